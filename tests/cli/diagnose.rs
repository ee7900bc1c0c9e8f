//! `ironwind diagnose`: synthetic readings made from a plan with a known fault must be diagnosed as
//! that fault, with the right count; readings as planned come back as planned.

use crate::common::{edited, run, scratch, write, GOOD_JOB};
use std::path::Path;

/// A job with two outputs (so a primary miscount shows as one ratio on both).
fn two_outputs() -> String {
    format!(
        "{GOOD_JOB}[[winding]]\nname = \"aux\"\nrole = \"secondary\"\nvolts = 12.0\namps = 1.0\n"
    )
}

fn plan(d: &Path, name: &str, job: &str) -> (String, serde_json::Value) {
    let p = write(d, name, job);
    let j = run(&["plan", &p, "--format", "json"]).ok().json();
    (p, j)
}

fn f(v: &serde_json::Value) -> f64 {
    v.as_f64().expect("number")
}

/// The first finding of a diagnosis of `measured` (TOML) against job `p`.
fn top(d: &Path, p: &str, measured: &str) -> serde_json::Value {
    let m = write(d, "measured.toml", measured);
    let j = run(&["diagnose", p, &m, "--format", "json"]).ok().json();
    j["findings"][0].clone()
}

/// Readings exactly as planned at `applied` volts and 20 °C, with output `k`'s turns and resistance
/// changed by the closures.
fn readings(
    j: &serde_json::Value,
    applied: f64,
    change: &dyn Fn(usize, f64, f64) -> (f64, f64),
) -> String {
    let ws = j["windings"].as_array().expect("windings");
    let np = f(&ws[0]["turns"]);
    let mut s = format!("applied_volts = {applied}\n");
    for (k, w) in ws.iter().enumerate() {
        let n = f(&w["turns"]) * f(&w["sections"]);
        let (n, r) = change(k, n, f(&w["resistance_20c_ohm"]));
        s += &format!("[[winding]]\nname = {}\nohms = {r}\n", w["name"]);
        if k > 0 {
            s += &format!("volts = {}\n", applied * n / np);
        }
    }
    s
}

#[test]
fn readings_as_planned_come_back_as_planned() {
    let d = scratch("diag-ok");
    let (p, j) = plan(&d, "job.toml", GOOD_JOB);
    let m = readings(&j, 230.0, &|_, n, r| (n, r));
    let first = top(&d, &p, &m);
    assert_eq!(first["kind"], "as-planned", "{first}");
    // IEC 60028: read at 40 °C a winding shows R20 × (1 + 0.00393 × 20); corrected, as planned.
    let hot = readings(&j, 230.0, &|_, n, r| (n, r * (1.0 + 0.00393 * 20.0)));
    let hot = format!("temperature_c = 40.0\n{hot}");
    assert_eq!(first_kind(&d, &p, &hot), "as-planned");
    // Uncorrected (read as if at 20 °C), the same ohms are 7.9 % high: the wrong wire.
    let raw = readings(&j, 230.0, &|_, n, r| (n, r * (1.0 + 0.00393 * 20.0)));
    assert_eq!(first_kind(&d, &p, &raw), "wire");
}

fn first_kind(d: &Path, p: &str, m: &str) -> String {
    top(d, p, m)["kind"].as_str().unwrap_or("").to_string()
}

#[test]
fn a_layer_too_many_on_an_output() {
    let d = scratch("diag-layer");
    let (p, j) = plan(&d, "job.toml", GOOD_JOB);
    let tpl = f(&j["windings"][1]["turns_per_layer"]);
    let planned = f(&j["windings"][1]["turns"]);
    let m = readings(&j, 231.0, &|k, n, r| {
        if k == 1 {
            (n + tpl, r * (n + tpl) / n)
        } else {
            (n, r)
        }
    });
    let first = top(&d, &p, &m);
    assert_eq!(first["kind"], "turns", "{first}");
    assert_eq!(first["winding"], "out");
    assert!(
        (f(&first["turns"]) - (planned + tpl)).abs() <= 1.0,
        "{first}"
    );
    assert!(first["fix"].as_str().expect("fix").contains("unwind"));
}

#[test]
fn every_output_off_by_one_ratio_is_the_primary() {
    let d = scratch("diag-primary");
    let (p, j) = plan(&d, "two.toml", &two_outputs());
    let tpl = f(&j["windings"][0]["turns_per_layer"]);
    let np = f(&j["windings"][0]["turns"]);
    // The primary has a layer too many: every output reads N_s/(N_p + layer) of the volts.
    let m = readings(&j, 230.0, &|k, n, r| {
        if k == 0 {
            (n + tpl, r * (n + tpl) / n)
        } else {
            (n * np / (np + tpl), r)
        }
    });
    let first = top(&d, &p, &m);
    assert_eq!(first["kind"], "turns", "{first}");
    assert_eq!(first["winding"], "mains");
    assert!((f(&first["turns"]) - (np + tpl)).abs() <= 1.0, "{first}");
}

#[test]
fn one_size_too_thin() {
    let d = scratch("diag-wire");
    let (p, j) = plan(&d, "job.toml", GOOD_JOB);
    // The plan's output wire and the R20 size below it (data/wire_metric.csv).
    let planned = j["windings"][1]["conductor"]["size"]
        .as_str()
        .expect("size")
        .to_string();
    let table = run(&["wire", "--list", "--format", "json"]).ok().json();
    let rows = table.as_array().expect("rows");
    let k = rows
        .iter()
        .position(|r| r["size"] == planned.as_str())
        .expect("in table");
    let thinner = &rows[k - 1];
    let ratio = f(&j["windings"][1]["conductor"]["area_mm2"]) / f(&thinner["area_mm2"]);
    let m = readings(&j, 230.0, &|i, n, r| {
        if i == 1 {
            (n, r * ratio)
        } else {
            (n, r)
        }
    });
    let first = top(&d, &p, &m);
    assert_eq!(first["kind"], "wire", "{first}");
    assert_eq!(first["size"], thinner["size"], "{first}");
}

#[test]
fn a_reversed_half_and_a_shorted_turn() {
    let d = scratch("diag-reversed");
    let ct = edited(GOOD_JOB, "amps = 4.0", "amps = 4.0\ncentre_tap = true");
    let (p, j) = plan(&d, "ct.toml", &ct);
    // One half reversed: the two halves cancel, end to end reads almost nothing.
    let m = readings(&j, 230.0, &|k, n, r| {
        if k == 1 {
            (n * 0.01, r)
        } else {
            (n, r)
        }
    });
    let first = top(&d, &p, &m);
    assert_eq!(first["kind"], "reversed", "{first}");
    assert!(first["fix"].as_str().expect("fix").contains("swap"));
    // A shorted turn modelled as idle power five times the core-loss estimate.
    let (p, j) = plan(&d, "job.toml", GOOD_JOB);
    let core = f(&j["losses"]["core_w"]);
    let m = format!(
        "idle_watts = {}\n{}",
        5.0 * core,
        readings(&j, 230.0, &|_, n, r| (n, r))
    );
    let first = top(&d, &p, &m);
    assert_eq!(first["kind"], "shorted-turn", "{first}");
    assert!(first["evidence"].as_str().expect("e").contains("× 5.0"));
}

#[test]
fn bad_measurement_files_exit_2_naming_the_key() {
    let d = scratch("diag-bad");
    let (p, _) = plan(&d, "job.toml", GOOD_JOB);
    for (text, needle) in [
        ("applied_volts = 230\nvolts = 3\n", "volts"),
        ("applied_volts = -230\n", "applied_volts"),
        (
            "applied_volts = 230\n[[winding]]\nname = \"nope\"\nvolts = 1\n",
            "nope",
        ),
        (
            "applied_volts = 230\ntemperature_c = 900\n",
            "temperature_c",
        ),
        ("idle_amps = 1\n", "applied_volts"),
    ] {
        let m = write(&d, "bad.toml", text);
        run(&["diagnose", &p, &m])
            .code(2)
            .one_line_error()
            .stderr_has(needle);
    }
}

#[test]
fn the_example_pair_diagnoses_and_the_shelf_keeps_it() {
    let j = run(&[
        "diagnose",
        "examples/garage_charger.toml",
        "examples/measured/garage_charger.toml",
        "--format",
        "json",
    ])
    .ok()
    .json();
    assert!(!j["findings"].as_array().expect("findings").is_empty());
    let d = scratch("diag-shelf");
    let shelf = d.join("shelf.csv").display().to_string();
    run(&[
        "shelf",
        "--shelf",
        &shelf,
        "add",
        "--label",
        "grey",
        "--tongue",
        "35",
        "--stack",
        "45",
        "--window",
        "17.5x52.5",
    ])
    .ok();
    run(&[
        "diagnose",
        "examples/garage_charger.toml",
        "examples/measured/garage_charger.toml",
        "--record",
        "1",
        "--shelf",
        &shelf,
    ])
    .ok();
    let show = run(&["shelf", "--shelf", &shelf, "show", "1", "--format", "json"])
        .ok()
        .json();
    assert!(
        show["notes"].as_str().expect("notes").contains("measured"),
        "{show}"
    );
    assert!(show["volts_per_turn"].as_f64().expect("vpt") > 0.3);
}
