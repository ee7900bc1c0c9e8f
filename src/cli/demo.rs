//! `ironwind demo`: the bundled example planned end to end, with no files needed.

use super::{out_err, Ctx, PlanFormat, DEMO_JOB};
use crate::error::{Error, Result};
use crate::job::parse_job;
use crate::plan::plan;
use crate::render::card::{self, CardOptions};
use crate::render::Format;
use std::io::Write;

/// Arguments of `ironwind demo`.
#[derive(Debug, clap::Args)]
pub(super) struct Args {
    /// Output format of the plan
    #[arg(long, value_enum, default_value_t = PlanFormat::Text)]
    format: PlanFormat,
    /// Show the demo's bench card (text) instead of the plan
    #[arg(long)]
    card: bool,
}

pub(super) fn run(out: &mut dyn Write, a: Args, ctx: &Ctx) -> Result<i32> {
    let job = parse_job(DEMO_JOB, "demo job", &|_| {
        Err(Error::Failed("the demo has no sweep".into()))
    })?;
    let p = plan(&job);
    if a.card {
        let opts = CardOptions {
            look: ctx.look,
            date: super::today(),
            ..CardOptions::default()
        };
        card::write(out, &p, Format::Text, &opts).map_err(out_err)?;
        return Ok(0);
    }
    let format = a.format.format();
    if format == Format::Text {
        crate::render::plan::write_demo_intro(out, &ctx.look).map_err(out_err)?;
    }
    crate::render::plan::write(out, &p, format, &ctx.look).map_err(out_err)?;
    Ok(0)
}
