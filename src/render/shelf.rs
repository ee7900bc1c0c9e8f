//! The shelf: the listing (`list`, `export`), one core (`show`), the ranking (`rank`) and the short
//! answers of `add`, `edit`, `remove` and `import`, as text, JSON or CSV.

use super::{core::by, num, pairs, table, visible, Format, Look, Units};
use crate::shelf::{export_csv, Entry, Listed, Listing, Ranking};
use serde::Serialize;
use std::io::Write;

#[derive(Serialize)]
struct CoreJson<'a> {
    id: u64,
    label: &'a str,
    shape: &'a str,
    tongue_mm: f64,
    stack_mm: f64,
    window_width_mm: f64,
    window_height_mm: f64,
    stacking_factor: f64,
    steel: &'a str,
    mass_g: Option<f64>,
    volts_per_turn: Option<f64>,
    notes: &'a str,
    added: &'a str,
    area_net_mm2: f64,
    window_area_mm2: f64,
    area_product_cm4: f64,
    mass_kg: f64,
    typed: &'a Entry,
}

fn core_json(c: &Listed) -> CoreJson<'_> {
    let (e, v, g) = (&c.entry, &c.values, &c.geometry);
    CoreJson {
        id: e.id,
        label: &e.label,
        shape: &e.shape,
        tongue_mm: v.dims.tongue_mm,
        stack_mm: v.dims.stack_mm,
        window_width_mm: v.dims.window_width_mm,
        window_height_mm: v.dims.window_height_mm,
        stacking_factor: v.dims.stacking_factor,
        steel: &e.steel,
        mass_g: v.dims.measured_mass_kg.map(|m| m * 1000.0),
        volts_per_turn: v.volts_per_turn,
        notes: &e.notes,
        added: &e.added,
        area_net_mm2: g.area_net_mm2,
        window_area_mm2: g.window_area_mm2,
        area_product_cm4: g.area_product_cm4,
        mass_kg: g.mass_kg,
        typed: e,
    }
}

/// `shelf list`: text, JSON (with the bad rows) or CSV (the shelf's own columns).
pub fn write_list(
    out: &mut dyn Write,
    l: &Listing,
    format: Format,
    look: &Look,
) -> std::io::Result<()> {
    match format {
        Format::Json => {
            let cores: Vec<CoreJson> = l.cores.iter().map(core_json).collect();
            super::json::write_json(
                out,
                &serde_json::json!({ "cores": cores, "bad_rows": l.bad }),
            )
        }
        Format::Csv => {
            let entries: Vec<Entry> = l.cores.iter().map(|c| c.entry.clone()).collect();
            out.write_all(export_csv(&entries).as_bytes())
        }
        _ => {
            let s = look.finish(list_text(l, look));
            writeln!(out, "{s}{} cores on {}", l.cores.len(), l.origin)
        }
    }
}

/// The header row of the text listing.
fn list_header(look: &Look) -> Vec<String> {
    let metric = look.units == Units::Metric;
    vec![
        "id".to_string(),
        "label".into(),
        "shape".into(),
        format!("tongue × stack {}", look.mm_unit()),
        format!("window {}", look.mm_unit()),
        if metric { "Ap cm⁴" } else { "Ap in⁴" }.into(),
        if metric { "mass kg" } else { "mass lb" }.into(),
        "V/turn".into(),
        "added".into(),
    ]
}

fn list_text(l: &Listing, look: &Look) -> String {
    let mut t = vec![list_header(look)];
    for cell in t[0].iter_mut() {
        *cell = look.heading(cell);
    }
    for c in &l.cores {
        t.push(list_cells(c, look));
    }
    table(t, 5, look)
}

/// One core's cells in the text listing.
pub fn list_cells(c: &Listed, look: &Look) -> Vec<String> {
    let metric = look.units == Units::Metric;
    {
        let (e, d, g) = (&c.entry, &c.values.dims, &c.geometry);
        let pair = |a: &str, b: &str, av: f64, bv: f64| {
            if metric {
                format!("{} × {}", visible(a), visible(b))
            } else {
                format!("{} × {}", look.mm_bare(av, 2), look.mm_bare(bv, 2))
            }
        };
        vec![
            e.id.to_string(),
            visible(&e.label),
            visible(&e.shape),
            pair(&e.tongue_mm, &e.stack_mm, d.tongue_mm, d.stack_mm),
            pair(
                &e.window_width_mm,
                &e.window_height_mm,
                d.window_width_mm,
                d.window_height_mm,
            ),
            if metric {
                num(g.area_product_cm4, 1)
            } else {
                num(g.area_product_cm4 / 41.623_142_56, 2)
            },
            if metric {
                num(g.mass_kg, 2)
            } else {
                num(g.mass_kg / 0.453_592_37, 2)
            },
            visible(&e.volts_per_turn),
            visible(&e.added),
        ]
    }
}

/// A listing written as it is read, for shelves too large to hold: column widths from a first
/// pass, then each row as it comes (text), or each core as one JSON object, or each CSV row.
pub struct ListStream {
    format: Format,
    widths: Vec<usize>,
    look: Look,
    first: bool,
}

/// The first pass of a streamed listing: column widths of the text table.
pub fn widths_of(widths: &mut Vec<usize>, cells: &[String]) {
    if widths.len() < cells.len() {
        widths.resize(cells.len(), 0);
    }
    for (w, c) in widths.iter_mut().zip(cells) {
        *w = (*w).max(c.chars().count());
    }
}

impl ListStream {
    /// A stream in `format` with the text widths of the first pass (header included).
    pub fn new(format: Format, mut widths: Vec<usize>, look: &Look) -> ListStream {
        widths_of(&mut widths, &list_header(look));
        ListStream {
            format,
            widths,
            look: *look,
            first: true,
        }
    }

    fn rule(&self, l: &str, m: &str, r: &str) -> String {
        let (l, m, r, h) = match self.look.charset {
            super::Charset::Unicode => (l, m, r, "─"),
            super::Charset::Ascii => ("+", "+", "+", "-"),
        };
        let parts: Vec<String> = self.widths.iter().map(|w| h.repeat(w + 2)).collect();
        format!("{l}{}{r}\n", parts.join(m))
    }

    fn line(&self, cells: &[String]) -> String {
        let v = if self.look.charset == super::Charset::Ascii {
            "|"
        } else {
            "│"
        };
        let mut line = String::with_capacity(160);
        line.push_str(v);
        for (k, (c, w)) in cells.iter().zip(&self.widths).enumerate() {
            let pad = w.saturating_sub(c.chars().count());
            line.push(' ');
            if k >= 5 {
                line.extend(std::iter::repeat_n(' ', pad));
                line.push_str(c);
            } else {
                line.push_str(c);
                line.extend(std::iter::repeat_n(' ', pad));
            }
            line.push(' ');
            line.push_str(v);
        }
        line.push('\n');
        line
    }

    /// The opening: the table's head, `{"cores": [`, or the CSV header.
    pub fn head(&mut self, out: &mut dyn Write) -> std::io::Result<()> {
        match self.format {
            Format::Json => out.write_all(b"{\n  \"cores\": ["),
            Format::Csv => out.write_all(export_csv(&[]).as_bytes()),
            _ => {
                let head: Vec<String> = list_header(&self.look)
                    .iter()
                    .map(|h| self.look.heading(h))
                    .collect();
                let mut s = self.rule("╭", "┬", "╮");
                s += &self.line(&head);
                s += &self.rule("├", "┼", "┤");
                out.write_all(self.look.finish(s).as_bytes())
            }
        }
    }

    /// One core.
    pub fn row(&mut self, out: &mut dyn Write, c: &Listed) -> std::io::Result<()> {
        let first = std::mem::replace(&mut self.first, false);
        match self.format {
            Format::Json => {
                let obj = serde_json::to_string(&core_json(c)).map_err(std::io::Error::other)?;
                write!(out, "{}\n    {obj}", if first { "" } else { "," })
            }
            Format::Csv => {
                let mut w = csv::WriterBuilder::new()
                    .has_headers(false)
                    .from_writer(&mut *out);
                crate::shelf::write_export_rows(&mut w, &c.entry).map_err(std::io::Error::other)?;
                w.flush()
            }
            _ => {
                let line = self.line(&list_cells(c, &self.look));
                out.write_all(self.look.finish(line).as_bytes())
            }
        }
    }

    /// The close: the table's foot and the count, or the bad rows of the JSON.
    pub fn tail(
        &mut self,
        out: &mut dyn Write,
        count: usize,
        origin: &str,
        bad: &[crate::shelf::BadRow],
    ) -> std::io::Result<()> {
        match self.format {
            Format::Json => {
                let bad = serde_json::to_string(bad).map_err(std::io::Error::other)?;
                write!(out, "\n  ],\n  \"bad_rows\": {bad}\n}}\n")
            }
            Format::Csv => Ok(()),
            _ => {
                let s = self.rule("╰", "┴", "╯");
                writeln!(out, "{}{count} cores on {origin}", self.look.finish(s))
            }
        }
    }
}

/// `shelf show`: one core, text or JSON.
pub fn write_show(
    out: &mut dyn Write,
    c: &Listed,
    format: Format,
    look: &Look,
) -> std::io::Result<()> {
    if format == Format::Json {
        return super::json::write_json(out, &core_json(c));
    }
    let (e, g, d) = (&c.entry, &c.geometry, &c.values.dims);
    let metric = look.units == Units::Metric;
    let s = pairs(
        &[
            ("id", e.id.to_string()),
            ("label", look.heading(&visible(&e.label))),
            ("shape", visible(&e.shape)),
            (
                "tongue × stack",
                if metric {
                    format!(
                        "{} × {} (mm unless a unit is given)",
                        visible(&e.tongue_mm),
                        visible(&e.stack_mm)
                    )
                } else {
                    by(look, d.tongue_mm, d.stack_mm, 2)
                },
            ),
            (
                "window w × h",
                if metric {
                    format!(
                        "{} × {}",
                        visible(&e.window_width_mm),
                        visible(&e.window_height_mm)
                    )
                } else {
                    by(look, d.window_width_mm, d.window_height_mm, 2)
                },
            ),
            ("stacking factor", visible(&e.stacking_factor)),
            ("steel", visible(&e.steel)),
            ("Ae net", look.mm2(g.area_net_mm2, 1)),
            ("Aw", look.mm2(g.window_area_mm2, 1)),
            (
                "area product",
                format!("{} cm⁴", num(g.area_product_cm4, 2)),
            ),
            (
                "mass",
                format!(
                    "{}{}",
                    look.kg(g.mass_kg, 3),
                    if g.mass_measured {
                        " (weighed)"
                    } else {
                        " (from the outline)"
                    }
                ),
            ),
            (
                "volts per turn",
                if e.volts_per_turn.is_empty() {
                    "not probed".into()
                } else {
                    format!("{} V", visible(&e.volts_per_turn))
                },
            ),
            ("notes", visible(&e.notes)),
            ("added", visible(&e.added)),
        ],
        look,
    );
    out.write_all(look.finish(s).as_bytes())
}

/// `shelf export`: CSV cells safe for spreadsheets, or JSON.
pub fn write_export(out: &mut dyn Write, l: &Listing, format: Format) -> std::io::Result<()> {
    if format == Format::Json {
        let cores: Vec<CoreJson> = l.cores.iter().map(core_json).collect();
        return super::json::write_json(out, &serde_json::json!({ "cores": cores }));
    }
    let entries: Vec<Entry> = l.cores.iter().map(|c| c.entry.clone()).collect();
    out.write_all(export_csv(&entries).as_bytes())
}

/// `shelf rank`: text or JSON.
pub fn write_rank(
    out: &mut dyn Write,
    r: &Ranking,
    format: Format,
    look: &Look,
) -> std::io::Result<()> {
    if format == Format::Json {
        return super::json::write_json(
            out,
            &serde_json::json!({ "job": r.job, "cores": r.total, "ranked": r.ranked }),
        );
    }
    let mut t = vec![vec![
        "rank".to_string(),
        "id".into(),
        "label".into(),
        "carries".into(),
        "margin %".into(),
        "limit".into(),
        "loss W".into(),
        "rise °C".into(),
        "fill".into(),
    ]];
    for (k, c) in r.ranked.iter().enumerate() {
        t.push(vec![
            (k + 1).to_string(),
            c.id.to_string(),
            visible(&c.label),
            look.mark(if c.carries { "yes" } else { "no" }, c.carries),
            num(c.margin_pct.min(99_999.0), 0),
            c.limit.clone(),
            num(c.loss_w, 1),
            num(c.rise_c, 0),
            num(c.copper_fill, 2),
        ]);
    }
    let s = look.finish(table(t, 99, look));
    let carrying = r.ranked.iter().filter(|c| c.carries).count();
    let head = super::wrap(
        &format!(
            "\"{}\" ({} VA) on {} cores: {carrying} shown carry it",
            visible(&r.job),
            num(r.job_va, 0),
            r.total
        ),
        look.width,
        "",
        "  ",
    );
    write!(out, "{head}{s}")
}

/// `shelf add`: the new id, text or JSON.
pub fn write_added(out: &mut dyn Write, id: u64, format: Format) -> std::io::Result<()> {
    if format == Format::Json {
        return super::json::write_json(out, &serde_json::json!({ "id": id }));
    }
    writeln!(out, "{id}")
}

/// `shelf edit` and `remove`: what was done to which id.
pub fn write_done(out: &mut dyn Write, what: &str, id: u64) -> std::io::Result<()> {
    writeln!(out, "{what} {id}")
}

/// `shelf import`: how many came in, their ids, and how many rows were skipped.
pub fn write_imported(out: &mut dyn Write, ids: &[u64], skipped: usize) -> std::io::Result<()> {
    let range = match (ids.first(), ids.last()) {
        (Some(a), Some(b)) if a != b => format!("{a}–{b}"),
        (Some(a), _) => a.to_string(),
        _ => "none".into(),
    };
    writeln!(
        out,
        "imported {} cores (ids {range}), skipped {skipped}",
        ids.len()
    )
}

/// A shelf row that does not read, for stderr.
pub fn bad_row_warning(path: &str, b: &crate::shelf::BadRow) -> String {
    format!(
        "warning: {path}: line {}: {} (the row is skipped; fix or remove it)",
        b.line,
        visible(&b.problem)
    )
}

/// An import row skipped with `--skip-bad`, for stderr.
pub fn skipped_row_warning(path: &str, b: &crate::shelf::BadRow) -> String {
    format!("warning: {path}: line {}: {} (skipped)", b.line, b.problem)
}

/// The progress bar of a long rank.
pub fn progress_line(done: usize, total: usize) -> String {
    let pct = done * 100 / total.max(1);
    let bar = "#".repeat(pct / 4);
    format!("ranking {done}/{total} [{bar:<25}] {pct}%")
}

/// The line that replaces the bar when the rank is done.
pub fn progress_done(total: usize) -> String {
    format!("ranked {total} cores{}", " ".repeat(30))
}
