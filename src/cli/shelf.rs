//! `ironwind shelf …`: the inventory of measured donor cores.

use super::{load_job, note, out_err, Ctx, ShapeArg, TextJson};
use crate::error::{Error, Result};
use crate::flags::ORIGIN;
use crate::render::{self, Format};
use crate::shelf::{check_entry, listing, parse_import, ranking, today, Entry, Shelf, SortKey};
use crate::store;
use clap::{Subcommand, ValueEnum};
use std::io::{IsTerminal, Write};
use std::path::{Path, PathBuf};

/// Arguments of `ironwind shelf`.
#[derive(Debug, clap::Args)]
pub(super) struct Args {
    /// The shelf file (default: $IRONWIND_SHELF, else shelf.csv in the platform's data folder)
    #[arg(long, global = true)]
    shelf: Option<PathBuf>,
    #[command(subcommand)]
    action: Action,
}

#[derive(Debug, clap::Args, Default)]
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
enum ExportFormat {
    Csv,
    Json,
}

#[derive(Debug, Clone, Copy, ValueEnum, PartialEq, Eq)]
enum SortArg {
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
        #[arg(long, value_enum, default_value_t = SortArg::Id)]
        sort: SortArg,
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

impl ListFormat {
    fn format(self) -> Format {
        match self {
            ListFormat::Text => Format::Text,
            ListFormat::Json => Format::Json,
            ListFormat::Csv => Format::Csv,
        }
    }
}

impl SortArg {
    fn key(self) -> SortKey {
        match self {
            SortArg::Id => SortKey::Id,
            SortArg::AreaProduct => SortKey::AreaProduct,
            SortArg::Mass => SortKey::Mass,
            SortArg::Date => SortKey::Date,
        }
    }
}

fn warn_bad(ctx: &Ctx, path: &str, shelf: &Shelf) {
    for b in &shelf.bad {
        note(ctx, &render::shelf::bad_row_warning(path, b));
    }
}

/// Runs a shelf command.
pub(super) fn run(out: &mut dyn Write, args: Args, ctx: &Ctx) -> Result<i32> {
    let path = store::locate(args.shelf.as_deref())?;
    let name = path.display().to_string();
    let look = &ctx.look;
    match args.action {
        Action::Add { core, from, format } => {
            let id = add(&path, &name, &core, from.as_deref())?;
            render::shelf::write_added(out, id, format.format()).map_err(out_err)?;
        }
        Action::List { sort, format } => {
            if sort == SortArg::Id && list_streamed(ctx, out, &path, &name, format.format())? {
                return Ok(0);
            }
            let shelf = store::read(&path)?;
            warn_bad(ctx, &name, &shelf);
            let l = listing(&name, &shelf, sort.key());
            render::shelf::write_list(out, &l, format.format(), look).map_err(out_err)?;
        }
        Action::Show { id, format } => {
            let shelf = store::read(&path)?;
            let l = listing(&name, &shelf, SortKey::Id);
            let Some(c) = l.cores.iter().find(|c| c.entry.id == id) else {
                return Err(not_found(&name, id, &shelf));
            };
            render::shelf::write_show(out, c, format.format(), look).map_err(out_err)?;
        }
        Action::Edit { id, core } => {
            edit(&path, &name, id, &core)?;
            render::shelf::write_done(out, "edited", id).map_err(out_err)?;
        }
        Action::Remove { id } => {
            remove(&path, &name, id)?;
            render::shelf::write_done(out, "removed", id).map_err(out_err)?;
        }
        Action::Export { format } => {
            let shelf = store::read(&path)?;
            warn_bad(ctx, &name, &shelf);
            let f = match format {
                ExportFormat::Csv => Format::Csv,
                ExportFormat::Json => Format::Json,
            };
            let l = listing(&name, &shelf, SortKey::Id);
            render::shelf::write_export(out, &l, f).map_err(out_err)?;
        }
        Action::Import { file, skip_bad } => {
            let (ids, skipped) = import(ctx, &path, &name, &file, skip_bad)?;
            render::shelf::write_imported(out, &ids, skipped).map_err(out_err)?;
        }
        Action::Rank { job, top, format } => {
            let job = load_job(&job)?;
            let shelf = store::read(&path)?;
            warn_bad(ctx, &name, &shelf);
            let r = rank(ctx, &job, &shelf, top);
            render::shelf::write_rank(out, &r, format.format(), look).map_err(out_err)?;
        }
    }
    Ok(0)
}

/// Shelves of more than this many cores are listed as they are read.
const STREAM_FROM: usize = 5000;

/// Lists a large shelf in id order without holding it: a quick first pass counts the rows, checks
/// they are in id order and measures the text columns from the cells as typed; a second checks
/// each row and writes it as it is read. False (nothing written) for a small shelf or one out of id
/// order, which the ordinary listing handles.
fn list_streamed(
    ctx: &Ctx,
    out: &mut dyn Write,
    path: &Path,
    name: &str,
    format: Format,
) -> Result<bool> {
    let (mut rows, mut last, mut ordered) = (0usize, 0u64, true);
    // Columns measured from the cells as typed; the computed ones (Ap, mass) are at most 9 wide.
    let mut widths = vec![0usize; 9];
    store::scan(path, |id, rec| {
        rows += 1;
        let id = id.unwrap_or(0);
        ordered &= id > last;
        last = id;
        let cell = |k: usize| rec.get(k).unwrap_or("");
        let w = [
            cell(0).len(),
            cell(1).chars().count(),
            cell(2).len(),
            cell(3).chars().count() + cell(4).chars().count() + 3,
            cell(5).chars().count() + cell(6).chars().count() + 3,
            9,
            9,
            cell(10).chars().count(),
            cell(12).chars().count(),
        ];
        for (m, x) in widths.iter_mut().zip(w) {
            *m = (*m).max(x);
        }
    })?;
    if rows <= STREAM_FROM || !ordered {
        return Ok(false);
    }
    let listed = |(e, v): (Entry, crate::shelf::CoreValues)| crate::shelf::Listed {
        geometry: crate::geometry::geometry(&v.dims),
        entry: e,
        values: v,
    };
    let mut s = render::shelf::ListStream::new(format, widths, &ctx.look);
    s.head(out).map_err(out_err)?;
    let (mut count, mut bad, mut failed) = (0usize, Vec::new(), None);
    store::stream(path, |row| match row {
        Ok(ev) if failed.is_none() => {
            count += 1;
            if let Err(e) = s.row(out, &listed(ev)) {
                failed = Some(e);
            }
        }
        Ok(_) => {}
        Err(b) => {
            if bad.len() < 1000 {
                bad.push(b);
            }
        }
    })?;
    if let Some(e) = failed {
        return Err(out_err(e));
    }
    s.tail(out, count, name, &bad).map_err(out_err)?;
    for b in &bad {
        note(ctx, &render::shelf::bad_row_warning(name, b));
    }
    Ok(true)
}

/// Adds a core from flags or from a job file; returns its id.
fn add(path: &Path, name: &str, core: &CoreFlags, from: Option<&Path>) -> Result<u64> {
    let mut e = Entry {
        added: today(),
        shape: "ei".into(),
        ..Default::default()
    };
    if let Some(job_path) = from {
        let job = load_job(job_path)?;
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
                return Err(Error::bad_value(
                    ORIGIN,
                    flag,
                    "(missing)",
                    "shelf add needs --label, --tongue, --stack and --window (or --from JOB.toml)",
                ));
            }
        }
    }
    apply(&mut e, core)?;
    let e = checked(e)?;
    store::update(path, |shelf| {
        refuse_if_bad(name, shelf)?;
        let id = shelf.ids_from(1).ok_or_else(|| ids_run_out(name))?;
        let mut entries: Vec<Entry> = shelf.entries.iter().map(|(e, _)| e.clone()).collect();
        entries.push(Entry { id, ..e });
        Ok((entries, id))
    })
}

fn edit(path: &Path, name: &str, id: u64, core: &CoreFlags) -> Result<()> {
    store::update(path, |shelf| {
        refuse_if_bad(name, shelf)?;
        let mut entries: Vec<Entry> = shelf.entries.iter().map(|(e, _)| e.clone()).collect();
        let Some(e) = entries.iter_mut().find(|e| e.id == id) else {
            return Err(not_found(name, id, shelf));
        };
        apply(e, core)?;
        *e = checked(e.clone())?;
        Ok((entries, ()))
    })
}

fn remove(path: &Path, name: &str, id: u64) -> Result<()> {
    store::update(path, |shelf| {
        let known = shelf.entries.iter().any(|(e, _)| e.id == id)
            || shelf.bad.iter().any(|b| b.id == Some(id));
        if !known {
            return Err(not_found(name, id, shelf));
        }
        // The bad rows other than this one still stop a rewrite.
        if let Some(b) = shelf.bad.iter().find(|b| b.id != Some(id)) {
            return Err(Error::bad_input(
                name,
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
    })
}

/// Imports the good rows of a CSV file (all or nothing unless `skip_bad`); the new ids and how many
/// rows were skipped.
fn import(
    ctx: &Ctx,
    path: &Path,
    name: &str,
    file: &Path,
    skip_bad: bool,
) -> Result<(Vec<u64>, usize)> {
    let fname = file.display().to_string();
    let text = crate::input::read_text(file)?;
    let (good, bad) = parse_import(&fname, &text)?;
    if let (Some(b), false) = (bad.first(), skip_bad) {
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
    for b in &bad {
        note(ctx, &render::shelf::skipped_row_warning(&fname, b));
    }
    let ids = store::update(path, |shelf| {
        refuse_if_bad(name, shelf)?;
        let mut entries: Vec<Entry> = shelf.entries.iter().map(|(e, _)| e.clone()).collect();
        let mut ids = Vec::new();
        let first = shelf
            .ids_from(good.len() as u64)
            .ok_or_else(|| ids_run_out(name))?;
        for (id, e) in (first..).zip(good) {
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
    Ok((ids, bad.len()))
}

/// Ranks the shelf for a job on every processor, with a progress bar on a terminal.
fn rank(
    ctx: &Ctx,
    job: &crate::job::Job,
    shelf: &Shelf,
    top: Option<usize>,
) -> crate::shelf::Ranking {
    let total = shelf.entries.len();
    // A bar for long ranks on a terminal; silent when the output is piped or redirected.
    let show_progress = std::io::stderr().is_terminal()
        && std::io::stdout().is_terminal()
        && total >= 20_000
        && !ctx.quiet;
    let progress = |done: usize| {
        if show_progress {
            let _ = write!(
                std::io::stderr(),
                "\r{}",
                render::shelf::progress_line(done, total)
            );
        }
    };
    let threads = std::thread::available_parallelism()
        .map(|n| n.get())
        .unwrap_or(1);
    let r = ranking(job, shelf, top, threads, &progress);
    if show_progress {
        let _ = writeln!(
            std::io::stderr(),
            "\r{}",
            render::shelf::progress_done(total)
        );
    }
    r
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
                ORIGIN,
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
        Error::bad_input(ORIGIN, format!("{}: {}", flag_for(field), rest))
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

fn not_found(name: &str, id: u64, shelf: &Shelf) -> Error {
    let n = shelf.entries.len();
    Error::bad_value(
        name,
        "id",
        id,
        format!("no core with that id on the shelf ({n} cores; `ironwind shelf list` shows them)"),
    )
}

fn ids_run_out(name: &str) -> Error {
    Error::bad_input(
        name,
        format!(
            "the largest id on the shelf leaves no room for new ones (ids stop at {}); edit that row's id to a small free number",
            u64::MAX
        ),
    )
}
