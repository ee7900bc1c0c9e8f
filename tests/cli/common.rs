//! A small builder that runs the real binary: args, optional stdin and env, then checks.

use std::io::Write;
use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};

/// What a run gave.
pub struct Ran {
    pub code: i32,
    pub stdout: String,
    pub stderr: String,
}

impl Ran {
    #[track_caller]
    pub fn ok(self) -> Self {
        assert_eq!(self.code, 0, "exit {}; stderr: {}", self.code, self.stderr);
        self
    }
    #[track_caller]
    pub fn code(self, code: i32) -> Self {
        assert_eq!(
            self.code, code,
            "stdout: {}\nstderr: {}",
            self.stdout, self.stderr
        );
        self
    }
    #[track_caller]
    pub fn stderr_has(self, needle: &str) -> Self {
        assert!(
            self.stderr.contains(needle),
            "stderr `{}` lacks `{needle}`",
            self.stderr
        );
        self
    }
    #[track_caller]
    pub fn stdout_has(self, needle: &str) -> Self {
        assert!(
            self.stdout.contains(needle),
            "stdout lacks `{needle}`:\n{}",
            self.stdout
        );
        self
    }
    /// An error run: one line on stderr starting with `error: `, no panic.
    #[track_caller]
    pub fn one_line_error(self) -> Self {
        assert!(!self.stderr.contains("panicked"), "panic: {}", self.stderr);
        assert!(
            self.stderr.starts_with("error: "),
            "stderr: {}",
            self.stderr
        );
        assert_eq!(
            self.stderr.trim_end().lines().count(),
            1,
            "stderr: {}",
            self.stderr
        );
        self
    }
    pub fn json(&self) -> serde_json::Value {
        serde_json::from_str(&self.stdout)
            .unwrap_or_else(|e| panic!("not JSON ({e}): {}", self.stdout))
    }
}

/// Runs ironwind with `args`.
pub fn run(args: &[&str]) -> Ran {
    run_with(args, None, &[])
}

/// Runs ironwind with `args`, optional stdin bytes and extra environment.
pub fn run_with(args: &[&str], stdin: Option<&[u8]>, env: &[(&str, &str)]) -> Ran {
    run_full(None, args, stdin, env)
}

/// Runs ironwind in directory `dir` (the child's working directory; the test process's own is
/// never changed, so tests running beside it are not moved).
pub fn run_in(dir: &Path, args: &[&str], env: &[(&str, &str)]) -> Ran {
    run_full(Some(dir), args, None, env)
}

fn run_full(dir: Option<&Path>, args: &[&str], stdin: Option<&[u8]>, env: &[(&str, &str)]) -> Ran {
    let mut cmd = Command::new(env!("CARGO_BIN_EXE_ironwind"));
    if let Some(d) = dir {
        cmd.current_dir(d);
    }
    cmd.args(args)
        .stdin(if stdin.is_some() {
            Stdio::piped()
        } else {
            Stdio::null()
        })
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .env_remove("IRONWIND_SHELF")
        .env_remove("COLUMNS")
        .env("NO_COLOR", "1");
    for (k, v) in env {
        cmd.env(k, v);
    }
    let mut child = cmd.spawn().expect("the binary runs");
    if let Some(bytes) = stdin {
        if let Some(mut s) = child.stdin.take() {
            let _ = s.write_all(bytes);
        }
    }
    let out = child.wait_with_output().expect("the binary finishes");
    Ran {
        code: out.status.code().unwrap_or(-1),
        stdout: String::from_utf8_lossy(&out.stdout).into_owned(),
        stderr: String::from_utf8_lossy(&out.stderr).into_owned(),
    }
}

/// The repository root.
pub fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

/// Every example job file.
pub fn example_jobs() -> Vec<PathBuf> {
    let mut v: Vec<PathBuf> = std::fs::read_dir(root().join("examples"))
        .expect("examples/")
        .filter_map(|e| e.ok().map(|e| e.path()))
        .filter(|p| p.extension().is_some_and(|x| x == "toml"))
        .collect();
    v.sort();
    assert!(v.len() >= 3, "at least three example jobs");
    v
}

/// A scratch directory unique to one test.
pub fn scratch(name: &str) -> PathBuf {
    let d = std::env::temp_dir().join(format!("ironwind-test-{}-{name}", std::process::id()));
    let _ = std::fs::remove_dir_all(&d);
    std::fs::create_dir_all(&d).expect("scratch dir");
    d
}

/// Writes a file in a scratch directory and returns its path as a string.
pub fn write(dir: &Path, name: &str, text: &str) -> String {
    let p = dir.join(name);
    std::fs::write(&p, text).expect("write");
    p.display().to_string()
}

/// A job that plans cleanly, for tests to edit.
pub const GOOD_JOB: &str = r#"name = "test job"
[core]
tongue_mm = 32.0
stack_mm = 40.0
window_width_mm = 16.0
window_height_mm = 48.0
[supply]
frequency_hz = 50.0
[[winding]]
name = "mains"
role = "primary"
volts = 230.0
[[winding]]
name = "out"
role = "secondary"
volts = 28.0
amps = 4.0
"#;

/// `text` with `from` replaced by `to`; fails when `from` is not in the text, so a test that edits
/// a job cannot silently test the unedited one.
#[track_caller]
pub fn edited(text: &str, from: &str, to: &str) -> String {
    assert!(
        text.contains(from),
        "the text to replace, `{from}`, is not in:\n{text}"
    );
    text.replace(from, to)
}
