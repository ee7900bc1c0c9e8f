//! `ironwind plan JOB.toml`: the whole design.

use super::{load_job, out_err, Ctx, PlanFormat};
use crate::error::Result;
use crate::plan::{check_windable, plan};
use std::io::Write;
use std::path::PathBuf;

/// Arguments of `ironwind plan`.
#[derive(Debug, clap::Args)]
pub(super) struct Args {
    /// The job file (TOML; `-` reads standard input)
    job: PathBuf,
    /// Output format
    #[arg(long, value_enum, default_value_t = PlanFormat::Text)]
    format: PlanFormat,
    /// Exit with code 3 when the verdict fails
    #[arg(long)]
    strict: bool,
}

pub(super) fn run(out: &mut dyn Write, a: Args, ctx: &Ctx) -> Result<i32> {
    let job = load_job(&a.job)?;
    let p = plan(&job);
    check_windable(&p, &a.job.display().to_string())?;
    crate::render::plan::write(out, &p, a.format.format(), &ctx.look).map_err(out_err)?;
    Ok(if a.strict && !p.verdict.ok { 3 } else { 0 })
}
