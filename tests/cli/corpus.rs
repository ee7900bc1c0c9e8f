//! The bad-input corpus in tests/bad_inputs: every case exits 2 (or 1 for I/O) with one line on
//! stderr naming the file, the key or line, and never panics or half-writes a file.

use crate::common::{root, run, scratch};

#[test]
fn every_bad_input_case_is_refused_cleanly() {
    let dir = root().join("tests/bad_inputs");
    let manifest = std::fs::read_to_string(dir.join("cases.tsv")).expect("cases.tsv");
    let good = root()
        .join("examples/garage_charger.toml")
        .display()
        .to_string();
    let mut n = 0;
    for line in manifest
        .lines()
        .filter(|l| !l.starts_with('#') && !l.trim().is_empty())
    {
        let cols: Vec<&str> = line.split('\t').collect();
        assert_eq!(cols.len(), 4, "manifest row: {line}");
        let (case, code, needle, args) = (cols[0], cols[1], cols[2], cols[3]);
        let scratch_dir = scratch(&format!("corpus-{n}"));
        let file = dir.join(case).display().to_string();
        let args: Vec<String> = args
            .split_whitespace()
            .map(|a| {
                a.replace("{f0}", &good)
                    .replace("{f}", &file)
                    .replace("{dir}", &scratch_dir.display().to_string())
            })
            .collect();
        let argv: Vec<&str> = args.iter().map(String::as_str).collect();
        let r = run(&argv);
        let code: i32 = code.parse().expect("code");
        assert_eq!(
            r.code, code,
            "{case}: exit {} (stderr: {})",
            r.code, r.stderr
        );
        assert!(
            !r.stderr.contains("panicked"),
            "{case}: panic: {}",
            r.stderr
        );
        assert!(r.stderr.starts_with("error: "), "{case}: {}", r.stderr);
        assert_eq!(
            r.stderr.trim_end().lines().count(),
            1,
            "{case}: one line: {}",
            r.stderr
        );
        assert!(
            r.stderr.contains(needle),
            "{case}: `{}` lacks `{needle}`",
            r.stderr.trim_end()
        );
        if dir.join(case).is_file() {
            assert!(
                r.stderr.contains(case),
                "{case}: the message names the file: {}",
                r.stderr.trim_end()
            );
        }
        assert!(r.stdout.is_empty(), "{case}: nothing on stdout");
        // Never a partial write: a failing command leaves no shelf behind.
        assert!(
            !scratch_dir.join("shelf.csv").exists(),
            "{case}: no shelf written"
        );
        n += 1;
    }
    assert!(n >= 60, "the corpus holds at least 60 cases ({n})");
}

#[test]
fn a_50_megabyte_file_is_refused_without_reading_it_all() {
    let d = scratch("corpus-huge");
    let p = d.join("huge.toml");
    let line =
        "# padding padding padding padding padding padding padding padding padding padding\n";
    let text = line.repeat(50 * 1024 * 1024 / line.len() + 1);
    std::fs::write(&p, text).expect("write");
    let r = run(&["plan", &p.display().to_string()]);
    assert_eq!(r.code, 2, "{}", r.stderr);
    assert!(
        r.stderr.contains("huge.toml") && r.stderr.contains("larger"),
        "{}",
        r.stderr
    );
    let _ = std::fs::remove_file(&p);
}
