//! The loads as they are drawn (DESIGN.md, "Loads as they are drawn"), inside the plan's rounds:
//!
//! - each rectified output is solved for its periodic steady state (`rectifier`) at its turns, with
//!   its own hot resistance plus the primary's referred by (N_s/N_p)², its leakage referred to it,
//!   and the EMF per turn less the drop the rest of the primary current makes; its turns are the
//!   fewest whose full-load DC volts reach the target (a battery: whose mean charge current does);
//! - an AC output's full-load volts are the phasor drop of its current at its power factor through
//!   R + jX (`leakage::phasor_volts`), X = ω·L_leak referred to it;
//! - the primary current is the RMS of the SUM of every referred winding current waveform, the
//!   core-loss current (in phase with the volts) and the magnetising current (`magnetising`), on one
//!   grid of 2·STEPS points over a cycle — not the sum of RMS values;
//! - the short-circuit current of each output: its no-load EMF over √(R² + X²), R its own plus the
//!   primary's referred (the primary at rated volts);
//! - Specht's inrush estimate for the primary.

use super::{Ctx, State};
use crate::job::DcLoad;
use crate::layout::{CoilLayout, Layout};
use crate::leakage::{between_h, phasor_volts, Placed};
use crate::magnetics::Waveform;
use crate::magnetising::{current_wave, inrush, rms, Inrush, InrushInput};
use crate::rectifier::{solve_from, Circuit, Filter, Rectifier, Solution, STEPS};
use std::f64::consts::{PI, SQRT_2};

/// Points per cycle of the waveforms the primary current is summed on.
pub const GRID: usize = 2 * STEPS;

/// The drive's volts waveform at GRID points from the rising zero crossing, scaled to RMS 1.
pub fn volts_shape(wf: Waveform) -> Vec<f64> {
    thread_local! {
        /// The last waveform's shape (a plan asks for one waveform many times).
        static LAST: std::cell::RefCell<Option<(Waveform, Vec<f64>)>> =
            const { std::cell::RefCell::new(None) };
    }
    LAST.with(|cell| {
        let mut last = cell.borrow_mut();
        match last.as_ref() {
            Some((w, v)) if *w == wf => v.clone(),
            _ => {
                let v = shape_of(wf);
                *last = Some((wf, v.clone()));
                v
            }
        }
    })
}

fn shape_of(wf: Waveform) -> Vec<f64> {
    (0..GRID)
        .map(|k| {
            let th = 2.0 * PI * (k as f64 + 0.5) / GRID as f64;
            match wf {
                Waveform::Sine => SQRT_2 * th.sin(),
                Waveform::Square => th.sin().signum(),
                Waveform::QuasiSquare { duty } => {
                    let t = th % PI;
                    let on = (t - PI / 2.0).abs() <= PI / 2.0 * duty;
                    if on {
                        th.sin().signum() / duty.sqrt()
                    } else {
                        0.0
                    }
                }
            }
        })
        .collect()
}

/// The peak of the volts waveform over its RMS.
pub fn crest(wf: Waveform) -> f64 {
    match wf {
        Waveform::Sine => SQRT_2,
        Waveform::Square => 1.0,
        Waveform::QuasiSquare { duty } => 1.0 / duty.sqrt(),
    }
}

fn placed(co: &CoilLayout) -> Placed {
    Placed {
        start_mm: co.start_mm,
        build_mm: co.build_mm,
        offset_mm: co.offset_mm,
        traverse_mm: co.traverse_mm,
        mean_turn_mm: co.mean_turn_mm,
        section: co.section,
    }
}

/// Legs the windings are shared over.
fn legs(c: &Ctx) -> f64 {
    match c.job.core.shape {
        crate::geometry::Shape::Ui => 2.0,
        crate::geometry::Shape::Ei => 1.0,
    }
}

/// Leakage inductance per turn² of each winding against the primary, referred to it (the primary's
/// against the first output), H. A half or section is taken with its turns over the whole
/// winding's build.
pub fn leakage_per_turn2(c: &Ctx, lay: &Layout) -> Vec<f64> {
    let p = c.p_idx;
    let other = (0..lay.coils.len()).find(|&i| i != p);
    (0..lay.coils.len())
        .map(|i| {
            let j = if i == p { other } else { Some(p) };
            match j {
                Some(j) => between_h(&placed(&lay.coils[i]), &placed(&lay.coils[j]), 1.0, legs(c)),
                None => 0.0,
            }
        })
        .collect()
}

/// The winding's referred share of the primary's resistance per (turns/N_p)²: both halves of ±
/// rails load the primary at once.
fn primary_share(d: &DcLoad, centre_tap: bool) -> f64 {
    if d.dual_rails(centre_tap) {
        2.0
    } else {
        1.0
    }
}

/// What a round knows that the rectifier circuits of output `i` need.
pub struct Drop<'a> {
    /// Hot resistance per turn of each winding, Ω.
    pub per_turn: &'a [f64],
    /// The primary's resistance as its current sees it, Ω.
    pub r_p: f64,
    /// Leakage per turn² of each winding, H.
    pub leak: &'a [f64],
    /// Volts per turn (RMS) at no load.
    pub v_turn: f64,
}

/// The EMF per turn (RMS) output `i` sees at full load: the volts per turn less the drop the rest of
/// the primary current (all but its own reflected current; its part in phase with the volts) makes
/// in the primary.
pub fn v_eff(c: &Ctx, st: &State, d: &Drop, i: usize) -> f64 {
    let _ = c;
    d.v_turn - d.r_p * st.rest[i] / st.n_p as f64
}

/// The rectifier circuit of output `i` at `n` turns (per half).
pub fn circuit(c: &Ctx, st: &State, d: &Drop, i: usize, n: u32, v_eff: f64) -> Circuit {
    let w = &c.job.windings[i];
    let dc = w.dc.unwrap_or(DC_NONE);
    let nf = n as f64;
    let ratio = nf / st.n_p as f64;
    let dual = dc.dual_rails(w.centre_tap);
    Circuit {
        rectifier: if dual {
            Rectifier::CentreTap
        } else {
            dc.rectifier
        },
        filter: dc.filter,
        waveform: c.job.waveform,
        emf_peak_v: nf * v_eff.max(0.0) * crest(c.job.waveform),
        frequency_hz: c.job.frequency_hz,
        r_ohm: d.per_turn[i] * nf + d.r_p * ratio * ratio * primary_share(&dc, w.centre_tap),
        l_h: d.leak[i] * nf * nf,
        diode_v: dc.diode_drop_v,
        capacitor_f: dc.capacitor_uf * 1e-6,
        choke_h: dc.choke_h,
        choke_ohm: dc.choke_ohm,
        load_ohm: dc.dc_volts / dc.dc_amps.max(1e-12),
        battery_v: dc.dc_volts,
        battery_ohm: dc.battery_ohm,
    }
}

/// A stand-in never used (every caller has checked `dc`).
const DC_NONE: DcLoad = DcLoad {
    rectifier: Rectifier::Bridge,
    filter: Filter::Resistive,
    dc_volts: 1.0,
    dc_amps: 1.0,
    capacitor_uf: 0.0,
    choke_h: 0.0,
    choke_ohm: 0.0,
    battery_ohm: 0.02,
    diode_drop_v: 0.9,
};

/// The figure a rectified output's turns are chosen on (DC volts; a battery's mean charge current)
/// and its target.
pub fn dc_figure(d: &DcLoad, s: &Solution) -> (f64, f64) {
    match d.filter {
        Filter::Battery => (s.dc_amps, d.dc_amps),
        _ => (s.dc_volts, d.dc_volts),
    }
}

/// RMS current of one half (or the whole winding) from a solution.
pub fn half_rms(d: &DcLoad, centre_tap: bool, s: &Solution) -> f64 {
    if d.dual_rails(centre_tap) {
        // The solver's centre-tap share halves the square; each half of ± rails carries both
        // rails' pulses.
        s.rms_amps * SQRT_2
    } else {
        s.rms_amps
    }
}

/// Solves every rectified output at its present turns: their RMS currents and waveforms.
pub fn solve_rectified(c: &Ctx, st: &mut State, d: &Drop) {
    for i in 0..c.job.windings.len() {
        let w = &c.job.windings[i];
        let Some(dc) = w.dc else { continue };
        let v = v_eff(c, st, d, i);
        let s = solve_from(&circuit(c, st, d, i, st.turns[i], v), st.rect[i].as_ref());
        st.amps[i] = half_rms(&dc, w.centre_tap, &s);
        st.rect[i] = Some(s);
    }
}

/// Turns and the figure they reach.
type Point = (u32, f64);

/// The fewest turns of rectified output `i` that reach its target, and the most it reaches when
/// none does (None when the target is reached). The figure rises with the turns up to a maximum
/// (the winding's resistance grows as N²): a bracket [lo short, hi reaching] is found by secant
/// steps from the last round's turns, then closed by secant-guided bisection, so a cold start far
/// from the answer costs a handful of solves.
pub fn rectified_turns(c: &Ctx, st: &State, d: &Drop, i: usize) -> (u32, Option<f64>) {
    let w = &c.job.windings[i];
    let Some(dc) = w.dc else {
        return (st.turns[i], None);
    };
    let v = v_eff(c, st, d, i);
    let warm = st.rect[i].as_ref();
    let target = dc_figure(&dc, st.rect[i].as_ref().unwrap_or(&EMPTY)).1;
    let max_n = crate::job::MAX_WINDING_TURNS;
    let mut seen: Vec<(u32, f64)> = Vec::new();
    let mut at = |n: u32| -> f64 {
        if let Some(&(_, f)) = seen.iter().find(|(m, _)| *m == n) {
            return f;
        }
        let f = dc_figure(&dc, &solve_from(&circuit(c, st, d, i, n, v), warm)).0;
        seen.push((n, f));
        f
    };
    let n0 = st.turns[i].clamp(1, max_n);
    let f0 = match &st.rect[i] {
        Some(s) => dc_figure(&dc, s).0,
        None => at(n0),
    };
    let (mut lo, mut hi): (Option<Point>, Option<Point>) = if f0 >= target {
        (None, Some((n0, f0)))
    } else {
        (Some((n0, f0)), None)
    };
    // The next point by the secant through two known points, else a proportional guess.
    let secant = |a: (u32, f64), b: (u32, f64)| -> Option<f64> {
        let df = b.1 - a.1;
        (df.abs() > 1e-300 && a.0 != b.0)
            .then(|| b.0 as f64 + (target - b.1) * (b.0 as f64 - a.0 as f64) / df)
    };
    for _ in 0..60 {
        match (lo, hi) {
            (Some(l), Some(h)) if h.0 <= l.0 + 1 => return (h.0, None),
            (Some(l), Some(h)) => {
                let mid = ((l.0 + h.0) / 2).clamp(l.0 + 1, h.0 - 1);
                let guess = secant(l, h)
                    .map(|x| (x.round() as u32).clamp(l.0 + 1, h.0 - 1))
                    .unwrap_or(mid);
                // The secant's guess and its neighbour on the far side: one round closes the
                // bracket when the secant is right.
                let g = guess;
                let fg = at(g);
                if fg >= target {
                    hi = Some((g, fg));
                    if g > l.0 + 1 {
                        let f1 = at(g - 1);
                        if f1 >= target {
                            hi = Some((g - 1, f1));
                        } else {
                            lo = Some((g - 1, f1));
                        }
                    }
                } else {
                    lo = Some((g, fg));
                    if g + 1 < h.0 {
                        let f1 = at(g + 1);
                        if f1 >= target {
                            hi = Some((g + 1, f1));
                        } else {
                            lo = Some((g + 1, f1));
                        }
                    }
                }
            }
            (None, Some(h)) => {
                if h.0 <= 1 {
                    return (1, None);
                }
                let below = h.0 - 1;
                let fb = at(below);
                if fb < target {
                    return (h.0, None);
                }
                let est = secant((below, fb), h)
                    .unwrap_or(below as f64 * target / fb.max(1e-12))
                    .floor()
                    .clamp(1.0, (below - 1).max(1) as f64) as u32;
                let fe = at(est);
                if fe >= target {
                    hi = Some((est, fe));
                } else {
                    lo = Some((est, fe));
                    hi = Some((below, fb));
                }
            }
            (Some(l), None) => {
                if l.0 >= max_n {
                    return (l.0, Some(l.1));
                }
                let above = l.0 + 1;
                let fa = at(above);
                if fa >= target {
                    return (above, None);
                }
                if fa <= l.1 {
                    // Past the maximum: more turns give less.
                    return (l.0, Some(l.1));
                }
                if above >= max_n {
                    return (above, Some(fa));
                }
                let est = secant(l, (above, fa))
                    .unwrap_or(above as f64 * 1.1)
                    .ceil()
                    .clamp((above + 1) as f64, max_n as f64) as u32;
                let fe = at(est);
                if fe >= target {
                    hi = Some((est, fe));
                    lo = Some((above, fa));
                } else if fe > fa {
                    lo = Some((est, fe));
                } else {
                    // The maximum lies between: walk from `above`.
                    let mut best = (above, fa);
                    let mut n = above;
                    while n < est {
                        let f = at(n + 1);
                        if f >= target {
                            return (n + 1, None);
                        }
                        if f <= best.1 {
                            break;
                        }
                        best = (n + 1, f);
                        n += 1;
                    }
                    return (best.0, Some(best.1));
                }
            }
            (None, None) => return (n0, None),
        }
    }
    match (lo, hi) {
        (_, Some(h)) => (h.0, None),
        (Some(l), None) => (l.0, Some(l.1)),
        (None, None) => (n0, None),
    }
}

/// An empty solution (for a target read before any solve).
const EMPTY: Solution = Solution {
    dc_volts: 0.0,
    dc_amps: 0.0,
    dc_volts_no_load: 0.0,
    ripple_pp_v: 0.0,
    rms_amps: 0.0,
    peak_amps: 0.0,
    conduction_deg: 0.0,
    wave: Vec::new(),
    iterations: 0,
    start: [0.0; 3],
    jacobian: Vec::new(),
    converged: false,
};

/// An AC output's full-load volts at `n` turns: the phasor drop through its own resistance per turn
/// `a` and the primary's share `b`·n² (`ab` = (a, b)), and X = ω·leak·n², at its power factor.
pub fn ac_volts(c: &Ctx, i: usize, n: f64, v: f64, amps: f64, ab: (f64, f64), leak: f64) -> f64 {
    let (a, b) = ab;
    let w = &c.job.windings[i];
    let x = 2.0 * PI * c.job.frequency_hz * leak * n * n;
    phasor_volts(n * v, amps, a * n + b * n * n, x, w.power_factor)
}

/// The fewest turns whose phasor full-load volts reach `target`, from a first guess.
pub fn ac_turns(reach: &dyn Fn(u32) -> f64, target: f64, guess: u32) -> u32 {
    let mut n = guess.max(1);
    let mut guard = 0;
    while reach(n) < target * (1.0 - 1e-12) && guard < 1000 && n < crate::job::MAX_WINDING_TURNS {
        if reach(n + 1) <= reach(n) {
            break;
        }
        n += 1;
        guard += 1;
    }
    while n > 1 && reach(n - 1) >= target * (1.0 - 1e-12) && guard < 2000 {
        n -= 1;
        guard += 1;
    }
    n
}

/// The magnetising current waveform of the primary (A at GRID points): from the sweep when there is
/// one (its current less the core-loss current, in quadrature), else from the steel's table.
pub fn magnetising_wave(c: &Ctx, flux_t: f64, n_p: u32, core_amps: f64) -> Vec<f64> {
    if let Some(s) = c.sweep {
        let f = c.job.frequency_hz;
        let idle = crate::probe::no_load_amps(s, f, c.g.area_net_mm2, flux_t, n_p);
        let m = (idle * idle - core_amps * core_amps).max(0.0).sqrt();
        return crate::magnetising::flux_shape(Waveform::Sine, GRID)
            .into_iter()
            .map(|b| b * m * SQRT_2)
            .collect();
    }
    current_wave(
        &c.job.steel.kind,
        c.job.waveform,
        flux_t,
        c.g.path_length_mm,
        n_p as f64,
        GRID,
    )
}

/// The primary current waveform: every output's current referred, the core-loss current and the
/// magnetising current; its RMS; and for each output the part of the primary current, in phase
/// with the volts, that is not its own (what drops the volts it sees).
pub fn primary_wave(c: &Ctx, st: &State, core_w: f64, mag: &[f64]) -> (Vec<f64>, f64, Vec<f64>) {
    let shape = volts_shape(c.job.waveform);
    let in_phase =
        |w: &[f64]| -> f64 { w.iter().zip(&shape).map(|(a, b)| a * b).sum::<f64>() / GRID as f64 };
    let mut own = vec![0.0; c.job.windings.len()];
    let core_amps = core_w / c.v_p_rms;
    let mut sum: Vec<f64> = shape
        .iter()
        .zip(mag)
        .map(|(s, m)| s * core_amps + m)
        .collect();
    for (i, w) in c.job.windings.iter().enumerate() {
        if i == c.p_idx {
            continue;
        }
        let ratio = st.turns[i] as f64 / st.n_p as f64;
        match (&w.dc, &st.rect[i]) {
            (Some(d), Some(s)) if s.wave.len() == GRID => {
                let k = ratio * primary_share(d, w.centre_tap);
                let mean = if d.rectifier == Rectifier::HalfWave {
                    s.wave.iter().sum::<f64>() / GRID as f64
                } else {
                    0.0
                };
                let referred: Vec<f64> = s.wave.iter().map(|iw| k * (iw - mean)).collect();
                own[i] = in_phase(&referred);
                for (p, v) in sum.iter_mut().zip(&referred) {
                    *p += v;
                }
            }
            _ => {
                // An AC load at its power factor (lagging): the volts' shape shifted by φ.
                let phi = w.power_factor.clamp(0.0, 1.0).acos();
                let shift = (phi / (2.0 * PI) * GRID as f64).round() as usize % GRID;
                let amps = c.mult(i) * st.amps[i] * ratio;
                for (k, p) in sum.iter_mut().enumerate() {
                    *p += amps * shape[(k + GRID - shift) % GRID];
                }
                own[i] = amps * w.power_factor;
            }
        }
    }
    let r = rms(&sum);
    let total = in_phase(&sum);
    let rest = own.iter().map(|o| (total - o).max(0.0)).collect();
    (sum, r, rest)
}

/// The primary current's RMS and each output's rest, without building the waveform when the
/// loads allow (`in_phase_loads`).
pub fn primary_rms(c: &Ctx, st: &State, core_w: f64, mag: &[f64]) -> (f64, Vec<f64>) {
    let (_, rms, rest) =
        in_phase_loads(c, st, core_w, mag).unwrap_or_else(|| primary_wave(c, st, core_w, mag));
    (rms, rest)
}

/// The same for a job whose outputs all draw in phase with the volts (AC, unity power factor): the
/// sum is A·shape + magnetising, A the in-phase amps, so its mean square is A² + 2A·⟨shape, mag⟩ +
/// ⟨mag²⟩ with no waveform to build (the waveform itself is left empty). None otherwise.
fn in_phase_loads(
    c: &Ctx,
    st: &State,
    core_w: f64,
    mag: &[f64],
) -> Option<(Vec<f64>, f64, Vec<f64>)> {
    let outputs = || {
        c.job
            .windings
            .iter()
            .enumerate()
            .filter(|(i, _)| *i != c.p_idx)
    };
    if outputs().any(|(_, w)| w.dc.is_some() || w.power_factor < 1.0) {
        return None;
    }
    let (m_in, m_sq) = magnetising_stats(c.job.waveform, mag);
    let mut own = vec![0.0; c.job.windings.len()];
    let mut a = core_w / c.v_p_rms;
    for (i, _) in outputs() {
        own[i] = c.mult(i) * st.amps[i] * st.turns[i] as f64 / st.n_p as f64;
        a += own[i];
    }
    let total_in_phase = a + m_in;
    let rms = (a * a + 2.0 * a * m_in + m_sq).max(0.0).sqrt();
    let rest = own.iter().map(|o| (total_in_phase - o).max(0.0)).collect();
    Some((Vec::new(), rms, rest))
}

/// The magnetising wave's part in phase with the volts and its mean square.
fn magnetising_stats(wf: Waveform, mag: &[f64]) -> (f64, f64) {
    let shape = volts_shape(wf);
    let n = mag.len().max(1) as f64;
    let m_in = mag.iter().zip(&shape).map(|(m, s)| m * s).sum::<f64>() / n;
    let m_sq = mag.iter().map(|m| m * m).sum::<f64>() / n;
    (m_in, m_sq)
}

/// The short-circuit current of output `i` (per half or section) with the primary at rated volts,
/// and its leakage reactance and short-circuit impedance, Ω.
pub fn short_circuit(c: &Ctx, st: &State, d: &Drop, i: usize) -> (f64, f64, f64) {
    let n = st.turns[i] as f64;
    let ratio = n / st.n_p as f64;
    let x = 2.0 * PI * c.job.frequency_hz * d.leak[i] * n * n;
    let r = d.per_turn[i] * n + d.r_p * ratio * ratio;
    let z = (r * r + x * x).sqrt();
    let e = n * d.v_turn;
    (if z > 0.0 { e / z } else { f64::INFINITY }, x, z)
}

/// Specht's inrush for the primary: the air-cored coil inside its mean turn.
pub fn inrush_of(
    c: &Ctx,
    st: &State,
    co: &CoilLayout,
    r20_ohm: f64,
    flux_t: f64,
    mag_peak: f64,
) -> Inrush {
    let (a, s) = (c.job.core.tongue_mm, c.job.core.stack_mm);
    let legs = legs(c);
    // Mean turn = 2(a + s) + 2πr for a rectangle with rounded corners of radius r around the tongue.
    let r = ((co.mean_turn_mm - 2.0 * (a + s)) / (2.0 * PI)).max(0.0);
    let area = a * s + 2.0 * r * (a + s) + PI * r * r;
    let wf = c.job.waveform;
    let volts_peak = match wf {
        Waveform::Sine => SQRT_2 * c.v_p_rms,
        _ => c.primary().volts,
    };
    inrush(&InrushInput {
        volts_peak,
        frequency_hz: c.job.frequency_hz,
        // Two legs in series, each N/2 on its own coil: L = 2·μ0(N/2)²A/h = μ0·N²·A/(2h).
        turns: st.n_p as f64 / legs.sqrt(),
        coil_area_mm2: area,
        traverse_mm: co.traverse_mm,
        r_ohm: r20_ohm,
        b_pk_t: flux_t,
        b_r_t: c.job.steel.remanence_t,
        rated_amps: st.primary_amps,
        magnetising_peak_amps: mag_peak,
    })
}

/// The magnetising current, the idle current (magnetising and core-loss currents together) and
/// the magnetising peak, A.
pub fn idle(c: &Ctx, core_w: f64, mag: &[f64]) -> (f64, f64, f64) {
    let core_amps = core_w / c.v_p_rms;
    let idle: Vec<f64> = volts_shape(c.job.waveform)
        .iter()
        .zip(mag)
        .map(|(s, m)| s * core_amps + m)
        .collect();
    let peak = mag.iter().fold(0.0_f64, |m, v| m.max(v.abs()));
    (rms(mag), rms(&idle), peak)
}
