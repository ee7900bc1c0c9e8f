//! `ironwind probe` and probe data in job files (kept windings).

use crate::common::{edited, root, run, scratch, write};
use approx::assert_relative_eq;

/// The IEC 61869-2 knee of I = a·V + b·V^n in closed form (the definition solved exactly):
/// a·1.1V + b·(1.1V)^n = 1.5·(aV + bV^n) → V^(n−1) = 0.4a / (b(1.1^n − 1.5)).
fn iec_knee(a: f64, b: f64, n: f64) -> f64 {
    (0.4 * a / (b * (1.1f64.powf(n) - 1.5))).powf(1.0 / (n - 1.0))
}

#[test]
fn test_winding_volts_per_turn_is_exact_and_flux_follows_the_emf_equation() {
    // Textbook worked problem (REFERENCES.md): 520 V on 400 turns over 60 cm² at 50 Hz is 0.976 T;
    // a 10-turn test winding reads 13 V. Net area 60 × 100 mm at stacking 1.
    let j = run(&[
        "probe",
        "--test-turns",
        "10",
        "--test-volts",
        "13",
        "--applied-volts",
        "520",
        "--frequency",
        "50",
        "--tongue",
        "60",
        "--stack",
        "100",
        "--stacking",
        "1",
        "--format",
        "json",
    ])
    .ok()
    .json();
    assert_eq!(j["volts_per_turn"].as_f64(), Some(1.3));
    assert_relative_eq!(
        j["powered_turns"].as_f64().expect("turns"),
        400.0,
        max_relative = 1e-12
    );
    assert_relative_eq!(
        j["donor_flux_t"].as_f64().expect("B"),
        0.976,
        max_relative = 0.001
    );
}

#[test]
fn a_hard_run_donor_is_flagged() {
    // Common practice: microwave-oven donors give about 1 V per turn once rewound and run near
    // saturation; on a 38 × 62 mm stack that is well above 1.5 T.
    let r = run(&[
        "probe",
        "--test-turns",
        "10",
        "--test-volts",
        "10",
        "--applied-volts",
        "230",
        "--frequency",
        "50",
        "--tongue",
        "38",
        "--stack",
        "62",
    ])
    .ok();
    assert!(r.stdout.contains("run hard"), "{}", r.stdout);
    let r = run(&[
        "probe",
        "--test-turns",
        "10",
        "--test-volts",
        "0.5",
        "--applied-volts",
        "230",
        "--tongue",
        "38",
        "--stack",
        "62",
    ])
    .ok();
    assert!(r.stdout.contains("check the stack"), "{}", r.stdout);
}

#[test]
fn sweep_knee_matches_the_iec_definition_on_unsorted_duplicated_points() {
    let (a, b, n) = (0.001, 4e-25, 11.0);
    let vk = iec_knee(a, b, n);
    let mut rows = vec!["volts,amps".to_string()];
    // Every 4 % from 0.3 Vk to 1.6 Vk, in reverse order, with one point repeated.
    let mut v = 0.3 * vk;
    let mut pts = Vec::new();
    while v < 1.6 * vk {
        pts.push(v);
        v *= 1.04;
    }
    pts.reverse();
    pts.push(pts[3]);
    for v in pts {
        rows.push(format!("{v:.4},{:.6}", a * v + b * v.powf(n)));
    }
    let d = scratch("sweep");
    let p = write(&d, "sweep.csv", &(rows.join("\n") + "\n"));
    let svg = d.join("sweep.svg");
    let j = run(&[
        "probe",
        "--sweep",
        &p,
        "--sweep-turns",
        "200",
        "--frequency",
        "50",
        "--tongue",
        "30",
        "--stack",
        "40",
        "--window",
        "15x45",
        "--plot",
        &svg.display().to_string(),
        "--format",
        "json",
    ])
    .ok()
    .json();
    let got = j["knee_volts"].as_f64().expect("knee");
    assert_relative_eq!(got, vk, max_relative = 0.02);
    // Flux at the knee from the EMF equation: V / (π√2 f N Ae).
    let ae = 0.95 * 30.0 * 40.0 * 1e-6;
    let bk = vk / (std::f64::consts::PI * 2f64.sqrt() * 50.0 * 200.0 * ae);
    assert_relative_eq!(
        j["knee_flux_t"].as_f64().expect("Bk"),
        bk,
        max_relative = 0.02
    );
    assert_relative_eq!(
        j["recommended_flux_t"].as_f64().expect("rec"),
        0.9 * j["knee_flux_t"].as_f64().expect("Bk"),
        max_relative = 1e-12
    );
    // The SVG parses as XML and carries its axes, knee markers and labels.
    let text = std::fs::read_to_string(&svg).expect("svg written");
    let doc = roxmltree::Document::parse(&text).expect("SVG is well-formed XML");
    let labels: Vec<&str> = doc
        .descendants()
        .filter(|n| n.has_tag_name("text"))
        .filter_map(|n| n.text())
        .collect();
    // The excitation curve as it is usually drawn (CT excitation curves in IEEE C57.13, from memory):
    // current across, volts up, and the flux those volts mean on the right.
    let axis_label = |rotated: Option<&str>| {
        doc.descendants()
            .filter(|n| n.attribute("class") == Some("axis-label"))
            .find(|n| match rotated {
                None => n.attribute("transform").is_none(),
                Some(r) => n.attribute("transform").is_some_and(|t| t.starts_with(r)),
            })
            .and_then(|n| n.text())
            .unwrap_or("")
            .to_string()
    };
    assert!(axis_label(None).contains("(A RMS)"), "current across");
    assert!(
        axis_label(Some("rotate(-90")).contains("(V RMS)"),
        "volts up"
    );
    assert!(
        axis_label(Some("rotate(90")).contains("(T)"),
        "tesla at the right"
    );
    assert!(labels.iter().any(|l| l.starts_with("IEC knee")));
    assert!(labels.iter().any(|l| l.starts_with("recommended max")));
    assert!(
        doc.descendants()
            .filter(|n| n.attribute("class") == Some("marker"))
            .count()
            >= 2
    );
}

#[test]
fn bad_sweep_files_exit_2_naming_the_line() {
    let d = scratch("badsweep");
    for (name, text, needle) in [
        (
            "noheader.csv",
            "10,0.01\n20,0.02\n30,0.03\n40,0.05\n",
            "line 1",
        ),
        (
            "text.csv",
            "volts,amps\n10,0.01\n20,lots\n30,0.03\n40,0.05\n",
            "line 3",
        ),
        (
            "negative.csv",
            "volts,amps\n10,0.01\n20,-0.02\n30,0.03\n40,0.05\n",
            "line 3",
        ),
        (
            "nan.csv",
            "volts,amps\n10,0.01\nNaN,0.02\n30,0.03\n40,0.05\n",
            "line 3",
        ),
        ("one.csv", "volts,amps\n10,0.01\n", "at least 4"),
        (
            "fields.csv",
            "volts,amps\n10,0.01,7\n20,0.02\n30,0.03\n40,0.05\n",
            "line 2",
        ),
    ] {
        let p = write(&d, name, text);
        run(&[
            "probe",
            "--sweep",
            &p,
            "--sweep-turns",
            "100",
            "--tongue",
            "30",
            "--stack",
            "40",
        ])
        .code(2)
        .one_line_error()
        .stderr_has(name)
        .stderr_has(needle);
    }
}

fn ups_job_json(edit: impl Fn(String) -> String, name: &str) -> serde_json::Value {
    let src = root().join("examples");
    let d = scratch(name);
    std::fs::copy(
        src.join("ups_donor_sweep.csv"),
        d.join("ups_donor_sweep.csv"),
    )
    .expect("copy sweep");
    let text = edit(std::fs::read_to_string(src.join("ups_donor_inverter.toml")).expect("example"));
    let p = write(&d, "job.toml", &text);
    run(&["plan", &p, "--format", "json"]).ok().json()
}

#[test]
fn kept_output_sets_the_largest_primary_that_still_reaches_its_volts() {
    // DESIGN.md: kept winding turns = rated volts / measured volts per turn (230 / 0.45 → 511);
    // the new primary is the largest whole N_p whose kept-output full-load voltage reaches its target.
    let j = ups_job_json(|t| t, "kept");
    let w = j["windings"].as_array().expect("windings");
    let kept = w.iter().find(|x| x["kept"] == true).expect("kept");
    let prim = w.iter().find(|x| x["role"] == "primary").expect("primary");
    assert_eq!(kept["turns"], 511);
    let f = |v: &serde_json::Value| v.as_f64().expect("num");
    let (nk, ik, rk, vk) = (
        f(&kept["turns"]),
        f(&kept["amps"]),
        f(&kept["resistance_ohm"]),
        f(&kept["volts"]),
    );
    let np = f(&prim["turns"]);
    let rp_turn = f(&prim["resistance_ohm"]) / np;
    let v_rms = f(&j["drive"]["primary_rms_volts"]);
    let full = |n: f64| nk * v_rms / n - ik * (rk + rp_turn * nk * nk / n);
    assert!(full(np) >= vk, "N_p = {np} reaches the target");
    assert!(full(np + 1.0) < vk, "N_p + 1 does not: N_p is the largest");
    // Probe keys in the plan's JSON.
    assert_relative_eq!(f(&j["probe"]["volts_per_turn"]), 0.45, max_relative = 1e-12);
    assert!(j["probe"]["knee_flux_t"].as_f64().is_some());
    assert!(j["drive"]["no_load_amps"].as_f64().expect("idle current") > 0.0);
}

#[test]
fn square_drive_on_a_kept_output_warns_at_the_knee_margin() {
    // 4.443/4: the same RMS volts per turn under a full square wave is 1.11 × the sine's peak flux.
    let j = ups_job_json(
        |t| {
            edited(
                &t,
                "waveform = \"quasi-square\"\nduty = 0.7",
                "waveform = \"square\"",
            )
        },
        "kept-square",
    );
    let warnings = j["warnings"].to_string();
    assert!(warnings.contains("knee margin"), "{warnings}");
    let note = j["drive"]["kept_output_note"].as_str().expect("note");
    assert!(note.contains("4.443/4"));
    let ratio = j["drive"]["flux_vs_donor"].as_f64().expect("ratio");
    assert!(ratio > 1.05, "square drive runs the donor harder: {ratio}");
}

#[test]
fn sweep_caps_the_flux_and_a_higher_given_flux_is_kept_with_a_warning() {
    let j = ups_job_json(|t| t, "cap");
    let rec = j["probe"]["recommended_flux_t"].as_f64().expect("rec");
    assert_relative_eq!(
        j["drive"]["design_flux_t"].as_f64().expect("design"),
        rec,
        max_relative = 1e-12
    );
    let j = ups_job_json(
        |t| {
            edited(
                &t,
                "current_density_a_mm2 = 3.5",
                "current_density_a_mm2 = 3.5\nflux_density_t = 1.4",
            )
        },
        "cap-given",
    );
    assert_eq!(j["drive"]["design_flux_t"].as_f64(), Some(1.4));
    assert!(j["warnings"]
        .to_string()
        .contains("above the sweep's recommended"));
}

#[test]
fn kept_primary_sets_the_volts_per_turn() {
    // A donor keeps its 230 V primary; a 12-turn test winding read 5.40 V: 511 turns at 0.45 V/turn.
    let d = scratch("keptp");
    let text = r#"[core]
tongue_mm = 38
stack_mm = 50
window_width_mm = 19
window_height_mm = 57
[supply]
frequency_hz = 50
[probe]
test_turns = 12
test_volts = 5.40
applied_volts = 230
applied_to = "mains"
[[winding]]
name = "mains"
role = "primary"
volts = 230
kept = true
build_mm = 7.0
[[winding]]
name = "out"
role = "secondary"
volts = 12
amps = 0.001
"#;
    let p = write(&d, "job.toml", text);
    let j = run(&["plan", &p, "--format", "json"]).ok().json();
    assert_eq!(j["windings"][0]["turns"], 511);
    let ns = j["windings"][1]["turns"].as_f64().expect("ns");
    // 12 V at 0.45 V/turn: 26.7 → 27 turns at almost no load (1 mA through the thinnest wire).
    assert_eq!(ns, 27.0);
}

#[test]
fn a_kept_windings_wire_is_not_invented() {
    // Issue (kept windings): the donor's own winding keeps its copper. With its resistance measured
    // the copper area is ρ·N·MLT/R20 (IEC 60028 copper), its conductor is "kept", and the current
    // density check leaves it out; a kept output says the most it gives at the design flux.
    let j = run(&[
        "plan",
        "examples/ups_donor_inverter.toml",
        "--format",
        "json",
    ])
    .ok()
    .json();
    let kept = &j["windings"][0];
    assert_eq!(kept["kept"], true);
    assert_eq!(kept["conductor"]["system"], "kept");
    let (n, mlt_m) = (
        kept["turns"].as_f64().expect("turns"),
        kept["mean_turn_mm"].as_f64().expect("mlt") / 1000.0,
    );
    let area = kept["conductor"]["area_mm2"].as_f64().expect("area");
    // Measured 9.5 Ω at 20 °C (the example's resistance_ohm).
    assert_relative_eq!(area, n * mlt_m / 58.0 / 9.5, max_relative = 1e-9);
    let cd = j["verdict"]["checks"]
        .as_array()
        .expect("checks")
        .iter()
        .find(|c| c["kind"] == "current-density")
        .expect("current density check");
    assert!(
        !cd["detail"].as_str().expect("detail").contains("mains"),
        "{cd}"
    );
    let limit = &j["drive"]["kept_limit"];
    assert_eq!(limit["winding"], "mains");
    assert!(limit["volts_full_load"].as_f64().expect("volts") > 0.0);
    assert!(limit["detail"]
        .as_str()
        .expect("detail")
        .contains("gives at most"));
    let card = run(&["card", "examples/ups_donor_inverter.toml"])
        .ok()
        .stdout;
    assert!(
        card.contains("the donor's own (measured 9.50 ohm"),
        "{card}"
    );
}
