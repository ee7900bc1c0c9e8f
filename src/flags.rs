//! Values typed on the command line, checked into domain types: a core from `--tongue`, `--stack`
//! and `--window`, and the quick job `rate` builds from its flags. Every error names the flag, the
//! value as typed and what is accepted, never an internal key.

use crate::error::{Error, Result};
use crate::geometry::{default_leg_yoke, CoreDims, Shape};
use crate::input::Checker;
use crate::job::{Job, Role, WindingSpec, MAX_CORE_MM};
use crate::layout::LayoutSettings;
use crate::magnetics::{steel_info, Waveform, MAX_FLUX_T};
use crate::wire::{Grade, System, WireRequest};

/// Where flag errors say they come from.
pub const ORIGIN: &str = "command line";

/// Checks a flag's number: finite, above `lo` (or at it when `lo_inclusive`) and at most `hi`.
pub fn flag_in(
    flag: &str,
    v: f64,
    lo: f64,
    lo_inclusive: bool,
    hi: f64,
    unit: &str,
) -> Result<f64> {
    Checker::new(ORIGIN).range(flag, v, lo, lo_inclusive, hi, unit)
}

/// A length flag ("32", "1.25 in"), > 0 and ≤ 1000 mm.
pub fn flag_length(flag: &str, text: &str) -> Result<f64> {
    let mm = crate::units::parse_length_mm(text)
        .map_err(|m| Error::bad_value(ORIGIN, flag, format!("\"{text}\""), m))?;
    if !(mm > 0.0 && mm <= MAX_CORE_MM) {
        return Err(Error::bad_value(
            ORIGIN,
            flag,
            format!("\"{text}\""),
            "must be > 0 mm and ≤ 1000 mm",
        ));
    }
    Ok(mm)
}

/// A window flag ("16x48", "0.625inx1.875in"): width and height, mm, each > 0 and ≤ 1000 mm.
pub fn flag_window(window: &str) -> Result<(f64, f64)> {
    let (w, h) = crate::units::parse_window(window)
        .map_err(|m| Error::bad_value(ORIGIN, "--window", format!("\"{window}\""), m))?;
    for (v, what) in [(w, "width"), (h, "height")] {
        if !(v > 0.0 && v <= MAX_CORE_MM) {
            return Err(Error::bad_value(
                ORIGIN,
                "--window",
                format!("\"{window}\""),
                format!("the {what} must be > 0 mm and ≤ 1000 mm"),
            ));
        }
    }
    Ok((w, h))
}

/// A core from its flags.
pub fn core_from_flags(
    tongue: &str,
    stack: &str,
    window: &str,
    shape: Shape,
    stacking: f64,
) -> Result<CoreDims> {
    let a = flag_length("--tongue", tongue)?;
    let s = flag_length("--stack", stack)?;
    let (w, h) = flag_window(window)?;
    if !(stacking > 0.5 && stacking <= 1.0) {
        return Err(Error::bad_value(
            ORIGIN,
            "--stacking",
            stacking,
            "must be > 0.5 and ≤ 1",
        ));
    }
    Ok(CoreDims::new(shape, a, s, (w, h), stacking))
}

/// A core for `probe`: without `--window`, scrapless E-I proportions (window a/2 × 1.5a, McLyman)
/// stand in for the path length; the flag says whether it was estimated.
pub fn probe_core(
    tongue: &str,
    stack: &str,
    window: Option<&str>,
    shape: Shape,
    stacking: f64,
) -> Result<(CoreDims, bool)> {
    let dims = core_from_flags(tongue, stack, window.unwrap_or("1x1"), shape, stacking)?;
    if window.is_some() {
        return Ok((dims, false));
    }
    let t = dims.tongue_mm;
    let d = CoreDims::new(dims.shape, t, dims.stack_mm, (t / 2.0, 1.5 * t), stacking);
    Ok((d, true))
}

/// The flags of a quick rating, as typed.
#[derive(Debug, Clone, PartialEq)]
pub struct QuickJob {
    /// `--tongue`.
    pub tongue: String,
    /// `--stack`.
    pub stack: String,
    /// `--window`.
    pub window: String,
    /// `--shape`.
    pub shape: Shape,
    /// `--stacking`.
    pub stacking: f64,
    /// `--steel`.
    pub steel: String,
    /// `--frequency`, Hz.
    pub frequency_hz: f64,
    /// `--primary`, V.
    pub primary_volts: f64,
    /// `--output`, V each.
    pub outputs_volts: Vec<f64>,
    /// `--waveform square` (else sine).
    pub square: bool,
    /// `--flux`, T.
    pub flux_t: Option<f64>,
    /// `--max-rise`, °C.
    pub max_rise_c: Option<f64>,
    /// `--ambient`, °C.
    pub ambient_c: Option<f64>,
    /// `--system`.
    pub system: System,
    /// `--va`: the outputs share it equally (100 VA when not given).
    pub va: Option<f64>,
}

/// The job a quick rating plans, built directly from the flags and checked by the job's ranges.
pub fn quick_job(q: &QuickJob) -> Result<Job> {
    let c = Checker::new(ORIGIN);
    let core = core_from_flags(&q.tongue, &q.stack, &q.window, q.shape, q.stacking)?;
    let steel =
        steel_info(&q.steel).map_err(|m| c.fail("--steel", format!("\"{}\"", q.steel), m))?;
    let f = c.range("--frequency", q.frequency_hz, 1.0, true, 2000.0, "Hz")?;
    let vp = c.range("--primary", q.primary_volts, 0.0, false, 100_000.0, "V")?;
    if q.outputs_volts.is_empty() {
        return Err(c.fail(
            "--output",
            "(none)",
            "give at least one output voltage, --output VOLTS",
        ));
    }
    let flux = match q.flux_t {
        Some(b) => Some(c.range("--flux", b, 0.0, false, MAX_FLUX_T, "T")?),
        None => None,
    };
    let max_rise = match q.max_rise_c {
        Some(t) => c.range("--max-rise", t, 0.0, false, 150.0, "°C")?,
        None => 50.0,
    };
    let ambient = match q.ambient_c {
        Some(t) => c.range("--ambient", t, -40.0, true, 80.0, "°C")?,
        None => 30.0,
    };
    let share = q.va.unwrap_or(100.0) / q.outputs_volts.len() as f64;
    let mut windings = vec![winding("primary", Role::Primary, vp, 0.0)];
    for (k, &v) in q.outputs_volts.iter().enumerate() {
        let v = c.range("--output", v, 0.0, false, 100_000.0, "V")?;
        let amps = share / v;
        if !(amps > 0.0 && amps <= 10_000.0) {
            return Err(c.fail(
                "--va",
                crate::input::fmt_value(q.va.unwrap_or(100.0)),
                format!(
                    "gives {amps:.3e} A on the {v} V output; each output must carry > 0 A and ≤ 10000 A"
                ),
            ));
        }
        windings.push(winding(
            &format!("output {}", k + 1),
            Role::Secondary,
            v,
            amps,
        ));
    }
    let (outer, yoke) = default_leg_yoke(q.shape, core.tongue_mm);
    Ok(Job {
        name: "quick rating".to_string(),
        core: CoreDims {
            outer_leg_mm: outer,
            yoke_mm: yoke,
            ..core
        },
        core_text: [
            q.tongue.clone(),
            q.stack.clone(),
            q.window.clone(),
            q.window.clone(),
        ],
        steel,
        frequency_hz: f,
        waveform: if q.square {
            Waveform::Square
        } else {
            Waveform::Sine
        },
        flux_density_t: flux,
        current_density_a_mm2: 3.0,
        ambient_c: ambient,
        max_rise_c: max_rise,
        insulation_class: crate::job::InsulationClass::B,
        system: q.system,
        grade: Grade::Two,
        max_strand_mm: 2.0,
        layout: LayoutSettings::default(),
        lead_m: 0.15,
        windings,
        probe: None,
        load_duty: 1.0,
        cooling_factor: 1.0,
        input_warnings: Vec::new(),
    })
}

fn winding(name: &str, role: Role, volts: f64, amps: f64) -> WindingSpec {
    WindingSpec {
        name: name.to_string(),
        role,
        volts,
        volts_given: true,
        amps,
        fixed_turns: None,
        volts_tolerance_pct: 5.0,
        sections: 1,
        centre_tap: false,
        bifilar: false,
        bobbin_section: 1,
        load_duty: 1.0,
        on_time_s: None,
        wire: WireRequest::default(),
        current_density_a_mm2: None,
        taps_volts: Vec::new(),
        kept: false,
        rated_volts: None,
        resistance_ohm: None,
        build_mm: None,
        dc: None,
        power_factor: 1.0,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn quick() -> QuickJob {
        QuickJob {
            tongue: "38".into(),
            stack: "62".into(),
            window: "19x57".into(),
            shape: Shape::Ei,
            stacking: 0.95,
            steel: "unknown".into(),
            frequency_hz: 50.0,
            primary_volts: 230.0,
            outputs_volts: vec![24.0, 12.0],
            square: false,
            flux_t: None,
            max_rise_c: None,
            ambient_c: None,
            system: System::Metric,
            va: Some(300.0),
        }
    }

    #[test]
    fn the_quick_job_is_the_job_file_it_stands_for() {
        // The same core and windings written as a job file plan to the same job.
        let text = "name = \"quick rating\"\n[core]\ntongue_mm = 38\nstack_mm = 62\nwindow_width_mm = 19\nwindow_height_mm = 57\n[supply]\nfrequency_hz = 50\n[[winding]]\nname = \"primary\"\nrole = \"primary\"\nvolts = 230\n[[winding]]\nname = \"output 1\"\nrole = \"secondary\"\nvolts = 24\namps = 6.25\n[[winding]]\nname = \"output 2\"\nrole = \"secondary\"\nvolts = 12\namps = 12.5\n";
        let from_file =
            crate::job::parse_job(text, "t", &|_| Err(Error::Failed("no sweep".into())))
                .expect("job");
        let from_flags = quick_job(&quick()).expect("quick");
        assert_eq!(from_flags.core, from_file.core);
        assert_eq!(from_flags.windings, from_file.windings);
        assert_eq!(from_flags.layout, from_file.layout);
    }

    #[test]
    fn errors_name_the_flag() {
        for (q, flag) in [
            (
                QuickJob {
                    primary_volts: f64::NAN,
                    ..quick()
                },
                "--primary",
            ),
            (
                QuickJob {
                    outputs_volts: vec![-5.0],
                    ..quick()
                },
                "--output",
            ),
            (
                QuickJob {
                    steel: "cheese".into(),
                    ..quick()
                },
                "--steel",
            ),
            (
                QuickJob {
                    va: Some(1e9),
                    outputs_volts: vec![1.0],
                    ..quick()
                },
                "--va",
            ),
        ] {
            let e = quick_job(&q).expect_err("bad");
            let m = e.to_string();
            assert!(m.starts_with("command line: ") && m.contains(flag), "{m}");
            assert!(!m.contains("line 1") && !m.contains("[["), "{m}");
        }
    }
}
