//! The command-line interface: clap structs, file reading and writing, stdout and stderr.
//!
//! This is the only module that touches files and the terminal. Arguments are parsed into plain
//! values, checked into domain types, then handed to the library; results are rendered by one
//! `match` on the format.

use crate::error::{Error, Result};
use crate::geometry::{geometry, rule_of_thumb_va, CoreDims, Shape};
use crate::job::{parse_job, Job};
use crate::plan::{check_windable, plan, Plan};
use crate::probe::{read_sweep, SweepPoint};
use crate::render::{self, Charset};
use clap::{Parser, Subcommand, ValueEnum};
use std::io::{IsTerminal, Read, Write};
use std::path::{Path, PathBuf};

mod shelf_cmd;

/// The bundled demo job.
pub const DEMO_JOB: &str = include_str!("../../examples/garage_charger.toml");

/// Largest text file read (job, sweep, shelf import), bytes.
pub const MAX_READ_BYTES: u64 = 16 << 20;

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
        " (data tables: wire_awg 1, wire_metric 1, steel 1)"
    )
}

#[derive(Debug, Subcommand)]
enum Command {
    /// Plan every winding of a job file: turns, wire, layers, fit, losses, heating, verdict
    #[command(
        after_help = "Example:\n  ironwind plan examples/garage_charger.toml\n  ironwind plan job.toml --format json > plan.json"
    )]
    Plan {
        /// The job file (TOML)
        job: PathBuf,
        /// Output format
        #[arg(long, value_enum, default_value_t = PlanFormat::Text)]
        format: PlanFormat,
    },
    /// Print the bench card of a job: winding order, turns, layer checkpoints, cut list, checks
    #[command(
        allow_negative_numbers = true,
        after_help = "Examples:\n  ironwind card examples/garage_charger.toml\n  ironwind card job.toml --format html --output card.html\n  ironwind card job.toml --format svg --output window.svg"
    )]
    Card {
        /// The job file (TOML)
        job: PathBuf,
        /// Output format
        #[arg(long, value_enum, default_value_t = CardFormat::Text)]
        format: CardFormat,
        /// Write to this file instead of stdout
        #[arg(long, short)]
        output: Option<PathBuf>,
        /// Spare allowance on the buy list, per cent (0 to 100)
        #[arg(long, default_value_t = 10.0)]
        spare: f64,
    },
    /// Can a core carry a wattage: its capacity, the limit that binds, and what would change it
    #[command(
        allow_negative_numbers = true,
        after_help = "Examples:\n  ironwind rate examples/garage_charger.toml\n  ironwind rate examples/garage_charger.toml --va 250 --format json\n  ironwind rate --tongue 38 --stack 62 --window 19x57 --frequency 50 --primary 230 --output 24 --va 600\n  ironwind rate job.toml --duty 0.25 --plot capacity.svg"
    )]
    Rate(RateArgs),
    /// Geometry of a measured core, with the rule-of-thumb rating
    #[command(
        allow_negative_numbers = true,
        after_help = "Example:\n  ironwind core --tongue 32 --stack 40 --window 16x48\n  ironwind core --tongue \"1.25 in\" --stack \"1.5 in\" --window 0.625inx1.875in --shape ei"
    )]
    Core {
        /// Tongue (centre leg) width, mm or with a unit ("1.25 in")
        #[arg(long)]
        tongue: String,
        /// Stack depth, mm or with a unit
        #[arg(long)]
        stack: String,
        /// One window, WIDTHxHEIGHT in mm (e.g. 16x48)
        #[arg(long)]
        window: String,
        /// Lamination shape
        #[arg(long, value_enum, default_value_t = ShapeArg::Ei)]
        shape: ShapeArg,
        /// Stacking factor, > 0.5 and ≤ 1
        #[arg(long, default_value_t = 0.95)]
        stacking: f64,
        /// Output format
        #[arg(long, value_enum, default_value_t = SimpleFormat::Text)]
        format: SimpleFormat,
    },
    /// Look up the wire tables, or choose a size and strands for a current
    #[command(
        allow_negative_numbers = true,
        after_help = "Examples:\n  ironwind wire --list --system awg\n  ironwind wire --amps 12 --density 3 --max-strand 2.0"
    )]
    Wire {
        /// Print the whole table of the system
        #[arg(long, conflicts_with = "amps")]
        list: bool,
        /// Current to carry, A RMS
        #[arg(long)]
        amps: Option<f64>,
        /// Current density, A/mm² (default 3.0)
        #[arg(long, default_value_t = 3.0)]
        density: f64,
        /// Wire system (default: metric, or AWG with --units imperial)
        #[arg(long, value_enum)]
        system: Option<SystemArg>,
        /// Thickest single strand before going to parallel strands, mm
        #[arg(long, default_value_t = 2.0)]
        max_strand: f64,
        /// Enamel grade: 1 (AWG single build) or 2 (AWG heavy build)
        #[arg(long, default_value_t = 2)]
        grade: u8,
        /// Output format
        #[arg(long, value_enum, default_value_t = SimpleFormat::Text)]
        format: SimpleFormat,
    },
    /// Read a donor core's test winding and magnetisation sweep: volts per turn, flux, knee points
    #[command(
        allow_negative_numbers = true,
        after_help = "Examples:\n  ironwind probe --test-turns 10 --test-volts 2.31 --applied-volts 230 --frequency 50 --tongue 38 --stack 62\n  ironwind probe --sweep examples/ups_donor_sweep.csv --sweep-turns 511 --frequency 50 --tongue 38 --stack 50 --window 19x57 --plot sweep.svg"
    )]
    Probe(ProbeArgs),
    /// The shelf of measured donor cores: add, list, show, edit, remove, export, import, rank
    #[command(
        after_help = "Examples:\n  ironwind shelf add --label \"grey core\" --tongue 38 --stack 62 --window 19x57\n  ironwind shelf list --sort area-product\n  ironwind shelf rank examples/garage_charger.toml --top 5\n\nThe shelf is one CSV file: --shelf FILE, else $IRONWIND_SHELF, else $XDG_DATA_HOME/ironwind/shelf.csv."
    )]
    Shelf(shelf_cmd::ShelfArgs),
    /// Print a shell completion script (bash, zsh or fish)
    #[command(
        after_help = "Example:\n  ironwind completions bash > ~/.local/share/bash-completion/completions/ironwind"
    )]
    Completions {
        /// The shell
        #[arg(value_enum)]
        shell: ShellArg,
    },
    /// Print the manual page (roff)
    #[command(after_help = "Example:\n  ironwind manpage > ~/.local/share/man/man1/ironwind.1")]
    Manpage,
    /// Plan the bundled example job end to end (no files needed)
    #[command(after_help = "Example:\n  ironwind demo\n  ironwind demo --format json")]
    Demo {
        /// Output format of the plan
        #[arg(long, value_enum, default_value_t = PlanFormat::Text)]
        format: PlanFormat,
        /// Show the demo's bench card (text) instead of the plan
        #[arg(long)]
        card: bool,
    },
}

#[derive(Debug, Clone, Copy, ValueEnum, PartialEq, Eq)]
enum PlanFormat {
    Text,
    Json,
    Csv,
}

#[derive(Debug, Clone, Copy, ValueEnum, PartialEq, Eq)]
enum CardFormat {
    Text,
    Markdown,
    Html,
    Svg,
}

#[derive(Debug, Clone, Copy, ValueEnum, PartialEq, Eq)]
enum SimpleFormat {
    Text,
    Json,
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

#[derive(Debug, Clone, Copy, ValueEnum, PartialEq, Eq)]
enum ShellArg {
    Bash,
    Zsh,
    Fish,
}

#[derive(Debug, Clone, Copy, ValueEnum, PartialEq, Eq)]
enum WaveArg {
    Sine,
    Square,
}

#[derive(Debug, Clone, Copy, ValueEnum, PartialEq, Eq)]
pub(crate) enum ShapeArg {
    Ei,
    Ui,
}

#[derive(Debug, Clone, Copy, ValueEnum, PartialEq, Eq)]
enum SystemArg {
    Metric,
    Awg,
}

/// Runs the command line and returns the process exit code.
pub fn main() -> i32 {
    let cli = match Cli::try_parse() {
        Ok(c) => c,
        Err(e) => {
            return match e.kind() {
                clap::error::ErrorKind::DisplayHelp
                | clap::error::ErrorKind::DisplayVersion
                | clap::error::ErrorKind::DisplayHelpOnMissingArgumentOrSubcommand => {
                    let _ = e.print();
                    if e.kind() == clap::error::ErrorKind::DisplayHelpOnMissingArgumentOrSubcommand
                    {
                        2
                    } else {
                        0
                    }
                }
                _ => {
                    // One line, like every other error: clap's message with its hints folded in.
                    let text = e.render().to_string();
                    let parts: Vec<&str> = text
                        .lines()
                        .map(str::trim)
                        .filter(|l| {
                            !l.is_empty()
                                && !l.starts_with("For more information")
                                && !l.starts_with("Usage:")
                        })
                        .collect();
                    let joined = parts.join("; ");
                    let joined = joined.strip_prefix("error: ").unwrap_or(&joined);
                    eprintln!("error: command line: {joined} (see --help)");
                    2
                }
            };
        }
    };
    let stdout = std::io::stdout();
    let mut out = std::io::BufWriter::new(stdout.lock());
    let result = run(cli, &mut out).and_then(|code| {
        out.flush()
            .map_err(|e| Error::io("stdout", "cannot write", &e))?;
        Ok(code)
    });
    match result {
        Ok(code) => code,
        Err(Error::Io { path, .. }) if path == "stdout" && broken_pipe_seen() => 0,
        Err(e) => {
            eprintln!("error: {e}");
            e.exit_code()
        }
    }
}

thread_local! {
    static QUIET: std::cell::Cell<bool> = const { std::cell::Cell::new(false) };
    static BROKEN_PIPE: std::cell::Cell<bool> = const { std::cell::Cell::new(false) };
}

/// Whether `--quiet` was given: warnings and notes on stderr are left out.
pub(crate) fn quiet() -> bool {
    QUIET.with(|q| q.get())
}

fn broken_pipe_seen() -> bool {
    BROKEN_PIPE.with(|b| b.get())
}

/// Maps a write error on stdout: a closed pipe (`| head`) is not a failure.
pub(crate) fn out_err(e: std::io::Error) -> Error {
    if e.kind() == std::io::ErrorKind::BrokenPipe {
        BROKEN_PIPE.with(|b| b.set(true));
    }
    Error::io("stdout", "cannot write", &e)
}

fn run(cli: Cli, out: &mut dyn Write) -> Result<i32> {
    let cs = if cli.ascii {
        Charset::Ascii
    } else {
        Charset::Unicode
    };
    let no_color_env = std::env::var_os("NO_COLOR").is_some_and(|v| !v.is_empty());
    let color = match cli.color {
        ColorArg::Always => true,
        ColorArg::Never => false,
        ColorArg::Auto => stdout_is_terminal() && !no_color_env,
    };
    let look = render::Look {
        charset: cs,
        units: if cli.units == UnitsArg::Imperial {
            render::Units::Imperial
        } else {
            render::Units::Metric
        },
        color,
    };
    QUIET.with(|q| q.set(cli.quiet));
    match cli.command {
        Command::Completions { shell } => {
            use clap::CommandFactory;
            let mut cmd = Cli::command();
            let sh = match shell {
                ShellArg::Bash => clap_complete::Shell::Bash,
                ShellArg::Zsh => clap_complete::Shell::Zsh,
                ShellArg::Fish => clap_complete::Shell::Fish,
            };
            let mut buf = Vec::new();
            clap_complete::generate(sh, &mut cmd, "ironwind", &mut buf);
            out.write_all(&buf).map_err(out_err)?;
        }
        Command::Manpage => {
            use clap::CommandFactory;
            let mut buf = Vec::new();
            clap_mangen::Man::new(Cli::command())
                .render(&mut buf)
                .map_err(|e| Error::Failed(format!("cannot render the manual page: {e}")))?;
            out.write_all(&buf).map_err(out_err)?;
        }
        Command::Plan { job, format } => {
            let (job, origin) = load_job(&job)?;
            let p = plan(&job);
            check_windable(&p, &origin)?;
            write_plan(out, &p, format, look)?;
        }
        Command::Shelf(args) => {
            return shelf_cmd::run(out, args, cs);
        }
        Command::Rate(args) => {
            return rate_command(out, args, cs);
        }
        Command::Card {
            job,
            format,
            output,
            spare,
        } => {
            flag_in("--spare", spare, 0.0, true, 100.0, "%")?;
            let (job, origin) = load_job(&job)?;
            let p = plan(&job);
            check_windable(&p, &origin)?;
            let opts = render::card::CardOptions {
                spare: spare / 100.0,
                ascii: cli.ascii,
                color: output.is_none() && look.color,
                units: look.units,
            };
            let text = match format {
                CardFormat::Text => render::card::text_card(&p, &opts),
                CardFormat::Markdown => render::card::markdown_card(&p, &opts),
                CardFormat::Html => render::card::html_card(&p, &opts),
                CardFormat::Svg => render::card::svg_card(&p),
            };
            match output {
                Some(path) => write_file(&path, text.as_bytes())?,
                None => out.write_all(text.as_bytes()).map_err(out_err)?,
            }
        }
        Command::Demo { format, card } => {
            let job = parse_job(DEMO_JOB, "demo job", &|_| {
                Err(Error::Failed("the demo has no sweep".into()))
            })?;
            let p = plan(&job);
            if card {
                let opts = render::card::CardOptions {
                    ascii: cli.ascii,
                    color: look.color,
                    units: look.units,
                    ..Default::default()
                };
                out.write_all(render::card::text_card(&p, &opts).as_bytes())
                    .map_err(out_err)?;
                return Ok(0);
            }
            if format == PlanFormat::Text {
                writeln!(
                    out,
                    "The bundled example (examples/garage_charger.toml), planned end to end.\n"
                )
                .map_err(out_err)?;
            }
            write_plan(out, &p, format, look)?;
        }
        Command::Core {
            tongue,
            stack,
            window,
            shape,
            stacking,
            format,
        } => {
            let dims = core_from_flags(&tongue, &stack, &window, shape, stacking)?;
            write_core(out, &dims, format, cs)?;
        }
        Command::Probe(args) => {
            probe_command(out, args, cs)?;
        }
        Command::Wire {
            list,
            amps,
            density,
            system,
            max_strand,
            grade,
            format,
        } => {
            let system = system.unwrap_or(if look.units == render::Units::Imperial {
                SystemArg::Awg
            } else {
                SystemArg::Metric
            });
            wire_command(
                out, list, amps, density, system, max_strand, grade, format, cs,
            )?;
        }
    }
    Ok(0)
}

fn write_plan(out: &mut dyn Write, p: &Plan, format: PlanFormat, look: render::Look) -> Result<()> {
    match format {
        PlanFormat::Text => render::text::write_plan(out, p, look),
        PlanFormat::Json => render::json::write_plan(out, p),
        PlanFormat::Csv => render::csv::write_schedule(out, p),
    }
    .map_err(out_err)
}

/// Reads a text file a person named, refusing directories, huge files and non-UTF-8 bytes.
pub fn read_text(path: &Path) -> Result<String> {
    let name = path.display().to_string();
    let meta = std::fs::metadata(path)
        .map_err(|e| Error::bad_input(&name, format!("cannot read: {e}")))?;
    if meta.is_dir() {
        return Err(Error::bad_input(&name, "is a directory; expected a file"));
    }
    let file = std::fs::File::open(path)
        .map_err(|e| Error::bad_input(&name, format!("cannot read: {e}")))?;
    let mut bytes = Vec::new();
    file.take(MAX_READ_BYTES + 1)
        .read_to_end(&mut bytes)
        .map_err(|e| Error::bad_input(&name, format!("cannot read: {e}")))?;
    if bytes.len() as u64 > MAX_READ_BYTES {
        return Err(Error::bad_input(
            &name,
            format!(
                "larger than {} MiB; expected a small text file",
                MAX_READ_BYTES >> 20
            ),
        ));
    }
    String::from_utf8(bytes).map_err(|e| {
        let line = e.as_bytes()[..e.utf8_error().valid_up_to()]
            .iter()
            .filter(|&&b| b == b'\n')
            .count()
            + 1;
        Error::bad_input(&name, format!("line {line}: not UTF-8 text"))
    })
}

/// Reads and checks a job file; sweep paths are relative to the job file.
pub fn load_job(path: &Path) -> Result<(Job, String)> {
    let origin = path.display().to_string();
    let text = read_text(path)?;
    let base = path.parent().map(Path::to_path_buf).unwrap_or_default();
    let loader = |rel: &str| -> Result<(String, Vec<SweepPoint>)> {
        let p = base.join(rel);
        let name = p.display().to_string();
        let text = read_text(&p)?;
        Ok((name.clone(), read_sweep(&name, text.as_bytes())?))
    };
    let job = parse_job(&text, &origin, &loader)?;
    Ok((job, origin))
}

fn flag_length(flag: &str, text: &str) -> Result<f64> {
    let mm = crate::units::parse_length_mm(text)
        .map_err(|m| Error::bad_value("command line", flag, format!("\"{text}\""), m))?;
    if !(mm > 0.0 && mm <= crate::job::MAX_CORE_MM) {
        return Err(Error::bad_value(
            "command line",
            flag,
            format!("\"{text}\""),
            "must be > 0 mm and ≤ 1000 mm",
        ));
    }
    Ok(mm)
}

fn core_from_flags(
    tongue: &str,
    stack: &str,
    window: &str,
    shape: ShapeArg,
    stacking: f64,
) -> Result<CoreDims> {
    let a = flag_length("--tongue", tongue)?;
    let s = flag_length("--stack", stack)?;
    let (w, h) = crate::units::parse_window(window)
        .map_err(|m| Error::bad_value("command line", "--window", format!("\"{window}\""), m))?;
    for (v, what) in [(w, "width"), (h, "height")] {
        if !(v > 0.0 && v <= crate::job::MAX_CORE_MM) {
            return Err(Error::bad_value(
                "command line",
                "--window",
                format!("\"{window}\""),
                format!("the {what} must be > 0 mm and ≤ 1000 mm"),
            ));
        }
    }
    if !(stacking > 0.5 && stacking <= 1.0) {
        return Err(Error::bad_value(
            "command line",
            "--stacking",
            stacking,
            "must be > 0.5 and ≤ 1",
        ));
    }
    let shape = match shape {
        ShapeArg::Ei => Shape::Ei,
        ShapeArg::Ui => Shape::Ui,
    };
    Ok(CoreDims::new(shape, a, s, (w, h), stacking))
}

#[derive(serde::Serialize)]
struct CoreJsonOut<'a> {
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

fn write_core(out: &mut dyn Write, d: &CoreDims, format: SimpleFormat, cs: Charset) -> Result<()> {
    let g = geometry(d);
    let va = rule_of_thumb_va(g.area_gross_mm2);
    match format {
        SimpleFormat::Json => render::json::write_json(
            out,
            &CoreJsonOut {
                shape: d.shape.name(),
                tongue_mm: d.tongue_mm,
                stack_mm: d.stack_mm,
                window_width_mm: d.window_width_mm,
                window_height_mm: d.window_height_mm,
                stacking_factor: d.stacking_factor,
                geometry: &g,
                rule_of_thumb_va: va,
            },
        ),
        SimpleFormat::Text => {
            use render::num;
            let t = render::pairs(
                &[
                    ("shape", d.shape.name().to_string()),
                    (
                        "tongue × stack",
                        format!("{} × {} mm", num(d.tongue_mm, 2), num(d.stack_mm, 2)),
                    ),
                    (
                        "window w × h",
                        format!(
                            "{} × {} mm",
                            num(d.window_width_mm, 2),
                            num(d.window_height_mm, 2)
                        ),
                    ),
                    ("stacking factor", num(d.stacking_factor, 3)),
                    (
                        "Ae gross",
                        format!(
                            "{} mm² ({} cm²)",
                            num(g.area_gross_mm2, 1),
                            num(g.area_gross_mm2 / 100.0, 2)
                        ),
                    ),
                    ("Ae net", format!("{} mm²", num(g.area_net_mm2, 1))),
                    (
                        "Aw (one window)",
                        format!("{} mm²", num(g.window_area_mm2, 1)),
                    ),
                    (
                        "area product Ap",
                        format!("{} cm⁴", num(g.area_product_cm4, 2)),
                    ),
                    ("path length le", format!("{} mm", num(g.path_length_mm, 1))),
                    (
                        "outline",
                        format!(
                            "{} × {} mm",
                            num(g.outline_width_mm, 1),
                            num(g.outline_height_mm, 1)
                        ),
                    ),
                    (
                        "core mass",
                        format!("{} kg (from the outline, 7.65 g/cm³)", num(g.mass_kg, 3)),
                    ),
                    (
                        "rule of thumb",
                        format!(
                            "about {} VA (Ae in cm² ≈ √VA; common practice, not a rating)",
                            num(va, 0)
                        ),
                    ),
                ],
                cs,
            );
            let t = render::fold(cs, t);
            writeln!(
                out,
                "{t}\nFor a rating from losses and heating, use `ironwind rate`."
            )
        }
    }
    .map_err(out_err)
}

/// Arguments of `ironwind rate`.
#[derive(Debug, clap::Args)]
pub(crate) struct RateArgs {
    /// The job file (TOML); or describe the core and windings with the flags below
    job: Option<PathBuf>,
    /// Target output, VA (default: the job's own outputs)
    #[arg(long)]
    va: Option<f64>,
    /// Fraction of the time the load is on (0 < duty ≤ 1), for welders and motor starts
    #[arg(long, default_value_t = 1.0)]
    duty: f64,
    /// Write capacity and total loss against flux density as an SVG chart
    #[arg(long)]
    plot: Option<PathBuf>,
    /// Exit with code 3 when the target is not carried
    #[arg(long)]
    strict: bool,
    /// Verify by a dense brute-force scan of VA instead of the search
    #[arg(long)]
    scan: bool,
    /// Tongue width, mm or with a unit (without a job file)
    #[arg(long, conflicts_with = "job")]
    tongue: Option<String>,
    /// Stack depth, mm or with a unit
    #[arg(long, conflicts_with = "job")]
    stack: Option<String>,
    /// One window, WIDTHxHEIGHT in mm
    #[arg(long, conflicts_with = "job")]
    window: Option<String>,
    /// Lamination shape
    #[arg(long, value_enum, default_value_t = ShapeArg::Ei)]
    shape: ShapeArg,
    /// Stacking factor
    #[arg(long, default_value_t = 0.95)]
    stacking: f64,
    /// Steel: unknown, non-oriented, grain-oriented or a grade like M400-50A
    #[arg(long, default_value = "unknown")]
    steel: String,
    /// Supply frequency, Hz
    #[arg(long, default_value_t = 50.0)]
    frequency: f64,
    /// Primary volts (RMS for sine; amplitude for square)
    #[arg(long, conflicts_with = "job")]
    primary: Option<f64>,
    /// Output volts RMS (repeat for more outputs; they share the load equally by VA)
    #[arg(long, conflicts_with = "job")]
    output: Vec<f64>,
    /// Drive waveform of the primary
    #[arg(long, value_enum, default_value_t = WaveArg::Sine)]
    waveform: WaveArg,
    /// Flux density, T (default: the steel's)
    #[arg(long)]
    flux: Option<f64>,
    /// Allowed temperature rise, °C
    #[arg(long)]
    max_rise: Option<f64>,
    /// Ambient temperature, °C
    #[arg(long)]
    ambient: Option<f64>,
    /// Wire system
    #[arg(long, value_enum, default_value_t = SystemArg::Metric)]
    system: SystemArg,
    /// Output format
    #[arg(long, value_enum, default_value_t = SimpleFormat::Text)]
    format: SimpleFormat,
}

/// Builds a job from the quick-look flags of `rate`.
#[allow(clippy::too_many_arguments)]
fn quick_job(
    tongue: &str,
    stack: &str,
    window: &str,
    shape: ShapeArg,
    stacking: f64,
    steel: &str,
    frequency: f64,
    primary: f64,
    outputs: &[f64],
    waveform: WaveArg,
    flux: Option<f64>,
    max_rise: Option<f64>,
    ambient: Option<f64>,
    system: SystemArg,
    va: Option<f64>,
) -> Result<Job> {
    let dims = core_from_flags(tongue, stack, window, shape, stacking)?;
    if outputs.is_empty() {
        return Err(Error::bad_value(
            "command line",
            "--output",
            "(none)",
            "give at least one output voltage, --output VOLTS",
        ));
    }
    let share = va.unwrap_or(100.0) / outputs.len() as f64;
    let mut text = format!(
        "name = \"quick rating\"\n[core]\nshape = \"{}\"\ntongue_mm = {}\nstack_mm = {}\nwindow_width_mm = {}\nwindow_height_mm = {}\nstacking_factor = {}\nsteel = {:?}\n[supply]\nfrequency_hz = {}\nwaveform = \"{}\"\n[limits]\n",
        dims.shape.name(),
        dims.tongue_mm,
        dims.stack_mm,
        dims.window_width_mm,
        dims.window_height_mm,
        dims.stacking_factor,
        steel,
        frequency,
        if waveform == WaveArg::Square { "square" } else { "sine" },
    );
    if let Some(b) = flux {
        text += &format!("flux_density_t = {b}\n");
    }
    if let Some(r) = max_rise {
        text += &format!("max_rise_c = {r}\n");
    }
    if let Some(t) = ambient {
        text += &format!("ambient_c = {t}\n");
    }
    text += &format!(
        "[wire]\nsystem = \"{}\"\n",
        if system == SystemArg::Awg {
            "awg"
        } else {
            "metric"
        }
    );
    text += &format!("[[winding]]\nname = \"primary\"\nrole = \"primary\"\nvolts = {primary}\n");
    for (k, v) in outputs.iter().enumerate() {
        let amps = if *v > 0.0 { share / v } else { 0.0 };
        text += &format!(
            "[[winding]]\nname = \"output {}\"\nrole = \"secondary\"\nvolts = {v}\namps = {amps}\n",
            k + 1
        );
    }
    // The flags are checked by the same rules as a job file; messages name the flag's key.
    parse_job(&text, "command line", &|_| {
        Err(Error::Failed("no sweep from flags".into()))
    })
}

#[derive(serde::Serialize)]
struct RateVerdict {
    ok: bool,
    margin_pct: f64,
    target_va: f64,
}

#[derive(serde::Serialize)]
struct RateJson<'a> {
    name: &'a str,
    capacity: &'a crate::capacity::Capacity,
    verdict: Option<RateVerdict>,
    options: &'a [crate::capacity::Improvement],
    duty: f64,
    notes: Vec<String>,
    cautions: &'a [&'a str],
}

fn rate_command(out: &mut dyn Write, args: RateArgs, cs: Charset) -> Result<i32> {
    use crate::capacity::{
        capacity, flux_sweep, options, scan as scan_capacity, usable_flux_range,
    };
    let RateArgs {
        job,
        va,
        duty,
        plot,
        strict,
        scan,
        tongue,
        stack,
        window,
        shape,
        stacking,
        steel,
        frequency,
        primary,
        output,
        waveform,
        flux,
        max_rise,
        ambient,
        system,
        format,
    } = args;
    if let Some(p) = va {
        flag_in("--va", p, 0.0, false, 1e7, "VA")?;
    }
    flag_in("--duty", duty, 0.0, false, 1.0, "")?;
    let mut job = match (&job, &tongue, &stack, &window, primary) {
        (Some(path), ..) => load_job(path)?.0,
        (None, Some(t), Some(s), Some(w), Some(p)) => quick_job(
            t, s, w, shape, stacking, &steel, frequency, p, &output, waveform, flux, max_rise,
            ambient, system, va,
        )?,
        _ => {
            return Err(Error::bad_value(
                "command line",
                "JOB or --tongue/--stack/--window/--primary/--output",
                "(missing)",
                "give a job file, or --tongue, --stack, --window, --primary and --output",
            ))
        }
    };
    job.load_duty = duty;
    let cap = if scan {
        scan_capacity(&job)
    } else {
        capacity(&job)
    };
    let base_va: f64 = job
        .windings
        .iter()
        .filter(|w| w.role == crate::job::Role::Secondary)
        .map(|w| w.volts * w.amps)
        .sum();
    let target = va.or(if tongue.is_none() {
        Some(base_va)
    } else {
        None
    });
    let verdict = target.map(|t| RateVerdict {
        ok: t <= cap.max_va * (1.0 + 1e-12),
        margin_pct: (cap.max_va - t) / t * 100.0,
        target_va: t,
    });
    let opts = match &verdict {
        Some(v) if !v.ok => options(&job, &cap),
        _ => Vec::new(),
    };
    let mut notes = Vec::new();
    if duty < 1.0 {
        notes.push(format!(
            "intermittent duty {duty}: heating is rated on the time-averaged copper loss; this assumes each load period is short against the core's thermal time constant (minutes to tens of minutes)"
        ));
    }
    notes.push("the area-product and rule-of-thumb figures are quick estimates; the capacity comes from full plans with losses and heating".to_string());
    if let Some(path) = &plot {
        let (lo, hi) = usable_flux_range(&job.steel.kind);
        let pts = flux_sweep(&job, lo, hi, 18);
        let b = cap.flux_density_t;
        let svg = crate::render::svg::chart(&crate::render::svg::Chart {
            title: format!("Capacity and loss against flux density: {}", job.name),
            x_label: "peak flux density (T)".into(),
            y_label: "capacity (VA)".into(),
            y2_label: Some("total loss at capacity (W)".into()),
            x_scale: crate::render::svg::Scale::Linear,
            y_scale: crate::render::svg::Scale::Linear,
            series: vec![
                crate::render::svg::Series {
                    label: "capacity (VA, left)".into(),
                    points: pts.iter().map(|p| (p.0, p.1)).collect(),
                    dots: true,
                    dash: "",
                    colour: "#1f4e79",
                    right_axis: false,
                },
                crate::render::svg::Series {
                    label: "total loss (W, right)".into(),
                    points: pts.iter().map(|p| (p.0, p.2)).collect(),
                    dots: true,
                    dash: "5 3",
                    colour: "#7a4a12",
                    right_axis: true,
                },
            ],
            markers: vec![crate::render::svg::Marker {
                x: b,
                label: format!("chosen flux {b:.2} T"),
                dash: "2 2",
            }],
        });
        write_file(path, svg.as_bytes())?;
    }
    let doc = RateJson {
        name: &job.name,
        capacity: &cap,
        verdict,
        options: &opts,
        duty,
        notes,
        cautions: crate::plan::CAUTIONS,
    };
    match format {
        SimpleFormat::Json => render::json::write_json(out, &doc),
        SimpleFormat::Text => {
            let s = rate_text(&doc, cs);
            let s = render::fold(cs, s);
            write!(out, "{s}")
        }
    }
    .map_err(out_err)?;
    let carried = doc.verdict.as_ref().is_none_or(|v| v.ok);
    Ok(if strict && !carried { 3 } else { 0 })
}

fn rate_text(d: &RateJson, cs: Charset) -> String {
    use render::num;
    let c = d.capacity;
    let mut s = format!("ironwind rate: {}\n\n", d.name);
    s += &render::pairs(
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
            ("limit that binds", c.limit.word().to_string()),
            (
                "at capacity",
                format!(
                    "rise {} °C, copper fill {}, {} A/mm², efficiency {} %",
                    num(c.rise_c, 1),
                    num(c.copper_fill, 2),
                    num(c.current_density_a_mm2, 2),
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
        cs,
    );
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
                render::sig3(w.amps),
                w.turns.to_string(),
                w.wire.clone(),
                w.strands.to_string(),
            ]);
        }
        s += &render::table(rows, 1, cs);
    }
    if let Some(v) = &d.verdict {
        s += &format!(
            "\nTarget {} VA: {} (margin {} %)\n",
            num(v.target_va, 0),
            if v.ok { "CARRIES" } else { "DOES NOT CARRY" },
            num(v.margin_pct, 1)
        );
    }
    if !d.options.is_empty() {
        s += "\nWhat would change it\n";
        let mut rows = vec![vec!["change".to_string(), "capacity VA".into()]];
        for o in d.options {
            rows.push(vec![o.change.clone(), num(o.max_va, 0)]);
        }
        s += &render::table(rows, 1, cs);
    }
    s += "\n";
    for n in &d.notes {
        s += &format!("note: {n}\n");
    }
    s += "\nCautions\n";
    for c in d.cautions {
        s += &format!("  * {c}\n");
    }
    s
}

/// Arguments of `ironwind probe`.
#[derive(Debug, clap::Args)]
pub(crate) struct ProbeArgs {
    /// Turns of the test winding wound over the existing one
    #[arg(long, requires_all = ["test_volts", "applied_volts"])]
    test_turns: Option<u32>,
    /// Volts read on the test winding, V RMS
    #[arg(long, requires = "test_turns")]
    test_volts: Option<f64>,
    /// Volts applied to the existing winding, V RMS
    #[arg(long, requires = "test_turns")]
    applied_volts: Option<f64>,
    /// Sweep CSV with header volts,amps (V RMS, A RMS)
    #[arg(long, requires = "sweep_turns")]
    sweep: Option<PathBuf>,
    /// Turns of the swept winding
    #[arg(long, requires = "sweep")]
    sweep_turns: Option<u32>,
    /// Frequency of the applied voltage, Hz
    #[arg(long, default_value_t = 50.0)]
    frequency: f64,
    /// Tongue width, mm or with a unit
    #[arg(long)]
    tongue: String,
    /// Stack depth, mm or with a unit
    #[arg(long)]
    stack: String,
    /// One window, WIDTHxHEIGHT in mm, for the path length (field strength)
    #[arg(long)]
    window: Option<String>,
    /// Lamination shape
    #[arg(long, value_enum, default_value_t = ShapeArg::Ei)]
    shape: ShapeArg,
    /// Stacking factor, > 0.5 and ≤ 1
    #[arg(long, default_value_t = 0.95)]
    stacking: f64,
    /// Write the sweep as an SVG chart to this file
    #[arg(long, requires = "sweep")]
    plot: Option<PathBuf>,
    /// Output format
    #[arg(long, value_enum, default_value_t = SimpleFormat::Text)]
    format: SimpleFormat,
}

/// Checks a flag's number: finite, above `lo` (or at it when `lo_inclusive`) and at most `hi`.
fn flag_in(flag: &str, v: f64, lo: f64, lo_inclusive: bool, hi: f64, unit: &str) -> Result<f64> {
    crate::job::Checker::new("command line").range(flag, v, lo, lo_inclusive, hi, unit)
}

fn probe_command(out: &mut dyn Write, a: ProbeArgs, cs: Charset) -> Result<()> {
    use crate::probe::{probe_run, sweep_plot, TestWinding};
    let format = a.format;
    if a.test_turns.is_none() && a.sweep.is_none() {
        return Err(Error::bad_value(
            "command line",
            "--test-turns / --sweep",
            "(neither)",
            "give a test winding (--test-turns, --test-volts, --applied-volts) or a sweep (--sweep, --sweep-turns), or both",
        ));
    }
    let f = a.frequency;
    flag_in("--frequency", f, 1.0, true, 2000.0, "Hz")?;
    let window = a.window.clone().unwrap_or_else(|| "1x1".to_string());
    let dims = core_from_flags(&a.tongue, &a.stack, &window, a.shape, a.stacking)?;
    let mut g = geometry(&dims);
    let path_estimated = a.window.is_none();
    if path_estimated {
        // Scrapless E-I proportions: window a/2 × 1.5a (McLyman).
        let t = dims.tongue_mm;
        g = geometry(&CoreDims::new(
            dims.shape,
            t,
            dims.stack_mm,
            (t / 2.0, 1.5 * t),
            dims.stacking_factor,
        ));
    }
    let test = match (a.test_turns, a.test_volts, a.applied_volts) {
        (Some(n), Some(v), Some(ap)) => {
            if !(1..=10_000).contains(&n) {
                return Err(Error::bad_value(
                    "command line",
                    "--test-turns",
                    n,
                    "must be ≥ 1 and ≤ 10000",
                ));
            }
            Some(TestWinding {
                turns: n,
                volts: flag_in("--test-volts", v, 0.0, false, 10_000.0, "V")?,
                applied_volts: flag_in("--applied-volts", ap, 0.0, false, 100_000.0, "V")?,
                applied_to: None,
            })
        }
        _ => None,
    };
    let curve = match (&a.sweep, a.sweep_turns) {
        (Some(path), Some(n)) => {
            if !(1..=100_000).contains(&n) {
                return Err(Error::bad_value(
                    "command line",
                    "--sweep-turns",
                    n,
                    "must be ≥ 1 and ≤ 100000",
                ));
            }
            let name = path.display().to_string();
            let text = read_text(path)?;
            let pts = read_sweep(&name, text.as_bytes())?;
            let c = crate::magnetics::ExcitationCurve::new(
                &pts.iter().map(|p| (p.volts, p.amps)).collect::<Vec<_>>(),
            )
            .map_err(|m| Error::bad_input(&name, m))?;
            Some((c, n))
        }
        _ => None,
    };
    let run = probe_run(
        test.as_ref(),
        curve.as_ref().map(|(c, n)| (c, *n)),
        f,
        g.area_net_mm2,
        g.path_length_mm,
        path_estimated,
    );
    if let Some(p) = &a.plot {
        write_file(p, sweep_plot(&run).as_bytes())?;
    }
    match format {
        SimpleFormat::Json => render::json::write_json(out, &run),
        SimpleFormat::Text => {
            let s = probe_text(&run, cs);
            let s = render::fold(cs, s);
            write!(out, "{s}")
        }
    }
    .map_err(out_err)
}

fn probe_text(r: &crate::probe::ProbeRun, cs: Charset) -> String {
    use render::{num, sig3};
    let mut s = String::new();
    if let (Some(v), Some(tpv), Some(n), Some(b)) = (
        r.volts_per_turn,
        r.turns_per_volt,
        r.powered_turns,
        r.donor_flux_t,
    ) {
        s += "Test winding\n";
        s += &render::pairs(
            &[
                ("volts per turn", format!("{} V", num(v, 4))),
                ("turns per volt", num(tpv, 4)),
                ("powered winding", format!("about {} turns", num(n, 0))),
                (
                    "donor ran at",
                    format!(
                        "{} T peak (net area {} mm², sine)",
                        num(b, 3),
                        num(r.area_net_mm2, 1)
                    ),
                ),
            ],
            cs,
        );
    }
    if !r.points.is_empty() {
        if !s.is_empty() {
            s += "\n";
        }
        s += &format!(
            "Magnetisation sweep ({} turns, {} Hz)\n",
            r.sweep_turns.unwrap_or(0),
            num(r.frequency_hz, 1)
        );
        let mut rows = vec![vec![
            "volts".to_string(),
            "amps".into(),
            "B peak T".into(),
            "H peak A/m (approx.)".into(),
        ]];
        for p in &r.points {
            rows.push(vec![
                num(p.volts, 2),
                sig3(p.amps),
                num(p.flux_t, 3),
                num(p.field_a_per_m, 0),
            ]);
        }
        s += &render::table(rows, 0, cs);
        let opt = |v: Option<f64>, d: usize, unit: &str| {
            v.map(|x| format!("{} {unit}", num(x, d)))
                .unwrap_or_else(|| "not reached".to_string())
        };
        s += &render::pairs(
            &[
                (
                    "IEC 61869-2 knee",
                    format!(
                        "{} = {}",
                        opt(r.knee_volts, 2, "V"),
                        opt(r.knee_flux_t, 3, "T")
                    ),
                ),
                (
                    "45° log-log tangent",
                    format!(
                        "{} = {}",
                        opt(r.tangent_volts, 2, "V"),
                        opt(r.tangent_flux_t, 3, "T")
                    ),
                ),
                (
                    "recommended maximum",
                    format!(
                        "{} (0.9 × the IEC knee flux)",
                        opt(r.recommended_flux_t, 3, "T")
                    ),
                ),
            ],
            cs,
        );
    }
    if !r.warnings.is_empty() {
        s += "\nWarnings\n";
        for w in &r.warnings {
            s += &format!("  ! {w}\n");
        }
    }
    s += "\nCaution: power probe tests only through a fuse and a current limit (series lamp or isolating variable\ntransformer); remove a microwave-oven donor's high-voltage winding first; keep one hand away.\n";
    s
}

/// Writes a whole file (charts, cards); failures are exit 1.
pub fn write_file(path: &Path, bytes: &[u8]) -> Result<()> {
    std::fs::write(path, bytes)
        .map_err(|e| Error::io(path.display().to_string(), "cannot write", &e))
}

#[allow(clippy::too_many_arguments)]
fn wire_command(
    out: &mut dyn Write,
    list: bool,
    amps: Option<f64>,
    density: f64,
    system: SystemArg,
    max_strand: f64,
    grade: u8,
    format: SimpleFormat,
    cs: Charset,
) -> Result<()> {
    use crate::wire::{choose, sizes, Grade, System, WireRequest};
    let system = match system {
        SystemArg::Metric => System::Metric,
        SystemArg::Awg => System::Awg,
    };
    let grade = match grade {
        1 => Grade::One,
        2 => Grade::Two,
        g => {
            return Err(Error::bad_value(
                "command line",
                "--grade",
                g,
                "must be 1 or 2",
            ))
        }
    };
    if list || amps.is_none() {
        let rows = sizes(system, grade);
        return match format {
            SimpleFormat::Json => render::json::write_json(out, &rows),
            SimpleFormat::Text => {
                let mut t = vec![vec![
                    if system == System::Awg {
                        "AWG".to_string()
                    } else {
                        "nominal mm".to_string()
                    },
                    "bare mm".into(),
                    format!("overall mm ({})", grade.label(system)),
                    "area mm²".into(),
                    "Ω/m at 20 °C".into(),
                    "A at 3 A/mm²".into(),
                ]];
                for r in rows {
                    t.push(vec![
                        r.size.clone(),
                        render::num(r.bare_mm, 4),
                        render::num(r.overall_mm, 3),
                        render::sig3(r.area_mm2),
                        render::sig3(crate::losses::resistance_ohm(1.0, r.area_mm2, 20.0)),
                        render::sig3(3.0 * r.area_mm2),
                    ]);
                }
                let s = render::table(t, 1, cs);
                let s = render::fold(cs, s);
                writeln!(out, "{s}")
            }
        }
        .map_err(out_err);
    }
    let amps = amps.unwrap_or(0.0);
    flag_in("--amps", amps, 0.0, false, 10_000.0, "A")?;
    flag_in("--density", density, 0.2, true, 20.0, "A/mm²")?;
    flag_in("--max-strand", max_strand, 0.1, true, 4.0, "mm")?;
    let c = choose(
        amps,
        density,
        system,
        grade,
        max_strand,
        &WireRequest::default(),
    );
    let area = c.area_mm2();
    #[derive(serde::Serialize)]
    struct Choice {
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
    let ch = Choice {
        amps,
        density_limit_a_mm2: density,
        system: c.conductor.system_name(),
        size: c.conductor.size_label(),
        strands: c.strands,
        bare_mm: c.conductor.bare_mm(),
        overall_mm: c.conductor.build_mm(),
        area_mm2: area,
        current_density_a_mm2: amps / area,
        cmil_per_a: area / crate::wire::MM2_PER_CMIL / amps,
    };
    match format {
        SimpleFormat::Json => render::json::write_json(out, &ch),
        SimpleFormat::Text => {
            use render::num;
            let s = render::pairs(
                &[
                    (
                        "current",
                        format!("{} A at ≤ {} A/mm²", num(amps, 2), num(density, 2)),
                    ),
                    (
                        "wire",
                        format!("{} ({})", c.conductor.describe(), grade.label(system)),
                    ),
                    ("strands in hand", c.strands.to_string()),
                    ("overall diameter", format!("{} mm", num(ch.overall_mm, 3))),
                    ("copper area", format!("{} mm² in all", num(area, 3))),
                    (
                        "current density",
                        format!(
                            "{} A/mm² ({} cmil/A)",
                            num(ch.current_density_a_mm2, 2),
                            num(ch.cmil_per_a, 0)
                        ),
                    ),
                ],
                cs,
            );
            let s = render::fold(cs, s);
            writeln!(out, "{s}")
        }
    }
    .map_err(out_err)
}

/// Whether stdout is a terminal (for colour and progress decisions).
pub fn stdout_is_terminal() -> bool {
    std::io::stdout().is_terminal()
}
