//! The JSON keys of DESIGN.md held by a typed mirror: every object denies unknown fields, so a key
//! that goes missing or appears unannounced fails here.
#![allow(dead_code)]

use crate::common::{example_jobs, run};
use serde::Deserialize;

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct PlanDoc {
    name: String,
    core: Core,
    drive: Drive,
    windings: Vec<Winding>,
    window: Window,
    losses: Losses,
    thermal: Thermal,
    probe: Option<Probe>,
    settings: Settings,
    buy: Vec<Buy>,
    verdict: Verdict,
    warnings: Vec<String>,
    cautions: Vec<String>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct Core {
    shape: String,
    tongue_mm: f64,
    stack_mm: f64,
    window_width_mm: f64,
    window_height_mm: f64,
    stacking_factor: f64,
    steel: String,
    steel_kind: String,
    steel_loss_w_per_kg: f64,
    area_gross_mm2: f64,
    area_net_mm2: f64,
    window_area_mm2: f64,
    area_product_cm4: f64,
    mass_kg: f64,
    mass_measured: bool,
    path_length_mm: f64,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct Drive {
    frequency_hz: f64,
    waveform: String,
    duty: f64,
    flux_density_t: f64,
    design_flux_t: f64,
    flux_source: String,
    flux_limit_t: f64,
    volts_per_turn: f64,
    turns_per_volt: f64,
    primary_rms_volts: f64,
    primary_amps: f64,
    no_load_amps: Option<f64>,
    flux_vs_donor: Option<f64>,
    kept_output_note: Option<String>,
    kept_limit: Option<KeptLimit>,
    magnetising_amps: f64,
    idle_amps: f64,
    inrush_peak_amps: f64,
    inrush_multiple: f64,
    soft_start_ohm: f64,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct Dc {
    rectifier: String,
    filter: String,
    dual_rails: bool,
    target_volts: f64,
    target_amps: f64,
    volts_full_load: f64,
    volts_no_load: f64,
    ripple_pp_v: f64,
    amps: f64,
    power_w: f64,
    va_per_dc_w: f64,
    diode_drop_v: f64,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct Conductor {
    system: String,
    size: String,
    grade: String,
    bare_mm: f64,
    overall_mm: f64,
    overall_width_mm: f64,
    area_mm2: f64,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct Tap {
    volts: f64,
    turn: u32,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct Winding {
    name: String,
    role: String,
    kept: bool,
    volts: f64,
    amps: f64,
    turns: u32,
    coil_turns: u32,
    strands: u32,
    conductor: Conductor,
    current_density_a_mm2: f64,
    turns_per_layer: u32,
    layers: u32,
    build_mm: f64,
    checkpoints: Vec<u32>,
    mean_turn_mm: f64,
    length_m: f64,
    cut_length_m: f64,
    resistance_ohm: f64,
    resistance_20c_ohm: f64,
    copper_loss_w: f64,
    copper_mass_g: f64,
    volts_no_load: f64,
    volts_full_load: f64,
    regulation_pct: Option<f64>,
    max_volts_full_load: Option<f64>,
    sections: u32,
    traverse_mm: f64,
    section_amps: f64,
    rms_amps: f64,
    peak_amps: f64,
    conduction_deg: Option<f64>,
    va: f64,
    output_w: f64,
    power_factor: f64,
    leakage_h: f64,
    leakage_reactance_ohm: f64,
    short_circuit_ohm: Option<f64>,
    short_circuit_amps: Option<f64>,
    dc: Option<Dc>,
    centre_tap: bool,
    bifilar: bool,
    turns_fixed: bool,
    section: u32,
    load_duty: f64,
    adiabatic_rise_c: Option<f64>,
    taps: Vec<Tap>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct Window {
    copper_fill: f64,
    build_mm: f64,
    available_mm: f64,
    traverse_mm: f64,
    fits: bool,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct Losses {
    core_w: f64,
    copper_w: f64,
    output_w: f64,
    efficiency: f64,
    regulation_pct: f64,
    core_waveform_factor: f64,
    saturated: bool,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct Thermal {
    surface_cm2: f64,
    rise_c: f64,
    ambient_c: f64,
    hot_c: f64,
    max_rise_c: f64,
    average_copper_w: f64,
    hot_spot_c: f64,
    insulation_class: String,
    insulation_class_c: f64,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct Probe {
    volts_per_turn: Option<f64>,
    donor_flux_t: Option<f64>,
    knee_volts: Option<f64>,
    knee_flux_t: Option<f64>,
    tangent_flux_t: Option<f64>,
    recommended_flux_t: Option<f64>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct Settings {
    current_density_a_mm2: f64,
    system: String,
    grade: u8,
    max_strand_mm: f64,
    pitch: f64,
    bobbin_wall_mm: f64,
    margin_mm: f64,
    interlayer_mm: f64,
    between_windings_mm: f64,
    outer_mm: f64,
    clearance_mm: f64,
    lead_m: f64,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct Buy {
    size: String,
    system: String,
    length_m: f64,
    mass_g: f64,
    spare_pct: f64,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct Check {
    name: String,
    kind: CheckKind,
    ok: bool,
    detail: String,
}

/// DESIGN.md (v2): `verdict.checks[].kind` is one of a fixed vocabulary.
#[derive(Deserialize, Debug, PartialEq)]
#[serde(rename_all = "kebab-case")]
enum CheckKind {
    Flux,
    Window,
    Heating,
    CurrentDensity,
    PrimaryCurrent,
    Output,
    InsulationClass,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct KeptLimit {
    winding: String,
    flux_t: f64,
    volts_full_load: f64,
    detail: String,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct Verdict {
    ok: bool,
    checks: Vec<Check>,
}

fn plan_doc(path: &str) -> PlanDoc {
    let r = run(&["plan", path, "--format", "json"]).ok();
    serde_json::from_str(&r.stdout)
        .unwrap_or_else(|e| panic!("{path}: JSON does not match the mirror: {e}"))
}

#[test]
fn every_example_plan_matches_the_mirror() {
    for p in example_jobs() {
        let doc = plan_doc(&p.display().to_string());
        assert!(!doc.windings.is_empty());
        assert!(!doc.cautions.is_empty(), "cautions always shown");
        // Each check's kind is the kind its name says (DESIGN.md v2 vocabulary).
        for c in &doc.verdict.checks {
            let want = match c.name.as_str() {
                "flux" => CheckKind::Flux,
                "window" => CheckKind::Window,
                "heating" => CheckKind::Heating,
                "current density" => CheckKind::CurrentDensity,
                "primary current" => CheckKind::PrimaryCurrent,
                n if n.starts_with("output ") => CheckKind::Output,
                "insulation class" => CheckKind::InsulationClass,
                n => panic!("unknown check name {n}"),
            };
            assert_eq!(c.kind, want, "{}", c.name);
        }
        for w in &doc.windings {
            // Checkpoints (card issue): the last equals the coil's turns; each step is a full layer
            // except the last.
            assert_eq!(
                *w.checkpoints.last().expect("checkpoints"),
                w.coil_turns,
                "{}",
                w.name
            );
            let mut prev = 0;
            for (k, cp) in w.checkpoints.iter().enumerate() {
                let step = cp - prev;
                if k + 1 < w.checkpoints.len() {
                    assert_eq!(step, w.turns_per_layer);
                } else {
                    assert!(step >= 1 && step <= w.turns_per_layer);
                }
                prev = *cp;
            }
            for t in &w.taps {
                assert!(t.turn >= 1 && t.turn <= w.turns, "tap inside the winding");
            }

            // 20 °C resistance is the hot one over the IEC 60028 factor 1 + 0.00393 (T − 20).
            let hot_t = doc.thermal.ambient_c + doc.thermal.max_rise_c;
            let factor = 1.0 + 0.00393 * (hot_t - 20.0);
            approx::assert_relative_eq!(
                w.resistance_20c_ohm * factor,
                w.resistance_ohm,
                max_relative = 1e-12
            );
        }
    }
}

#[test]
fn demo_json_matches_the_mirror() {
    let r = run(&["demo", "--format", "json"]).ok();
    let doc: PlanDoc = serde_json::from_str(&r.stdout).expect("mirror");
    assert!(doc.verdict.ok, "the demo is a design that passes");
}
