//! The first hour without the source: the examples built into the binary, a job on standard input,
//! a card on standard output, `plan --strict`, completions for every shell.

use crate::common::{edited, run, run_with, GOOD_JOB};

#[test]
fn the_examples_are_in_the_binary() {
    let list = run(&["example"]).ok().stdout;
    assert!(
        list.contains("garage_charger") && list.contains("spot_welder_donor"),
        "{list}"
    );
    for name in [
        "garage_charger",
        "pushpull_inverter_24v",
        "split_bobbin_rewind",
    ] {
        let text = run(&["example", name]).ok().stdout;
        let from_file =
            std::fs::read_to_string(format!("examples/{name}.toml")).expect("example file");
        assert_eq!(text, from_file, "{name}: the bundled text is the file's");
        // Printed, it plans from standard input.
        run_with(&["plan", "-"], Some(text.as_bytes()), &[]).ok();
    }
    run(&["example", "nope"])
        .code(2)
        .one_line_error()
        .stderr_has("garage_charger");
}

#[test]
fn standard_input_and_output_are_dashes() {
    let r = run_with(
        &["plan", "-", "--format", "json"],
        Some(GOOD_JOB.as_bytes()),
        &[],
    )
    .ok();
    assert_eq!(r.json()["windings"][0]["name"], "mains");
    let card = run(&["card", "examples/garage_charger.toml", "-o", "-"])
        .ok()
        .stdout;
    assert!(card.contains("WINDING CARD"));
    assert!(!std::path::Path::new("-").exists(), "no file named -");
}

#[test]
fn plan_strict_exits_3_when_the_verdict_fails() {
    let d = crate::common::scratch("strict");
    let bad = edited(GOOD_JOB, "amps = 4.0", "amps = 40.0");
    let p = crate::common::write(&d, "bad.toml", &bad);
    run(&["plan", &p, "--strict"]).code(3);
    run(&["plan", "examples/garage_charger.toml", "--strict"]).ok();
}

#[test]
fn completions_for_every_shell() {
    for shell in ["bash", "zsh", "fish", "powershell"] {
        let out = run(&["completions", shell]).ok().stdout;
        assert!(out.contains("ironwind"), "{shell}");
    }
}

#[test]
fn slips_get_a_hint() {
    let d = crate::common::scratch("slips");
    // A misspelt key: the message is whole and suggests the nearest key.
    let typo = edited(GOOD_JOB, "tongue_mm = 32.0", "tongu_mm = 32.0");
    run(&["plan", &crate::common::write(&d, "typo.toml", &typo)])
        .code(2)
        .one_line_error()
        .stderr_has("did you mean `tongue_mm`?");
    // A tongue of 1.5 read as millimetres: planned, with a warning that asks about inches.
    let inch = edited(GOOD_JOB, "tongue_mm = 32.0", "tongue_mm = 1.5");
    let j = run(&[
        "plan",
        &crate::common::write(&d, "inch.toml", &inch),
        "--format",
        "json",
    ])
    .ok()
    .json();
    assert!(
        j["warnings"].to_string().contains("did you mean inches?"),
        "{}",
        j["warnings"]
    );
    // Fractional inches as a US rule reads them: 1 1/4 in = 31.75 mm.
    let frac = edited(GOOD_JOB, "tongue_mm = 32.0", "tongue_mm = \"1 1/4 in\"");
    let j = run(&[
        "plan",
        &crate::common::write(&d, "frac.toml", &frac),
        "--format",
        "json",
    ])
    .ok()
    .json();
    assert_eq!(j["core"]["tongue_mm"], 31.75);
}

#[test]
fn a_card_that_does_not_pass_says_so_first() {
    let d = crate::common::scratch("banner");
    let bad = edited(GOOD_JOB, "amps = 4.0", "amps = 40.0");
    let p = crate::common::write(&d, "bad.toml", &bad);
    let text = run(&["card", &p]).ok().stdout;
    let first_words = text
        .lines()
        .find(|l| l.chars().any(char::is_alphanumeric))
        .expect("text");
    assert!(
        first_words.starts_with("DOES NOT PASS - DO NOT WIND THIS"),
        "{first_words}"
    );
    let html = run(&["card", &p, "--format", "html"]).ok().stdout;
    let banner = html.find("class=\"banner\"").expect("banner");
    assert!(
        banner < html.find("<h1>").expect("title"),
        "the banner comes before the title"
    );
    // Every winding's instructions are marked as not to be wound, in every format.
    let windings = bad.matches("[[winding]]").count();
    assert_eq!(text.matches("NOT TO BE WOUND").count(), windings, "{text}");
    assert_eq!(html.matches("class=\"w void\"").count(), windings);
    let md = run(&["card", &p, "--format", "markdown"]).ok().stdout;
    assert_eq!(md.matches("not to be wound").count(), windings, "{md}");
    let good = run(&["card", "examples/garage_charger.toml"]).ok().stdout;
    assert!(!good.contains("DO NOT WIND") && !good.contains("NOT TO BE WOUND"));
}

#[test]
fn the_svg_is_drawn_in_millimetres() {
    // Sized in mm at 1:1 (the drawing's unit is the millimetre): it prints to scale.
    let svg = run(&["card", "examples/garage_charger.toml", "--format", "svg"])
        .ok()
        .stdout;
    let doc = roxmltree::Document::parse(&svg).expect("svg");
    let root = doc.root_element();
    let vb: Vec<f64> = root
        .attribute("viewBox")
        .expect("viewBox")
        .split(' ')
        .map(|v| v.parse().expect("n"))
        .collect();
    assert_eq!(
        root.attribute("width"),
        Some(format!("{:.2}mm", vb[2]).as_str())
    );
    assert_eq!(
        root.attribute("height"),
        Some(format!("{:.2}mm", vb[3]).as_str())
    );
    // Eight windings, eight different hatchings.
    let ids: std::collections::HashSet<&str> = doc
        .descendants()
        .filter(|n| n.has_tag_name("pattern"))
        .filter_map(|n| n.attribute("id"))
        .filter(|id| id.starts_with("hatch-"))
        .collect();
    assert_eq!(ids.len(), 8);
}

#[test]
fn new_writes_a_job_that_plans() {
    let d = crate::common::scratch("new");
    let flags = [
        "new",
        "--tongue",
        "1 1/4 in",
        "--stack",
        "40",
        "--window",
        "16x48",
        "--primary",
        "230",
        "--output",
        "low=18:4",
        "--output",
        "12:1:ct",
    ];
    crate::common::run_in(&d, &flags, &[])
        .ok()
        .stderr_has("wrote job.toml")
        .stderr_has("ironwind plan job.toml");
    let text = std::fs::read_to_string(d.join("job.toml")).expect("written");
    // 1 1/4 in = 31.75 mm (1 in = 25.4 mm exactly, NIST SP 811 B.8).
    assert!(text.contains("tongue_mm = 31.75"), "{text}");
    let plan = crate::common::run_in(&d, &["plan", "job.toml", "--format", "json"], &[])
        .ok()
        .json();
    let names: Vec<&str> = plan["windings"]
        .as_array()
        .expect("windings")
        .iter()
        .filter_map(|w| w["name"].as_str())
        .collect();
    assert_eq!(names, ["primary", "low", "out2"]);
    // A second run does not write over the first.
    crate::common::run_in(&d, &flags, &[])
        .code(2)
        .one_line_error()
        .stderr_has("--force");
    // Without a terminal nothing is asked: a missing answer names its flag.
    crate::common::run_in(&d, &["new", "other.toml", "--tongue", "32"], &[])
        .code(2)
        .one_line_error()
        .stderr_has("--stack");
    // To standard output, with the inch slip warned.
    let r = run(&[
        "new",
        "-",
        "--tongue",
        "1.5",
        "--stack",
        "40",
        "--window",
        "16x48",
        "--primary",
        "230",
        "--output",
        "18:4",
    ])
    .ok()
    .stderr_has("did you mean inches");
    run_with(&["plan", "-"], Some(r.stdout.as_bytes()), &[]).ok();
}

#[test]
fn new_asks_on_a_terminal() {
    // `script` (util-linux) gives the child a pseudo-terminal; without it this check is skipped.
    let have_script = std::process::Command::new("script")
        .arg("--version")
        .output()
        .is_ok_and(|o| o.status.success());
    if !have_script {
        eprintln!("skipped: no `script` to give ironwind a terminal");
        return;
    }
    let d = crate::common::scratch("new-tty");
    let bin = env!("CARGO_BIN_EXE_ironwind");
    let answers = "bench job\n\n32\n40\n16x48\n\n60\n\n120\n24:2\n\n";
    let mut child = std::process::Command::new("script")
        .args(["-qec", &format!("{bin} new asked.toml"), "/dev/null"])
        .current_dir(&d)
        .stdin(std::process::Stdio::piped())
        .stdout(std::process::Stdio::piped())
        .stderr(std::process::Stdio::piped())
        .spawn()
        .expect("script runs");
    if let Some(mut s) = child.stdin.take() {
        use std::io::Write;
        let _ = s.write_all(answers.as_bytes());
    }
    let out = child.wait_with_output().expect("script finishes");
    let shown = String::from_utf8_lossy(&out.stdout);
    assert!(shown.contains("Tongue width, mm"), "{shown}");
    let text = std::fs::read_to_string(d.join("asked.toml")).expect("written");
    assert!(text.contains("name = \"bench job\""), "{text}");
    assert!(text.contains("frequency_hz = 60"), "{text}");
    assert!(text.contains("volts = 120"), "{text}");
    crate::common::run_in(&d, &["plan", "asked.toml"], &[]).ok();
}

#[test]
fn every_manual_page_the_pages_name_exists() {
    let d = crate::common::scratch("man");
    let dir = d.join("man1");
    run(&["manpage", "--dir", &dir.display().to_string()]).ok();
    let mut named = Vec::new();
    for e in std::fs::read_dir(&dir).expect("pages") {
        let text = std::fs::read_to_string(e.expect("entry").path()).expect("page");
        for part in text.split("(1)") {
            let word = part
                .rsplit(|c: char| c.is_whitespace())
                .next()
                .unwrap_or("")
                .replace("\\-", "-");
            if word.starts_with("ironwind") {
                named.push(word);
            }
        }
    }
    assert!(named.iter().any(|n| n == "ironwind-plan"), "{named:?}");
    assert!(named.iter().any(|n| n == "ironwind-shelf-add"), "{named:?}");
    for n in named {
        assert!(
            dir.join(format!("{n}.1")).exists(),
            "{n}(1) is named but not written"
        );
    }
    let one = run(&["manpage", "shelf", "rank"]).ok().stdout;
    assert!(one.contains(".TH ironwind-shelf-rank 1"), "{one}");
    run(&["manpage", "nope"]).code(2).one_line_error();
}

#[test]
fn clap_errors_keep_their_usage_line_on_one_line() {
    let r = run(&["plan"]).code(2).one_line_error();
    assert!(
        r.stderr.contains("Usage: ironwind plan <JOB>"),
        "{}",
        r.stderr
    );
    let r = run(&["plan", "x.toml", "--bogus"]).code(2).one_line_error();
    assert!(
        r.stderr.contains("--bogus") && r.stderr.contains("Usage:"),
        "{}",
        r.stderr
    );
}
