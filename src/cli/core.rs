//! `ironwind core`: the geometry of a measured core.

use super::{out_err, Ctx, ShapeArg, TextJson};
use crate::error::Result;
use crate::flags::core_from_flags;
use crate::geometry::core_report;
use std::io::Write;

/// Arguments of `ironwind core`.
#[derive(Debug, clap::Args)]
pub(super) struct Args {
    /// Tongue (centre leg) width, mm or with a unit ("1.25 in")
    #[arg(long)]
    tongue: String,
    /// Stack depth, mm or with a unit
    #[arg(long)]
    stack: String,
    /// One window, WIDTHxHEIGHT in mm (e.g. 16x48)
    #[arg(long)]
    window: String,
    /// Lamination shape
    #[arg(long, value_enum, default_value_t = ShapeArg::Ei)]
    shape: ShapeArg,
    /// Stacking factor, > 0.5 and ≤ 1
    #[arg(long, default_value_t = 0.95)]
    stacking: f64,
    /// Output format
    #[arg(long, value_enum, default_value_t = TextJson::Text)]
    format: TextJson,
}

pub(super) fn run(out: &mut dyn Write, a: Args, ctx: &Ctx) -> Result<i32> {
    let dims = core_from_flags(&a.tongue, &a.stack, &a.window, a.shape.shape(), a.stacking)?;
    let r = core_report(&dims);
    crate::render::core::write(out, &r, a.format.format(), &ctx.look).map_err(out_err)?;
    Ok(0)
}
