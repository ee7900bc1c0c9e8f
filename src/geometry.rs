//! A measured core: net iron area, window area, area product, magnetic path length and mass.
//!
//! Shape `ei` (shell type, coil on the tongue): a = tongue, s = stack, w × h = one window, outer leg
//! c and yoke y default to a/2 (the scrapless proportions, McLyman, Transformer and Inductor Design
//! Handbook, ch. 3). Ae = k·a·s, Aw = w·h, Ap = Ae·Aw, le = a/2 + 2w + c + 2h + 2y (the centre line
//! of each half of the flux: it divides in the tongue, so each half runs in half the tongue's width;
//! McLyman's EI-150 table lists 22.9 cm), mass = ρ·k·s·((a + 2w + 2c)(h + 2y) − 2wh).
//! Shape `ui` (core type, two legs of width a, yokes y default a): Ae = k·a·s, Aw = w·h,
//! le = 2a + 2w + 2h + 2y, mass = ρ·k·s·((2a + w)(h + 2y) − wh).
//! Steel density 7.65 g/cm³ (IEC 60404-8-7 grain-oriented, used for all grades as the default).

use serde::Serialize;

/// Default steel density, g/cm³.
pub const STEEL_DENSITY_G_CM3: f64 = 7.65;
/// Default stacking factor (common practice for 0.5 mm laminations; ASTM A719 range 0.90–0.99).
pub const DEFAULT_STACKING: f64 = 0.95;

/// The lamination shape.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Shape {
    /// Shell type: E and I laminations, the coil on the centre tongue.
    Ei,
    /// Core type: U and I laminations, a half-coil on each leg.
    Ui,
}

impl Shape {
    /// The name used in job files and on the command line.
    pub fn name(self) -> &'static str {
        match self {
            Shape::Ei => "ei",
            Shape::Ui => "ui",
        }
    }
}

/// The measurements of a core.
#[derive(Debug, Clone, PartialEq)]
pub struct CoreDims {
    /// Lamination shape.
    pub shape: Shape,
    /// Tongue (or leg) width a, mm.
    pub tongue_mm: f64,
    /// Stack depth s, mm.
    pub stack_mm: f64,
    /// Window width w (build direction), mm.
    pub window_width_mm: f64,
    /// Window height h (traverse direction), mm.
    pub window_height_mm: f64,
    /// Stacking factor k.
    pub stacking_factor: f64,
    /// Outer leg width c, mm (E-I only).
    pub outer_leg_mm: f64,
    /// Yoke height y, mm.
    pub yoke_mm: f64,
    /// Measured mass, kg, when the person weighed the core.
    pub measured_mass_kg: Option<f64>,
}

impl CoreDims {
    /// A core with the default outer leg and yoke for its shape and no measured mass.
    pub fn new(
        shape: Shape,
        tongue_mm: f64,
        stack_mm: f64,
        window: (f64, f64),
        stacking: f64,
    ) -> Self {
        let (outer, yoke) = default_leg_yoke(shape, tongue_mm);
        CoreDims {
            shape,
            tongue_mm,
            stack_mm,
            window_width_mm: window.0,
            window_height_mm: window.1,
            stacking_factor: stacking,
            outer_leg_mm: outer,
            yoke_mm: yoke,
            measured_mass_kg: None,
        }
    }
}

/// Default outer leg and yoke widths (mm) for a shape with tongue `a`.
pub fn default_leg_yoke(shape: Shape, a: f64) -> (f64, f64) {
    match shape {
        Shape::Ei => (a / 2.0, a / 2.0),
        Shape::Ui => (a, a),
    }
}

/// What follows from the measurements.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct CoreGeometry {
    /// Gross iron area a·s, mm².
    pub area_gross_mm2: f64,
    /// Net iron area k·a·s, mm².
    pub area_net_mm2: f64,
    /// One window's area w·h, mm².
    pub window_area_mm2: f64,
    /// Area product Ae·Aw, cm⁴.
    pub area_product_cm4: f64,
    /// Magnetic path length along the centre line, mm.
    pub path_length_mm: f64,
    /// Core mass, kg (measured when given).
    pub mass_kg: f64,
    /// Whether the mass was measured rather than computed.
    pub mass_measured: bool,
    /// Lamination outline width, mm.
    pub outline_width_mm: f64,
    /// Lamination outline height, mm.
    pub outline_height_mm: f64,
}

/// Computes the geometry of a core.
pub fn geometry(d: &CoreDims) -> CoreGeometry {
    let (a, s, w, h, k) = (
        d.tongue_mm,
        d.stack_mm,
        d.window_width_mm,
        d.window_height_mm,
        d.stacking_factor,
    );
    let (c, y) = (d.outer_leg_mm, d.yoke_mm);
    let area_gross = a * s;
    let area_net = k * area_gross;
    let window = w * h;
    let (outline_w, outline_h, face_mm2, path) = match d.shape {
        Shape::Ei => {
            let ow = a + 2.0 * w + 2.0 * c;
            let oh = h + 2.0 * y;
            (
                ow,
                oh,
                ow * oh - 2.0 * w * h,
                a / 2.0 + 2.0 * w + c + 2.0 * h + 2.0 * y,
            )
        }
        Shape::Ui => {
            let ow = 2.0 * a + w;
            let oh = h + 2.0 * y;
            (
                ow,
                oh,
                ow * oh - w * h,
                2.0 * a + 2.0 * w + 2.0 * h + 2.0 * y,
            )
        }
    };
    // mm³ × g/cm³ × 1e-3 cm³/mm³ = g; /1000 = kg.
    let computed_kg = STEEL_DENSITY_G_CM3 * k * s * face_mm2 * 1e-6;
    CoreGeometry {
        area_gross_mm2: area_gross,
        area_net_mm2: area_net,
        window_area_mm2: window,
        area_product_cm4: area_net * window / 1e4,
        path_length_mm: path,
        mass_kg: d.measured_mass_kg.unwrap_or(computed_kg),
        mass_measured: d.measured_mass_kg.is_some(),
        outline_width_mm: outline_w,
        outline_height_mm: outline_h,
    }
}

/// The common bench rule of thumb: Ae in cm² ≈ √VA, so VA ≈ (Ae/cm²)² (common practice, no
/// source states it; gross area is what a person measures).
pub fn rule_of_thumb_va(area_gross_mm2: f64) -> f64 {
    let cm2 = area_gross_mm2 / 100.0;
    cm2 * cm2
}

/// What `ironwind core` reports: the measurements, their geometry and the rule-of-thumb rating.
#[derive(Debug, Clone, PartialEq)]
pub struct CoreReport {
    /// The measurements.
    pub dims: CoreDims,
    /// What follows from them.
    pub geometry: CoreGeometry,
    /// The rule of thumb Ae[cm²] ≈ √VA, VA (common practice, not a rating).
    pub rule_of_thumb_va: f64,
}

/// The report of a measured core.
pub fn core_report(dims: &CoreDims) -> CoreReport {
    let g = geometry(dims);
    CoreReport {
        dims: dims.clone(),
        rule_of_thumb_va: rule_of_thumb_va(g.area_gross_mm2),
        geometry: g,
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    /// Geometry is closed-form: a tight tolerance.
    const GEOM: f64 = 1e-9;

    #[test]
    fn scrapless_ei_area_product_mclyman_from_memory() {
        // McLyman scrapless E-I proportions (from memory, REFERENCES.md): a = 2.54 cm, window
        // a/2 × 1.5a → Wa = 4.84 cm², Ac = 6.13 cm² at k = 0.95, Ap = 29.7 cm⁴ (3 significant figures).
        let a = 25.4;
        let d = CoreDims::new(Shape::Ei, a, a, (a / 2.0, 1.5 * a), 0.95);
        let g = geometry(&d);
        assert_relative_eq!(g.window_area_mm2 / 100.0, 4.84, max_relative = 0.002);
        assert_relative_eq!(g.area_net_mm2 / 100.0, 6.13, max_relative = 0.002);
        assert_relative_eq!(g.area_product_cm4, 29.7, max_relative = 0.002);
        // Outline 3a × 2.5a (McLyman, from memory).
        assert_relative_eq!(g.outline_width_mm, 3.0 * a, max_relative = GEOM);
        assert_relative_eq!(g.outline_height_mm, 2.5 * a, max_relative = GEOM);
    }

    #[test]
    fn ei_mass_and_path_by_design_formula() {
        // DESIGN.md formulas worked by hand: a 32, s 40, w 16, h 48, k 0.95, c = y = 16.
        let g = geometry(&CoreDims::new(Shape::Ei, 32.0, 40.0, (16.0, 48.0), 0.95));
        assert_relative_eq!(g.area_net_mm2, 1216.0, max_relative = GEOM);
        assert_relative_eq!(g.window_area_mm2, 768.0, max_relative = GEOM);
        assert_relative_eq!(g.area_product_cm4, 93.3888, max_relative = GEOM);
        // le = 16 + 32 + 16 + 96 + 32 = 192 mm.
        assert_relative_eq!(g.path_length_mm, 192.0, max_relative = GEOM);
        // face = 96·80 − 2·768 = 6144 mm²; mass = 7.65e-6·0.95·40·6144 = 1.786 kg.
        assert_relative_eq!(
            g.mass_kg,
            7.65e-6 * 0.95 * 40.0 * 6144.0,
            max_relative = GEOM
        );
    }

    #[test]
    fn ei150_path_length_from_mclyman() {
        // McLyman, Transformer and Inductor Design Handbook, lamination table: EI-150 (tongue
        // 1.5 in, scrapless: window 0.75 × 2.25 in) has a magnetic path length of 22.9 cm, which
        // the table quotes to three figures.
        let a = 1.5 * 25.4;
        let g = geometry(&CoreDims::new(Shape::Ei, a, a, (a / 2.0, 1.5 * a), 0.95));
        assert_relative_eq!(g.path_length_mm / 10.0, 22.9, max_relative = 0.003);
    }

    #[test]
    fn ui_outline_and_mass() {
        let g = geometry(&CoreDims::new(Shape::Ui, 20.0, 30.0, (20.0, 60.0), 1.0));
        // outline (2a + w)(h + 2y) − wh = 60·100 − 1200 = 4800 mm².
        assert_relative_eq!(g.mass_kg, 7.65e-6 * 30.0 * 4800.0, max_relative = GEOM);
        assert_relative_eq!(
            g.path_length_mm,
            40.0 + 40.0 + 120.0 + 40.0,
            max_relative = GEOM
        );
    }

    #[test]
    fn rule_of_thumb_squares_the_area() {
        // Common practice: Ae[cm²] ≈ √VA; 10 cm² → 100 VA.
        assert_relative_eq!(rule_of_thumb_va(1000.0), 100.0, max_relative = GEOM);
    }
}
