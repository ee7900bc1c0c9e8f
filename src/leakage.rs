//! Leakage inductance between two windings, short-circuit impedance and the phasor drop.
//!
//! Lee's formula (after Fortescue; McLyman, Transformer and Inductor Design Handbook, ch. 17): two
//! concentric windings, referred to the one of N turns,
//!     L = μ0·N²·MLT·(g + (b1 + b2)/3) / h,
//! b1, b2 the radial builds, g the radial gap between them (insulation and any windings between),
//! MLT the mean turn over both, h the traverse. Side by side on a split bobbin the field runs across
//! the divider: the same with build and traverse exchanged (b1, b2 the two sections' axial lengths,
//! g the divider, h the radial build). No Rogowski factor is applied (it would lower L by a few per
//! cent for a tall narrow window; the bare formula is the conservative one).
//!
//! A U-I core carries half of each winding on each leg: the two legs' leakages add, each with half
//! the turns, so L = legs × (per-leg formula with N/legs turns).
//!
//! Phasor drop (any electrical-machines text): a load of power factor cos φ (lagging) at volts V
//! draws I at −φ; E = V + I·(R + jX), so V = √(E² − (I·(X cos φ − R sin φ))²) − I·(R cos φ + X sin φ).

/// The permeability of free space, H/m (CODATA 2018: 1.256 637 062 12 × 10⁻⁶).
pub const MU0: f64 = 1.256_637_062_12e-6;

/// Lee's formula for two concentric windings, H. Lengths in mm.
pub fn concentric_h(
    turns: f64,
    mean_turn_mm: f64,
    gap_mm: f64,
    build1_mm: f64,
    build2_mm: f64,
    traverse_mm: f64,
) -> f64 {
    if traverse_mm <= 0.0 {
        return 0.0;
    }
    MU0 * turns
        * turns
        * (mean_turn_mm / 1000.0)
        * ((gap_mm + (build1_mm + build2_mm) / 3.0) / 1000.0)
        / (traverse_mm / 1000.0)
}

/// Lee's formula for two windings side by side on a split bobbin, H: the concentric formula with
/// build and traverse exchanged (`divider_mm` the gap, `length1_mm`, `length2_mm` the sections'
/// axial lengths, `build_mm` the radial build they share).
pub fn side_by_side_h(
    turns: f64,
    mean_turn_mm: f64,
    divider_mm: f64,
    length1_mm: f64,
    length2_mm: f64,
    build_mm: f64,
) -> f64 {
    concentric_h(
        turns,
        mean_turn_mm,
        divider_mm,
        length1_mm,
        length2_mm,
        build_mm,
    )
}

/// Where a winding sits, as the leakage needs it.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Placed {
    /// Distance from the tube's outer face to its inner face, mm.
    pub start_mm: f64,
    /// Radial build, mm.
    pub build_mm: f64,
    /// Where its traverse starts along the bobbin, mm.
    pub offset_mm: f64,
    /// Its traverse, mm.
    pub traverse_mm: f64,
    /// Mean turn, mm.
    pub mean_turn_mm: f64,
    /// Bobbin section (1 or 2).
    pub section: u32,
}

/// The leakage between windings `a` and `b`, referred to `turns` turns of `a`, H; `legs` the legs
/// the windings are shared over (2 for a U-I core).
pub fn between_h(a: &Placed, b: &Placed, turns: f64, legs: f64) -> f64 {
    let mlt = (a.mean_turn_mm + b.mean_turn_mm) / 2.0;
    let n = turns / legs;
    let per_leg = if a.section == b.section {
        let (inner, outer) = if a.start_mm <= b.start_mm {
            (a, b)
        } else {
            (b, a)
        };
        let gap = (outer.start_mm - inner.start_mm - inner.build_mm).max(0.0);
        let h = (a.traverse_mm + b.traverse_mm) / 2.0;
        concentric_h(n, mlt, gap, a.build_mm, b.build_mm, h)
    } else {
        let (first, second) = if a.offset_mm <= b.offset_mm {
            (a, b)
        } else {
            (b, a)
        };
        let divider = (second.offset_mm - first.offset_mm - first.traverse_mm).max(0.0);
        let build = a.build_mm.max(b.build_mm);
        side_by_side_h(n, mlt, divider, a.traverse_mm, b.traverse_mm, build)
    };
    legs * per_leg
}

/// Full-load volts of a load at power factor `pf` (lagging) from the EMF `emf` behind `r` + j`x`,
/// drawing `amps`; 0 when the drop exceeds the EMF.
pub fn phasor_volts(emf: f64, amps: f64, r: f64, x: f64, pf: f64) -> f64 {
    let cos = pf.clamp(0.0, 1.0);
    let sin = (1.0 - cos * cos).sqrt();
    let quad = amps * (x * cos - r * sin);
    let inner = emf * emf - quad * quad;
    if inner <= 0.0 {
        return 0.0;
    }
    (inner.sqrt() - amps * (r * cos + x * sin)).max(0.0)
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    /// Hand-worked case of Lee's formula (McLyman's form): N = 100, MLT = 200 mm, g = 1 mm, b1 = b2
    /// = 6 mm, h = 50 mm → L = 4π·10⁻⁷·10⁴·0.2·(0.001 + 0.004)/0.05 = 251.3 µH.
    #[test]
    fn lee_hand_case() {
        let l = concentric_h(100.0, 200.0, 1.0, 6.0, 6.0, 50.0);
        assert_relative_eq!(
            l,
            4e-7 * std::f64::consts::PI * 1e4 * 0.2 * 0.005 / 0.05,
            max_relative = 1e-9
        );
        assert_relative_eq!(l, 251.327e-6, max_relative = 1e-5);
    }

    /// Against a 2-D finite-element solution of one window (tests/fem/leakage_window.py, scikit-fem
    /// from PyPI; the script and its printed values are committed, not the library): window 20 × 60
    /// mm, builds 6 mm with a 1 mm gap, N = 100, MLT 200 mm. Over the whole height the field is the
    /// one Lee's formula assumes and the FEM gives 209.440 µH; with 2 mm margins (traverse 56 mm)
    /// the FEM gives 213.502 µH, and Lee's formula, which ignores the fringing at the coil ends,
    /// 5 % more (224.4 µH): it errs high, on the side of less short-circuit current.
    #[test]
    fn lee_against_a_finite_element_window() {
        let full = concentric_h(100.0, 200.0, 1.0, 6.0, 6.0, 60.0);
        assert_relative_eq!(full, 209.440e-6, max_relative = 2e-5);
        let margins = concentric_h(100.0, 200.0, 1.0, 6.0, 6.0, 56.0);
        let fem = 213.502e-6;
        assert!(
            margins >= fem && margins <= 1.06 * fem,
            "{margins} vs {fem}"
        );
    }

    /// Side by side on a split bobbin (Lee's formula with build and traverse exchanged; McLyman):
    /// sections 20 mm and 24 mm long across a 2 mm divider, a shared build of 8 mm, MLT 180 mm,
    /// N = 50: L = μ0·2500·0.18·(0.002 + 0.044/3)/0.008 = 1.1781 mH.
    #[test]
    fn side_by_side_hand_case() {
        let a = Placed {
            start_mm: 0.0,
            build_mm: 8.0,
            offset_mm: 0.0,
            traverse_mm: 20.0,
            mean_turn_mm: 180.0,
            section: 1,
        };
        let b = Placed {
            build_mm: 6.0,
            offset_mm: 22.0,
            traverse_mm: 24.0,
            section: 2,
            ..a
        };
        let hand = MU0 * 2500.0 * 0.18 * (0.002 + 0.044 / 3.0) / 0.008;
        assert_relative_eq!(between_h(&a, &b, 50.0, 1.0), hand, max_relative = 1e-12);
        assert_relative_eq!(hand, 1.1781e-3, max_relative = 1e-4);
    }

    /// Referred to the other winding, the leakage scales with the turns ratio squared.
    #[test]
    fn referred_by_turns_squared() {
        let a = Placed {
            start_mm: 0.0,
            build_mm: 4.0,
            offset_mm: 0.0,
            traverse_mm: 40.0,
            mean_turn_mm: 150.0,
            section: 1,
        };
        let b = Placed {
            start_mm: 4.5,
            build_mm: 3.0,
            mean_turn_mm: 190.0,
            ..a
        };
        let l200 = between_h(&a, &b, 200.0, 1.0);
        let l20 = between_h(&b, &a, 20.0, 1.0);
        assert_relative_eq!(l200 / l20, 100.0, max_relative = 1e-12);
        // g = 0.5 mm, (b1 + b2)/3 = 7/3 mm, MLT 170 mm, h 40 mm.
        let hand = MU0 * 200.0 * 200.0 * 0.170 * (0.0005 + 7.0 / 3.0 / 1000.0) / 0.040;
        assert_relative_eq!(l200, hand, max_relative = 1e-12);
    }

    /// The phasor drop (any electrical-machines text): at unity power factor with X = 0 it is I·R;
    /// at zero power factor, I·X in line with the EMF.
    #[test]
    fn phasor_drop_limits() {
        assert_relative_eq!(
            phasor_volts(100.0, 10.0, 0.5, 0.0, 1.0),
            95.0,
            max_relative = 1e-12
        );
        assert_relative_eq!(
            phasor_volts(100.0, 10.0, 0.0, 0.5, 0.0),
            95.0,
            max_relative = 1e-12
        );
        // cos φ = 0.8, R = 0.3, X = 0.4, I = 10: V = √(100² − (10·(0.32 − 0.18))²) − 10·(0.24 + 0.24).
        let v = (100f64.powi(2) - 1.4f64.powi(2)).sqrt() - 4.8;
        assert_relative_eq!(
            phasor_volts(100.0, 10.0, 0.3, 0.4, 0.8),
            v,
            max_relative = 1e-12
        );
    }
}
