//! Exact-output (golden) tests: the text plan, the text card, and the text and JSON of every
//! command, compared byte for byte with the files in `tests/golden/`. They were written before the
//! library was reorganised into one report per command and kept after it, so a move that changes a
//! figure or a word fails here. After an intended change of output, regenerate them with
//! `IRONWIND_BLESS=1 cargo test --test cli golden` and read the diff before committing it.

use crate::common::{root, run_with};

const SHELF: &str = "tests/golden/shelf.csv";
const GARAGE: &str = "examples/garage_charger.toml";
const CABIN: &str = "examples/cabin_inverter_24v.toml";
const BENCH: &str = "examples/bench_supply_120v_ui.toml";
const UPS: &str = "examples/ups_donor_inverter.toml";

/// Each case: the golden file's name and the arguments.
const CASES: &[(&str, &[&str])] = &[
    ("plan_garage.txt", &["plan", GARAGE]),
    ("plan_cabin.txt", &["plan", CABIN]),
    ("plan_bench.txt", &["plan", BENCH]),
    ("plan_ups.txt", &["plan", UPS]),
    ("plan_garage.json", &["plan", GARAGE, "--format", "json"]),
    ("plan_ups.json", &["plan", UPS, "--format", "json"]),
    ("plan_garage.csv", &["plan", GARAGE, "--format", "csv"]),
    ("card_garage.txt", &["card", GARAGE]),
    ("card_cabin.txt", &["card", CABIN]),
    ("card_bench.txt", &["card", BENCH]),
    ("card_ups.txt", &["card", UPS]),
    ("card_garage.md", &["card", GARAGE, "--format", "markdown"]),
    ("card_garage.html", &["card", GARAGE, "--format", "html"]),
    ("card_garage.svg", &["card", GARAGE, "--format", "svg"]),
    ("demo.txt", &["demo"]),
    (
        "core.txt",
        &[
            "core", "--tongue", "32", "--stack", "40", "--window", "16x48",
        ],
    ),
    (
        "core.json",
        &[
            "core", "--tongue", "1.25 in", "--stack", "38", "--window", "16x48", "--shape", "ui",
            "--format", "json",
        ],
    ),
    ("wire_list.txt", &["wire", "--list"]),
    (
        "wire_list_awg.json",
        &["wire", "--list", "--system", "awg", "--format", "json"],
    ),
    (
        "wire_choice.txt",
        &["wire", "--amps", "12", "--density", "3"],
    ),
    (
        "wire_choice.json",
        &[
            "wire", "--amps", "40", "--system", "awg", "--format", "json",
        ],
    ),
    (
        "probe_test.txt",
        &[
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
    ),
    (
        "probe_sweep.txt",
        &[
            "probe",
            "--sweep",
            "examples/ups_donor_sweep.csv",
            "--sweep-turns",
            "511",
            "--tongue",
            "38",
            "--stack",
            "50",
            "--window",
            "19x57",
        ],
    ),
    (
        "probe_both.json",
        &[
            "probe",
            "--test-turns",
            "12",
            "--test-volts",
            "5.4",
            "--applied-volts",
            "230",
            "--sweep",
            "examples/ups_donor_sweep.csv",
            "--sweep-turns",
            "511",
            "--tongue",
            "38",
            "--stack",
            "50",
            "--format",
            "json",
        ],
    ),
    ("rate_garage.txt", &["rate", GARAGE]),
    ("rate_garage.json", &["rate", GARAGE, "--format", "json"]),
    ("rate_garage_600.txt", &["rate", GARAGE, "--va", "600"]),
    (
        "rate_flags.txt",
        &[
            "rate",
            "--tongue",
            "38",
            "--stack",
            "62",
            "--window",
            "19x57",
            "--primary",
            "230",
            "--output",
            "24",
            "--va",
            "600",
        ],
    ),
    (
        "rate_flags.json",
        &[
            "rate",
            "--tongue",
            "38",
            "--stack",
            "62",
            "--window",
            "19x57",
            "--primary",
            "230",
            "--output",
            "24",
            "--output",
            "12",
            "--format",
            "json",
        ],
    ),
    (
        "diagnose.txt",
        &["diagnose", GARAGE, "examples/measured/garage_charger.toml"],
    ),
    (
        "diagnose.json",
        &[
            "diagnose",
            GARAGE,
            "examples/measured/garage_charger.toml",
            "--format",
            "json",
        ],
    ),
    (
        "plan_pushpull.txt",
        &["plan", "examples/pushpull_inverter_24v.toml"],
    ),
    (
        "card_dual.txt",
        &["card", "examples/dual_primary_bench_supply.toml"],
    ),
    (
        "plan_welder.json",
        &[
            "plan",
            "examples/spot_welder_donor.toml",
            "--format",
            "json",
        ],
    ),
    ("shelf_list.txt", &["shelf", "--shelf", SHELF, "list"]),
    (
        "shelf_list.json",
        &["shelf", "--shelf", SHELF, "list", "--format", "json"],
    ),
    ("shelf_show.txt", &["shelf", "--shelf", SHELF, "show", "2"]),
    (
        "shelf_show.json",
        &["shelf", "--shelf", SHELF, "show", "3", "--format", "json"],
    ),
    (
        "shelf_rank.txt",
        &["shelf", "--shelf", SHELF, "rank", GARAGE],
    ),
    (
        "shelf_rank.json",
        &[
            "shelf", "--shelf", SHELF, "rank", GARAGE, "--format", "json",
        ],
    ),
];

#[test]
fn every_command_prints_what_its_golden_file_holds() {
    let bless = std::env::var_os("IRONWIND_BLESS").is_some();
    let mut differ = Vec::new();
    for (name, args) in CASES {
        let r = run_with(args, None, &[("SOURCE_DATE_EPOCH", "1796169600")]);
        assert_eq!(r.code, 0, "{name}: {}", r.stderr);
        let path = root().join("tests/golden").join(name);
        if bless {
            std::fs::write(&path, &r.stdout).expect("write golden");
            continue;
        }
        let want =
            std::fs::read_to_string(&path).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
        if want != r.stdout {
            let line = want
                .lines()
                .zip(r.stdout.lines())
                .position(|(a, b)| a != b)
                .map(|k| k + 1)
                .unwrap_or(want.lines().count().min(r.stdout.lines().count()) + 1);
            differ.push(format!("{name} (first difference at line {line})"));
        }
    }
    assert!(differ.is_empty(), "output changed: {}", differ.join(", "));
}
