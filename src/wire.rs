//! Wire: the round-wire tables, strip conductors, and the choice of size and strands for a current.
//!
//! - AWG: d(n) = 0.127 mm × 92^((36 − n)/39) (ASTM B258); area = π d²/4.
//! - Metric: ISO 3 R20 nominal diameters, IEC 60317-0-1 grades of enamel.
//! - Current density: 1 A/mm² = 1973.5 circular mils per ampere (1 cmil = 5.067×10⁻⁴ mm²).
//! - Choice (DESIGN.md): area needed A = I/J; strands n = ceil(A / area(max strand)); then the smallest
//!   size with n·area ≥ A. A forced size takes the strands it needs; forced strands take the smallest
//!   size that carries the current with them.

use crate::data;
use serde::Serialize;
use std::f64::consts::PI;
use std::sync::OnceLock;

/// Square millimetres in one circular mil: (0.0254 mm)² × π/4.
pub const MM2_PER_CMIL: f64 = 0.0254 * 0.0254 * PI / 4.0;
/// Circular mils per ampere for 1 A/mm².
pub const CMIL_PER_A_AT_1_A_MM2: f64 = 1.0 / MM2_PER_CMIL;

/// The wire system a winding is chosen from.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum System {
    /// Metric nominal diameters (ISO 3 R20, IEC 60317).
    Metric,
    /// American Wire Gauge (ASTM B258).
    Awg,
    /// British Standard Wire Gauge (BS 3737:1964).
    Swg,
}

impl System {
    /// The name used in job files and JSON.
    pub fn name(self) -> &'static str {
        match self {
            System::Metric => "metric",
            System::Awg => "awg",
            System::Swg => "swg",
        }
    }
}

/// Enamel grade: 1 (thin; AWG single build) or 2 (medium; AWG heavy build).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub enum Grade {
    /// Grade 1 / single build.
    One,
    /// Grade 2 / heavy build.
    Two,
}

impl Grade {
    /// Label for a system: `grade 2` for metric, `heavy build` for AWG.
    pub fn label(self, system: System) -> &'static str {
        match (self, system) {
            (Grade::One, System::Metric | System::Swg) => "grade 1",
            (Grade::Two, System::Metric | System::Swg) => "grade 2",
            (Grade::One, System::Awg) => "single build",
            (Grade::Two, System::Awg) => "heavy build",
        }
    }
}

/// One round wire size.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct RoundSize {
    /// The system.
    pub system: System,
    /// Its label: `"1.60"` (metric, mm) or `"14"` (AWG).
    pub size: String,
    /// Bare copper diameter, mm.
    pub bare_mm: f64,
    /// Maximum overall diameter with enamel, mm.
    pub overall_mm: f64,
    /// Copper area, mm².
    pub area_mm2: f64,
}

/// A conductor as wound: round wire or strip.
#[derive(Debug, Clone, PartialEq)]
pub enum Conductor {
    /// Round enamelled wire: a row of the embedded tables.
    Round(&'static RoundSize),
    /// Rectangular strip: width along the traverse, thickness in the build direction.
    Strip {
        /// Bare width, mm.
        width_mm: f64,
        /// Bare thickness, mm.
        thickness_mm: f64,
        /// Insulation added to each dimension, mm.
        insulation_mm: f64,
    },
    /// An enamelled round wire measured with a micrometer (any diameter): its overall diameter from
    /// the enamel grade, interpolated (`overall_for_bare_mm`).
    Measured {
        /// Bare diameter, mm.
        bare_mm: f64,
        /// Overall diameter, mm (interpolated).
        overall_mm: f64,
    },
    /// Stranded, insulated cable: resistance from its copper cross-section, layout from its outer
    /// diameter.
    Cable {
        /// Copper cross-section, mm².
        area_mm2: f64,
        /// Outer diameter over the insulation, mm.
        od_mm: f64,
    },
    /// A donor's own winding left on the core: nobody chose its wire. Its copper area comes from
    /// its measured resistance, else from its measured build, else from its current at the job's
    /// current density (an estimate, labelled so); its round-wire diameter follows from the area.
    Kept {
        /// Copper area, mm².
        area_mm2: f64,
        /// Diameter with enamel, mm.
        overall_mm: f64,
        /// Where the area comes from.
        source: KeptCopper,
    },
}

/// Where a kept winding's copper area comes from.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum KeptCopper {
    /// Its measured resistance, over its length.
    Resistance,
    /// Its measured build (McLyman's S1·S2 copper fraction of the winding's cross-section).
    Build,
    /// Its current at the job's current density (nothing measured).
    Current,
}

/// Copper over the cross-section of a layer-wound round-wire winding: McLyman's S1·S2 (copper over
/// wire area about 0.85 for mid gauges, wire over winding area about 0.6 for round heavy-film wire).
pub const KEPT_COPPER_FRACTION: f64 = 0.85 * 0.6;

impl Conductor {
    /// A kept winding's conductor of copper area `area_mm2` (enamel taken as 7 % of the diameter,
    /// grade 2 at about 1 mm, IS 13730-0-1).
    pub fn kept(area_mm2: f64, source: KeptCopper) -> Conductor {
        let area = area_mm2.max(1e-6);
        Conductor::Kept {
            area_mm2: area,
            overall_mm: 1.07 * (4.0 * area / PI).sqrt(),
            source,
        }
    }

    /// Copper area of one strand, mm².
    pub fn area_mm2(&self) -> f64 {
        match self {
            Conductor::Round(r) => r.area_mm2,
            Conductor::Strip {
                width_mm,
                thickness_mm,
                ..
            } => width_mm * thickness_mm,
            Conductor::Kept { area_mm2, .. } => *area_mm2,
            Conductor::Measured { bare_mm, .. } => round_area_mm2(*bare_mm),
            Conductor::Cable { area_mm2, .. } => *area_mm2,
        }
    }
    /// The size along the traverse, with insulation, mm (what a turn takes on a layer).
    pub fn traverse_mm(&self) -> f64 {
        match self {
            Conductor::Round(r) => r.overall_mm,
            Conductor::Strip {
                width_mm,
                insulation_mm,
                ..
            } => width_mm + insulation_mm,
            Conductor::Kept { overall_mm, .. } | Conductor::Measured { overall_mm, .. } => {
                *overall_mm
            }
            Conductor::Cable { od_mm, .. } => *od_mm,
        }
    }
    /// The size in the build direction, with insulation, mm (what a layer adds).
    pub fn build_mm(&self) -> f64 {
        match self {
            Conductor::Round(r) => r.overall_mm,
            Conductor::Strip {
                thickness_mm,
                insulation_mm,
                ..
            } => thickness_mm + insulation_mm,
            Conductor::Kept { overall_mm, .. } | Conductor::Measured { overall_mm, .. } => {
                *overall_mm
            }
            Conductor::Cable { od_mm, .. } => *od_mm,
        }
    }
    /// The bare dimension in the build direction (diameter or thickness), mm.
    pub fn bare_mm(&self) -> f64 {
        match self {
            Conductor::Round(r) => r.bare_mm,
            Conductor::Strip { thickness_mm, .. } => *thickness_mm,
            Conductor::Kept { overall_mm, .. } => overall_mm / 1.07,
            Conductor::Measured { bare_mm, .. } => *bare_mm,
            Conductor::Cable { area_mm2, .. } => (4.0 * area_mm2 / PI).sqrt(),
        }
    }
    /// `metric`, `awg`, `strip` or `kept`.
    pub fn system_name(&self) -> &'static str {
        match self {
            Conductor::Round(r) => r.system.name(),
            Conductor::Strip { .. } => "strip",
            Conductor::Kept { .. } => "kept",
            Conductor::Measured { .. } => "measured",
            Conductor::Cable { .. } => "cable",
        }
    }
    /// The size label: `1.60`, `14`, or `10.0x1.00` for strip.
    pub fn size_label(&self) -> String {
        match self {
            Conductor::Round(r) => r.size.clone(),
            Conductor::Strip {
                width_mm,
                thickness_mm,
                ..
            } => format!("{width_mm:.1}x{thickness_mm:.2}"),
            Conductor::Kept { .. } => "kept".to_string(),
            Conductor::Measured { bare_mm, .. } => format_metric(*bare_mm),
            Conductor::Cable { area_mm2, .. } => format!("{area_mm2}"),
        }
    }
    /// A person's description: `1.60 mm`, `AWG 14`, `strip 10.0 x 1.00 mm`.
    pub fn describe(&self) -> String {
        match self {
            Conductor::Round(r) if r.system == System::Metric => format!("{} mm", r.size),
            Conductor::Round(r) if r.system == System::Swg => format!("SWG {}", r.size),
            Conductor::Round(r) => format!("AWG {}", r.size),
            Conductor::Strip {
                width_mm,
                thickness_mm,
                ..
            } => {
                format!("strip {width_mm:.1} x {thickness_mm:.2} mm")
            }
            Conductor::Kept { .. } => "kept".to_string(),
            Conductor::Measured { bare_mm, .. } => {
                format!("{} mm (measured)", format_metric(*bare_mm))
            }
            Conductor::Cable { area_mm2, od_mm } => {
                format!("cable {area_mm2} mm² ({od_mm:.1} mm over insulation)")
            }
        }
    }
}

/// AWG diameter by the ASTM B258 formula, mm.
pub fn awg_diameter_mm(gauge: f64) -> f64 {
    0.127 * 92f64.powf((36.0 - gauge) / 39.0)
}

/// The AWG gauge whose area is nearest (on a log scale) to `area_mm2`, for display.
pub fn nearest_awg(area_mm2: f64) -> u32 {
    // Area ∝ 92^(−2(n − 36)/39): n = 36 − 19.5 · log92(A / A36).
    let a36 = round_area_mm2(awg_diameter_mm(36.0));
    let n = 36.0 - 19.5 * (area_mm2 / a36).ln() / 92f64.ln();
    n.round().clamp(0.0, 50.0) as u32
}

/// Area of a round conductor of diameter `d_mm`, mm².
pub fn round_area_mm2(d_mm: f64) -> f64 {
    PI / 4.0 * d_mm * d_mm
}

/// All sizes of a system with the overall diameter of a grade, thinnest first (built once).
pub fn sizes(system: System, grade: Grade) -> &'static [RoundSize] {
    static CELLS: [OnceLock<Vec<RoundSize>>; 6] = [
        OnceLock::new(),
        OnceLock::new(),
        OnceLock::new(),
        OnceLock::new(),
        OnceLock::new(),
        OnceLock::new(),
    ];
    let k = match (system, grade) {
        (System::Metric, Grade::One) => 0,
        (System::Metric, Grade::Two) => 1,
        (System::Awg, Grade::One) => 2,
        (System::Awg, Grade::Two) => 3,
        (System::Swg, Grade::One) => 4,
        (System::Swg, Grade::Two) => 5,
    };
    CELLS[k].get_or_init(|| build_sizes(system, grade))
}

fn build_sizes(system: System, grade: Grade) -> Vec<RoundSize> {
    match system {
        System::Metric => data::metric()
            .iter()
            .map(|r| RoundSize {
                system,
                size: format_metric(r.nominal_mm),
                bare_mm: r.nominal_mm,
                overall_mm: if grade == Grade::One {
                    r.grade1_max_mm
                } else {
                    r.grade2_max_mm
                },
                area_mm2: round_area_mm2(r.nominal_mm),
            })
            .collect(),
        System::Awg => gauge_sizes(
            system,
            grade,
            data::awg()
                .iter()
                .map(|r| (r.gauge, r.bare_mm, r.grade1_max_mm, r.grade2_max_mm)),
        ),
        System::Swg => gauge_sizes(
            system,
            grade,
            data::swg()
                .iter()
                .map(|r| (r.gauge, r.bare_mm, r.grade1_max_mm, r.grade2_max_mm)),
        ),
    }
}

/// A gauge table's sizes, thinnest first: rows (gauge, bare, grade 1 and grade 2 overall, mm) come
/// thickest first, as gauges count up.
fn gauge_sizes(
    system: System,
    grade: Grade,
    rows: impl DoubleEndedIterator<Item = (u32, f64, f64, f64)>,
) -> Vec<RoundSize> {
    rows.rev()
        .map(|(gauge, bare, g1, g2)| RoundSize {
            system,
            size: gauge.to_string(),
            bare_mm: bare,
            overall_mm: if grade == Grade::One { g1 } else { g2 },
            area_mm2: round_area_mm2(bare),
        })
        .collect()
}

/// The overall diameter of an enamelled round wire of bare diameter `d_mm` (measured with a
/// micrometer): the metric table's enamel increase of the grade (IEC 60317-0-1 via IS 13730-0-1),
/// interpolated linearly in diameter, held at the table's ends.
pub fn overall_for_bare_mm(d_mm: f64, grade: Grade) -> f64 {
    let rows = sizes(System::Metric, grade);
    let inc = |r: &RoundSize| r.overall_mm - r.bare_mm;
    let (Some(first), Some(last)) = (rows.first(), rows.last()) else {
        return d_mm * 1.07;
    };
    if d_mm <= first.bare_mm {
        return d_mm + inc(first);
    }
    if d_mm >= last.bare_mm {
        return d_mm + inc(last);
    }
    for pair in rows.windows(2) {
        let (a, b) = (&pair[0], &pair[1]);
        if d_mm <= b.bare_mm {
            let t = (d_mm - a.bare_mm) / (b.bare_mm - a.bare_mm);
            return d_mm + inc(a) + t * (inc(b) - inc(a));
        }
    }
    d_mm + inc(last)
}

fn format_metric(d: f64) -> String {
    if d < 1.0 {
        format!("{d:.3}")
    } else {
        format!("{d:.2}")
    }
}

/// Finds a size by its label: `"1.60"`, `"1.6"`, `"1.6 mm"`, `"AWG 14"`, `"14 AWG"`, `"#14"`.
pub fn find_size(label: &str, grade: Grade) -> Result<&'static RoundSize, String> {
    let t = label.trim().to_ascii_lowercase();
    let awg_part = t
        .strip_prefix("awg")
        .or_else(|| t.strip_suffix("awg"))
        .or_else(|| t.strip_prefix('#'))
        .map(str::trim);
    if let Some(g) = awg_part {
        let gauge: u32 = g.parse().map_err(|_| {
            format!("`{label}`: expected an AWG gauge from 4 to 40, like \"AWG 14\"")
        })?;
        return sizes(System::Awg, grade)
            .iter()
            .find(|s| s.size == gauge.to_string())
            .ok_or_else(|| format!("AWG {gauge} is not in the table (AWG 4 to 40)"));
    }
    let swg_part = t
        .strip_prefix("swg")
        .or_else(|| t.strip_suffix("swg"))
        .map(str::trim);
    if let Some(g) = swg_part {
        let gauge: u32 = g.parse().map_err(|_| {
            format!("`{label}`: expected an SWG gauge from 4 to 40, like \"SWG 18\"")
        })?;
        return sizes(System::Swg, grade)
            .iter()
            .find(|s| s.size == gauge.to_string())
            .ok_or_else(|| format!("SWG {gauge} is not in the table (SWG 4 to 40, BS 3737)"));
    }
    let d: f64 = t.trim_end_matches("mm").trim().parse().map_err(|_| {
        format!(
            "`{label}`: expected a metric diameter like \"1.60\", an AWG size like \"AWG 14\" or an SWG size like \"SWG 18\""
        )
    })?;
    sizes(System::Metric, grade)
        .iter()
        .find(|s| (s.bare_mm - d).abs() < 1e-6)
        .ok_or_else(|| {
            format!("{d} mm is not an ISO 3 R20 nominal diameter from 0.100 to 4.00 mm (e.g. 1.50 is not; 1.40 and 1.60 are)")
        })
}

/// What the job asks of a winding's conductor.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct WireRequest {
    /// A forced round size.
    pub size: Option<&'static RoundSize>,
    /// A forced strand count.
    pub strands: Option<u32>,
    /// A strip conductor (width, thickness) in mm.
    pub strip_mm: Option<(f64, f64)>,
    /// A round wire measured with a micrometer, bare diameter in mm.
    pub bare_mm: Option<f64>,
    /// Stranded insulated cable: copper cross-section mm², outer diameter mm.
    pub cable: Option<(f64, f64)>,
}

/// A chosen conductor and strand count.
#[derive(Debug, Clone, PartialEq)]
pub struct WireChoice {
    /// The conductor of one strand.
    pub conductor: Conductor,
    /// Strands in hand.
    pub strands: u32,
}

impl WireRequest {
    /// Whether the job gives the conductor (a size, strip, measured wire or cable).
    pub fn given(&self) -> bool {
        self.size.is_some()
            || self.strip_mm.is_some()
            || self.bare_mm.is_some()
            || self.cable.is_some()
    }
}

impl WireChoice {
    /// Total copper area, mm².
    pub fn area_mm2(&self) -> f64 {
        self.conductor.area_mm2() * self.strands as f64
    }
}

/// Default insulation added to a strip conductor's width and thickness, mm (paper or enamel wrap;
/// common practice).
pub const STRIP_INSULATION_MM: f64 = 0.1;

/// Chooses a conductor for `amps` at current density `j_a_mm2`.
pub fn choose(
    amps: f64,
    j_a_mm2: f64,
    system: System,
    grade: Grade,
    max_strand_mm: f64,
    req: &WireRequest,
) -> WireChoice {
    let need = (amps / j_a_mm2).max(0.0);
    if let Some((area, od)) = req.cable {
        // A cable is the job's own choice, one run unless `strands` says more: welders and battery
        // leads run it far above a magnet wire's current density, and heating judges it.
        let strands = req.strands.unwrap_or(1);
        return WireChoice {
            conductor: Conductor::Cable {
                area_mm2: area,
                od_mm: od,
            },
            strands,
        };
    }
    if let Some(d) = req.bare_mm {
        let area = round_area_mm2(d);
        let strands = req
            .strands
            .unwrap_or_else(|| ((need / area - 1e-9).ceil() as u32).max(1));
        return WireChoice {
            conductor: Conductor::Measured {
                bare_mm: d,
                overall_mm: overall_for_bare_mm(d, grade),
            },
            strands,
        };
    }
    if let Some((w, t)) = req.strip_mm {
        let area = w * t;
        let strands = req
            .strands
            .unwrap_or_else(|| ((need / area).ceil() as u32).max(1));
        return WireChoice {
            conductor: Conductor::Strip {
                width_mm: w,
                thickness_mm: t,
                insulation_mm: STRIP_INSULATION_MM,
            },
            strands,
        };
    }
    if let Some(size) = req.size {
        let strands = req
            .strands
            .unwrap_or_else(|| ((need / size.area_mm2 - 1e-9).ceil() as u32).max(1));
        return WireChoice {
            conductor: Conductor::Round(size),
            strands,
        };
    }
    let table = sizes(system, grade);
    let strands = req.strands.unwrap_or_else(|| {
        (need / round_area_mm2(max_strand_mm) - 1e-9)
            .ceil()
            .clamp(1.0, 10_000.0) as u32
    });
    let per = need / strands as f64;
    let size = table
        .iter()
        .find(|s| s.area_mm2 >= per * (1.0 - 1e-12))
        .or_else(|| table.last());
    match size {
        Some(size) => {
            // The thickest size falls short only with forced strands: add strands to carry it.
            let strands = if size.area_mm2 * strands as f64 >= need * (1.0 - 1e-12) {
                strands
            } else {
                ((need / size.area_mm2).ceil() as u32).max(strands)
            };
            WireChoice {
                conductor: Conductor::Round(size),
                strands,
            }
        }
        None => WireChoice {
            conductor: Conductor::Strip {
                width_mm: 1.0,
                thickness_mm: 1.0,
                insulation_mm: STRIP_INSULATION_MM,
            },
            strands: 1,
        },
    }
}

/// One row of a wire table as `ironwind wire --list` shows it.
#[derive(Debug, Clone, PartialEq)]
pub struct TableRow {
    /// The size.
    pub size: &'static RoundSize,
    /// Resistance per metre at 20 °C (IEC 60028), Ω/m.
    pub ohm_per_m_20c: f64,
    /// Current at 3 A/mm², A.
    pub amps_at_3_a_mm2: f64,
}

/// A size and strands chosen for a current.
#[derive(Debug, Clone, PartialEq)]
pub struct ChoiceReport {
    /// Current to carry, A.
    pub amps: f64,
    /// The current density asked for, A/mm².
    pub density_limit_a_mm2: f64,
    /// The enamel grade.
    pub grade: Grade,
    /// The system.
    pub system: System,
    /// The wire.
    pub choice: WireChoice,
    /// Current density reached, A/mm².
    pub current_density_a_mm2: f64,
    /// The same as circular mils per ampere.
    pub cmil_per_a: f64,
}

/// What `ironwind wire` reports: a whole table, or a choice for a current.
#[derive(Debug, Clone, PartialEq)]
pub enum WireReport {
    /// The table of a system and grade.
    Table {
        /// The system.
        system: System,
        /// The enamel grade.
        grade: Grade,
        /// Its rows, thinnest first.
        rows: Vec<TableRow>,
    },
    /// A choice.
    Choice(ChoiceReport),
}

/// The table of a system and grade.
pub fn table_report(system: System, grade: Grade) -> WireReport {
    WireReport::Table {
        system,
        grade,
        rows: sizes(system, grade)
            .iter()
            .map(|r| TableRow {
                size: r,
                ohm_per_m_20c: crate::losses::resistance_ohm(1.0, r.area_mm2, 20.0),
                amps_at_3_a_mm2: 3.0 * r.area_mm2,
            })
            .collect(),
    }
}

/// The wire chosen for a current at a current density, by the plan's own rule.
pub fn choice_report(
    amps: f64,
    density: f64,
    system: System,
    grade: Grade,
    max_strand_mm: f64,
) -> WireReport {
    let choice = choose(
        amps,
        density,
        system,
        grade,
        max_strand_mm,
        &WireRequest::default(),
    );
    let area = choice.area_mm2();
    WireReport::Choice(ChoiceReport {
        amps,
        density_limit_a_mm2: density,
        grade,
        system,
        current_density_a_mm2: amps / area,
        cmil_per_a: area / MM2_PER_CMIL / amps,
        choice,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    /// Check values quote diameters to 0.001 mm: half a unit of that digit, plus float slack.
    const HALF_LAST_DIGIT: f64 = 0.0005 + 1e-9;
    /// NEMA tables in mils to 0.1 mil: half a tenth of a mil on ~10–70 mils.
    const MIL_TENTH: f64 = 0.0026;

    #[track_caller]
    fn awg_case(gauge: u32, d_mm: f64, area_mm2: f64) {
        let row = data::awg()
            .iter()
            .find(|r| r.gauge == gauge)
            .expect("gauge in table");
        // Quoted to 0.001 mm (0.0001 mm for AWG 40): half a unit of the last digit.
        assert_relative_eq!(row.bare_mm, d_mm, epsilon = HALF_LAST_DIGIT);
        assert_relative_eq!(
            awg_diameter_mm(gauge as f64),
            d_mm,
            epsilon = HALF_LAST_DIGIT
        );
        let a = round_area_mm2(row.bare_mm);
        // Areas are given to 4 significant figures except AWG 36/40, given to 3 and 2.
        let tol = if area_mm2 < 0.02 { 0.01 } else { 0.002 };
        assert_relative_eq!(a, area_mm2, max_relative = tol);
    }

    #[test]
    fn awg_against_astm_b258() {
        // ASTM B258 formula values [C], REFERENCES.md.
        awg_case(4, 5.189, 21.15);
        awg_case(8, 3.264, 8.366);
        awg_case(10, 2.588, 5.261);
        awg_case(12, 2.053, 3.309);
        awg_case(14, 1.628, 2.081);
        awg_case(16, 1.291, 1.309);
        awg_case(18, 1.024, 0.823);
        awg_case(20, 0.812, 0.518);
        awg_case(22, 0.644, 0.326);
        awg_case(24, 0.511, 0.205);
        awg_case(26, 0.405, 0.129);
        awg_case(28, 0.321, 0.081);
        awg_case(30, 0.255, 0.051);
        awg_case(36, 0.127, 0.0127);
        awg_case(40, 0.0799, 0.0050);
    }

    #[test]
    fn awg_rules_of_six_three_and_ten() {
        // ASTM B258 (REFERENCES.md): six gauges double the diameter, three double the area, ten give
        // a tenth of the area (each within 1 %: the rules are approximations of 92^(1/39)).
        assert_relative_eq!(
            awg_diameter_mm(14.0) / awg_diameter_mm(20.0),
            2.0,
            max_relative = 0.01
        );
        let ar = |a: f64, b: f64| {
            round_area_mm2(awg_diameter_mm(a)) / round_area_mm2(awg_diameter_mm(b))
        };
        assert_relative_eq!(ar(17.0, 20.0), 2.0, max_relative = 0.01);
        assert_relative_eq!(ar(30.0, 20.0), 0.1, max_relative = 0.03);
    }

    #[test]
    fn awg_22_is_0_0253_inch_not_0_0254() {
        // REFERENCES.md trap: ASTM rounding gives 0.0253 in for AWG 22.
        let d_in = awg_diameter_mm(22.0) / 25.4;
        assert_eq!((d_in * 10_000.0).round() as i64, 253);
    }

    #[test]
    fn single_build_overall_diameters_nema_mw1000() {
        // NEMA MW 1000 single build max OD, mils [S] (REFERENCES.md).
        for (g, mils) in [
            (14, 66.6),
            (16, 53.1),
            (18, 42.4),
            (20, 33.9),
            (22, 27.0),
            (24, 21.7),
            (26, 17.3),
            (28, 14.0),
            (30, 11.2),
            (32, 9.1),
            (36, 5.8),
            (40, 3.7),
        ] {
            let row = data::awg().iter().find(|r| r.gauge == g).expect("gauge");
            assert_relative_eq!(row.grade1_max_mm, mils * 0.0254, max_relative = MIL_TENTH);
        }
    }

    #[test]
    fn heavy_build_exceeds_bare_by_nema_minimum() {
        // NEMA MW 1000 heavy build minimum increase over bare, mils [S]; the table's maximum OD
        // (from memory [M] for 14–30) must be at least bare + that increase.
        for (g, inc) in [
            (14, 3.2),
            (16, 2.9),
            (18, 2.6),
            (20, 2.3),
            (22, 2.1),
            (24, 1.9),
            (26, 1.7),
            (28, 1.6),
            (30, 1.4),
        ] {
            let row = data::awg().iter().find(|r| r.gauge == g).expect("gauge");
            assert!(row.grade2_max_mm >= row.bare_mm + inc * 0.0254, "AWG {g}");
        }
        // Heavy-build max OD from memory (REFERENCES.md [M]), inches: AWG 14 0.0682, 20 0.0346.
        let r14 = data::awg().iter().find(|r| r.gauge == 14).expect("14");
        assert_relative_eq!(r14.grade2_max_mm, 0.0682 * 25.4, max_relative = 0.002);
    }

    #[test]
    fn metric_overall_diameters_is_13730() {
        // IS 13730-0-1 (IEC 60317-0-1) max OD [S] at R20 sizes it lists; grade 2 interpolated at
        // 0.50, 1.00, 2.00 [C] (REFERENCES.md), within the 3rd decimal.
        let find = |d: f64| {
            sizes(System::Metric, Grade::Two)
                .iter()
                .find(|s| (s.bare_mm - d).abs() < 1e-9)
                .expect("size")
        };
        let find1 = |d: f64| {
            sizes(System::Metric, Grade::One)
                .iter()
                .find(|s| (s.bare_mm - d).abs() < 1e-9)
                .expect("size")
        };
        assert_relative_eq!(find(0.100).overall_mm, 0.125, epsilon = 1e-9);
        assert_relative_eq!(find1(0.100).overall_mm, 0.117, epsilon = 1e-9);
        assert_relative_eq!(find(0.125).overall_mm, 0.154, epsilon = 1e-9);
        assert_relative_eq!(find(0.160).overall_mm, 0.194, epsilon = 1e-9);
        assert_relative_eq!(find(0.50).overall_mm, 0.569, epsilon = 0.0015);
        assert_relative_eq!(find(1.00).overall_mm, 1.095, epsilon = 0.0025);
        assert_relative_eq!(find(2.00).overall_mm, 2.114, epsilon = 0.0015);
    }

    #[test]
    fn metric_nominals_are_iso_3_r20() {
        // ISO 3 R20 preferred numbers 10^(k/20), rounded as the standard lists them (REFERENCES.md).
        let listed = [
            0.100, 0.112, 0.125, 0.140, 0.160, 0.180, 0.200, 0.224, 0.250, 0.280, 0.315, 0.355,
            0.400, 0.450, 0.500, 0.560, 0.630, 0.710, 0.800, 0.900, 1.00, 1.12, 1.25, 1.40, 1.60,
            1.80, 2.00, 2.24, 2.50, 2.80, 3.15, 3.55, 4.00,
        ];
        let table: Vec<f64> = data::metric().iter().map(|r| r.nominal_mm).collect();
        assert_eq!(table, listed.to_vec());
        for (k, d) in listed.iter().enumerate() {
            // Each listed value is within 1.3 % of the exact series (ISO 3 rounding).
            assert_relative_eq!(*d, 0.1 * 10f64.powf(k as f64 / 20.0), max_relative = 0.013);
        }
    }

    #[test]
    fn circular_mils_conversions() {
        // 1 cmil = 5.067e-4 mm² [S]; 1 A/mm² = 1973.5 cmil/A [C]; 700 cmil/A ≈ 2.82 A/mm² [C].
        assert_relative_eq!(MM2_PER_CMIL, 5.067e-4, max_relative = 1e-4);
        assert_relative_eq!(CMIL_PER_A_AT_1_A_MM2, 1973.5, max_relative = 1e-4);
        assert_relative_eq!(CMIL_PER_A_AT_1_A_MM2 / 700.0, 2.82, max_relative = 0.001);
    }

    #[test]
    fn choice_by_design_rule() {
        // 12 A at 3 A/mm² needs 4 mm²; one 2.0 mm strand is 3.14 mm² → 2 strands of ≥ 2 mm² → 1.60 mm.
        let c = choose(
            12.0,
            3.0,
            System::Metric,
            Grade::Two,
            2.0,
            &WireRequest::default(),
        );
        assert_eq!(c.strands, 2);
        assert_eq!(c.conductor.size_label(), "1.60");
        // 2 A at 3 A/mm²: 0.667 mm² → 1 strand of 1.00 mm (0.785 mm²); 0.90 (0.636) is too thin.
        let c = choose(
            2.0,
            3.0,
            System::Metric,
            Grade::Two,
            2.0,
            &WireRequest::default(),
        );
        assert_eq!(
            (c.strands, c.conductor.size_label()),
            (1, "1.00".to_string())
        );
        // AWG: 5 A at 3 A/mm² = 1.667 mm² → AWG 15 (1.650 mm²) is short, AWG 14 (2.081) carries it.
        let c = choose(
            5.0,
            3.0,
            System::Awg,
            Grade::Two,
            2.0,
            &WireRequest::default(),
        );
        assert_eq!(c.conductor.size_label(), "14");
    }

    #[test]
    fn forced_size_and_strands() {
        let size = find_size("AWG 18", Grade::Two).expect("size");
        let req = WireRequest {
            size: Some(size),
            ..Default::default()
        };
        let c = choose(5.0, 3.0, System::Metric, Grade::Two, 2.0, &req);
        assert_eq!(c.strands, 3); // 1.667 / 0.823 → 3
        let req = WireRequest {
            strands: Some(4),
            ..Default::default()
        };
        let c = choose(12.0, 3.0, System::Metric, Grade::Two, 2.0, &req);
        assert_eq!(
            (c.strands, c.conductor.size_label()),
            (4, "1.25".to_string())
        );
        assert!(find_size("1.50", Grade::Two).is_err());
        assert_eq!(find_size("1.6 mm", Grade::Two).expect("1.6").size, "1.60");
        assert_eq!(find_size("14 awg", Grade::One).expect("14").size, "14");
    }
}
