//! `ironwind rate`.

use crate::common::{example_jobs, run, scratch, write, GOOD_JOB};
use approx::assert_relative_eq;

fn rate(args: &[&str]) -> serde_json::Value {
    let mut a = vec!["rate"];
    a.extend_from_slice(args);
    a.extend_from_slice(&["--format", "json"]);
    run(&a).ok().json()
}

#[test]
fn capacity_keys_and_self_consistent_verdicts() {
    for p in example_jobs() {
        let path = p.display().to_string();
        let j = rate(&[&path]);
        let c = &j["capacity"];
        for key in [
            "max_va",
            "rise_c",
            "copper_fill",
            "area_product_va",
            "rule_of_thumb_va",
        ] {
            assert!(c[key].as_f64().is_some(), "{path}: capacity.{key}");
        }
        assert!(c["plans_evaluated"].as_u64().is_some_and(|n| n > 0));
        assert!(["window", "heating", "regulation", "flux/turns"]
            .contains(&c["limit"].as_str().unwrap_or("")));
        let cap = c["max_va"].as_f64().expect("cap");
        let at = rate(&[&path, "--va", &format!("{}", cap * 0.999)]);
        assert_eq!(
            at["verdict"]["ok"], true,
            "{path}: carries just under capacity"
        );
        let above = rate(&[&path, "--va", &format!("{}", cap * 1.02)]);
        assert_eq!(
            above["verdict"]["ok"], false,
            "{path}: 2 % above is not carried"
        );
        assert!(above["verdict"]["margin_pct"].as_f64().expect("margin") < 0.0);
        // What to change, computed: only changes that would carry more are shown.
        let opts = above["options"].as_array().expect("options");
        assert!(!opts.is_empty(), "{path}: what to change");
        for o in opts {
            assert!(o["change"].as_str().is_some());
            assert!(o["max_va"].as_f64().expect("max_va") > cap, "{path}: {o}");
        }
    }
}

#[test]
fn scan_agrees_with_search_and_costs_fifty_times_the_plans() {
    for p in example_jobs() {
        let path = p.display().to_string();
        let a = rate(&[&path]);
        let b = rate(&[&path, "--scan"]);
        let (ca, cb) = (&a["capacity"], &b["capacity"]);
        assert_relative_eq!(
            ca["max_va"].as_f64().expect("a"),
            cb["max_va"].as_f64().expect("b"),
            max_relative = 0.005
        );
        let (na, nb) = (
            ca["plans_evaluated"].as_u64().expect("na"),
            cb["plans_evaluated"].as_u64().expect("nb"),
        );
        assert!(nb >= 50 * na, "{path}: scan {nb} plans, search {na}");
    }
}

#[test]
fn strict_exits_3_when_not_carried() {
    let d = scratch("strict");
    let p = write(&d, "job.toml", GOOD_JOB);
    let r = run(&["rate", &p, "--va", "100000", "--strict"]);
    assert_eq!(r.code, 3, "{}", r.stderr);
    run(&["rate", &p, "--va", "100000"])
        .ok()
        .stdout_has("DOES NOT CARRY");
    run(&["rate", &p, "--va", "1", "--strict"]).ok();
}

#[test]
fn quick_flags_duty_and_plot() {
    let j = rate(&[
        "--tongue",
        "38",
        "--stack",
        "62",
        "--window",
        "19x57",
        "--frequency",
        "50",
        "--primary",
        "230",
        "--output",
        "24",
        "--va",
        "600",
    ]);
    assert!(j["capacity"]["max_va"].as_f64().expect("cap") > 0.0);
    assert_eq!(j["verdict"]["target_va"].as_f64(), Some(600.0));
    // Intermittent duty rates heating on the averaged copper loss, with its note.
    let d = rate(&[
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
        "--duty",
        "0.25",
    ]);
    assert!(d["capacity"]["max_va"].as_f64() >= j["capacity"]["max_va"].as_f64());
    assert!(d["notes"].to_string().contains("thermal time constant"));
    let dir = scratch("rateplot");
    let svg = dir.join("cap.svg");
    run(&[
        "rate",
        &example_jobs()[0].display().to_string(),
        "--plot",
        &svg.display().to_string(),
    ])
    .ok();
    let text = std::fs::read_to_string(&svg).expect("plot");
    let doc = roxmltree::Document::parse(&text).expect("SVG parses");
    let labels: Vec<&str> = doc
        .descendants()
        .filter(|n| n.has_tag_name("text"))
        .filter_map(|n| n.text())
        .collect();
    assert!(labels.iter().any(|l| l.contains("flux density (T)")));
    assert!(labels.iter().any(|l| l.starts_with("chosen flux")));
    run(&[
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
        "--duty",
        "0",
    ])
    .code(2)
    .one_line_error()
    .stderr_has("--duty");
    run(&["rate"]).code(2).one_line_error();
}
