//! The EMF equation per drive waveform, design flux density per steel, core loss, and the knee
//! point of a magnetisation curve.
//!
//! EMF equation (any electrical-technology textbook, transformer chapter):
//! - sine: V_rms = π√2 · f · N · B · Ae (π√2 = 4.443, the 4.44 of the textbooks: 4 × form factor 1.11);
//! - square at full conduction: V_amp = 4 · f · N · B · Ae and V_rms = V_amp (form factor 1.00);
//! - quasi-square with conduction fraction δ of each half cycle: B = V_amp·δ / (4 f N Ae),
//!   V_rms = V_amp·√δ.
//!
//! Core loss (an estimate, labelled so): P = m · p15 · (B/1.5)² · (f/50)^1.3 · 1.2, p15 from the grade
//! name by IEC 60404-8-4 (M400-50A: at most 4.00 W/kg at 1.5 T, 50 Hz); grain-oriented grades ending
//! in S or P are rated at 1.7 T, so p15 = p17·(1.5/1.7)²; 1.2 is the building factor for punched E-I.
//! Under square and quasi-square drive, by loss separation (Bertotti's three terms): the sine figure
//! splits into hysteresis (depends on the peak flux only), classical eddy (∝ mean (dB/dt)²) and
//! excess (∝ mean |dB/dt|^1.5), with shares 0.6 / 0.2 / 0.2 by default (from memory; a column of
//! data/steel.csv). At the same peak flux and frequency the flux of a quasi-square drive of
//! conduction δ is a trapezoid, ramping at 4·B·f/δ for a fraction δ of the time, so relative to sine
//! eddy × 8/(π²·δ) and excess × (2/π)^1.5 / m₁.₅ / √δ, m₁.₅ = mean |cos|^1.5 = Γ(1.25)/(√π·Γ(1.75)).
//! Full square (δ = 1): 0.945 × the sine loss; δ = 0.5: 1.18 ×.
//!
//! Knee point (IEC 61869-2, 3.4.215): the r.m.s. voltage which, raised by 10 %, raises the exciting
//! current by 50 %. The 45° point (IEEE C57.13): where d(ln V)/d(ln I) = 1 on the curve. Both are
//! found on a monotone cubic (Fritsch–Carlson, SIAM J. Numer. Anal. 17 (1980) 238) through the
//! measured points in log-log coordinates.

use serde::Serialize;
use std::f64::consts::{PI, SQRT_2};

/// The sine-wave EMF constant π√2 (≈ 4.443).
pub const K_SINE: f64 = PI * SQRT_2;
/// The square-wave EMF constant.
pub const K_SQUARE: f64 = 4.0;
/// Flux density above which no design is accepted, T.
pub const MAX_FLUX_T: f64 = 2.1;
/// Fraction of the IEC knee flux recommended as the design maximum.
pub const KNEE_MARGIN: f64 = 0.9;

/// How the driven winding is driven.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Waveform {
    /// Sinusoidal; the primary's volts are RMS.
    Sine,
    /// Full-conduction square wave; the primary's volts are the amplitude.
    Square,
    /// Quasi-square with conduction fraction `duty` of each half cycle; volts are the amplitude.
    QuasiSquare {
        /// Conduction fraction δ, 0 < δ ≤ 1.
        duty: f64,
    },
}

impl Waveform {
    /// The name used in job files.
    pub fn name(&self) -> &'static str {
        match self {
            Waveform::Sine => "sine",
            Waveform::Square => "square",
            Waveform::QuasiSquare { .. } => "quasi-square",
        }
    }

    /// RMS volts at the winding for the primary's stated volts (RMS for sine, amplitude otherwise).
    pub fn rms_volts(&self, stated: f64) -> f64 {
        match *self {
            Waveform::Sine | Waveform::Square => stated,
            Waveform::QuasiSquare { duty } => stated * duty.sqrt(),
        }
    }

    /// Volt-seconds factor: peak flux B = stated_volts · factor / (f · N · Ae).
    fn flux_factor(&self) -> f64 {
        match *self {
            Waveform::Sine => 1.0 / K_SINE,
            Waveform::Square => 1.0 / K_SQUARE,
            Waveform::QuasiSquare { duty } => duty / K_SQUARE,
        }
    }

    /// Peak flux density (T) for `stated` volts on `turns` at `freq_hz` over `area_mm2` net iron.
    pub fn flux_t(&self, stated: f64, freq_hz: f64, turns: f64, area_mm2: f64) -> f64 {
        stated * self.flux_factor() / (freq_hz * turns * area_mm2 * 1e-6)
    }

    /// Exact (real) turns for `stated` volts at peak flux `b_t`.
    pub fn turns_exact(&self, stated: f64, freq_hz: f64, b_t: f64, area_mm2: f64) -> f64 {
        stated * self.flux_factor() / (freq_hz * b_t * area_mm2 * 1e-6)
    }
}

/// Rounds an exact turn count up, ignoring floating-point dust (400.0000000001 is 400).
pub fn ceil_turns(exact: f64) -> u32 {
    let c = (exact - 1e-9 * exact.abs().max(1.0)).ceil();
    c.max(1.0).min(u32::MAX as f64) as u32
}

/// How a steel's 50 Hz sine loss divides between hysteresis, classical eddy and excess loss.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct LossShares {
    /// Hysteresis.
    pub hysteresis: f64,
    /// Classical eddy current.
    pub eddy: f64,
    /// Excess (anomalous).
    pub excess: f64,
}

/// The default shares (from memory, DESIGN.md).
pub const DEFAULT_SHARES: LossShares = LossShares {
    hysteresis: 0.6,
    eddy: 0.2,
    excess: 0.2,
};

/// mean |cos θ|^1.5 over a period: Γ(1.25)/(√π·Γ(1.75)) (the sine's excess-loss integral).
pub const MEAN_ABS_COS_1_5: f64 = 0.556_417_894;

impl Waveform {
    /// The core loss of this drive over the sine's at the same peak flux and frequency, by loss
    /// separation with `shares`.
    pub fn loss_factor(&self, shares: LossShares) -> f64 {
        let duty = match *self {
            Waveform::Sine => return 1.0,
            Waveform::Square => 1.0,
            Waveform::QuasiSquare { duty } => duty,
        };
        let eddy = 8.0 / (PI * PI * duty);
        let excess = (2.0 / PI).powf(1.5) / MEAN_ABS_COS_1_5 / duty.sqrt();
        shares.hysteresis + shares.eddy * eddy + shares.excess * excess
    }
}

/// What a steel name tells: its kind, specific loss at 1.5 T 50 Hz, and default design flux.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct SteelInfo {
    /// The name as given (`unknown`, `non-oriented`, `grain-oriented`, or a grade like `M400-50A`).
    pub name: String,
    /// `unknown`, `non-oriented` or `grain-oriented`.
    pub kind: String,
    /// Specific loss at 1.5 T, 50 Hz, W/kg (an estimate).
    pub loss_w_per_kg_1t5: f64,
    /// Default design flux density, T.
    pub design_flux_t: f64,
    /// How its sine loss divides (for square and quasi-square drives).
    pub shares: LossShares,
    /// Remanent flux density of a stacked core, T (from memory; the inrush estimate).
    pub remanence_t: f64,
}

/// Reads a steel name. Accepted: the names of `data/steel.csv`, or an IEC 60404-8 grade
/// `M<100·P>-<100·t><letter>` (A non-oriented, rated at 1.5 T; S or P grain-oriented, rated at 1.7 T).
pub fn steel_info(name: &str) -> Result<SteelInfo, String> {
    let accepted = "\"unknown\", \"non-oriented\", \"grain-oriented\", or a grade like \"M400-50A\" or \"M105-30P\"";
    let lower = name.trim().to_ascii_lowercase();
    if let Some(row) = crate::data::steel().iter().find(|r| r.name == lower) {
        return Ok(SteelInfo {
            name: row.name.clone(),
            kind: row.kind.clone(),
            loss_w_per_kg_1t5: row.loss_w_per_kg_1t5_50hz,
            design_flux_t: row.design_flux_t,
            shares: LossShares {
                hysteresis: row.hysteresis_share,
                eddy: row.eddy_share,
                excess: row.excess_share,
            },
            remanence_t: row.remanence_t,
        });
    }
    let upper = name.trim().to_ascii_uppercase();
    let bad = || format!("must be {accepted}");
    let rest = upper.strip_prefix('M').ok_or_else(bad)?;
    let (loss, thick) = rest.split_once('-').ok_or_else(bad)?;
    let letter = thick.chars().last().ok_or_else(bad)?;
    let digits = &thick[..thick.len() - letter.len_utf8()];
    if loss.is_empty()
        || digits.is_empty()
        || !loss.bytes().all(|b| b.is_ascii_digit())
        || !digits.bytes().all(|b| b.is_ascii_digit())
    {
        return Err(bad());
    }
    let p: f64 = loss.parse::<u32>().map_err(|_| bad())? as f64 / 100.0;
    if !(0.3..=20.0).contains(&p) {
        return Err(format!(
            "grade loss {p:.2} W/kg is outside 0.30–20.00; {}",
            bad()
        ));
    }
    let kind_row = |k: &str| crate::data::steel().iter().find(|r| r.kind == k).cloned();
    let (kind, p15) = match letter {
        'A' | 'D' | 'E' => ("non-oriented", p),
        'S' | 'P' => ("grain-oriented", p * (1.5f64 / 1.7).powi(2)),
        _ => return Err(bad()),
    };
    let row = kind_row(kind);
    let flux = row.as_ref().map(|r| r.design_flux_t).unwrap_or(1.2);
    let remanence_t = row.as_ref().map(|r| r.remanence_t).unwrap_or(0.9);
    let shares = row
        .map(|r| LossShares {
            hysteresis: r.hysteresis_share,
            eddy: r.eddy_share,
            excess: r.excess_share,
        })
        .unwrap_or(DEFAULT_SHARES);
    Ok(SteelInfo {
        name: upper,
        kind: kind.to_string(),
        loss_w_per_kg_1t5: p15,
        design_flux_t: flux,
        shares,
        remanence_t,
    })
}

/// Core loss estimate, W.
pub fn core_loss_w(mass_kg: f64, p15_w_kg: f64, b_t: f64, freq_hz: f64) -> f64 {
    mass_kg * p15_w_kg * (b_t / 1.5).powi(2) * (freq_hz / 50.0).powf(1.3) * 1.2
}

/// A monotone cubic through points (x, y) with x strictly increasing and y non-decreasing
/// (Fritsch–Carlson).
#[derive(Debug, Clone)]
pub struct MonotoneCubic {
    x: Vec<f64>,
    y: Vec<f64>,
    m: Vec<f64>,
}

impl MonotoneCubic {
    /// Builds the interpolant. Needs at least two points, x strictly increasing.
    pub fn new(x: Vec<f64>, y: Vec<f64>) -> Option<Self> {
        let n = x.len();
        if n < 2 || y.len() != n || x.windows(2).any(|p| p[1] <= p[0]) {
            return None;
        }
        let d: Vec<f64> = (0..n - 1)
            .map(|i| (y[i + 1] - y[i]) / (x[i + 1] - x[i]))
            .collect();
        let mut m = vec![0.0; n];
        m[0] = d[0];
        m[n - 1] = d[n - 2];
        for i in 1..n - 1 {
            m[i] = if d[i - 1] * d[i] <= 0.0 {
                0.0
            } else {
                (d[i - 1] + d[i]) / 2.0
            };
        }
        for i in 0..n - 1 {
            if d[i] == 0.0 {
                m[i] = 0.0;
                m[i + 1] = 0.0;
                continue;
            }
            let a = m[i] / d[i];
            let b = m[i + 1] / d[i];
            let s = a * a + b * b;
            if s > 9.0 {
                let t = 3.0 / s.sqrt();
                m[i] = t * a * d[i];
                m[i + 1] = t * b * d[i];
            }
        }
        Some(MonotoneCubic { x, y, m })
    }

    /// The first and last x.
    pub fn domain(&self) -> (f64, f64) {
        (self.x[0], self.x[self.x.len() - 1])
    }

    fn segment(&self, x: f64) -> usize {
        let n = self.x.len();
        match self.x.partition_point(|&xi| xi <= x) {
            0 => 0,
            k if k >= n => n - 2,
            k => k - 1,
        }
    }

    /// Value at x (linear extrapolation with the end slope outside the domain).
    pub fn value(&self, x: f64) -> f64 {
        let (x0, x1) = self.domain();
        if x < x0 {
            return self.y[0] + self.m[0] * (x - x0);
        }
        if x > x1 {
            let n = self.x.len();
            return self.y[n - 1] + self.m[n - 1] * (x - x1);
        }
        let i = self.segment(x);
        let h = self.x[i + 1] - self.x[i];
        let t = (x - self.x[i]) / h;
        let (t2, t3) = (t * t, t * t * t);
        let h00 = 2.0 * t3 - 3.0 * t2 + 1.0;
        let h10 = t3 - 2.0 * t2 + t;
        let h01 = -2.0 * t3 + 3.0 * t2;
        let h11 = t3 - t2;
        h00 * self.y[i] + h10 * h * self.m[i] + h01 * self.y[i + 1] + h11 * h * self.m[i + 1]
    }

    /// Derivative at x.
    pub fn slope(&self, x: f64) -> f64 {
        let (x0, x1) = self.domain();
        if x < x0 {
            return self.m[0];
        }
        if x > x1 {
            return self.m[self.m.len() - 1];
        }
        let i = self.segment(x);
        let h = self.x[i + 1] - self.x[i];
        let t = (x - self.x[i]) / h;
        let t2 = t * t;
        let d00 = 6.0 * t2 - 6.0 * t;
        let d10 = 3.0 * t2 - 4.0 * t + 1.0;
        let d01 = -6.0 * t2 + 6.0 * t;
        let d11 = 3.0 * t2 - 2.0 * t;
        (d00 * self.y[i] + d01 * self.y[i + 1]) / h + d10 * self.m[i] + d11 * self.m[i + 1]
    }
}

/// A magnetisation curve: RMS volts against RMS exciting current, cleaned and interpolable.
#[derive(Debug, Clone)]
pub struct ExcitationCurve {
    /// Volts, strictly increasing.
    pub volts: Vec<f64>,
    /// Amps, non-decreasing.
    pub amps: Vec<f64>,
    curve: MonotoneCubic,
}

/// The knee points of a curve.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Knees {
    /// IEC 61869-2 knee voltage, V (None when the curve does not reach it).
    pub iec_volts: Option<f64>,
    /// 45° log-log tangent point, V (None when the slope never crosses 1 inside the data).
    pub tangent_volts: Option<f64>,
}

impl ExcitationCurve {
    /// Sorts the points by voltage, merges repeated voltages (mean current), and forces the current
    /// non-decreasing (a running maximum: a reading that fell is a meter's noise). Needs at least
    /// four distinct positive points.
    pub fn new(points: &[(f64, f64)]) -> Result<Self, String> {
        let mut pts: Vec<(f64, f64)> = points
            .iter()
            .copied()
            .filter(|(v, i)| *v > 0.0 && *i > 0.0)
            .collect();
        pts.sort_by(|a, b| a.0.total_cmp(&b.0));
        let mut volts: Vec<f64> = Vec::new();
        let mut amps: Vec<f64> = Vec::new();
        let mut count: Vec<f64> = Vec::new();
        for (v, i) in pts {
            match volts.last() {
                Some(&last) if (v - last).abs() <= 1e-12 * v.max(1.0) => {
                    let k = amps.len() - 1;
                    amps[k] += i;
                    count[k] += 1.0;
                }
                _ => {
                    volts.push(v);
                    amps.push(i);
                    count.push(1.0);
                }
            }
        }
        for (a, c) in amps.iter_mut().zip(&count) {
            *a /= c;
        }
        if volts.len() < 4 {
            return Err(format!(
                "{} distinct points with positive volts and amps; at least 4 are needed",
                volts.len()
            ));
        }
        let mut run = 0.0f64;
        for a in amps.iter_mut() {
            run = run.max(*a);
            *a = run;
        }
        // Log-log: ln I must be non-decreasing; equal currents make flat segments, kept monotone.
        let lx: Vec<f64> = volts.iter().map(|v| v.ln()).collect();
        let ly: Vec<f64> = amps.iter().map(|i| i.ln()).collect();
        let curve = MonotoneCubic::new(lx, ly).ok_or("points do not form a curve")?;
        Ok(ExcitationCurve { volts, amps, curve })
    }

    /// Interpolated RMS current at `volts` (extrapolated on the end slopes in log-log).
    pub fn amps_at(&self, volts: f64) -> f64 {
        self.curve.value(volts.ln()).exp()
    }

    /// Local log-log slope d(ln I)/d(ln V) at `volts`.
    pub fn log_slope(&self, volts: f64) -> f64 {
        self.curve.slope(volts.ln())
    }

    /// Finds both knees inside the measured range.
    pub fn knees(&self) -> Knees {
        let (lo, hi) = (self.volts[0], self.volts[self.volts.len() - 1]);
        let target = 1.5f64.ln();
        // g(V) = ln I(1.1V) − ln I(V) − ln 1.5, scanned for its first rise through zero.
        let g = |v: f64| self.curve.value((1.1 * v).ln()) - self.curve.value(v.ln()) - target;
        let iec = first_root(g, lo, hi / 1.1);
        // 45°: d ln I / d ln V = 1, i.e. d ln V / d ln I = 1. Meter noise at the low end can make the
        // slope wander about 1 there, so the last crossing from below is the knee.
        let s = |v: f64| self.curve.slope(v.ln()) - 1.0;
        let tangent = last_root(s, lo, hi);
        Knees {
            iec_volts: iec,
            tangent_volts: tangent,
        }
    }
}

/// The last x in [lo, hi] where f rises through zero, found like [`first_root`].
fn last_root(f: impl Fn(f64) -> f64, lo: f64, hi: f64) -> Option<f64> {
    let mut found = None;
    let mut start = lo;
    while let Some(x) = first_root(&f, start, hi) {
        found = Some(x);
        // Continue past this crossing: skip to where f is negative again, if it ever is.
        let step = (hi / lo).powf(1.0 / 2000.0);
        let mut y = x * step;
        while y < hi && f(y) >= 0.0 {
            y *= step;
        }
        if y >= hi {
            break;
        }
        start = y;
    }
    found
}

/// The first x in [lo, hi] where f rises through zero (f(lo side) < 0 ≤ f(hi side)), by a log-spaced
/// scan and bisection to 1e-12 relative. None when f never becomes ≥ 0 after being < 0.
fn first_root(f: impl Fn(f64) -> f64, lo: f64, hi: f64) -> Option<f64> {
    if !(lo > 0.0 && hi > lo) {
        return None;
    }
    const STEPS: usize = 2000;
    let ratio = (hi / lo).ln() / STEPS as f64;
    let mut x0 = lo;
    let mut f0 = f(x0);
    for k in 1..=STEPS {
        let x1 = lo * (ratio * k as f64).exp();
        let f1 = f(x1);
        if f0 < 0.0 && f1 >= 0.0 {
            let (mut a, mut b) = (x0, x1);
            for _ in 0..100 {
                let m = 0.5 * (a + b);
                if f(m) < 0.0 {
                    a = m;
                } else {
                    b = m;
                }
                if (b - a) <= 1e-12 * b {
                    break;
                }
            }
            return Some(0.5 * (a + b));
        }
        x0 = x1;
        f0 = f1;
    }
    None
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    /// The loss-separation integrals of a waveform, by direct numerical integration of its flux:
    /// (mean (dB/dt)², mean |dB/dt|^1.5) over one period, for unit peak flux and unit frequency.
    fn integrals(flux: impl Fn(f64) -> f64) -> (f64, f64) {
        let n = 200_000;
        let dt = 1.0 / n as f64;
        let (mut e2, mut e15) = (0.0, 0.0);
        for k in 0..n {
            let t = (k as f64 + 0.5) * dt;
            let d = (flux(t + dt / 2.0) - flux(t - dt / 2.0)) / dt;
            e2 += d * d * dt;
            e15 += d.abs().powf(1.5) * dt;
        }
        (e2, e15)
    }

    /// The flux of a quasi-square drive of conduction `duty`: a trapezoid between −1 and +1, ramping
    /// during the conduction and flat during the dead time (the voltage is zero there).
    fn trapezoid(duty: f64) -> impl Fn(f64) -> f64 {
        move |t: f64| {
            let t = t.rem_euclid(1.0);
            let ramp = duty / 2.0;
            let (half, sign) = if t < 0.5 { (t, 1.0) } else { (t - 0.5, -1.0) };
            // Each half cycle: ramp from −1 to +1 (or back), centred in the half cycle.
            let start = (0.5 - ramp) / 2.0;
            let x = if half < start {
                -1.0
            } else if half > start + ramp {
                1.0
            } else {
                -1.0 + 2.0 * (half - start) / ramp
            };
            sign * x
        }
    }

    #[test]
    fn loss_separation_factors_against_numerical_integration() {
        // DESIGN.md (v2): scale each part of the sine loss by its waveform integral for the actual
        // flux waveform over the sine's; hysteresis depends on the peak flux only.
        let (s2, s15) = integrals(|t: f64| (2.0 * PI * t).sin());
        for duty in [1.0, 0.9, 0.7, 0.5, 0.3] {
            let (q2, q15) = integrals(trapezoid(duty));
            let want = 0.6 + 0.2 * q2 / s2 + 0.2 * q15 / s15;
            let got = Waveform::QuasiSquare { duty }.loss_factor(DEFAULT_SHARES);
            assert_relative_eq!(got, want, max_relative = 1e-4);
        }
        assert_relative_eq!(
            Waveform::Square.loss_factor(DEFAULT_SHARES),
            Waveform::QuasiSquare { duty: 1.0 }.loss_factor(DEFAULT_SHARES),
            max_relative = 1e-12
        );
        // DESIGN.md: full square a few per cent below sine; δ = 0.5 about 20 % above.
        let full = Waveform::Square.loss_factor(DEFAULT_SHARES);
        assert!(full < 1.0 && full > 0.9, "{full}");
        let half = Waveform::QuasiSquare { duty: 0.5 }.loss_factor(DEFAULT_SHARES);
        assert!(half > 1.1 && half < 1.3, "{half}");
        assert_relative_eq!(Waveform::Sine.loss_factor(DEFAULT_SHARES), 1.0);
    }

    #[test]
    fn mean_of_cos_to_the_one_and_a_half() {
        // Γ(1.25) = 0.906402, Γ(1.75) = 0.919063 (general mathematical tables).
        let closed = 0.906_402_477 / (PI.sqrt() * 0.919_062_527);
        assert_relative_eq!(MEAN_ABS_COS_1_5, closed, max_relative = 1e-6);
    }

    /// Worked textbook problems quote three significant figures.
    const TEXTBOOK: f64 = 0.001;
    /// Closed-form identities.
    const EXACT: f64 = 1e-12;

    #[test]
    fn emf_textbook_worked_problem() {
        // Electrical-technology textbook, transformer chapter (REFERENCES.md): 400 primary turns,
        // 60 cm² net core, 50 Hz, 520 V → B_max = 0.976 T; 1000 secondary turns → E2 = 1300 V.
        let b = Waveform::Sine.flux_t(520.0, 50.0, 400.0, 6000.0);
        assert_relative_eq!(b, 0.976, max_relative = TEXTBOOK);
        let e2 = K_SINE * 50.0 * 1000.0 * b * 6000.0e-6;
        assert_relative_eq!(e2, 1300.0, max_relative = EXACT);
        // Variant: 350/1050 turns, 55 cm², 400 V → 0.936 T, 1200 V.
        let b = Waveform::Sine.flux_t(400.0, 50.0, 350.0, 5500.0);
        assert_relative_eq!(b, 0.936, max_relative = TEXTBOOK);
        assert_relative_eq!(400.0 * 1050.0 / 350.0, 1200.0, max_relative = EXACT);
    }

    #[test]
    fn sine_constant_is_pi_root_two() {
        // 4.44 = 4 × form factor 1.11 (REFERENCES.md); π√2 = 4.4429.
        assert_relative_eq!(K_SINE, 4.4429, max_relative = 1e-4);
    }

    #[test]
    fn square_uses_four_and_quasi_square_at_full_duty_is_square() {
        // Square wave: E = 4 f N B A (form factor 1.00; REFERENCES.md).
        let b = Waveform::Square.flux_t(24.0, 50.0, 40.0, 1000.0);
        assert_relative_eq!(b, 24.0 / (4.0 * 50.0 * 40.0 * 1e-3), max_relative = EXACT);
        let q = Waveform::QuasiSquare { duty: 1.0 };
        assert_relative_eq!(q.flux_t(24.0, 50.0, 40.0, 1000.0), b, max_relative = EXACT);
        assert_relative_eq!(q.rms_volts(24.0), 24.0, max_relative = EXACT);
        // Quasi-square at δ: B scales by δ, V_rms by √δ (DESIGN.md).
        let q = Waveform::QuasiSquare { duty: 0.64 };
        assert_relative_eq!(
            q.flux_t(24.0, 50.0, 40.0, 1000.0),
            0.64 * b,
            max_relative = EXACT
        );
        assert_relative_eq!(q.rms_volts(24.0), 19.2, max_relative = EXACT);
    }

    #[test]
    fn hobby_rule_800_over_area_implies_0_87_tesla() {
        // Hobby literature (REFERENCES.md): N ≈ 800 / A[in²] for 120 V 60 Hz implies B ≈ 0.87 T.
        let area_mm2 = 645.16; // 1 in²
        let b = Waveform::Sine.flux_t(120.0, 60.0, 800.0, area_mm2);
        assert_relative_eq!(b, 0.87, max_relative = 0.01);
    }

    #[test]
    fn ceil_turns_ignores_float_dust() {
        assert_eq!(ceil_turns(400.000_000_000_1), 400);
        assert_eq!(ceil_turns(400.01), 401);
        assert_eq!(ceil_turns(0.2), 1);
    }

    #[test]
    fn grade_names_follow_iec_60404_8() {
        // IEC 60404-8-4: M400-50A is at most 4.00 W/kg at 1.5 T, 50 Hz.
        let s = steel_info("M400-50A").expect("grade");
        assert_eq!(s.kind, "non-oriented");
        assert_relative_eq!(s.loss_w_per_kg_1t5, 4.0, max_relative = EXACT);
        // Grain-oriented grades are rated at 1.7 T: p15 = p17·(1.5/1.7)².
        let s = steel_info("m105-30p").expect("grade");
        assert_eq!(s.kind, "grain-oriented");
        assert_relative_eq!(
            s.loss_w_per_kg_1t5,
            1.05 * (1.5f64 / 1.7).powi(2),
            max_relative = EXACT
        );
        assert!(steel_info("mystery").is_err());
        assert!(steel_info("M-50A").is_err());
        assert_eq!(steel_info("Unknown").expect("known").design_flux_t, 1.2);
    }

    #[test]
    fn core_loss_scales_as_designed() {
        // At 1.5 T and 50 Hz the estimate is mass × p15 × building factor 1.2 (DESIGN.md).
        assert_relative_eq!(core_loss_w(2.0, 4.0, 1.5, 50.0), 9.6, max_relative = EXACT);
        assert_relative_eq!(core_loss_w(2.0, 4.0, 0.75, 50.0), 2.4, max_relative = EXACT);
    }

    /// I = a·V + b·V^n: the IEC knee solves (1.1^n − 1.5)·b·V^(n−1) = 0.4·a... exactly:
    /// a·1.1V + b·(1.1V)^n = 1.5(aV + bV^n) → V^(n−1) = 0.4a / (b(1.1^n − 1.5)).
    fn iec_closed_form(a: f64, b: f64, n: f64) -> f64 {
        (0.4 * a / (b * (1.1f64.powf(n) - 1.5))).powf(1.0 / (n - 1.0))
    }

    #[test]
    fn iec_knee_on_a_synthetic_curve_matches_closed_form() {
        // Definition of IEC 61869-2, 3.4.215, solved in closed form for I = aV + bV^n.
        let (a, b, n) = (0.002, 1e-22, 10.0);
        let vk = iec_closed_form(a, b, n);
        let pts: Vec<(f64, f64)> = (1..=40)
            .map(|k| {
                let v = vk * 0.2 * 1.05f64.powi(k);
                (v, a * v + b * v.powf(n))
            })
            .collect();
        let curve = ExcitationCurve::new(&pts).expect("curve");
        let got = curve.knees().iec_volts.expect("knee inside the data");
        assert_relative_eq!(got, vk, max_relative = 0.005);
    }

    #[test]
    fn tangent_point_lies_below_the_iec_point() {
        // REFERENCES.md: the IEC point has secant slope ln1.5/ln1.1 = 4.254 > 1, so it lies above 45°.
        // I = a·V^0.5 + b·V^8: slope rises from 0.5 to 8 and crosses 1.
        let (a, b) = (0.01, 1e-17);
        let pts: Vec<(f64, f64)> = (1..=60)
            .map(|k| {
                let v = 5.0 * 1.06f64.powi(k);
                (v, a * v.sqrt() + b * v.powi(8))
            })
            .collect();
        let curve = ExcitationCurve::new(&pts).expect("curve");
        let k = curve.knees();
        let (iec, tan) = (k.iec_volts.expect("iec"), k.tangent_volts.expect("tangent"));
        assert!(iec > tan, "iec {iec} above tangent {tan}");
        // The 45° point solves 0.5aV^0.5 + 8bV^8 = aV^0.5 + bV^8 → 7bV^7.5 = 0.5a.
        let exact = (0.5 * a / (7.0 * b)).powf(1.0 / 7.5);
        assert_relative_eq!(tan, exact, max_relative = 0.01);
    }

    #[test]
    fn curve_cleans_unsorted_and_repeated_points() {
        let pts = [
            (30.0, 0.05),
            (10.0, 0.01),
            (20.0, 0.02),
            (20.0, 0.03),
            (40.0, 0.2),
            (35.0, 0.04),
        ];
        let c = ExcitationCurve::new(&pts).expect("curve");
        assert_eq!(c.volts, vec![10.0, 20.0, 30.0, 35.0, 40.0]);
        assert_relative_eq!(c.amps[1], 0.025, max_relative = EXACT);
        assert!(c.amps.windows(2).all(|p| p[1] >= p[0]));
        assert!(ExcitationCurve::new(&pts[..3]).is_err());
    }
}
