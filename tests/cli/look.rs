//! The Look (units, colour, charset) reaches every command: `--units imperial` prints inches where a
//! length is shown, `--color always` colours the verdict words, `--color never` and NO_COLOR print no
//! escape at all, help included.

use crate::common::run_with;

const SHELF: &str = "tests/golden/shelf.csv";
const JOB: &str = "examples/garage_charger.toml";

fn commands() -> Vec<Vec<&'static str>> {
    vec![
        vec!["plan", JOB],
        vec!["card", JOB],
        vec!["demo"],
        vec![
            "core", "--tongue", "32", "--stack", "40", "--window", "16x48",
        ],
        vec!["wire", "--amps", "12"],
        vec!["wire", "--list"],
        vec![
            "probe",
            "--test-turns",
            "10",
            "--test-volts",
            "2.31",
            "--applied-volts",
            "230",
            "--tongue",
            "38",
            "--stack",
            "62",
        ],
        vec!["rate", JOB],
        vec!["shelf", "--shelf", SHELF, "list"],
        vec!["shelf", "--shelf", SHELF, "show", "1"],
        vec!["shelf", "--shelf", SHELF, "rank", JOB],
    ]
}

fn with(flags: &[&'static str], cmd: &[&'static str]) -> Vec<&'static str> {
    flags.iter().chain(cmd).copied().collect()
}

#[test]
fn imperial_units_reach_every_command_that_shows_a_length() {
    // `shelf rank` shows no length (margins, losses, rises and fills only).
    for cmd in commands().into_iter().filter(|c| !c.contains(&"rank")) {
        let r = run_with(&with(&["--units", "imperial"], &cmd), None, &[]).ok();
        let has_inches = r.stdout.contains(" in ")
            || r.stdout.contains(" in)")
            || r.stdout.contains(" in²")
            || r.stdout.contains(" in\n")
            || r.stdout.contains("in ×")
            || r.stdout.contains("bare in")
            || r.stdout.contains("AWG");
        assert!(
            has_inches,
            "{cmd:?} shows no inch or AWG figure:\n{}",
            r.stdout
        );
        let metric = run_with(&cmd, None, &[]).ok();
        assert_ne!(r.stdout, metric.stdout, "{cmd:?}: imperial changes nothing");
    }
}

#[test]
fn colour_always_marks_verdict_words_and_never_prints_no_escape() {
    for cmd in commands() {
        let plain = run_with(&with(&["--color", "never"], &cmd), None, &[]).ok();
        assert!(!plain.stdout.contains('\x1b'), "{cmd:?} --color never");
        let auto = run_with(&cmd, None, &[("NO_COLOR", "1")]).ok();
        assert!(!auto.stdout.contains('\x1b'), "{cmd:?} with NO_COLOR");
        let coloured = run_with(&with(&["--color", "always"], &cmd), None, &[]).ok();
        assert!(coloured.stdout.contains('\x1b'), "{cmd:?} --color always");
    }
    // Verdict words in colour: green for a pass, red for a failure.
    let r = run_with(
        &["--color", "always", "rate", JOB, "--va", "900"],
        None,
        &[],
    )
    .ok();
    assert!(
        r.stdout.contains("\x1b[1;31mDOES NOT CARRY"),
        "{}",
        r.stdout
    );
    let r = run_with(&["--color", "always", "plan", JOB], None, &[]).ok();
    assert!(
        r.stdout.contains("\x1b[1;32mevery check passes"),
        "{}",
        r.stdout
    );
}

#[test]
fn help_follows_the_colour_flag() {
    let never = run_with(&["--color", "never", "--help"], None, &[]).ok();
    assert!(!never.stdout.contains('\x1b'));
    let always = run_with(&["--color", "always", "plan", "--help"], None, &[]).ok();
    assert!(always.stdout.contains('\x1b'), "{}", always.stdout);
    let env = run_with(&["core", "--help"], None, &[("NO_COLOR", "1")]).ok();
    assert!(!env.stdout.contains('\x1b'));
}

#[test]
fn text_fits_the_width_it_is_given() {
    // COLUMNS stands in for a terminal's width (POSIX.1-2017, 8.3 "Other Environment Variables").
    let mut cmds = commands();
    cmds.push(vec!["plan", "examples/dual_primary_bench_supply.toml"]);
    cmds.push(vec![
        "diagnose",
        JOB,
        "examples/measured/garage_charger.toml",
    ]);
    for width in ["60", "100"] {
        let w: usize = width.parse().expect("width");
        for cmd in &cmds {
            let r = run_with(cmd, None, &[("COLUMNS", width)]);
            assert_eq!(r.code, 0, "{cmd:?}: {}", r.stderr);
            for line in r.stdout.lines() {
                assert!(
                    line.chars().count() <= w,
                    "{cmd:?} at {w} columns: {} > {w}: {line}",
                    line.chars().count()
                );
            }
        }
    }
}

#[test]
fn quiet_keeps_data_and_cautions_and_drops_the_rest() {
    for cmd in commands() {
        let loud = run_with(&cmd, None, &[]);
        let quiet = run_with(&with(&["-q"], &cmd), None, &[]);
        assert_eq!(quiet.code, loud.code, "{cmd:?}");
        assert!(quiet.stderr.is_empty(), "{cmd:?}: {}", quiet.stderr);
        for hint in [
            "note:",
            "use `ironwind",
            "keep it on the shelf",
            "Print one",
            "planned end to end",
        ] {
            assert!(!quiet.stdout.contains(hint), "{cmd:?} -q still says {hint}");
        }
        // The cautions stay with every plan and card.
        if loud.stdout.contains("does not certify a design as safe") {
            assert!(
                quiet.stdout.contains("does not certify a design as safe"),
                "{cmd:?}"
            );
        }
    }
    // Where there was something to drop, it is gone.
    for cmd in [
        vec!["rate", JOB],
        vec![
            "core", "--tongue", "32", "--stack", "40", "--window", "16x48",
        ],
        vec!["demo"],
        vec!["example"],
        vec!["diagnose", JOB, "examples/measured/garage_charger.toml"],
    ] {
        let loud = run_with(&cmd, None, &[]).stdout;
        let quiet = run_with(&with(&["-q"], &cmd), None, &[]).stdout;
        assert!(quiet.len() < loud.len(), "{cmd:?}: -q changed nothing");
    }
}

#[test]
fn imperial_shows_an_imperial_figure_beside_every_metric_one() {
    // (metric unit, the imperial unit that must stand beside it on the same line)
    let pairs = [
        ("cm⁴", "in⁴"),
        (" kg", " lb"),
        ("A/mm²", "cmil/A"),
        (" m)", " ft ("),
        (" g)", " oz ("),
    ];
    for cmd in [
        vec!["plan", JOB],
        vec!["card", JOB],
        vec!["rate", JOB],
        vec![
            "core", "--tongue", "32", "--stack", "40", "--window", "16x48",
        ],
    ] {
        let out = run_with(
            &with(&["--units", "imperial"], &cmd),
            None,
            &[("COLUMNS", "300")],
        )
        .stdout;
        for line in out.lines() {
            for (metric, imperial) in pairs {
                if line.contains(metric) {
                    assert!(
                        line.contains(imperial),
                        "{cmd:?}: {metric} without {imperial}: {line}"
                    );
                }
            }
        }
    }
}
