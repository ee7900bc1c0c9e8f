//! `ironwind core`.

use crate::common::run;
use approx::assert_relative_eq;

#[test]
fn geometry_and_rule_of_thumb() {
    let j = run(&[
        "core", "--tongue", "32", "--stack", "40", "--window", "16x48", "--format", "json",
    ])
    .ok()
    .json();
    assert_relative_eq!(
        j["area_net_mm2"].as_f64().expect("Ae"),
        1216.0,
        max_relative = 1e-12
    );
    assert_relative_eq!(
        j["window_area_mm2"].as_f64().expect("Aw"),
        768.0,
        max_relative = 1e-12
    );
    // Common practice: Ae[cm²] ≈ √VA → 12.8² = 163.84 VA.
    assert_relative_eq!(
        j["rule_of_thumb_va"].as_f64().expect("va"),
        163.84,
        max_relative = 1e-9
    );
    run(&[
        "core", "--tongue", "32", "--stack", "40", "--window", "16x48",
    ])
    .ok()
    .stdout_has("rule of thumb");
}

#[test]
fn core_flags_are_checked() {
    run(&[
        "core", "--tongue", "-3", "--stack", "40", "--window", "16x48",
    ])
    .code(2)
    .one_line_error()
    .stderr_has("--tongue");
    run(&["core", "--tongue", "32", "--stack", "40", "--window", "16"])
        .code(2)
        .one_line_error()
        .stderr_has("--window");
    run(&[
        "core",
        "--tongue",
        "32",
        "--stack",
        "40",
        "--window",
        "16x48",
        "--stacking",
        "0.4",
    ])
    .code(2)
    .one_line_error()
    .stderr_has("--stacking");
}
