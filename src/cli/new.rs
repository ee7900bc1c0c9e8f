//! `ironwind new [FILE]`: start a job. Every answer not given as a flag is asked on a terminal
//! (defaults and units shown); with no terminal nothing is asked and a missing answer is an error
//! naming its flag. The written file is parsed and planned before it is written.

use super::{note, out_err, Ctx, ShapeArg, SystemArg};
use crate::error::{Error, Result};
use crate::flags::{flag_in, flag_length, ORIGIN};
use crate::job::starter::{starter_text, Starter, StarterOutput};
use std::io::{BufRead, IsTerminal, Write};
use std::path::PathBuf;

/// `--waveform` of a new job.
#[derive(Debug, Clone, Copy, clap::ValueEnum, PartialEq, Eq)]
enum DriveArg {
    Sine,
    Square,
    QuasiSquare,
}

impl DriveArg {
    fn word(self) -> &'static str {
        match self {
            DriveArg::Sine => "sine",
            DriveArg::Square => "square",
            DriveArg::QuasiSquare => "quasi-square",
        }
    }
}

/// Arguments of `ironwind new`.
#[derive(Debug, clap::Args)]
pub(super) struct Args {
    /// The job file to write (default job.toml; `-` writes standard output)
    file: Option<PathBuf>,
    /// Write over an existing file
    #[arg(long)]
    force: bool,
    /// The job's name
    #[arg(long)]
    name: Option<String>,
    /// Lamination shape
    #[arg(long, value_enum)]
    shape: Option<ShapeArg>,
    /// Tongue (centre leg) width: mm, or with a unit ("1.25 in")
    #[arg(long)]
    tongue: Option<String>,
    /// Stack depth: mm, or with a unit
    #[arg(long)]
    stack: Option<String>,
    /// One window, width x height: "16x48", "0.625inx1.875in"
    #[arg(long)]
    window: Option<String>,
    /// Steel: unknown, non-oriented, grain-oriented or a grade like M400-50A
    #[arg(long)]
    steel: Option<String>,
    /// Supply frequency, Hz
    #[arg(long)]
    frequency: Option<f64>,
    /// The primary's drive
    #[arg(long, value_enum)]
    waveform: Option<DriveArg>,
    /// Primary volts (RMS; for square drives the amplitude)
    #[arg(long)]
    primary: Option<f64>,
    /// A centre-tapped primary for a push-pull drive (each half at --primary)
    #[arg(long)]
    push_pull: bool,
    /// An output: VOLTS:AMPS, with a name NAME=VOLTS:AMPS, centre-tapped VOLTS:AMPS:ct (repeat
    /// for more outputs)
    #[arg(long = "output", value_name = "[NAME=]VOLTS:AMPS[:ct]")]
    outputs: Vec<String>,
    /// Wire table for automatic choices
    #[arg(long, value_enum)]
    system: Option<SystemArg>,
}

/// Questions on a terminal, answers from standard input.
struct Asker {
    live: bool,
}

impl Asker {
    /// One answer: the default on an empty line; `None` at the end of input.
    fn ask(&self, question: &str, default: Option<&str>) -> Result<Option<String>> {
        let prompt = match default {
            Some(d) => format!("{question} [{d}]: "),
            None => format!("{question}: "),
        };
        let mut err = std::io::stderr();
        let _ = write!(err, "{prompt}");
        let _ = err.flush();
        let mut line = String::new();
        let n = std::io::stdin()
            .lock()
            .read_line(&mut line)
            .map_err(|e| Error::io("standard input", "cannot read", &e))?;
        if n == 0 {
            return Ok(None);
        }
        let line = line.trim();
        Ok(Some(if line.is_empty() {
            default.unwrap_or("").to_string()
        } else {
            line.to_string()
        }))
    }

    /// Asks until `check` accepts the answer (five tries); without a terminal, a missing flag is
    /// an error naming it.
    fn value<T>(
        &self,
        flag: &str,
        question: &str,
        default: Option<&str>,
        check: impl Fn(&str) -> Result<T>,
    ) -> Result<T> {
        if !self.live {
            return match default {
                Some(d) => check(d),
                None => Err(Error::bad_value(
                    ORIGIN,
                    flag,
                    "(not given)",
                    format!("is needed without a terminal to ask on: give {flag}"),
                )),
            };
        }
        let mut last = None;
        for _ in 0..5 {
            let Some(answer) = self.ask(question, default)? else {
                break;
            };
            match check(&answer) {
                Ok(v) => return Ok(v),
                Err(e) => {
                    let _ = writeln!(std::io::stderr(), "  {e}");
                    last = Some(e);
                }
            }
        }
        Err(last.unwrap_or_else(|| {
            Error::bad_value(ORIGIN, flag, "(no answer)", format!("give {flag}"))
        }))
    }
}

/// A number answer.
fn number(flag: &str, text: &str, lo: f64, hi: f64, unit: &str) -> Result<f64> {
    let v: f64 = text.trim().parse().map_err(|_| {
        Error::bad_value(
            ORIGIN,
            flag,
            format!("\"{}\"", crate::error::short_value(text)),
            format!("must be a number of {unit}"),
        )
    })?;
    flag_in(flag, v, lo, false, hi, unit)
}

/// One `--output` answer: `[NAME=]VOLTS:AMPS[:ct]`.
fn output(text: &str, index: usize) -> Result<StarterOutput> {
    let bad = |why: &str| {
        Error::bad_value(
            ORIGIN,
            "--output",
            format!("\"{}\"", crate::error::short_value(text)),
            format!("{why}: give VOLTS:AMPS, NAME=VOLTS:AMPS or VOLTS:AMPS:ct"),
        )
    };
    let (name, rest) = match text.split_once('=') {
        Some((n, r)) if !n.trim().is_empty() => (n.trim().to_string(), r),
        Some(_) => return Err(bad("the name is empty")),
        None => (format!("out{index}"), text),
    };
    let parts: Vec<&str> = rest.split(':').map(str::trim).collect();
    let centre_tap = match parts.get(2) {
        None => false,
        Some(&"ct") => true,
        Some(_) => return Err(bad("the third part may only be `ct`")),
    };
    if parts.len() < 2 || parts.len() > 3 {
        return Err(bad("volts and amps are both needed"));
    }
    let volts = number("--output", parts[0], 0.0, 100_000.0, "V")?;
    let amps = number("--output", parts[1], 0.0, 100_000.0, "A")?;
    Ok(StarterOutput {
        name,
        volts,
        amps,
        centre_tap,
    })
}

/// The outputs: from the flags, else asked one by one (an empty line ends the list).
fn outputs(a: &Args, asker: &Asker) -> Result<Vec<StarterOutput>> {
    if !a.outputs.is_empty() {
        return a
            .outputs
            .iter()
            .enumerate()
            .map(|(k, t)| output(t, k + 1))
            .collect();
    }
    if !asker.live {
        return Err(Error::bad_value(
            ORIGIN,
            "--output",
            "(not given)",
            "is needed without a terminal to ask on: give --output VOLTS:AMPS (repeat for more)",
        ));
    }
    let mut list = Vec::new();
    while list.len() < 16 {
        let k = list.len() + 1;
        let question = if list.is_empty() {
            format!("Output {k}: [name=]volts:amps[:ct], e.g. 24:5")
        } else {
            format!("Output {k} (empty to finish)")
        };
        let Some(answer) = asker.ask(&question, None)? else {
            break;
        };
        if answer.is_empty() && !list.is_empty() {
            break;
        }
        match output(&answer, k) {
            Ok(o) => list.push(o),
            Err(e) => {
                let _ = writeln!(std::io::stderr(), "  {e}");
            }
        }
    }
    if list.is_empty() {
        return Err(Error::bad_value(
            ORIGIN,
            "--output",
            "(no answer)",
            "give at least one output, VOLTS:AMPS",
        ));
    }
    Ok(list)
}

/// Every answer, from the flags or asked.
fn answers(a: &Args, asker: &Asker) -> Result<Starter> {
    let name = match &a.name {
        Some(n) => n.clone(),
        None => asker.value("--name", "Job name", Some("new job"), |s| Ok(s.to_string()))?,
    };
    let shape = match a.shape {
        Some(s) => s.shape(),
        None => asker.value(
            "--shape",
            "Lamination shape, ei or ui",
            Some("ei"),
            |s| match s.trim().to_ascii_lowercase().as_str() {
                "ei" | "e-i" => Ok(crate::geometry::Shape::Ei),
                "ui" | "u-i" => Ok(crate::geometry::Shape::Ui),
                _ => Err(Error::bad_value(ORIGIN, "--shape", s, "must be ei or ui")),
            },
        )?,
    };
    let length = |flag: &'static str, given: &Option<String>, q: &str| -> Result<(f64, String)> {
        let check = |s: &str| flag_length(flag, s).map(|mm| (mm, s.to_string()));
        match given {
            Some(t) => check(t),
            None => asker.value(flag, q, None, check),
        }
    };
    let tongue = length("--tongue", &a.tongue, "Tongue width, mm (or \"1.25 in\")")?;
    let stack = length("--stack", &a.stack, "Stack depth, mm")?;
    let window_check = |s: &str| crate::flags::flag_window(s).map(|(w, h)| (w, h, s.to_string()));
    let window = match &a.window {
        Some(w) => window_check(w)?,
        None => asker.value(
            "--window",
            "One window, width x height, mm (e.g. 16x48)",
            None,
            window_check,
        )?,
    };
    let steel = match &a.steel {
        Some(s) => s.clone(),
        None => asker.value(
            "--steel",
            "Steel: unknown, non-oriented, grain-oriented or a grade",
            Some("unknown"),
            |s| Ok(s.to_string()),
        )?,
    };
    let frequency_hz = match a.frequency {
        Some(f) => flag_in("--frequency", f, 1.0, true, 2000.0, "Hz")?,
        None => asker.value("--frequency", "Supply frequency, Hz", Some("50"), |s| {
            number("--frequency", s, 1.0, 2000.0, "Hz")
        })?,
    };
    let waveform = match a.waveform {
        Some(w) => w.word().to_string(),
        None => asker.value(
            "--waveform",
            "Drive: sine (mains), square or quasi-square (an inverter)",
            Some("sine"),
            |s| {
                crate::input::Checker::new(ORIGIN).word(
                    "--waveform",
                    s.trim(),
                    &["sine", "square", "quasi-square"],
                )
            },
        )?,
    };
    let primary_volts = match a.primary {
        Some(v) => flag_in("--primary", v, 0.0, false, 100_000.0, "V")?,
        None => asker.value("--primary", "Primary volts (RMS)", None, |s| {
            number("--primary", s, 0.0, 100_000.0, "V")
        })?,
    };
    let outputs = outputs(a, asker)?;
    let system = a
        .system
        .map_or(crate::wire::System::Metric, SystemArg::system);
    Ok(Starter {
        name,
        shape,
        tongue_mm: tongue,
        stack_mm: stack,
        window_mm: window,
        steel,
        frequency_hz,
        waveform,
        primary_volts,
        primary_centre_tap: a.push_pull,
        outputs,
        system,
    })
}

pub(super) fn run(out: &mut dyn Write, a: Args, ctx: &Ctx) -> Result<i32> {
    let path = a.file.clone().unwrap_or_else(|| PathBuf::from("job.toml"));
    let to_stdout = path.as_os_str() == "-";
    if !to_stdout && !a.force && path.exists() {
        return Err(Error::bad_value(
            ORIGIN,
            "FILE",
            format!("\"{}\"", path.display()),
            "exists already: give another name, or --force to write over it",
        ));
    }
    let asker = Asker {
        live: std::io::stdin().is_terminal() && std::io::stderr().is_terminal(),
    };
    let starter = answers(&a, &asker)?;
    let text = starter_text(&starter);
    let origin = format!("{} (ironwind new)", path.display());
    let no_sweep = |_: &str| Err(Error::Failed("a new job has no sweep".into()));
    let job = crate::job::parse_job(&text, &origin, &no_sweep)?;
    let plan = crate::plan::plan(&job);
    for w in &job.input_warnings {
        note(
            ctx,
            &format!("warning: {}", crate::render::words::warning(w)),
        );
    }
    if to_stdout {
        out.write_all(text.as_bytes()).map_err(out_err)?;
    } else {
        super::write_file(&path, text.as_bytes())?;
    }
    let shown = if to_stdout {
        "JOB.toml".to_string()
    } else {
        path.display().to_string()
    };
    if !to_stdout {
        note(ctx, &format!("wrote {shown}"));
    }
    let verdict = if plan.verdict.ok {
        "its plan passes every check"
    } else {
        "its plan does not pass yet (the plan says which check fails and why)"
    };
    note(
        ctx,
        &format!("{verdict}; next: ironwind plan {shown}, then ironwind card {shown}"),
    );
    Ok(0)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn output_answers_read_name_volts_amps_and_tap() {
        let o = output("low=12.6:3:ct", 1).expect("ok");
        assert_eq!(o.name, "low");
        assert!(o.centre_tap);
        approx::assert_relative_eq!(o.volts, 12.6);
        let o = output("24:5", 2).expect("ok");
        assert_eq!(o.name, "out2");
        assert!(output("24", 1).is_err());
        assert!(output("24:5:x", 1).is_err());
        assert!(output("=24:5", 1).is_err());
    }
}
