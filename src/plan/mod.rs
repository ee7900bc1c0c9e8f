//! Job → Plan: turns, currents, wire, layout, losses, heating, checks, warnings and cautions.
//!
//! The model of DESIGN.md (v1):
//! - primary turns N_p = ceil(exact N from the EMF equation at the design flux); the actual flux is
//!   recomputed from N_p;
//! - volts per turn v = V_p,rms / N_p; each output gets the smallest whole N_s whose full-load voltage
//!   V_s,FL = (N_s/N_p)·(V_p − I_p·R_p) − I_s·R_s reaches its target: every output sees the drop of
//!   the WHOLE primary current in the primary (resistive loads, in phase; leakage reactance neglected;
//!   hot resistances). I_p = Σ I_s·N_s/N_p + the core-loss current, so V_s,FL is concave in N_s: when
//!   even its maximum falls short, the output check fails and the plan shows the most the winding
//!   delivers. The outputs are solved together, by the fixed-point loop below;
//! - regulation of each output (McLyman's definition): (V_NL − V_FL)/V_FL·100, V_NL at rated volts;
//! - primary current from the power balance I_p·V_p = P_out + P_cu,out + P_core + I_p²·R_p;
//! - core loss under square and quasi-square drive scaled by loss separation (`magnetics`); above
//!   1.9 T the core is past saturation and the loss figures are not an estimate of anything;
//! - kept donor windings take their turns from the test winding's volts per turn; a kept output sets
//!   the largest N_p for which it still reaches its target.
//!
//! Wire, layout and resistance depend on the turns and the primary current, and those on the
//! resistances, so the plan iterates to a fixed point (it settles in a few rounds; a repeat of a
//! state ends the loop).

mod loads;

use crate::error::{Error, Result};
use crate::geometry::{geometry, CoreDims, CoreGeometry, Shape};
use crate::job::{Job, Role};
use crate::layout::{layout, CoilInput, CoilLayout, Layout};
use crate::losses::{
    box_surface_cm2, copper_mass_g, efficiency, regulation_pct, resistance_ohm, rise_c,
    temperature_factor,
};
use crate::magnetics::{ceil_turns, core_loss_w, SteelInfo, Waveform, MAX_FLUX_T};
use crate::probe::{
    donor_flux_notes, no_load_amps, sweep_report, test_report, Sweep, SweepReport, TestReport,
    TestWinding,
};
use crate::verdict::{
    Check, CheckFigures, FluxSource, KeptLimit, KeptOutputNote, Verdict, Warning,
};
use crate::wire::{choose, Conductor, KeptCopper, WireChoice, KEPT_COPPER_FRACTION};

/// Window fill above which hand winding gets hard (McLyman's window utilisation Ku = 0.4).
pub const HAND_FILL_LIMIT: f64 = 0.4;
/// Peak flux above which silicon steel is past saturation, T (common practice: saturation 2.0 T,
/// REFERENCES.md; the loss model is not extrapolated past 1.9 T).
pub const SATURATION_T: f64 = 1.9;
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
    pub flux_source: FluxSource,
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
    pub kept_output_note: Option<KeptOutputNote>,
    /// The most a kept output gives at the design flux.
    pub kept_limit: Option<KeptLimit>,
    /// Magnetising current (RMS), A: from the steel's magnetisation table and the joints, or from
    /// the sweep.
    pub magnetising_amps: f64,
    /// Predicted idle current: magnetising and core-loss currents together (RMS), A.
    pub idle_amps: f64,
    /// Switch-on inrush (Specht's estimate).
    pub inrush: crate::magnetising::Inrush,
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
    /// Target volts (amplitude for a square-driven primary), per half or section.
    pub volts: f64,
    /// Whether the job gave the volts (a fixed-turns output may not).
    pub volts_given: bool,
    /// Full-load current, A RMS: an output's per half or section; the primary's as one winding at
    /// its volts (the whole primary current).
    pub amps: f64,
    /// RMS current in one half or section, A (a push-pull primary's half: I_p/√2).
    pub section_amps: f64,
    /// Halves or sections (1, 2 for a centre tap, N for sections).
    pub sections: u32,
    /// Centre-tapped (two halves).
    pub centre_tap: bool,
    /// Halves or sections wound together.
    pub bifilar: bool,
    /// Turns fixed by the job.
    pub turns_fixed: bool,
    /// Its section of a split bobbin (1 on a single bobbin).
    pub bobbin_section: u32,
    /// Fraction of the time its load is on.
    pub load_duty: f64,
    /// The copper's own rise in one on-time, °C (when the job gives `on_time_s`).
    pub adiabatic_rise_c: Option<f64>,
    /// Turns, per half or section.
    pub turns: u32,
    /// Wire of one half or section.
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
    /// Regulation (V_NL − V_FL)/V_FL, % (outputs only).
    pub regulation_pct: Option<f64>,
    /// The most this winding can deliver at full load, V (outputs only).
    pub max_volts_full_load: Option<f64>,
    /// Taps.
    pub taps: Vec<Tap>,
    /// Power delivered to the load at full load, W (a rectified output's DC watts; an AC output's
    /// V·I·cos φ; 0 for the primary).
    pub output_w: f64,
    /// The load's power factor (AC outputs; 1 otherwise).
    pub power_factor: f64,
    /// Leakage inductance referred to this winding (one half or section) against the primary (the
    /// primary's against the first output), H.
    pub leakage_h: f64,
    /// Leakage reactance referred to it, Ω.
    pub leakage_reactance_ohm: f64,
    /// Short-circuit impedance referred to it (both windings' resistance and the leakage), Ω
    /// (outputs).
    pub short_circuit_ohm: Option<f64>,
    /// Current with this output shorted and the primary at rated volts, A (outputs).
    pub short_circuit_amps: Option<f64>,
    /// Peak current at full load, A (the primary's from its summed waveform).
    pub peak_amps: f64,
    /// V_rms·I_rms of the whole winding at full load (a rectified output: its EMF's RMS times the
    /// RMS current of every half), VA.
    pub va: f64,
    /// A rectified output's figures.
    pub dc: Option<DcPlan>,
}

/// A rectified output as planned.
#[derive(Debug, Clone, PartialEq)]
pub struct DcPlan {
    /// The job's load.
    pub load: crate::job::DcLoad,
    /// A bridge on a centre-tapped winding: ± rails.
    pub dual_rails: bool,
    /// Mean DC volts at full load (each rail), V (a battery: its terminal volts).
    pub volts_full_load: f64,
    /// DC volts with no load, V.
    pub volts_no_load: f64,
    /// Ripple peak to peak, V.
    pub ripple_pp_v: f64,
    /// Mean DC current (each rail), A.
    pub amps: f64,
    /// RMS current of one half (or the winding), A.
    pub rms_amps: f64,
    /// Peak current, A.
    pub peak_amps: f64,
    /// Each pulse of current, electrical degrees.
    pub conduction_deg: f64,
    /// DC power delivered (both rails), W.
    pub power_w: f64,
    /// The winding's VA over the DC power.
    pub va_per_dc_w: f64,
    /// Whether the solver met its 1e-9 tolerance.
    pub converged: bool,
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
    /// The largest output regulation, % (McLyman's definition, per output on each winding).
    pub regulation_pct: f64,
    /// The core loss over the sine figure at the same peak flux (loss separation; 1 for sine).
    pub core_waveform_factor: f64,
    /// The flux is past saturation (above 1.9 T): the loss and efficiency figures are not estimates.
    pub saturated: bool,
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
    /// The time-averaged copper loss the rise is taken from, W (each load at its duty).
    pub average_copper_w: f64,
    /// The hottest copper: the hot winding plus the largest adiabatic rise of one on-time, °C.
    pub hot_spot_c: f64,
    /// The insulation class (IEC 60085) and its temperature, °C.
    pub insulation_class: crate::job::InsulationClass,
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
    pub warnings: Vec<Warning>,
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

/// What the plan knows before its loop: the job, the core, the probe's reports and the design flux.
struct Ctx<'a> {
    job: &'a Job,
    g: CoreGeometry,
    p_idx: usize,
    v_p_rms: f64,
    hot_c: f64,
    test: Option<(&'a TestWinding, TestReport)>,
    sweep: Option<&'a Sweep>,
    sweep_rep: Option<SweepReport>,
    recommended: Option<f64>,
    design_flux: f64,
    source: FluxSource,
    kept_idx: Option<usize>,
}

impl<'a> Ctx<'a> {
    /// The probe's reports and the design flux with its source; early warnings go to `warnings`.
    fn new(job: &'a Job, warnings: &mut Vec<Warning>) -> Ctx<'a> {
        let g = geometry(&job.core);
        let (f, ae) = (job.frequency_hz, g.area_net_mm2);
        let p_idx = job.primary_index();
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
        let recommended = sweep_rep.as_ref().and_then(|r| r.recommended_flux_t);
        if sweep.is_some() && recommended.is_none() {
            warnings.push(Warning::SweepBelowKnee { in_plan: true });
        }
        let steel_flux = job.steel.design_flux_t;
        let (design_flux, source) = match (job.flux_density_t, recommended) {
            (Some(b), Some(rec)) if b > rec => {
                warnings.push(Warning::GivenFluxAboveSweep {
                    given_t: b,
                    recommended_t: rec,
                });
                (b, FluxSource::GivenAboveSweep)
            }
            (Some(b), _) => (b, FluxSource::Given),
            (None, Some(rec)) if rec < steel_flux => (rec, FluxSource::Sweep),
            (None, _) => (steel_flux, FluxSource::Steel(job.steel.name.clone())),
        };
        Ctx {
            job,
            g,
            p_idx,
            v_p_rms: job.waveform.rms_volts(job.windings[p_idx].volts),
            hot_c: job.ambient_c + job.max_rise_c,
            test,
            sweep,
            sweep_rep,
            recommended,
            design_flux,
            source,
            kept_idx: job.windings.iter().position(|w| w.kept),
        }
    }

    fn primary(&self) -> &'a crate::job::WindingSpec {
        &self.job.windings[self.p_idx]
    }

    /// The measured volts per turn of the test winding.
    fn v_meas(&self) -> Option<f64> {
        self.test.as_ref().map(|(t, _)| t.volts_per_turn())
    }

    /// A kept winding's turns: its rated volts over the measured volts per turn.
    fn kept_turns(&self, i: usize) -> u32 {
        let w = &self.job.windings[i];
        let rated = w.rated_volts.unwrap_or_else(|| match self.test.as_ref() {
            Some((t, _)) if t.applied_to.as_deref() == Some(w.name.as_str()) => t.applied_volts,
            _ => w.volts,
        });
        let vm = self.v_meas().unwrap_or(1.0);
        (rated / vm).round().clamp(1.0, 1e7) as u32
    }

    /// The kept output's index, when the kept winding is not the primary.
    fn kept_output(&self) -> Option<usize> {
        self.kept_idx.filter(|&k| k != self.p_idx)
    }

    /// Halves or sections of winding `i`.
    fn mult(&self, i: usize) -> f64 {
        self.job.windings[i].sections.max(1) as f64
    }

    /// The primary's resistance as its current I_p sees it (the current of the equivalent single
    /// winding at the primary's volts): one half of a push-pull primary (one half conducts at a
    /// time), or the sections in parallel.
    fn r_p_eff(&self, r_hot: &[f64]) -> f64 {
        let p = self.primary();
        if p.centre_tap {
            r_hot[self.p_idx]
        } else {
            r_hot[self.p_idx] / self.mult(self.p_idx)
        }
    }

    /// The RMS current in one half or section of winding `i`: a push-pull primary's half carries
    /// I_p for half of each cycle, so I_p/√2; a sectioned primary's sections share I_p; an
    /// output's halves or sections each carry its `amps`.
    fn section_amps(&self, i: usize, st: &State) -> f64 {
        let w = &self.job.windings[i];
        let primary_amps = st.primary_amps;
        if i != self.p_idx {
            return st.amps[i];
        }
        if w.centre_tap {
            primary_amps / std::f64::consts::SQRT_2
        } else {
            primary_amps / self.mult(i)
        }
    }

    /// Whether the turns of winding `i` are not the plan's to choose (kept, or fixed by the job).
    fn turns_fixed(&self, i: usize) -> bool {
        let w = &self.job.windings[i];
        w.kept || w.fixed_turns.is_some()
    }
}

/// What one round of the fixed-point loop carries to the next.
struct State {
    turns: Vec<u32>,
    wires: Vec<WireChoice>,
    primary_amps: f64,
    n_p: u32,
    /// Each winding's mean turn in the last layout, mm (a kept winding's copper from its
    /// resistance needs its length).
    mean_turns_mm: Vec<f64>,
    /// RMS current of one half or section of each output (a rectified output's from its last
    /// solution), A.
    amps: Vec<f64>,
    /// The last solution of each rectified output, at its present turns.
    rect: Vec<Option<crate::rectifier::Solution>>,
    /// For each output, the primary current in phase with the volts less its own: what drops the
    /// volts it sees, A.
    rest: Vec<f64>,
    /// The magnetising current waveform and the primary turns it was taken at.
    mag: Option<(u32, Vec<f64>)>,
}

/// The first guess: primary turns from the EMF equation (or the kept winding), outputs by ratio.
fn initial_state(c: &Ctx) -> State {
    let job = c.job;
    let (f, ae, wf) = (job.frequency_hz, c.g.area_net_mm2, job.waveform);
    let mut n_p = match (c.kept_idx, c.primary().fixed_turns) {
        (Some(k), _) if k == c.p_idx => c.kept_turns(k),
        (_, Some(n)) => n,
        _ => ceil_turns(wf.turns_exact(c.primary().volts, f, c.design_flux, ae)).min(10_000_000),
    };
    if let Some(k) = c.kept_output() {
        // Start from the measured volts per turn: N_p ≈ V_p / (V_k / N_k).
        let nk = c.kept_turns(k) as f64;
        n_p = (c.v_p_rms * nk / job.windings[k].volts)
            .floor()
            .clamp(1.0, 1e7) as u32;
    }
    let p_out_guess: f64 = job
        .windings
        .iter()
        .filter(|w| w.role == Role::Secondary)
        .map(|w| w.sections.max(1) as f64 * w.volts * w.amps)
        .sum();
    State {
        turns: job
            .windings
            .iter()
            .enumerate()
            .map(|(i, w)| {
                if i == c.p_idx {
                    n_p
                } else if w.kept {
                    c.kept_turns(i)
                } else if let Some(n) = w.fixed_turns {
                    n
                } else {
                    ceil_turns(w.volts * n_p as f64 / c.v_p_rms).min(10_000_000)
                }
            })
            .collect(),
        wires: Vec::new(),
        mean_turns_mm: vec![
            2.0 * (job.core.tongue_mm + job.core.stack_mm)
                + 8.0 * job.layout.bobbin_wall_mm
                + std::f64::consts::PI * job.core.window_width_mm / 2.0;
            job.windings.len()
        ],
        primary_amps: p_out_guess / c.v_p_rms / 0.9,
        n_p,
        amps: job.windings.iter().map(|w| w.amps).collect(),
        rect: vec![None; job.windings.len()],
        rest: vec![0.0; job.windings.len()],
        mag: None,
    }
}

/// The figures of one round: layout, hot resistances, core loss, flux and the output maxima.
struct Round {
    lay: Layout,
    r_hot: Vec<f64>,
    per_turn: Vec<f64>,
    leak: Vec<f64>,
    mag: Vec<f64>,
    core_w: f64,
    flux: f64,
    v_turn: f64,
    max_fl: Vec<Option<f64>>,
    primary_ok: bool,
}

impl Round {
    fn drop<'a>(&'a self, c: &Ctx) -> loads::Drop<'a> {
        loads::Drop {
            per_turn: &self.per_turn,
            r_p: c.r_p_eff(&self.r_hot),
            leak: &self.leak,
            v_turn: self.v_turn,
        }
    }
}

/// What a round proposes for the next: turns, primary turns and primary current.
struct Next {
    turns: Vec<u32>,
    n_p: u32,
    primary_amps: f64,
}

/// Wires from the currents, by the job's choice rule.
fn choose_wires(c: &Ctx, st: &State) -> Vec<WireChoice> {
    let job = c.job;
    job.windings
        .iter()
        .enumerate()
        .map(|(i, w)| {
            let amps = c.section_amps(i, st);
            if w.kept && !w.wire.given() {
                return kept_wire(c, st, i, amps);
            }
            choose(
                amps,
                w.current_density_a_mm2.unwrap_or(job.current_density_a_mm2),
                job.system,
                job.grade,
                job.max_strand_mm,
                &w.wire,
            )
        })
        .collect()
}

/// A kept winding's copper, which nobody chose: from its measured resistance (ρ·N·MLT/R), else its
/// measured build (McLyman's copper fraction of the build × traverse), else its current at the job's
/// current density.
fn kept_wire(c: &Ctx, st: &State, i: usize, amps: f64) -> WireChoice {
    let job = c.job;
    let w = &job.windings[i];
    let n = st.turns[i].max(1) as f64;
    let (area, source) = match (w.resistance_ohm, w.build_mm) {
        (Some(r20), _) => (
            crate::losses::RHO20_OHM_MM2_PER_M * n * st.mean_turns_mm[i] / 1000.0 / r20,
            KeptCopper::Resistance,
        ),
        (None, Some(b)) => {
            let traverse = job.core.window_height_mm
                - 2.0 * job.layout.bobbin_wall_mm
                - 2.0 * job.layout.margin_mm;
            let per_coil = crate::layout::coil_turns(job.core.shape, st.turns[i]).max(1) as f64;
            (
                KEPT_COPPER_FRACTION * b * traverse.max(0.0) / per_coil,
                KeptCopper::Build,
            )
        }
        (None, None) => (amps / job.current_density_a_mm2, KeptCopper::Current),
    };
    WireChoice {
        conductor: Conductor::kept(area, source),
        strands: 1,
    }
}

/// The coil laid out with the current turns and wires.
fn lay_out(c: &Ctx, st: &State) -> Layout {
    let coils: Vec<CoilInput> = c
        .job
        .windings
        .iter()
        .zip(&st.wires)
        .zip(&st.turns)
        .map(|((w, wire), &n)| CoilInput {
            // Halves and sections one after another, or side by side in hand when bifilar.
            turns: if w.bifilar { n } else { n * w.sections.max(1) },
            strands: if w.bifilar {
                wire.strands * w.sections.max(1)
            } else {
                wire.strands
            },
            section: w.bobbin_section,
            traverse_mm: wire.conductor.traverse_mm(),
            build_mm: wire.conductor.build_mm(),
            area_mm2: wire.conductor.area_mm2(),
            measured_build_mm: w.build_mm,
            stacked: matches!(wire.conductor, Conductor::Strip { .. }),
        })
        .collect();
    layout(&c.job.core, &c.job.settings_layout(), &coils)
}

/// Hot resistance per turn of each winding (a kept winding's from its measured resistance).
fn hot_per_turn(c: &Ctx, st: &State, lay: &Layout) -> Vec<f64> {
    c.job
        .windings
        .iter()
        .zip(&st.wires)
        .zip(&lay.coils)
        .zip(&st.turns)
        .map(|(((w, wire), coil), &n)| match w.resistance_ohm {
            Some(r20) => r20 * temperature_factor(c.hot_c) / n as f64,
            None => resistance_ohm(coil.mean_turn_mm / 1000.0, wire.area_mm2(), c.hot_c),
        })
        .collect()
}

/// The output VA a job asks for: every half or section of every output at its volts and amps; an
/// output with fixed turns and no volts given counts at the full-load volts its plan reaches.
pub fn output_va(job: &Job) -> f64 {
    let needs_plan = job
        .windings
        .iter()
        .any(|w| w.role == Role::Secondary && !w.volts_given);
    let planned = needs_plan.then(|| plan(job));
    job.windings
        .iter()
        .enumerate()
        .filter(|(_, w)| w.role == Role::Secondary)
        .map(|(i, w)| {
            if let Some(d) = &w.dc {
                let rails = if d.dual_rails(w.centre_tap) { 2.0 } else { 1.0 };
                return rails * d.dc_volts * d.dc_amps;
            }
            let volts = match &planned {
                Some(p) if !w.volts_given => p.windings[i].volts_full_load.max(0.0),
                _ => w.volts,
            };
            w.sections.max(1) as f64 * volts * w.amps
        })
        .sum()
}

/// An output's full-load volts: (N_s/N_p)·(V_p − I_p·R_p) − I_s·R_s.
pub fn full_load_volts(
    n_s: f64,
    n_p: u32,
    v_p: f64,
    i_p: f64,
    r_p: f64,
    i_s: f64,
    r_s: f64,
) -> f64 {
    n_s / n_p as f64 * (v_p - i_p * r_p) - i_s * r_s
}

/// The primary current: the RMS of the sum of every referred current waveform, the core-loss and
/// the magnetising current; false when its drop in the primary is past half the primary's volts (no
/// more power passes: the maximum-power point of the power balance V·I = P + I²·R_p).
fn primary_current(c: &Ctx, st: &mut State, r: &Round) -> (f64, bool) {
    let (i_p, rest) = loads::primary_rms(c, st, r.core_w, &r.mag);
    st.rest = rest;
    let r_p = c.r_p_eff(&r.r_hot);
    (i_p, 2.0 * i_p * r_p <= c.v_p_rms * (1.0 + 1e-12))
}

/// New turns: a kept output sets N_p; every other output the smallest N reaching its target. Also
/// the most each output can deliver.
fn next_turns(c: &Ctx, st: &State, r: &Round) -> (Vec<u32>, u32, Vec<Option<f64>>) {
    let (per_turn, r_hot, v_turn) = (&r.per_turn, &r.r_hot, r.v_turn);
    let job = c.job;
    let mut turns = st.turns.clone();
    let mut max_fl = vec![None; job.windings.len()];
    let mut new_np = st.n_p;
    if let Some(k) = c.kept_output() {
        // The kept output sets N_p: the largest N_p with (N_k/N_p)(V_p − I_p·r_p·N_p) − I_k·R_k ≥ V_k,
        // r_p the primary's resistance per turn: N_p ≤ N_k·V_p / (V_k + I_k·R_k + N_k·I_p·r_p).
        let wk = &job.windings[k];
        let nk = st.turns[k] as f64;
        let num = nk * c.v_p_rms;
        let r_p_turn = c.r_p_eff(r_hot) / st.n_p as f64;
        let den = wk.volts + wk.amps * r_hot[k] + nk * st.primary_amps * r_p_turn;
        new_np = if num > 0.0 {
            ((num / den * (1.0 + 1e-12)).floor().clamp(1.0, 1e7)) as u32
        } else {
            1
        };
        turns[c.p_idx] = new_np;
    }
    let r_p = c.r_p_eff(r_hot);
    let drop = r.drop(c);
    for (i, w) in job.windings.iter().enumerate() {
        if i == c.p_idx {
            continue;
        }
        if w.dc.is_some() {
            if !c.turns_fixed(i) {
                let (n, most) = loads::rectified_turns(c, st, &drop, i);
                turns[i] = n;
                max_fl[i] = most;
            }
            continue;
        }
        let a = per_turn[i];
        let amps = st.amps[i];
        // Its own reflected current (every half or section) in the primary: b·N² of drop.
        let b = c.mult(i) * r_p / (st.n_p as f64 * st.n_p as f64);
        // The primary current less this output's own reflected current: the drop it causes in the
        // primary acts on this output like a lower volts per turn.
        let v = v_turn - r_p * rest_of_primary(st, i) / st.n_p as f64;
        let reach = |n: u32| loads::ac_volts(c, i, n as f64, v, amps, (a, b), r.leak[i]);
        let lin = v - amps * a;
        max_fl[i] = Some(if b > 0.0 && amps > 0.0 {
            reach((lin / (2.0 * amps * b)).round().clamp(1.0, 1e7) as u32)
        } else {
            f64::INFINITY
        });
        if !c.turns_fixed(i) {
            let first = smallest_turns(w.volts, v, amps, a, b).0.min(10_000_000);
            turns[i] = loads::ac_turns(&reach, w.volts, first);
        }
    }
    (turns, new_np, max_fl)
}

/// The primary current in phase with the volts less output `i`'s own reflected load current (the
/// other outputs' currents and the core-loss current, which this output's turns do not change).
fn rest_of_primary(st: &State, i: usize) -> f64 {
    st.rest[i]
}

/// One round of the fixed-point loop: wires from the currents, layout, resistances, the primary
/// current, and the turns that follow from them.
fn one_round(c: &Ctx, st: &mut State) -> (Round, Next) {
    let job = c.job;
    let (f, ae) = (job.frequency_hz, c.g.area_net_mm2);
    let flux = job.waveform.flux_t(c.primary().volts, f, st.n_p as f64, ae);
    let v_turn = c.v_p_rms / st.n_p as f64;
    let core_w = core_loss_w(c.g.mass_kg, job.steel.loss_w_per_kg_1t5, flux, f)
        * job.waveform.loss_factor(job.steel.shares);
    st.wires = choose_wires(c, st);
    let lay = lay_out(c, st);
    st.mean_turns_mm = lay.coils.iter().map(|co| co.mean_turn_mm).collect();
    let per_turn = hot_per_turn(c, st, &lay);
    let r_hot: Vec<f64> = per_turn
        .iter()
        .zip(&st.turns)
        .map(|(r, &n)| r * n as f64)
        .collect();
    let leak = loads::leakage_per_turn2(c, &lay);
    // The magnetising current depends only on the primary turns (the flux): kept between rounds.
    let mag = match &st.mag {
        Some((n, m)) if *n == st.n_p => m.clone(),
        _ => {
            let m = loads::magnetising_wave(c, flux, st.n_p, core_w / c.v_p_rms);
            st.mag = Some((st.n_p, m.clone()));
            m
        }
    };
    let mut round = Round {
        lay,
        r_hot,
        per_turn,
        leak,
        mag,
        core_w,
        flux,
        v_turn,
        max_fl: Vec::new(),
        primary_ok: true,
    };
    loads::solve_rectified(c, st, &round.drop(c));
    let (i_p, primary_ok) = primary_current(c, st, &round);
    round.primary_ok = primary_ok;
    let (turns, n_p, max_fl) = next_turns(c, st, &round);
    round.max_fl = max_fl;
    (
        round,
        Next {
            turns,
            n_p,
            primary_amps: i_p,
        },
    )
}

/// Runs rounds until nothing changes. A state that repeats (a wire size or a layer flipping at a
/// boundary) settles on the turns that meet every target — the larger output, the smaller primary
/// under a kept output — and the wires for the largest primary current seen, and is evaluated once
/// more, so every figure belongs to one layout and the plan does not fail its own checks.
fn settle(c: &Ctx, st: &mut State) -> Round {
    let mut seen: Vec<(Vec<u32>, u64)> = Vec::new();
    let mut iterations = 0;
    let mut final_pass = false;
    let mut most_amps = st.primary_amps;
    loop {
        iterations += 1;
        let (round, next) = one_round(c, st);
        let i_p = next.primary_amps;
        most_amps = most_amps.max(i_p);
        let key = (next.turns.clone(), (i_p * 1e6).round() as u64);
        // Settled when the turns repeat and the current moves less than a millionth (the final
        // polish of the current, with these wires, is `settle_current`'s).
        let settled =
            next.turns == st.turns && (i_p - st.primary_amps).abs() <= 1e-6 * i_p.max(1e-9);
        let repeat = seen.contains(&key);
        st.primary_amps = i_p;
        if settled || final_pass {
            return settle_current(c, st, round);
        }
        let mut turns = next.turns;
        if repeat || iterations >= 60 {
            for (i, w) in c.job.windings.iter().enumerate() {
                if i != c.p_idx && !w.kept {
                    turns[i] = turns[i].max(st.turns[i]);
                }
            }
            st.turns = turns;
            st.n_p = next.n_p.min(st.n_p);
            st.turns[c.p_idx] = st.n_p;
            // The wires of the last round are chosen for the largest primary current of the cycle,
            // so the current density check holds at whichever current the cycle settles on.
            st.primary_amps = most_amps;
            final_pass = true;
            continue;
        }
        seen.push(key);
        st.turns = turns;
        st.n_p = next.n_p;
    }
}

/// The primary current made consistent with the settled turns and wires: the power balance solved
/// again until it no longer moves (a final pass after a cycle starts from the cycle's largest current,
/// chosen for the wires).
fn settle_current(c: &Ctx, st: &mut State, mut round: Round) -> Round {
    for _ in 0..50 {
        loads::solve_rectified(c, st, &round.drop(c));
        let (i_p, ok) = primary_current(c, st, &round);
        round.primary_ok = ok;
        let moved = (i_p - st.primary_amps).abs();
        st.primary_amps = i_p;
        if moved <= 1e-9 * i_p.max(1e-12) {
            break;
        }
    }
    round
}

/// Every winding's figures from the settled state; with the output power and the copper loss.
fn winding_figures(c: &Ctx, st: &State, r: &Round) -> (Vec<WindingPlan>, f64, f64) {
    let windings: Vec<WindingPlan> = (0..c.job.windings.len())
        .map(|i| winding_plan(c, st, r, i))
        .collect();
    let p_out = windings.iter().map(|w| w.output_w).sum();
    let p_cu = windings.iter().map(|w| w.copper_loss_w).sum();
    (windings, p_out, p_cu)
}

/// A rectified output's figures from its solution at the settled turns.
fn dc_plan(c: &Ctx, st: &State, i: usize, emf_rms: f64) -> Option<DcPlan> {
    let w = &c.job.windings[i];
    let load = w.dc?;
    let s = st.rect[i].as_ref()?;
    let dual = load.dual_rails(w.centre_tap);
    let rails = if dual { 2.0 } else { 1.0 };
    let rms_half = loads::half_rms(&load, w.centre_tap, s);
    let power = rails * s.dc_volts * s.dc_amps;
    let va = c.mult(i) * emf_rms.max(0.0) * rms_half;
    Some(DcPlan {
        load,
        dual_rails: dual,
        volts_full_load: s.dc_volts,
        volts_no_load: s.dc_volts_no_load,
        ripple_pp_v: s.ripple_pp_v,
        amps: s.dc_amps,
        rms_amps: rms_half,
        peak_amps: s.peak_amps,
        conduction_deg: s.conduction_deg,
        power_w: power,
        va_per_dc_w: if power > 0.0 { va / power } else { 0.0 },
        converged: s.converged,
    })
}

/// One winding's figures. Turns, resistance, lengths and volts are one half's or section's; the
/// copper loss and mass are the whole winding's.
fn winding_plan(c: &Ctx, st: &State, r: &Round, i: usize) -> WindingPlan {
    let job = c.job;
    let w = &job.windings[i];
    let primary = i == c.p_idx;
    let k = c.mult(i);
    let r_p = c.r_p_eff(&r.r_hot);
    let n = st.turns[i];
    let wire = st.wires[i].clone();
    let mut coil = r.lay.coils[i].clone();
    coil.fill_checkpoints();
    let amps = if primary { st.primary_amps } else { st.amps[i] };
    let section_amps = c.section_amps(i, st);
    let length_m = n as f64 * coil.mean_turn_mm / 1000.0;
    let cut = length_m + 2.0 * job.lead_m;
    let res = r.r_hot[i];
    let cu = if primary {
        amps * amps * r_p
    } else {
        k * amps * amps * res
    };
    let drop = r.drop(c);
    let nf = n as f64;
    let (v_nl, v_fl) = if primary {
        (c.v_p_rms, c.v_p_rms - amps * r_p)
    } else if w.dc.is_some() {
        (nf * r.v_turn, nf * loads::v_eff(c, st, &drop, i))
    } else {
        let b = k * r_p / (st.n_p as f64 * st.n_p as f64);
        let v = r.v_turn - r_p * rest_of_primary(st, i) / st.n_p as f64;
        let fl = loads::ac_volts(c, i, nf, v, amps, (res / nf.max(1.0), b), r.leak[i]);
        (nf * r.v_turn, fl)
    };
    let dc = dc_plan(c, st, i, v_fl);
    let (sc_amps, x_ohm, z_ohm) = loads::short_circuit(c, st, &drop, i);
    let peak = if primary {
        let (wave, _, _) = loads::primary_wave(c, st, r.core_w, &r.mag);
        wave.iter().fold(0.0_f64, |m, v| m.max(v.abs()))
    } else {
        match &dc {
            Some(d) => d.peak_amps,
            None => amps * loads::crest(job.waveform),
        }
    };
    let output_w = match (&dc, primary) {
        (_, true) => 0.0,
        (Some(d), _) => d.power_w,
        (None, _) => k * v_fl.max(0.0) * amps * w.power_factor,
    };
    let regulation_pct = match &dc {
        Some(d) if d.volts_full_load > 0.0 => {
            Some(regulation_pct(d.volts_no_load, d.volts_full_load))
        }
        Some(_) => None,
        None => (!primary && v_fl > 0.0).then(|| regulation_pct(v_nl, v_fl)),
    };
    let area = wire.area_mm2();
    WindingPlan {
        output_w,
        power_factor: if primary { 1.0 } else { w.power_factor },
        leakage_h: r.leak[i] * nf * nf,
        leakage_reactance_ohm: x_ohm,
        short_circuit_ohm: (!primary).then_some(z_ohm),
        short_circuit_amps: (!primary).then_some(sc_amps),
        peak_amps: peak,
        va: if primary {
            c.v_p_rms * amps
        } else {
            k * v_fl.max(0.0) * section_amps
        },
        dc,
        name: w.name.clone(),
        role: w.role,
        kept: w.kept,
        resistance_measured: w.resistance_ohm.is_some(),
        // A rectified output's AC volts are the plan's: its open-circuit RMS.
        volts: if w.dc.is_some() { v_nl } else { w.volts },
        volts_given: w.volts_given,
        amps,
        section_amps,
        sections: w.sections.max(1),
        centre_tap: w.centre_tap,
        bifilar: w.bifilar,
        turns_fixed: w.fixed_turns.is_some(),
        bobbin_section: w.bobbin_section,
        load_duty: w.load_duty,
        turns: n,
        grade_label: grade_label(job, &wire.conductor),
        current_density_a_mm2: section_amps / area,
        adiabatic_rise_c: w
            .on_time_s
            .map(|t| adiabatic_rise_c(section_amps / area, c.hot_c, t)),
        resistance_20c_ohm: res / temperature_factor(c.hot_c),
        copper_mass_g: copper_mass_g(cut, area) * k,
        taps: taps_of(c, st, r, i, res),
        wire,
        coil,
        length_m,
        cut_length_m: cut,
        resistance_ohm: res,
        copper_loss_w: cu,
        volts_no_load: v_nl,
        volts_full_load: v_fl,
        regulation_pct,
        max_volts_full_load: if primary { None } else { r.max_fl[i] },
    }
}

/// The tap turns of winding `i`: on an output, the fewest turns whose full-load volts reach the
/// tap's; on the primary, the turns that hold the flux at the tap's volts (N_p × tap/volts, up).
fn taps_of(c: &Ctx, st: &State, r: &Round, i: usize, res: f64) -> Vec<Tap> {
    let w = &c.job.windings[i];
    let n = st.turns[i];
    let r_p = c.r_p_eff(&r.r_hot);
    let b = c.mult(i) * r_p / (st.n_p as f64 * st.n_p as f64);
    let v_eff = r.v_turn - r_p * rest_of_primary(st, i) / st.n_p as f64;
    w.taps_volts
        .iter()
        .map(|&tv| Tap {
            volts: tv,
            turn: if i == c.p_idx {
                ceil_turns(n as f64 * tv / w.volts).min(n)
            } else {
                smallest_turns(tv, v_eff, w.amps, res / n.max(1) as f64, b)
                    .0
                    .min(n)
            },
        })
        .collect()
}

/// The enamel grade or build of a conductor, as the plan labels it.
fn grade_label(job: &Job, c: &Conductor) -> &'static str {
    match c {
        Conductor::Round(rs) => job.grade.label(rs.system),
        Conductor::Strip { .. } => "strip, insulated",
        Conductor::Kept { .. } => "kept",
        Conductor::Measured { .. } if job.grade == crate::wire::Grade::One => {
            "grade 1, overall diameter interpolated"
        }
        Conductor::Measured { .. } => "grade 2, overall diameter interpolated",
        Conductor::Cable { .. } => "insulated cable",
    }
}

/// Volumetric heat capacity of copper, J/(cm³·K) (DESIGN.md: 8.89 g/cm³ × 0.385 J/(g·K), IEC 60028
/// density and general physics tables; 3.42 by the product, 3.45 as DESIGN.md states it).
pub const COPPER_CV_J_CM3_K: f64 = 3.45;

/// The copper's own rise in one on-time with no cooling (adiabatic): ΔT = J²·ρ·t / c_v, J in A/mm²,
/// ρ in Ω·mm²/m at `hot_c` (so J²·ρ is W/cm³), t in s.
pub fn adiabatic_rise_c(j_a_mm2: f64, hot_c: f64, on_time_s: f64) -> f64 {
    let rho = crate::losses::RHO20_OHM_MM2_PER_M * temperature_factor(hot_c);
    j_a_mm2 * j_a_mm2 * rho * on_time_s / COPPER_CV_J_CM3_K
}

/// The box around core and coil, and the rise from the time-averaged loss (McLyman).
fn heating(c: &Ctx, r: &Round, windings: &[WindingPlan]) -> Thermal {
    let job = c.job;
    let total_build = r.lay.build_mm;
    let (box_w, box_h) = match job.core.shape {
        Shape::Ei => (c.g.outline_width_mm, c.g.outline_height_mm),
        Shape::Ui => (
            2.0 * job.core.tongue_mm + job.core.window_width_mm + 2.0 * total_build,
            c.g.outline_height_mm,
        ),
    };
    let surface = box_surface_cm2(box_w, box_h, job.core.stack_mm + 2.0 * total_build);
    // Intermittent loads: each output's copper loss at its duty, the primary's at the outputs'
    // power-weighted duty (exact for one load); `rate --duty` scales all; forced air: more
    // surface, in effect.
    let average = average_copper_w(windings) * job.load_duty;
    let rise = rise_c(average + r.core_w, surface * job.cooling_factor);
    let adiabatic = windings
        .iter()
        .filter_map(|w| w.adiabatic_rise_c)
        .fold(0.0, f64::max);
    Thermal {
        surface_cm2: surface,
        rise_c: rise,
        ambient_c: job.ambient_c,
        hot_c: job.ambient_c + rise,
        resistance_at_c: c.hot_c,
        max_rise_c: job.max_rise_c,
        average_copper_w: average,
        hot_spot_c: job.ambient_c + rise + adiabatic,
        insulation_class: job.insulation_class,
    }
}

/// The copper loss averaged over time: each output's at its load duty, the primary's at the
/// outputs' duty weighted by their power.
fn average_copper_w(windings: &[WindingPlan]) -> f64 {
    let outputs = || windings.iter().filter(|w| w.role == Role::Secondary);
    let power: f64 = outputs().map(|w| w.output_w).sum();
    let duty_p = if power > 0.0 {
        outputs().map(|w| w.load_duty * w.output_w).sum::<f64>() / power
    } else {
        outputs().map(|w| w.load_duty).fold(0.0, f64::max)
    };
    windings
        .iter()
        .map(|w| {
            let d = if w.role == Role::Primary {
                duty_p
            } else {
                w.load_duty
            };
            w.copper_loss_w * d
        })
        .sum()
}

/// How a kept output's drive compares with the donor's sine flux.
fn kept_output_note(c: &Ctx, r: &Round) -> Option<KeptOutputNote> {
    let (k, (_, t)) = (c.kept_output()?, c.test.as_ref()?);
    Some(KeptOutputNote {
        winding: c.job.windings[k].name.clone(),
        waveform: c.job.waveform,
        volts_per_turn: r.v_turn,
        flux_t: r.flux,
        donor_flux_t: t.donor_flux_t,
    })
}

/// The most a kept output gives at the design flux: the primary turns that hold the flux to it
/// (N_p = ceil of the EMF equation's), then its full-load volts with the settled currents and
/// resistances.
fn kept_limit(c: &Ctx, st: &State, r: &Round) -> Option<KeptLimit> {
    let k = c.kept_output()?;
    let job = c.job;
    let w = &job.windings[k];
    let n_p = ceil_turns(job.waveform.turns_exact(
        c.primary().volts,
        job.frequency_hz,
        c.design_flux,
        c.g.area_net_mm2,
    ));
    let r_p_turn = r.r_hot[c.p_idx] / st.n_p as f64;
    let volts = full_load_volts(
        st.turns[k] as f64,
        n_p,
        c.v_p_rms,
        st.primary_amps,
        r_p_turn * n_p as f64,
        w.amps,
        r.r_hot[k],
    );
    Some(KeptLimit {
        winding: w.name.clone(),
        flux_t: c.design_flux,
        volts,
        target_volts: w.volts,
    })
}

/// Warnings found once the plan has settled, in the order a person reads them.
fn late_warnings(
    c: &Ctx,
    r: &Round,
    windings: &[WindingPlan],
    primary_amps: f64,
    w: &mut Vec<Warning>,
) {
    let flux = r.flux;
    if flux > SATURATION_T {
        w.push(Warning::PastSaturation {
            flux_t: flux,
            limit_t: SATURATION_T,
        });
    }
    if let Some(knee) = c.sweep_rep.as_ref().and_then(|s| s.knee_flux_t) {
        let rec = c.recommended.unwrap_or(knee);
        if flux > rec * (1.0 + 1e-9) {
            w.push(Warning::FluxAboveKneeMargin {
                flux_t: flux,
                margin_t: rec,
                knee_t: knee,
            });
        }
    }
    if let (Some((_, t)), None) = (&c.test, c.kept_idx) {
        if flux > t.donor_flux_t * (1.0 + 1e-9) {
            w.push(Warning::FluxAboveDonor {
                flux_t: flux,
                donor_t: t.donor_flux_t,
            });
        }
    }
    if let (Some(_), Some((_, t))) = (c.kept_output(), &c.test) {
        let ratio = flux / t.donor_flux_t;
        if c.recommended.is_none() && ratio > 1.0 + 1e-9 {
            w.push(Warning::KeptOutputAboveDonor { ratio });
        }
    }
    if r.lay.copper_fill > HAND_FILL_LIMIT {
        w.push(Warning::HardToWind {
            copper_fill: r.lay.copper_fill,
            limit: HAND_FILL_LIMIT,
        });
    }
    if primary_amps > HIGH_CURRENT_A {
        w.push(Warning::HighPrimaryCurrent { amps: primary_amps });
    }
    if matches!(
        c.job.waveform,
        Waveform::Square | Waveform::QuasiSquare { .. }
    ) {
        w.push(Warning::SquareDrive {
            loss_factor: c.job.waveform.loss_factor(c.job.steel.shares),
        });
    }
    for wp in windings {
        if matches!(wp.wire.conductor, Conductor::Round(_)) && wp.wire.strands > 8 {
            w.push(Warning::ManyStrands {
                winding: wp.name.clone(),
                strands: wp.wire.strands,
            });
        }
    }
}

/// A rectified output's check: its DC volts (a battery's charge current) against the target, or
/// within the tolerance for fixed turns.
fn dc_check(job: &Job, w: &WindingPlan, d: &DcPlan) -> Check {
    let battery = d.load.filter == crate::rectifier::Filter::Battery;
    let (reached, target, other) = if battery {
        (d.amps, d.load.dc_amps, d.volts_full_load)
    } else {
        (d.volts_full_load, d.load.dc_volts, d.amps)
    };
    let tolerance = job
        .windings
        .iter()
        .find(|s| s.name == w.name)
        .filter(|s| s.fixed_turns.is_some() || s.kept)
        .map(|s| s.volts_tolerance_pct);
    let ok = match tolerance {
        Some(t) => (reached - target).abs() <= target * t / 100.0 * (1.0 + 1e-9),
        None => reached >= target * (1.0 - 1e-9),
    };
    Check {
        ok,
        figures: CheckFigures::DcOutput {
            winding: w.name.clone(),
            reached,
            target,
            other,
            charge_current: battery,
            max: w.max_volts_full_load,
            tolerance_pct: tolerance,
        },
    }
}

/// The checks of the verdict, in their fixed order.
fn checks(
    c: &Ctx,
    r: &Round,
    windings: &[WindingPlan],
    thermal: &Thermal,
    primary_amps: f64,
) -> Vec<Check> {
    let job = c.job;
    let flux_limit = c.design_flux.min(MAX_FLUX_T);
    let mut checks = vec![
        Check {
            ok: r.flux <= flux_limit * (1.0 + 1e-9),
            figures: CheckFigures::Flux {
                flux_t: r.flux,
                limit_t: flux_limit,
                source: c.source.clone(),
            },
        },
        Check {
            ok: r.lay.fits,
            figures: CheckFigures::Window {
                build_mm: r.lay.build_mm,
                available_mm: r.lay.available_mm,
                copper_fill: r.lay.copper_fill,
                no_turn_fits: r.lay.coils.iter().any(|co| co.turns_per_layer == 0),
            },
        },
        Check {
            ok: thermal.rise_c <= job.max_rise_c * (1.0 + 1e-9),
            figures: CheckFigures::Heating {
                rise_c: thermal.rise_c,
                limit_c: job.max_rise_c,
            },
        },
    ];
    checks.push(Check {
        ok: thermal.hot_spot_c <= thermal.insulation_class.limit_c() + 1e-9,
        figures: CheckFigures::InsulationClass {
            hot_spot_c: thermal.hot_spot_c,
            class: thermal.insulation_class.letter(),
            limit_c: thermal.insulation_class.limit_c(),
        },
    });
    let worst_j = windings
        .iter()
        // The limit is on the wire the plan chooses: a kept winding's and a conductor the job gives
        // (a size, strip, cable or measured wire) are judged by heating and the insulation class.
        .filter(|w| {
            !matches!(w.wire.conductor, Conductor::Kept { .. })
                && !job
                    .windings
                    .iter()
                    .any(|s| s.name == w.name && s.wire.given())
        })
        .map(|w| (w.current_density_a_mm2, w.name.as_str()))
        .fold((0.0, ""), |acc, x| if x.0 > acc.0 { x } else { acc });
    checks.push(Check {
        ok: worst_j.0 <= job.current_density_a_mm2 * (1.0 + 1e-9),
        figures: CheckFigures::CurrentDensity {
            highest_a_mm2: worst_j.0,
            winding: worst_j.1.to_string(),
            limit_a_mm2: job.current_density_a_mm2,
        },
    });
    checks.push(Check {
        ok: r.primary_ok,
        figures: CheckFigures::PrimaryCurrent { amps: primary_amps },
    });
    for w in windings.iter().filter(|w| w.role == Role::Secondary) {
        if let Some(d) = &w.dc {
            checks.push(dc_check(job, w, d));
            continue;
        }
        let tolerance = job
            .windings
            .iter()
            .find(|s| s.name == w.name)
            .filter(|s| s.fixed_turns.is_some())
            .map(|s| s.volts_tolerance_pct);
        let ok = match tolerance {
            // Fixed turns: within the tolerance either way of the volts, when they are given.
            Some(t) if w.volts_given => {
                (w.volts_full_load - w.volts).abs() <= w.volts * t / 100.0 * (1.0 + 1e-9)
            }
            Some(_) => true,
            None => w.volts_full_load >= w.volts * (1.0 - 1e-9),
        };
        checks.push(Check {
            ok,
            figures: CheckFigures::Output {
                winding: w.name.clone(),
                volts_full_load: w.volts_full_load,
                amps: w.amps,
                target_volts: w.volts,
                max_volts: w.max_volts_full_load,
                tolerance_pct: tolerance.filter(|_| w.volts_given),
                fixed_no_target: tolerance.is_some() && !w.volts_given,
            },
        });
    }
    checks
}

/// Plans a job. Never fails on a checked job: a design that does not work is a verdict.
pub fn plan(job: &Job) -> Plan {
    let mut warnings = job.input_warnings.clone();
    let c = Ctx::new(job, &mut warnings);
    let mut st = initial_state(&c);
    let r = settle(&c, &mut st);
    let (windings, p_out, p_cu) = winding_figures(&c, &st, &r);
    let worst_regulation = windings
        .iter()
        .filter_map(|w| w.regulation_pct)
        .fold(0.0, f64::max);
    let thermal = heating(&c, &r, &windings);
    late_warnings(&c, &r, &windings, st.primary_amps, &mut warnings);
    let verdict = Verdict::new(checks(&c, &r, &windings, &thermal, st.primary_amps));
    let (f, ae) = (job.frequency_hz, c.g.area_net_mm2);
    let (magnetising_amps, idle_amps, mag_peak) = loads::idle(&c, r.core_w, &r.mag);
    let inrush = loads::inrush_of(
        &c,
        &st,
        &r.lay.coils[c.p_idx],
        windings[c.p_idx].resistance_20c_ohm,
        r.flux,
        mag_peak,
    );
    let probe = job.probe.as_ref().map(|_| ProbePlan {
        volts_per_turn: c.v_meas(),
        donor_flux_t: c.test.as_ref().map(|(_, t)| t.donor_flux_t),
        knee_volts: c.sweep_rep.as_ref().and_then(|s| s.knee_volts),
        knee_flux_t: c.sweep_rep.as_ref().and_then(|s| s.knee_flux_t),
        tangent_flux_t: c.sweep_rep.as_ref().and_then(|s| s.tangent_flux_t),
        recommended_flux_t: c.recommended,
    });
    Plan {
        name: job.name.clone(),
        core: job.core.clone(),
        steel: job.steel.clone(),
        drive: Drive {
            frequency_hz: f,
            waveform: job.waveform,
            flux_density_t: r.flux,
            design_flux_t: c.design_flux,
            flux_source: c.source.clone(),
            flux_limit_t: c.design_flux.min(MAX_FLUX_T),
            volts_per_turn: r.v_turn,
            primary_rms_volts: c.v_p_rms,
            primary_amps: st.primary_amps,
            no_load_amps: c.sweep.map(|s| no_load_amps(s, f, ae, r.flux, st.n_p)),
            flux_vs_donor: c.test.as_ref().map(|(_, t)| r.flux / t.donor_flux_t),
            kept_output_note: kept_output_note(&c, &r),
            kept_limit: kept_limit(&c, &st, &r),
            magnetising_amps,
            idle_amps,
            inrush,
        },
        windings,
        window: WindowPlan {
            copper_fill: r.lay.copper_fill,
            build_mm: r.lay.build_mm,
            available_mm: r.lay.available_mm,
            traverse_mm: r.lay.traverse_mm,
            fits: r.lay.fits,
        },
        losses: LossPlan {
            core_w: r.core_w,
            copper_w: p_cu,
            output_w: p_out,
            efficiency: efficiency(p_out, p_cu, r.core_w),
            regulation_pct: worst_regulation,
            core_waveform_factor: job.waveform.loss_factor(job.steel.shares),
            saturated: r.flux > SATURATION_T,
        },
        thermal,
        probe,
        verdict,
        warnings,
        cautions: CAUTIONS,
        current_density_limit_a_mm2: job.current_density_a_mm2,
        settings: job.settings_layout(),
        lead_m: job.lead_m,
        system: job.system,
        grade: job.grade,
        max_strand_mm: job.max_strand_mm,
        geometry: c.g,
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
        let total = w.turns as u64 * w.sections as u64;
        if total > crate::job::MAX_WINDING_TURNS as u64 {
            return Err(Error::bad_value(
                origin,
                format!("[[winding]] \"{}\"", w.name),
                format!("{total} turns"),
                format!(
                    "a winding of more than {} turns is not one a person winds: the volts are too high for the core at this frequency (raise the frequency or the core's area, or lower the volts)",
                    crate::job::MAX_WINDING_TURNS
                ),
            ));
        }
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

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    /// Arithmetic of the model's equations holds to rounding.
    const SOLVED: f64 = 1e-6;

    fn job(text: &str) -> Job {
        crate::job::parse_job(text, "t", &|_| Err(Error::Failed("no sweep".into()))).expect("job")
    }

    #[test]
    fn two_outputs_solved_by_hand() {
        // Two 25 V outputs of 3 A on one core. By hand, with the plan's own resistances (hot),
        // leakage and core loss: the in-phase primary current is I_ip = Σ I_s·N_s/N_p + P_core/V_p;
        // each output's EMF is (N_s/N_p)(V_p − R_p·(I_ip − its own I_s·N_s/N_p)) behind
        // R_s + R_p·(N_s/N_p)² and X_s = ω·L_s (its leakage), and at unity power factor
        // V_FL = √(E² − (I_s·X_s)²) − I_s·R (the phasor drop; any electrical-machines text). Each
        // output has the fewest turns that reach 25 V: one turn fewer (resistance in proportion,
        // leakage by turns²) falls short. The primary's RMS adds the magnetising current in
        // quadrature.
        let p = plan(&job(
            "[core]\ntongue_mm = 35\nstack_mm = 45\nwindow_width_mm = 17.5\nwindow_height_mm = 52.5\n[supply]\nfrequency_hz = 50\n[[winding]]\nname = \"mains\"\nrole = \"primary\"\nvolts = 230\n[[winding]]\nname = \"a\"\nrole = \"secondary\"\nvolts = 25\namps = 3\n[[winding]]\nname = \"b\"\nrole = \"secondary\"\nvolts = 25\namps = 3\n",
        ));
        let (vp, ip) = (230.0, p.drive.primary_amps);
        let np = p.windings[0].turns as f64;
        let rp = p.windings[0].resistance_ohm;
        let w_ = 2.0 * std::f64::consts::PI * 50.0;
        let i_ip = p.windings[1..]
            .iter()
            .map(|w| w.amps * w.turns as f64 / np)
            .sum::<f64>()
            + p.losses.core_w / vp;
        let fl_at = |w: &WindingPlan, ns: f64| {
            let own = w.amps * w.turns as f64 / np;
            let e = ns / np * (vp - rp * (i_ip - own));
            let r = w.resistance_ohm * ns / w.turns as f64 + rp * (ns / np).powi(2);
            let x = w_ * w.leakage_h * (ns / w.turns as f64).powi(2);
            (e * e - (w.amps * x).powi(2)).sqrt() - w.amps * r
        };
        for w in &p.windings[1..] {
            let ns = w.turns as f64;
            let fl = fl_at(w, ns);
            assert_relative_eq!(w.volts_full_load, fl, max_relative = SOLVED);
            assert!(fl >= 25.0, "{}: {fl}", w.name);
            let fl_less = fl_at(w, ns - 1.0);
            assert!(
                fl_less < 25.0,
                "{}: one turn fewer still gives {fl_less}",
                w.name
            );
            // McLyman's regulation of this output.
            let reg = (w.volts_no_load - fl) / fl * 100.0;
            assert_relative_eq!(w.regulation_pct.expect("reg"), reg, max_relative = SOLVED);
        }
        let quadrature = (i_ip * i_ip + p.drive.magnetising_amps.powi(2)).sqrt();
        assert_relative_eq!(ip, quadrature, max_relative = 0.01);
        // The two outputs see the same primary drop: the outer one, with its longer mean turn,
        // has at least the inner one's turns.
        assert!(p.windings[2].turns >= p.windings[1].turns);
    }

    #[test]
    fn square_drive_core_loss_is_the_sine_figure_times_the_loss_separation_factor() {
        // The same core and peak flux under sine and under a full square drive: the square's core
        // loss is the sine's × 0.945 (magnetics::Waveform::loss_factor, checked there against a
        // numerical integration of the flux waveform).
        let sine = "[core]\ntongue_mm = 35\nstack_mm = 45\nwindow_width_mm = 17.5\nwindow_height_mm = 52.5\n[supply]\nfrequency_hz = 50\n[limits]\nflux_density_t = 1.2\n[[winding]]\nname = \"p\"\nrole = \"primary\"\nvolts = 230\n[[winding]]\nname = \"s\"\nrole = \"secondary\"\nvolts = 25\namps = 2\n";
        let square = sine.replace(
            "frequency_hz = 50",
            "frequency_hz = 50\nwaveform = \"square\"",
        );
        let (a, b) = (plan(&job(sine)), plan(&job(&square)));
        let per_t2 = |p: &Plan| p.losses.core_w / p.drive.flux_density_t.powi(2);
        let k = Waveform::Square.loss_factor(crate::magnetics::DEFAULT_SHARES);
        assert_relative_eq!(per_t2(&b) / per_t2(&a), k, max_relative = SOLVED);
        assert!(b
            .warnings
            .iter()
            .any(|w| matches!(w, Warning::SquareDrive { .. })));
    }
}
