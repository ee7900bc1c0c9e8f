//! `ironwind rate`: can a core carry a wattage.

use super::{load_job, out_err, render_to_file, Ctx, ShapeArg, SystemArg, TextJson};
use crate::error::{Error, Result};
use crate::flags::{flag_in, quick_job, QuickJob, ORIGIN};
use crate::rate::{rate, RateRequest};
use clap::ValueEnum;
use std::io::Write;
use std::path::PathBuf;

#[derive(Debug, Clone, Copy, ValueEnum, PartialEq, Eq)]
enum WaveArg {
    Sine,
    Square,
}

/// Arguments of `ironwind rate`.
#[derive(Debug, clap::Args)]
pub(super) struct Args {
    /// The job file (TOML); or describe the core and windings with the flags below
    job: Option<PathBuf>,
    /// Target output, VA (default: the job's own outputs)
    #[arg(long)]
    va: Option<f64>,
    /// Fraction of the time the load is on (0 < duty ≤ 1), for welders and motor starts
    #[arg(long, default_value_t = 1.0)]
    duty: f64,
    /// Write capacity and total loss against flux density as an SVG chart
    #[arg(long)]
    plot: Option<PathBuf>,
    /// Exit with code 3 when the target is not carried
    #[arg(long)]
    strict: bool,
    /// Verify by a dense brute-force scan of VA instead of the search
    #[arg(long)]
    scan: bool,
    /// Tongue width, mm or with a unit (without a job file)
    #[arg(long, conflicts_with = "job")]
    tongue: Option<String>,
    /// Stack depth, mm or with a unit
    #[arg(long, conflicts_with = "job")]
    stack: Option<String>,
    /// One window, WIDTHxHEIGHT in mm
    #[arg(long, conflicts_with = "job")]
    window: Option<String>,
    /// Lamination shape
    #[arg(long, value_enum, default_value_t = ShapeArg::Ei)]
    shape: ShapeArg,
    /// Stacking factor
    #[arg(long, default_value_t = 0.95)]
    stacking: f64,
    /// Steel: unknown, non-oriented, grain-oriented or a grade like M400-50A
    #[arg(long, default_value = "unknown")]
    steel: String,
    /// Supply frequency, Hz
    #[arg(long, default_value_t = 50.0)]
    frequency: f64,
    /// Primary volts (RMS for sine; amplitude for square)
    #[arg(long, conflicts_with = "job")]
    primary: Option<f64>,
    /// Output volts RMS (repeat for more outputs; they share the load equally by VA)
    #[arg(long, conflicts_with = "job")]
    output: Vec<f64>,
    /// Drive waveform of the primary
    #[arg(long, value_enum, default_value_t = WaveArg::Sine)]
    waveform: WaveArg,
    /// Flux density, T (default: the steel's)
    #[arg(long)]
    flux: Option<f64>,
    /// Allowed temperature rise, °C
    #[arg(long)]
    max_rise: Option<f64>,
    /// Ambient temperature, °C
    #[arg(long)]
    ambient: Option<f64>,
    /// Wire system
    #[arg(long, value_enum, default_value_t = SystemArg::Metric)]
    system: SystemArg,
    /// Output format
    #[arg(long, value_enum, default_value_t = TextJson::Text)]
    format: TextJson,
}

fn job_of(a: &Args) -> Result<crate::job::Job> {
    match (&a.job, &a.tongue, &a.stack, &a.window, a.primary) {
        (Some(path), ..) => load_job(path),
        (None, Some(t), Some(s), Some(w), Some(p)) => quick_job(&QuickJob {
            tongue: t.clone(),
            stack: s.clone(),
            window: w.clone(),
            shape: a.shape.shape(),
            stacking: a.stacking,
            steel: a.steel.clone(),
            frequency_hz: a.frequency,
            primary_volts: p,
            outputs_volts: a.output.clone(),
            square: a.waveform == WaveArg::Square,
            flux_t: a.flux,
            max_rise_c: a.max_rise,
            ambient_c: a.ambient,
            system: a.system.system(),
            va: a.va,
        }),
        _ => Err(Error::bad_value(
            ORIGIN,
            "JOB or --tongue/--stack/--window/--primary/--output",
            "(missing)",
            "give a job file, or --tongue, --stack, --window, --primary and --output",
        )),
    }
}

pub(super) fn run(out: &mut dyn Write, a: Args, ctx: &Ctx) -> Result<i32> {
    if let Some(p) = a.va {
        flag_in("--va", p, 0.0, false, 1e7, "VA")?;
    }
    flag_in("--duty", a.duty, 0.0, false, 1.0, "")?;
    if let (Some(plot), Some(job)) = (&a.plot, &a.job) {
        super::not_an_input(plot, &[job], "--plot")?;
    }
    let job = job_of(&a)?;
    let rating = rate(
        &job,
        &RateRequest {
            va: a.va,
            duty: a.duty,
            scan: a.scan,
            curve: a.plot.is_some(),
            target_from_job: a.tongue.is_none(),
        },
    );
    if let Some(path) = &a.plot {
        let svg = crate::render::rate::flux_chart(&rating);
        render_to_file(path, |w| w.write_all(svg.as_bytes()))?;
    }
    crate::render::rate::write(out, &rating, a.format.format(), &ctx.look).map_err(out_err)?;
    Ok(if a.strict && !rating.carried() { 3 } else { 0 })
}
