//! What a person gave, read and checked: the size-limited text reader and the range checker.
//!
//! Both are shared by every input path (job files, sweeps, shelf imports, flags), so they live
//! here, below the modules that use them. Every error names where the value came from (a file, or
//! `command line`), the key or flag, the value as given and what is accepted (STYLE.md, habit 4).

use crate::error::{Error, Result};
use crate::units::LengthInput;
use std::io::Read;
use std::path::Path;

/// Reads standard input as a text file (a job given as `-`), size-limited like a file.
pub fn read_stdin() -> Result<String> {
    let mut bytes = Vec::new();
    std::io::stdin()
        .take(MAX_READ_BYTES + 1)
        .read_to_end(&mut bytes)
        .map_err(|e| Error::bad_input("standard input", format!("cannot read: {e}")))?;
    if bytes.len() as u64 > MAX_READ_BYTES {
        return Err(Error::bad_input(
            "standard input",
            format!(
                "larger than {} MiB; expected a small text file",
                MAX_READ_BYTES >> 20
            ),
        ));
    }
    String::from_utf8(bytes).map_err(|_| Error::bad_input("standard input", "not UTF-8 text"))
}

/// The accepted word nearest `word`, when it is near enough to be a slip (an edit distance of at
/// most a third of its length, and at least 1 and at most 3).
pub fn did_you_mean<'a>(word: &str, accepted: &[&'a str]) -> Option<&'a str> {
    let limit = (word.chars().count() / 3).clamp(1, 3);
    accepted
        .iter()
        .map(|a| (edit_distance(word, a), *a))
        .filter(|(d, _)| *d <= limit)
        .min_by_key(|(d, _)| *d)
        .map(|(_, a)| a)
}

/// Levenshtein distance (insertions, deletions and substitutions count one each).
fn edit_distance(a: &str, b: &str) -> usize {
    let b: Vec<char> = b.chars().collect();
    let mut row: Vec<usize> = (0..=b.len()).collect();
    for (i, ca) in a.chars().enumerate() {
        let mut prev = row[0];
        row[0] = i + 1;
        for (j, cb) in b.iter().enumerate() {
            let cur = row[j + 1];
            row[j + 1] = (prev + usize::from(ca != *cb)).min(row[j] + 1).min(cur + 1);
            prev = cur;
        }
    }
    row[b.len()]
}

/// Largest text file read (job, sweep, shelf import), bytes.
pub const MAX_READ_BYTES: u64 = 16 << 20;

/// Reads a text file a person named, refusing directories, huge files and non-UTF-8 bytes.
pub fn read_text(path: &Path) -> Result<String> {
    let name = path.display().to_string();
    let meta = std::fs::metadata(path)
        .map_err(|e| Error::bad_input(&name, format!("cannot read: {e}")))?;
    if meta.is_dir() {
        return Err(Error::bad_input(&name, "is a directory; expected a file"));
    }
    if !meta.is_file() {
        // A FIFO would block the read for ever; a device is not a text file.
        return Err(Error::bad_input(
            &name,
            "is not a regular file (a pipe or a device); expected a text file",
        ));
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

/// Converts a TOML error to one line: file, line, key and the message.
pub fn toml_error(origin: &str, text: &str, err: &toml::de::Error) -> Error {
    let mut msg = err.message().replace('\n', " ");
    if let Some(hint) = unknown_field_hint(&msg) {
        msg += &hint;
    }
    let Some(span) = err.span() else {
        return Error::bad_input(origin, msg);
    };
    let start = span.start.min(text.len());
    let line_no = text[..start].matches('\n').count() + 1;
    let line = text.lines().nth(line_no - 1).unwrap_or("").trim();
    let shown = crate::error::one_line(line);
    if shown.is_empty() || msg.contains(&shown) {
        Error::bad_input(origin, format!("line {line_no}: {msg}"))
    } else {
        Error::bad_input(origin, format!("line {line_no}: `{shown}`: {msg}"))
    }
}

/// "; did you mean `x`?" for serde's "unknown field `y`, expected one of `a`, `b`".
fn unknown_field_hint(msg: &str) -> Option<String> {
    let rest = msg.strip_prefix("unknown field `")?;
    let (field, rest) = rest.split_once('`')?;
    let list = rest.split_once("expected one of ")?.1;
    let keys: Vec<&str> = list
        .split(", ")
        .map(|k| k.trim().trim_matches('`'))
        .collect();
    did_you_mean(field, &keys).map(|k| format!("; did you mean `{k}`?"))
}

/// A range check helper bound to one file.
pub struct Checker<'a> {
    origin: &'a str,
}

impl<'a> Checker<'a> {
    /// A checker for values from `origin`.
    pub fn new(origin: &'a str) -> Self {
        Checker { origin }
    }

    /// Checks lo < v ≤ hi (or lo ≤ v when `lo_inclusive`), finite.
    pub fn range(
        &self,
        field: &str,
        v: f64,
        lo: f64,
        lo_inclusive: bool,
        hi: f64,
        unit: &str,
    ) -> Result<f64> {
        let ok_lo = if lo_inclusive { v >= lo } else { v > lo };
        if v.is_finite() && ok_lo && v <= hi {
            return Ok(v);
        }
        let op = if lo_inclusive { "≥" } else { ">" };
        let unit = if unit.is_empty() {
            String::new()
        } else {
            format!(" {unit}")
        };
        Err(Error::bad_value(
            self.origin,
            field,
            fmt_value(v),
            format!("must be {op} {lo}{unit} and ≤ {hi}{unit}"),
        ))
    }

    /// A length in mm that must be positive and at most `hi`.
    pub fn length(&self, field: &str, v: &LengthInput, hi: f64) -> Result<f64> {
        self.range(field, v.mm, 0.0, false, hi, "mm")
            .map_err(|e| relabel(e, &v.text))
    }

    /// A length in mm that may be zero.
    pub fn length0(&self, field: &str, v: &LengthInput, hi: f64) -> Result<f64> {
        self.range(field, v.mm, 0.0, true, hi, "mm")
            .map_err(|e| relabel(e, &v.text))
    }

    /// A choice among words.
    pub fn word(&self, field: &str, v: &str, accepted: &[&str]) -> Result<String> {
        let lower = v.trim().to_ascii_lowercase();
        if accepted.contains(&lower.as_str()) {
            Ok(lower)
        } else {
            let list: Vec<String> = accepted.iter().map(|a| format!("\"{a}\"")).collect();
            Err(Error::bad_value(
                self.origin,
                field,
                format!("\"{v}\""),
                format!("must be one of {}", list.join(", ")),
            ))
        }
    }

    /// Any error for a field.
    pub fn fail(
        &self,
        field: &str,
        value: impl std::fmt::Display,
        accepted: impl Into<String>,
    ) -> Error {
        Error::bad_value(self.origin, field, value, accepted)
    }
}

fn relabel(e: Error, text: &str) -> Error {
    match e {
        Error::BadValue {
            origin,
            field,
            accepted,
            value,
        } => Error::BadValue {
            origin,
            field,
            value: if text.is_empty() || text == value {
                value
            } else {
                format!("\"{text}\"")
            },
            accepted,
        },
        other => other,
    }
}

/// Formats a number as a person typed it (no trailing zeros), or NaN/inf.
pub fn fmt_value(v: f64) -> String {
    if v.is_finite() {
        format!("{v}")
    } else {
        format!("{v}").to_lowercase()
    }
}
