//! The tables in `data/`, embedded at compile time and parsed once into typed rows.
//!
//! - `wire_awg.csv`: AWG 4–40. Bare diameter from the ASTM B258 formula
//!   d(n) = 0.127 mm × 92^((36 − n)/39); single-build (grade 1) maximum overall diameters from
//!   NEMA MW 1000 as reproduced in published tables, heavy build (grade 2) from memory where
//!   marked, the other gauges interpolated or extrapolated on the enamel increase and marked so.
//! - `wire_metric.csv`: ISO 3 R20 nominal diameters 0.100–4.00 mm; IEC 60317-0-1 grade 1 and
//!   grade 2 maximum overall diameters from IS 13730-0-1 (its Indian adoption) where listed,
//!   interpolated on the enamel increase otherwise.
//! - `wire_swg.csv`: British Standard Wire Gauge 4–40 (BS 3737:1964, withdrawn; the 1883 Board of
//!   Trade gauge), diameters in inches as tabulated; overall diameters of IEC 60317-0-1 grades from
//!   IS 13730-0-1 where it lists the size, interpolated on the enamel increase otherwise.
//! - `steel.csv`: the generic steel kinds with a design flux density and a loss estimate.
//!
//! Each row keeps its source. A unit test checks every table is sorted, unique and positive, so a
//! bad edit fails `cargo test`, not a user.

use serde::Deserialize;
use std::sync::OnceLock;

/// The text of `data/wire_awg.csv`.
pub const WIRE_AWG_CSV: &str = include_str!("../data/wire_awg.csv");
/// The text of `data/wire_metric.csv`.
pub const WIRE_METRIC_CSV: &str = include_str!("../data/wire_metric.csv");
/// The text of `data/wire_swg.csv`.
pub const WIRE_SWG_CSV: &str = include_str!("../data/wire_swg.csv");
/// The text of `data/steel.csv`.
pub const STEEL_CSV: &str = include_str!("../data/steel.csv");
/// Version label of the embedded data tables (bump when a table changes).
pub const DATA_VERSION: &str = "wire_awg 1, wire_metric 1, wire_swg 1, steel 3, magnetisation 1";
/// The text of `data/magnetisation.csv`.
pub const MAGNETISATION_CSV: &str = include_str!("../data/magnetisation.csv");

/// One AWG row.
#[derive(Debug, Clone, Deserialize)]
pub struct AwgRow {
    /// The gauge number.
    pub gauge: u32,
    /// Bare copper diameter, mm.
    pub bare_mm: f64,
    /// Maximum overall diameter, single build (grade 1), mm.
    pub grade1_max_mm: f64,
    /// Maximum overall diameter, heavy build (grade 2), mm.
    pub grade2_max_mm: f64,
    /// Where the row's numbers come from.
    pub source: String,
}

/// One metric row.
#[derive(Debug, Clone, Deserialize)]
pub struct MetricRow {
    /// Nominal conductor diameter, mm (ISO 3 R20).
    pub nominal_mm: f64,
    /// Maximum overall diameter, grade 1, mm.
    pub grade1_max_mm: f64,
    /// Maximum overall diameter, grade 2, mm.
    pub grade2_max_mm: f64,
    /// Where the row's numbers come from.
    pub source: String,
}

/// One SWG row.
#[derive(Debug, Clone, Deserialize)]
pub struct SwgRow {
    /// The gauge number.
    pub gauge: u32,
    /// Diameter in inches as BS 3737 tabulates it.
    pub inch: f64,
    /// Bare diameter, mm.
    pub bare_mm: f64,
    /// Maximum overall diameter, grade 1, mm.
    pub grade1_max_mm: f64,
    /// Maximum overall diameter, grade 2, mm.
    pub grade2_max_mm: f64,
    /// Where the row's numbers come from.
    pub source: String,
}

/// One steel row.
#[derive(Debug, Clone, Deserialize)]
pub struct SteelRow {
    /// The name a job uses (`unknown`, `non-oriented`, `grain-oriented`).
    pub name: String,
    /// The kind of steel.
    pub kind: String,
    /// Specific loss at 1.5 T, 50 Hz, W/kg (an estimate).
    pub loss_w_per_kg_1t5_50hz: f64,
    /// Default design flux density, T.
    pub design_flux_t: f64,
    /// Share of the 50 Hz sine loss that is hysteresis (from memory).
    pub hysteresis_share: f64,
    /// Share that is classical eddy-current loss (from memory).
    pub eddy_share: f64,
    /// Share that is excess (anomalous) loss (from memory).
    pub excess_share: f64,
    /// Remanent flux density of a stacked core, T (from memory; for the inrush estimate).
    pub remanence_t: f64,
    /// Where the row's numbers come from.
    pub source: String,
}

/// One point of a magnetisation curve (H at B) for a steel kind.
#[derive(Debug, Clone, Deserialize)]
pub struct MagnetisationRow {
    /// The kind of steel (`unknown`, `non-oriented`, `grain-oriented`).
    pub kind: String,
    /// Flux density, T.
    pub b_t: f64,
    /// Field strength, A/m.
    pub h_a_per_m: f64,
    /// Where the point comes from.
    pub source: String,
}

fn parse<T: for<'de> Deserialize<'de>>(text: &str) -> Result<Vec<T>, String> {
    let mut rdr = csv::Reader::from_reader(text.as_bytes());
    rdr.deserialize()
        .collect::<Result<Vec<T>, _>>()
        .map_err(|e| e.to_string())
}

fn parsed<T: for<'de> Deserialize<'de>>(
    cell: &'static OnceLock<Vec<T>>,
    text: &str,
) -> &'static [T] {
    // The tables are part of the binary and checked by unit tests; a parse failure here is a
    // build defect, so an empty table is returned rather than a panic.
    cell.get_or_init(|| parse(text).unwrap_or_default())
}

/// The AWG table, thickest first (gauge 4 to 40).
pub fn awg() -> &'static [AwgRow] {
    static CELL: OnceLock<Vec<AwgRow>> = OnceLock::new();
    parsed(&CELL, WIRE_AWG_CSV)
}

/// The metric table, thinnest first.
pub fn metric() -> &'static [MetricRow] {
    static CELL: OnceLock<Vec<MetricRow>> = OnceLock::new();
    parsed(&CELL, WIRE_METRIC_CSV)
}

/// The SWG table, thickest first (gauge 4 to 40).
pub fn swg() -> &'static [SwgRow] {
    static CELL: OnceLock<Vec<SwgRow>> = OnceLock::new();
    parsed(&CELL, WIRE_SWG_CSV)
}

/// The magnetisation table, by kind, rising B.
pub fn magnetisation() -> &'static [MagnetisationRow] {
    static CELL: OnceLock<Vec<MagnetisationRow>> = OnceLock::new();
    parsed(&CELL, MAGNETISATION_CSV)
}

/// The steel table.
pub fn steel() -> &'static [SteelRow] {
    static CELL: OnceLock<Vec<SteelRow>> = OnceLock::new();
    parsed(&CELL, STEEL_CSV)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn tables_parse_whole() {
        assert_eq!(parse::<AwgRow>(WIRE_AWG_CSV).expect("awg").len(), 37);
        assert_eq!(
            parse::<MetricRow>(WIRE_METRIC_CSV).expect("metric").len(),
            33
        );
        assert_eq!(parse::<SteelRow>(STEEL_CSV).expect("steel").len(), 3);
        let mag = parse::<MagnetisationRow>(MAGNETISATION_CSV).expect("magnetisation");
        for kind in ["unknown", "non-oriented", "grain-oriented"] {
            let pts: Vec<_> = mag.iter().filter(|r| r.kind == kind).collect();
            assert!(pts.len() >= 5, "{kind}");
            assert!(pts
                .windows(2)
                .all(|w| w[1].b_t > w[0].b_t && w[1].h_a_per_m > w[0].h_a_per_m));
            assert!(pts.iter().all(|r| !r.source.is_empty()));
        }
        assert_eq!(parse::<SwgRow>(WIRE_SWG_CSV).expect("swg").len(), 37);
    }

    #[test]
    fn swg_against_bs_3737() {
        // BS 3737:1964 (REFERENCES.md, as tabulated in public reference tables), inches / mm.
        for (gauge, inch, mm) in [
            (10, 0.128, 3.251),
            (12, 0.104, 2.642),
            (14, 0.080, 2.032),
            (16, 0.064, 1.626),
            (18, 0.048, 1.219),
            (20, 0.036, 0.914),
            (22, 0.028, 0.711),
            (24, 0.022, 0.559),
            (26, 0.018, 0.457),
            (28, 0.0148, 0.376),
            (30, 0.0124, 0.315),
            (32, 0.0108, 0.274),
            (34, 0.0092, 0.234),
            (36, 0.0076, 0.193),
            (38, 0.0060, 0.152),
            (40, 0.0048, 0.122),
        ] {
            let r = swg().iter().find(|r| r.gauge == gauge).expect("gauge");
            assert!((r.inch - inch).abs() < 1e-9, "SWG {gauge}");
            // The table's mm are the inches × 25.4 to the micrometre.
            assert!(
                (r.bare_mm - mm).abs() <= 0.0006,
                "SWG {gauge}: {}",
                r.bare_mm
            );
            assert!((r.bare_mm - inch * 25.4).abs() <= 0.0006, "SWG {gauge}");
        }
        // IS 13730-0-1 overall diameters on SWG sizes [S]: 0.315 → 0.349 / 0.367, 1.626 → 1.698 /
        // 1.735.
        let r30 = swg().iter().find(|r| r.gauge == 30).expect("30");
        assert_eq!((r30.grade1_max_mm, r30.grade2_max_mm), (0.349, 0.367));
        let r16 = swg().iter().find(|r| r.gauge == 16).expect("16");
        assert_eq!((r16.grade1_max_mm, r16.grade2_max_mm), (1.698, 1.735));
    }

    #[test]
    fn swg_sorted_unique_positive_and_enamel_grows() {
        let rows = swg();
        for pair in rows.windows(2) {
            assert!(pair[1].gauge == pair[0].gauge + 1, "gauges consecutive");
            assert!(pair[1].bare_mm < pair[0].bare_mm, "thinner with gauge");
        }
        for r in rows {
            assert!(r.grade1_max_mm > r.bare_mm && r.grade2_max_mm > r.grade1_max_mm);
            assert!(!r.source.is_empty());
        }
    }

    #[test]
    fn awg_sorted_unique_positive_and_enamel_grows() {
        let rows = awg();
        for pair in rows.windows(2) {
            assert!(pair[1].gauge == pair[0].gauge + 1, "gauges consecutive");
            assert!(pair[1].bare_mm < pair[0].bare_mm, "thinner with gauge");
            assert!(pair[1].grade2_max_mm < pair[0].grade2_max_mm);
        }
        for r in rows {
            assert!(r.bare_mm > 0.0);
            assert!(r.grade1_max_mm > r.bare_mm, "gauge {}", r.gauge);
            assert!(r.grade2_max_mm > r.grade1_max_mm, "gauge {}", r.gauge);
            assert!(!r.source.is_empty());
        }
    }

    #[test]
    fn metric_sorted_unique_positive_and_enamel_grows() {
        let rows = metric();
        for pair in rows.windows(2) {
            assert!(pair[1].nominal_mm > pair[0].nominal_mm);
        }
        for r in rows {
            assert!(r.grade1_max_mm > r.nominal_mm);
            assert!(r.grade2_max_mm > r.grade1_max_mm);
            assert!(!r.source.is_empty());
        }
    }

    #[test]
    fn steel_rows_positive() {
        for r in steel() {
            assert!(r.loss_w_per_kg_1t5_50hz > 0.0 && r.design_flux_t > 0.0);
            let shares = [r.hysteresis_share, r.eddy_share, r.excess_share];
            assert!(shares.iter().all(|&s| s >= 0.0), "{}", r.name);
            let sum: f64 = shares.iter().sum();
            assert!((sum - 1.0).abs() < 1e-9, "{}: shares sum to {sum}", r.name);
        }
    }
}
