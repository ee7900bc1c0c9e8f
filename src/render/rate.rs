//! `ironwind rate`: the capacity of a core, its verdict against a target and what would change it,
//! as text, JSON and an SVG chart of capacity against flux.

use super::{num, pairs, sig3, table, words, Format, Look};
use crate::capacity::Capacity;
use crate::rate::Rating;
use serde::Serialize;
use std::io::Write;

#[derive(Serialize)]
struct VerdictJson {
    ok: bool,
    margin_pct: f64,
    target_va: f64,
}

#[derive(Serialize)]
struct OptionJson {
    change: String,
    max_va: f64,
}

#[derive(Serialize)]
struct RateJson<'a> {
    name: &'a str,
    capacity: &'a Capacity,
    verdict: Option<VerdictJson>,
    options: Vec<OptionJson>,
    duty: f64,
    notes: Vec<String>,
    cautions: &'a [&'a str],
}

/// Writes the rating in a format: text or JSON.
pub fn write(out: &mut dyn Write, r: &Rating, format: Format, look: &Look) -> std::io::Result<()> {
    if format != Format::Json {
        return write!(out, "{}", look.finish(rate_text(r, look)));
    }
    super::json::write_json(
        out,
        &RateJson {
            name: &r.name,
            capacity: &r.capacity,
            verdict: r.verdict.as_ref().map(|v| VerdictJson {
                ok: v.ok,
                margin_pct: v.margin_pct,
                target_va: v.target_va,
            }),
            options: r
                .options
                .iter()
                .map(|o| OptionJson {
                    change: words::change(&o.change),
                    max_va: o.max_va,
                })
                .collect(),
            duty: r.duty,
            notes: r.notes.iter().map(words::rate_note).collect(),
            cautions: r.cautions,
        },
    )
}

fn capacity_pairs(c: &Capacity, look: &Look) -> String {
    pairs(
        &[
            (
                "capacity",
                format!(
                    "{} VA ({})",
                    num(c.max_va, 0),
                    if c.method == "scan" {
                        "dense scan"
                    } else {
                        "search"
                    }
                ),
            ),
            ("limit that binds", words::limit(c.limit).to_string()),
            (
                "at capacity",
                format!(
                    "rise {} °C, copper fill {}, {}, efficiency {} %",
                    num(c.rise_c, 1),
                    num(c.copper_fill, 2),
                    look.density(c.current_density_a_mm2),
                    num(c.efficiency * 100.0, 1)
                ),
            ),
            ("flux density", format!("{} T", num(c.flux_density_t, 3))),
            (
                "area-product estimate",
                format!(
                    "{} VA (McLyman, Ku 0.4, J from Kj)",
                    num(c.area_product_va, 0)
                ),
            ),
            (
                "rule of thumb",
                format!(
                    "{} VA (Ae in cm² ≈ √VA, common practice)",
                    num(c.rule_of_thumb_va, 0)
                ),
            ),
            ("plans evaluated", c.plans_evaluated.to_string()),
        ],
        look,
    )
}

/// The rating as text.
pub fn rate_text(r: &Rating, look: &Look) -> String {
    let c = &r.capacity;
    let mut s = format!(
        "{}\n\n",
        look.heading(&format!("ironwind rate: {}", r.name))
    );
    s += &capacity_pairs(c, look);
    if !c.wires.is_empty() {
        s += "\nWire at capacity\n";
        let mut rows = vec![vec![
            "winding".to_string(),
            "amps".into(),
            "turns".into(),
            "wire".into(),
            "strands".into(),
        ]];
        for w in &c.wires {
            rows.push(vec![
                w.name.clone(),
                sig3(w.amps),
                w.turns.to_string(),
                match look.units {
                    super::Units::Metric => w.wire.clone(),
                    super::Units::Imperial => super::plan::wire_label(&w.conductor, look),
                },
                w.strands.to_string(),
            ]);
        }
        s += &table(rows, 1, look);
    }
    if let Some(v) = &r.verdict {
        s += &format!(
            "\nTarget {} VA: {} (margin {} %)\n",
            num(v.target_va, 0),
            look.mark(if v.ok { "CARRIES" } else { "DOES NOT CARRY" }, v.ok),
            num(v.margin_pct, 1)
        );
    }
    if !r.options.is_empty() {
        s += "\nWhat would change it\n";
        let mut rows = vec![vec!["change".to_string(), "capacity VA".into()]];
        for o in &r.options {
            rows.push(vec![words::change(&o.change), num(o.max_va, 0)]);
        }
        s += &table(rows, 1, look);
    }
    s += "\n";
    for n in r.notes.iter().filter(|_| !look.quiet) {
        s += &super::wrap(&words::rate_note(n), look.width, "note: ", "      ");
    }
    s += "\nCautions\n";
    for c in r.cautions {
        s += &super::wrap(c, look.width, "  * ", "    ");
    }
    s
}

/// Capacity and total loss against flux density as an SVG chart.
pub fn flux_chart(r: &Rating) -> String {
    use super::svg::{chart, Chart, Marker, Scale, Series};
    let (pts, b) = match &r.curve {
        Some(c) => (c.points.as_slice(), c.chosen_t),
        None => (&[][..], r.capacity.flux_density_t),
    };
    chart(&Chart {
        title: format!("Capacity and loss against flux density: {}", r.name),
        x_label: "peak flux density (T)".into(),
        y_label: "capacity (VA)".into(),
        y2_label: Some("total loss at capacity (W)".into()),
        y2_mirror: None,
        x_scale: Scale::Linear,
        y_scale: Scale::Linear,
        series: vec![
            Series {
                label: "capacity (VA, left)".into(),
                points: pts.iter().map(|p| (p.0, p.1)).collect(),
                dots: true,
                dash: "",
                colour: "#1f4e79",
                right_axis: false,
            },
            Series {
                label: "total loss (W, right)".into(),
                points: pts.iter().map(|p| (p.0, p.2)).collect(),
                dots: true,
                dash: "5 3",
                colour: "#7a4a12",
                right_axis: true,
            },
        ],
        markers: vec![Marker {
            x: b,
            horizontal: false,
            label: format!("chosen flux {b:.2} T"),
            dash: "2 2",
        }],
    })
}
