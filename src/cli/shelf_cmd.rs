//! `ironwind shelf …`: the inventory of measured donor cores.

use super::{load_job, out_err, read_text, ShapeArg};
use crate::error::{Error, Result};
use crate::geometry::geometry;
use crate::render::{self, num, Charset};
use crate::shelf::{
    check_entry, export_csv, parse_import, rank, today, BadRow, CoreValues, Entry, Shelf,
};
use crate::store;
use clap::{Args, Subcommand, ValueEnum};
use std::io::{IsTerminal, Write};
use std::path::PathBuf;

/// Arguments of `ironwind shelf`.
#[derive(Debug, Args)]
pub struct ShelfArgs {
    /// The shelf file (default: $IRONWIND_SHELF, else $XDG_DATA_HOME/ironwind/shelf.csv)
    #[arg(long, global = true)]
    shelf: Option<PathBuf>,
    #[command(subcommand)]
    action: Action,
}

#[derive(Debug, Args, Default)]
struct CoreFlags {
    /// A label to know the core by
    #[arg(long, allow_hyphen_values = true)]
    label: Option<String>,
    /// Tongue width, mm or with a unit ("1.25 in")
    #[arg(long)]
    tongue: Option<String>,
    /// Stack depth, mm or with a unit
    #[arg(long)]
    stack: Option<String>,
    /// One window, WIDTHxHEIGHT in mm (e.g. 19x57)
    #[arg(long)]
    window: Option<String>,
    /// Lamination shape
    #[arg(long, value_enum)]
    shape: Option<ShapeArg>,
    /// Stacking factor, > 0.5 and ≤ 1 (default 0.95)
    #[arg(long)]
    stacking: Option<String>,
    /// Steel: unknown, non-oriented, grain-oriented or a grade like M400-50A
    #[arg(long)]
    steel: Option<String>,
    /// Weighed mass of the core, g
    #[arg(long)]
    mass_g: Option<String>,
    /// Free notes
    #[arg(long, allow_hyphen_values = true)]
    notes: Option<String>,
    /// Measured volts per turn (from a test winding), V
    #[arg(long)]
    volts_per_turn: Option<String>,
}

#[derive(Debug, Clone, Copy, ValueEnum, PartialEq, Eq)]
enum ListFormat {
    Text,
    Json,
    Csv,
}

#[derive(Debug, Clone, Copy, ValueEnum, PartialEq, Eq)]
enum TextJson {
    Text,
    Json,
}

#[derive(Debug, Clone, Copy, ValueEnum, PartialEq, Eq)]
enum ExportFormat {
    Csv,
    Json,
}

#[derive(Debug, Clone, Copy, ValueEnum, PartialEq, Eq)]
enum SortKey {
    Id,
    AreaProduct,
    Mass,
    Date,
}

#[derive(Debug, Subcommand)]
enum Action {
    /// Add a measured core; prints its id
    #[command(
        allow_negative_numbers = true,
        after_help = "Examples:\n  ironwind shelf add --label \"grey core\" --tongue 38 --stack 62 --window 19x57\n  ironwind shelf add --from examples/ups_donor_inverter.toml --label \"UPS donor\""
    )]
    Add {
        #[command(flatten)]
        core: CoreFlags,
        /// Take the core (and the probe's volts per turn) from a job file
        #[arg(long)]
        from: Option<PathBuf>,
        /// Output format
        #[arg(long, value_enum, default_value_t = TextJson::Text)]
        format: TextJson,
    },
    /// List the cores
    #[command(after_help = "Example:\n  ironwind shelf list --sort area-product")]
    List {
        /// Sort by
        #[arg(long, value_enum, default_value_t = SortKey::Id)]
        sort: SortKey,
        /// Output format
        #[arg(long, value_enum, default_value_t = ListFormat::Text)]
        format: ListFormat,
    },
    /// Show one core with its geometry
    #[command(after_help = "Example:\n  ironwind shelf show 3")]
    Show {
        /// The core's id
        id: u64,
        /// Output format
        #[arg(long, value_enum, default_value_t = TextJson::Text)]
        format: TextJson,
    },
    /// Change a core's measurements or notes
    #[command(
        allow_negative_numbers = true,
        after_help = "Example:\n  ironwind shelf edit 3 --stack 64 --notes \"re-measured\""
    )]
    Edit {
        /// The core's id
        id: u64,
        #[command(flatten)]
        core: CoreFlags,
    },
    /// Remove a core (also a row that no longer reads)
    #[command(after_help = "Example:\n  ironwind shelf remove 3")]
    Remove {
        /// The core's id
        id: u64,
    },
    /// Write the whole shelf (CSV cells safe for spreadsheets)
    #[command(after_help = "Example:\n  ironwind shelf export --format csv > cores.csv")]
    Export {
        /// Output format
        #[arg(long, value_enum, default_value_t = ExportFormat::Csv)]
        format: ExportFormat,
    },
    /// Add cores from a CSV file (header label,shape,tongue_mm,stack_mm,window_width_mm,window_height_mm,stacking_factor,steel,mass_g,volts_per_turn,notes)
    #[command(after_help = "Example:\n  ironwind shelf import cores.csv --skip-bad")]
    Import {
        /// The CSV file
        file: PathBuf,
        /// Import the good rows and report the bad ones, instead of importing nothing
        #[arg(long)]
        skip_bad: bool,
    },
    /// Plan a job on every core and list the cores that carry it, best first
    #[command(after_help = "Example:\n  ironwind shelf rank examples/garage_charger.toml --top 5")]
    Rank {
        /// The job file (TOML)
        job: PathBuf,
        /// Show only the best N
        #[arg(long)]
        top: Option<usize>,
        /// Output format
        #[arg(long, value_enum, default_value_t = TextJson::Text)]
        format: TextJson,
    },
}

fn warn_bad(path: &str, bad: &[BadRow]) {
    if super::quiet() {
        return;
    }
    for b in bad {
        eprintln!(
            "warning: {path}: line {}: {} (the row is skipped; fix or remove it)",
            b.line, b.problem
        );
    }
}

fn refuse_if_bad(path: &str, shelf: &Shelf) -> Result<()> {
    match shelf.bad.first() {
        None => Ok(()),
        Some(b) => Err(Error::bad_input(
            path,
            format!(
                "line {}: {}; the shelf is not rewritten while a row is bad: fix it by hand or `ironwind shelf remove {}`",
                b.line,
                b.problem,
                b.id.map(|i| i.to_string()).unwrap_or_else(|| "ID".into())
            ),
        )),
    }
}

fn apply(e: &mut Entry, f: &CoreFlags) -> Result<()> {
    if let Some(v) = &f.label {
        e.label = v.clone();
    }
    if let Some(v) = &f.tongue {
        e.tongue_mm = v.clone();
    }
    if let Some(v) = &f.stack {
        e.stack_mm = v.clone();
    }
    if let Some(v) = &f.window {
        let lower = v.to_ascii_lowercase();
        let parts: Vec<&str> = lower.split(['x', '×']).map(str::trim).collect();
        if parts.len() != 2 {
            return Err(Error::bad_value(
                "command line",
                "--window",
                format!("\"{v}\""),
                "expected WIDTHxHEIGHT in mm, like 19x57",
            ));
        }
        e.window_width_mm = parts[0].to_string();
        e.window_height_mm = parts[1].to_string();
    }
    if let Some(v) = f.shape {
        e.shape = if v == ShapeArg::Ui { "ui" } else { "ei" }.to_string();
    }
    if let Some(v) = &f.stacking {
        e.stacking_factor = v.clone();
    }
    if let Some(v) = &f.steel {
        e.steel = v.clone();
    }
    if let Some(v) = &f.mass_g {
        e.mass_g = v.clone();
    }
    if let Some(v) = &f.notes {
        e.notes = v.clone();
    }
    if let Some(v) = &f.volts_per_turn {
        e.volts_per_turn = v.clone();
    }
    Ok(())
}

fn checked(e: Entry) -> Result<Entry> {
    check_entry(e).map(|(e, _)| e).map_err(|m| {
        let (field, rest) = m
            .split_once(" = ")
            .or_else(|| m.split_once(": "))
            .unwrap_or(("core", m.as_str()));
        Error::bad_input("command line", format!("{}: {}", flag_for(field), rest))
    })
}

fn flag_for(field: &str) -> String {
    match field {
        "tongue_mm" => "--tongue".into(),
        "stack_mm" => "--stack".into(),
        "window_width_mm" | "window_height_mm" => "--window".into(),
        "stacking_factor" => "--stacking".into(),
        "mass_g" => "--mass-g".into(),
        "volts_per_turn" => "--volts-per-turn".into(),
        "label" | "label is empty" => "--label".into(),
        other => format!(
            "--{}",
            other
                .split_whitespace()
                .next()
                .unwrap_or(other)
                .replace('_', "-")
        ),
    }
}

#[derive(serde::Serialize)]
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

fn core_json<'a>(e: &'a Entry, v: &CoreValues) -> CoreJson<'a> {
    let g = geometry(&v.dims);
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

/// Runs a shelf command.
pub fn run(out: &mut dyn Write, args: ShelfArgs, cs: Charset) -> Result<i32> {
    let path = store::locate(args.shelf.as_deref())?;
    let name = path.display().to_string();
    let w = |out: &mut dyn Write, s: &str| out.write_all(s.as_bytes()).map_err(out_err);
    match args.action {
        Action::Add { core, from, format } => {
            let mut e = Entry {
                added: today(),
                shape: "ei".into(),
                ..Default::default()
            };
            if let Some(job_path) = &from {
                let (job, _) = load_job(job_path)?;
                e.label = job.name.clone();
                e.shape = job.core.shape.name().to_string();
                e.tongue_mm = job.core_text[0].clone();
                e.stack_mm = job.core_text[1].clone();
                e.window_width_mm = job.core_text[2].clone();
                e.window_height_mm = job.core_text[3].clone();
                e.stacking_factor = format!("{}", job.core.stacking_factor);
                e.steel = job.steel.name.clone();
                e.mass_g = job
                    .core
                    .measured_mass_kg
                    .map(|m| format!("{}", m * 1000.0))
                    .unwrap_or_default();
                e.volts_per_turn = job
                    .probe
                    .as_ref()
                    .and_then(|p| p.test.as_ref())
                    .map(|t| format!("{}", t.volts_per_turn()))
                    .unwrap_or_default();
            } else {
                for (flag, v) in [
                    ("--label", &core.label),
                    ("--tongue", &core.tongue),
                    ("--stack", &core.stack),
                    ("--window", &core.window),
                ] {
                    if v.is_none() {
                        return Err(Error::bad_value("command line", flag, "(missing)", "shelf add needs --label, --tongue, --stack and --window (or --from JOB.toml)"));
                    }
                }
            }
            apply(&mut e, &core)?;
            let e = checked(e)?;
            let id = store::update(&path, |shelf| {
                refuse_if_bad(&name, shelf)?;
                let id = shelf.next_id();
                let mut entries: Vec<Entry> =
                    shelf.entries.iter().map(|(e, _)| e.clone()).collect();
                entries.push(Entry { id, ..e });
                Ok((entries, id))
            })?;
            match format {
                TextJson::Json => render::json::write_json(out, &serde_json::json!({ "id": id }))
                    .map_err(out_err)?,
                TextJson::Text => w(out, &format!("{id}\n"))?,
            }
        }
        Action::List { sort, format } => {
            let shelf = store::read(&path)?;
            warn_bad(&name, &shelf.bad);
            let mut rows: Vec<&(Entry, CoreValues)> = shelf.entries.iter().collect();
            let ap = |v: &CoreValues| geometry(&v.dims).area_product_cm4;
            let mass = |v: &CoreValues| geometry(&v.dims).mass_kg;
            match sort {
                SortKey::Id => rows.sort_by_key(|(e, _)| e.id),
                SortKey::AreaProduct => {
                    rows.sort_by(|a, b| ap(&b.1).total_cmp(&ap(&a.1)).then(a.0.id.cmp(&b.0.id)))
                }
                SortKey::Mass => {
                    rows.sort_by(|a, b| mass(&b.1).total_cmp(&mass(&a.1)).then(a.0.id.cmp(&b.0.id)))
                }
                SortKey::Date => {
                    rows.sort_by(|a, b| a.0.added.cmp(&b.0.added).then(a.0.id.cmp(&b.0.id)))
                }
            }
            match format {
                ListFormat::Json => {
                    let cores: Vec<CoreJson> = rows.iter().map(|(e, v)| core_json(e, v)).collect();
                    render::json::write_json(
                        out,
                        &serde_json::json!({ "cores": cores, "bad_rows": shelf.bad }),
                    )
                    .map_err(out_err)?;
                }
                ListFormat::Csv => {
                    let entries: Vec<Entry> = rows.iter().map(|(e, _)| e.clone()).collect();
                    w(out, &export_csv(&entries))?;
                }
                ListFormat::Text => {
                    let mut t = vec![vec![
                        "id".to_string(),
                        "label".into(),
                        "shape".into(),
                        "tongue × stack mm".into(),
                        "window mm".into(),
                        "Ap cm⁴".into(),
                        "mass kg".into(),
                        "V/turn".into(),
                        "added".into(),
                    ]];
                    for (e, v) in &rows {
                        let g = geometry(&v.dims);
                        t.push(vec![
                            e.id.to_string(),
                            e.label.clone(),
                            e.shape.clone(),
                            format!("{} × {}", e.tongue_mm, e.stack_mm),
                            format!("{} × {}", e.window_width_mm, e.window_height_mm),
                            num(g.area_product_cm4, 1),
                            num(g.mass_kg, 2),
                            e.volts_per_turn.clone(),
                            e.added.clone(),
                        ]);
                    }
                    let s = render::table(t, 5, cs);
                    let s = render::fold(cs, s);
                    w(out, &format!("{s}{} cores on {name}\n", rows.len()))?;
                }
            }
        }
        Action::Show { id, format } => {
            let shelf = store::read(&path)?;
            let Some((e, v)) = shelf.entries.iter().find(|(e, _)| e.id == id) else {
                return Err(not_found(&name, id, &shelf));
            };
            match format {
                TextJson::Json => {
                    render::json::write_json(out, &core_json(e, v)).map_err(out_err)?
                }
                TextJson::Text => {
                    let g = geometry(&v.dims);
                    let s = render::pairs(
                        &[
                            ("id", e.id.to_string()),
                            ("label", e.label.clone()),
                            ("shape", e.shape.clone()),
                            (
                                "tongue × stack",
                                format!(
                                    "{} × {} (mm unless a unit is given)",
                                    e.tongue_mm, e.stack_mm
                                ),
                            ),
                            (
                                "window w × h",
                                format!("{} × {}", e.window_width_mm, e.window_height_mm),
                            ),
                            ("stacking factor", e.stacking_factor.clone()),
                            ("steel", e.steel.clone()),
                            ("Ae net", format!("{} mm²", num(g.area_net_mm2, 1))),
                            ("Aw", format!("{} mm²", num(g.window_area_mm2, 1))),
                            (
                                "area product",
                                format!("{} cm⁴", num(g.area_product_cm4, 2)),
                            ),
                            (
                                "mass",
                                format!(
                                    "{} kg{}",
                                    num(g.mass_kg, 3),
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
                                    format!("{} V", e.volts_per_turn)
                                },
                            ),
                            ("notes", e.notes.clone()),
                            ("added", e.added.clone()),
                        ],
                        cs,
                    );
                    let s = render::fold(cs, s);
                    w(out, &s)?;
                }
            }
        }
        Action::Edit { id, core } => {
            store::update(&path, |shelf| {
                refuse_if_bad(&name, shelf)?;
                let mut entries: Vec<Entry> =
                    shelf.entries.iter().map(|(e, _)| e.clone()).collect();
                let Some(e) = entries.iter_mut().find(|e| e.id == id) else {
                    return Err(not_found(&name, id, shelf));
                };
                apply(e, &core)?;
                *e = checked(e.clone())?;
                Ok((entries, ()))
            })?;
            w(out, &format!("edited {id}\n"))?;
        }
        Action::Remove { id } => {
            store::update(&path, |shelf| {
                let known = shelf.entries.iter().any(|(e, _)| e.id == id)
                    || shelf.bad.iter().any(|b| b.id == Some(id));
                if !known {
                    return Err(not_found(&name, id, shelf));
                }
                // The bad rows other than this one still stop a rewrite.
                if let Some(b) = shelf.bad.iter().find(|b| b.id != Some(id)) {
                    return Err(Error::bad_input(
                        &name,
                        format!("line {}: {}; fix that row by hand first", b.line, b.problem),
                    ));
                }
                Ok((
                    shelf
                        .entries
                        .iter()
                        .filter(|(e, _)| e.id != id)
                        .map(|(e, _)| e.clone())
                        .collect(),
                    (),
                ))
            })?;
            w(out, &format!("removed {id}\n"))?;
        }
        Action::Export { format } => {
            let shelf = store::read(&path)?;
            warn_bad(&name, &shelf.bad);
            let entries: Vec<Entry> = shelf.entries.iter().map(|(e, _)| e.clone()).collect();
            match format {
                ExportFormat::Csv => w(out, &export_csv(&entries))?,
                ExportFormat::Json => {
                    let cores: Vec<CoreJson> =
                        shelf.entries.iter().map(|(e, v)| core_json(e, v)).collect();
                    render::json::write_json(out, &serde_json::json!({ "cores": cores }))
                        .map_err(out_err)?
                }
            }
        }
        Action::Import { file, skip_bad } => {
            let fname = file.display().to_string();
            let text = read_text(&file)?;
            let (good, bad) = parse_import(&fname, &text)?;
            if !bad.is_empty() && !skip_bad {
                let b = &bad[0];
                let more = if bad.len() > 1 {
                    format!(
                        "; {} more bad rows (lines {})",
                        bad.len() - 1,
                        bad[1..]
                            .iter()
                            .map(|b| b.line.to_string())
                            .collect::<Vec<_>>()
                            .join(", ")
                    )
                } else {
                    String::new()
                };
                return Err(Error::bad_input(
                    &fname,
                    format!(
                        "line {}: {}{more}; nothing imported (--skip-bad imports the good rows)",
                        b.line, b.problem
                    ),
                ));
            }
            for b in bad.iter().filter(|_| !super::quiet()) {
                eprintln!("warning: {fname}: line {}: {} (skipped)", b.line, b.problem);
            }
            let n = good.len();
            let ids = store::update(&path, |shelf| {
                refuse_if_bad(&name, shelf)?;
                let mut entries: Vec<Entry> =
                    shelf.entries.iter().map(|(e, _)| e.clone()).collect();
                let mut ids = Vec::new();
                for (id, e) in (shelf.next_id()..).zip(good) {
                    ids.push(id);
                    let added = if e.added.is_empty() {
                        today()
                    } else {
                        e.added.clone()
                    };
                    entries.push(Entry { id, added, ..e });
                }
                Ok((entries, ids))
            })?;
            w(
                out,
                &format!(
                    "imported {n} cores (ids {}), skipped {}\n",
                    ids_text(&ids),
                    bad.len()
                ),
            )?;
        }
        Action::Rank { job, top, format } => {
            let (job, _) = load_job(&job)?;
            let shelf = store::read(&path)?;
            warn_bad(&name, &shelf.bad);
            let total = shelf.entries.len();
            // A bar for long ranks on a terminal; silent when the output is piped or redirected.
            let show_progress = std::io::stderr().is_terminal()
                && std::io::stdout().is_terminal()
                && total >= 20_000
                && !super::quiet();
            let progress = |done: usize| {
                if show_progress {
                    let pct = done * 100 / total.max(1);
                    let bar = "#".repeat(pct / 4);
                    eprint!("\rranking {done}/{total} [{bar:<25}] {pct}%");
                }
            };
            let threads = std::thread::available_parallelism()
                .map(|n| n.get())
                .unwrap_or(1);
            let mut ranked = rank(&job, &shelf.entries, threads, &progress);
            if show_progress {
                eprintln!("\rranked {total} cores{}", " ".repeat(30));
            }
            if let Some(n) = top {
                ranked.truncate(n);
            }
            match format {
                TextJson::Json => render::json::write_json(
                    out,
                    &serde_json::json!({ "job": job.name, "cores": total, "ranked": ranked }),
                )
                .map_err(out_err)?,
                TextJson::Text => {
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
                    for (k, r) in ranked.iter().enumerate() {
                        t.push(vec![
                            (k + 1).to_string(),
                            r.id.to_string(),
                            r.label.clone(),
                            if r.carries { "yes".into() } else { "no".into() },
                            num(r.margin_pct.min(99_999.0), 0),
                            r.limit.clone(),
                            num(r.loss_w, 1),
                            num(r.rise_c, 0),
                            num(r.copper_fill, 2),
                        ]);
                    }
                    let s = render::table(t, 99, cs);
                    let s = render::fold(cs, s);
                    let carrying = ranked.iter().filter(|r| r.carries).count();
                    w(
                        out,
                        &format!(
                            "\"{}\" ({} VA) on {total} cores: {carrying} shown carry it\n{s}",
                            job.name,
                            num(crate::shelf::job_va(&job), 0)
                        ),
                    )?;
                }
            }
        }
    }
    Ok(0)
}

fn ids_text(ids: &[u64]) -> String {
    match (ids.first(), ids.last()) {
        (Some(a), Some(b)) if a != b => format!("{a}–{b}"),
        (Some(a), _) => a.to_string(),
        _ => "none".into(),
    }
}

fn not_found(name: &str, id: u64, shelf: &Shelf) -> Error {
    let n = shelf.entries.len();
    Error::bad_value(
        name,
        "id",
        id,
        format!("no core with that id on the shelf ({n} cores; `ironwind shelf list` shows them)"),
    )
}
