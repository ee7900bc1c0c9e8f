//! After winding: what a meter's readings say about what was wound (`ironwind diagnose`).
//!
//! The person powers the primary at `applied_volts`, reads each output's open-circuit volts, each
//! winding's DC resistance at `temperature_c`, and perhaps the idle current and power. Against the
//! plan:
//! - turns: with no load an output reads V_a·N_s/N_p (the EMF equation's ratio), so the turns it
//!   has are N_s ≈ N_p·V_s/V_a, to the turn the meter allows (two readings at `meter_pct` each:
//!   ±√2·meter_pct of N). When every output is off by one ratio the primary is off instead
//!   (N_p ≈ N_p,plan / ratio). With one output the two cannot be told apart by volts: the
//!   resistances decide where measured (R ∝ turns), else both are shown, the output first;
//! - wire: R20 = R_T / (1 + 0.00393·(T − 20)) (IEC 60028); at the turns it settles on, the planned
//!   wire gives R_plan·N/N_plan; outside `ohms_pct` the copper area is A_plan·R_expected/R20 and the
//!   size nearest it in the plan's system is named;
//! - shorted turn: a shorted turn is a secondary loaded by its own resistance; it shows as idle
//!   power far above the core-loss estimate (scaled by (V_a/V_rated)², loss ∝ B²) — more than
//!   `SHORTED_RATIO` times, the estimate being rough (an unknown steel's loss is a guess) — or idle
//!   current far above the sweep's prediction;
//! - reversed: halves or sections in series read k·N·V_a/N_p; one of two joined the wrong way round
//!   reads about nothing, one of k reads (k − 2)/k of it;
//! - as planned: within the meter's tolerance, with the margins.
//!
//! Findings are ranked, the most likely first; two explanations that fit the same reading are both
//! given.

use crate::error::Result;
use crate::input::Checker;
use crate::job::Role;
use crate::losses::temperature_factor;
use crate::plan::Plan;
use crate::units::LengthInput;
use crate::wire::{sizes, Conductor};
use serde::Deserialize;

/// Idle power above the estimate by this factor points to a shorted turn (the core-loss estimate
/// of salvaged steel is rough: common practice).
pub const SHORTED_RATIO: f64 = 2.5;

/// What was measured, as the measurement file gives it.
#[derive(Debug, Clone, PartialEq)]
pub struct Measured {
    /// Volts on the primary while reading the outputs, V RMS.
    pub applied_volts: f64,
    /// Primary current with no load, A RMS.
    pub idle_amps: Option<f64>,
    /// Primary power with no load, W.
    pub idle_watts: Option<f64>,
    /// Where the resistances were read, °C.
    pub temperature_c: f64,
    /// The meter's tolerance on volts, %.
    pub meter_pct: f64,
    /// The meter's tolerance on ohms, %.
    pub ohms_pct: f64,
    /// Readings of each winding.
    pub windings: Vec<MeasuredWinding>,
}

/// One winding's readings.
#[derive(Debug, Clone, PartialEq)]
pub struct MeasuredWinding {
    /// The winding's name in the job.
    pub name: String,
    /// Open-circuit volts, end to end (every half or section in series).
    pub volts: Option<f64>,
    /// DC resistance, end to end of one half or section (the plan's `resistance_ohm`), Ω.
    pub ohms: Option<f64>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawMeasured {
    applied_volts: f64,
    idle_amps: Option<f64>,
    idle_watts: Option<f64>,
    temperature_c: Option<f64>,
    meter_pct: Option<f64>,
    ohms_pct: Option<f64>,
    #[serde(default)]
    winding: Vec<RawMeasuredWinding>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawMeasuredWinding {
    name: String,
    volts: Option<f64>,
    ohms: Option<f64>,
    /// Accepted so a file can note where a reading was taken; not used.
    #[allow(dead_code)]
    note: Option<String>,
    #[allow(dead_code)]
    lead_mm: Option<LengthInput>,
}

/// Reads and checks a measurement file against the plan's winding names.
pub fn parse_measured(text: &str, origin: &str, plan: &Plan) -> Result<Measured> {
    let raw: RawMeasured =
        toml::from_str(text).map_err(|e| crate::input::toml_error(origin, text, &e))?;
    let c = Checker::new(origin);
    let applied = c.range(
        "applied_volts",
        raw.applied_volts,
        0.0,
        false,
        100_000.0,
        "V",
    )?;
    let idle_amps = match raw.idle_amps {
        Some(a) => Some(c.range("idle_amps", a, 0.0, false, 10_000.0, "A")?),
        None => None,
    };
    let idle_watts = match raw.idle_watts {
        Some(w) => Some(c.range("idle_watts", w, 0.0, false, 1e6, "W")?),
        None => None,
    };
    let temperature = match raw.temperature_c {
        Some(t) => c.range("temperature_c", t, -40.0, true, 150.0, "°C")?,
        None => 20.0,
    };
    let meter = match raw.meter_pct {
        Some(p) => c.range("meter_pct", p, 0.0, false, 20.0, "%")?,
        None => 1.0,
    };
    let ohms_pct = match raw.ohms_pct {
        Some(p) => c.range("ohms_pct", p, 0.0, false, 50.0, "%")?,
        None => 2.0,
    };
    let mut windings: Vec<MeasuredWinding> = Vec::new();
    for (i, w) in raw.winding.iter().enumerate() {
        let at = format!("[[winding]] #{}", i + 1);
        if !plan.windings.iter().any(|p| p.name == w.name) {
            let names: Vec<String> = plan
                .windings
                .iter()
                .map(|p| format!("\"{}\"", p.name))
                .collect();
            return Err(c.fail(
                &format!("{at} name"),
                format!("\"{}\"", w.name),
                format!("must name a winding of the job: {}", names.join(", ")),
            ));
        }
        if windings.iter().any(|m| m.name == w.name) {
            return Err(c.fail(
                &format!("{at} name"),
                format!("\"{}\"", w.name),
                "each winding's readings once",
            ));
        }
        let key = |k: &str| format!("[[winding]] \"{}\" {k}", w.name);
        let volts = match w.volts {
            Some(v) => Some(c.range(&key("volts"), v, 0.0, true, 100_000.0, "V")?),
            None => None,
        };
        let ohms = match w.ohms {
            Some(r) => Some(c.range(&key("ohms"), r, 0.0, false, 1e6, "Ω")?),
            None => None,
        };
        windings.push(MeasuredWinding {
            name: w.name.clone(),
            volts,
            ohms,
        });
    }
    Ok(Measured {
        applied_volts: applied,
        idle_amps,
        idle_watts,
        temperature_c: temperature,
        meter_pct: meter,
        ohms_pct,
        windings,
    })
}

/// What a finding is (JSON `findings[].kind`).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum FindingKind {
    /// Within the meter's tolerance.
    AsPlanned,
    /// Turns miscounted.
    Turns,
    /// The wrong wire.
    Wire,
    /// A shorted turn (or a wrong lamination stack).
    ShortedTurn,
    /// A half or section joined the wrong way round.
    Reversed,
    /// The readings fit nothing the model knows.
    Unknown,
}

impl FindingKind {
    /// The key in JSON.
    pub fn key(self) -> &'static str {
        match self {
            FindingKind::AsPlanned => "as-planned",
            FindingKind::Turns => "turns",
            FindingKind::Wire => "wire",
            FindingKind::ShortedTurn => "shorted-turn",
            FindingKind::Reversed => "reversed",
            FindingKind::Unknown => "unknown",
        }
    }
}

/// The figures behind a finding.
#[derive(Debug, Clone, PartialEq)]
pub enum Evidence {
    /// Volts and ohms within tolerance, with the deviations, %.
    AsPlanned {
        /// Volts deviation, % (None when not read).
        volts_pct: Option<f64>,
        /// Ohms deviation at 20 °C, % (None when not read).
        ohms_pct: Option<f64>,
        /// The tolerances, %.
        tolerances: (f64, f64),
    },
    /// Turns: the reading, what the plan expects, the turns estimated and planned.
    Turns {
        /// Volts read.
        measured_volts: f64,
        /// Volts expected.
        expected_volts: f64,
        /// Turns estimated (real).
        estimated: f64,
        /// Turns planned.
        planned: u32,
        /// Every output is off by one ratio (the primary's miscount).
        all_outputs: bool,
        /// The resistance agrees with the estimate (None: not read).
        ohms_agree: Option<bool>,
        /// Another winding's miscount would read the same (both shown).
        alternative: bool,
        /// The outer layer's turns per layer, for the fix.
        turns_per_layer: u32,
    },
    /// Wire: the resistances and the sizes.
    Wire {
        /// Measured at 20 °C, Ω.
        r20: f64,
        /// Expected at 20 °C with the planned wire, Ω.
        expected: f64,
        /// The planned conductor's label.
        planned: String,
        /// The size that fits, as the plan writes sizes, with its system.
        fits: String,
    },
    /// Idle power or current against the prediction.
    ShortedTurn {
        /// Measured.
        measured: f64,
        /// Predicted.
        predicted: f64,
        /// Watts (true) or amps (false).
        watts: bool,
    },
    /// Series volts of halves or sections.
    Reversed {
        /// Measured.
        measured_volts: f64,
        /// Expected with all in the same sense.
        expected_volts: f64,
        /// Halves or sections.
        sections: u32,
        /// How many read reversed.
        reversed: u32,
    },
    /// Nothing fits: why.
    Unknown {
        /// Volts read.
        measured_volts: f64,
        /// Volts expected.
        expected_volts: f64,
    },
}

/// One finding.
#[derive(Debug, Clone, PartialEq)]
pub struct Finding {
    /// What it is.
    pub kind: FindingKind,
    /// The winding (the primary's name for a primary finding; empty for the core).
    pub winding: String,
    /// Turns estimated to be wound (turns findings).
    pub turns: Option<u32>,
    /// The wire estimated (wire findings), as the plan writes sizes.
    pub size: Option<String>,
    /// The figures.
    pub evidence: Evidence,
}

/// What `ironwind diagnose` reports.
#[derive(Debug, Clone, PartialEq)]
pub struct Diagnosis {
    /// The job's name.
    pub job: String,
    /// The readings.
    pub measured: Measured,
    /// Findings, the most likely first.
    pub findings: Vec<Finding>,
    /// Volts per turn the readings imply on this core (primary volts over its estimated turns).
    pub volts_per_turn: f64,
}

/// Compares the readings with the plan.
pub fn diagnose(plan: &Plan, m: &Measured) -> Diagnosis {
    let mut findings = Vec::new();
    let p_idx = plan
        .windings
        .iter()
        .position(|w| w.role == Role::Primary)
        .unwrap_or(0);
    let n_p = plan.windings[p_idx].turns.max(1) as f64;
    let turns = turns_findings(plan, m, p_idx, &mut findings);
    let primary_estimate = turns
        .iter()
        .find(|(i, _)| *i == p_idx)
        .map(|(_, n)| *n)
        .unwrap_or(n_p);
    wire_findings(plan, m, &turns, &mut findings);
    idle_findings(plan, m, p_idx, &mut findings);
    as_planned(plan, m, &mut findings);
    findings.sort_by_key(|f| rank(f.kind));
    Diagnosis {
        job: plan.name.clone(),
        measured: m.clone(),
        findings,
        volts_per_turn: m.applied_volts / primary_estimate,
    }
}

/// Most likely first: a reversed half reads far off, a miscount plainly, a wire by its ohms, a
/// shorted turn by a rough estimate; then what is as planned.
fn rank(k: FindingKind) -> u8 {
    match k {
        FindingKind::Reversed => 0,
        FindingKind::Turns => 1,
        FindingKind::Wire => 2,
        FindingKind::ShortedTurn => 3,
        FindingKind::Unknown => 4,
        FindingKind::AsPlanned => 5,
    }
}

fn reading<'a>(m: &'a Measured, name: &str) -> Option<&'a MeasuredWinding> {
    m.windings.iter().find(|w| w.name == name)
}

/// Each output's volts over what the plan expects at the applied volts (every half or section in
/// series), with its index.
fn output_ratios(plan: &Plan, m: &Measured, p_idx: usize) -> Vec<(usize, f64, f64)> {
    let n_p = plan.windings[p_idx].turns.max(1) as f64;
    plan.windings
        .iter()
        .enumerate()
        .filter(|(i, _)| *i != p_idx)
        .filter_map(|(i, w)| {
            let v = reading(m, &w.name)?.volts?;
            let expected = m.applied_volts * (w.sections as f64 * w.turns as f64) / n_p;
            (expected > 0.0).then_some((i, v, expected))
        })
        .collect()
}

/// Turns and reversed findings; returns the turns estimated per winding that is off.
fn turns_findings(
    plan: &Plan,
    m: &Measured,
    p_idx: usize,
    out: &mut Vec<Finding>,
) -> Vec<(usize, f64)> {
    let tol = m.meter_pct / 100.0 * std::f64::consts::SQRT_2;
    let mut ratios = output_ratios(plan, m, p_idx);
    // Halves or sections joined the wrong way round read far off the turns ratio.
    ratios.retain(|&(i, v, expected)| {
        let w = &plan.windings[i];
        match reversed_count(w.sections, v / expected, tol) {
            Some(rev) => {
                out.push(Finding {
                    kind: FindingKind::Reversed,
                    winding: w.name.clone(),
                    turns: None,
                    size: None,
                    evidence: Evidence::Reversed {
                        measured_volts: v,
                        expected_volts: expected,
                        sections: w.sections,
                        reversed: rev,
                    },
                });
                false
            }
            None => {
                if v < 0.05 * expected {
                    out.push(Finding {
                        kind: FindingKind::Unknown,
                        winding: w.name.clone(),
                        turns: None,
                        size: None,
                        evidence: Evidence::Unknown {
                            measured_volts: v,
                            expected_volts: expected,
                        },
                    });
                    return false;
                }
                true
            }
        }
    });
    let off: Vec<&(usize, f64, f64)> = ratios
        .iter()
        .filter(|(_, v, e)| (v / e - 1.0).abs() > tol)
        .collect();
    if off.is_empty() {
        return Vec::new();
    }
    let factors: Vec<f64> = ratios.iter().map(|(_, v, e)| v / e).collect();
    let mean = factors.iter().sum::<f64>() / factors.len() as f64;
    let common = ratios.len() >= 2 && factors.iter().all(|f| (f / mean - 1.0).abs() <= tol);
    if common {
        // Every output off by one ratio: the primary's turns.
        let (_, v, e) = ratios[0];
        return vec![primary_turns(plan, m, p_idx, mean, v, e, true, false, out)];
    }
    let mut estimates = Vec::new();
    for &&(i, v, e) in &off {
        let f = v / e;
        let own = output_turns(plan, m, i, f, v, e, ratios.len() == 1, out);
        if ratios.len() == 1 {
            // One output: the primary's miscount would read the same. Resistances decide which
            // goes first; only that one's turns are carried on to the wire check.
            let prim = primary_turns(plan, m, p_idx, f, v, e, false, true, out);
            if order_by_ohms(plan, m, p_idx, i, f, out) {
                estimates.push(prim);
                continue;
            }
        }
        estimates.push(own);
    }
    estimates
}

/// The number of halves or sections of `k` reversed that explains `ratio` (measured over expected):
/// (k − 2r)/k; None when all in the same sense fits best.
fn reversed_count(k: u32, ratio: f64, tol: f64) -> Option<u32> {
    if k < 2 {
        return None;
    }
    let band = tol.max(0.05);
    (1..=k / 2)
        .find(|&r| (ratio - (k - 2 * r) as f64 / k as f64).abs() <= band)
        .filter(|_| (ratio - 1.0).abs() > band)
}

/// What a turns finding says: the winding, the turns it seems to have, and the resistance ratio
/// those turns would give.
struct Miscount {
    winding: usize,
    estimated: f64,
    ohms_ratio: f64,
    all_outputs: bool,
    alternative: bool,
}

/// A turns finding from a reading `v` against `e`.
fn turns_finding(
    plan: &Plan,
    m: &Measured,
    c: Miscount,
    v: f64,
    e: f64,
    out: &mut Vec<Finding>,
) -> (usize, f64) {
    let w = &plan.windings[c.winding];
    let tol = m.ohms_pct / 100.0 + 0.02;
    let ohms_agree = resistance_ratio(plan, m, c.winding).map(|r| (r - c.ohms_ratio).abs() <= tol);
    out.push(Finding {
        kind: FindingKind::Turns,
        winding: w.name.clone(),
        turns: Some(c.estimated.round().max(0.0) as u32),
        size: None,
        evidence: Evidence::Turns {
            measured_volts: v,
            expected_volts: e,
            estimated: c.estimated,
            planned: w.turns,
            all_outputs: c.all_outputs,
            ohms_agree,
            alternative: c.alternative,
            turns_per_layer: w.coil.turns_per_layer,
        },
    });
    (c.winding, c.estimated)
}

/// A turns finding on output `i`, reading `f` × the plan: N_s ≈ N_s,plan·f.
#[allow(clippy::too_many_arguments)]
fn output_turns(
    plan: &Plan,
    m: &Measured,
    i: usize,
    f: f64,
    v: f64,
    e: f64,
    alternative: bool,
    out: &mut Vec<Finding>,
) -> (usize, f64) {
    let c = Miscount {
        winding: i,
        estimated: plan.windings[i].turns as f64 * f,
        ohms_ratio: f,
        all_outputs: false,
        alternative,
    };
    turns_finding(plan, m, c, v, e, out)
}

/// A turns finding on the primary: the outputs read `f` × the plan, so N_p ≈ N_p,plan / f.
#[allow(clippy::too_many_arguments)]
fn primary_turns(
    plan: &Plan,
    m: &Measured,
    p_idx: usize,
    f: f64,
    v: f64,
    e: f64,
    all_outputs: bool,
    alternative: bool,
    out: &mut Vec<Finding>,
) -> (usize, f64) {
    let c = Miscount {
        winding: p_idx,
        estimated: plan.windings[p_idx].turns as f64 / f,
        ohms_ratio: 1.0 / f,
        all_outputs,
        alternative,
    };
    turns_finding(plan, m, c, v, e, out)
}

/// With one output off, the two explanations are both in `out` (output, then primary): the one
/// whose resistance agrees goes first. True when that is the primary.
fn order_by_ohms(
    plan: &Plan,
    m: &Measured,
    p_idx: usize,
    i: usize,
    f: f64,
    out: &mut [Finding],
) -> bool {
    let tol = m.ohms_pct / 100.0 + 0.02;
    let output_fits = resistance_ratio(plan, m, i).map(|r| (r - f).abs() <= tol);
    let primary_fits = resistance_ratio(plan, m, p_idx).map(|r| (r - 1.0 / f).abs() <= tol);
    let primary_first = matches!(
        (output_fits, primary_fits),
        (Some(false) | None, Some(true)) | (Some(false), None)
    );
    if primary_first {
        let n = out.len();
        if n >= 2 {
            out.swap(n - 2, n - 1);
        }
    }
    primary_first
}

/// The measured resistance at 20 °C over the plan's, for winding `i`.
fn resistance_ratio(plan: &Plan, m: &Measured, i: usize) -> Option<f64> {
    let w = &plan.windings[i];
    let r = reading(m, &w.name)?.ohms?;
    let r20 = r / temperature_factor(m.temperature_c);
    (w.resistance_20c_ohm > 0.0).then(|| r20 / w.resistance_20c_ohm)
}

/// Wire findings: each winding's resistance at the turns it settled on.
fn wire_findings(plan: &Plan, m: &Measured, turns: &[(usize, f64)], out: &mut Vec<Finding>) {
    for (i, w) in plan.windings.iter().enumerate() {
        let Some(r) = reading(m, &w.name).and_then(|x| x.ohms) else {
            continue;
        };
        if w.kept {
            continue;
        }
        let n = turns
            .iter()
            .find(|(j, _)| *j == i)
            .map(|(_, n)| *n)
            .unwrap_or(w.turns as f64);
        let r20 = r / temperature_factor(m.temperature_c);
        let expected = w.resistance_20c_ohm * n / w.turns.max(1) as f64;
        if expected <= 0.0 || (r20 / expected - 1.0).abs() <= m.ohms_pct / 100.0 {
            continue;
        }
        // The copper that would give this resistance at these turns, per strand.
        let area = w.wire.area_mm2() * expected / r20 / w.wire.strands as f64;
        let fits = nearest_size(plan, &w.wire.conductor, area);
        out.push(Finding {
            kind: FindingKind::Wire,
            winding: w.name.clone(),
            turns: None,
            size: Some(fits.clone()),
            evidence: Evidence::Wire {
                r20,
                expected,
                planned: w.wire.conductor.size_label(),
                fits,
            },
        });
    }
}

/// The size of the plan's wire system whose copper area is nearest `area` (in log terms).
fn nearest_size(plan: &Plan, planned: &Conductor, area: f64) -> String {
    let system = match planned {
        Conductor::Round(r) => r.system,
        _ => plan.system,
    };
    sizes(system, plan.grade)
        .iter()
        .min_by(|a, b| {
            (a.area_mm2 / area)
                .ln()
                .abs()
                .total_cmp(&(b.area_mm2 / area).ln().abs())
        })
        .map(|s| s.size.clone())
        .unwrap_or_default()
}

/// Idle power or current far above the prediction: a shorted turn.
fn idle_findings(plan: &Plan, m: &Measured, p_idx: usize, out: &mut Vec<Finding>) {
    let rated = plan.drive.primary_rms_volts;
    let scale = (m.applied_volts / rated).powi(2);
    let primary = plan.windings[p_idx].name.clone();
    if let Some(w) = m.idle_watts {
        let predicted = plan.losses.core_w * scale;
        if predicted > 0.0 && w > SHORTED_RATIO * predicted {
            out.push(shorted(&primary, w, predicted, true));
            return;
        }
    }
    if let (Some(a), Some(pred)) = (m.idle_amps, plan.drive.no_load_amps) {
        let predicted = pred * m.applied_volts / rated;
        if predicted > 0.0 && a > SHORTED_RATIO * predicted {
            out.push(shorted(&primary, a, predicted, false));
        }
    }
}

fn shorted(primary: &str, measured: f64, predicted: f64, watts: bool) -> Finding {
    Finding {
        kind: FindingKind::ShortedTurn,
        winding: primary.to_string(),
        turns: None,
        size: None,
        evidence: Evidence::ShortedTurn {
            measured,
            predicted,
            watts,
        },
    }
}

/// Every winding read and found nothing wrong: as planned, with its margins.
fn as_planned(plan: &Plan, m: &Measured, out: &mut Vec<Finding>) {
    let p_idx = plan
        .windings
        .iter()
        .position(|w| w.role == Role::Primary)
        .unwrap_or(0);
    let n_p = plan.windings[p_idx].turns.max(1) as f64;
    for (i, w) in plan.windings.iter().enumerate() {
        if out
            .iter()
            .any(|f| f.winding == w.name && f.kind != FindingKind::ShortedTurn)
        {
            continue;
        }
        let Some(r) = reading(m, &w.name) else {
            continue;
        };
        let volts_pct = r.volts.filter(|_| i != p_idx).map(|v| {
            let e = m.applied_volts * w.sections as f64 * w.turns as f64 / n_p;
            (v / e - 1.0) * 100.0
        });
        let ohms_pct = resistance_ratio(plan, m, i).map(|x| (x - 1.0) * 100.0);
        if volts_pct.is_none() && ohms_pct.is_none() {
            continue;
        }
        out.push(Finding {
            kind: FindingKind::AsPlanned,
            winding: w.name.clone(),
            turns: None,
            size: None,
            evidence: Evidence::AsPlanned {
                volts_pct,
                ohms_pct,
                tolerances: (m.meter_pct, m.ohms_pct),
            },
        });
    }
}
