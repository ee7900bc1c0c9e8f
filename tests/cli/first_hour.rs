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
