//! The plan (`ironwind plan`, `demo`): text tables for a terminal, and the dispatch to its JSON and
//! CSV forms.

use super::{num, pairs, sig3, table, words, Format, Look, Units};
use crate::magnetics::Waveform;
use crate::plan::Plan;
use crate::wire::Conductor;
use std::io::Write;

/// Writes a plan in a format: text tables, JSON or the CSV schedule.
pub fn write(out: &mut dyn Write, plan: &Plan, format: Format, look: &Look) -> std::io::Result<()> {
    match format {
        Format::Json => super::json::write_plan(out, plan),
        Format::Csv => super::csv::write_schedule(out, plan),
        _ => out.write_all(look.finish(plan_text(plan, *look)).as_bytes()),
    }
}

/// The line the demo prints before its plan.
pub fn write_demo_intro(out: &mut dyn Write, look: &Look) -> std::io::Result<()> {
    if look.quiet {
        return Ok(());
    }
    let text = super::wrap(
        "The bundled example (examples/garage_charger.toml), planned end to end.",
        look.width,
        "",
        "",
    );
    writeln!(out, "{text}")
}

/// The plan as one string.
pub fn plan_text(plan: &Plan, look: Look) -> String {
    let mut s = format!("ironwind plan: {}\n\n", plan.name);
    s += &headline(plan, look);
    s += &core_section(plan, look);
    s += &drive_section(plan, look);
    s += &windings_section(plan, look);
    s += &electrical_section(plan, look);
    s += &loads_section(plan, look);
    s += &window_section(plan, look);
    s += &warnings_and_verdict(plan, look);
    s
}

/// The core: measurements, areas, path, mass.
fn core_section(plan: &Plan, look: Look) -> String {
    let lk = &look;
    let mut s = String::new();
    let g = &plan.geometry;
    let c = &plan.core;
    s += "Core\n";
    s += &pairs(
        &[
            (
                "shape",
                format!(
                    "{} ({})",
                    c.shape.name(),
                    if c.shape.name() == "ei" {
                        "shell, coil on the tongue"
                    } else {
                        "core type, half-coil on each leg"
                    }
                ),
            ),
            (
                "tongue × stack",
                format!("{} × {}", lk.mm(c.tongue_mm, 2), lk.mm(c.stack_mm, 2)),
            ),
            (
                "window w × h",
                format!(
                    "{} × {}",
                    lk.mm(c.window_width_mm, 2),
                    lk.mm(c.window_height_mm, 2)
                ),
            ),
            ("stacking factor", num(c.stacking_factor, 3)),
            (
                "steel",
                format!(
                    "{} ({}, loss estimate {} W/kg at 1.5 T 50 Hz)",
                    plan.steel.name,
                    plan.steel.kind,
                    num(plan.steel.loss_w_per_kg_1t5, 2)
                ),
            ),
            (
                "Ae gross / net",
                format!(
                    "{} / {}",
                    lk.mm2(g.area_gross_mm2, 1),
                    lk.mm2(g.area_net_mm2, 1)
                ),
            ),
            ("Aw (one window)", lk.mm2(g.window_area_mm2, 1)),
            ("area product Ap", lk.cm4(g.area_product_cm4, 2)),
            ("path length le", lk.mm(g.path_length_mm, 1)),
            (
                "core mass",
                format!(
                    "{}{}",
                    lk.kg(g.mass_kg, 3),
                    if g.mass_measured {
                        " (weighed)"
                    } else {
                        " (from the outline)"
                    }
                ),
            ),
        ],
        look,
    );
    s
}

/// The drive and what the probe told the plan.
fn drive_section(plan: &Plan, look: Look) -> String {
    let mut s = String::new();
    let d = &plan.drive;
    let wf = match d.waveform {
        Waveform::Sine => "sine (primary volts RMS)".to_string(),
        Waveform::Square => "square (primary volts = amplitude)".to_string(),
        Waveform::QuasiSquare { duty } => format!(
            "quasi-square, duty {} (primary volts = amplitude)",
            num(duty, 3)
        ),
    };
    let mut drive = vec![
        ("frequency", format!("{} Hz", num(d.frequency_hz, 1))),
        ("waveform", wf),
        (
            "flux density",
            format!(
                "{} T peak (aimed at {} T: {})",
                num(d.flux_density_t, 3),
                num(d.design_flux_t, 2),
                words::flux_source(&d.flux_source)
            ),
        ),
        ("volts per turn", format!("{} V", num(d.volts_per_turn, 4))),
        ("turns per volt", num(1.0 / d.volts_per_turn, 4)),
        (
            "primary current",
            format!("{} A RMS at full load", sig3(d.primary_amps)),
        ),
    ];
    if let Some(i0) = d.no_load_amps {
        drive.push((
            "no-load current",
            format!("{} A RMS (from the sweep, approximate)", sig3(i0)),
        ));
    }
    if let Some(r) = d.flux_vs_donor {
        drive.push(("flux vs donor", format!("× {}", num(r, 3))));
    }
    drive.push((
        "magnetising current",
        format!(
            "{} A RMS ({})",
            sig3(d.magnetising_amps),
            if d.no_load_amps.is_some() {
                "from the sweep"
            } else {
                "estimate from the steel's magnetisation table and the joints"
            }
        ),
    ));
    drive.push((
        "idle current",
        format!("{} A RMS (predicted)", sig3(d.idle_amps)),
    ));
    drive.push(("switch-on inrush", words::inrush(&d.inrush)));
    s += "\nDrive\n";
    s += &pairs(&drive, look);
    if let Some(n) = &d.kept_output_note {
        s += &super::wrap(&words::kept_output_note(n), look.width, "", "  ");
    }
    if let Some(k) = &d.kept_limit {
        s += &super::wrap(&words::kept_limit(k), look.width, "", "  ");
    }
    if let Some(p) = &plan.probe {
        let mut rows = Vec::new();
        if let Some(v) = p.volts_per_turn {
            rows.push(("measured volts per turn", format!("{} V", num(v, 4))));
        }
        if let Some(b) = p.donor_flux_t {
            rows.push(("donor ran at", format!("{} T", num(b, 3))));
        }
        if let (Some(v), Some(b)) = (p.knee_volts, p.knee_flux_t) {
            rows.push((
                "IEC knee",
                format!("{} V on the swept winding, {} T", num(v, 2), num(b, 3)),
            ));
        }
        if let Some(b) = p.tangent_flux_t {
            rows.push(("45° tangent point", format!("{} T", num(b, 3))));
        }
        if let Some(b) = p.recommended_flux_t {
            rows.push((
                "recommended maximum",
                format!("{} T (0.9 × IEC knee)", num(b, 3)),
            ));
        }
        if !rows.is_empty() {
            s += "\nProbe\n";
            s += &pairs(&rows, look);
        }
    }
    s
}

/// The windings table, innermost first.
fn windings_section(plan: &Plan, look: Look) -> String {
    let lk = &look;
    let mut s = String::new();
    s += "\nWindings (innermost first)\n";
    let mut rows = vec![vec![
        "winding".to_string(),
        "role".into(),
        "volts".into(),
        "amps".into(),
        "turns".into(),
        "wire".into(),
        "strands".into(),
        format!("OD {}", lk.mm_unit()),
        lk.density_unit().into(),
        "turns/layer".into(),
        "layers".into(),
        format!("build {}", lk.mm_unit()),
    ]];
    for w in &plan.windings {
        rows.push(vec![
            if w.kept {
                format!("{} (kept)", w.name)
            } else {
                w.name.clone()
            },
            w.role.name().to_string(),
            if w.volts_given {
                num(w.volts, 2)
            } else {
                "-".into()
            },
            sig3(w.amps),
            if w.sections > 1 {
                format!("{} × {}", w.sections, w.turns)
            } else {
                w.turns.to_string()
            },
            wire_label(&w.wire.conductor, lk),
            w.wire.strands.to_string(),
            lk.mm_bare(w.wire.conductor.build_mm(), 3),
            lk.density_bare(w.current_density_a_mm2),
            w.coil.turns_per_layer.to_string(),
            w.coil.layers.to_string(),
            lk.mm_bare(w.coil.build_mm, 2),
        ]);
    }
    s += &table(rows, 2, look);
    if plan.core.shape.name() == "ui" {
        s += "(U-I core: each winding is split over the two legs; turns per layer, layers and build are per half-coil.)\n";
    }
    for w in &plan.windings {
        for note in words::built_notes(plan, w) {
            s += &super::wrap(&note, look.width, "", "  ");
        }
    }
    s
}

/// Mean turn, length, resistance, loss and volts of each winding; taps.
fn electrical_section(plan: &Plan, look: Look) -> String {
    let lk = &look;
    let mut s = String::new();
    s += "\nElectrical\n";
    let mut rows = vec![vec![
        "winding".to_string(),
        format!("mean turn {}", lk.mm_unit()),
        if lk.units == Units::Imperial {
            "length ft".to_string()
        } else {
            "length m".to_string()
        },
        format!("R at {} °C Ω", num(plan.thermal.resistance_at_c, 0)),
        "copper W".into(),
        "no-load V".into(),
        "full-load V".into(),
        "regulation %".into(),
    ]];
    for w in &plan.windings {
        rows.push(vec![
            w.name.clone(),
            lk.mm_bare(w.coil.mean_turn_mm, 1),
            if lk.units == Units::Imperial {
                num(w.length_m / 0.3048, 1)
            } else {
                num(w.length_m, 2)
            },
            sig3(w.resistance_ohm),
            num(w.copper_loss_w, 2),
            num(w.volts_no_load, 2),
            num(w.volts_full_load, 2),
            w.regulation_pct
                .map(|r| num(r, 1))
                .unwrap_or_else(|| "-".into()),
        ]);
    }
    s += &table(rows, 1, look);
    for w in plan.windings.iter().filter(|w| !w.taps.is_empty()) {
        let list: Vec<String> = w
            .taps
            .iter()
            .map(|t| format!("{} V at turn {}", num(t.volts, 2), t.turn))
            .collect();
        s += &format!("taps on \"{}\": {}\n", w.name, list.join(", "));
    }
    s
}

/// The figure a welder's user wants first: each intermittent AC output's short-circuit current.
fn headline(plan: &Plan, look: Look) -> String {
    let mut s = String::new();
    for w in plan.windings.iter().filter(|w| words::is_welder(w)) {
        if let Some(a) = w.short_circuit_amps.filter(|a| a.is_finite()) {
            s += &super::wrap(
                &words::short_circuit_headline(&w.name, a),
                look.width,
                "",
                "  ",
            );
        }
    }
    if !s.is_empty() {
        s.push('\n');
    }
    s
}

/// Rectified outputs (DC figures and the winding's waveform) and every output's leakage and
/// short-circuit current.
fn loads_section(plan: &Plan, look: Look) -> String {
    let mut s = String::new();
    let outputs: Vec<_> = plan
        .windings
        .iter()
        .filter(|w| w.role == crate::job::Role::Secondary)
        .collect();
    if outputs.iter().any(|w| w.dc.is_some()) {
        s += "\nRectified outputs (periodic steady state)\n";
        let mut rows = vec![vec![
            "winding".to_string(),
            "load".into(),
            "DC V full / no load".into(),
            "DC A".into(),
            "ripple V p-p".into(),
            "A RMS".into(),
            "A peak".into(),
            "conduction °".into(),
            "VA / P_dc".into(),
        ]];
        for w in &outputs {
            let Some(d) = &w.dc else { continue };
            rows.push(vec![
                w.name.clone(),
                words::dc_load(d),
                format!(
                    "{}{} / {}",
                    if d.dual_rails { "± " } else { "" },
                    num(d.volts_full_load, 2),
                    num(d.volts_no_load, 2)
                ),
                sig3(d.amps),
                num(d.ripple_pp_v, 2),
                sig3(d.rms_amps),
                sig3(d.peak_amps),
                num(d.conduction_deg, 0),
                num(d.va_per_dc_w, 2),
            ]);
        }
        s += &table(rows, 1, look);
    }
    if outputs.is_empty() {
        return s;
    }
    s += "\nLeakage and short circuit (primary at rated volts)\n";
    let mut rows = vec![vec![
        "winding".to_string(),
        "leakage mH".into(),
        "X Ω".into(),
        "Z Ω".into(),
        "short-circuit A".into(),
        "power factor".into(),
    ]];
    for w in &outputs {
        rows.push(vec![
            w.name.clone(),
            sig3(w.leakage_h * 1e3),
            sig3(w.leakage_reactance_ohm),
            w.short_circuit_ohm.map(sig3).unwrap_or_else(|| "-".into()),
            w.short_circuit_amps
                .filter(|a| a.is_finite())
                .map(sig3)
                .unwrap_or_else(|| "-".into()),
            if w.dc.is_some() {
                "-".into()
            } else {
                num(w.power_factor, 2)
            },
        ]);
    }
    s += &table(rows, 1, look);
    s
}

/// The core loss, or why there is none to give.
fn core_loss_text(plan: &Plan) -> String {
    let l = &plan.losses;
    if l.saturated {
        return "not estimated: the core is past saturation".to_string();
    }
    if (l.core_waveform_factor - 1.0).abs() > 1e-12 {
        return format!(
            "{} W (estimate; {} × the sine figure, loss separation)",
            num(l.core_w, 2),
            num(l.core_waveform_factor, 3)
        );
    }
    format!("{} W (estimate)", num(l.core_w, 2))
}

/// The efficiency, or why there is none to give.
fn efficiency_text(plan: &Plan) -> String {
    if plan.losses.saturated {
        return "not estimated: the core is past saturation".to_string();
    }
    format!("{} %", num(plan.losses.efficiency * 100.0, 1))
}

/// Window fill, build, losses and heating.
fn window_section(plan: &Plan, look: Look) -> String {
    let lk = &look;
    let mut s = String::new();
    s += "\nWindow, losses and heating\n";
    let win = &plan.window;
    let l = &plan.losses;
    let t = &plan.thermal;
    s += &pairs(
        &[
            ("copper fill", num(win.copper_fill, 3)),
            (
                "build",
                format!(
                    "{} of {} available ({})",
                    lk.mm(win.build_mm, 2),
                    lk.mm(win.available_mm, 2),
                    if win.fits { "fits" } else { "does not fit" }
                ),
            ),
            ("core loss", core_loss_text(plan)),
            ("copper loss", format!("{} W", num(l.copper_w, 2))),
            ("output", format!("{} W", num(l.output_w, 1))),
            ("efficiency", efficiency_text(plan)),
            (
                "regulation",
                format!(
                    "{} % (the worst output; (V_NL − V_FL)/V_FL)",
                    num(l.regulation_pct, 1)
                ),
            ),
            (
                "surface",
                match lk.units {
                    Units::Metric => format!("{} cm²", num(t.surface_cm2, 0)),
                    Units::Imperial => format!(
                        "{} in² ({} cm²)",
                        num(t.surface_cm2 / 6.4516, 0),
                        num(t.surface_cm2, 0)
                    ),
                },
            ),
            (
                "temperature rise",
                format!(
                    "{} °C (limit {} °C)",
                    num(t.rise_c, 1),
                    num(t.max_rise_c, 0)
                ),
            ),
            (
                "hot winding",
                format!(
                    "{} °C at {} °C ambient",
                    num(t.hot_c, 1),
                    num(t.ambient_c, 0)
                ),
            ),
            (
                "hottest copper",
                format!(
                    "{} °C (class {} insulation: {} °C, IEC 60085)",
                    num(t.hot_spot_c, 1),
                    t.insulation_class.letter(),
                    num(t.insulation_class.limit_c(), 0)
                ),
            ),
        ],
        look,
    );
    for w in plan
        .windings
        .iter()
        .filter(|w| w.adiabatic_rise_c.is_some())
    {
        s += &super::wrap(&words::adiabatic_note(w), look.width, "", "  ");
    }
    s
}

/// Warnings, the verdict table and the cautions, shared by the plan and the demo.
pub fn warnings_and_verdict(plan: &Plan, look: Look) -> String {
    let mut s = String::new();
    if !plan.warnings.is_empty() {
        s += "\nWarnings\n";
        for w in &plan.warnings {
            s += &super::wrap(&words::warning(w), look.width, "  ! ", "    ");
        }
    } else {
        s += "\n";
    }
    let verdict = if plan.verdict.ok {
        "every check passes"
    } else {
        "DOES NOT PASS"
    };
    s += &format!("\nVerdict: {}\n", look.mark(verdict, plan.verdict.ok));
    let mut rows = vec![vec!["check".to_string(), "result".into(), "detail".into()]];
    for c in &plan.verdict.checks {
        rows.push(vec![
            c.name(),
            if c.ok { "ok".into() } else { "FAIL".into() },
            words::check_detail_in(c, look.units),
        ]);
    }
    s += &table(rows, 99, look);
    s += "\nCautions\n";
    for c in plan.cautions {
        s += &super::wrap(c, look.width, "  * ", "    ");
    }
    s
}

/// The wire as a person reads it; imperial display gives the nearest AWG beside a metric size.
pub fn wire_label(c: &Conductor, look: &Look) -> String {
    match (c, look.units) {
        (Conductor::Round(r), Units::Imperial) if r.system == crate::wire::System::Metric => {
            format!(
                "{} (≈AWG {})",
                c.describe(),
                crate::wire::nearest_awg(r.area_mm2)
            )
        }
        _ => c.describe(),
    }
}
