//! `ironwind wire`: a wire table, or the size and strands chosen for a current, as text or JSON.

use super::{num, pairs, sig3, table, Format, Look, Units};
use crate::wire::{ChoiceReport, WireReport};
use serde::Serialize;
use std::io::Write;

#[derive(Serialize)]
struct ChoiceJson {
    amps: f64,
    density_limit_a_mm2: f64,
    system: &'static str,
    size: String,
    strands: u32,
    bare_mm: f64,
    overall_mm: f64,
    area_mm2: f64,
    current_density_a_mm2: f64,
    cmil_per_a: f64,
}

/// Writes the report in a format: text or JSON.
pub fn write(
    out: &mut dyn Write,
    r: &WireReport,
    format: Format,
    look: &Look,
) -> std::io::Result<()> {
    match (r, format) {
        (WireReport::Table { rows, .. }, Format::Json) => {
            let sizes: Vec<&crate::wire::RoundSize> = rows.iter().map(|r| r.size).collect();
            super::json::write_json(out, &sizes)
        }
        (WireReport::Table { .. }, _) => writeln!(out, "{}", look.finish(table_text(r, look))),
        (WireReport::Choice(c), Format::Json) => super::json::write_json(out, &choice_json(c)),
        (WireReport::Choice(c), _) => writeln!(out, "{}", look.finish(choice_text(c, look))),
    }
}

fn table_text(r: &WireReport, look: &Look) -> String {
    let WireReport::Table {
        system,
        grade,
        rows,
    } = r
    else {
        return String::new();
    };
    let imperial = look.units == Units::Imperial;
    let mut t = vec![vec![
        match system {
            crate::wire::System::Awg => "AWG".to_string(),
            crate::wire::System::Swg => "SWG".to_string(),
            crate::wire::System::Metric => "nominal mm".to_string(),
        },
        "bare mm".into(),
        format!("overall mm ({})", grade.label(*system)),
        "area mm²".into(),
        "Ω/m at 20 °C".into(),
        "A at 3 A/mm²".into(),
    ]];
    if imperial {
        t[0].insert(2, "bare in".into());
        t[0].push("cmil".into());
    }
    for cell in t[0].iter_mut() {
        *cell = look.heading(cell);
    }
    for r in rows {
        let mut row = vec![
            r.size.size.clone(),
            num(r.size.bare_mm, 4),
            num(r.size.overall_mm, 3),
            sig3(r.size.area_mm2),
            sig3(r.ohm_per_m_20c),
            sig3(r.amps_at_3_a_mm2),
        ];
        if imperial {
            row.insert(2, num(r.size.bare_mm / crate::units::MM_PER_INCH, 4));
            row.push(num(r.size.area_mm2 / crate::wire::MM2_PER_CMIL, 0));
        }
        t.push(row);
    }
    table(t, 1, look)
}

fn choice_json(c: &ChoiceReport) -> ChoiceJson {
    let k = &c.choice.conductor;
    ChoiceJson {
        amps: c.amps,
        density_limit_a_mm2: c.density_limit_a_mm2,
        system: k.system_name(),
        size: k.size_label(),
        strands: c.choice.strands,
        bare_mm: k.bare_mm(),
        overall_mm: k.build_mm(),
        area_mm2: c.choice.area_mm2(),
        current_density_a_mm2: c.current_density_a_mm2,
        cmil_per_a: c.cmil_per_a,
    }
}

fn choice_text(c: &ChoiceReport, look: &Look) -> String {
    let k = &c.choice.conductor;
    let area = c.choice.area_mm2();
    pairs(
        &[
            (
                "current",
                format!(
                    "{} A at ≤ {} A/mm²",
                    num(c.amps, 2),
                    num(c.density_limit_a_mm2, 2)
                ),
            ),
            (
                "wire",
                format!(
                    "{} ({})",
                    look.heading(&super::plan::wire_label(k, look)),
                    c.grade.label(c.system)
                ),
            ),
            ("strands in hand", c.choice.strands.to_string()),
            ("overall diameter", look.mm(k.build_mm(), 3)),
            ("copper area", format!("{} in all", look.mm2(area, 3))),
            (
                "current density",
                format!(
                    "{} A/mm² ({} cmil/A)",
                    num(c.current_density_a_mm2, 2),
                    num(c.cmil_per_a, 0)
                ),
            ),
        ],
        look,
    )
}
