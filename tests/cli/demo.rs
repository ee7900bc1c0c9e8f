//! `ironwind demo`.

use crate::common::run;

#[test]
fn demo_prints_a_whole_plan_ending_with_cautions() {
    let r = run(&["demo"]).ok();
    for part in [
        "Core",
        "Drive",
        "Windings",
        "Electrical",
        "Verdict",
        "Cautions",
    ] {
        assert!(r.stdout.contains(part), "demo shows {part}");
    }
    assert!(
        r.stdout.trim_end().ends_with("licensed practice."),
        "ends with the cautions"
    );
    assert!(r.stderr.is_empty());
}
