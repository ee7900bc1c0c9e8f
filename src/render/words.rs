//! Sentences: every check, warning and note of the library, in words, once for every format.
//!
//! The library hands over kinds and figures (`verdict`, `capacity`, `rate`); this module is the only
//! place they become text, so the plan's text, its JSON `detail` strings and the card agree.

use crate::capacity::{Change, Limit};
use crate::magnetics::Waveform;
use crate::rate::RateNote;
use crate::verdict::{Check, CheckFigures, FluxSource, KeptLimit, KeptOutputNote, Warning};

/// Where the design flux came from, in words.
pub fn flux_source(s: &FluxSource) -> String {
    match s {
        FluxSource::Given => "given in the job".to_string(),
        FluxSource::GivenAboveSweep => "given in the job (above the sweep's recommendation)".into(),
        FluxSource::Sweep => "sweep: 0.9 × the IEC knee".to_string(),
        FluxSource::Steel(name) => format!("steel default ({name})"),
    }
}

/// One line of detail for a check.
pub fn check_detail(c: &Check) -> String {
    check_detail_in(c, super::Units::Metric)
}

/// A check's figures in words, in the display units (imperial: inches and circular mils per
/// ampere first, SI beside).
pub fn check_detail_in(c: &Check, units: super::Units) -> String {
    let look = super::Look {
        units,
        ..super::Look::default()
    };
    match &c.figures {
        CheckFigures::Flux {
            flux_t,
            limit_t,
            source,
        } => format!(
            "{flux_t:.3} T peak, limit {limit_t:.2} T ({})",
            flux_source(source)
        ),
        CheckFigures::Window { no_turn_fits, .. } if *no_turn_fits => {
            "a winding cannot get a single turn on a layer".to_string()
        }
        CheckFigures::Window {
            build_mm,
            available_mm,
            copper_fill,
            ..
        } => format!(
            "build {} of {} available; copper fill {copper_fill:.2}",
            look.mm(*build_mm, 2),
            look.mm(*available_mm, 2)
        ),
        CheckFigures::Heating { rise_c, limit_c } => {
            format!("rise {rise_c:.1} °C, limit {limit_c:.0} °C")
        }
        CheckFigures::CurrentDensity { winding, .. } if winding.is_empty() => {
            "no wire here is the plan's choice: kept windings and given conductors are judged by heating and the insulation class".to_string()
        }
        CheckFigures::CurrentDensity {
            highest_a_mm2,
            winding,
            limit_a_mm2,
        } => format!(
            "highest {} (\"{winding}\"), limit {}",
            look.density(*highest_a_mm2),
            look.density(*limit_a_mm2)
        ),
        CheckFigures::PrimaryCurrent { amps } if c.ok => format!("{amps:.2} A at full load"),
        CheckFigures::PrimaryCurrent { .. } => {
            "the primary's resistance is too high to pass the load's power".to_string()
        }
        CheckFigures::Output {
            volts_full_load,
            amps,
            fixed_no_target: true,
            ..
        } => format!("{volts_full_load:.2} V at {amps:.2} A (fixed turns, no volts to compare)"),
        CheckFigures::Output {
            volts_full_load,
            amps,
            target_volts,
            tolerance_pct: Some(t),
            ..
        } => format!(
            "{volts_full_load:.2} V at {amps:.2} A with fixed turns ({:+.1} % from {target_volts:.2} V; within ±{t:.0} % passes)",
            (volts_full_load - target_volts) / target_volts * 100.0
        ),
        CheckFigures::Output {
            volts_full_load,
            amps,
            target_volts,
            ..
        } if c.ok => format!("{volts_full_load:.2} V at {amps:.2} A (target {target_volts:.2} V)"),
        CheckFigures::Output {
            volts_full_load,
            amps,
            target_volts,
            max_volts,
            ..
        } => format!(
            "{volts_full_load:.2} V at {amps:.2} A, short of {target_volts:.2} V; the most it can deliver is {:.2} V",
            max_volts.unwrap_or(*volts_full_load).min(1e9)
        ),
        CheckFigures::DcOutput {
            reached,
            target,
            other,
            charge_current,
            max,
            tolerance_pct,
            ..
        } => {
            let (unit, o_unit, what) = if *charge_current {
                ("A", "V", "charge current")
            } else {
                ("V DC", "A", "DC volts")
            };
            let head = format!("{what} {reached:.2} {unit} at {other:.2} {o_unit}");
            match (tolerance_pct, c.ok) {
                (Some(t), _) => format!(
                    "{head} with fixed turns ({:+.1} % from {target:.2} {unit}; within ±{t:.0} % passes)",
                    (reached - target) / target * 100.0
                ),
                (None, true) => format!("{head} (target {target:.2} {unit})"),
                (None, false) => format!(
                    "{head}, short of {target:.2} {unit}; the most it can deliver is {:.2} {unit}",
                    max.unwrap_or(*reached).min(1e9)
                ),
            }
        }
        CheckFigures::InsulationClass {
            hot_spot_c,
            class,
            limit_c,
        } => format!(
            "hottest copper {hot_spot_c:.0} °C, class {class} insulation {limit_c:.0} °C (IEC 60085)"
        ),
    }
}

/// A warning or note, as one sentence.
pub fn warning(w: &Warning) -> String {
    match w {
        Warning::DonorRunHard { flux_t, hard_t } => format!(
            "the donor ran at {flux_t:.2} T, above the {hard_t:.1} T salvaged steel normally takes: it was run hard (as microwave-oven cores are); plan lower"
        ),
        Warning::DonorFluxImplausible { flux_t } => format!(
            "the donor's flux works out at only {flux_t:.2} T: check the stack and tongue measurements and the test-winding reading"
        ),
        Warning::SweepBelowKnee { in_plan: true } => "the sweep does not reach the IEC knee (10 % more volts never gave 50 % more current inside it): the flux cap is not known; sweep higher".to_string(),
        Warning::SweepBelowKnee { in_plan: false } => "the sweep does not reach the IEC knee (10 % more volts never gave 50 % more current inside it): sweep higher".to_string(),
        Warning::NoTangentPoint => {
            "the log-log slope never crosses 45° inside the sweep: no tangent point".to_string()
        }
        Warning::DonorAboveRecommended {
            donor_t,
            recommended_t,
        } => format!(
            "the donor ran at {donor_t:.2} T, above the sweep's recommended {recommended_t:.2} T"
        ),
        Warning::PathLengthEstimated => "no --window given: the path length for the field strength assumes scrapless E-I proportions".to_string(),
        Warning::GivenFluxAboveSweep {
            given_t,
            recommended_t,
        } => format!(
            "the given flux {given_t:.2} T is above the sweep's recommended {recommended_t:.2} T (0.9 × the IEC knee): kept as given, expect a high idle current"
        ),
        Warning::FluxAboveKneeMargin {
            flux_t,
            margin_t,
            knee_t,
        } => format!(
            "planned flux {flux_t:.2} T is above the knee margin {margin_t:.2} T (0.9 × the IEC knee {knee_t:.2} T): the idle current will be high and the core may saturate"
        ),
        Warning::FluxAboveDonor { flux_t, donor_t } => {
            format!("planned flux {flux_t:.2} T is above the {donor_t:.2} T the donor ran at")
        }
        Warning::KeptOutputAboveDonor { ratio } => format!(
            "the core runs at {ratio:.2} × the flux the donor was built for and no sweep shows the knee margin: sweep the kept winding before relying on it"
        ),
        Warning::HardToWind { copper_fill, limit } => format!(
            "copper fill {copper_fill:.2} is above {limit:.2} (McLyman's window utilisation): hard to wind by hand"
        ),
        Warning::HighPrimaryCurrent { amps } => format!(
            "the primary draws {amps:.0} A at full load: use parallel strands or strip, and thick, short leads"
        ),
        Warning::SquareDrive { loss_factor } => format!(
            "square-wave drive: core loss taken as {loss_factor:.2} × the sine figure at the same peak flux (loss separation; a short conduction raises it, full square lowers it); the harmonics reach the load; fuse for the bridge's peak current"
        ),
        Warning::PastSaturation { flux_t, limit_t } => format!(
            "the core runs at {flux_t:.2} T, past saturation (about {limit_t:.1} T for silicon steel): the magnetising current runs away, so the loss, heating and efficiency figures are not estimates of anything; lower the volts per turn (more primary turns)"
        ),
        Warning::TinyLength { key, value_mm } => format!(
            "{key} = {value_mm} was read as {value_mm} mm: did you mean inches? Write \"{value_mm} in\" (a string with its unit) if so"
        ),
        Warning::ManyStrands { winding, strands } => format!(
            "\"{winding}\" needs {strands} strands in hand: consider strip conductor (strip_mm)"
        ),
    }
}

/// How a kept output's drive compares with the donor's sine flux, in words.
pub fn kept_output_note(n: &KeptOutputNote) -> String {
    let ratio = n.flux_t / n.donor_flux_t;
    let (name, flux, donor) = (&n.winding, n.flux_t, n.donor_flux_t);
    match n.waveform {
        Waveform::Sine => format!(
            "kept output \"{name}\": sine drive at {:.4} V per turn; the core runs at {flux:.3} T against the donor's {donor:.3} T (×{ratio:.3})",
            n.volts_per_turn
        ),
        wf => format!(
            "kept output \"{name}\": a square drive at the donor's RMS volts per turn runs the core at 4.443/4 = 1.11 × the sine flux it was built for{}; here {flux:.3} T against the donor's {donor:.3} T (×{ratio:.3})",
            match wf {
                Waveform::QuasiSquare { duty } => format!(
                    ", times √δ = {:.3} for quasi-square at duty {duty}",
                    duty.sqrt()
                ),
                _ => String::new(),
            }
        ),
    }
}

/// The limit that binds a capacity, as a person reads it.
pub fn limit(l: Limit) -> &'static str {
    match l {
        Limit::Window => "window",
        Limit::Heating => "heating",
        Limit::Regulation => "regulation",
        Limit::FluxTurns => "flux/turns",
    }
}

/// A change that would let a core carry more, in words.
pub fn change(c: &Change) -> String {
    match c {
        Change::DeeperStack { stack_mm } => {
            format!("stack 25 % deeper ({stack_mm:.1} mm of laminations)")
        }
        Change::LowerFlux { flux_t } => format!("lower flux {flux_t:.2} T (more turns)"),
        Change::Strip {
            winding,
            width_mm,
            thickness_mm,
        } => format!(
            "strip conductor on \"{winding}\" ({width_mm:.0} mm wide, {thickness_mm} mm foils in hand)"
        ),
        Change::ForcedAir => {
            "forced air (a fan; taken as twice the heat shed, common practice)".to_string()
        }
        Change::HigherDensity { limit_a_mm2 } => format!(
            "current density up to {limit_a_mm2:.2} A/mm² (thinner wire; the coil runs hotter)"
        ),
    }
}

/// A note on a rating.
pub fn rate_note(n: &RateNote) -> String {
    match n {
        RateNote::IntermittentDuty { duty } => format!(
            "intermittent duty {duty}: heating is rated on the time-averaged copper loss; this assumes each load period is short against the core's thermal time constant (minutes to tens of minutes)"
        ),
        RateNote::QuickEstimates => "the area-product and rule-of-thumb figures are quick estimates; the capacity comes from full plans with losses and heating".to_string(),
        RateNote::RectifiedOutputs { va_per_dc_w } => format!(
            "a rectified output counts by its DC watts; its winding carries up to {} × that in VA (its pulsed current heats the copper as the plan's rectifier solution shows)",
            super::num(*va_per_dc_w, 2)
        ),
    }
}

/// The most a kept output gives at the design flux, in words.
pub fn kept_limit(k: &KeptLimit) -> String {
    format!(
        "at {:.2} T the kept winding \"{}\" gives at most {:.1} V at full load (target {:.1} V){}",
        k.flux_t,
        k.winding,
        k.volts,
        k.target_volts,
        if k.volts + 1e-9 < k.target_volts {
            ": to reach the target the core must run above the design flux"
        } else {
            ""
        }
    )
}

/// How a winding is built, when that is more than one plain coil: halves, sections, fixed turns,
/// a split bobbin's section, a load duty.
pub fn built_notes(plan: &crate::plan::Plan, w: &crate::plan::WindingPlan) -> Vec<String> {
    use crate::job::Role;
    let mut v = Vec::new();
    let name = &w.name;
    let (n, k) = (w.turns, w.sections);
    let wound = if w.bifilar {
        "wound together (bifilar, strands side by side)"
    } else {
        "wound one after the other"
    };
    if w.centre_tap && w.role == Role::Primary {
        v.push(format!(
            "\"{name}\": push-pull primary, two halves of {n} turns ({} in all) {wound}; each half conducts half of each cycle and carries {:.3} A RMS (I/√2 of {:.3} A)",
            2 * n,
            w.section_amps,
            w.amps
        ));
    } else if w.centre_tap {
        v.push(format!(
            "\"{name}\": centre-tapped, two halves of {n} turns ({} in all) {wound}, {:.2} V and {:.3} A each",
            2 * n,
            w.volts,
            w.section_amps
        ));
    } else if k > 1 {
        v.push(format!(
            "\"{name}\": {k} sections of {n} turns {wound}, each {:.2} V and {:.3} A: in series for {:.2} V, in parallel for {:.2} V (sections in parallel must have the same turns)",
            w.volts,
            w.section_amps,
            w.volts * k as f64,
            w.volts
        ));
    }
    if w.turns_fixed {
        v.push(format!("\"{name}\": {n} turns fixed by the job"));
    }
    if plan.settings.split.is_some() {
        v.push(format!(
            "\"{name}\": section {} of the split bobbin ({:.1} mm of traverse)",
            w.bobbin_section, w.coil.traverse_mm
        ));
    }
    if w.load_duty < 1.0 {
        v.push(format!(
            "\"{name}\": load on {:.0} % of the time; heating from the time-averaged loss",
            w.load_duty * 100.0
        ));
    }
    v
}

/// The copper's own rise in one on-time, in words.
pub fn adiabatic_note(w: &crate::plan::WindingPlan) -> String {
    format!(
        "\"{}\": in one on-time its copper rises a further {:.1} °C with no time to shed heat (J²·ρ·t / c_v at {:.1} A/mm²)",
        w.name,
        w.adiabatic_rise_c.unwrap_or(0.0),
        w.current_density_a_mm2
    )
}

/// Whether an output is a welder's (intermittent and AC): its short-circuit current leads its plan.
pub fn is_welder(w: &crate::plan::WindingPlan) -> bool {
    w.role == crate::job::Role::Secondary
        && w.dc.is_none()
        && (w.load_duty < 1.0 || w.adiabatic_rise_c.is_some())
}

/// The welder's headline.
pub fn short_circuit_headline(name: &str, amps: f64) -> String {
    format!(
        "Short-circuit current of \"{name}\": {} A with the primary at rated volts (the leakage reactance sets a welder's current; it also sizes the supply's fuse, by the supply's code).",
        super::sig3(amps)
    )
}

/// A rectified output's load in words: rectifier, filter and its part.
pub fn dc_load(d: &crate::plan::DcPlan) -> String {
    use crate::rectifier::Filter;
    let l = &d.load;
    let filter = match l.filter {
        Filter::Capacitor => format!("{} µF", super::num(l.capacitor_uf, 0)),
        Filter::Choke => format!(
            "choke {} H, {} µF",
            super::sig3(l.choke_h),
            super::num(l.capacitor_uf, 0)
        ),
        Filter::Battery => format!(
            "battery {} V, {} Ω",
            super::num(l.dc_volts, 1),
            super::sig3(l.battery_ohm)
        ),
        Filter::Resistive => "resistor".to_string(),
    };
    format!(
        "{}{}, {}",
        l.rectifier.name(),
        if d.dual_rails { " (± rails)" } else { "" },
        filter
    )
}

/// The inrush estimate in words.
pub fn inrush(i: &crate::magnetising::Inrush) -> String {
    let soft = if i.soft_start_ohm > 0.0 {
        format!(
            "; a series {} ohm at switch-on holds it to 10 × rated",
            super::sig3(i.soft_start_ohm)
        )
    } else {
        "; within 10 × rated with no soft start".to_string()
    };
    format!(
        "{} A peak, {} × rated (Specht's estimate, first half cycle from remanence){soft}; fuse by the supply's code",
        super::sig3(i.peak_amps),
        super::num(i.multiple_of_rated, 1)
    )
}
