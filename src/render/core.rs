//! `ironwind core`: the geometry of a measured core, as text or JSON.

use super::{num, pairs, Format, Look, Units};
use crate::geometry::CoreReport;
use serde::Serialize;
use std::io::Write;

#[derive(Serialize)]
struct CoreJson<'a> {
    shape: &'a str,
    tongue_mm: f64,
    stack_mm: f64,
    window_width_mm: f64,
    window_height_mm: f64,
    stacking_factor: f64,
    #[serde(flatten)]
    geometry: &'a crate::geometry::CoreGeometry,
    rule_of_thumb_va: f64,
}

/// Two lengths as "a × b mm" (imperial: inches first, mm beside).
pub fn by(look: &Look, a: f64, b: f64, d: usize) -> String {
    let mm = format!("{} × {} mm", num(a, d), num(b, d));
    match look.units {
        Units::Metric => mm,
        Units::Imperial => {
            let i = |v: f64| num(v / crate::units::MM_PER_INCH, d + 2);
            format!("{} × {} in ({mm})", i(a), i(b))
        }
    }
}

/// Writes the report in a format: text or JSON.
pub fn write(
    out: &mut dyn Write,
    r: &CoreReport,
    format: Format,
    look: &Look,
) -> std::io::Result<()> {
    let d = &r.dims;
    let g = &r.geometry;
    if format == Format::Json {
        return super::json::write_json(
            out,
            &CoreJson {
                shape: d.shape.name(),
                tongue_mm: d.tongue_mm,
                stack_mm: d.stack_mm,
                window_width_mm: d.window_width_mm,
                window_height_mm: d.window_height_mm,
                stacking_factor: d.stacking_factor,
                geometry: g,
                rule_of_thumb_va: r.rule_of_thumb_va,
            },
        );
    }
    let metric = look.units == Units::Metric;
    let t = pairs(
        &[
            ("shape", d.shape.name().to_string()),
            ("tongue × stack", by(look, d.tongue_mm, d.stack_mm, 2)),
            (
                "window w × h",
                by(look, d.window_width_mm, d.window_height_mm, 2),
            ),
            ("stacking factor", num(d.stacking_factor, 3)),
            (
                "Ae gross",
                if metric {
                    format!(
                        "{} mm² ({} cm²)",
                        num(g.area_gross_mm2, 1),
                        num(g.area_gross_mm2 / 100.0, 2)
                    )
                } else {
                    look.mm2(g.area_gross_mm2, 1)
                },
            ),
            ("Ae net", look.mm2(g.area_net_mm2, 1)),
            ("Aw (one window)", look.mm2(g.window_area_mm2, 1)),
            (
                "area product Ap",
                if metric {
                    format!("{} cm⁴", num(g.area_product_cm4, 2))
                } else {
                    format!(
                        "{} in⁴ ({} cm⁴)",
                        num(g.area_product_cm4 / 41.623_142_56, 3),
                        num(g.area_product_cm4, 2)
                    )
                },
            ),
            ("path length le", look.mm(g.path_length_mm, 1)),
            (
                "outline",
                by(look, g.outline_width_mm, g.outline_height_mm, 1),
            ),
            (
                "core mass",
                format!("{} (from the outline, 7.65 g/cm³)", look.kg(g.mass_kg, 3)),
            ),
            (
                "rule of thumb",
                format!(
                    "about {} VA (Ae in cm² ≈ √VA; common practice, not a rating)",
                    num(r.rule_of_thumb_va, 0)
                ),
            ),
        ],
        look,
    );
    if look.quiet {
        return writeln!(out, "{}", look.finish(t));
    }
    writeln!(
        out,
        "{}\n{}",
        look.finish(t),
        look.heading("For a rating from losses and heating, use `ironwind rate`.")
    )
}
