//! Copper resistance, heating, efficiency and regulation.
//!
//! - Annealed copper (IEC 60028): ρ20 = 1/58 Ω·mm²/m = 0.017241, temperature coefficient 0.00393 /K at
//!   20 °C, density 8.89 g/cm³; R(T) = R20·(1 + 0.00393·(T − 20)).
//! - Temperature rise of a transformer cooled by natural convection (McLyman, Transformer and Inductor
//!   Design Handbook, ch. 6): ΔT = 450 · ψ^0.826 °C, ψ = total loss / surface area in W/cm².
//! - Surface: the box around core and coil, A_t = 2(W·H + W·D + H·D).
//! - Efficiency η = P_out / (P_out + P_cu + P_core); regulation % = (V_NL − V_FL)/V_FL · 100
//!   (McLyman, Transformer and Inductor Design Handbook: α, per output winding)
//!   (McLyman's α ≈ P_cu/P_o, in the form DESIGN.md fixes).

/// Resistivity of annealed copper at 20 °C, Ω·mm²/m (IEC 60028).
pub const RHO20_OHM_MM2_PER_M: f64 = 1.0 / 58.0;
/// Temperature coefficient of resistance of copper at 20 °C, 1/K (IEC 60028).
pub const ALPHA20_PER_K: f64 = 0.00393;
/// Density of copper, g/cm³ (IEC 60028).
pub const COPPER_DENSITY_G_CM3: f64 = 8.89;

/// The factor R(T)/R(20 °C).
pub fn temperature_factor(t_c: f64) -> f64 {
    1.0 + ALPHA20_PER_K * (t_c - 20.0)
}

/// Resistance of `length_m` of copper of area `area_mm2` at `t_c`, Ω.
pub fn resistance_ohm(length_m: f64, area_mm2: f64, t_c: f64) -> f64 {
    RHO20_OHM_MM2_PER_M * length_m / area_mm2 * temperature_factor(t_c)
}

/// Copper mass of `length_m` of area `area_mm2`, g.
pub fn copper_mass_g(length_m: f64, area_mm2: f64) -> f64 {
    // m × mm² = 1e3 mm³ = 1 cm³.
    length_m * area_mm2 * COPPER_DENSITY_G_CM3
}

/// Temperature rise by natural convection, °C, for `loss_w` over `surface_cm2`.
pub fn rise_c(loss_w: f64, surface_cm2: f64) -> f64 {
    if loss_w <= 0.0 {
        return 0.0;
    }
    450.0 * (loss_w / surface_cm2).powf(0.826)
}

/// The loss (W) that gives `rise` °C over `surface_cm2` — the inverse of [`rise_c`].
pub fn loss_for_rise_w(rise: f64, surface_cm2: f64) -> f64 {
    if rise <= 0.0 {
        return 0.0;
    }
    (rise / 450.0).powf(1.0 / 0.826) * surface_cm2
}

/// Surface of a box W × H × D (mm), cm².
pub fn box_surface_cm2(w_mm: f64, h_mm: f64, d_mm: f64) -> f64 {
    2.0 * (w_mm * h_mm + w_mm * d_mm + h_mm * d_mm) / 100.0
}

/// Efficiency, as a fraction.
pub fn efficiency(p_out: f64, p_cu: f64, p_core: f64) -> f64 {
    let total = p_out + p_cu + p_core;
    if total <= 0.0 {
        0.0
    } else {
        p_out / total
    }
}

/// Regulation of an output, % (McLyman): (V_NL − V_FL)/V_FL · 100.
pub fn regulation_pct(v_no_load: f64, v_full_load: f64) -> f64 {
    if v_full_load > 0.0 {
        (v_no_load - v_full_load) / v_full_load * 100.0
    } else {
        f64::INFINITY
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    /// Published tables round to 4 significant figures.
    const TABLE: f64 = 0.001;

    #[test]
    fn iec_60028_resistivity_and_factors() {
        // IEC 60028: ρ20 = 0.017241 Ω·mm²/m; ×1.216 at 75 °C, ×1.314 at 100 °C [C].
        // 0.017241 is 1/58 to five significant figures.
        assert_relative_eq!(RHO20_OHM_MM2_PER_M, 0.017241, epsilon = 0.0000005);
        assert_relative_eq!(temperature_factor(75.0), 1.216, max_relative = TABLE);
        assert_relative_eq!(temperature_factor(100.0), 1.314, max_relative = TABLE);
    }

    #[test]
    fn published_awg_resistance_per_1000_ft() {
        // Published magnet-wire tables (REFERENCES.md [S]): AWG 20 = 10.13 Ω/1000 ft, AWG 14 = 2.524
        // Ω/1000 ft at 20 °C — ρ20 over the ASTM-rounded area (0.0320 in and 0.0641 in).
        let area = |d_in: f64| crate::wire::round_area_mm2(d_in * 25.4);
        let per_kft = |d_in: f64| resistance_ohm(304.8, area(d_in), 20.0);
        assert_relative_eq!(per_kft(0.0320), 10.13, max_relative = TABLE);
        assert_relative_eq!(per_kft(0.0641), 2.524, max_relative = TABLE);
    }

    #[test]
    fn mclyman_heating_relation_from_memory() {
        // McLyman (from memory, REFERENCES.md): ψ 0.03 W/cm² → 24.8 °C, 0.07 → 50.0 °C.
        assert_relative_eq!(rise_c(3.0, 100.0), 24.8, max_relative = 0.005);
        assert_relative_eq!(rise_c(7.0, 100.0), 50.0, max_relative = 0.005);
        assert_relative_eq!(
            loss_for_rise_w(rise_c(7.0, 100.0), 100.0),
            7.0,
            max_relative = 1e-12
        );
    }

    #[test]
    fn copper_mass_density() {
        // 1 m of 1 mm² is 1 cm³: 8.89 g (IEC 60028 density).
        assert_relative_eq!(copper_mass_g(1.0, 1.0), 8.89, max_relative = 1e-12);
    }

    #[test]
    fn efficiency_and_regulation() {
        assert_relative_eq!(efficiency(90.0, 6.0, 4.0), 0.9, max_relative = 1e-12);
        // McLyman: α = (V_NL − V_FL)/V_FL · 100; 26.5 V with no load, 25.0 V at full load → 6 %.
        assert_relative_eq!(regulation_pct(26.5, 25.0), 6.0, max_relative = 1e-12);
    }
}
