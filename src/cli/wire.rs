//! `ironwind wire`: the wire tables, or a size and strands for a current.

use super::{out_err, Ctx, SystemArg, TextJson};
use crate::error::{Error, Result};
use crate::flags::{flag_in, ORIGIN};
use crate::render::Units;
use crate::wire::{choice_report, table_report, Grade, System};
use std::io::Write;

/// Arguments of `ironwind wire`.
#[derive(Debug, clap::Args)]
pub(super) struct Args {
    /// Print the whole table of the system
    #[arg(long, conflicts_with = "amps")]
    list: bool,
    /// Current to carry, A RMS
    #[arg(long)]
    amps: Option<f64>,
    /// Current density, A/mm² (default 3.0)
    #[arg(long, default_value_t = 3.0)]
    density: f64,
    /// Wire system (default: metric, or AWG with --units imperial)
    #[arg(long, value_enum)]
    system: Option<SystemArg>,
    /// Thickest single strand before going to parallel strands, mm
    #[arg(long, default_value_t = 2.0)]
    max_strand: f64,
    /// Enamel grade: 1 (grade 1; AWG single build) or 2 (grade 2; AWG heavy build)
    #[arg(long, default_value_t = 2)]
    grade: u8,
    /// Output format
    #[arg(long, value_enum, default_value_t = TextJson::Text)]
    format: TextJson,
}

pub(super) fn run(out: &mut dyn Write, a: Args, ctx: &Ctx) -> Result<i32> {
    let system = match a.system {
        Some(s) => s.system(),
        None if ctx.look.units == Units::Imperial => System::Awg,
        None => System::Metric,
    };
    let grade = match a.grade {
        1 => Grade::One,
        2 => Grade::Two,
        g => return Err(Error::bad_value(ORIGIN, "--grade", g, "must be 1 or 2")),
    };
    let report = match a.amps {
        Some(amps) if !a.list => {
            flag_in("--amps", amps, 0.0, false, 10_000.0, "A")?;
            flag_in("--density", a.density, 0.2, true, 20.0, "A/mm²")?;
            flag_in("--max-strand", a.max_strand, 0.1, true, 4.0, "mm")?;
            choice_report(amps, a.density, system, grade, a.max_strand)
        }
        _ => table_report(system, grade),
    };
    crate::render::wire::write(out, &report, a.format.format(), &ctx.look).map_err(out_err)?;
    Ok(0)
}
