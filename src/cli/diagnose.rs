//! `ironwind diagnose JOB.toml MEASURED.toml`: what the meter's readings say.

use super::{load_job, out_err, Ctx, TextJson};
use crate::diagnose::{diagnose, parse_measured};
use crate::error::{Error, Result};
use crate::plan::plan;
use crate::shelf::{today, Entry};
use crate::store;
use std::io::Write;
use std::path::PathBuf;

/// Arguments of `ironwind diagnose`.
#[derive(Debug, clap::Args)]
pub(super) struct Args {
    /// The job file (TOML) the transformer was wound from
    job: PathBuf,
    /// The measurement file (TOML): applied_volts, idle_amps, idle_watts, temperature_c,
    /// meter_pct, ohms_pct, and [[winding]] name, volts, ohms
    measured: PathBuf,
    /// Keep the readings on the shelf against this core's id (a dated note and its volts per turn)
    #[arg(long)]
    record: Option<u64>,
    /// The shelf file (with --record)
    #[arg(long, requires = "record")]
    shelf: Option<PathBuf>,
    /// Output format
    #[arg(long, value_enum, default_value_t = TextJson::Text)]
    format: TextJson,
}

pub(super) fn run(out: &mut dyn Write, a: Args, ctx: &Ctx) -> Result<i32> {
    let job = load_job(&a.job)?;
    let p = plan(&job);
    let origin = a.measured.display().to_string();
    let text = crate::input::read_text(&a.measured)?;
    let m = parse_measured(&text, &origin, &p)?;
    let d = diagnose(&p, &m);
    if let Some(id) = a.record {
        record(a.shelf.as_deref(), id, &d)?;
    }
    crate::render::diagnose::write(out, &d, a.format.format(), &ctx.look).map_err(out_err)?;
    Ok(0)
}

/// Keeps the readings on the shelf: the core's volts per turn, and a dated note.
fn record(shelf: Option<&std::path::Path>, id: u64, d: &crate::diagnose::Diagnosis) -> Result<()> {
    let path = store::locate(shelf)?;
    let name = path.display().to_string();
    let note = crate::render::diagnose::shelf_note(&today(), d);
    store::update(&path, |s| {
        if let Some(b) = s.bad.first() {
            return Err(Error::bad_input(
                &name,
                format!("line {}: {}; fix that row first", b.line, b.problem),
            ));
        }
        let mut entries: Vec<Entry> = s.entries.iter().map(|(e, _)| e.clone()).collect();
        let Some(e) = entries.iter_mut().find(|e| e.id == id) else {
            return Err(Error::bad_value(
                &name,
                "--record",
                id,
                "no core with that id on the shelf (`ironwind shelf list` shows them)",
            ));
        };
        e.volts_per_turn = format!("{:.4}", d.volts_per_turn);
        e.notes = if e.notes.is_empty() {
            note.clone()
        } else {
            format!("{}; {note}", e.notes)
        };
        let checked = crate::shelf::check_entry(e.clone())
            .map_err(|m| Error::bad_input(&name, m))?
            .0;
        *e = checked;
        Ok((entries, ()))
    })
}
