//! Windings as they are built (DESIGN.md v2): halves, sections, fixed turns, SWG, measured wire,
//! cable, split bobbins and load duty, each through the real binary, checked against the outside
//! value or the hand calculation named beside it.

use crate::common::{edited, run, scratch, write, GOOD_JOB};
use approx::assert_relative_eq;

fn plan(path: &str) -> serde_json::Value {
    run(&["plan", path, "--format", "json"]).ok().json()
}

/// The card's text with its wrapping undone (one space between words).
fn words(text: &str) -> String {
    text.split_whitespace().collect::<Vec<_>>().join(" ")
}

fn f(v: &serde_json::Value) -> f64 {
    v.as_f64().expect("number")
}

#[test]
fn a_push_pull_half_carries_the_primary_current_over_root_two() {
    // Derivation: a square-wave drive puts a square current of amplitude I through the primary of
    // the equivalent bridge (RMS I). In push-pull each half carries I for one half cycle and nothing
    // in the other: its RMS is √(I²·½) = I/√2, so its wire is chosen for I/√2, and the two halves'
    // copper loss is 2·(I/√2)²·R_half = I²·R_half.
    let j = plan("examples/pushpull_inverter_24v.toml");
    let p = &j["windings"][0];
    assert_eq!(p["centre_tap"], true);
    assert_eq!(p["sections"], 2);
    let (i, half) = (f(&p["amps"]), f(&p["section_amps"]));
    assert_relative_eq!(half, i / 2f64.sqrt(), max_relative = 1e-12);
    let r_half = f(&p["resistance_ohm"]);
    assert_relative_eq!(
        f(&p["copper_loss_w"]),
        2.0 * half * half * r_half,
        max_relative = 1e-9
    );
    // The current density is one half's.
    let area = f(&p["conductor"]["area_mm2"]) * f(&p["strands"]);
    assert_relative_eq!(
        f(&p["current_density_a_mm2"]),
        half / area,
        max_relative = 1e-9
    );
    // Flux from one half's volt-seconds: square wave, V = 4·f·N·B·A (EMF equation).
    let ae = f(&j["core"]["area_net_mm2"]) * 1e-6;
    let b = 23.0 / (4.0 * 50.0 * f(&p["turns"]) * ae);
    assert_relative_eq!(f(&j["drive"]["flux_density_t"]), b, max_relative = 1e-9);
    // Bifilar: both halves lie side by side, two strands in hand on each layer.
    let tpl = f(&p["turns_per_layer"]);
    let per = 2.0 * f(&p["strands"]) * f(&p["conductor"]["overall_width_mm"]) * 1.05;
    assert_eq!(tpl, (f(&p["traverse_mm"]) / per).floor());
    let card = words(
        &run(&["card", "examples/pushpull_inverter_24v.toml"])
            .ok()
            .stdout,
    );
    assert!(
        card.contains("centre tap M1") && card.contains("TURNS 43 + 43"),
        "{card}"
    );
}

#[test]
fn sections_share_the_load_and_the_card_links_them() {
    // A 2 × 115 V primary: each section carries half the primary current in either link (series at
    // 230 V: I/2 through both; parallel at 115 V: I shared), so its copper loss is 2·(I/2)²·R_sec.
    let j = plan("examples/dual_primary_bench_supply.toml");
    let p = &j["windings"][0];
    assert_eq!(p["sections"], 2);
    let (i, sec) = (f(&p["amps"]), f(&p["section_amps"]));
    assert_relative_eq!(sec, i / 2.0, max_relative = 1e-12);
    assert_relative_eq!(
        f(&p["copper_loss_w"]),
        2.0 * sec * sec * f(&p["resistance_ohm"]),
        max_relative = 1e-9
    );
    // A 110 V adjustment tap holds the flux: N × 110/115, rounded up.
    let n = f(&p["turns"]);
    assert_eq!(f(&p["taps"][0]["turn"]), (n * 110.0 / 115.0).ceil());
    // Output sections: each 18 V at 2.5 A, copper in both.
    let o = &j["windings"][1];
    assert_relative_eq!(
        f(&o["copper_loss_w"]),
        2.0 * 2.5 * 2.5 * f(&o["resistance_ohm"]),
        max_relative = 1e-9
    );
    let card = words(
        &run(&["card", "examples/dual_primary_bench_supply.toml"])
            .ok()
            .stdout,
    );
    assert!(
        card.contains("in series for 230.0 V, join F1a to S1b"),
        "{card}"
    );
    assert!(card.contains("in parallel for 115.0 V"), "{card}");
    assert!(card.contains("must have the same turns"), "{card}");
}

#[test]
fn a_welders_fixed_turns_cable_and_duty() {
    let j = plan("examples/spot_welder_donor.toml");
    let w = &j["windings"][1];
    assert_eq!(w["turns"], 2);
    assert_eq!(w["turns_fixed"], true);
    assert_eq!(w["conductor"]["system"], "cable");
    assert_relative_eq!(f(&w["conductor"]["area_mm2"]), 50.0);
    // Adiabatic rise in one 2 s weld: ΔT = J²·ρ·t/c_v, with IEC 60028 copper (ρ20 = 1/58 Ω·mm²/m,
    // 0.00393 /K, at the hot winding's temperature) and c_v = 8.89 g/cm³ × 0.385 J/(g·K) = 3.42
    // J/(cm³·K) (REFERENCES.md; DESIGN.md rounds it to 3.45, so 1 % apart).
    // Resistances are taken hot: ambient 30 °C + the example's max_rise_c 60 °C.
    let hot = f(&j["thermal"]["ambient_c"]) + f(&j["thermal"]["max_rise_c"]);
    let rho = (1.0 / 58.0) * (1.0 + 0.00393 * (hot - 20.0));
    let jd = 900.0 / 50.0;
    let dt = jd * jd * rho * 2.0 / (8.89 * 0.385);
    assert_relative_eq!(f(&w["adiabatic_rise_c"]), dt, max_relative = 0.012);
    // Heating from the time-averaged loss: the weld's copper at a tenth, the primary's too.
    let avg = f(&j["thermal"]["average_copper_w"]);
    let all: f64 = j["windings"]
        .as_array()
        .expect("w")
        .iter()
        .map(|w| f(&w["copper_loss_w"]))
        .sum();
    assert_relative_eq!(avg, 0.1 * all, max_relative = 1e-9);
    let hottest = f(&j["thermal"]["hot_spot_c"]);
    assert_relative_eq!(hottest, f(&j["thermal"]["hot_c"]) + dt, max_relative = 0.01);
    assert_eq!(j["thermal"]["insulation_class"], "F");
}

#[test]
fn a_fixed_turns_output_far_from_its_volts_fails() {
    // 2 turns at the example's 0.69 V per turn give about 1.1 V at 900 A: within 15 % of 1.2 V,
    // but not within 5 % of 2.0 V.
    let d = scratch("fixed-turns");
    let text = std::fs::read_to_string("examples/spot_welder_donor.toml").expect("example");
    let text = edited(
        &text,
        "volts = 1.2\nvolts_tolerance_pct = 15.0",
        "volts = 2.0",
    );
    let p = write(&d, "far.toml", &text);
    let j = plan(&p);
    let c = j["verdict"]["checks"]
        .as_array()
        .expect("checks")
        .iter()
        .find(|c| c["name"] == "output weld")
        .expect("check")
        .clone();
    assert_eq!(c["ok"], false, "{c}");
    assert!(c["detail"].as_str().expect("d").contains("within ±5 %"));
}

#[test]
fn split_bobbin_traverse_and_mean_turn_by_hand() {
    // By hand (DESIGN.md v2): window 37.5 mm, walls 1.5 → traverse 34.5; less the 1.5 mm divider,
    // 33 mm shared half and half: 16.5 mm each. Each section's first winding starts at the tube, so
    // its mean turn is 2(a + s) + 8·wall + 2π·(build/2).
    let j = plan("examples/split_bobbin_rewind.toml");
    for w in j["windings"].as_array().expect("w") {
        assert_relative_eq!(f(&w["traverse_mm"]), 16.5, max_relative = 1e-12);
        let mlt =
            2.0 * (25.0 + 30.0) + 8.0 * 1.5 + 2.0 * std::f64::consts::PI * f(&w["build_mm"]) / 2.0;
        assert_relative_eq!(f(&w["mean_turn_mm"]), mlt, max_relative = 1e-12);
    }
    assert_eq!(j["windings"][0]["section"], 1);
    assert_eq!(j["windings"][1]["section"], 2);
    // Both sections must fit: the window's build is the fuller section's.
    let b0 = f(&j["windings"][0]["build_mm"]);
    let b1 = f(&j["windings"][1]["build_mm"]);
    assert_relative_eq!(
        f(&j["window"]["build_mm"]),
        1.5 + b0.max(b1) + 0.2,
        max_relative = 1e-12
    );
    let svg = run(&[
        "card",
        "examples/split_bobbin_rewind.toml",
        "--format",
        "svg",
    ])
    .ok()
    .stdout;
    assert!(svg.contains("class=\"divider\""), "the divider is drawn");
}

#[test]
fn swg_and_measured_wire_plan() {
    let d = scratch("swg");
    let swg = edited(
        GOOD_JOB,
        "[[winding]]\nname = \"mains\"",
        "[wire]\nsystem = \"swg\"\n[[winding]]\nname = \"mains\"",
    );
    let j = plan(&write(&d, "swg.toml", &swg));
    assert_eq!(j["windings"][1]["conductor"]["system"], "swg");
    // 4 A at 3 A/mm² needs 1.33 mm²: SWG 18 (1.219 mm, 1.167 mm²) is short, SWG 17 (1.422 mm,
    // 1.588 mm²) carries it (BS 3737 diameters).
    assert_eq!(j["windings"][1]["conductor"]["size"], "17");
    assert_relative_eq!(f(&j["windings"][1]["conductor"]["bare_mm"]), 1.422);
    let forced = edited(GOOD_JOB, "amps = 4.0", "amps = 4.0\nsize = \"SWG 16\"");
    let j = plan(&write(&d, "swg16.toml", &forced));
    assert_relative_eq!(f(&j["windings"][1]["conductor"]["bare_mm"]), 1.626);
    // A 1.50 mm wire measured with a micrometer: grade 2 overall interpolated between the table's
    // 1.40 (1.506) and 1.60 (1.709) mm rows (IS 13730-0-1 via data/wire_metric.csv): 1.6075 mm.
    let bare = edited(GOOD_JOB, "amps = 4.0", "amps = 4.0\nbare_mm = 1.5");
    let j = plan(&write(&d, "bare.toml", &bare));
    let c = &j["windings"][1]["conductor"];
    assert_eq!(c["system"], "measured");
    assert_relative_eq!(f(&c["overall_mm"]), 1.6075, max_relative = 1e-9);
    let list = run(&["wire", "--list", "--system", "swg", "--format", "json"])
        .ok()
        .json();
    assert_eq!(list.as_array().expect("rows").len(), 37);
}
