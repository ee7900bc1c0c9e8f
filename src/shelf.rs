//! The shelf: an inventory of measured donor cores, kept as one CSV file, and the ranking of its
//! cores for a job.
//!
//! Measurements are kept exactly as typed ("31.50" stays "31.50", "1.25 in" keeps its unit): each
//! cell is checked with `rust_decimal` (or the length parser for a value with a unit) and stored as
//! its text. Reading never stops at a bad row: the good rows are returned with the bad ones listed
//! by line, and the caller refuses to rewrite the file until they are fixed.
//!
//! Ranking plans the job's windings on every core (the job's own core, probe and kept windings set
//! aside) and orders the cores that carry it by margin, then by total loss. The margin is the
//! smaller of two headrooms read from that plan: heating, the factor the load could grow before the
//! rise reaches its limit with the same wire (copper loss ∝ I²: √((P_allowed − P_core)/P_cu) − 1),
//! and window, the spare build over the build used ((available − build)/build).

use crate::error::{Error, Result};
use crate::geometry::{default_leg_yoke, CoreDims, Shape};
use crate::job::Job;
use crate::losses::loss_for_rise_w;
use crate::magnetics::steel_info;
use crate::plan::plan;
use rust_decimal::prelude::ToPrimitive;
use rust_decimal::Decimal;
use serde::Serialize;
use std::str::FromStr;

/// The shelf file's header.
pub const HEADER: &[&str] = &[
    "id",
    "label",
    "shape",
    "tongue_mm",
    "stack_mm",
    "window_width_mm",
    "window_height_mm",
    "stacking_factor",
    "steel",
    "mass_g",
    "volts_per_turn",
    "notes",
    "added",
];

/// The header `shelf import` reads.
pub const IMPORT_HEADER: &[&str] = &[
    "label",
    "shape",
    "tongue_mm",
    "stack_mm",
    "window_width_mm",
    "window_height_mm",
    "stacking_factor",
    "steel",
    "mass_g",
    "volts_per_turn",
    "notes",
];

/// One core on the shelf, every measurement as typed.
#[derive(Debug, Clone, PartialEq, Eq, Default, Serialize)]
pub struct Entry {
    /// Its id, unique on the shelf.
    pub id: u64,
    /// A person's label.
    pub label: String,
    /// `ei` or `ui`.
    pub shape: String,
    /// Tongue width as typed (mm, or with a unit).
    pub tongue_mm: String,
    /// Stack depth as typed.
    pub stack_mm: String,
    /// Window width as typed.
    pub window_width_mm: String,
    /// Window height as typed.
    pub window_height_mm: String,
    /// Stacking factor as typed.
    pub stacking_factor: String,
    /// Steel name.
    pub steel: String,
    /// Weighed mass in grams as typed (empty when not weighed).
    pub mass_g: String,
    /// Measured volts per turn as typed (empty when not probed).
    pub volts_per_turn: String,
    /// Free notes.
    pub notes: String,
    /// The date it was added, YYYY-MM-DD.
    pub added: String,
}

/// An entry's values in SI and mm, for computing.
#[derive(Debug, Clone, PartialEq)]
pub struct CoreValues {
    /// The core's dimensions.
    pub dims: CoreDims,
    /// Steel name (checked).
    pub steel: String,
    /// Volts per turn, when probed.
    pub volts_per_turn: Option<f64>,
}

/// A row that could not be read.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct BadRow {
    /// Its line in the file.
    pub line: u64,
    /// Its id, when that much could be read.
    pub id: Option<u64>,
    /// What is wrong.
    pub problem: String,
}

/// A shelf as read.
#[derive(Debug, Clone, Default)]
pub struct Shelf {
    /// Good rows, in file order, with their values.
    pub entries: Vec<(Entry, CoreValues)>,
    /// Rows that could not be read.
    pub bad: Vec<BadRow>,
}

impl Shelf {
    /// The next free id.
    pub fn next_id(&self) -> u64 {
        self.ids_from(1).unwrap_or(u64::MAX)
    }

    /// The first of `count` fresh ids, or None when the ids would pass u64::MAX (a row with an id at
    /// the edge: ids are never wrapped into duplicates).
    pub fn ids_from(&self, count: u64) -> Option<u64> {
        let top = self
            .entries
            .iter()
            .map(|(e, _)| e.id)
            .chain(self.bad.iter().filter_map(|b| b.id))
            .max()
            .unwrap_or(0);
        let first = top.checked_add(1)?;
        first.checked_add(count.saturating_sub(1))?;
        Some(first)
    }
}

fn decimal(
    field: &str,
    text: &str,
    lo: f64,
    lo_incl: bool,
    hi: f64,
    unit: &str,
) -> std::result::Result<f64, String> {
    let t = text.trim();
    let d =
        Decimal::from_str(t).map_err(|_| format!("{field} = \"{t}\": must be a decimal number"))?;
    let v = d
        .to_f64()
        .ok_or_else(|| format!("{field} = \"{t}\": out of range"))?;
    let ok = if lo_incl { v >= lo } else { v > lo };
    if ok && v <= hi {
        Ok(v)
    } else {
        let op = if lo_incl { "≥" } else { ">" };
        Err(format!(
            "{field} = \"{t}\": must be {op} {lo} {unit} and ≤ {hi} {unit}"
        ))
    }
}

fn length(field: &str, text: &str) -> std::result::Result<f64, String> {
    let t = text.trim();
    // A bare number must be a plain decimal (no exponent, no comma); a unit goes through the parser.
    let mm = if t
        .bytes()
        .all(|b| b.is_ascii_digit() || b == b'.' || b == b'-' || b == b'+')
    {
        decimal(field, t, 0.0, false, crate::job::MAX_CORE_MM, "mm")?
    } else {
        crate::units::parse_length_mm(t).map_err(|m| format!("{field} = \"{t}\": {m}"))?
    };
    if mm > 0.0 && mm <= crate::job::MAX_CORE_MM {
        Ok(mm)
    } else {
        Err(format!("{field} = \"{t}\": must be > 0 mm and ≤ 1000 mm"))
    }
}

/// Trims a cell without a new allocation when there is nothing to trim.
fn trim_in_place(cell: &mut String) {
    if cell.trim().len() != cell.len() {
        *cell = cell.trim().to_string();
    }
}

fn text_cell(
    field: &str,
    text: &str,
    max: usize,
    required: bool,
) -> std::result::Result<String, String> {
    let t = text.trim();
    if required && t.is_empty() {
        return Err(format!("{field} is empty: it is required"));
    }
    if t.chars().count() > max {
        return Err(format!("{field}: longer than {max} characters"));
    }
    if t.chars().any(crate::error::unsafe_char) {
        return Err(format!(
            "{field}: has control, bidirectional or zero-width characters"
        ));
    }
    Ok(t.to_string())
}

/// Checks an entry's cells and computes its values. Empty optional cells take the defaults
/// (shape `ei`, stacking 0.95, steel `unknown`).
pub fn check_entry(mut e: Entry) -> std::result::Result<(Entry, CoreValues), String> {
    e.label = text_cell("label", &e.label, 80, true)?;
    e.notes = text_cell("notes", &e.notes, 500, false)?;
    e.shape = match e.shape.trim().to_ascii_lowercase().as_str() {
        "" | "ei" => "ei".to_string(),
        "ui" => "ui".to_string(),
        other => return Err(format!("shape = \"{other}\": must be \"ei\" or \"ui\"")),
    };
    let shape = if e.shape == "ui" {
        Shape::Ui
    } else {
        Shape::Ei
    };
    let a = length("tongue_mm", &e.tongue_mm)?;
    let s = length("stack_mm", &e.stack_mm)?;
    let w = length("window_width_mm", &e.window_width_mm)?;
    let h = length("window_height_mm", &e.window_height_mm)?;
    for cell in [
        &mut e.tongue_mm,
        &mut e.stack_mm,
        &mut e.window_width_mm,
        &mut e.window_height_mm,
    ] {
        trim_in_place(cell);
    }
    if e.stacking_factor.trim().is_empty() {
        e.stacking_factor = "0.95".to_string();
    }
    trim_in_place(&mut e.stacking_factor);
    let k = decimal("stacking_factor", &e.stacking_factor, 0.5, false, 1.0, "")?;
    if e.steel.trim().is_empty() {
        e.steel = "unknown".to_string();
    }
    trim_in_place(&mut e.steel);
    steel_info(&e.steel).map_err(|m| format!("steel = \"{}\": {m}", e.steel))?;
    trim_in_place(&mut e.mass_g);
    let mass = if e.mass_g.is_empty() {
        None
    } else {
        Some(decimal("mass_g", &e.mass_g, 0.0, false, 1.0e6, "g")? / 1000.0)
    };
    trim_in_place(&mut e.volts_per_turn);
    let vpt = if e.volts_per_turn.is_empty() {
        None
    } else {
        Some(decimal(
            "volts_per_turn",
            &e.volts_per_turn,
            0.0,
            false,
            1000.0,
            "V",
        )?)
    };
    let (c, y) = default_leg_yoke(shape, a);
    let dims = CoreDims {
        shape,
        tongue_mm: a,
        stack_mm: s,
        window_width_mm: w,
        window_height_mm: h,
        stacking_factor: k,
        outer_leg_mm: c,
        yoke_mm: y,
        measured_mass_kg: mass,
    };
    let steel = e.steel.clone();
    Ok((
        e,
        CoreValues {
            dims,
            steel,
            volts_per_turn: vpt,
        },
    ))
}

/// Reads a shelf file's text. A missing header or a header that differs is an error; bad rows are
/// collected, never fatal.
pub fn parse_shelf(origin: &str, text: &str) -> Result<Shelf> {
    let mut shelf = Shelf::default();
    read_rows(origin, text.as_bytes(), |row| match row {
        Ok(ev) => shelf.entries.push(ev),
        Err(bad) => shelf.bad.push(bad),
    })?;
    Ok(shelf)
}

/// One row of a shelf file: a checked core, or a row that does not read.
pub type Row = std::result::Result<(Entry, CoreValues), BadRow>;

/// Reads a shelf file row by row from any reader, handing each row to `each` as it is read (a
/// listing of a million cores need not hold them all). An empty file is an empty shelf.
pub fn read_rows(origin: &str, reader: impl std::io::Read, each: impl FnMut(Row)) -> Result<()> {
    read_rows_with(origin, reader, true, each)
}

/// [`read_rows`], with the check for an id used twice left out when the caller knows the ids rise
/// (a streamed listing has checked them on its first pass).
pub fn read_rows_with(
    origin: &str,
    reader: impl std::io::Read,
    check_twice: bool,
    mut each: impl FnMut(Row),
) -> Result<()> {
    let mut seen = std::collections::HashSet::new();
    let mut rdr = csv::ReaderBuilder::new()
        .has_headers(false)
        .flexible(true)
        .from_reader(reader);
    let mut records = rdr.records();
    let header = match records.next() {
        None => return Ok(()),
        Some(h) => h.map_err(|e| Error::bad_input(origin, format!("line 1: {e}")))?,
    };
    let names: Vec<&str> = header
        .iter()
        .map(|h| h.trim_start_matches('\u{feff}'))
        .collect();
    if names.len() == 1 && names[0].trim().is_empty() {
        return Ok(());
    }
    if names != HEADER {
        return Err(Error::bad_input(
            origin,
            format!(
                "line 1: header is `{}`; a shelf file starts with `{}`",
                crate::error::one_line(&names.join(",")),
                HEADER.join(",")
            ),
        ));
    }
    for rec in records {
        match rec {
            Ok(r) => {
                if let Some(row) = row_of(&r, check_twice.then_some(&mut seen)) {
                    each(row);
                }
            }
            Err(e) => each(Err(BadRow {
                line: e.position().map(|p| p.line()).unwrap_or(0),
                id: None,
                problem: crate::error::one_line(&e.to_string()),
            })),
        }
    }
    Ok(())
}

/// A quick first look at a shelf file's rows: each data row's cells, unchecked, with its id when it
/// reads as one (no header check: [`read_rows`] does that on the pass that counts).
pub fn scan_cells(
    reader: impl std::io::Read,
    mut each: impl FnMut(Option<u64>, &csv::StringRecord),
) {
    let mut rdr = csv::ReaderBuilder::new()
        .has_headers(true)
        .flexible(true)
        .from_reader(reader);
    let mut rec = csv::StringRecord::new();
    while let Ok(true) = rdr.read_record(&mut rec) {
        let id = rec.get(0).and_then(|c| c.trim().parse::<u64>().ok());
        each(id, &rec);
    }
}

/// One record checked into a row; None for a blank line.
fn row_of(
    rec: &csv::StringRecord,
    seen: Option<&mut std::collections::HashSet<u64>>,
) -> Option<Row> {
    let line = rec.position().map(|p| p.line()).unwrap_or(0);
    if rec.len() == 1 && rec.get(0).is_some_and(|c| c.trim().is_empty()) {
        return None;
    }
    let id = rec
        .get(0)
        .and_then(|c| c.trim().parse::<u64>().ok())
        .filter(|&i| i > 0);
    let bad = |id, problem| Some(Err(BadRow { line, id, problem }));
    if rec.len() != HEADER.len() {
        return bad(
            id,
            format!("{} fields; a shelf row has {}", rec.len(), HEADER.len()),
        );
    }
    let Some(id) = id else {
        return bad(
            None,
            format!(
                "id = \"{}\": must be a whole number ≥ 1",
                crate::error::short_value(rec.get(0).unwrap_or(""))
            ),
        );
    };
    if seen.is_some_and(|s| !s.insert(id)) {
        return bad(Some(id), format!("id {id} is used twice"));
    }
    let cell = |k: usize| rec.get(k).unwrap_or("").to_string();
    let entry = Entry {
        id,
        label: cell(1),
        shape: cell(2),
        tongue_mm: cell(3),
        stack_mm: cell(4),
        window_width_mm: cell(5),
        window_height_mm: cell(6),
        stacking_factor: cell(7),
        steel: cell(8),
        mass_g: cell(9),
        volts_per_turn: cell(10),
        notes: cell(11),
        added: cell(12),
    };
    Some(check_entry(entry).map_err(|problem| BadRow {
        line,
        id: Some(id),
        problem,
    }))
}

/// Neutralises a text cell a spreadsheet would run as a formula (OWASP CSV injection guidance:
/// cells starting with `=`, `+`, `-`, `@`, tab or carriage return get a leading apostrophe).
pub fn neutralise(cell: &str) -> String {
    match cell.chars().next() {
        Some('=' | '+' | '-' | '@' | '\t' | '\r') => format!("'{cell}"),
        _ => cell.to_string(),
    }
}

/// Undoes [`neutralise`]: an apostrophe before a formula character is dropped on import.
pub fn unneutralise(cell: &str) -> String {
    match cell.strip_prefix('\'') {
        Some(rest) if rest.starts_with(['=', '+', '-', '@', '\t', '\r']) => rest.to_string(),
        _ => cell.to_string(),
    }
}

fn row(e: &Entry) -> [String; 13] {
    [
        e.id.to_string(),
        e.label.clone(),
        e.shape.clone(),
        e.tongue_mm.clone(),
        e.stack_mm.clone(),
        e.window_width_mm.clone(),
        e.window_height_mm.clone(),
        e.stacking_factor.clone(),
        e.steel.clone(),
        e.mass_g.clone(),
        e.volts_per_turn.clone(),
        e.notes.clone(),
        e.added.clone(),
    ]
}

/// The shelf file's text for these entries (the storage form: cells exactly as typed).
pub fn shelf_text(entries: &[Entry]) -> String {
    let mut w = csv::Writer::from_writer(Vec::new());
    let _ = w.write_record(HEADER);
    for e in entries {
        let _ = w.write_record(row(e));
    }
    let bytes = w.into_inner().unwrap_or_default();
    String::from_utf8(bytes).unwrap_or_default()
}

/// The export form: like the shelf file, with text cells neutralised for spreadsheets.
pub fn export_csv(entries: &[Entry]) -> String {
    let mut w = csv::Writer::from_writer(Vec::new());
    let _ = w.write_record(HEADER);
    for e in entries {
        let _ = w.write_record(export_cells(e));
    }
    String::from_utf8(w.into_inner().unwrap_or_default()).unwrap_or_default()
}

/// An entry's exported cells (text cells a spreadsheet would run neutralised).
fn export_cells(e: &Entry) -> [String; 13] {
    let mut r = row(e);
    for k in [1, 2, 8, 11, 12] {
        r[k] = neutralise(&r[k]);
    }
    r
}

/// Writes entries as export rows (no header) into a CSV writer kept across calls.
pub fn write_export_rows<W: std::io::Write>(
    w: &mut csv::Writer<W>,
    e: &Entry,
) -> std::result::Result<(), csv::Error> {
    w.write_record(export_cells(e))
}

/// Reads an import file (header [`IMPORT_HEADER`]): entries without ids, or the bad rows.
pub fn parse_import(origin: &str, text: &str) -> Result<(Vec<Entry>, Vec<BadRow>)> {
    let mut rdr = csv::ReaderBuilder::new()
        .has_headers(true)
        .flexible(true)
        .from_reader(text.as_bytes());
    let header = rdr
        .headers()
        .map_err(|e| Error::bad_input(origin, format!("line 1: {e}")))?
        .clone();
    let names: Vec<String> = header
        .iter()
        .map(|h| h.trim().trim_start_matches('\u{feff}').to_string())
        .collect();
    // The import header, or the shelf's own (an export read back: its ids are replaced, its dates kept).
    let full = names == HEADER;
    if names != IMPORT_HEADER && !full {
        return Err(Error::bad_input(
            origin,
            format!(
                "line 1: header is `{}`; expected `{}` (or a shelf export's header)",
                crate::error::one_line(&names.join(",")),
                IMPORT_HEADER.join(",")
            ),
        ));
    }
    let width = if full {
        HEADER.len()
    } else {
        IMPORT_HEADER.len()
    };
    let offset = usize::from(full);
    let mut good = Vec::new();
    let mut bad = Vec::new();
    for rec in rdr.records() {
        let rec = match rec {
            Ok(r) => r,
            Err(e) => {
                let line = e.position().map(|p| p.line()).unwrap_or(0);
                bad.push(BadRow {
                    line,
                    id: None,
                    problem: crate::error::one_line(&e.to_string()),
                });
                continue;
            }
        };
        let line = rec.position().map(|p| p.line()).unwrap_or(0);
        if rec.iter().all(|c| c.trim().is_empty()) {
            continue;
        }
        if rec.len() != width {
            bad.push(BadRow {
                line,
                id: None,
                problem: format!("{} fields; expected {width}", rec.len()),
            });
            continue;
        }
        let cell = |k: usize| rec.get(k + offset).unwrap_or("").to_string();
        let text = |k: usize| unneutralise(&cell(k));
        let e = Entry {
            id: 0,
            label: text(0),
            shape: text(1),
            tongue_mm: cell(2),
            stack_mm: cell(3),
            window_width_mm: cell(4),
            window_height_mm: cell(5),
            stacking_factor: cell(6),
            steel: text(7),
            mass_g: cell(8),
            volts_per_turn: cell(9),
            notes: text(10),
            added: if full { text(11) } else { String::new() },
        };
        match check_entry(e) {
            Ok((e, _)) => good.push(e),
            Err(problem) => bad.push(BadRow {
                line,
                id: None,
                problem,
            }),
        }
    }
    Ok((good, bad))
}

/// Today's date (UTC) as YYYY-MM-DD, from the system clock (Hinnant's civil-from-days).
pub fn today() -> String {
    let secs = std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .map(|d| d.as_secs())
        .unwrap_or(0);
    civil_date((secs / 86_400) as i64)
}

/// The date (proleptic Gregorian, YYYY-MM-DD) of a day counted from 1970-01-01 (Hinnant's
/// civil-from-days).
pub fn civil_date(days: i64) -> String {
    let z = days + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z.rem_euclid(146_097);
    let yoe = (doe - doe / 1460 + doe / 36_524 - doe / 146_096) / 365;
    let y = yoe + era * 400;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let d = doy - (153 * mp + 2) / 5 + 1;
    let m = if mp < 10 { mp + 3 } else { mp - 9 };
    let y = if m <= 2 { y + 1 } else { y };
    format!("{y:04}-{m:02}-{d:02}")
}

/// One core's result for a job.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Ranked {
    /// Shelf id.
    pub id: u64,
    /// Label.
    pub label: String,
    /// Whether every check of the plan passes.
    pub carries: bool,
    /// Headroom, % (negative when it does not carry).
    pub margin_pct: f64,
    /// What binds (when it carries) or what fails (when it does not).
    pub limit: String,
    /// Total loss at the job's load, W.
    pub loss_w: f64,
    /// Temperature rise, °C.
    pub rise_c: f64,
    /// Copper fill.
    pub copper_fill: f64,
    /// Area product, cm⁴.
    pub area_product_cm4: f64,
}

/// The job as it is planned on a shelf core: the job's own probe and kept windings set aside.
pub fn job_for_shelf(job: &Job) -> Job {
    let mut j = job.clone();
    j.probe = None;
    for w in &mut j.windings {
        w.kept = false;
        w.rated_volts = None;
        w.resistance_ohm = None;
        w.build_mm = None;
    }
    j
}

/// Plans the job on one core and scores it.
pub fn rank_one(job: &mut Job, e: &Entry, v: &CoreValues) -> Ranked {
    job.core = v.dims.clone();
    if let Ok(s) = steel_info(&v.steel) {
        job.steel = s;
    }
    let p = plan(job);
    let t = &p.thermal;
    let allowed = loss_for_rise_w(t.max_rise_c, t.surface_cm2 * job.cooling_factor);
    let p_cu = p.losses.copper_w * job.load_duty;
    let heat = if p_cu > 0.0 && allowed > p.losses.core_w {
        ((allowed - p.losses.core_w) / p_cu).sqrt() - 1.0
    } else if p_cu > 0.0 {
        -1.0
    } else {
        f64::INFINITY
    };
    let window = if p.window.build_mm > 0.0 {
        (p.window.available_mm - p.window.build_mm) / p.window.build_mm
    } else {
        -1.0
    };
    let (margin, binding) = if heat <= window {
        (heat, "heating")
    } else {
        (window, "window")
    };
    let failed = p.verdict.failed();
    let carries = failed.is_empty();
    let margin_pct = if margin.is_finite() {
        margin * 100.0
    } else {
        1e6
    };
    Ranked {
        id: e.id,
        label: e.label.clone(),
        carries,
        margin_pct: if carries {
            margin_pct.max(0.0)
        } else {
            margin_pct.min(0.0)
        },
        limit: if carries {
            binding.to_string()
        } else {
            failed.join(", ")
        },
        loss_w: p.losses.core_w + p.losses.copper_w,
        rise_c: t.rise_c,
        copper_fill: p.window.copper_fill,
        area_product_cm4: p.geometry.area_product_cm4,
    }
}

/// Ranks every core for the job on `threads` threads, calling `progress(done)` now and then. Cores
/// that carry come first, by margin (largest first), then by loss (smallest first); then the rest,
/// least short first.
pub fn rank(
    job: &Job,
    entries: &[(Entry, CoreValues)],
    threads: usize,
    progress: &(dyn Fn(usize) + Sync),
) -> Vec<Ranked> {
    let base = job_for_shelf(job);
    let threads = threads.clamp(1, 16);
    let chunk = entries.len().div_ceil(threads).max(1);
    let done = std::sync::atomic::AtomicUsize::new(0);
    let mut out: Vec<Ranked> = std::thread::scope(|s| {
        let handles: Vec<_> = entries
            .chunks(chunk)
            .map(|part| {
                let mut j = base.clone();
                let done = &done;
                s.spawn(move || {
                    let mut v = Vec::with_capacity(part.len());
                    for (k, (e, c)) in part.iter().enumerate() {
                        v.push(rank_one(&mut j, e, c));
                        if k % 2048 == 2047 {
                            let n =
                                done.fetch_add(2048, std::sync::atomic::Ordering::Relaxed) + 2048;
                            progress(n);
                        }
                    }
                    v
                })
            })
            .collect();
        handles
            .into_iter()
            .flat_map(|h| h.join().unwrap_or_default())
            .collect()
    });
    out.sort_by(|a, b| {
        b.carries
            .cmp(&a.carries)
            .then(b.margin_pct.total_cmp(&a.margin_pct))
            .then(a.loss_w.total_cmp(&b.loss_w))
            .then(a.id.cmp(&b.id))
    });
    out
}

/// The total output VA of a job (for messages).
pub fn job_va(job: &Job) -> f64 {
    crate::plan::output_va(job)
}

/// How `shelf list` orders the cores.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum SortKey {
    /// By id.
    Id,
    /// Largest area product first.
    AreaProduct,
    /// Heaviest first.
    Mass,
    /// Oldest first.
    Date,
}

/// One core as listed: its row, its values and its geometry.
#[derive(Debug, Clone, PartialEq)]
pub struct Listed {
    /// The row as typed.
    pub entry: Entry,
    /// Its values.
    pub values: CoreValues,
    /// Its geometry.
    pub geometry: crate::geometry::CoreGeometry,
}

/// What `shelf list` (and `show`, `export`) report: the cores in order, and the rows that do not read.
#[derive(Debug, Clone, PartialEq)]
pub struct Listing {
    /// The shelf file, for the count line.
    pub origin: String,
    /// The cores, in the order asked for.
    pub cores: Vec<Listed>,
    /// Rows that could not be read.
    pub bad: Vec<BadRow>,
}

/// The shelf's cores in the order asked for (ties by id).
pub fn listing(origin: &str, shelf: &Shelf, sort: SortKey) -> Listing {
    let mut cores: Vec<Listed> = shelf
        .entries
        .iter()
        .map(|(e, v)| Listed {
            entry: e.clone(),
            values: v.clone(),
            geometry: crate::geometry::geometry(&v.dims),
        })
        .collect();
    let by_id = |a: &Listed, b: &Listed| a.entry.id.cmp(&b.entry.id);
    match sort {
        SortKey::Id => cores.sort_by(by_id),
        SortKey::AreaProduct => cores.sort_by(|a, b| {
            b.geometry
                .area_product_cm4
                .total_cmp(&a.geometry.area_product_cm4)
                .then(by_id(a, b))
        }),
        SortKey::Mass => cores.sort_by(|a, b| {
            b.geometry
                .mass_kg
                .total_cmp(&a.geometry.mass_kg)
                .then(by_id(a, b))
        }),
        SortKey::Date => cores.sort_by(|a, b| a.entry.added.cmp(&b.entry.added).then(by_id(a, b))),
    }
    Listing {
        origin: origin.to_string(),
        cores,
        bad: shelf.bad.clone(),
    }
}

/// What `shelf rank` reports.
#[derive(Debug, Clone, PartialEq)]
pub struct Ranking {
    /// The job's name.
    pub job: String,
    /// The job's output VA.
    pub job_va: f64,
    /// Cores on the shelf.
    pub total: usize,
    /// The cores, best first (cut to the top N when asked).
    pub ranked: Vec<Ranked>,
}

/// Ranks the shelf for a job, keeping the best `top`.
pub fn ranking(
    job: &Job,
    shelf: &Shelf,
    top: Option<usize>,
    threads: usize,
    progress: &(dyn Fn(usize) + Sync),
) -> Ranking {
    let mut ranked = rank(job, &shelf.entries, threads, progress);
    if let Some(n) = top {
        ranked.truncate(n);
    }
    Ranking {
        job: job.name.clone(),
        job_va: job_va(job),
        total: shelf.entries.len(),
        ranked,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn entry(label: &str, t: &str) -> Entry {
        Entry {
            id: 1,
            label: label.into(),
            shape: String::new(),
            tongue_mm: t.into(),
            stack_mm: "40".into(),
            window_width_mm: "16".into(),
            window_height_mm: "48".into(),
            stacking_factor: String::new(),
            steel: String::new(),
            mass_g: String::new(),
            volts_per_turn: String::new(),
            notes: String::new(),
            added: String::new(),
        }
    }

    #[test]
    fn exact_decimals_round_trip() {
        let (e, v) = check_entry(entry("a", "31.50")).expect("good");
        assert_eq!(e.tongue_mm, "31.50");
        assert_eq!(v.dims.tongue_mm, 31.5);
        assert_eq!(e.stacking_factor, "0.95");
        let text = shelf_text(std::slice::from_ref(&e));
        let back = parse_shelf("s.csv", &text).expect("parses");
        assert_eq!(back.entries[0].0, e);
        let (e, v) = check_entry(entry("b", "1.25 in")).expect("inches");
        assert_eq!(e.tongue_mm, "1.25 in");
        assert!((v.dims.tongue_mm - 31.75).abs() < 1e-12);
    }

    #[test]
    fn bad_cells_are_named() {
        for (t, needle) in [
            ("abc", "tongue_mm"),
            ("1,25", "tongue_mm"),
            ("-3", "tongue_mm"),
            ("NaN", "tongue_mm"),
            ("5000", "tongue_mm"),
        ] {
            let err = check_entry(entry("x", t)).expect_err("bad");
            assert!(err.contains(needle), "{err}");
        }
        assert!(check_entry(entry("", "30")).is_err());
    }

    #[test]
    fn formula_cells_are_neutralised() {
        // OWASP CSV injection: =, +, -, @, tab, carriage return.
        for c in ["=1+1", "+1", "-1", "@SUM(A1)", "\tx", "\rx"] {
            assert!(neutralise(c).starts_with('\''), "{c:?}");
        }
        assert_eq!(neutralise("grey core"), "grey core");
    }

    #[test]
    fn bad_rows_do_not_hide_good_ones() {
        let text = "id,label,shape,tongue_mm,stack_mm,window_width_mm,window_height_mm,stacking_factor,steel,mass_g,volts_per_turn,notes,added\n1,a,ei,30,40,15,45,0.95,unknown,,,,2026-01-01\n2,b,ei,abc,40,15,45,0.95,unknown,,,,2026-01-01\n3,c,ei,30,40,15,45\n";
        let s = parse_shelf("s.csv", text).expect("reads");
        assert_eq!(s.entries.len(), 1);
        assert_eq!(s.bad.iter().map(|b| b.line).collect::<Vec<_>>(), vec![3, 4]);
        // Ids of bad rows are not reused: row 3 (id 3) is bad but its id is taken.
        assert_eq!(s.next_id(), 4);
    }

    #[test]
    fn today_is_a_date() {
        let d = today();
        assert_eq!(d.len(), 10);
        assert!(d.starts_with("20"));
    }

    #[test]
    fn day_counts_give_calendar_dates() {
        // Day counts from 1970-01-01 of known dates (proleptic Gregorian calendar, as computed by
        // any general date library): leap days of a 400-year century and not of a 100-year one.
        for (days, date) in [
            (0, "1970-01-01"),
            (-1, "1969-12-31"),
            (11_016, "2000-02-29"),
            (11_017, "2000-03-01"),
            (-25_508, "1900-03-01"),
            (47_540, "2100-02-28"),
            (20_088, "2024-12-31"),
            (20_789, "2026-12-02"),
        ] {
            assert_eq!(civil_date(days), date, "day {days}");
        }
    }
}
