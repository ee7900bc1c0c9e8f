//! Renderers: every word a person reads. One module per report (plan, card, core, wire, probe,
//! rate, shelf), each writing any of its formats from (&Report, &Look, &mut dyn Write).
//!
//! Compute once, render many. Numbers shown to people are rounded per quantity; JSON carries full
//! precision. Nothing here depends on the locale. Checks, warnings and notes become sentences in
//! `words`, once for every format.

pub mod card;
pub mod core;
pub mod csv;
pub mod diagnose;
pub mod json;
pub mod plan;
pub mod probe;
pub mod rate;
pub mod shelf;
pub mod svg;
pub mod wire;
pub mod words;

/// An output format. Each command offers the ones that suit its report; a renderer given a format
/// it has no form for writes its text.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Format {
    /// Tables and lines for a terminal.
    Text,
    /// JSON for scripts (SI and mm always).
    Json,
    /// CSV rows.
    Csv,
    /// Markdown (the card).
    Markdown,
    /// A self-contained HTML page (the card).
    Html,
    /// SVG (the card's cross-section).
    Svg,
}

use std::borrow::Borrow;
use tabled::builder::Builder;
use tabled::settings::object::Columns;
use tabled::settings::{Alignment, Style};

/// Table look: box-drawing characters, or plain ASCII.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum Charset {
    /// Unicode box drawing.
    #[default]
    Unicode,
    /// Plain ASCII only.
    Ascii,
}

/// Units for display (input always accepts both).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum Units {
    /// Millimetres and metres first.
    #[default]
    Metric,
    /// Inches and feet first, millimetres beside them.
    Imperial,
}

/// How text output looks: characters, units, colour and width.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Look {
    /// Box drawing or plain ASCII.
    pub charset: Charset,
    /// Units shown first.
    pub units: Units,
    /// ANSI colour and bold.
    pub color: bool,
    /// Columns the wrapped text (the card) keeps within.
    pub width: usize,
    /// Tables narrowed to `width` too (on a terminal, or when `COLUMNS` is set); otherwise, in a
    /// file or a pipe, tables keep their natural width so each row stays one line.
    pub fit_tables: bool,
    /// `--quiet`: data only — no hints, notes or introductions (cautions and warnings stay).
    pub quiet: bool,
}

impl Default for Look {
    fn default() -> Self {
        Look {
            charset: Charset::Unicode,
            units: Units::Metric,
            color: false,
            width: 80,
            fit_tables: false,
            quiet: false,
        }
    }
}

impl Look {
    /// A length in mm, with `d` decimals in mm (imperial: inches first, mm beside).
    pub fn mm(&self, v: f64, d: usize) -> String {
        match self.units {
            Units::Metric => format!("{} mm", num(v, d)),
            Units::Imperial => format!(
                "{} in ({} mm)",
                num(v / crate::units::MM_PER_INCH, d + 2),
                num(v, d)
            ),
        }
    }
    /// A bare length in the display unit (no unit text): mm, or inches.
    pub fn mm_bare(&self, v: f64, d: usize) -> String {
        match self.units {
            Units::Metric => num(v, d),
            Units::Imperial => num(v / crate::units::MM_PER_INCH, d + 2),
        }
    }
    /// The display unit of lengths: `mm` or `in`.
    pub fn mm_unit(&self) -> &'static str {
        match self.units {
            Units::Metric => "mm",
            Units::Imperial => "in",
        }
    }
    /// A length in metres (imperial: feet first).
    pub fn m(&self, v: f64, d: usize) -> String {
        match self.units {
            Units::Metric => format!("{} m", num(v, d)),
            Units::Imperial => format!("{} ft ({} m)", num(v / 0.3048, d), num(v, d)),
        }
    }
    /// A heading: bold when colour is on.
    pub fn heading(&self, s: &str) -> String {
        self.bold(s)
    }
    /// A mass in kg (imperial: pounds first).
    pub fn kg(&self, v: f64, d: usize) -> String {
        match self.units {
            Units::Metric => format!("{} kg", num(v, d)),
            Units::Imperial => format!("{} lb ({} kg)", num(v / 0.453_592_37, d), num(v, d)),
        }
    }
    /// An area in mm² (imperial: square inches first).
    pub fn mm2(&self, v: f64, d: usize) -> String {
        match self.units {
            Units::Metric => format!("{} mm²", num(v, d)),
            Units::Imperial => format!("{} in² ({} mm²)", num(v / 645.16, 3), num(v, d)),
        }
    }
    /// An area product in cm⁴ (imperial: in⁴ first; 1 in⁴ = 41.623 cm⁴ from 2.54⁴).
    pub fn cm4(&self, v: f64, d: usize) -> String {
        match self.units {
            Units::Metric => format!("{} cm⁴", num(v, d)),
            Units::Imperial => format!("{} in⁴ ({} cm⁴)", num(v / 2.54f64.powi(4), 3), num(v, d)),
        }
    }
    /// A mass in grams (imperial: ounces first, 1 oz = 28.349 523 125 g).
    pub fn g(&self, v: f64, d: usize) -> String {
        match self.units {
            Units::Metric => format!("{} g", num(v, d)),
            Units::Imperial => format!("{} oz ({} g)", num(v / 28.349_523_125, 1), num(v, d)),
        }
    }
    /// A current density in A/mm² (imperial: circular mils per ampere, the trade's figure).
    pub fn density(&self, a_mm2: f64) -> String {
        match self.units {
            Units::Metric => format!("{} A/mm²", num(a_mm2, 2)),
            Units::Imperial => format!(
                "{} cmil/A ({} A/mm²)",
                num(crate::wire::CMIL_PER_A_AT_1_A_MM2 / a_mm2.max(1e-9), 0),
                num(a_mm2, 2)
            ),
        }
    }
    /// A current density's bare figure for a table column and its heading.
    pub fn density_bare(&self, a_mm2: f64) -> String {
        match self.units {
            Units::Metric => num(a_mm2, 2),
            Units::Imperial => num(crate::wire::CMIL_PER_A_AT_1_A_MM2 / a_mm2.max(1e-9), 0),
        }
    }
    /// The heading of a current-density column.
    pub fn density_unit(&self) -> &'static str {
        match self.units {
            Units::Metric => "A/mm²",
            Units::Imperial => "cmil/A",
        }
    }
    /// Wraps text in bold when colour is on.
    pub fn bold(&self, s: &str) -> String {
        if self.color {
            format!("\x1b[1m{s}\x1b[0m")
        } else {
            s.to_string()
        }
    }
    /// Green (good) or red (bad) when colour is on.
    pub fn mark(&self, s: &str, good: bool) -> String {
        if self.color {
            format!("\x1b[1;{}m{s}\x1b[0m", if good { 32 } else { 31 })
        } else {
            s.to_string()
        }
    }
    /// The finished text: ASCII-folded when asked.
    pub fn finish(&self, s: String) -> String {
        fold(self.charset, s)
    }
}

/// Text from a file made safe for a terminal: control, bidirectional and zero-width characters
/// shown as `\u{..}` escapes instead of acting on the screen.
pub fn visible(s: &str) -> String {
    if !s.chars().any(crate::error::unsafe_char) {
        return s.to_string();
    }
    let mut out = String::with_capacity(s.len());
    for c in s.chars() {
        if crate::error::unsafe_char(c) {
            out += &format!("\\u{{{:x}}}", c as u32);
        } else {
            out.push(c);
        }
    }
    out
}

/// Builds a table from rows (the first is the header) with numbers right-aligned from `right_from`;
/// the text ends with a newline.
pub fn table(rows: Vec<Vec<String>>, right_from: usize, look: impl Borrow<Look>) -> String {
    let look = look.borrow();
    // Too many columns for the width even with every cell wrapped at its words: one small
    // table per row (heading: value), so no number is ever broken.
    let cols = rows.first().map(Vec::len).unwrap_or(0);
    let least: usize = (0..cols)
        .map(|c| {
            rows.iter()
                .filter_map(|r| r.get(c))
                .flat_map(|cell| cell.split_whitespace())
                .map(|w| w.chars().count())
                .max()
                .unwrap_or(1)
                + 3
        })
        .sum::<usize>()
        + 1;
    if look.fit_tables && cols > 2 && rows.len() > 1 && least > look.width {
        let head = &rows[0];
        let mut out = String::new();
        for r in &rows[1..] {
            let pairs_rows: Vec<(&str, String)> = head
                .iter()
                .map(String::as_str)
                .zip(r.iter().cloned())
                .collect();
            out += &pairs(&pairs_rows, look);
        }
        return out;
    }
    let mut b = Builder::default();
    for r in rows {
        b.push_record(r);
    }
    let mut t = b.build();
    match look.charset {
        Charset::Unicode => t.with(Style::rounded()),
        Charset::Ascii => t.with(Style::ascii()),
    };
    t.modify(Columns::new(right_from..), Alignment::right());
    fit(&mut t, look);
    t.to_string() + "\n"
}

/// Narrows a table to the look's width: cells wrap at word boundaries (long words are broken),
/// the widest columns giving up room first.
fn fit(t: &mut tabled::Table, look: &Look) {
    use tabled::settings::{peaker::PriorityMax, Width};
    let width = look.width;
    if look.fit_tables && t.total_width() > width {
        t.with(
            Width::wrap(width)
                .keep_words(true)
                .priority(PriorityMax::default()),
        );
    }
}

/// A two-column table of labels and values, without a header row; the text ends with a newline.
pub fn pairs(rows: &[(&str, String)], look: impl Borrow<Look>) -> String {
    let look = look.borrow();
    let mut b = Builder::default();
    for (k, v) in rows {
        b.push_record([k.to_string(), v.clone()]);
    }
    let mut t = b.build();
    match look.charset {
        Charset::Unicode => t.with(Style::rounded().remove_horizontals()),
        Charset::Ascii => t.with(Style::ascii().remove_horizontals()),
    };
    fit(&mut t, look);
    t.to_string() + "\n"
}

/// A table whose long cells are wrapped so the whole fits the look's width.
pub fn wrap_table(mut rows: Vec<Vec<String>>, look: &Look) -> String {
    let cols = rows.first().map(Vec::len).unwrap_or(0);
    if cols == 0 {
        return String::new();
    }
    // Columns but the last two keep their widths; the last two share what is left.
    let fixed: usize = (0..cols.saturating_sub(2))
        .map(|c| rows.iter().map(|r| r[c].chars().count()).max().unwrap_or(0) + 3)
        .sum();
    let room = look.width.saturating_sub(fixed + 7).max(20) / 2;
    for r in rows.iter_mut() {
        for cell in r.iter_mut().skip(cols.saturating_sub(2)) {
            *cell = wrap(cell, room, "", "").trim_end().to_string();
        }
    }
    table(rows, 99, look)
}

/// Wraps `text` to `width` columns with `indent` on continuation lines.
pub fn wrap(text: &str, width: usize, first: &str, indent: &str) -> String {
    let mut out = String::new();
    let mut line = first.to_string();
    let mut empty = true;
    for word in text.split_whitespace() {
        let need = line.chars().count() + if empty { 0 } else { 1 } + word.chars().count();
        if !empty && need > width {
            out += line.trim_end();
            out += "\n";
            line = indent.to_string();
            empty = true;
        }
        if !empty {
            line.push(' ');
        }
        line += word;
        empty = false;
    }
    out += line.trim_end();
    out += "\n";
    out
}

/// A number with `d` decimals; NaN and infinities as words (they should never reach a person).
pub fn num(v: f64, d: usize) -> String {
    if v.is_finite() {
        let s = format!("{v:.d$}");
        if s.starts_with('-') && s[1..].chars().all(|c| c == '0' || c == '.') {
            s[1..].to_string()
        } else {
            s
        }
    } else {
        "n/a".to_string()
    }
}

/// A number with about three significant figures for quantities that span decades (Ω, A).
pub fn sig3(v: f64) -> String {
    if !v.is_finite() {
        return "n/a".to_string();
    }
    let a = v.abs();
    let d = if a == 0.0 || a >= 100.0 {
        0
    } else if a >= 10.0 {
        1
    } else if a >= 1.0 {
        2
    } else if a >= 0.1 {
        3
    } else if a >= 0.01 {
        4
    } else {
        5
    };
    num(v, d)
}

/// The text as given, or folded to ASCII for `--ascii`.
pub fn fold(cs: Charset, s: String) -> String {
    if cs == Charset::Ascii {
        asciify(&s)
    } else {
        s
    }
}

/// Replaces the few non-ASCII symbols ironwind prints with ASCII equivalents.
pub fn asciify(s: &str) -> String {
    s.replace('°', " deg ")
        .replace("deg C", "degC")
        .replace("  deg", " deg")
        .replace('²', "2")
        .replace('³', "3")
        .replace('⁴', "4")
        .replace('≤', "<=")
        .replace('≥', ">=")
        .replace('×', "x")
        .replace('Ω', "ohm")
        .replace('µ', "u")
        .replace('±', "+/-")
        .replace('√', "sqrt")
        .replace(['–', '—'], "-")
        .replace('·', "*")
        .replace('δ', "duty")
        .replace(['“', '”'], "\"")
        .replace('’', "'")
        .replace('…', "...")
        .replace('✓', "ok")
        .replace('✗', "FAIL")
        .chars()
        .map(|c| if c.is_ascii() { c } else { '?' })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn numbers_round_without_negative_zero() {
        assert_eq!(num(-0.0001, 2), "0.00");
        assert_eq!(num(1.005, 1), "1.0");
        assert_eq!(num(f64::NAN, 2), "n/a");
        assert_eq!(sig3(0.01234), "0.0123");
        assert_eq!(sig3(123.4), "123");
    }

    #[test]
    fn every_symbol_has_its_own_ascii_form() {
        // Each symbol ironwind prints maps to a readable ASCII form, never the `?` fallback: a
        // mapping removed from `asciify` fails its row here.
        for (symbol, ascii) in [
            ("20 °C", "20 degC"),
            ("mm²", "mm2"),
            ("cm³", "cm3"),
            ("cm⁴", "cm4"),
            ("≤", "<="),
            ("≥", ">="),
            ("4 × 5", "4 x 5"),
            ("Ω", "ohm"),
            ("√VA", "sqrtVA"),
            ("a–b—c", "a-b-c"),
            ("N·m", "N*m"),
            ("δ", "duty"),
            ("“q”", "\"q\""),
            ("it’s", "it's"),
            ("…", "..."),
            ("✓", "ok"),
            ("✗", "FAIL"),
        ] {
            assert_eq!(asciify(symbol), ascii, "{symbol}");
        }
        assert_eq!(asciify("é"), "?", "an unknown symbol still becomes ASCII");
    }

    #[test]
    fn imperial_figures_match_their_definitions() {
        // NIST SP 811 (2008), B.8: 1 in = 2.54 cm exactly, so 1 in⁴ = 41.623 142 56 cm⁴; the
        // avoirdupois ounce = 28.349 523 125 g; 1 lb = 0.453 592 37 kg. A circular mil is the
        // area of a circle 0.001 in across, π/4 × (0.0254 mm)² = 5.067e-4 mm² (ASTM B258), so
        // 1 A/mm² = 1973.5 cmil/A.
        let look = Look {
            units: Units::Imperial,
            ..Look::default()
        };
        assert_eq!(look.cm4(41.623_142_56, 2), "1.000 in⁴ (41.62 cm⁴)");
        assert_eq!(look.g(28.349_523_125 * 12.0, 0), "12.0 oz (340 g)");
        assert_eq!(look.kg(0.453_592_37 * 5.0, 3), "5.000 lb (2.268 kg)");
        assert_eq!(look.density(3.0), "658 cmil/A (3.00 A/mm²)");
        assert_eq!(look.density_bare(1.0), "1974");
    }
}
