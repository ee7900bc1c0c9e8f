//! `ironwind wire`.

use crate::common::run;

#[test]
fn list_both_systems() {
    run(&["wire", "--list", "--system", "awg"])
        .ok()
        .stdout_has("AWG");
    let j = run(&["wire", "--list", "--format", "json"]).ok().json();
    assert_eq!(
        j.as_array().expect("rows").len(),
        33,
        "ISO 3 R20 0.100–4.00 mm"
    );
}

#[test]
fn choice_for_a_current() {
    // 12 A at 3 A/mm² = 4 mm²; one 2.0 mm strand is 3.14 mm², so two strands of 1.60 mm (DESIGN.md rule).
    let j = run(&["wire", "--amps", "12", "--density", "3", "--format", "json"])
        .ok()
        .json();
    assert_eq!(j["strands"], 2);
    assert_eq!(j["size"], "1.60");
    run(&["wire", "--amps", "0", "--density", "3"])
        .code(2)
        .one_line_error()
        .stderr_has("--amps");
}
