//! The keys of a rectified output and an AC output's power factor (DESIGN.md, "Loads as they are
//! drawn"): rectifier, filter, dc_volts, dc_amps, capacitor_uf, choke_h, choke_ohm, battery_ohm,
//! diode_drop_v; power_factor. The plan's first guess of a rectified winding's AC volts and RMS amps
//! comes from the textbook ratios (Mohan, Undeland & Robbins, ch. 5); the plan then solves the
//! rectifier for the real figures.

use super::winding::RawWinding;
use super::{DcLoad, Role};
use crate::error::Result;
use crate::input::{fmt_value, Checker};
use crate::rectifier::{Filter, Rectifier, BATTERY_OHM, DIODE_DROP_V};
use std::f64::consts::{PI, SQRT_2};

/// The DC load of an output that names a rectifier; None for an AC winding (and an error when the
/// rectifier keys are given without a rectifier).
pub(super) fn dc_load(
    c: &Checker,
    rw: &RawWinding,
    role: Role,
    key: &dyn Fn(&str) -> String,
) -> Result<Option<DcLoad>> {
    let Some(rect_word) = &rw.rectifier else {
        let stray = [
            ("filter", rw.filter.is_some()),
            ("dc_volts", rw.dc_volts.is_some()),
            ("dc_amps", rw.dc_amps.is_some()),
            ("capacitor_uf", rw.capacitor_uf.is_some()),
            ("choke_h", rw.choke_h.is_some()),
            ("choke_ohm", rw.choke_ohm.is_some()),
            ("battery_ohm", rw.battery_ohm.is_some()),
            ("diode_drop_v", rw.diode_drop_v.is_some()),
        ];
        if let Some((k, _)) = stray.iter().find(|(_, g)| *g) {
            return Err(c.fail(
                &key(k),
                "(without rectifier)",
                "describes a rectified output: add rectifier = \"bridge\", \"centre-tap\" or \"half-wave\"",
            ));
        }
        return Ok(None);
    };
    if role == Role::Primary {
        return Err(c.fail(
            &key("rectifier"),
            format!("\"{rect_word}\""),
            "a rectifier belongs on an output, not on the primary",
        ));
    }
    let rectifier = match c
        .word(
            &key("rectifier"),
            rect_word,
            &["bridge", "centre-tap", "half-wave"],
        )?
        .as_str()
    {
        "bridge" => Rectifier::Bridge,
        "centre-tap" => Rectifier::CentreTap,
        _ => Rectifier::HalfWave,
    };
    let filter = match &rw.filter {
        None => {
            return Err(c.fail(
                &key("filter"),
                "(missing)",
                "a rectified output needs its filter: \"capacitor\", \"choke\", \"battery\" or \"resistive\"",
            ))
        }
        Some(f) => match c
            .word(
                &key("filter"),
                f,
                &["capacitor", "choke", "battery", "resistive"],
            )?
            .as_str()
        {
            "capacitor" => Filter::Capacitor,
            "choke" => Filter::Choke,
            "battery" => Filter::Battery,
            _ => Filter::Resistive,
        },
    };
    for (k, given) in [("volts", rw.volts.is_some()), ("amps", rw.amps.is_some())] {
        if given {
            return Err(c.fail(
                &key(k),
                "(with rectifier)",
                "a rectified output is given by dc_volts and dc_amps in place of volts and amps",
            ));
        }
    }
    if rectifier == Rectifier::HalfWave && filter == Filter::Choke {
        return Err(c.fail(
            &key("filter"),
            "\"choke\"",
            "a choke after a half-wave rectifier needs a freewheeling diode, which is not modelled: use a bridge or a centre tap",
        ));
    }
    let dc_volts = match rw.dc_volts {
        Some(v) => c.range(&key("dc_volts"), v, 0.0, false, 10_000.0, "V")?,
        None => {
            return Err(c.fail(
                &key("dc_volts"),
                "(missing)",
                "a rectified output needs its mean DC volts at full load (a battery: its EMF), > 0 and ≤ 10000 V",
            ))
        }
    };
    let dc_amps = match rw.dc_amps {
        Some(a) => c.range(&key("dc_amps"), a, 0.0, false, 10_000.0, "A")?,
        None => {
            return Err(c.fail(
                &key("dc_amps"),
                "(missing)",
                "a rectified output needs its mean DC current at full load (a battery: the charge current), > 0 and ≤ 10000 A",
            ))
        }
    };
    let (capacitor_uf, choke_h, choke_ohm, battery_ohm) =
        filter_parts(c, rw, filter, (dc_volts, dc_amps), key)?;
    let diode_drop_v = match rw.diode_drop_v {
        Some(v) => c.range(&key("diode_drop_v"), v, 0.0, true, 5.0, "V")?,
        None => DIODE_DROP_V,
    };
    Ok(Some(DcLoad {
        rectifier,
        filter,
        dc_volts,
        dc_amps,
        capacitor_uf,
        choke_h,
        choke_ohm,
        battery_ohm,
        diode_drop_v,
    }))
}

/// The filter's parts: capacitor (µF), choke (H) and its resistance (Ω), battery resistance (Ω);
/// each required by, or refused without, the filter it belongs to.
fn filter_parts(
    c: &Checker,
    rw: &RawWinding,
    filter: Filter,
    (dc_volts, dc_amps): (f64, f64),
    key: &dyn Fn(&str) -> String,
) -> Result<(f64, f64, f64, f64)> {
    let needs_cap = matches!(filter, Filter::Capacitor | Filter::Choke);
    let capacitor_uf = match (rw.capacitor_uf, needs_cap) {
        (Some(cap), true) => c.range(&key("capacitor_uf"), cap, 0.0, false, 10_000_000.0, "µF")?,
        (None, true) => {
            return Err(c.fail(
                &key("capacitor_uf"),
                "(missing)",
                format!(
                    "a {} filter needs its capacitor in µF, > 0 and ≤ 10000000 (about {} µF keeps the ripple near 10 %)",
                    filter.name(),
                    suggest_uf(dc_volts, dc_amps)
                ),
            ))
        }
        (Some(cap), false) => {
            return Err(c.fail(
                &key("capacitor_uf"),
                fmt_value(cap),
                format!(
                    "a {} filter has no capacitor: remove capacitor_uf or choose filter = \"capacitor\"",
                    filter.name()
                ),
            ))
        }
        (None, false) => 0.0,
    };
    let choke_h = match (rw.choke_h, filter) {
        (Some(h), Filter::Choke) => c.range(&key("choke_h"), h, 0.0, false, 100.0, "H")?,
        (None, Filter::Choke) => {
            return Err(c.fail(
                &key("choke_h"),
                "(missing)",
                "a choke filter needs its inductance in H, > 0 and ≤ 100",
            ))
        }
        (Some(h), _) => {
            return Err(c.fail(
                &key("choke_h"),
                fmt_value(h),
                "choke_h belongs to filter = \"choke\"",
            ))
        }
        (None, _) => 0.0,
    };
    let choke_ohm = match (rw.choke_ohm, filter) {
        (Some(r), Filter::Choke) => c.range(&key("choke_ohm"), r, 0.0, true, 1000.0, "Ω")?,
        (Some(r), _) => {
            return Err(c.fail(
                &key("choke_ohm"),
                fmt_value(r),
                "choke_ohm belongs to filter = \"choke\"",
            ))
        }
        (None, _) => 0.0,
    };
    let battery_ohm = match (rw.battery_ohm, filter) {
        (Some(r), Filter::Battery) => c.range(&key("battery_ohm"), r, 0.0, false, 10.0, "Ω")?,
        (Some(r), _) => {
            return Err(c.fail(
                &key("battery_ohm"),
                fmt_value(r),
                "battery_ohm belongs to filter = \"battery\"",
            ))
        }
        (None, _) => BATTERY_OHM,
    };
    Ok((capacitor_uf, choke_h, choke_ohm, battery_ohm))
}

/// A capacitor that holds the ripple of a full-wave capacitor filter near 10 %: C = I/(2·f·ΔV) at
/// 50 Hz (common practice), rounded to two figures.
fn suggest_uf(dc_volts: f64, dc_amps: f64) -> String {
    let uf = dc_amps / (2.0 * 50.0 * 0.1 * dc_volts) * 1e6;
    let mag = 10f64.powf(uf.log10().floor() - 1.0);
    fmt_value((uf / mag).round() * mag)
}

/// The rectifier's rules on the winding's build: a centre-tap rectifier needs the centre tap, a
/// half-wave one none, and neither takes sections.
pub(super) fn fits_build(
    c: &Checker,
    d: &DcLoad,
    (centre_tap, sections): &(bool, u32),
    key: &dyn Fn(&str) -> String,
) -> Result<()> {
    if d.rectifier == Rectifier::CentreTap && !centre_tap {
        return Err(c.fail(
            &key("centre_tap"),
            "(missing)",
            "a centre-tap rectifier needs centre_tap = true (two halves, the tap to the load's return)",
        ));
    }
    if d.rectifier == Rectifier::HalfWave && *centre_tap {
        return Err(c.fail(
            &key("centre_tap"),
            "true",
            "a half-wave rectifier uses the whole winding: remove centre_tap, or use rectifier = \"centre-tap\" or \"bridge\" (± rails)",
        ));
    }
    if *sections > 1 && !centre_tap {
        return Err(c.fail(
            &key("sections"),
            sections,
            "a rectified output is one winding or two halves (centre_tap = true): remove sections",
        ));
    }
    Ok(())
}

/// An AC output's power factor (0.3–1, lagging; default 1). None on the primary or a rectified
/// output.
pub(super) fn power_factor(
    c: &Checker,
    rw: &RawWinding,
    role: Role,
    rectified: bool,
    key: &dyn Fn(&str) -> String,
) -> Result<f64> {
    match rw.power_factor {
        None => Ok(1.0),
        Some(pf) if role == Role::Primary || rectified => Err(c.fail(
            &key("power_factor"),
            fmt_value(pf),
            "power_factor belongs to an AC output (the primary's follows its loads; a rectifier's comes from its waveform)",
        )),
        Some(pf) => c.range(&key("power_factor"), pf, 0.3, true, 1.0, ""),
    }
}

/// The plan's first guess of the winding's AC volts (RMS, per half) and RMS amps (per half).
pub(super) fn first_guess(d: &DcLoad, centre_tap: bool) -> (f64, f64) {
    let dual = d.dual_rails(centre_tap);
    let diodes = if dual { 1.0 } else { d.rectifier.diodes() };
    let dc = d.dc_volts + diodes * d.diode_drop_v;
    let full_wave = d.rectifier != Rectifier::HalfWave;
    let avg_to_rms = if full_wave {
        PI / (2.0 * SQRT_2)
    } else {
        PI / SQRT_2
    };
    let volts = match d.filter {
        Filter::Capacitor => 1.1 * dc / SQRT_2,
        Filter::Battery => 1.15 * dc / SQRT_2,
        Filter::Choke => 1.05 * dc * avg_to_rms,
        Filter::Resistive => dc * avg_to_rms,
    };
    let form = match d.filter {
        Filter::Capacitor | Filter::Battery => 1.8,
        Filter::Choke => 1.0,
        Filter::Resistive => 1.11,
    } * if full_wave { 1.0 } else { 1.4 };
    let per_half = if d.rectifier == Rectifier::CentreTap {
        1.0 / SQRT_2
    } else {
        1.0
    };
    (volts, form * d.dc_amps * per_half)
}
