//! The `[[winding]]` tables: each checked on its own, in order (names unique), before the rules
//! across tables. Keys (DESIGN.md, v1 and "Windings as they are built"): name, role, volts, amps,
//! turns (fixed), volts_tolerance_pct, centre_tap, sections, bifilar, section (split bobbin),
//! load_duty, on_time_s, the conductor (size, strands, strip_mm, bare_mm, cable_mm2 + cable_od_mm,
//! current_density_a_mm2), taps_volts, and the kept-winding keys (kept, rated_volts,
//! resistance_ohm, build_mm).

use super::{Role, WindingSpec, MAX_CORE_MM};
use crate::error::Result;
use crate::input::{fmt_value, Checker};
use crate::units::LengthInput;
use crate::wire::{find_size, Grade, WireRequest};
use serde::Deserialize;

/// Most turns a winding may have (a fixed count or a computed one).
pub const MAX_TURNS: u32 = 100_000;
/// The least volts a winding may ask for, V (below a millivolt nothing is measured or wound).
pub const MIN_VOLTS: f64 = 0.001;
/// The least full-load current of an output, A.
pub const MIN_AMPS: f64 = 1e-6;

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawWinding {
    name: String,
    role: String,
    pub(super) volts: Option<f64>,
    pub(super) amps: Option<f64>,
    turns: Option<u32>,
    volts_tolerance_pct: Option<f64>,
    pub(super) centre_tap: Option<bool>,
    sections: Option<u32>,
    bifilar: Option<bool>,
    section: Option<u32>,
    load_duty: Option<f64>,
    on_time_s: Option<f64>,
    size: Option<String>,
    strands: Option<u32>,
    strip_mm: Option<Vec<LengthInput>>,
    bare_mm: Option<LengthInput>,
    cable_mm2: Option<f64>,
    cable_od_mm: Option<LengthInput>,
    taps_volts: Option<Vec<f64>>,
    kept: Option<bool>,
    rated_volts: Option<f64>,
    resistance_ohm: Option<f64>,
    build_mm: Option<LengthInput>,
    current_density_a_mm2: Option<f64>,
    pub(super) rectifier: Option<String>,
    pub(super) filter: Option<String>,
    pub(super) dc_volts: Option<f64>,
    pub(super) dc_amps: Option<f64>,
    pub(super) capacitor_uf: Option<f64>,
    pub(super) choke_h: Option<f64>,
    pub(super) choke_ohm: Option<f64>,
    pub(super) battery_ohm: Option<f64>,
    pub(super) diode_drop_v: Option<f64>,
    pub(super) power_factor: Option<f64>,
}

/// Every `[[winding]]`, in order, each checked on its own.
pub(super) fn winding_tables(
    c: &Checker,
    raw: &[RawWinding],
    grade: Grade,
    split: bool,
) -> Result<Vec<WindingSpec>> {
    if raw.is_empty() {
        return Err(c.fail(
            "[[winding]]",
            "(none)",
            "a job needs one primary and at least one secondary winding",
        ));
    }
    if raw.len() > 32 {
        return Err(c.fail(
            "[[winding]]",
            format!("{} windings", raw.len()),
            "at most 32 windings",
        ));
    }
    let mut windings: Vec<WindingSpec> = Vec::new();
    for (i, rw) in raw.iter().enumerate() {
        let w = winding_table(c, i, rw, grade, split, &windings)?;
        windings.push(w);
    }
    Ok(windings)
}

/// A winding's name: 1 to 40 printable characters, unique in the job.
fn name_of(c: &Checker, i: usize, rw: &RawWinding, before: &[WindingSpec]) -> Result<String> {
    let at = format!("[[winding]] #{}", i + 1);
    let name = rw.name.trim().to_string();
    if name.is_empty() || name.chars().count() > 40 || name.chars().any(crate::error::unsafe_char) {
        return Err(c.fail(
            &format!("{at} name"),
            format!("\"{}\"", crate::render::visible(&rw.name)),
            "must be 1 to 40 printable characters (no control, bidirectional or zero-width characters)",
        ));
    }
    if before.iter().any(|w| w.name == name) {
        return Err(c.fail(
            &format!("{at} name"),
            format!("\"{name}\""),
            "winding names must be unique; this one is used twice",
        ));
    }
    Ok(name)
}

/// One `[[winding]]`: name, role, volts and amps, then its build, wire, taps and kept keys.
fn winding_table(
    c: &Checker,
    i: usize,
    rw: &RawWinding,
    grade: Grade,
    split: bool,
    before: &[WindingSpec],
) -> Result<WindingSpec> {
    let name = name_of(c, i, rw, before)?;
    let key = |k: &str| format!("[[winding]] \"{name}\" {k}");
    let role = match c
        .word(&key("role"), &rw.role, &["primary", "secondary"])?
        .as_str()
    {
        "primary" => Role::Primary,
        _ => Role::Secondary,
    };
    let fixed_turns = match rw.turns {
        Some(n) if (1..=MAX_TURNS).contains(&n) => Some(n),
        Some(n) => return Err(c.fail(&key("turns"), n, format!("must be ≥ 1 and ≤ {MAX_TURNS}"))),
        None => None,
    };
    let dc = super::dc::dc_load(c, rw, role, &key)?;
    let power_factor = super::dc::power_factor(c, rw, role, dc.is_some(), &key)?;
    let (volts, amps) = match dc {
        Some(d) => super::dc::first_guess(&d, rw.centre_tap.unwrap_or(false)),
        None => volts_amps(c, rw, role, fixed_turns, &key)?,
    };
    let build = built_as(c, rw, role, split, &key)?;
    if let Some(d) = &dc {
        super::dc::fits_build(c, d, &build_shape(&build), &key)?;
    }
    let wire = wire_request(c, rw, grade, &key)?;
    let density = match rw.current_density_a_mm2 {
        Some(d) => Some(c.range(&key("current_density_a_mm2"), d, 0.1, true, 20.0, "A/mm²")?),
        None => None,
    };
    if dc.is_some() && rw.taps_volts.is_some() {
        return Err(c.fail(
            &key("taps_volts"),
            "(with rectifier)",
            "taps are AC volts; a rectified output has none (plan a second output for another DC voltage)",
        ));
    }
    let taps_volts = taps(c, rw, volts, &key)?;
    let kept = kept_keys(c, rw, &key)?;
    let tolerance = match rw.volts_tolerance_pct {
        Some(t) => c.range(&key("volts_tolerance_pct"), t, 0.0, false, 50.0, "%")?,
        None => 5.0,
    };
    Ok(WindingSpec {
        name,
        role,
        volts,
        volts_given: rw.volts.is_some() || dc.is_some(),
        amps,
        fixed_turns,
        volts_tolerance_pct: tolerance,
        sections: build.sections,
        centre_tap: build.centre_tap,
        bifilar: build.bifilar,
        bobbin_section: build.section,
        load_duty: build.load_duty,
        on_time_s: build.on_time_s,
        wire,
        current_density_a_mm2: density,
        taps_volts,
        kept: kept.kept,
        rated_volts: kept.rated_volts,
        resistance_ohm: kept.resistance_ohm,
        build_mm: kept.build_mm,
        dc,
        power_factor,
    })
}

/// The centre tap and sections of a winding, as the rectifier rules read them.
fn build_shape(b: &Built) -> (bool, u32) {
    (b.centre_tap, b.sections)
}

/// An AC winding's volts and amps.
fn volts_amps(
    c: &Checker,
    rw: &RawWinding,
    role: Role,
    fixed_turns: Option<u32>,
    key: &dyn Fn(&str) -> String,
) -> Result<(f64, f64)> {
    let volts = match (rw.volts, fixed_turns, role) {
        (Some(v), _, _) => c.range(&key("volts"), v, MIN_VOLTS, true, 100_000.0, "V")?,
        (None, Some(_), Role::Secondary) => 0.0,
        (None, _, Role::Primary) => return Err(c.fail(
            &key("volts"),
            "(missing)",
            "the primary needs its volts (RMS for sine, amplitude for square), > 0 and ≤ 100000 V",
        )),
        (None, None, Role::Secondary) => {
            return Err(c.fail(
                &key("volts"),
                "(missing)",
                "an output needs its volts, > 0 and ≤ 100000 V, or fixed turns (turns = N)",
            ))
        }
    };
    let amps = amps_of(c, rw, role, key)?;
    Ok((volts, amps))
}

/// An output's full-load amps (required); none on the primary, whose current is computed.
fn amps_of(c: &Checker, rw: &RawWinding, role: Role, key: &dyn Fn(&str) -> String) -> Result<f64> {
    match (role, rw.amps) {
        (Role::Secondary, None) => Err(c.fail(
            &key("amps"),
            "(missing)",
            "an output winding needs its full-load amps, > 0 and ≤ 10000 A",
        )),
        (Role::Secondary, Some(i)) => c.range(&key("amps"), i, MIN_AMPS, true, 10_000.0, "A"),
        (Role::Primary, Some(i)) => Err(c.fail(
            &key("amps"),
            fmt_value(i),
            "the primary's current is computed from the loads; remove amps from the primary",
        )),
        (Role::Primary, None) => Ok(0.0),
    }
}

/// How a winding is built and loaded: halves or sections, bifilar, its bobbin section, its duty.
struct Built {
    sections: u32,
    centre_tap: bool,
    bifilar: bool,
    section: u32,
    load_duty: f64,
    on_time_s: Option<f64>,
}

fn built_as(
    c: &Checker,
    rw: &RawWinding,
    role: Role,
    split: bool,
    key: &dyn Fn(&str) -> String,
) -> Result<Built> {
    let centre_tap = rw.centre_tap.unwrap_or(false);
    let sections = match (rw.sections, centre_tap) {
        (Some(_), true) => {
            return Err(c.fail(
                &key("sections"),
                "(with centre_tap)",
                "give centre_tap = true (two halves) or sections = N, not both",
            ))
        }
        (Some(n), false) if (2..=4).contains(&n) => n,
        (Some(n), false) => return Err(c.fail(&key("sections"), n, "must be 2, 3 or 4")),
        (None, true) => 2,
        (None, false) => 1,
    };
    let bifilar = rw.bifilar.unwrap_or(false);
    if bifilar && sections == 1 {
        return Err(c.fail(
            &key("bifilar"),
            "true",
            "bifilar winds halves or sections together: add centre_tap = true or sections = N",
        ));
    }
    let section = match (rw.section, split) {
        (Some(s), true) if s == 1 || s == 2 => s,
        (Some(s), true) => {
            return Err(c.fail(
                &key("section"),
                s,
                "must be 1 or 2 (the bobbin's two sections)",
            ))
        }
        (Some(s), false) => {
            return Err(c.fail(
                &key("section"),
                s,
                "a section number needs a split bobbin: add [core] bobbin = \"split\"",
            ))
        }
        (None, _) => 1,
    };
    let load_duty = match (rw.load_duty, role) {
        (Some(d), Role::Primary) => {
            return Err(c.fail(
                &key("load_duty"),
                fmt_value(d),
                "load duty belongs on an output (the primary follows its loads)",
            ))
        }
        (Some(d), Role::Secondary) => c.range(&key("load_duty"), d, 0.0, false, 1.0, "")?,
        (None, _) => 1.0,
    };
    let on_time_s = match rw.on_time_s {
        Some(t) => Some(c.range(&key("on_time_s"), t, 0.0, false, 3600.0, "s")?),
        None => None,
    };
    Ok(Built {
        sections,
        centre_tap,
        bifilar,
        section,
        load_duty,
        on_time_s,
    })
}

/// A winding's conductor: `size`, `strands`, `strip_mm`, `bare_mm` or `cable_mm2` with
/// `cable_od_mm` (one kind at most).
fn wire_request(
    c: &Checker,
    rw: &RawWinding,
    grade: Grade,
    key: &dyn Fn(&str) -> String,
) -> Result<WireRequest> {
    let given: Vec<&str> = [
        ("size", rw.size.is_some()),
        ("strip_mm", rw.strip_mm.is_some()),
        ("bare_mm", rw.bare_mm.is_some()),
        ("cable_mm2", rw.cable_mm2.is_some()),
    ]
    .iter()
    .filter(|(_, g)| *g)
    .map(|(k, _)| *k)
    .collect();
    if given.len() > 1 {
        return Err(c.fail(
            &key(given[1]),
            format!("(with {})", given[0]),
            "give one conductor: size, strip_mm, bare_mm or cable_mm2 with cable_od_mm",
        ));
    }
    let mut wire = WireRequest::default();
    if let Some(sz) = &rw.size {
        wire.size =
            Some(find_size(sz, grade).map_err(|m| c.fail(&key("size"), format!("\"{sz}\""), m))?);
    }
    if let Some(n) = rw.strands {
        if !(1..=200).contains(&n) {
            return Err(c.fail(&key("strands"), n, "must be ≥ 1 and ≤ 200"));
        }
        wire.strands = Some(n);
    }
    if let Some(strip) = &rw.strip_mm {
        wire.strip_mm = Some(strip_of(c, strip, key)?);
    }
    if let Some(d) = &rw.bare_mm {
        let d = c.length(&key("bare_mm"), d, 6.0)?;
        if d < 0.05 {
            return Err(c.fail(
                &key("bare_mm"),
                fmt_value(d),
                "must be ≥ 0.05 mm and ≤ 6 mm",
            ));
        }
        wire.bare_mm = Some(d);
    }
    wire.cable = cable_of(c, rw, key)?;
    Ok(wire)
}

/// `strip_mm = [width, thickness]`.
fn strip_of(
    c: &Checker,
    strip: &[LengthInput],
    key: &dyn Fn(&str) -> String,
) -> Result<(f64, f64)> {
    if strip.len() != 2 {
        return Err(c.fail(
            &key("strip_mm"),
            format!("{} values", strip.len()),
            "must be [width, thickness] in mm",
        ));
    }
    let sw = c.length(&key("strip_mm[0] (width)"), &strip[0], 500.0)?;
    let st = c.length(&key("strip_mm[1] (thickness)"), &strip[1], 20.0)?;
    if st > sw {
        return Err(c.fail(
            &key("strip_mm"),
            format!("[{sw}, {st}]"),
            "must be [width, thickness] with width ≥ thickness",
        ));
    }
    if st < 0.05 {
        return Err(c.fail(&key("strip_mm[1] (thickness)"), st, "must be ≥ 0.05 mm"));
    }
    Ok((sw, st))
}

/// `cable_mm2` with `cable_od_mm`: the copper cross-section and the diameter over the insulation.
fn cable_of(
    c: &Checker,
    rw: &RawWinding,
    key: &dyn Fn(&str) -> String,
) -> Result<Option<(f64, f64)>> {
    match (rw.cable_mm2, &rw.cable_od_mm) {
        (None, None) => Ok(None),
        (None, Some(_)) => Err(c.fail(
            &key("cable_mm2"),
            "(missing)",
            "cable_od_mm describes a cable: give its copper cross-section, cable_mm2",
        )),
        (Some(a), None) => Err(c.fail(
            &key("cable_od_mm"),
            "(missing)",
            format!(
                "a cable of {} mm² needs its outer diameter over the insulation, cable_od_mm",
                fmt_value(a)
            ),
        )),
        (Some(a), Some(od)) => {
            let a = c.range(&key("cable_mm2"), a, 0.0, false, 1000.0, "mm²")?;
            let od = c.length(&key("cable_od_mm"), od, 100.0)?;
            let copper_d = (4.0 * a / std::f64::consts::PI).sqrt();
            if od <= copper_d {
                return Err(c.fail(
                    &key("cable_od_mm"),
                    fmt_value(od),
                    format!(
                        "must be more than the {copper_d:.2} mm of a solid round conductor of {} mm²",
                        fmt_value(a)
                    ),
                ));
            }
            Ok(Some((a, od)))
        }
    }
}

/// `taps_volts`: each above 0 V and below the winding's volts; sorted, unique.
fn taps(
    c: &Checker,
    rw: &RawWinding,
    volts: f64,
    key: &dyn Fn(&str) -> String,
) -> Result<Vec<f64>> {
    let mut taps = rw.taps_volts.clone().unwrap_or_default();
    if !taps.is_empty() && volts <= 0.0 {
        return Err(c.fail(
            &key("taps_volts"),
            "(without volts)",
            "taps need the winding's volts to be given",
        ));
    }
    for t in &taps {
        if !(t.is_finite() && *t > 0.0 && *t < volts) {
            return Err(c.fail(
                &key("taps_volts"),
                fmt_value(*t),
                format!("each tap must be > 0 V and below the winding's {volts} V"),
            ));
        }
    }
    taps.sort_by(f64::total_cmp);
    taps.dedup();
    Ok(taps)
}

/// The kept-winding keys.
struct Kept {
    kept: bool,
    rated_volts: Option<f64>,
    resistance_ohm: Option<f64>,
    build_mm: Option<f64>,
}

fn kept_keys(c: &Checker, rw: &RawWinding, key: &dyn Fn(&str) -> String) -> Result<Kept> {
    let kept = rw.kept.unwrap_or(false);
    let rated = match rw.rated_volts {
        Some(v) => Some(c.range(&key("rated_volts"), v, 0.0, false, 100_000.0, "V")?),
        None => None,
    };
    let res = match rw.resistance_ohm {
        Some(r) => Some(c.range(&key("resistance_ohm"), r, 0.0, false, 100_000.0, "Ω")?),
        None => None,
    };
    let build = match &rw.build_mm {
        Some(b) => Some(c.length(&key("build_mm"), b, MAX_CORE_MM)?),
        None => None,
    };
    if !kept && (rated.is_some() || res.is_some() || build.is_some()) {
        return Err(c.fail(
            &key("kept"),
            "false",
            "rated_volts, resistance_ohm and build_mm describe a kept donor winding: add kept = true",
        ));
    }
    Ok(Kept {
        kept,
        rated_volts: rated,
        resistance_ohm: res,
        build_mm: build,
    })
}
