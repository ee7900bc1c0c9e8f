//! `ironwind card JOB.toml`: the bench card.

use super::{load_job, out_err, render_to_file, Ctx};
use crate::error::Result;
use crate::flags::flag_in;
use crate::plan::{check_windable, plan};
use crate::render::card::{self, CardOptions, Paper};
use crate::render::Format;
use clap::ValueEnum;
use std::io::Write;
use std::path::PathBuf;

/// `--paper`.
#[derive(Debug, Clone, Copy, ValueEnum, PartialEq, Eq)]
enum PaperArg {
    A5,
    A4,
    Letter,
}

#[derive(Debug, Clone, Copy, ValueEnum, PartialEq, Eq)]
enum CardFormat {
    Text,
    Markdown,
    Html,
    Svg,
}

/// Arguments of `ironwind card`.
#[derive(Debug, clap::Args)]
pub(super) struct Args {
    /// The job file (TOML)
    job: PathBuf,
    /// Output format
    #[arg(long, value_enum, default_value_t = CardFormat::Text)]
    format: CardFormat,
    /// Write to this file instead of stdout
    #[arg(long, short)]
    output: Option<PathBuf>,
    /// Spare allowance on the buy list, per cent (0 to 100)
    #[arg(long, default_value_t = 10.0)]
    spare: f64,
    /// The sheet the HTML card is laid out for (one page, printed at 100 %)
    #[arg(long, value_enum, default_value_t = PaperArg::A5)]
    paper: PaperArg,
}

pub(super) fn run(out: &mut dyn Write, a: Args, ctx: &Ctx) -> Result<i32> {
    let spare = flag_in("--spare", a.spare, 0.0, true, 100.0, "%")?;
    if let Some(o) = &a.output {
        super::not_an_input(o, &[&a.job], "--output")?;
    }
    let job = load_job(&a.job)?;
    let p = plan(&job);
    check_windable(&p, &a.job.display().to_string())?;
    let format = match a.format {
        CardFormat::Text => Format::Text,
        CardFormat::Markdown => Format::Markdown,
        CardFormat::Html => Format::Html,
        CardFormat::Svg => Format::Svg,
    };
    let mut look = ctx.look;
    // Colour only on the terminal, never in a file.
    look.color = look.color && a.output.is_none();
    let opts = CardOptions {
        spare: spare / 100.0,
        look,
        paper: match a.paper {
            PaperArg::A5 => Paper::A5,
            PaperArg::A4 => Paper::A4,
            PaperArg::Letter => Paper::Letter,
        },
        date: super::today(),
    };
    match &a.output {
        Some(path) => render_to_file(path, |w| card::write(w, &p, format, &opts))?,
        None => card::write(out, &p, format, &opts).map_err(out_err)?,
    }
    Ok(0)
}
