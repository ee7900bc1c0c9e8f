//! Bench measurements of a donor core: a test winding and a magnetisation sweep.
//!
//! - Test winding: volts per turn v = V_test / N_test; the powered winding has about
//!   V_applied / v turns; the donor's peak flux is B = v / (π√2 · f · Ae) (EMF equation, sine mains).
//! - Sweep: RMS volts and amps on a winding of N turns. Each point's peak flux is
//!   B = V / (π√2 · f · N · Ae); its approximate peak field H ≈ √2 · I · N / le (the exciting current
//!   is far from sinusoidal near the knee, hence "approximate"). The knees are found by
//!   [`crate::magnetics::ExcitationCurve`]; the recommended maximum flux is 0.9 × the IEC knee flux.
//!
//! Flags: a donor run above 1.5 T was run hard (microwave-oven cores are, near saturation: common
//! practice); below 0.5 T a stack or area measurement is probably wrong (common practice).

use crate::error::{Error, Result};
use crate::input::Checker;
use crate::magnetics::{ExcitationCurve, Knees, KNEE_MARGIN, K_SINE};
use crate::verdict::Warning;
use serde::Serialize;

/// Flux above which a donor is said to have been run hard, T (common practice).
pub const HARD_DONOR_T: f64 = 1.5;
/// Flux below which a measurement is probably wrong, T (common practice).
pub const IMPLAUSIBLE_LOW_T: f64 = 0.5;
/// Most rows read from a sweep file.
pub const MAX_SWEEP_ROWS: usize = 10_000;

/// Reads a sweep file named in a job (relative to the job) and gives its display name and points.
pub type SweepLoader<'a> = &'a dyn Fn(&str) -> Result<(String, Vec<SweepPoint>)>;

/// One measured sweep point.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct SweepPoint {
    /// RMS volts on the swept winding.
    pub volts: f64,
    /// RMS exciting current, A.
    pub amps: f64,
}

/// The `[probe]` table as read, before checking.
#[derive(Debug, Clone, Default)]
pub struct RawProbeInput {
    /// Turns of the test winding.
    pub test_turns: Option<u32>,
    /// Volts read on the test winding.
    pub test_volts: Option<f64>,
    /// Volts applied to the powered winding.
    pub applied_volts: Option<f64>,
    /// Name of the powered winding.
    pub applied_to: Option<String>,
    /// Path of the sweep CSV, relative to the job file.
    pub sweep: Option<String>,
    /// Turns of the swept winding.
    pub sweep_turns: Option<u32>,
    /// Name of the swept winding.
    pub sweep_winding: Option<String>,
}

/// A test-winding measurement.
#[derive(Debug, Clone, PartialEq)]
pub struct TestWinding {
    /// Turns of the test winding.
    pub turns: u32,
    /// Volts read on it, RMS.
    pub volts: f64,
    /// Volts applied to the powered winding, RMS.
    pub applied_volts: f64,
    /// The powered winding's name in the job, if it is one of them.
    pub applied_to: Option<String>,
}

impl TestWinding {
    /// Measured volts per turn.
    pub fn volts_per_turn(&self) -> f64 {
        self.volts / self.turns as f64
    }
}

/// A magnetisation sweep.
#[derive(Debug, Clone)]
pub struct Sweep {
    /// Where it was read from.
    pub origin: String,
    /// The points as read.
    pub points: Vec<SweepPoint>,
    /// Turns of the swept winding.
    pub turns: u32,
    /// The swept winding's name in the job.
    pub winding: Option<String>,
    /// The cleaned curve.
    pub curve: ExcitationCurve,
    /// Its knees, found once.
    pub knees: Knees,
}

/// The checked probe measurements of a job.
#[derive(Debug, Clone)]
pub struct ProbeInput {
    /// The test winding.
    pub test: Option<TestWinding>,
    /// The sweep.
    pub sweep: Option<Sweep>,
}

impl PartialEq for ProbeInput {
    fn eq(&self, other: &Self) -> bool {
        self.test == other.test
            && self.sweep.as_ref().map(|s| (&s.points, s.turns))
                == other.sweep.as_ref().map(|s| (&s.points, s.turns))
    }
}

/// Checks the `[probe]` table of a job.
pub fn check_probe_table(
    c: &Checker,
    rp: RawProbeInput,
    windings: &[&str],
    load_sweep: SweepLoader,
) -> Result<ProbeInput> {
    let known = |field: &str, name: &Option<String>| -> Result<()> {
        if let Some(n) = name {
            if !windings.iter().any(|w| w == n) {
                let names: Vec<String> = windings.iter().map(|w| format!("\"{w}\"")).collect();
                return Err(c.fail(
                    field,
                    format!("\"{n}\""),
                    format!("must name a winding of this job: {}", names.join(", ")),
                ));
            }
        }
        Ok(())
    };
    known("[probe] applied_to", &rp.applied_to)?;
    known("[probe] sweep_winding", &rp.sweep_winding)?;
    let test = match (rp.test_turns, rp.test_volts, rp.applied_volts) {
        (None, None, None) => None,
        (Some(n), Some(v), Some(a)) => {
            if !(1..=10_000).contains(&n) {
                return Err(c.fail("[probe] test_turns", n, "must be ≥ 1 and ≤ 10000"));
            }
            let v = c.range("[probe] test_volts", v, 0.0, false, 10_000.0, "V")?;
            let a = c.range("[probe] applied_volts", a, 0.0, false, 100_000.0, "V")?;
            Some(TestWinding {
                turns: n,
                volts: v,
                applied_volts: a,
                applied_to: rp.applied_to.clone(),
            })
        }
        (n, v, _) => {
            let missing = if n.is_none() {
                "test_turns"
            } else if v.is_none() {
                "test_volts"
            } else {
                "applied_volts"
            };
            return Err(c.fail(
                &format!("[probe] {missing}"),
                "(missing)",
                "a test winding needs test_turns, test_volts and applied_volts together",
            ));
        }
    };
    let sweep = match (&rp.sweep, rp.sweep_turns) {
        (None, None) => None,
        (Some(path), Some(turns)) => {
            if !(1..=100_000).contains(&turns) {
                return Err(c.fail("[probe] sweep_turns", turns, "must be ≥ 1 and ≤ 100000"));
            }
            let (origin, points) = load_sweep(path)?;
            let curve =
                ExcitationCurve::new(&points.iter().map(|p| (p.volts, p.amps)).collect::<Vec<_>>())
                    .map_err(|m| Error::bad_input(&origin, m))?;
            let knees = curve.knees();
            Some(Sweep {
                origin,
                points,
                turns,
                winding: rp.sweep_winding.clone(),
                curve,
                knees,
            })
        }
        (Some(_), None) => {
            return Err(c.fail(
                "[probe] sweep_turns",
                "(missing)",
                "a sweep needs the swept winding's turns, sweep_turns ≥ 1",
            ))
        }
        (None, Some(_)) => {
            return Err(c.fail(
                "[probe] sweep",
                "(missing)",
                "sweep_turns needs sweep, the path of the sweep CSV",
            ))
        }
    };
    Ok(ProbeInput { test, sweep })
}

/// Reads a sweep CSV (header `volts,amps`). `origin` names the file in messages.
pub fn read_sweep(origin: &str, bytes: &[u8]) -> Result<Vec<SweepPoint>> {
    let text = std::str::from_utf8(bytes).map_err(|e| {
        let line = bytes[..e.valid_up_to()]
            .iter()
            .filter(|&&b| b == b'\n')
            .count()
            + 1;
        Error::bad_input(
            origin,
            format!("line {line}: not UTF-8 text; a sweep is a CSV file with header volts,amps"),
        )
    })?;
    if text.trim().is_empty() {
        return Err(Error::bad_input(
            origin,
            "the file is empty; expected a header volts,amps and at least 4 rows",
        ));
    }
    let mut rdr = csv::ReaderBuilder::new()
        .has_headers(true)
        .flexible(true)
        .trim(csv::Trim::All)
        .from_reader(text.as_bytes());
    let headers = rdr
        .headers()
        .map_err(|e| Error::bad_input(origin, format!("line 1: {e}")))?
        .clone();
    let names: Vec<String> = headers
        .iter()
        .map(|h| h.trim_start_matches('\u{feff}').to_ascii_lowercase())
        .collect();
    if names != ["volts", "amps"] {
        return Err(Error::bad_input(
            origin,
            format!(
                "line 1: header is `{}`; expected exactly `volts,amps`",
                crate::error::one_line(&names.join(","))
            ),
        ));
    }
    let mut points = Vec::new();
    for rec in rdr.records() {
        let rec =
            rec.map_err(|e| Error::bad_input(origin, crate::error::one_line(&e.to_string())))?;
        let line = rec.position().map(|p| p.line()).unwrap_or(0);
        if rec.len() == 1 && rec.get(0).is_some_and(str::is_empty) {
            continue;
        }
        if rec.len() != 2 {
            return Err(Error::bad_input(
                origin,
                format!("line {line}: {} fields; expected 2 (volts,amps)", rec.len()),
            ));
        }
        let num = |k: usize, field: &str, lo_ok: fn(f64) -> bool, accepted: &str| -> Result<f64> {
            let cell = rec.get(k).unwrap_or("");
            match cell.parse::<f64>() {
                Ok(v) if v.is_finite() && lo_ok(v) => Ok(v),
                _ => Err(Error::bad_value(
                    origin,
                    format!("line {line}: {field}"),
                    format!("\"{cell}\""),
                    accepted,
                )),
            }
        };
        let volts = num(
            0,
            "volts",
            |v| (0.001..=100_000.0).contains(&v),
            "must be a number ≥ 0.001 V and ≤ 100000 V",
        )?;
        let amps = num(
            1,
            "amps",
            |v| v == 0.0 || (1e-9..=10_000.0).contains(&v),
            "must be 0, or a number ≥ 1e-9 A and ≤ 10000 A",
        )?;
        points.push(SweepPoint { volts, amps });
        if points.len() > MAX_SWEEP_ROWS {
            return Err(Error::bad_input(
                origin,
                format!("line {line}: more than {MAX_SWEEP_ROWS} rows"),
            ));
        }
    }
    if points.len() < 4 {
        return Err(Error::bad_input(
            origin,
            format!(
                "{} points; a sweep needs at least 4 rows of volts,amps",
                points.len()
            ),
        ));
    }
    Ok(points)
}

/// What a test winding tells.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct TestReport {
    /// Measured volts per turn.
    pub volts_per_turn: f64,
    /// Turns per volt.
    pub turns_per_volt: f64,
    /// Estimated turns of the powered winding.
    pub powered_turns: f64,
    /// Peak flux at which the donor was run, T (sine mains).
    pub donor_flux_t: f64,
}

/// Analyses a test winding on a core of net area `area_net_mm2`.
pub fn test_report(t: &TestWinding, freq_hz: f64, area_net_mm2: f64) -> TestReport {
    let v = t.volts_per_turn();
    TestReport {
        volts_per_turn: v,
        turns_per_volt: 1.0 / v,
        powered_turns: t.applied_volts / v,
        donor_flux_t: v / (K_SINE * freq_hz * area_net_mm2 * 1e-6),
    }
}

/// Warnings about a donor flux.
pub fn donor_flux_notes(b: f64) -> Vec<Warning> {
    let mut w = Vec::new();
    if b > HARD_DONOR_T {
        w.push(Warning::DonorRunHard {
            flux_t: b,
            hard_t: HARD_DONOR_T,
        });
    }
    if b < IMPLAUSIBLE_LOW_T {
        w.push(Warning::DonorFluxImplausible { flux_t: b });
    }
    w
}

/// One sweep point with its magnetic values.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct SweepRow {
    /// RMS volts.
    pub volts: f64,
    /// RMS amps.
    pub amps: f64,
    /// Peak flux density, T.
    pub flux_t: f64,
    /// Approximate peak field strength, A/m.
    pub field_a_per_m: f64,
}

/// What a sweep tells.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct SweepReport {
    /// Each cleaned point.
    pub points: Vec<SweepRow>,
    /// IEC 61869-2 knee voltage, V.
    pub knee_volts: Option<f64>,
    /// IEC knee flux, T.
    pub knee_flux_t: Option<f64>,
    /// 45° tangent point voltage, V.
    pub tangent_volts: Option<f64>,
    /// 45° tangent point flux, T.
    pub tangent_flux_t: Option<f64>,
    /// Recommended maximum flux, 0.9 × the IEC knee flux, T.
    pub recommended_flux_t: Option<f64>,
}

/// Volts on the swept winding per tesla of peak flux.
pub fn sweep_volts_per_tesla(turns: u32, freq_hz: f64, area_net_mm2: f64) -> f64 {
    K_SINE * freq_hz * turns as f64 * area_net_mm2 * 1e-6
}

/// Analyses a sweep (with its knees, found once) on a core of net area `area_net_mm2` and path `path_mm`.
pub fn sweep_report(
    curve: &ExcitationCurve,
    knees: Knees,
    turns: u32,
    freq_hz: f64,
    area_net_mm2: f64,
    path_mm: f64,
) -> SweepReport {
    let vpt = sweep_volts_per_tesla(turns, freq_hz, area_net_mm2);
    let points = curve
        .volts
        .iter()
        .zip(&curve.amps)
        .map(|(&v, &i)| SweepRow {
            volts: v,
            amps: i,
            flux_t: v / vpt,
            field_a_per_m: std::f64::consts::SQRT_2 * i * turns as f64 / (path_mm * 1e-3),
        })
        .collect();
    SweepReport {
        points,
        knee_volts: knees.iec_volts,
        knee_flux_t: knees.iec_volts.map(|v| v / vpt),
        tangent_volts: knees.tangent_volts,
        tangent_flux_t: knees.tangent_volts.map(|v| v / vpt),
        recommended_flux_t: knees.iec_volts.map(|v| KNEE_MARGIN * v / vpt),
    }
}

/// The magnetising current (A RMS) a winding of `turns` draws at peak flux `b_t`, scaled by
/// ampere-turns from the sweep (same flux, same field). None when no sweep is known.
pub fn no_load_amps(sweep: &Sweep, freq_hz: f64, area_net_mm2: f64, b_t: f64, turns: u32) -> f64 {
    let vpt = sweep_volts_per_tesla(sweep.turns, freq_hz, area_net_mm2);
    let i_sweep = sweep.curve.amps_at(b_t * vpt);
    i_sweep * sweep.turns as f64 / turns as f64
}

/// Everything `ironwind probe` reports.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ProbeReport {
    /// Frequency, Hz.
    pub frequency_hz: f64,
    /// Net iron area used, mm².
    pub area_net_mm2: f64,
    /// Magnetic path length used for the field, mm.
    pub path_length_mm: f64,
    /// Whether the path length was estimated from scrapless proportions (no window given).
    pub path_estimated: bool,
    /// Measured volts per turn (test winding).
    pub volts_per_turn: Option<f64>,
    /// Turns per volt.
    pub turns_per_volt: Option<f64>,
    /// Estimated turns of the powered winding.
    pub powered_turns: Option<f64>,
    /// Flux the donor ran at, T.
    pub donor_flux_t: Option<f64>,
    /// Turns of the swept winding.
    pub sweep_turns: Option<u32>,
    /// Sweep points with flux and field.
    pub points: Vec<SweepRow>,
    /// IEC knee voltage, V.
    pub knee_volts: Option<f64>,
    /// IEC knee flux, T.
    pub knee_flux_t: Option<f64>,
    /// 45° tangent voltage, V.
    pub tangent_volts: Option<f64>,
    /// 45° tangent flux, T.
    pub tangent_flux_t: Option<f64>,
    /// Recommended maximum flux, T.
    pub recommended_flux_t: Option<f64>,
    /// Warnings and notes.
    #[serde(skip)]
    pub warnings: Vec<Warning>,
}

/// Runs the analyses a person asked for.
pub fn probe_run(
    test: Option<&TestWinding>,
    sweep: Option<(&ExcitationCurve, u32)>,
    freq_hz: f64,
    area_net_mm2: f64,
    path_mm: f64,
    path_estimated: bool,
) -> ProbeReport {
    let t = test.map(|t| test_report(t, freq_hz, area_net_mm2));
    let s = sweep.map(|(c, n)| sweep_report(c, c.knees(), n, freq_hz, area_net_mm2, path_mm));
    let mut warnings = Vec::new();
    if let Some(r) = &t {
        warnings.extend(donor_flux_notes(r.donor_flux_t));
    }
    if let Some(r) = &s {
        if r.knee_volts.is_none() {
            warnings.push(Warning::SweepBelowKnee { in_plan: false });
        }
        if r.tangent_volts.is_none() {
            warnings.push(Warning::NoTangentPoint);
        }
        if let (Some(rec), Some(tr)) = (r.recommended_flux_t, &t) {
            if tr.donor_flux_t > rec {
                warnings.push(Warning::DonorAboveRecommended {
                    donor_t: tr.donor_flux_t,
                    recommended_t: rec,
                });
            }
        }
    }
    if path_estimated && s.is_some() {
        warnings.push(Warning::PathLengthEstimated);
    }
    ProbeReport {
        frequency_hz: freq_hz,
        area_net_mm2,
        path_length_mm: path_mm,
        path_estimated,
        volts_per_turn: t.as_ref().map(|r| r.volts_per_turn),
        turns_per_volt: t.as_ref().map(|r| r.turns_per_volt),
        powered_turns: t.as_ref().map(|r| r.powered_turns),
        donor_flux_t: t.as_ref().map(|r| r.donor_flux_t),
        sweep_turns: sweep.map(|(_, n)| n),
        points: s.as_ref().map(|r| r.points.clone()).unwrap_or_default(),
        knee_volts: s.as_ref().and_then(|r| r.knee_volts),
        knee_flux_t: s.as_ref().and_then(|r| r.knee_flux_t),
        tangent_volts: s.as_ref().and_then(|r| r.tangent_volts),
        tangent_flux_t: s.as_ref().and_then(|r| r.tangent_flux_t),
        recommended_flux_t: s.as_ref().and_then(|r| r.recommended_flux_t),
        warnings,
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    /// Worked textbook problems quote three significant figures.
    const TEXTBOOK: f64 = 0.001;

    #[test]
    fn test_winding_against_textbook_problem() {
        // Textbook worked problem (REFERENCES.md): 520 V on 400 turns over 60 cm² at 50 Hz → 0.976 T.
        // A 10-turn test winding on that core reads 520/400·10 = 13 V.
        let t = TestWinding {
            turns: 10,
            volts: 13.0,
            applied_volts: 520.0,
            applied_to: None,
        };
        let r = test_report(&t, 50.0, 6000.0);
        assert_relative_eq!(r.volts_per_turn, 1.3, max_relative = 1e-12);
        assert_relative_eq!(r.powered_turns, 400.0, max_relative = 1e-12);
        assert_relative_eq!(r.donor_flux_t, 0.976, max_relative = TEXTBOOK);
        assert!(donor_flux_notes(r.donor_flux_t).is_empty());
    }

    #[test]
    fn microwave_donor_about_one_volt_per_turn() {
        // Common practice: a microwave-oven donor gives about 1 V per turn and runs near saturation.
        // A 38 × 62 mm tongue and stack at 0.95 and 50 Hz: 1 V/turn → about 1.9 T: run hard.
        let t = TestWinding {
            turns: 10,
            volts: 10.0,
            applied_volts: 230.0,
            applied_to: None,
        };
        let r = test_report(&t, 50.0, 38.0 * 62.0 * 0.95);
        assert!(r.donor_flux_t > HARD_DONOR_T);
        assert_eq!(donor_flux_notes(r.donor_flux_t).len(), 1);
        assert!(matches!(
            donor_flux_notes(0.2)[0],
            Warning::DonorFluxImplausible { .. }
        ));
    }

    #[test]
    fn sweep_reader_handles_order_and_refuses_bad_rows() {
        let ok =
            read_sweep("s.csv", b"volts,amps\n40,0.1\n10,0.01\n20,0.02\n30,0.05\n").expect("ok");
        assert_eq!(ok.len(), 4);
        for (bytes, needle) in [
            (&b"10,0.01\n20,0.02\n"[..], "line 1"),
            (
                b"volts,amps\n10,abc\n20,0.02\n30,0.03\n40,0.04\n",
                "line 2: amps",
            ),
            (
                b"volts,amps\n10,-0.01\n20,0.02\n30,0.03\n40,0.04\n",
                "line 2: amps",
            ),
            (
                b"volts,amps\nNaN,0.01\n20,0.02\n30,0.03\n40,0.04\n",
                "line 2: volts",
            ),
            (b"volts,amps\n10,0.01\n", "at least 4"),
            (b"", "empty"),
            (b"volts,amps\n10,0.01\xff\n", "UTF-8"),
        ] {
            let e = read_sweep("s.csv", bytes).expect_err("bad");
            assert_eq!(e.exit_code(), 2);
            assert!(e.to_string().contains(needle), "{e}");
        }
    }

    #[test]
    fn no_load_current_scales_by_turns() {
        let pts: Vec<(f64, f64)> = (1..=10)
            .map(|k| (k as f64 * 10.0, k as f64 * 0.01))
            .collect();
        let sweep = Sweep {
            origin: "s".into(),
            points: vec![],
            turns: 100,
            winding: None,
            curve: ExcitationCurve::new(&pts).expect("curve"),
            knees: Knees {
                iec_volts: None,
                tangent_volts: None,
            },
        };
        let vpt = sweep_volts_per_tesla(100, 50.0, 1000.0);
        let b = 50.0 / vpt;
        // 50 V on the sweep winding draws 0.05 A; a 50-turn winding needs twice the current.
        assert_relative_eq!(
            no_load_amps(&sweep, 50.0, 1000.0, b, 50),
            0.1,
            max_relative = 1e-9
        );
    }
}
