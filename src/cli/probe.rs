//! `ironwind probe`: a donor's test winding and magnetisation sweep.

use super::{out_err, render_to_file, Ctx, ShapeArg, TextJson};
use crate::error::{Error, Result};
use crate::flags::{flag_in, probe_core, ORIGIN};
use crate::geometry::geometry;
use crate::magnetics::ExcitationCurve;
use crate::probe::{probe_run, read_sweep, TestWinding};
use std::io::Write;
use std::path::PathBuf;

/// Arguments of `ironwind probe`.
#[derive(Debug, clap::Args)]
pub(super) struct Args {
    /// Turns of the test winding wound over the existing one
    #[arg(long, requires_all = ["test_volts", "applied_volts"])]
    test_turns: Option<u32>,
    /// Volts read on the test winding, V RMS
    #[arg(long, requires = "test_turns")]
    test_volts: Option<f64>,
    /// Volts applied to the existing winding, V RMS
    #[arg(long, requires = "test_turns")]
    applied_volts: Option<f64>,
    /// Sweep CSV with header volts,amps (V RMS, A RMS)
    #[arg(long, requires = "sweep_turns")]
    sweep: Option<PathBuf>,
    /// Turns of the swept winding
    #[arg(long, requires = "sweep")]
    sweep_turns: Option<u32>,
    /// Frequency of the applied voltage, Hz
    #[arg(long, default_value_t = 50.0)]
    frequency: f64,
    /// Tongue width, mm or with a unit
    #[arg(long)]
    tongue: String,
    /// Stack depth, mm or with a unit
    #[arg(long)]
    stack: String,
    /// One window, WIDTHxHEIGHT in mm, for the path length (field strength)
    #[arg(long)]
    window: Option<String>,
    /// Lamination shape
    #[arg(long, value_enum, default_value_t = ShapeArg::Ei)]
    shape: ShapeArg,
    /// Stacking factor, > 0.5 and ≤ 1
    #[arg(long, default_value_t = 0.95)]
    stacking: f64,
    /// Write the sweep as an SVG chart to this file
    #[arg(long, requires = "sweep")]
    plot: Option<PathBuf>,
    /// Output format
    #[arg(long, value_enum, default_value_t = TextJson::Text)]
    format: TextJson,
}

fn test_winding(a: &Args) -> Result<Option<TestWinding>> {
    let (Some(n), Some(v), Some(ap)) = (a.test_turns, a.test_volts, a.applied_volts) else {
        return Ok(None);
    };
    if !(1..=10_000).contains(&n) {
        return Err(Error::bad_value(
            ORIGIN,
            "--test-turns",
            n,
            "must be ≥ 1 and ≤ 10000",
        ));
    }
    Ok(Some(TestWinding {
        turns: n,
        volts: flag_in("--test-volts", v, 0.0, false, 10_000.0, "V")?,
        applied_volts: flag_in("--applied-volts", ap, 0.0, false, 100_000.0, "V")?,
        applied_to: None,
    }))
}

fn sweep(a: &Args) -> Result<Option<(ExcitationCurve, u32)>> {
    let (Some(path), Some(n)) = (&a.sweep, a.sweep_turns) else {
        return Ok(None);
    };
    if !(1..=100_000).contains(&n) {
        return Err(Error::bad_value(
            ORIGIN,
            "--sweep-turns",
            n,
            "must be ≥ 1 and ≤ 100000",
        ));
    }
    let name = path.display().to_string();
    let text = crate::input::read_text(path)?;
    let pts = read_sweep(&name, text.as_bytes())?;
    let c = ExcitationCurve::new(&pts.iter().map(|p| (p.volts, p.amps)).collect::<Vec<_>>())
        .map_err(|m| Error::bad_input(&name, m))?;
    Ok(Some((c, n)))
}

pub(super) fn run(out: &mut dyn Write, a: Args, ctx: &Ctx) -> Result<i32> {
    if a.test_turns.is_none() && a.sweep.is_none() {
        return Err(Error::bad_value(
            ORIGIN,
            "--test-turns / --sweep",
            "(neither)",
            "give a test winding (--test-turns, --test-volts, --applied-volts) or a sweep (--sweep, --sweep-turns), or both",
        ));
    }
    let f = flag_in("--frequency", a.frequency, 1.0, true, 2000.0, "Hz")?;
    if let (Some(plot), Some(sweep)) = (&a.plot, &a.sweep) {
        super::not_an_input(plot, &[sweep], "--plot")?;
    }
    let (dims, estimated) = probe_core(
        &a.tongue,
        &a.stack,
        a.window.as_deref(),
        a.shape.shape(),
        a.stacking,
    )?;
    let g = geometry(&dims);
    let test = test_winding(&a)?;
    let curve = sweep(&a)?;
    let report = probe_run(
        test.as_ref(),
        curve.as_ref().map(|(c, n)| (c, *n)),
        f,
        g.area_net_mm2,
        g.path_length_mm,
        estimated,
    );
    if let Some(p) = &a.plot {
        let svg = crate::render::probe::sweep_chart(&report);
        render_to_file(p, |w| w.write_all(svg.as_bytes()))?;
    }
    crate::render::probe::write(out, &report, a.format.format(), &ctx.look).map_err(out_err)?;
    Ok(0)
}
