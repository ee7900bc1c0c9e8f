//! The command line: clap structs, files, stdout and stderr, exit codes.
//!
//! This is the only module that touches the terminal and writes files. Each command is one file
//! here, with its arguments and a `run` that parses, reads, calls the library for its report and
//! hands the report to its renderer in `render/` (STYLE.md: a thin CLI over a pure library).

use crate::error::{Error, Result};
use crate::job::{parse_job, Job};
use crate::probe::{read_sweep, SweepPoint};
use crate::render::{Charset, Format, Look, Units};
use clap::{CommandFactory, FromArgMatches, Parser, Subcommand, ValueEnum};
use std::io::{IsTerminal, Write};
use std::path::Path;

mod card;
mod completions;
mod core;
mod demo;
mod diagnose;
mod example;
mod manpage;
mod new;
mod plan;
mod probe;
mod rate;
mod shelf;
mod wire;

/// The bundled demo job.
pub const DEMO_JOB: &str = include_str!("../../examples/garage_charger.toml");

#[derive(Debug, Parser)]
#[command(
    name = "ironwind",
    version = version_text(),
    about = "Plans the rewinding of salvaged laminated transformer cores: turns, wire, layers, fit, losses, heating.",
    after_help = "Examples:\n  ironwind demo\n  ironwind plan examples/garage_charger.toml --format json\n  ironwind core --tongue 32 --stack 40 --window 16x48\n  ironwind wire --amps 12 --density 3"
)]
struct Cli {
    /// Plain ASCII output (no box drawing, no symbols)
    #[arg(long, global = true)]
    ascii: bool,
    /// Data only: no warnings, notes or progress on stderr (errors still show)
    #[arg(long, short, global = true)]
    quiet: bool,
    /// Colour: auto (on a terminal, unless NO_COLOR is set), always or never
    #[arg(long, value_enum, global = true, default_value_t = ColorArg::Auto)]
    color: ColorArg,
    /// Units shown first in text output: metric (mm, m) or imperial (in, ft; AWG beside metric wire).
    /// Input accepts both always
    #[arg(long, value_enum, global = true, default_value_t = UnitsArg::Metric)]
    units: UnitsArg,
    #[command(subcommand)]
    command: Command,
}

const fn version_text() -> &'static str {
    concat!(
        env!("CARGO_PKG_VERSION"),
        " (data tables: wire_awg 1, wire_metric 1, wire_swg 1, steel 2)"
    )
}

#[derive(Debug, Subcommand)]
enum Command {
    /// Plan every winding of a job file: turns, wire, layers, fit, losses, heating, verdict
    #[command(
        after_help = "Example:\n  ironwind plan examples/garage_charger.toml\n  ironwind plan job.toml --format json > plan.json"
    )]
    Plan(plan::Args),
    /// Print the bench card of a job: winding order, turns, layer checkpoints, cut list, checks
    #[command(
        allow_negative_numbers = true,
        after_help = "Examples:\n  ironwind card examples/garage_charger.toml\n  ironwind card job.toml --format html --output card.html\n  ironwind card job.toml --format svg --output window.svg"
    )]
    Card(card::Args),
    /// Can a core carry a wattage: its capacity, the limit that binds, and what would change it
    #[command(
        allow_negative_numbers = true,
        after_help = "Examples:\n  ironwind rate examples/garage_charger.toml\n  ironwind rate examples/garage_charger.toml --va 250 --format json\n  ironwind rate --tongue 38 --stack 62 --window 19x57 --frequency 50 --primary 230 --output 24 --va 600\n  ironwind rate job.toml --duty 0.25 --plot capacity.svg"
    )]
    Rate(rate::Args),
    /// Geometry of a measured core, with the rule-of-thumb rating
    #[command(
        allow_negative_numbers = true,
        after_help = "Example:\n  ironwind core --tongue 32 --stack 40 --window 16x48\n  ironwind core --tongue \"1.25 in\" --stack \"1.5 in\" --window 0.625inx1.875in --shape ei"
    )]
    Core(core::Args),
    /// Look up the wire tables, or choose a size and strands for a current
    #[command(
        allow_negative_numbers = true,
        after_help = "Examples:\n  ironwind wire --list --system awg\n  ironwind wire --amps 12 --density 3 --max-strand 2.0"
    )]
    Wire(wire::Args),
    /// Read a donor core's test winding and magnetisation sweep: volts per turn, flux, knee points
    #[command(
        allow_negative_numbers = true,
        after_help = "Examples:\n  ironwind probe --test-turns 10 --test-volts 2.31 --applied-volts 230 --frequency 50 --tongue 38 --stack 62\n  ironwind probe --sweep examples/ups_donor_sweep.csv --sweep-turns 511 --frequency 50 --tongue 38 --stack 50 --window 19x57 --plot sweep.svg"
    )]
    Probe(probe::Args),
    /// The shelf of measured donor cores: add, list, show, edit, remove, export, import, rank
    #[command(
        after_help = "Examples:\n  ironwind shelf add --label \"grey core\" --tongue 38 --stack 62 --window 19x57\n  ironwind shelf list --sort area-product\n  ironwind shelf rank examples/garage_charger.toml --top 5\n\nThe shelf is one CSV file: --shelf FILE, else $IRONWIND_SHELF, else shelf.csv in the platform's data folder ($XDG_DATA_HOME/ironwind on Linux; ironwind shelf list says where)."
    )]
    Shelf(shelf::Args),
    /// Print a shell completion script (bash, zsh or fish)
    #[command(
        after_help = "Example:\n  ironwind completions bash > ~/.local/share/bash-completion/completions/ironwind"
    )]
    Completions(completions::Args),
    /// Print the manual pages (roff): the main one, one command's, or all into a folder
    #[command(
        after_help = "Examples:\n  ironwind manpage > ~/.local/share/man/man1/ironwind.1\n  ironwind manpage plan > ~/.local/share/man/man1/ironwind-plan.1\n  ironwind manpage --dir ~/.local/share/man/man1"
    )]
    Manpage(manpage::Args),
    /// After winding: what the meter's readings say (turns, wire, a shorted turn, a reversed half)
    #[command(
        after_help = "Example:\n  ironwind diagnose examples/garage_charger.toml examples/measured/garage_charger.toml\n  ironwind diagnose job.toml measured.toml --format json\n  ironwind diagnose job.toml measured.toml --record 3   # keep the readings with shelf core 3"
    )]
    Diagnose(diagnose::Args),
    /// Start a job file: asks for the core, supply and windings (or takes them as flags)
    #[command(
        allow_negative_numbers = true,
        after_help = "Examples:\n  ironwind new                      # asks, writes job.toml\n  ironwind new charger.toml --tongue 32 --stack 40 --window 16x48 --primary 230 --output 18:6\n  ironwind new - --tongue \"1.25 in\" --stack \"1.5 in\" --window 0.625inx1.875in --frequency 60 --primary 120 --output main=24:2:ct"
    )]
    New(new::Args),
    /// List the bundled example jobs, or print one (they are built into the binary)
    #[command(
        after_help = "Example:\n  ironwind example\n  ironwind example pushpull_inverter_24v > job.toml"
    )]
    Example(example::Args),
    /// Plan the bundled example job end to end (no files needed)
    #[command(after_help = "Example:\n  ironwind demo\n  ironwind demo --format json")]
    Demo(demo::Args),
}

/// `--format` of commands that print text or JSON.
#[derive(Debug, Clone, Copy, ValueEnum, PartialEq, Eq)]
enum TextJson {
    Text,
    Json,
}

impl TextJson {
    fn format(self) -> Format {
        match self {
            TextJson::Text => Format::Text,
            TextJson::Json => Format::Json,
        }
    }
}

/// `--format` of `plan` and `demo`.
#[derive(Debug, Clone, Copy, ValueEnum, PartialEq, Eq)]
enum PlanFormat {
    Text,
    Json,
    Csv,
}

impl PlanFormat {
    fn format(self) -> Format {
        match self {
            PlanFormat::Text => Format::Text,
            PlanFormat::Json => Format::Json,
            PlanFormat::Csv => Format::Csv,
        }
    }
}

#[derive(Debug, Clone, Copy, ValueEnum, PartialEq, Eq)]
enum ColorArg {
    Auto,
    Always,
    Never,
}

#[derive(Debug, Clone, Copy, ValueEnum, PartialEq, Eq)]
enum UnitsArg {
    Metric,
    Imperial,
}

/// `--shape`.
#[derive(Debug, Clone, Copy, ValueEnum, PartialEq, Eq)]
enum ShapeArg {
    Ei,
    Ui,
}

impl ShapeArg {
    fn shape(self) -> crate::geometry::Shape {
        match self {
            ShapeArg::Ei => crate::geometry::Shape::Ei,
            ShapeArg::Ui => crate::geometry::Shape::Ui,
        }
    }
}

/// `--system`.
#[derive(Debug, Clone, Copy, ValueEnum, PartialEq, Eq)]
enum SystemArg {
    Metric,
    Awg,
    Swg,
}

impl SystemArg {
    fn system(self) -> crate::wire::System {
        match self {
            SystemArg::Metric => crate::wire::System::Metric,
            SystemArg::Awg => crate::wire::System::Awg,
            SystemArg::Swg => crate::wire::System::Swg,
        }
    }
}

/// What every command gets besides its own arguments.
struct Ctx {
    look: Look,
    quiet: bool,
}

/// Runs the command line and returns the process exit code.
pub fn main() -> i32 {
    let args: Vec<std::ffi::OsString> = std::env::args_os().collect();
    let cmd = Cli::command().color(help_color(&args));
    let cli = match cmd
        .try_get_matches_from(&args)
        .and_then(|m| Cli::from_arg_matches(&m))
    {
        Ok(c) => c,
        Err(e) => return clap_error(&e),
    };
    let stdout = std::io::stdout();
    let mut out = std::io::BufWriter::new(stdout.lock());
    let result = run(cli, &mut out).and_then(|code| {
        out.flush().map_err(out_err)?;
        Ok(code)
    });
    match result {
        Ok(code) => code,
        Err(Error::Io { path, reason, .. }) if path == "stdout" && reason == BROKEN_PIPE => 0,
        Err(e) => {
            say(&format!("error: {e}"));
            e.exit_code()
        }
    }
}

/// `--color` as it stands on the command line (before clap has parsed it), with NO_COLOR, for help
/// and clap's own messages.
fn help_color(args: &[std::ffi::OsString]) -> clap::ColorChoice {
    let mut choice = None;
    for (k, a) in args.iter().enumerate() {
        let a = a.to_string_lossy();
        let v = match a.strip_prefix("--color=") {
            Some(v) => Some(v.to_string()),
            None if a == "--color" => args.get(k + 1).map(|v| v.to_string_lossy().into_owned()),
            None => None,
        };
        if v.is_some() {
            choice = v;
        }
    }
    let no_color = std::env::var_os("NO_COLOR").is_some_and(|v| !v.is_empty());
    match choice.as_deref() {
        Some("always") => clap::ColorChoice::Always,
        Some("never") => clap::ColorChoice::Never,
        _ if no_color => clap::ColorChoice::Never,
        _ => clap::ColorChoice::Auto,
    }
}

/// Help and version exit 0; every other clap error is one line on stderr, exit 2.
fn clap_error(e: &clap::Error) -> i32 {
    use clap::error::ErrorKind;
    match e.kind() {
        ErrorKind::DisplayHelp | ErrorKind::DisplayVersion => {
            let _ = e.print();
            0
        }
        ErrorKind::DisplayHelpOnMissingArgumentOrSubcommand => {
            let _ = e.print();
            2
        }
        _ => {
            // One line, like every other error: clap's message with its hints and its usage line
            // folded in.
            let text = e.render().to_string();
            let parts: Vec<&str> = text
                .lines()
                .map(str::trim)
                .filter(|l| !l.is_empty() && !l.starts_with("For more information"))
                .collect();
            let joined = parts.join("; ").replace(":; ", ": ");
            let joined = joined.strip_prefix("error: ").unwrap_or(&joined);
            say(&format!("error: command line: {joined} (see --help)"));
            2
        }
    }
}

fn run(cli: Cli, out: &mut dyn Write) -> Result<i32> {
    let no_color_env = std::env::var_os("NO_COLOR").is_some_and(|v| !v.is_empty());
    let (width, fit_tables) = text_width();
    let look = Look {
        charset: if cli.ascii {
            Charset::Ascii
        } else {
            Charset::Unicode
        },
        units: match cli.units {
            UnitsArg::Imperial => Units::Imperial,
            UnitsArg::Metric => Units::Metric,
        },
        color: match cli.color {
            ColorArg::Always => true,
            ColorArg::Never => false,
            ColorArg::Auto => std::io::stdout().is_terminal() && !no_color_env,
        },
        width,
        fit_tables,
        quiet: cli.quiet,
    };
    let ctx = Ctx {
        look,
        quiet: cli.quiet,
    };
    match cli.command {
        Command::Plan(a) => plan::run(out, a, &ctx),
        Command::Card(a) => card::run(out, a, &ctx),
        Command::Rate(a) => rate::run(out, a, &ctx),
        Command::Core(a) => core::run(out, a, &ctx),
        Command::Wire(a) => wire::run(out, a, &ctx),
        Command::Probe(a) => probe::run(out, a, &ctx),
        Command::Shelf(a) => shelf::run(out, a, &ctx),
        Command::Completions(a) => completions::run(out, a, Cli::command()),
        Command::Manpage(a) => manpage::run(out, a, Cli::command()),
        Command::Demo(a) => demo::run(out, a, &ctx),
        Command::Diagnose(a) => diagnose::run(out, a, &ctx),
        Command::Example(a) => example::run(out, a, ctx.quiet),
        Command::New(a) => new::run(out, a, &ctx),
    }
}

/// Columns for text: the terminal's width on a terminal, else `COLUMNS` when set, else 80; never
/// below 40 (a table cannot fit less) nor above 400. The flag says whether a width was found
/// (tables are then narrowed to it too).
fn text_width() -> (usize, bool) {
    let from_terminal = std::io::stdout()
        .is_terminal()
        .then(terminal_size::terminal_size)
        .flatten()
        .map(|(w, _)| usize::from(w.0));
    let from_env = || {
        std::env::var("COLUMNS")
            .ok()
            .and_then(|v| v.trim().parse::<usize>().ok())
    };
    match from_terminal.or_else(from_env) {
        Some(w) => (w.clamp(40, 400), true),
        None => (80, false),
    }
}

/// The reason a closed pipe carries, to tell it from other write failures.
const BROKEN_PIPE: &str = "closed pipe";

/// Maps a write error on stdout: a closed pipe (`| head`) is not a failure.
fn out_err(e: std::io::Error) -> Error {
    if e.kind() == std::io::ErrorKind::BrokenPipe {
        return Error::Io {
            path: "stdout".into(),
            action: "cannot write".into(),
            reason: BROKEN_PIPE.into(),
        };
    }
    Error::io("stdout", "cannot write", &e)
}

/// Writes a whole file (charts, cards) atomically; failures are exit 1.
fn write_file(path: &Path, bytes: &[u8]) -> Result<()> {
    crate::store::write_whole(path, bytes)
}

/// Refuses to write an output over one of the command's own inputs.
fn not_an_input(output: &Path, inputs: &[&Path], flag: &str) -> Result<()> {
    let same = |a: &Path, b: &Path| match (std::fs::canonicalize(a), std::fs::canonicalize(b)) {
        (Ok(x), Ok(y)) => x == y,
        _ => false,
    };
    if let Some(input) = inputs.iter().find(|i| same(output, i)) {
        return Err(Error::bad_value(
            "command line",
            flag,
            format!("\"{}\"", output.display()),
            format!(
                "is this command's input {}; write the output to another file",
                input.display()
            ),
        ));
    }
    Ok(())
}

/// Writes what a renderer writes into a file (`-`: standard output, as without the option).
fn render_to_file(
    path: &Path,
    render: impl FnOnce(&mut dyn Write) -> std::io::Result<()>,
) -> Result<()> {
    if path.as_os_str() == "-" {
        let stdout = std::io::stdout();
        let mut lock = stdout.lock();
        render(&mut lock).map_err(out_err)?;
        return lock.flush().map_err(out_err);
    }
    let mut buf = Vec::new();
    render(&mut buf).map_err(|e| Error::io(path.display().to_string(), "cannot write", &e))?;
    write_file(path, &buf)
}

/// Reads and checks a job file (`-`: standard input); sweep paths are relative to the job file.
fn load_job(path: &Path) -> Result<Job> {
    let origin = path.display().to_string();
    let text = if path.as_os_str() == "-" {
        crate::input::read_stdin()?
    } else {
        crate::input::read_text(path)?
    };
    let base = path.parent().map(Path::to_path_buf).unwrap_or_default();
    let loader = |rel: &str| -> Result<(String, Vec<SweepPoint>)> {
        let p = base.join(rel);
        let name = p.display().to_string();
        let text = crate::input::read_text(&p)?;
        Ok((name.clone(), read_sweep(&name, text.as_bytes())?))
    };
    parse_job(&text, &origin, &loader)
}

/// Warnings and notes for stderr, unless `--quiet`. A stderr that cannot be written (closed, or
/// a full device) is not a reason to stop: the data on stdout and the exit code still stand.
fn note(ctx: &Ctx, line: &str) {
    if !ctx.quiet {
        say(line);
    }
}

/// What a command whose only output is files did, on stderr (under `--quiet` too: it is the
/// command's whole report).
fn note_always(line: &str) {
    say(line);
}

/// One line on stderr, ignoring a stderr that cannot be written.
fn say(line: &str) {
    let _ = writeln!(std::io::stderr(), "{line}");
}

/// Today's date (UTC) for a card's footer: `SOURCE_DATE_EPOCH` when set (reproducible output, as
/// reproducible-builds.org specifies it), else the clock. Days to a civil date by H. Hinnant's
/// `civil_from_days` (proleptic Gregorian calendar).
fn today() -> Option<(i64, u32, u32)> {
    let secs: i64 = match std::env::var("SOURCE_DATE_EPOCH") {
        Ok(v) => v.trim().parse().ok()?,
        Err(_) => std::time::SystemTime::now()
            .duration_since(std::time::UNIX_EPOCH)
            .ok()?
            .as_secs()
            .try_into()
            .ok()?,
    };
    Some(civil_from_days(secs.div_euclid(86_400)))
}

/// Days since 1970-01-01 to (year, month, day).
fn civil_from_days(days: i64) -> (i64, u32, u32) {
    let z = days + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z.rem_euclid(146_097);
    let yoe = (doe - doe / 1460 + doe / 36_524 - doe / 146_096) / 365;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let d = (doy - (153 * mp + 2) / 5 + 1) as u32;
    let m = if mp < 10 { mp + 3 } else { mp - 9 } as u32;
    let y = yoe + era * 400 + i64::from(m <= 2);
    (y, m, d)
}

#[cfg(test)]
mod tests {
    use super::civil_from_days;

    #[test]
    fn civil_dates_from_unix_days() {
        // Reference dates: the Unix epoch; 2000-03-01 (day 11 017) after a century leap day;
        // 2026-12-02 = 1 796 169 600 s / 86 400 (POSIX time, IEEE Std 1003.1 "Seconds Since the Epoch").
        assert_eq!(civil_from_days(0), (1970, 1, 1));
        assert_eq!(civil_from_days(11_017), (2000, 3, 1));
        assert_eq!(civil_from_days(10_956), (1999, 12, 31));
        assert_eq!(civil_from_days(20_789), (2026, 12, 2));
        assert_eq!(civil_from_days(-1), (1969, 12, 31));
    }
}
