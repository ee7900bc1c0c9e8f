//! Magnetising current, idle current and switch-on inrush.
//!
//! Magnetising current (DESIGN.md): the RMS over a cycle of i(t) = (H(B(t))·l_e + B(t)·g/μ0) / N,
//! B(t) the drive's flux waveform (a cosine for sine drive, a triangle for square, a trapezoid for
//! quasi-square), H(B) from `data/magnetisation.csv` for the steel's kind (IEC 60404-8-4 and -8-7
//! minimum polarisations at their stated fields; lower points from memory, labelled so) interpolated
//! linearly between its points, g the joints' equivalent air gap of a stacked core (two joints in the
//! path, 0.01 mm each for interleaved laminations: from memory). Above the table, the iron adds air's
//! slope (μ0). With a sweep, the measured current at the planned flux replaces the table.
//!
//! Inrush, first half cycle from remanence (Specht, "Transformer magnetizing inrush current", AIEE
//! Trans. 70 (1951)): î = V̂/√((ωL_air)² + R²) · (2·B_pk + B_r − B_s)/B_pk, L_air = μ0·N²·A_coil/h
//! (the primary as an air-cored coil: A_coil the area inside its mean turn, h its traverse), B_s =
//! 2.0 T for silicon steel (common practice), B_r from the steel row (from memory). V̂ is the sine's
//! peak, or a square drive's amplitude started at full volt-seconds. When 2·B_pk + B_r ≤ B_s the core
//! does not saturate and the inrush is no more than the magnetising peak. The series resistance that
//! holds the peak to `limit` × rated: R_s = √((V̂·k/I_lim)² − (ωL_air)²) − R, at least 0.

use crate::leakage::MU0;
use crate::magnetics::Waveform;
use std::f64::consts::PI;
use std::sync::OnceLock;

/// Saturation flux density of silicon steel for the inrush estimate, T (common practice).
pub const SATURATION_FOR_INRUSH_T: f64 = 2.0;
/// Equivalent air gap of one joint of an interleaved stack, mm (from memory).
pub const JOINT_GAP_MM: f64 = 0.01;
/// Joints in the flux path of a stacked E-I or U-I core.
pub const JOINTS: f64 = 2.0;
/// The inrush a soft start should hold to, × rated current (DESIGN.md).
pub const INRUSH_LIMIT_MULTIPLE: f64 = 10.0;

/// Each kind's points, (B, H), rising.
type Curves = Vec<(String, Vec<(f64, f64)>)>;

/// The table's points of one kind, (B, H), rising.
fn table(kind: &str) -> &'static [(f64, f64)] {
    static CELL: OnceLock<Curves> = OnceLock::new();
    let all = CELL.get_or_init(|| {
        let mut kinds: Vec<(String, Vec<(f64, f64)>)> = Vec::new();
        for r in crate::data::magnetisation() {
            let pt = (r.b_t, r.h_a_per_m);
            match kinds.iter_mut().find(|(k, _)| *k == r.kind) {
                Some((_, v)) => v.push(pt),
                None => kinds.push((r.kind.clone(), vec![pt])),
            }
        }
        kinds
    });
    all.iter()
        .find(|(k, _)| k == kind)
        .or_else(|| all.iter().find(|(k, _)| k == "unknown"))
        .map(|(_, v)| v.as_slice())
        .unwrap_or(&[])
}

/// H at B for a steel kind, A/m (a kind not in the table reads as `unknown`).
pub fn h_at(kind: &str, b_t: f64) -> f64 {
    let rows = table(kind);
    let b = b_t.abs();
    let (Some(first), Some(last)) = (rows.first(), rows.last()) else {
        return 0.0;
    };
    let h = if b <= first.0 {
        first.1 * b / first.0
    } else if b >= last.0 {
        last.1 + (b - last.0) / MU0
    } else {
        let k = rows
            .iter()
            .position(|r| r.0 >= b)
            .unwrap_or(rows.len() - 1)
            .max(1);
        let (lo, hi) = (rows[k - 1], rows[k]);
        let t = (b - lo.0) / (hi.0 - lo.0);
        lo.1 + t * (hi.1 - lo.1)
    };
    h.copysign(b_t)
}

/// The flux over one cycle, as a fraction of its peak, at the middles of `n` equal steps from θ = 0
/// (the volts' rising zero crossing): −cos θ for sine; a ramp while the volts are on for square and
/// quasi-square drive.
pub fn flux_shape(waveform: Waveform, n: usize) -> Vec<f64> {
    thread_local! {
        /// The last shape asked for (a plan asks for one many times).
        static LAST: std::cell::RefCell<Option<(Waveform, usize, Vec<f64>)>> =
            const { std::cell::RefCell::new(None) };
    }
    LAST.with(|cell| {
        let mut last = cell.borrow_mut();
        match last.as_ref() {
            Some((w, m, v)) if *w == waveform && *m == n => v.clone(),
            _ => {
                let v = shape_of(waveform, n);
                *last = Some((waveform, n, v.clone()));
                v
            }
        }
    })
}

fn shape_of(waveform: Waveform, n: usize) -> Vec<f64> {
    (0..n)
        .map(|k| {
            let th = 2.0 * PI * (k as f64 + 0.5) / n as f64;
            match waveform {
                Waveform::Sine => -th.cos(),
                Waveform::Square => ramp(th, 1.0),
                Waveform::QuasiSquare { duty } => ramp(th, duty),
            }
        })
        .collect()
}

/// A trapezoid flux: rising from −1 to 1 while the volts are on in the first half (centred, a
/// fraction `duty` of it), falling in the second.
fn ramp(th: f64, duty: f64) -> f64 {
    let (half, t) = if th < PI { (1.0, th) } else { (-1.0, th - PI) };
    let a = PI / 2.0 * (1.0 - duty);
    let w = PI * duty;
    let frac = ((t - a) / w).clamp(0.0, 1.0);
    half * (-1.0 + 2.0 * frac)
}

/// The magnetising current waveform on the primary, A, at `n` steps over a cycle: from the steel's
/// table and the joints' gap.
pub fn current_wave(
    kind: &str,
    waveform: Waveform,
    b_pk_t: f64,
    path_mm: f64,
    turns: f64,
    n: usize,
) -> Vec<f64> {
    let gap_m = JOINTS * JOINT_GAP_MM / 1000.0;
    flux_shape(waveform, n)
        .into_iter()
        .map(|s| {
            let b = s * b_pk_t;
            (h_at(kind, b) * path_mm / 1000.0 + b * gap_m / MU0) / turns.max(1.0)
        })
        .collect()
}

/// RMS of samples over a cycle.
pub fn rms(samples: &[f64]) -> f64 {
    if samples.is_empty() {
        return 0.0;
    }
    (samples.iter().map(|v| v * v).sum::<f64>() / samples.len() as f64).sqrt()
}

/// The switch-on inrush estimate.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct Inrush {
    /// Peak of the first half cycle, A.
    pub peak_amps: f64,
    /// Over the rated primary current (RMS).
    pub multiple_of_rated: f64,
    /// Series resistance that holds the peak to 10 × rated, Ω (0: none needed).
    pub soft_start_ohm: f64,
    /// The primary as an air-cored coil, H.
    pub air_core_h: f64,
}

/// What the inrush estimate needs.
#[derive(Debug, Clone, Copy)]
pub struct InrushInput {
    /// Peak of the applied volts (a sine's √2·V; a square's amplitude), V.
    pub volts_peak: f64,
    /// Frequency, Hz.
    pub frequency_hz: f64,
    /// Primary turns.
    pub turns: f64,
    /// Area inside the primary's mean turn, mm².
    pub coil_area_mm2: f64,
    /// The primary's traverse, mm.
    pub traverse_mm: f64,
    /// The primary's resistance (cold), Ω.
    pub r_ohm: f64,
    /// Working peak flux, T.
    pub b_pk_t: f64,
    /// Remanence, T.
    pub b_r_t: f64,
    /// Rated primary current, A RMS.
    pub rated_amps: f64,
    /// The magnetising current's peak at rated volts, A (the floor when the core does not saturate).
    pub magnetising_peak_amps: f64,
}

/// Specht's first-half-cycle estimate and the soft-start resistance.
pub fn inrush(i: &InrushInput) -> Inrush {
    let l_air =
        MU0 * i.turns * i.turns * (i.coil_area_mm2 * 1e-6) / (i.traverse_mm / 1000.0).max(1e-6);
    let x = 2.0 * PI * i.frequency_hz * l_air;
    let k = ((2.0 * i.b_pk_t + i.b_r_t - SATURATION_FOR_INRUSH_T) / i.b_pk_t.max(1e-9)).max(0.0);
    let z = (x * x + i.r_ohm * i.r_ohm).sqrt().max(1e-12);
    let peak = (i.volts_peak / z * k).max(i.magnetising_peak_amps);
    let limit = INRUSH_LIMIT_MULTIPLE * i.rated_amps;
    let soft = if peak > limit && limit > 0.0 {
        let z_needed = i.volts_peak * k / limit;
        let r_total = (z_needed * z_needed - x * x).max(0.0).sqrt();
        (r_total - i.r_ohm).max(0.0)
    } else {
        0.0
    };
    Inrush {
        peak_amps: peak,
        multiple_of_rated: if i.rated_amps > 0.0 {
            peak / i.rated_amps
        } else {
            0.0
        },
        soft_start_ohm: soft,
        air_core_h: l_air,
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    /// Specht's estimate worked by hand: 230 V, 50 Hz, N = 500, coil area 40 × 50 mm (2000 mm²),
    /// h = 50 mm, R = 2 Ω, B_pk = 1.3 T, B_r = 0.9 T, B_s = 2.0 T.
    /// L_air = 4π·10⁻⁷·500²·0.002/0.05 = 12.566 mH, ωL = 3.948 Ω, |Z| = √(3.948² + 2²) = 4.426 Ω,
    /// î = 325.27/4.426 × (2.6 + 0.9 − 2.0)/1.3 = 73.49 × 1.1538 = 84.8 A.
    #[test]
    fn specht_by_hand() {
        let r = inrush(&InrushInput {
            volts_peak: 230.0 * 2f64.sqrt(),
            frequency_hz: 50.0,
            turns: 500.0,
            coil_area_mm2: 2000.0,
            traverse_mm: 50.0,
            r_ohm: 2.0,
            b_pk_t: 1.3,
            b_r_t: 0.9,
            rated_amps: 2.0,
            magnetising_peak_amps: 0.1,
        });
        assert_relative_eq!(r.air_core_h, 12.566e-3, max_relative = 1e-4);
        assert_relative_eq!(r.peak_amps, 84.8, max_relative = 2e-3);
        assert_relative_eq!(r.multiple_of_rated, 42.4, max_relative = 2e-3);
        // Held to 20 A: |Z| = 325.27·1.1538/20 = 18.77 Ω → R_total = √(18.77² − 3.948²) = 18.35 Ω.
        assert_relative_eq!(r.soft_start_ohm, 18.35 - 2.0, max_relative = 3e-3);
    }

    /// A core run low enough that 2·B_pk + B_r stays below saturation sees no inrush beyond its
    /// magnetising peak.
    #[test]
    fn no_saturation_no_inrush() {
        let r = inrush(&InrushInput {
            volts_peak: 325.0,
            frequency_hz: 50.0,
            turns: 500.0,
            coil_area_mm2: 2000.0,
            traverse_mm: 50.0,
            r_ohm: 2.0,
            b_pk_t: 0.5,
            b_r_t: 0.9,
            rated_amps: 2.0,
            magnetising_peak_amps: 0.1,
        });
        assert_relative_eq!(r.peak_amps, 0.1);
        assert_eq!(r.soft_start_ohm, 0.0);
    }

    /// The table's IEC points come back exactly; the sine's magnetising current of an ideal linear
    /// core (H ∝ B) is its peak over √2.
    #[test]
    fn table_and_waveform() {
        assert_relative_eq!(h_at("non-oriented", 1.636), 5000.0, max_relative = 1e-9);
        assert_relative_eq!(h_at("grain-oriented", 1.781), 800.0, max_relative = 1e-9);
        assert!(h_at("unknown", 1.3) > h_at("non-oriented", 1.3));
        let lin = current_wave("non-oriented", Waveform::Sine, 0.4, 100.0, 100.0, 720);
        let peak = lin.iter().fold(0.0_f64, |m, v| m.max(v.abs()));
        assert_relative_eq!(rms(&lin), peak / 2f64.sqrt(), max_relative = 1e-3);
    }
}
