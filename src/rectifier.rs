//! A winding feeding a rectifier and its filter: the periodic steady state, solved directly.
//!
//! The circuit (DESIGN.md, "Loads as they are drawn"): the winding is an EMF e(t) = E·w(θ) (w the
//! drive's unit waveform: sine, square, or quasi-square of conduction δ) behind a resistance R (its
//! own hot resistance plus the primary's referred) and its leakage inductance L, feeding ideal diodes
//! with a fixed drop each (two in the path of a bridge, one for a centre tap or a half-wave), then
//!
//! - capacitor: C across the load resistor R_L = V_dc/I_dc;
//! - choke: a choke L_ch (with its own resistance) into C across R_L (choke input);
//! - battery: an EMF V_b behind its internal resistance R_b;
//! - resistive: R_L alone.
//!
//! While a pair of diodes conducts, (L + L_ch)·di/dt = s·e − n·V_d − (R + R_dc)·i − v (s the pair's
//! sign, v the capacitor's volts or the battery's EMF); with a choke the bridge may commute with all
//! diodes on (overlap: the winding shorted through them, L·di_w/dt = e − R·i_w, while the choke
//! freewheels), which ends when the incoming pair carries the whole choke current. A centre tap is
//! taken as a bridge with one diode drop; its overlap is modelled the same way (an approximation: the
//! two halves' mutual leakage is not modelled).
//!
//! The state at the start of a cycle (winding current, choke current, capacitor volts) is found by
//! shooting: Newton's method on x = Φ(x), Φ the map over one period (over half a period with the sign
//! of the winding current flipped, for the bridge and centre tap, which are half-wave symmetric),
//! Jacobian by finite differences, to 1e-9 relative. The period map is integrated with the
//! trapezoidal rule on each linear piece (switching instants located inside the step by linear
//! interpolation), 180 steps per half cycle, the EMF taken as its exact mean over each step.
//!
//! Closed forms this reproduces in its limits (tests below): a resistive load on a bridge draws
//! I_rms = I_dc·π/(2√2) (sine, 1.11 × I_dc), and VA/P_dc = 1.11 for the winding of a bridge with a
//! large choke and 1.57 for each half of a centre tap (any power-electronics textbook, e.g. Mohan,
//! Undeland & Robbins, Power Electronics, ch. 5).

use crate::magnetics::Waveform;
use std::borrow::Cow;
use std::f64::consts::PI;
use std::sync::OnceLock;

/// Steps per half cycle.
pub const STEPS: usize = 180;
/// Default drop of one silicon diode, V (DESIGN.md; common practice).
pub const DIODE_DROP_V: f64 = 0.9;
/// Default internal resistance of a battery, Ω (DESIGN.md; common practice for a car-size battery).
pub const BATTERY_OHM: f64 = 0.02;

/// The rectifier.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Rectifier {
    /// Four diodes on the whole winding.
    Bridge,
    /// Two diodes on a centre-tapped winding.
    CentreTap,
    /// One diode.
    HalfWave,
}

impl Rectifier {
    /// The job-file word.
    pub fn name(self) -> &'static str {
        match self {
            Rectifier::Bridge => "bridge",
            Rectifier::CentreTap => "centre-tap",
            Rectifier::HalfWave => "half-wave",
        }
    }
    /// Diodes in the path of the current.
    pub fn diodes(self) -> f64 {
        match self {
            Rectifier::Bridge => 2.0,
            _ => 1.0,
        }
    }
}

/// The filter after the rectifier.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Filter {
    /// A capacitor across the load.
    Capacitor,
    /// A choke, then a capacitor across the load.
    Choke,
    /// A battery being charged.
    Battery,
    /// A resistor alone.
    Resistive,
}

impl Filter {
    /// The job-file word.
    pub fn name(self) -> &'static str {
        match self {
            Filter::Capacitor => "capacitor",
            Filter::Choke => "choke",
            Filter::Battery => "battery",
            Filter::Resistive => "resistive",
        }
    }
}

/// One rectifier circuit, referred to the winding (one half of a centre tap).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Circuit {
    /// Rectifier.
    pub rectifier: Rectifier,
    /// Filter.
    pub filter: Filter,
    /// Drive waveform (its shape only).
    pub waveform: Waveform,
    /// Amplitude of the EMF, V.
    pub emf_peak_v: f64,
    /// Frequency, Hz.
    pub frequency_hz: f64,
    /// Series resistance: the winding's own plus the primary's referred, Ω.
    pub r_ohm: f64,
    /// Leakage inductance referred to the winding, H.
    pub l_h: f64,
    /// Drop of one diode, V.
    pub diode_v: f64,
    /// Capacitor, F (capacitor and choke filters).
    pub capacitor_f: f64,
    /// Choke, H, and its resistance, Ω (choke filter).
    pub choke_h: f64,
    /// The choke's resistance, Ω.
    pub choke_ohm: f64,
    /// Load resistance, Ω (capacitor, choke and resistive filters).
    pub load_ohm: f64,
    /// Battery EMF, V, and internal resistance, Ω (battery filter).
    pub battery_v: f64,
    /// The battery's internal resistance, Ω.
    pub battery_ohm: f64,
}

/// The periodic steady state.
#[derive(Debug, Clone, PartialEq)]
pub struct Solution {
    /// Mean load volts, V (a battery: its terminal volts, EMF plus the mean drop in it).
    pub dc_volts: f64,
    /// Mean load current, A (a battery: the mean charge current).
    pub dc_amps: f64,
    /// DC volts with no load: the peak less the diode drops (the mean of the rectified EMF for a
    /// resistive filter).
    pub dc_volts_no_load: f64,
    /// Ripple, peak to peak, V.
    pub ripple_pp_v: f64,
    /// RMS current in the winding (in each half of a centre tap), A.
    pub rms_amps: f64,
    /// Peak current in the winding, A.
    pub peak_amps: f64,
    /// How long each pulse of current lasts, electrical degrees.
    pub conduction_deg: f64,
    /// The winding's current over one cycle (a centre tap: half one's less half two's) at the
    /// middles of 2·STEPS equal steps from θ = 0.
    pub wave: Vec<f64>,
    /// Newton iterations taken.
    pub iterations: u32,
    /// The last Jacobian of the period map's residual (row-major), for a warm start.
    pub jacobian: Vec<f64>,
    /// The state at the start of the cycle (winding current, choke current, capacitor volts): a
    /// warm start for a nearby circuit.
    pub start: [f64; 3],
    /// Whether the start and end of a cycle agree to 1e-9 relative.
    pub converged: bool,
}

/// The state at a step boundary.
#[derive(Debug, Clone, Copy, PartialEq)]
struct State {
    /// Winding current (signed).
    iw: f64,
    /// Choke current (choke filter; |iw| otherwise).
    ich: f64,
    /// Capacitor volts.
    v: f64,
}

/// What one integration over a span gathers.
#[derive(Default, Clone, Copy)]
struct Tally {
    sq: f64,
    abs: f64,
    dc_load: f64,
    load_v: f64,
    vmin: f64,
    vmax: f64,
    peak: f64,
    on: f64,
}

/// sin at the step boundaries and its exact mean over each step, half a cycle.
fn sine_table() -> &'static (Vec<f64>, Vec<f64>) {
    static CELL: OnceLock<(Vec<f64>, Vec<f64>)> = OnceLock::new();
    CELL.get_or_init(|| {
        let h = PI / STEPS as f64;
        let points = (0..=STEPS).map(|k| (k as f64 * h).sin()).collect();
        let means = (0..STEPS)
            .map(|k| ((k as f64 * h).cos() - ((k + 1) as f64 * h).cos()) / h)
            .collect();
        (points, means)
    })
}

impl Circuit {
    /// The unit EMF of the first half cycle: at step boundaries and as each step's mean.
    fn half_wave_tables(&self) -> (Cow<'static, [f64]>, Cow<'static, [f64]>) {
        match self.waveform {
            Waveform::Sine => {
                let (p, m) = sine_table();
                (Cow::Borrowed(p.as_slice()), Cow::Borrowed(m.as_slice()))
            }
            Waveform::Square => (
                Cow::Owned(vec![1.0; STEPS + 1]),
                Cow::Owned(vec![1.0; STEPS]),
            ),
            Waveform::QuasiSquare { duty } => {
                let (a, b) = (PI / 2.0 * (1.0 - duty), PI / 2.0 * (1.0 + duty));
                let h = PI / STEPS as f64;
                let points = (0..=STEPS)
                    .map(|k| {
                        let t = k as f64 * h;
                        if t >= a && t <= b {
                            1.0
                        } else {
                            0.0
                        }
                    })
                    .collect();
                let means = (0..STEPS)
                    .map(|k| {
                        let (t0, t1) = (k as f64 * h, (k + 1) as f64 * h);
                        (t1.min(b) - t0.max(a)).max(0.0) / h
                    })
                    .collect();
                (Cow::Owned(points), Cow::Owned(means))
            }
        }
    }

    fn symmetric(&self) -> bool {
        self.rectifier != Rectifier::HalfWave
    }

    fn has_cap(&self) -> bool {
        matches!(self.filter, Filter::Capacitor | Filter::Choke)
    }

    /// Series resistance and inductance in the conducting path, and the opposing volts at zero
    /// current for a state.
    fn path(&self, st: &State) -> (f64, f64, f64) {
        let nvd = self.rectifier.diodes() * self.diode_v;
        match self.filter {
            Filter::Capacitor => (self.r_ohm, self.l_h, st.v + nvd),
            Filter::Choke => (
                self.r_ohm + self.choke_ohm,
                self.l_h + self.choke_h,
                st.v + nvd,
            ),
            Filter::Battery => (
                self.r_ohm + self.battery_ohm,
                self.l_h,
                self.battery_v + nvd,
            ),
            Filter::Resistive => (self.r_ohm + self.load_ohm, self.l_h, nvd),
        }
    }
}

/// Modes of the rectifier within a step.
#[derive(Debug, Clone, Copy, PartialEq)]
enum Mode {
    Off,
    /// One pair (sign +1 or −1) conducting.
    On(f64),
    /// A choke freewheeling through all four diodes while the winding current reverses; the
    /// outgoing pair's sign.
    Overlap(f64),
}

/// Integrates the circuit over `steps` steps starting at step `k0` of the cycle (steps ≥ STEPS
/// belong to the negative half), from `x`; `tally` gathers the figures; `wave` records the winding
/// current at each step's end.
struct Run<'a> {
    c: &'a Circuit,
    pts: &'a [f64],
    means: &'a [f64],
    h: f64,
    /// The capacitor's decay over one whole step with no current, exp(−h/(R_L·C)).
    decay_h: f64,
    /// A conducting pair's trapezoid over one whole step.
    on: Steady,
}

/// The trapezoid's coefficients for a conducting pair over one whole step (they do not depend on
/// the state): for [i, v] with a capacitor, for i alone without.
struct Steady {
    cap: bool,
    nvd: f64,
    r: f64,
    l_dt: f64,
    c_dt: f64,
    g_l: f64,
    a11: f64,
    a22: f64,
    back: f64,
    inv_det: f64,
}

impl Steady {
    fn new(c: &Circuit, h: f64) -> Steady {
        let (r, l0, _) = c.path(&State {
            iw: 0.0,
            ich: 0.0,
            v: 0.0,
        });
        let l = l0.max(r * h / 2.0);
        let cap = c.has_cap() && c.capacitor_f > 0.0;
        let l_dt = l / h;
        let a11 = l_dt + r / 2.0;
        let c_dt = c.capacitor_f / h;
        let g_l = 1.0 / c.load_ohm;
        let a22 = c_dt + g_l / 2.0;
        Steady {
            cap,
            nvd: c.rectifier.diodes() * c.diode_v,
            r,
            l_dt,
            c_dt,
            g_l,
            a11,
            a22,
            back: if c.filter == Filter::Battery {
                c.battery_v
            } else {
                0.0
            },
            inv_det: if cap {
                1.0 / (a11 * a22 + 0.25)
            } else {
                1.0 / a11
            },
        }
    }
}

impl Run<'_> {
    fn e_point(&self, k: usize) -> f64 {
        let (half, kk) = (k / STEPS, k % STEPS);
        let v = if kk == 0 && half > 0 {
            // Boundary between halves: the value entering the new half.
            0.0
        } else {
            self.pts[kk]
        };
        let s = if half % 2 == 0 { 1.0 } else { -1.0 };
        s * v * self.c.emf_peak_v
    }

    fn e_mean(&self, k: usize) -> f64 {
        let (half, kk) = (k / STEPS, k % STEPS);
        let s = if half % 2 == 0 { 1.0 } else { -1.0 };
        s * self.means[kk] * self.c.emf_peak_v
    }

    fn mode_of(&self, x: &State, k: usize) -> Mode {
        let c = self.c;
        if c.filter == Filter::Choke {
            if x.ich <= 0.0 {
                return Mode::Off;
            }
            if x.iw.abs() >= x.ich * (1.0 - 1e-12) {
                return Mode::On(if x.iw >= 0.0 { 1.0 } else { -1.0 });
            }
            let s = if self.e_point(k) >= 0.0 { -1.0 } else { 1.0 };
            return Mode::Overlap(s);
        }
        if x.iw > 0.0 {
            Mode::On(1.0)
        } else if x.iw < 0.0 {
            Mode::On(-1.0)
        } else {
            Mode::Off
        }
    }

    /// The sign of a pair that would start conducting now, if any.
    fn starts(&self, x: &State, e: f64) -> Option<f64> {
        let (_, _, opp) = self.c.path(x);
        if e > opp {
            Some(1.0)
        } else if -e > opp && self.c.symmetric() {
            Some(-1.0)
        } else {
            None
        }
    }

    /// One step of length `dt` (the EMF's mean `e` over it) in mode `m`; returns the new state.
    fn advance(&self, x: &State, m: Mode, e: f64, dt: f64) -> State {
        let c = self.c;
        let cap = c.capacitor_f;
        let rl = c.load_ohm;
        match m {
            Mode::Off => {
                let v = if !(c.has_cap() && cap > 0.0) {
                    x.v
                } else if dt == self.h {
                    x.v * self.decay_h
                } else {
                    x.v * (-dt / (rl * cap)).exp()
                };
                State {
                    iw: 0.0,
                    ich: 0.0,
                    v,
                }
            }
            Mode::On(s) if dt == self.h => {
                // A whole step: the trapezoid's matrix inverted once per circuit (`Steady`).
                let k = &self.on;
                let i0 = x.iw.abs();
                let drive = s * e - k.nvd;
                let (i1, v1) = if k.cap {
                    let b1 = k.l_dt * i0 - (k.r * i0 + x.v) / 2.0 + drive;
                    let b2 = k.c_dt * x.v + (i0 - x.v * k.g_l) / 2.0;
                    (
                        (b1 * k.a22 - 0.5 * b2) * k.inv_det,
                        (k.a11 * b2 + 0.5 * b1) * k.inv_det,
                    )
                } else {
                    (
                        ((k.l_dt - k.r / 2.0) * i0 + drive - k.back) * k.inv_det,
                        x.v,
                    )
                };
                State {
                    iw: s * i1,
                    ich: i1,
                    v: v1,
                }
            }
            Mode::On(s) => {
                let (r, l0, _) = c.path(x);
                let nvd = c.rectifier.diodes() * c.diode_v;
                // Never a time constant below half a step (the trapezoid then neither rings nor
                // overshoots); a real leakage is far above it.
                let l = l0.max(r * dt / 2.0);
                let i0 = x.iw.abs();
                let drive = s * e - nvd;
                let (i1, v1) = if c.has_cap() && cap > 0.0 {
                    // Trapezoid on [i, v]: a 2×2 linear solve.
                    let a11 = l / dt + r / 2.0;
                    let a12 = 0.5;
                    let a21 = -0.5;
                    let a22 = cap / dt + 1.0 / (2.0 * rl);
                    let b1 = l / dt * i0 - (r * i0 + x.v) / 2.0 + drive;
                    let b2 = cap / dt * x.v + (i0 - x.v / rl) / 2.0;
                    let det = a11 * a22 - a12 * a21;
                    ((b1 * a22 - a12 * b2) / det, (a11 * b2 - a21 * b1) / det)
                } else {
                    let back = match c.filter {
                        Filter::Battery => c.battery_v,
                        _ => 0.0,
                    };
                    let i1 = ((l / dt - r / 2.0) * i0 + drive - back) / (l / dt + r / 2.0);
                    (i1, x.v)
                };
                State {
                    iw: s * i1,
                    ich: i1,
                    v: v1,
                }
            }
            Mode::Overlap(_) => {
                let l = c.l_h.max(c.r_ohm * dt / 2.0);
                let iw = ((l / dt - c.r_ohm / 2.0) * x.iw + e) / (l / dt + c.r_ohm / 2.0);
                let nvd = c.rectifier.diodes() * c.diode_v;
                let (lc, rc) = (c.choke_h.max(c.choke_ohm * dt / 2.0), c.choke_ohm);
                let a11 = lc / dt + rc / 2.0;
                let a22 = cap / dt + 1.0 / (2.0 * rl);
                let b1 = lc / dt * x.ich - (rc * x.ich + x.v) / 2.0 - nvd;
                let b2 = cap / dt * x.v + (x.ich - x.v / rl) / 2.0;
                let det = a11 * a22 + 0.25;
                let ich = (b1 * a22 - 0.5 * b2) / det;
                let v = (a11 * b2 + 0.5 * b1) / det;
                State { iw, ich, v }
            }
        }
    }

    /// The load's volts and current for a state (for the mean and ripple).
    fn load(&self, x: &State) -> (f64, f64) {
        let c = self.c;
        match c.filter {
            Filter::Capacitor | Filter::Choke => (x.v, x.v / c.load_ohm),
            Filter::Battery => (c.battery_v + c.battery_ohm * x.ich, x.ich),
            Filter::Resistive => (c.load_ohm * x.ich, x.ich),
        }
    }

    /// Whether the mode must change within a step that went from `a` to `b` in mode `m`; the fraction
    /// of the step at which it does, and the mode after.
    fn event(&self, a: &State, b: &State, m: Mode, e0: f64, e1: f64) -> Option<(f64, Mode)> {
        let c = self.c;
        match m {
            Mode::On(s) => {
                let (i0, i1) = (a.iw * s, b.iw * s);
                if i1 < 0.0 {
                    return Some(((i0 / (i0 - i1)).clamp(0.0, 1.0), Mode::Off));
                }
                if c.filter == Filter::Choke && c.symmetric() {
                    // The winding's terminal volts reverse: the other pair turns on (overlap).
                    let term = |x: &State, e: f64| {
                        let (r, l, opp) = c.path(x);
                        let didt = (s * e - opp - r * x.ich) / l.max(1e-300);
                        s * e - c.r_ohm * x.ich - c.l_h * didt
                    };
                    let (t0, t1) = (term(a, e0), term(b, e1));
                    if t1 < 0.0 {
                        let f = if t0 > 0.0 { t0 / (t0 - t1) } else { 0.0 };
                        return Some((f.clamp(0.0, 1.0), Mode::Overlap(s)));
                    }
                }
                None
            }
            Mode::Off => {
                let (_, _, opp) = c.path(a);
                let g = |e: f64, s: f64| s * e - opp;
                for s in [1.0, -1.0] {
                    if s < 0.0 && !c.symmetric() {
                        continue;
                    }
                    let (g0, g1) = (g(e0, s), g(e1, s));
                    if g1 > 0.0 {
                        let f = if g0 < 0.0 { g0 / (g0 - g1) } else { 0.0 };
                        return Some((f.clamp(0.0, 1.0), Mode::On(s)));
                    }
                }
                None
            }
            Mode::Overlap(s) => {
                if b.ich <= 0.0 {
                    return Some((1.0, Mode::Off));
                }
                // Incoming pair (−s) takes the whole choke current.
                let (d0, d1) = (-s * a.iw - a.ich, -s * b.iw - b.ich);
                if d1 >= 0.0 {
                    let f = if d1 > d0 { -d0 / (d1 - d0) } else { 1.0 };
                    return Some((f.clamp(0.0, 1.0), Mode::On(-s)));
                }
                None
            }
        }
    }

    /// Integrates steps k0..k0+n from `x`; with a tally and a wave record when asked.
    fn run(
        &self,
        mut x: State,
        k0: usize,
        n: usize,
        mut tally: Option<&mut Tally>,
        mut wave: Option<&mut Vec<f64>>,
    ) -> State {
        let mut m = self.mode_of(&x, k0);
        if m == Mode::Off {
            if let Some(s) = self.starts(&x, self.e_point(k0)) {
                m = Mode::On(s);
            }
        }
        for k in k0..k0 + n {
            let e = self.e_mean(k);
            let (e0, e1) = (self.e_point(k), self.e_point(k + 1));
            let mut left = 1.0;
            let mut guard = 0;
            loop {
                let dt = self.h * left;
                let y = self.advance(&x, m, e, dt);
                let ev = if guard < 4 {
                    self.event(&x, &y, m, e0, e1)
                } else {
                    None
                };
                match ev {
                    Some((f, next)) if f < 1.0 - 1e-12 || next != m => {
                        let mid = lerp(&x, &y, f);
                        let mid = match next {
                            Mode::Off => State {
                                iw: 0.0,
                                ich: 0.0,
                                v: mid.v,
                            },
                            Mode::On(s) if matches!(m, Mode::Overlap(_)) => State {
                                iw: s * mid.ich,
                                ..mid
                            },
                            _ => mid,
                        };
                        // Account the part before the event in the tally.
                        if let Some(t) = tally.as_deref_mut() {
                            self.tally_piece(t, &x, &mid, dt * f);
                        }
                        x = mid;
                        m = next;
                        left *= 1.0 - f;
                        guard += 1;
                        if left <= 1e-12 {
                            break;
                        }
                    }
                    _ => {
                        if let Some(t) = tally.as_deref_mut() {
                            self.tally_piece(t, &x, &y, dt);
                        }
                        x = y;
                        break;
                    }
                }
            }
            if let Some(w) = wave.as_deref_mut() {
                w.push(x.iw);
            }
        }
        x
    }

    fn tally_piece(&self, t: &mut Tally, a: &State, b: &State, dt: f64) {
        // Trapezoid for ∫i², ∫|i| and the load's mean; extremes at the ends.
        t.sq += dt * (a.iw * a.iw + a.iw * b.iw + b.iw * b.iw) / 3.0;
        t.abs += dt * (a.iw.abs() + b.iw.abs()) / 2.0;
        let (va, ia) = self.load(a);
        let (vb, ib) = self.load(b);
        t.dc_load += dt * (ia + ib) / 2.0;
        t.load_v += dt * (va + vb) / 2.0;
        t.vmin = t.vmin.min(va.min(vb));
        t.vmax = t.vmax.max(va.max(vb));
        t.peak = t.peak.max(a.iw.abs().max(b.iw.abs()));
        if a.iw != 0.0 || b.iw != 0.0 {
            t.on += dt;
        }
    }
}

fn lerp(a: &State, b: &State, f: f64) -> State {
    State {
        iw: a.iw + (b.iw - a.iw) * f,
        ich: a.ich + (b.ich - a.ich) * f,
        v: a.v + (b.v - a.v) * f,
    }
}

/// The start-of-cycle state as a vector of the unknowns the filter has.
fn pack(c: &Circuit, x: &State) -> Vec<f64> {
    match c.filter {
        Filter::Capacitor => vec![x.iw, x.v],
        Filter::Choke => vec![x.iw, x.ich, x.v],
        Filter::Battery | Filter::Resistive => vec![x.iw],
    }
}

fn unpack(c: &Circuit, p: &[f64]) -> State {
    match c.filter {
        Filter::Capacitor => State {
            iw: p[0],
            ich: p[0].abs(),
            v: p[1].max(0.0),
        },
        Filter::Choke => State {
            iw: p[0],
            ich: p[1].max(0.0),
            v: p[2].max(0.0),
        },
        Filter::Battery | Filter::Resistive => State {
            iw: p[0],
            ich: p[0].abs(),
            v: 0.0,
        },
    }
}

/// Solves an n×n system (n ≤ 3) by Gaussian elimination with partial pivoting; None when singular.
fn solve(mut a: Vec<Vec<f64>>, mut b: Vec<f64>) -> Option<Vec<f64>> {
    let n = b.len();
    for col in 0..n {
        let piv = (col..n).max_by(|&i, &j| a[i][col].abs().total_cmp(&a[j][col].abs()))?;
        if a[piv][col].abs() < 1e-300 {
            return None;
        }
        a.swap(col, piv);
        b.swap(col, piv);
        for row in col + 1..n {
            let f = a[row][col] / a[col][col];
            let pivot_row = a[col].clone();
            for (x, p) in a[row].iter_mut().zip(&pivot_row).skip(col) {
                *x -= f * p;
            }
            b[row] -= f * b[col];
        }
    }
    let mut x = vec![0.0; n];
    for row in (0..n).rev() {
        let s: f64 = (row + 1..n).map(|k| a[row][k] * x[k]).sum();
        x[row] = (b[row] - s) / a[row][row];
    }
    x.iter().all(|v| v.is_finite()).then_some(x)
}

/// Where the shooting starts: a warm start's state, else the capacitor near the peak (a choke's
/// current at 60 % of it) with no current in the winding.
fn first_state(c: &Circuit, warm: Option<&Solution>) -> State {
    let peak = c.emf_peak_v.abs();
    let nvd = c.rectifier.diodes() * c.diode_v;
    let v0 = match c.filter {
        Filter::Capacitor => 0.9 * (peak - nvd).max(0.0),
        Filter::Choke => 0.6 * (peak - nvd).max(0.0),
        _ => 0.0,
    };
    let i0 = match c.filter {
        Filter::Choke => v0 / c.load_ohm,
        _ => 0.0,
    };
    match warm {
        Some(w) if w.converged => State {
            iw: w.start[0],
            ich: w.start[1],
            v: w.start[2],
        },
        _ => State {
            iw: -i0,
            ich: i0,
            v: v0,
        },
    }
}

/// Solves the circuit's periodic steady state.
pub fn solve_circuit(c: &Circuit) -> Solution {
    solve_from(c, None)
}

/// Solves the circuit's periodic steady state from `warm`, a nearby circuit's solution (a warm
/// start: Newton then needs a step or two), if any.
pub fn solve_from(c: &Circuit, warm: Option<&Solution>) -> Solution {
    let (pts, means) = c.half_wave_tables();
    let h = 1.0 / (2.0 * c.frequency_hz * STEPS as f64);
    let run = Run {
        c,
        pts: &pts,
        means: &means,
        h,
        decay_h: (-h / (c.load_ohm * c.capacitor_f)).exp(),
        on: Steady::new(c, h),
    };
    let span = if c.symmetric() { STEPS } else { 2 * STEPS };
    // The period map: over the span; a symmetric rectifier's winding current flips sign.
    let map = |p: &[f64]| -> Vec<f64> {
        let y = run.run(unpack(c, p), 0, span, None, None);
        let y = if c.symmetric() {
            State { iw: -y.iw, ..y }
        } else {
            y
        };
        pack(c, &y)
    };
    let start = first_state(c, warm);
    let peak = c.emf_peak_v.abs();
    let mut p = pack(c, &start);
    let scale = |p: &[f64]| -> f64 {
        p.iter()
            .fold(0.0_f64, |m, v| m.max(v.abs()))
            .max(peak * 1e-6)
            .max(1e-9)
    };
    let mut converged = false;
    let mut iterations = 0;
    let mut fp = map(&p);
    let n = p.len();
    // A warm start brings its Jacobian: chord steps with it while the residual falls fast; a fresh
    // one by finite differences otherwise.
    let mut kept_jac: Option<Vec<Vec<f64>>> = warm
        .filter(|w| w.converged && w.jacobian.len() == n * n)
        .map(|w| w.jacobian.chunks(n).map(|r| r.to_vec()).collect());
    let mut last_norm = f64::INFINITY;
    let mut jac_out: Vec<Vec<f64>> = Vec::new();
    for it in 0..40 {
        iterations = it + 1;
        let r: Vec<f64> = fp.iter().zip(&p).map(|(a, b)| a - b).collect();
        let sc = scale(&p);
        let norm = r.iter().fold(0.0_f64, |m, v| m.max(v.abs()));
        if norm <= 1e-9 * sc {
            converged = true;
            break;
        }
        if norm > 0.25 * last_norm {
            kept_jac = None;
        }
        last_norm = norm;
        if let Some(jac) = &kept_jac {
            if let Some(dx) = solve(jac.clone(), r.iter().map(|v| -v).collect()) {
                let q: Vec<f64> = p.iter().zip(&dx).map(|(a, b)| a + b).collect();
                p = pack(c, &unpack(c, &q));
                fp = map(&p);
                jac_out = jac.clone();
                continue;
            }
        }
        // Jacobian of the residual by finite differences.
        let mut jac = vec![vec![0.0; n]; n];
        for j in 0..n {
            let d = 1e-7 * p[j].abs().max(sc * 1e-3);
            let mut q = p.clone();
            q[j] += d;
            let fq = map(&q);
            for i in 0..n {
                let rq = fq[i] - q[i];
                jac[i][j] = (rq - r[i]) / d;
            }
        }
        jac_out = jac.clone();
        kept_jac = Some(jac.clone());
        let step = solve(jac, r.iter().map(|v| -v).collect());
        (p, fp) = match step {
            Some(dx) => {
                // Backtrack while the residual grows.
                let mut lambda = 1.0;
                let mut best = (p.clone(), fp.clone());
                for _ in 0..6 {
                    let q: Vec<f64> = p.iter().zip(&dx).map(|(a, b)| a + lambda * b).collect();
                    let q = pack(c, &unpack(c, &q));
                    let fq = map(&q);
                    let rq = fq
                        .iter()
                        .zip(&q)
                        .fold(0.0_f64, |m, (a, b)| m.max((a - b).abs()));
                    best = (q, fq);
                    if rq < norm {
                        break;
                    }
                    lambda /= 2.0;
                }
                best
            }
            // Singular: one cycle of plain stepping.
            None => {
                let next = fp.clone();
                let f_next = map(&next);
                (next, f_next)
            }
        };
    }
    let mut sol = report(c, &run, &unpack(c, &p), iterations, converged);
    sol.jacobian = jac_out.concat();
    sol
}

/// The figures of the converged cycle.
fn report(c: &Circuit, run: &Run, x: &State, iterations: u32, converged: bool) -> Solution {
    let mut t = Tally {
        vmin: f64::INFINITY,
        vmax: f64::NEG_INFINITY,
        ..Tally::default()
    };
    let mut wave = Vec::with_capacity(2 * STEPS);
    let period = 1.0 / c.frequency_hz;
    if c.symmetric() {
        // The second half repeats the first with the winding current reversed.
        run.run(*x, 0, STEPS, Some(&mut t), Some(&mut wave));
        let first: Vec<f64> = wave.iter().map(|v| -v).collect();
        wave.extend(first);
        for v in [
            &mut t.sq,
            &mut t.abs,
            &mut t.dc_load,
            &mut t.load_v,
            &mut t.on,
        ] {
            *v *= 2.0;
        }
    } else {
        run.run(*x, 0, 2 * STEPS, Some(&mut t), Some(&mut wave));
    }
    // The record holds each step's end; the waveform is taken at each step's middle (the mean of its
    // two ends), the grid every waveform of the plan shares.
    let first = wave.last().copied().unwrap_or(0.0);
    let mut prev = first;
    for v in wave.iter_mut() {
        let end = *v;
        *v = (prev + end) / 2.0;
        prev = end;
    }
    let pulses = if c.symmetric() { 2.0 } else { 1.0 };
    let half_share = if c.rectifier == Rectifier::CentreTap {
        0.5
    } else {
        1.0
    };
    let nvd = c.rectifier.diodes() * c.diode_v;
    let peak_e = c.emf_peak_v.abs();
    let no_load = match c.filter {
        Filter::Resistive => {
            let (pts, _) = c.half_wave_tables();
            let mean: f64 =
                pts.iter().map(|p| (p * peak_e - nvd).max(0.0)).sum::<f64>() / pts.len() as f64;
            if c.symmetric() {
                mean
            } else {
                mean / 2.0
            }
        }
        _ => (peak_e - nvd).max(0.0),
    };
    Solution {
        dc_volts: t.load_v / period,
        dc_amps: t.dc_load / period,
        dc_volts_no_load: no_load,
        ripple_pp_v: (t.vmax - t.vmin).max(0.0),
        rms_amps: (t.sq * half_share / period).sqrt(),
        peak_amps: t.peak,
        conduction_deg: (t.on / pulses / period * 360.0).min(360.0 / pulses),
        wave,
        iterations,
        start: [x.iw, x.ich, x.v],
        jacobian: Vec::new(),
        converged,
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    fn circuit(rect: Rectifier, filter: Filter) -> Circuit {
        Circuit {
            rectifier: rect,
            filter,
            waveform: Waveform::Sine,
            emf_peak_v: 40.0,
            frequency_hz: 50.0,
            r_ohm: 0.2,
            l_h: 200e-6,
            diode_v: 0.9,
            capacitor_f: 10e-3,
            choke_h: 0.0,
            choke_ohm: 0.0,
            load_ohm: 5.0,
            battery_v: 24.0,
            battery_ohm: BATTERY_OHM,
        }
    }

    /// Closed form (Mohan, Undeland & Robbins, ch. 5): a bridge on a resistor with no diode drop and
    /// no inductance gives the full-wave rectified sine: V_dc = 2E/π, I_rms = I_dc·π/(2√2).
    #[test]
    fn resistive_bridge_closed_form() {
        let mut c = circuit(Rectifier::Bridge, Filter::Resistive);
        c.diode_v = 0.0;
        c.l_h = 0.0;
        c.r_ohm = 0.0;
        let s = solve_circuit(&c);
        assert_relative_eq!(s.dc_volts, 2.0 * 40.0 / PI, max_relative = 1e-4);
        assert_relative_eq!(
            s.rms_amps,
            s.dc_amps * PI / (2.0 * 2f64.sqrt()),
            max_relative = 1e-4
        );
        assert_relative_eq!(s.conduction_deg, 180.0, max_relative = 1e-3);
    }

    /// Closed form (same source): with a choke large enough for a flat current, the bridge winding
    /// carries a square wave of I_dc (I_rms = I_dc), so VA/P_dc = (E/√2)·I_dc/(2E/π·I_dc) = 1.11;
    /// each half of a centre tap carries I_dc for half the cycle (I_rms = I_dc/√2): 1.57 for both
    /// halves' VA.
    #[test]
    fn large_choke_va_ratios() {
        for (rect, ratio) in [(Rectifier::Bridge, 1.111), (Rectifier::CentreTap, 1.571)] {
            let mut c = circuit(rect, Filter::Choke);
            c.diode_v = 0.0;
            c.l_h = 1e-7;
            c.r_ohm = 1e-4;
            c.choke_h = 20.0;
            c.load_ohm = 5.0;
            let s = solve_circuit(&c);
            assert!(s.converged);
            let halves = if rect == Rectifier::CentreTap {
                2.0
            } else {
                1.0
            };
            let va = halves * 40.0 / 2f64.sqrt() * s.rms_amps;
            let per_half = s.rms_amps
                * if rect == Rectifier::CentreTap {
                    2f64.sqrt()
                } else {
                    1.0
                };
            assert_relative_eq!(per_half, s.dc_amps, max_relative = 0.01);
            assert_relative_eq!(va / (s.dc_volts * s.dc_amps), ratio, max_relative = 0.01);
        }
    }

    #[test]
    fn capacitor_bridge_converges_to_its_own_cycle() {
        let c = circuit(Rectifier::Bridge, Filter::Capacitor);
        let s = solve_circuit(&c);
        assert!(s.converged, "{s:?}");
        assert!(s.iterations <= 8, "{} iterations", s.iterations);
        // Below the no-load peak, above the ripple; the pulses are much peakier than the mean.
        assert!(s.dc_volts < s.dc_volts_no_load && s.dc_volts > 30.0);
        assert!(s.rms_amps > 1.5 * s.dc_amps && s.conduction_deg < 90.0);
        assert_relative_eq!(s.dc_amps, s.dc_volts / 5.0, max_relative = 1e-9);
    }

    #[test]
    fn every_combination_converges() {
        for rect in [Rectifier::Bridge, Rectifier::CentreTap, Rectifier::HalfWave] {
            for filter in [
                Filter::Capacitor,
                Filter::Choke,
                Filter::Battery,
                Filter::Resistive,
            ] {
                if rect == Rectifier::HalfWave && filter == Filter::Choke {
                    continue;
                }
                for wf in [
                    Waveform::Sine,
                    Waveform::Square,
                    Waveform::QuasiSquare { duty: 0.6 },
                ] {
                    let mut c = circuit(rect, filter);
                    c.waveform = wf;
                    c.choke_h = 0.05;
                    c.choke_ohm = 0.1;
                    let s = solve_circuit(&c);
                    assert!(
                        s.converged,
                        "{rect:?} {filter:?} {wf:?}: {} iterations",
                        s.iterations
                    );
                    assert!(s.rms_amps.is_finite() && s.dc_volts.is_finite());
                }
            }
        }
    }

    /// A quasi-square drive of the same RMS peaks lower than a sine: a capacitor filter charges to
    /// less.
    #[test]
    fn quasi_square_peaks_lower_than_sine() {
        let sine = solve_circuit(&circuit(Rectifier::Bridge, Filter::Capacitor));
        let duty: f64 = 0.6;
        let mut c = circuit(Rectifier::Bridge, Filter::Capacitor);
        c.waveform = Waveform::QuasiSquare { duty };
        // Same RMS: amplitude·√δ = 40/√2.
        c.emf_peak_v = 40.0 / 2f64.sqrt() / duty.sqrt();
        let q = solve_circuit(&c);
        assert!(q.dc_volts_no_load < sine.dc_volts_no_load);
    }
}
