//! The TOML job file, read and checked into a [`Job`] before any physics runs.
//!
//! Parse, then check: serde reads the text into raw tables that refuse unknown keys (the message
//! lists the accepted ones), then every value is checked against its accepted range. Every error
//! names the file, the line or key, the value and what is accepted.

use crate::error::{Error, Result};
use crate::geometry::{default_leg_yoke, CoreDims, Shape};
use crate::input::{fmt_value, toml_error, Checker};
use crate::layout::LayoutSettings;
use crate::magnetics::{steel_info, SteelInfo, Waveform, MAX_FLUX_T};
#[cfg(test)]
use crate::probe::SweepPoint;
use crate::probe::{ProbeInput, SweepLoader};
use crate::units::LengthInput;
use crate::wire::{Grade, System, WireRequest, CMIL_PER_A_AT_1_A_MM2};
use serde::Deserialize;

mod dc;
pub mod starter;
mod winding;

/// Largest job file read, bytes (a job is a few hundred bytes; this refuses a wrong file early).
pub const MAX_JOB_BYTES: usize = 1 << 20;

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawJob {
    name: Option<String>,
    core: RawCore,
    supply: RawSupply,
    limits: Option<RawLimits>,
    wire: Option<RawWire>,
    insulation: Option<RawInsulation>,
    probe: Option<RawProbe>,
    winding: Vec<winding::RawWinding>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawCore {
    shape: Option<String>,
    tongue_mm: LengthInput,
    stack_mm: LengthInput,
    window_width_mm: LengthInput,
    window_height_mm: LengthInput,
    stacking_factor: Option<f64>,
    steel: Option<String>,
    bobbin_wall_mm: Option<LengthInput>,
    bobbin: Option<String>,
    divider_mm: Option<LengthInput>,
    split_at: Option<f64>,
    outer_leg_mm: Option<LengthInput>,
    yoke_mm: Option<LengthInput>,
    mass_g: Option<f64>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawSupply {
    frequency_hz: f64,
    waveform: Option<String>,
    duty: Option<f64>,
}

#[derive(Debug, Default, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawLimits {
    flux_density_t: Option<f64>,
    current_density_a_mm2: Option<f64>,
    current_density_cmil_per_a: Option<f64>,
    ambient_c: Option<f64>,
    max_rise_c: Option<f64>,
    insulation_class: Option<String>,
}

#[derive(Debug, Default, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawWire {
    system: Option<String>,
    max_strand_mm: Option<LengthInput>,
    pitch: Option<f64>,
    grade: Option<u8>,
    lead_m: Option<f64>,
}

#[derive(Debug, Default, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawInsulation {
    interlayer_mm: Option<LengthInput>,
    between_windings_mm: Option<LengthInput>,
    outer_mm: Option<LengthInput>,
    clearance_mm: Option<LengthInput>,
    margin_mm: Option<LengthInput>,
}

#[derive(Debug, Default, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawProbe {
    test_turns: Option<u32>,
    test_volts: Option<f64>,
    applied_volts: Option<f64>,
    applied_to: Option<String>,
    sweep: Option<String>,
    sweep_turns: Option<u32>,
    sweep_winding: Option<String>,
}

/// The role of a winding.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Role {
    /// The driven winding.
    Primary,
    /// An output.
    Secondary,
}

impl Role {
    /// The name used in job files.
    pub fn name(self) -> &'static str {
        match self {
            Role::Primary => "primary",
            Role::Secondary => "secondary",
        }
    }
}

/// An insulation thermal class (IEC 60085): the hottest the copper may run.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum InsulationClass {
    /// 105 °C.
    A,
    /// 120 °C.
    E,
    /// 130 °C.
    B,
    /// 155 °C.
    F,
    /// 180 °C.
    H,
}

impl InsulationClass {
    /// The class of a letter (any case).
    pub fn from_letter(s: &str) -> Option<InsulationClass> {
        match s.trim().to_ascii_uppercase().as_str() {
            "A" => Some(InsulationClass::A),
            "E" => Some(InsulationClass::E),
            "B" => Some(InsulationClass::B),
            "F" => Some(InsulationClass::F),
            "H" => Some(InsulationClass::H),
            _ => None,
        }
    }

    /// Its letter.
    pub fn letter(self) -> &'static str {
        match self {
            InsulationClass::A => "A",
            InsulationClass::E => "E",
            InsulationClass::B => "B",
            InsulationClass::F => "F",
            InsulationClass::H => "H",
        }
    }

    /// Its temperature, °C (IEC 60085: A 105, E 120, B 130, F 155, H 180).
    pub fn limit_c(self) -> f64 {
        match self {
            InsulationClass::A => 105.0,
            InsulationClass::E => 120.0,
            InsulationClass::B => 130.0,
            InsulationClass::F => 155.0,
            InsulationClass::H => 180.0,
        }
    }
}

/// A checked winding.
#[derive(Debug, Clone, PartialEq)]
pub struct WindingSpec {
    /// Its name, unique in the job.
    pub name: String,
    /// Primary or secondary.
    pub role: Role,
    /// Volts: RMS, or the amplitude for a primary under a square or quasi-square drive; per half
    /// of a centre-tapped winding and per section of a sectioned one (0 when not given: fixed
    /// turns without a target).
    pub volts: f64,
    /// Whether `volts` was given (a fixed-turns output may leave it out).
    pub volts_given: bool,
    /// Full-load current for an output, A (per half or section; 0 for the primary: it is computed).
    pub amps: f64,
    /// Fixed turns (per half or section), when the job gives them.
    pub fixed_turns: Option<u32>,
    /// How far a fixed-turns output may be from its volts, either way, %.
    pub volts_tolerance_pct: f64,
    /// Halves or sections: 2 for a centre tap, N for `sections`, 1 otherwise.
    pub sections: u32,
    /// Two halves in series with the middle brought out.
    pub centre_tap: bool,
    /// Halves or sections wound together, strands in hand.
    pub bifilar: bool,
    /// Which section of a split bobbin the winding sits in (1 on a single bobbin).
    pub bobbin_section: u32,
    /// Fraction of the time the load is on (outputs; 1 for continuous).
    pub load_duty: f64,
    /// How long the load is on at a time, s (for the copper's adiabatic rise).
    pub on_time_s: Option<f64>,
    /// What the job asks of the conductor.
    pub wire: WireRequest,
    /// This winding's own current density for the wire choice, A/mm² (`rate` sets it per winding;
    /// None: the job's `[limits] current_density_a_mm2`).
    pub current_density_a_mm2: Option<f64>,
    /// Tap voltages of an output, V RMS, ascending.
    pub taps_volts: Vec<f64>,
    /// Whether this is the donor's own winding, left on the core.
    pub kept: bool,
    /// Rated volts of a kept winding.
    pub rated_volts: Option<f64>,
    /// Measured resistance of a kept winding at 20 °C, Ω.
    pub resistance_ohm: Option<f64>,
    /// Measured build of a kept winding, mm.
    pub build_mm: Option<f64>,
    /// A rectified output's DC load (then `volts` and `amps` are the plan's first guesses).
    pub dc: Option<DcLoad>,
    /// Power factor of an AC output's load (lagging; 1 for a resistive load).
    pub power_factor: f64,
}

/// A rectified output (DESIGN.md, "Loads as they are drawn").
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct DcLoad {
    /// Bridge, centre tap or half-wave (a bridge on a centre-tapped winding gives ± rails).
    pub rectifier: crate::rectifier::Rectifier,
    /// Capacitor, choke, battery or resistive.
    pub filter: crate::rectifier::Filter,
    /// Mean DC volts at full load, V (battery: its EMF); each rail's for ± rails.
    pub dc_volts: f64,
    /// Mean DC current at full load, A (battery: the mean charge current wanted); each rail's.
    pub dc_amps: f64,
    /// Filter capacitor, µF.
    pub capacitor_uf: f64,
    /// Choke, H.
    pub choke_h: f64,
    /// The choke's resistance, Ω.
    pub choke_ohm: f64,
    /// A battery's internal resistance, Ω.
    pub battery_ohm: f64,
    /// Drop of one diode, V.
    pub diode_drop_v: f64,
}

impl DcLoad {
    /// Whether this is a bridge on a centre-tapped winding: two rails, ± dc_volts.
    pub fn dual_rails(&self, centre_tap: bool) -> bool {
        centre_tap && self.rectifier == crate::rectifier::Rectifier::Bridge
    }
}

/// A checked job.
#[derive(Debug, Clone, PartialEq)]
pub struct Job {
    /// The job's name.
    pub name: String,
    /// The core's measurements.
    pub core: CoreDims,
    /// The core's lengths as typed, for the shelf: tongue, stack, window width, height.
    pub core_text: [String; 4],
    /// The steel.
    pub steel: SteelInfo,
    /// Supply frequency, Hz.
    pub frequency_hz: f64,
    /// Drive waveform of the primary.
    pub waveform: Waveform,
    /// The flux density asked for, T (None: from the steel and probe).
    pub flux_density_t: Option<f64>,
    /// Current density, A/mm².
    pub current_density_a_mm2: f64,
    /// Ambient temperature, °C.
    pub ambient_c: f64,
    /// Allowed temperature rise, °C.
    pub max_rise_c: f64,
    /// The insulation's thermal class (IEC 60085).
    pub insulation_class: InsulationClass,
    /// Wire system for automatic choices.
    pub system: System,
    /// Enamel grade.
    pub grade: Grade,
    /// Thickest single strand before going to parallel strands, mm.
    pub max_strand_mm: f64,
    /// Layout and insulation.
    pub layout: LayoutSettings,
    /// Lead length at each end of a winding, m.
    pub lead_m: f64,
    /// Windings, innermost first.
    pub windings: Vec<WindingSpec>,
    /// Probe measurements.
    pub probe: Option<ProbeInput>,
    /// Fraction of the time the load is on (1 continuous; `rate --duty` for welders and motor starts):
    /// heating is rated on the time-averaged copper loss.
    pub load_duty: f64,
    /// How many times the heat a surface sheds by natural convection (1; 2 for forced air, common
    /// practice).
    pub cooling_factor: f64,
    /// What reading the file raised without refusing it (a core length that looks like inches).
    pub input_warnings: Vec<crate::verdict::Warning>,
}

impl Job {
    /// Index of the primary winding (there is always exactly one after checking).
    pub fn primary_index(&self) -> usize {
        self.windings
            .iter()
            .position(|w| w.role == Role::Primary)
            .unwrap_or(0)
    }
}

/// Most turns in one winding a plan may ask a person to wind.
pub const MAX_WINDING_TURNS: u32 = winding::MAX_TURNS;

/// Largest core dimension accepted, mm.
pub const MAX_CORE_MM: f64 = 1000.0;

/// Reads and checks a job. `load_sweep` reads a sweep file named in `[probe] sweep` (relative to the
/// job file) and returns its name for messages and its points.
pub fn parse_job(text: &str, origin: &str, load_sweep: SweepLoader) -> Result<Job> {
    if text.len() > MAX_JOB_BYTES {
        return Err(Error::bad_input(
            origin,
            format!(
                "{} bytes: a job file must be at most {} bytes",
                text.len(),
                MAX_JOB_BYTES
            ),
        ));
    }
    if text.trim().is_empty() {
        return Err(Error::bad_input(
            origin,
            "the file is empty; a job needs [core], [supply] and [[winding]] tables",
        ));
    }
    let raw: RawJob = toml::from_str(text).map_err(|e| toml_error(origin, text, &e))?;
    let c = Checker::new(origin);
    let (core, steel, mut layout) = core_table(&c, &raw.core)?;
    let (frequency_hz, waveform) = supply_table(&c, &raw.supply)?;
    let limits = limits_table(&c, raw.limits.unwrap_or_default())?;
    let wire = wire_table(&c, raw.wire.unwrap_or_default(), &mut layout)?;
    insulation_table(&c, raw.insulation.unwrap_or_default(), &mut layout)?;
    let windings = winding::winding_tables(&c, &raw.winding, wire.grade, layout.split.is_some())?;
    let names: Vec<&str> = windings.iter().map(|w| w.name.as_str()).collect();
    let probe = match raw.probe {
        None => None,
        Some(rp) => Some(crate::probe::check_probe_table(
            &c,
            rp.into_input(),
            &names,
            load_sweep,
        )?),
    };
    cross_table_rules(&c, &windings, probe.as_ref())?;
    Ok(Job {
        name: raw
            .name
            .map(|n| crate::error::one_line(n.trim()))
            .unwrap_or_else(|| "untitled job".to_string()),
        core,
        core_text: [
            raw.core.tongue_mm.text.clone(),
            raw.core.stack_mm.text.clone(),
            raw.core.window_width_mm.text.clone(),
            raw.core.window_height_mm.text.clone(),
        ],
        steel,
        frequency_hz,
        waveform,
        flux_density_t: limits.flux_density_t,
        current_density_a_mm2: limits.current_density_a_mm2,
        ambient_c: limits.ambient_c,
        max_rise_c: limits.max_rise_c,
        insulation_class: limits.insulation_class,
        system: wire.system,
        grade: wire.grade,
        max_strand_mm: wire.max_strand_mm,
        layout,
        lead_m: wire.lead_m,
        windings,
        probe,
        load_duty: 1.0,
        cooling_factor: 1.0,
        input_warnings: tiny_lengths(&raw.core),
    })
}

/// Core lengths under 5 given as bare numbers: a tongue of 1.5 mm is a 1.5-inch tongue typed
/// without its unit far more often than a real one.
fn tiny_lengths(rc: &RawCore) -> Vec<crate::verdict::Warning> {
    [
        ("[core] tongue_mm", &rc.tongue_mm),
        ("[core] stack_mm", &rc.stack_mm),
        ("[core] window_width_mm", &rc.window_width_mm),
        ("[core] window_height_mm", &rc.window_height_mm),
    ]
    .iter()
    .filter(|(_, l)| l.mm < 5.0 && l.text.parse::<f64>().is_ok())
    .map(|(k, l)| crate::verdict::Warning::TinyLength {
        key: k.to_string(),
        value_mm: l.mm,
    })
    .collect()
}

/// `[core]`: the measured core, its steel and the bobbin wall.
fn core_table(c: &Checker, rc: &RawCore) -> Result<(CoreDims, SteelInfo, LayoutSettings)> {
    let shape = match rc.shape.as_deref() {
        None => Shape::Ei,
        Some(s) => match c.word("[core] shape", s, &["ei", "ui"])?.as_str() {
            "ui" => Shape::Ui,
            _ => Shape::Ei,
        },
    };
    let a = c.length("[core] tongue_mm", &rc.tongue_mm, MAX_CORE_MM)?;
    let s = c.length("[core] stack_mm", &rc.stack_mm, MAX_CORE_MM)?;
    let w = c.length("[core] window_width_mm", &rc.window_width_mm, MAX_CORE_MM)?;
    let h = c.length("[core] window_height_mm", &rc.window_height_mm, MAX_CORE_MM)?;
    let k = match rc.stacking_factor {
        Some(k) => c.range("[core] stacking_factor", k, 0.5, false, 1.0, "")?,
        None => crate::geometry::DEFAULT_STACKING,
    };
    let steel = match &rc.steel {
        None => steel_info("unknown").map_err(|m| c.fail("[core] steel", "unknown", m))?,
        Some(name) => {
            steel_info(name).map_err(|m| c.fail("[core] steel", format!("\"{name}\""), m))?
        }
    };
    let (dc, dy) = default_leg_yoke(shape, a);
    let outer = match &rc.outer_leg_mm {
        Some(v) => c.length("[core] outer_leg_mm", v, MAX_CORE_MM)?,
        None => dc,
    };
    let yoke = match &rc.yoke_mm {
        Some(v) => c.length("[core] yoke_mm", v, MAX_CORE_MM)?,
        None => dy,
    };
    let mass = match rc.mass_g {
        Some(m) => Some(c.range("[core] mass_g", m, 0.0, false, 1.0e6, "g")? / 1000.0),
        None => None,
    };
    let mut layout = LayoutSettings::default();
    if let Some(v) = &rc.bobbin_wall_mm {
        layout.bobbin_wall_mm = c.length0("[core] bobbin_wall_mm", v, 20.0)?;
    }
    layout.split = split_bobbin(c, rc)?;
    let core = CoreDims {
        shape,
        tongue_mm: a,
        stack_mm: s,
        window_width_mm: w,
        window_height_mm: h,
        stacking_factor: k,
        outer_leg_mm: outer,
        yoke_mm: yoke,
        measured_mass_kg: mass,
    };
    Ok((core, steel, layout))
}

/// `[core] bobbin`, `divider_mm`, `split_at`: a split bobbin's two sections side by side.
fn split_bobbin(c: &Checker, rc: &RawCore) -> Result<Option<crate::layout::Split>> {
    let split = match rc.bobbin.as_deref() {
        Some(b) => c.word("[core] bobbin", b, &["single", "split"])? == "split",
        None => false,
    };
    if !split {
        if rc.divider_mm.is_some() || rc.split_at.is_some() {
            let k = if rc.divider_mm.is_some() {
                "[core] divider_mm"
            } else {
                "[core] split_at"
            };
            return Err(c.fail(
                k,
                "(on a single bobbin)",
                "divider_mm and split_at describe a split bobbin: add [core] bobbin = \"split\"",
            ));
        }
        return Ok(None);
    }
    let divider = match &rc.divider_mm {
        Some(v) => c.length0("[core] divider_mm", v, 20.0)?,
        None => 1.5,
    };
    let at = match rc.split_at {
        Some(f) if f.is_finite() && f > 0.0 && f < 1.0 => f,
        Some(f) => {
            return Err(c.fail(
                "[core] split_at",
                fmt_value(f),
                "must be > 0 and < 1 (the fraction of the traverse for section 1)",
            ))
        }
        None => 0.5,
    };
    Ok(Some(crate::layout::Split {
        divider_mm: divider,
        split_at: at,
    }))
}

/// `[supply]`: frequency and waveform.
fn supply_table(c: &Checker, rs: &RawSupply) -> Result<(f64, Waveform)> {
    let f = c.range(
        "[supply] frequency_hz",
        rs.frequency_hz,
        1.0,
        true,
        2000.0,
        "Hz",
    )?;
    let waveform_name = match &rs.waveform {
        Some(wf) => c.word("[supply] waveform", wf, &["sine", "square", "quasi-square"])?,
        None => "sine".to_string(),
    };
    let waveform = match waveform_name.as_str() {
        "square" => Waveform::Square,
        "quasi-square" => {
            let d = rs.duty.ok_or_else(|| {
                c.fail("[supply] duty", "(missing)", "a quasi-square drive needs duty, the conduction fraction of each half cycle, > 0 and ≤ 1")
            })?;
            Waveform::QuasiSquare {
                duty: c.range("[supply] duty", d, 0.0, false, 1.0, "")?,
            }
        }
        _ => Waveform::Sine,
    };
    if let (Some(d), false) = (rs.duty, matches!(waveform, Waveform::QuasiSquare { .. })) {
        if d != 1.0 {
            return Err(c.fail(
                "[supply] duty",
                fmt_value(d),
                "duty applies only to waveform = \"quasi-square\"; remove it or set the waveform",
            ));
        }
    }
    Ok((f, waveform))
}

/// The checked `[limits]` table.
struct Limits {
    flux_density_t: Option<f64>,
    current_density_a_mm2: f64,
    ambient_c: f64,
    max_rise_c: f64,
    insulation_class: InsulationClass,
}

/// `[limits]`: flux, current density (A/mm² or cmil/A), ambient and rise.
fn limits_table(c: &Checker, lim: RawLimits) -> Result<Limits> {
    let flux = match lim.flux_density_t {
        Some(b) => Some(c.range("[limits] flux_density_t", b, 0.0, false, MAX_FLUX_T, "T")?),
        None => None,
    };
    let j = match (lim.current_density_a_mm2, lim.current_density_cmil_per_a) {
        (Some(_), Some(_)) => return Err(c.fail(
            "[limits] current_density_cmil_per_a",
            "(given with current_density_a_mm2)",
            "give the current density one way: current_density_a_mm2 or current_density_cmil_per_a",
        )),
        (Some(j), None) => c.range(
            "[limits] current_density_a_mm2",
            j,
            0.2,
            true,
            20.0,
            "A/mm²",
        )?,
        (None, Some(cm)) => {
            let cm = c.range(
                "[limits] current_density_cmil_per_a",
                cm,
                100.0,
                true,
                10_000.0,
                "cmil/A",
            )?;
            CMIL_PER_A_AT_1_A_MM2 / cm
        }
        (None, None) => 3.0,
    };
    let ambient = match lim.ambient_c {
        Some(t) => c.range("[limits] ambient_c", t, -40.0, true, 80.0, "°C")?,
        None => 30.0,
    };
    let rise = match lim.max_rise_c {
        Some(t) => c.range("[limits] max_rise_c", t, 0.0, false, 150.0, "°C")?,
        None => 50.0,
    };
    let class = match &lim.insulation_class {
        Some(k) => {
            let w = c.word("[limits] insulation_class", k, &["a", "e", "b", "f", "h"])?;
            InsulationClass::from_letter(&w).unwrap_or(InsulationClass::B)
        }
        None => InsulationClass::B,
    };
    Ok(Limits {
        flux_density_t: flux,
        current_density_a_mm2: j,
        ambient_c: ambient,
        max_rise_c: rise,
        insulation_class: class,
    })
}

/// The checked `[wire]` table (the pitch goes into the layout settings).
struct WireTable {
    system: System,
    grade: Grade,
    max_strand_mm: f64,
    lead_m: f64,
}

/// `[wire]`: system, grade, thickest strand, pitch and lead length.
fn wire_table(c: &Checker, rw: RawWire, layout: &mut LayoutSettings) -> Result<WireTable> {
    let system = match &rw.system {
        Some(sys) => match c
            .word("[wire] system", sys, &["metric", "awg", "swg"])?
            .as_str()
        {
            "awg" => System::Awg,
            "swg" => System::Swg,
            _ => System::Metric,
        },
        None => System::Metric,
    };
    let grade = match rw.grade {
        None | Some(2) => Grade::Two,
        Some(1) => Grade::One,
        Some(g) => {
            return Err(c.fail(
                "[wire] grade",
                g,
                "must be 1 (grade 1 / AWG single build) or 2 (grade 2 / AWG heavy build)",
            ))
        }
    };
    let max_strand = match &rw.max_strand_mm {
        Some(v) => c.length("[wire] max_strand_mm", v, 4.0)?,
        None => 2.0,
    };
    if max_strand < 0.1 {
        return Err(c.fail(
            "[wire] max_strand_mm",
            fmt_value(max_strand),
            "must be ≥ 0.1 mm and ≤ 4 mm",
        ));
    }
    if let Some(p) = rw.pitch {
        layout.pitch = c.range("[wire] pitch", p, 1.0, true, 2.0, "")?;
    }
    let lead_m = match rw.lead_m {
        Some(l) => c.range("[wire] lead_m", l, 0.0, true, 10.0, "m")?,
        None => 0.15,
    };
    Ok(WireTable {
        system,
        grade,
        max_strand_mm: max_strand,
        lead_m,
    })
}

/// `[insulation]`: interlayer, between windings, outer wrap, clearance and margin.
fn insulation_table(c: &Checker, ri: RawInsulation, layout: &mut LayoutSettings) -> Result<()> {
    if let Some(v) = &ri.interlayer_mm {
        layout.interlayer_mm = c.length0("[insulation] interlayer_mm", v, 5.0)?;
    }
    if let Some(v) = &ri.between_windings_mm {
        layout.between_windings_mm = c.length0("[insulation] between_windings_mm", v, 10.0)?;
    }
    if let Some(v) = &ri.outer_mm {
        layout.outer_mm = c.length0("[insulation] outer_mm", v, 10.0)?;
    }
    if let Some(v) = &ri.clearance_mm {
        layout.clearance_mm = c.length0("[insulation] clearance_mm", v, 50.0)?;
    }
    if let Some(v) = &ri.margin_mm {
        layout.margin_mm = c.length0("[insulation] margin_mm", v, 50.0)?;
    }
    Ok(())
}

/// Rules across tables: one primary, at least one output, at most one kept winding, and a kept
/// winding's test winding.
fn cross_table_rules(
    c: &Checker,
    windings: &[WindingSpec],
    probe: Option<&ProbeInput>,
) -> Result<()> {
    let primaries = windings.iter().filter(|w| w.role == Role::Primary).count();
    if primaries != 1 {
        return Err(c.fail(
            "[[winding]] role",
            format!("{primaries} primaries"),
            "exactly one winding must have role = \"primary\" (a dual primary, 2 × 115 V, is one winding with sections = 2)",
        ));
    }
    if windings.len() < 2 {
        return Err(c.fail(
            "[[winding]]",
            "only a primary",
            "a job needs at least one secondary winding",
        ));
    }
    let kept_count = windings.iter().filter(|w| w.kept).count();
    if kept_count > 1 {
        return Err(c.fail(
            "[[winding]] kept",
            format!("{kept_count} kept windings"),
            "at most one donor winding can be kept",
        ));
    }
    if kept_count == 1 && probe.and_then(|p| p.test.as_ref()).is_none() {
        return Err(c.fail(
            "[probe] test_turns",
            "(missing)",
            "a kept winding needs a test winding in [probe] (test_turns, test_volts, applied_volts) to count its turns",
        ));
    }
    Ok(())
}

impl RawProbe {
    fn into_input(self) -> crate::probe::RawProbeInput {
        crate::probe::RawProbeInput {
            test_turns: self.test_turns,
            test_volts: self.test_volts,
            applied_volts: self.applied_volts,
            applied_to: self.applied_to,
            sweep: self.sweep,
            sweep_turns: self.sweep_turns,
            sweep_winding: self.sweep_winding,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn no_sweep(_: &str) -> Result<(String, Vec<SweepPoint>)> {
        Err(Error::Failed("no sweep here".into()))
    }

    const GOOD: &str = r#"
[core]
tongue_mm = 32.0
stack_mm = "1.5 in"
window_width_mm = 16
window_height_mm = 48.0
[supply]
frequency_hz = 50
[[winding]]
name = "mains"
role = "primary"
volts = 230
[[winding]]
name = "out"
role = "secondary"
volts = 28
amps = 6
"#;

    #[test]
    fn good_job_reads_with_defaults() {
        let j = parse_job(GOOD, "job.toml", &no_sweep).expect("good");
        approx::assert_relative_eq!(j.core.stack_mm, 38.1, max_relative = 1e-12); // 1.5 in × 25.4 mm/in
        assert_eq!(j.current_density_a_mm2, 3.0);
        assert_eq!(j.windings.len(), 2);
        assert_eq!(j.core_text[1], "1.5 in");
    }

    /// `text` with `from` replaced; fails when `from` is missing, so no case tests the good job.
    #[track_caller]
    fn edited(text: &str, from: &str, to: &str) -> String {
        assert!(text.contains(from), "`{from}` is not in the job");
        text.replace(from, to)
    }

    #[track_caller]
    fn bad(text: &str, needle: &str) {
        let e = parse_job(text, "job.toml", &no_sweep).expect_err("must fail");
        let msg = e.to_string();
        assert_eq!(e.exit_code(), 2, "{msg}");
        assert!(msg.contains(needle), "`{msg}` should name `{needle}`");
        assert!(msg.starts_with("job.toml: "), "{msg}");
        assert!(!msg.contains('\n'), "{msg}");
    }

    #[test]
    fn bad_inputs_name_the_key() {
        bad(
            &edited(GOOD, "tongue_mm = 32.0", "tongue_mm = -3"),
            "tongue_mm",
        );
        bad(
            &edited(GOOD, "tongue_mm = 32.0", "tongu_mm = 32"),
            "tongu_mm",
        );
        bad(&edited(GOOD, "tongue_mm = 32.0", ""), "tongue_mm");
        bad(
            &edited(GOOD, "frequency_hz = 50", "frequency_hz = 5000"),
            "frequency_hz",
        );
        bad(
            &edited(GOOD, "[supply]", "[supply]\nwaveform = \"triangle\""),
            "waveform",
        );
        bad(
            &edited(GOOD, "role = \"secondary\"", "role = \"primary\""),
            "primary",
        );
        bad(
            &edited(GOOD, "stack_mm = \"1.5 in\"", "stack_mm = \"12 furlongs\""),
            "stack_mm",
        );
        bad(
            &edited(GOOD, "[supply]", "[limits]\nflux_density_t = 5.0\n[supply]"),
            "flux_density_t",
        );
        bad(&edited(GOOD, "[supply]", "[core.extra]\n[supply]"), "extra");
        bad(
            &edited(GOOD, "name = \"out\"", "name = \"mains\""),
            "unique",
        );
        bad(&edited(GOOD, "amps = 6", ""), "amps");
        bad("[core", "line 1");
        bad("", "empty");
    }
}
