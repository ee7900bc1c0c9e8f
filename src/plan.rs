//! Job → Plan: turns, currents, wire, layout, losses, heating, checks, warnings and cautions.
//!
//! The model of DESIGN.md (v1):
//! - primary turns N_p = ceil(exact N from the EMF equation at the design flux); the actual flux is
//!   recomputed from N_p;
//! - volts per turn v = V_p,rms / N_p; each output gets the smallest whole N_s whose full-load voltage
//!   N_s·v − I_s·(R_s + R_p·(N_s/N_p)²) reaches its target (resistive load, leakage reactance
//!   neglected, hot resistances). The full-load voltage is concave in N_s: when even its maximum falls
//!   short, the output check fails and the plan shows the most the winding delivers;
//! - primary current from the power balance I_p·V_p = P_out + P_cu,out + P_core + I_p²·R_p;
//! - kept donor windings take their turns from the test winding's volts per turn; a kept output sets
//!   the largest N_p for which it still reaches its target.
//!
//! Wire, layout and resistance depend on the turns and the primary current, and those on the
//! resistances, so the plan iterates to a fixed point (it settles in a few rounds; a repeat of a
//! state ends the loop).

use crate::error::{Error, Result};
use crate::geometry::{geometry, CoreDims, CoreGeometry, Shape};
use crate::job::{Job, Role};
use crate::layout::{layout, CoilInput, CoilLayout, Layout};
use crate::losses::{
    box_surface_cm2, copper_mass_g, efficiency, regulation_pct, resistance_ohm, rise_c,
    temperature_factor,
};
use crate::magnetics::{ceil_turns, core_loss_w, SteelInfo, Waveform, MAX_FLUX_T};
use crate::probe::{donor_flux_notes, no_load_amps, sweep_report, test_report};
use crate::wire::{choose, Conductor, WireChoice};

/// Window fill above which hand winding gets hard (McLyman's window utilisation Ku = 0.4).
pub const HAND_FILL_LIMIT: f64 = 0.4;
/// Primary current above which leads and strands deserve a warning, A (common practice).
pub const HIGH_CURRENT_A: f64 = 30.0;

/// The cautions every plan and card shows.
pub const CAUTIONS: &[&str] = &[
    "Mains windings, inverter outputs and a microwave-oven donor's windings carry voltages that can kill. Work only with everything unplugged and capacitors discharged.",
    "A microwave-oven donor: remove its high-voltage winding (and the magnetic shunts) before anything else; never power the core with that winding in place.",
    "Power every probe test and the first run only through a fuse and a current limit: a series lamp or an isolating variable transformer.",
    "Keep test leads insulated and clipped on before power is applied; keep one hand away from the circuit.",
    "Fuse the primary and fit a thermal cut-out against the coil; check the temperature by hand-held thermometer at the first runs.",
    "Insulation between a mains winding and anything that can be touched must follow your local code and the transformer safety standards (IEC 61558 family or the national equivalent).",
    "ironwind computes estimates. It does not certify a design as safe; defer to local codes and licensed practice.",
];

/// The drive of the primary.
#[derive(Debug, Clone, PartialEq)]
pub struct Drive {
    /// Frequency, Hz.
    pub frequency_hz: f64,
    /// Waveform.
    pub waveform: Waveform,
    /// Actual peak flux density with the whole primary turns, T.
    pub flux_density_t: f64,
    /// The flux the design aimed at, T.
    pub design_flux_t: f64,
    /// Where the design flux came from.
    pub flux_source: String,
    /// The flux ceiling the flux check compares with, T.
    pub flux_limit_t: f64,
    /// Volts per turn (RMS).
    pub volts_per_turn: f64,
    /// Primary RMS volts.
    pub primary_rms_volts: f64,
    /// Primary full-load current, A RMS.
    pub primary_amps: f64,
    /// Predicted no-load (magnetising) current of the primary, A RMS, when a sweep is known.
    pub no_load_amps: Option<f64>,
    /// Actual flux over the donor's measured flux, when a test winding is known.
    pub flux_vs_donor: Option<f64>,
    /// How the drive compares with the donor's own sine, when a kept output sets the turns.
    pub kept_output_note: Option<String>,
}

/// A tap on an output.
#[derive(Debug, Clone, PartialEq)]
pub struct Tap {
    /// Target volts at full load, RMS.
    pub volts: f64,
    /// Turn number, counted from the start lead.
    pub turn: u32,
}

/// One planned winding.
#[derive(Debug, Clone, PartialEq)]
pub struct WindingPlan {
    /// Name.
    pub name: String,
    /// Role.
    pub role: Role,
    /// Whether the donor's winding is kept.
    pub kept: bool,
    /// Whether its resistance was measured (a kept winding with `resistance_ohm`).
    pub resistance_measured: bool,
    /// Target volts (amplitude for a square-driven primary).
    pub volts: f64,
    /// Full-load current, A RMS.
    pub amps: f64,
    /// Turns.
    pub turns: u32,
    /// Wire.
    pub wire: WireChoice,
    /// Enamel grade label (`grade 2`, `heavy build`, `strip`).
    pub grade_label: &'static str,
    /// Current density at full load, A/mm².
    pub current_density_a_mm2: f64,
    /// Layout on the bobbin (the first leg's half-coil for `ui`).
    pub coil: CoilLayout,
    /// Wound length, m.
    pub length_m: f64,
    /// Length to cut including two leads, m (per strand).
    pub cut_length_m: f64,
    /// Resistance at the hot temperature, Ω.
    pub resistance_ohm: f64,
    /// Resistance at 20 °C, Ω.
    pub resistance_20c_ohm: f64,
    /// Copper loss at full load, W.
    pub copper_loss_w: f64,
    /// Copper mass of the cut length, all strands, g.
    pub copper_mass_g: f64,
    /// No-load volts (RMS).
    pub volts_no_load: f64,
    /// Full-load volts (RMS).
    pub volts_full_load: f64,
    /// The most this winding can deliver at full load, V (outputs only).
    pub max_volts_full_load: Option<f64>,
    /// Taps.
    pub taps: Vec<Tap>,
}

/// The window.
#[derive(Debug, Clone, PartialEq)]
pub struct WindowPlan {
    /// Copper area over window area.
    pub copper_fill: f64,
    /// Total build, mm.
    pub build_mm: f64,
    /// Build available, mm.
    pub available_mm: f64,
    /// Traverse, mm.
    pub traverse_mm: f64,
    /// Fits.
    pub fits: bool,
}

/// Losses.
#[derive(Debug, Clone, PartialEq)]
pub struct LossPlan {
    /// Core loss (estimate), W.
    pub core_w: f64,
    /// Copper loss, W.
    pub copper_w: f64,
    /// Output power at full load, W.
    pub output_w: f64,
    /// Efficiency, fraction.
    pub efficiency: f64,
    /// Regulation, %.
    pub regulation_pct: f64,
}

/// Heating.
#[derive(Debug, Clone, PartialEq)]
pub struct Thermal {
    /// Surface area, cm².
    pub surface_cm2: f64,
    /// Temperature rise, °C.
    pub rise_c: f64,
    /// Ambient, °C.
    pub ambient_c: f64,
    /// Hot winding temperature ambient + rise, °C.
    pub hot_c: f64,
    /// The temperature resistances are taken at (ambient + max rise), °C.
    pub resistance_at_c: f64,
    /// Allowed rise, °C.
    pub max_rise_c: f64,
}

/// What the probe told the plan.
#[derive(Debug, Clone, PartialEq)]
pub struct ProbePlan {
    /// Measured volts per turn.
    pub volts_per_turn: Option<f64>,
    /// Flux the donor ran at, T.
    pub donor_flux_t: Option<f64>,
    /// IEC knee voltage on the swept winding, V.
    pub knee_volts: Option<f64>,
    /// IEC knee flux, T.
    pub knee_flux_t: Option<f64>,
    /// 45° tangent flux, T.
    pub tangent_flux_t: Option<f64>,
    /// Recommended maximum flux, T.
    pub recommended_flux_t: Option<f64>,
}

/// One check of the verdict.
#[derive(Debug, Clone, PartialEq)]
pub struct Check {
    /// Its name.
    pub name: String,
    /// Whether it passes.
    pub ok: bool,
    /// One line of detail.
    pub detail: String,
}

/// The verdict.
#[derive(Debug, Clone, PartialEq)]
pub struct Verdict {
    /// All checks pass.
    pub ok: bool,
    /// The checks.
    pub checks: Vec<Check>,
}

impl Verdict {
    /// The names of the checks that fail, in order.
    pub fn failed(&self) -> Vec<&str> {
        self.checks
            .iter()
            .filter(|c| !c.ok)
            .map(|c| c.name.as_str())
            .collect()
    }
}

/// The whole plan.
#[derive(Debug, Clone, PartialEq)]
pub struct Plan {
    /// Job name.
    pub name: String,
    /// The core's measurements.
    pub core: CoreDims,
    /// Geometry.
    pub geometry: CoreGeometry,
    /// Steel.
    pub steel: SteelInfo,
    /// Drive.
    pub drive: Drive,
    /// Windings, innermost first.
    pub windings: Vec<WindingPlan>,
    /// Window.
    pub window: WindowPlan,
    /// Losses.
    pub losses: LossPlan,
    /// Heating.
    pub thermal: Thermal,
    /// Probe results.
    pub probe: Option<ProbePlan>,
    /// Verdict.
    pub verdict: Verdict,
    /// Warnings.
    pub warnings: Vec<String>,
    /// Cautions.
    pub cautions: &'static [&'static str],
    /// The current density limit, A/mm².
    pub current_density_limit_a_mm2: f64,
    /// Layout settings used.
    pub settings: crate::layout::LayoutSettings,
    /// Lead length per end, m.
    pub lead_m: f64,
    /// Wire system for automatic choices.
    pub system: crate::wire::System,
    /// Enamel grade.
    pub grade: crate::wire::Grade,
    /// Thickest single strand, mm.
    pub max_strand_mm: f64,
}

/// The smallest whole N with N·v − I·(a·N + b·N²) ≥ target, or (the best N, false) when the maximum
/// falls short. `a` is the winding's own resistance per turn, `b` = R_p/N_p².
pub fn smallest_turns(target: f64, v: f64, amps: f64, a: f64, b: f64) -> (u32, bool) {
    let f = |n: f64| n * v - amps * (a * n + b * n * n);
    let lin = v - amps * a;
    if lin <= 0.0 {
        return (1, false);
    }
    let quad = amps * b;
    let exact = if quad <= 0.0 {
        target / lin
    } else {
        let disc = lin * lin - 4.0 * quad * target;
        if disc < 0.0 {
            let peak = lin / (2.0 * quad);
            let lo = peak.floor().max(1.0);
            let best = if f(lo + 1.0) > f(lo) { lo + 1.0 } else { lo };
            return (best.min(1e7) as u32, false);
        }
        2.0 * target / (lin + disc.sqrt())
    };
    if !exact.is_finite() || exact > 1e7 {
        return (1, false);
    }
    let mut n = ceil_turns(exact);
    while n > 1 && f((n - 1) as f64) >= target {
        n -= 1;
    }
    let mut guard = 0;
    while f(n as f64) < target * (1.0 - 1e-12) && guard < 4 {
        n += 1;
        guard += 1;
    }
    (n, f(n as f64) >= target * (1.0 - 1e-12))
}

struct State {
    turns: Vec<u32>,
    wires: Vec<WireChoice>,
    primary_amps: f64,
    n_p: u32,
}

/// Plans a job. Never fails on a checked job: a design that does not work is a verdict.
pub fn plan(job: &Job) -> Plan {
    plan_with(job, true)
}

/// Plans a job for a search (capacity, shelf ranking): every number and check as [`plan`], without
/// the words — check details and warnings are left empty, which is most of a plan's cost.
pub fn plan_lean(job: &Job) -> Plan {
    plan_with(job, false)
}

fn plan_with(job: &Job, words: bool) -> Plan {
    // Formats only when the plan is for a person.
    macro_rules! say {
        ($($t:tt)*) => {
            if words { format!($($t)*) } else { String::new() }
        };
    }
    let g = geometry(&job.core);
    let ae = g.area_net_mm2;
    let f = job.frequency_hz;
    let wf = job.waveform;
    let p_idx = job.primary_index();
    let primary = &job.windings[p_idx];
    let v_p_rms = wf.rms_volts(primary.volts);
    let hot_c = job.ambient_c + job.max_rise_c;
    let mut warnings: Vec<String> = Vec::new();

    // Probe results.
    let test = job
        .probe
        .as_ref()
        .and_then(|p| p.test.as_ref())
        .map(|t| (t, test_report(t, f, ae)));
    let sweep = job.probe.as_ref().and_then(|p| p.sweep.as_ref());
    let sweep_rep =
        sweep.map(|s| sweep_report(&s.curve, s.knees, s.turns, f, ae, g.path_length_mm));
    if let Some((_, r)) = &test {
        warnings.extend(donor_flux_notes(r.donor_flux_t));
    }

    // Design flux and its source.
    let steel_flux = job.steel.design_flux_t;
    let recommended = sweep_rep.as_ref().and_then(|r| r.recommended_flux_t);
    if sweep.is_some() && recommended.is_none() {
        warnings.push("the sweep does not reach the IEC knee (10 % more volts never gave 50 % more current inside it): the flux cap is not known; sweep higher".to_string());
    }
    let (design_flux, source) = match (job.flux_density_t, recommended) {
        (Some(b), Some(rec)) if b > rec => {
            warnings.push(say!(
                "the given flux {b:.2} T is above the sweep's recommended {rec:.2} T (0.9 × the IEC knee): kept as given, expect a high idle current"
            ));
            (
                b,
                "given in the job (above the sweep's recommendation)".to_string(),
            )
        }
        (Some(b), _) => (b, "given in the job".to_string()),
        (None, Some(rec)) if rec < steel_flux => (rec, "sweep: 0.9 × the IEC knee".to_string()),
        (None, _) => (steel_flux, format!("steel default ({})", job.steel.name)),
    };
    let flux_limit = design_flux.min(MAX_FLUX_T);

    // Kept windings.
    let v_meas = test.as_ref().map(|(t, _)| t.volts_per_turn());
    let kept_idx = job.windings.iter().position(|w| w.kept);
    let kept_turns = |i: usize| -> u32 {
        let w = &job.windings[i];
        let rated = w.rated_volts.unwrap_or_else(|| match test.as_ref() {
            Some((t, _)) if t.applied_to.as_deref() == Some(w.name.as_str()) => t.applied_volts,
            _ => w.volts,
        });
        let vm = v_meas.unwrap_or(1.0);
        (rated / vm).round().clamp(1.0, 1e7) as u32
    };

    // Primary turns before the loop.
    let mut n_p = match kept_idx {
        Some(k) if k == p_idx => kept_turns(k),
        _ => ceil_turns(wf.turns_exact(primary.volts, f, design_flux, ae)).min(10_000_000),
    };
    if let Some(k) = kept_idx.filter(|&k| k != p_idx) {
        // Start from the measured volts per turn: N_p ≈ V_p / (V_k / N_k).
        let nk = kept_turns(k) as f64;
        n_p = (v_p_rms * nk / job.windings[k].volts)
            .floor()
            .clamp(1.0, 1e7) as u32;
    }

    let grade_label = |w: &WireChoice| match &w.conductor {
        Conductor::Round(r) => job.grade.label(r.system),
        Conductor::Strip { .. } => "strip, insulated",
    };

    let p_out_guess: f64 = job
        .windings
        .iter()
        .filter(|w| w.role == Role::Secondary)
        .map(|w| w.volts * w.amps)
        .sum();
    let mut st = State {
        turns: job
            .windings
            .iter()
            .enumerate()
            .map(|(i, w)| {
                if i == p_idx {
                    n_p
                } else if w.kept {
                    kept_turns(i)
                } else {
                    ceil_turns(w.volts * n_p as f64 / v_p_rms).min(10_000_000)
                }
            })
            .collect(),
        wires: Vec::new(),
        primary_amps: p_out_guess / v_p_rms / 0.9,
        n_p,
    };

    let mut seen: Vec<(Vec<u32>, u64)> = Vec::new();
    let mut lay: Layout;
    let mut r_hot: Vec<f64>;
    let mut core_w;
    let mut flux;
    let mut v_turn;
    let mut max_fl: Vec<Option<f64>>;
    let mut primary_ok;
    let mut iterations = 0;
    let mut final_pass = false;
    loop {
        iterations += 1;
        flux = wf.flux_t(primary.volts, f, st.n_p as f64, ae);
        v_turn = v_p_rms / st.n_p as f64;
        core_w = core_loss_w(g.mass_kg, job.steel.loss_w_per_kg_1t5, flux, f);
        // Wires from currents.
        st.wires = job
            .windings
            .iter()
            .enumerate()
            .map(|(i, w)| {
                let amps = if i == p_idx { st.primary_amps } else { w.amps };
                choose(
                    amps,
                    job.current_density_a_mm2,
                    job.system,
                    job.grade,
                    job.max_strand_mm,
                    &w.wire,
                )
            })
            .collect();
        let coils: Vec<CoilInput> = job
            .windings
            .iter()
            .zip(&st.wires)
            .zip(&st.turns)
            .map(|((w, wire), &n)| CoilInput {
                turns: n,
                strands: wire.strands,
                traverse_mm: wire.conductor.traverse_mm(),
                build_mm: wire.conductor.build_mm(),
                area_mm2: wire.conductor.area_mm2(),
                measured_build_mm: w.build_mm,
                stacked: matches!(wire.conductor, Conductor::Strip { .. }),
            })
            .collect();
        lay = layout(&job.core, &job.settings_layout(), &coils);
        // Resistance per turn (hot) of each winding.
        let per_turn: Vec<f64> = job
            .windings
            .iter()
            .zip(&st.wires)
            .zip(&lay.coils)
            .zip(&st.turns)
            .map(|(((w, wire), c), &n)| match w.resistance_ohm {
                Some(r20) => r20 * temperature_factor(hot_c) / n as f64,
                None => resistance_ohm(c.mean_turn_mm / 1000.0, wire.area_mm2(), hot_c),
            })
            .collect();
        r_hot = per_turn
            .iter()
            .zip(&st.turns)
            .map(|(r, &n)| r * n as f64)
            .collect();
        let r_p = r_hot[p_idx];
        let b = r_p / (st.n_p as f64 * st.n_p as f64);
        // Output full-load volts and power.
        let mut p_out = 0.0;
        let mut p_cu_out = 0.0;
        for (i, w) in job.windings.iter().enumerate() {
            if i == p_idx {
                continue;
            }
            let n = st.turns[i] as f64;
            let vfl = n * v_turn - w.amps * (r_hot[i] + b * n * n);
            p_out += vfl.max(0.0) * w.amps;
            p_cu_out += w.amps * w.amps * r_hot[i];
        }
        let need = p_out + p_cu_out + core_w;
        let disc = v_p_rms * v_p_rms - 4.0 * r_p * need;
        let i_p = if r_p <= 0.0 {
            need / v_p_rms
        } else if disc >= 0.0 {
            2.0 * need / (v_p_rms + disc.sqrt())
        } else {
            v_p_rms / (2.0 * r_p)
        };
        primary_ok = disc >= 0.0;
        // New turns.
        let mut turns = st.turns.clone();
        max_fl = vec![None; job.windings.len()];
        let mut new_np = st.n_p;
        if let Some(k) = kept_idx.filter(|&k| k != p_idx) {
            // The kept output sets N_p: largest N_p with N_k·V/N_p − I_k(R_k + r_p·N_k²/N_p) ≥ V_k.
            let wk = &job.windings[k];
            let nk = st.turns[k] as f64;
            let r_p_turn = per_turn[p_idx];
            let num = nk * v_p_rms - wk.amps * r_p_turn * nk * nk;
            let den = wk.volts + wk.amps * r_hot[k];
            new_np = if num > 0.0 {
                ((num / den * (1.0 + 1e-12)).floor().clamp(1.0, 1e7)) as u32
            } else {
                1
            };
            turns[p_idx] = new_np;
        }
        for (i, w) in job.windings.iter().enumerate() {
            if i == p_idx {
                continue;
            }
            let n = st.turns[i] as f64;
            let a = per_turn[i];
            let lin = v_turn - w.amps * a;
            let peak = if b > 0.0 && w.amps > 0.0 {
                lin / (2.0 * w.amps * b)
            } else {
                f64::INFINITY
            };
            let best_n = if peak.is_finite() {
                peak.round().max(1.0)
            } else {
                n
            };
            let fl = |x: f64| x * v_turn - w.amps * (a * x + b * x * x);
            max_fl[i] = Some(if peak.is_finite() {
                fl(best_n)
            } else {
                f64::INFINITY
            });
            if w.kept {
                continue;
            }
            let (ns, _ok) = smallest_turns(w.volts, v_turn, w.amps, a, b);
            turns[i] = ns.min(10_000_000);
        }
        let key = (turns.clone(), (i_p * 1e6).round() as u64);
        let settled = turns == st.turns && (i_p - st.primary_amps).abs() <= 1e-9 * i_p.max(1e-9);
        let repeat = seen.contains(&key);
        st.primary_amps = i_p;
        if settled || final_pass {
            break;
        }
        if repeat || iterations >= 60 {
            // A cycle (a wire size or a layer flipping at a boundary): settle on the turns that meet
            // every target (the larger output counts, the smaller primary under a kept output) and
            // evaluate that state once more, so every figure reported belongs to one layout.
            for (i, w) in job.windings.iter().enumerate() {
                if i != p_idx && !w.kept {
                    turns[i] = turns[i].max(st.turns[i]);
                }
            }
            st.turns = turns;
            st.n_p = new_np.min(st.n_p);
            st.turns[p_idx] = st.n_p;
            final_pass = true;
            continue;
        }
        seen.push(key);
        st.turns = turns;
        st.n_p = new_np;
    }

    // Final figures from the settled state.
    let r_p = r_hot[p_idx];
    let b = r_p / (st.n_p as f64 * st.n_p as f64);
    let mut windings = Vec::with_capacity(job.windings.len());
    let mut p_out = 0.0;
    let mut p_cu = 0.0;
    for (i, w) in job.windings.iter().enumerate() {
        let n = st.turns[i];
        let wire = st.wires[i].clone();
        let mut coil = lay.coils[i].clone();
        coil.fill_checkpoints();
        let amps = if i == p_idx { st.primary_amps } else { w.amps };
        let length_m = n as f64 * coil.mean_turn_mm / 1000.0;
        let cut = length_m + 2.0 * job.lead_m;
        let r = r_hot[i];
        let cu = amps * amps * r;
        p_cu += cu;
        let (v_nl, v_fl) = if i == p_idx {
            (v_p_rms, v_p_rms - amps * r)
        } else {
            let nf = n as f64;
            (nf * v_turn, nf * v_turn - w.amps * (r + b * nf * nf))
        };
        if i != p_idx {
            p_out += v_fl.max(0.0) * w.amps;
        }
        let taps = w
            .taps_volts
            .iter()
            .map(|&tv| {
                let a = r / n as f64;
                let (t, _) = smallest_turns(tv, v_turn, w.amps, a, b);
                Tap {
                    volts: tv,
                    turn: t.min(n),
                }
            })
            .collect();
        windings.push(WindingPlan {
            name: w.name.clone(),
            role: w.role,
            kept: w.kept,
            resistance_measured: w.resistance_ohm.is_some(),
            volts: w.volts,
            amps,
            turns: n,
            grade_label: grade_label(&wire),
            current_density_a_mm2: amps / wire.area_mm2(),
            resistance_20c_ohm: r / temperature_factor(hot_c),
            copper_mass_g: copper_mass_g(cut, wire.area_mm2()),
            wire,
            coil,
            length_m,
            cut_length_m: cut,
            resistance_ohm: r,
            copper_loss_w: cu,
            volts_no_load: v_nl,
            volts_full_load: v_fl,
            max_volts_full_load: if i == p_idx { None } else { max_fl[i] },
            taps,
        });
    }

    // Heating.
    let total_build = lay.build_mm;
    let (box_w, box_h) = match job.core.shape {
        Shape::Ei => (g.outline_width_mm, g.outline_height_mm),
        Shape::Ui => (
            2.0 * job.core.tongue_mm + job.core.window_width_mm + 2.0 * total_build,
            g.outline_height_mm,
        ),
    };
    let surface = box_surface_cm2(box_w, box_h, job.core.stack_mm + 2.0 * total_build);
    // Intermittent load: the copper loss averaged over time; forced air: more surface, in effect.
    let rise = rise_c(p_cu * job.load_duty + core_w, surface * job.cooling_factor);

    // Drive extras.
    let no_load = sweep.map(|s| no_load_amps(s, f, ae, flux, st.n_p));
    let flux_vs_donor = test.as_ref().map(|(_, r)| flux / r.donor_flux_t);

    // Warnings.
    if let (Some(rep), Some(knee)) = (&sweep_rep, sweep_rep.as_ref().and_then(|r| r.knee_flux_t)) {
        let rec = rep.recommended_flux_t.unwrap_or(knee);
        if flux > rec * (1.0 + 1e-9) {
            warnings.push(say!(
                "planned flux {flux:.2} T is above the knee margin {rec:.2} T (0.9 × the IEC knee {knee:.2} T): the idle current will be high and the core may saturate"
            ));
        }
    }
    if let (Some((_, r)), None) = (&test, kept_idx) {
        if flux > r.donor_flux_t * (1.0 + 1e-9) {
            warnings.push(say!(
                "planned flux {flux:.2} T is above the {:.2} T the donor ran at",
                r.donor_flux_t
            ));
        }
    }
    let mut kept_note = None;
    if let (Some(k), Some((_, r))) = (kept_idx.filter(|&k| k != p_idx), &test) {
        let ratio = flux / r.donor_flux_t;
        let note = match wf {
            Waveform::Sine => format!(
                "kept output \"{}\": sine drive at {:.4} V per turn; the core runs at {flux:.3} T against the donor's {:.3} T (×{ratio:.3})",
                job.windings[k].name, v_turn, r.donor_flux_t
            ),
            _ => format!(
                "kept output \"{}\": a square drive at the donor's RMS volts per turn runs the core at 4.443/4 = 1.11 × the sine flux it was built for{}; here {flux:.3} T against the donor's {:.3} T (×{ratio:.3})",
                job.windings[k].name,
                match wf {
                    Waveform::QuasiSquare { duty } => format!(", times √δ = {:.3} for quasi-square at duty {duty}", duty.sqrt()),
                    _ => String::new(),
                },
                r.donor_flux_t
            ),
        };
        let knee_known = sweep_rep
            .as_ref()
            .and_then(|s| s.recommended_flux_t)
            .is_some();
        if !knee_known && ratio > 1.0 + 1e-9 {
            warnings.push(say!(
                "the core runs at {ratio:.2} × the flux the donor was built for and no sweep shows the knee margin: sweep the kept winding before relying on it"
            ));
        }
        kept_note = Some(note);
    }
    if lay.copper_fill > HAND_FILL_LIMIT {
        warnings.push(say!(
            "copper fill {:.2} is above {HAND_FILL_LIMIT:.2} (McLyman's window utilisation): hard to wind by hand",
            lay.copper_fill
        ));
    }
    if st.primary_amps > HIGH_CURRENT_A {
        warnings.push(say!(
            "the primary draws {:.0} A at full load: use parallel strands or strip, and thick, short leads",
            st.primary_amps
        ));
    }
    if matches!(wf, Waveform::Square | Waveform::QuasiSquare { .. }) {
        warnings.push("square and quasi-square drives add eddy loss and harmonics the core-loss estimate leaves out; fuse for the bridge's peak current".to_string());
    }
    for w in &windings {
        if w.wire.strands > 1
            && matches!(w.wire.conductor, Conductor::Round(_))
            && w.wire.strands > 8
        {
            warnings.push(say!(
                "\"{}\" needs {} strands in hand: consider strip conductor (strip_mm)",
                w.name,
                w.wire.strands
            ));
        }
    }

    // Verdict.
    let mut checks = Vec::new();
    checks.push(Check {
        name: "flux".to_string(),
        ok: flux <= flux_limit * (1.0 + 1e-9),
        detail: say!("{flux:.3} T peak, limit {flux_limit:.2} T ({source})"),
    });
    checks.push(Check {
        name: "window".to_string(),
        ok: lay.fits,
        detail: if lay.coils.iter().any(|c| c.turns_per_layer == 0) {
            "a winding cannot get a single turn on a layer".to_string()
        } else {
            say!(
                "build {:.2} mm of {:.2} mm available; copper fill {:.2}",
                lay.build_mm,
                lay.available_mm,
                lay.copper_fill
            )
        },
    });
    checks.push(Check {
        name: "heating".to_string(),
        ok: rise <= job.max_rise_c * (1.0 + 1e-9),
        detail: say!("rise {rise:.1} °C, limit {:.0} °C", job.max_rise_c),
    });
    let worst_j = windings
        .iter()
        .filter(|w| w.resistance_ohm_measured(job).is_none())
        .map(|w| (w.current_density_a_mm2, w.name.as_str()))
        .fold((0.0, ""), |acc, x| if x.0 > acc.0 { x } else { acc });
    checks.push(Check {
        name: "current density".to_string(),
        ok: worst_j.0 <= job.current_density_a_mm2 * (1.0 + 1e-9),
        detail: say!(
            "highest {:.2} A/mm² (\"{}\"), limit {:.2} A/mm²",
            worst_j.0,
            worst_j.1,
            job.current_density_a_mm2
        ),
    });
    checks.push(Check {
        name: "primary current".to_string(),
        ok: primary_ok,
        detail: if primary_ok {
            say!("{:.2} A at full load", st.primary_amps)
        } else {
            "the primary's resistance is too high to pass the load's power".to_string()
        },
    });
    for w in windings.iter().filter(|w| w.role == Role::Secondary) {
        let ok = w.volts_full_load >= w.volts * (1.0 - 1e-9);
        checks.push(Check {
            name: format!("output {}", w.name),
            ok,
            detail: if ok {
                say!(
                    "{:.2} V at {:.2} A (target {:.2} V)",
                    w.volts_full_load,
                    w.amps,
                    w.volts
                )
            } else {
                say!(
                    "{:.2} V at {:.2} A, short of {:.2} V; the most it can deliver is {:.2} V",
                    w.volts_full_load,
                    w.amps,
                    w.volts,
                    w.max_volts_full_load.unwrap_or(w.volts_full_load).min(1e9)
                )
            },
        });
    }
    let ok = checks.iter().all(|c| c.ok);

    let probe = job.probe.as_ref().map(|_| ProbePlan {
        volts_per_turn: v_meas,
        donor_flux_t: test.as_ref().map(|(_, r)| r.donor_flux_t),
        knee_volts: sweep_rep.as_ref().and_then(|r| r.knee_volts),
        knee_flux_t: sweep_rep.as_ref().and_then(|r| r.knee_flux_t),
        tangent_flux_t: sweep_rep.as_ref().and_then(|r| r.tangent_flux_t),
        recommended_flux_t: recommended,
    });

    Plan {
        name: job.name.clone(),
        core: job.core.clone(),
        geometry: g,
        steel: job.steel.clone(),
        drive: Drive {
            frequency_hz: f,
            waveform: wf,
            flux_density_t: flux,
            design_flux_t: design_flux,
            flux_source: source,
            flux_limit_t: flux_limit,
            volts_per_turn: v_turn,
            primary_rms_volts: v_p_rms,
            primary_amps: st.primary_amps,
            no_load_amps: no_load,
            flux_vs_donor,
            kept_output_note: kept_note,
        },
        windings,
        window: WindowPlan {
            copper_fill: lay.copper_fill,
            build_mm: lay.build_mm,
            available_mm: lay.available_mm,
            traverse_mm: lay.traverse_mm,
            fits: lay.fits,
        },
        losses: LossPlan {
            core_w,
            copper_w: p_cu,
            output_w: p_out,
            efficiency: efficiency(p_out, p_cu, core_w),
            regulation_pct: regulation_pct(p_out, p_cu),
        },
        thermal: Thermal {
            surface_cm2: surface,
            rise_c: rise,
            ambient_c: job.ambient_c,
            hot_c: job.ambient_c + rise,
            resistance_at_c: hot_c,
            max_rise_c: job.max_rise_c,
        },
        probe,
        verdict: Verdict { ok, checks },
        warnings,
        cautions: CAUTIONS,
        current_density_limit_a_mm2: job.current_density_a_mm2,
        settings: job.settings_layout(),
        lead_m: job.lead_m,
        system: job.system,
        grade: job.grade,
        max_strand_mm: job.max_strand_mm,
    }
}

impl WindingPlan {
    /// The measured 20 °C resistance of a kept winding, if the job gives one.
    pub fn resistance_ohm_measured(&self, job: &Job) -> Option<f64> {
        job.windings
            .iter()
            .find(|w| w.name == self.name)
            .and_then(|w| w.resistance_ohm)
    }
}

impl Job {
    /// The layout settings of the job.
    pub fn settings_layout(&self) -> crate::layout::LayoutSettings {
        self.layout.clone()
    }
}

/// Refuses a plan a person cannot wind at all: a winding with no room for a single turn on a layer
/// is bad input (the wire or the strands chosen for it), named by the winding.
pub fn check_windable(plan: &Plan, origin: &str) -> Result<()> {
    for w in &plan.windings {
        if w.coil.turns_per_layer == 0 {
            return Err(Error::bad_value(
                origin,
                format!("[[winding]] \"{}\" size/strands", w.name),
                format!("{} × {}", w.wire.strands, w.wire.conductor.describe()),
                format!(
                    "cannot get a single turn on a layer: {} strand(s) of {:.2} mm need {:.2} mm, the traverse is {:.2} mm; use fewer strands, a thinner or strip conductor, or a taller window",
                    w.wire.strands,
                    w.wire.conductor.traverse_mm(),
                    w.wire.strands as f64 * w.wire.conductor.traverse_mm() * plan.settings.pitch,
                    plan.window.traverse_mm
                ),
            ));
        }
    }
    Ok(())
}
