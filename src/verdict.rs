//! Checks, warnings and notes as typed values: a kind plus the figures it is about.
//!
//! A design that fails a check is a result, not an error (STYLE.md, habit 5). The library only
//! says what was found and with which numbers; `render::words` turns each into a sentence, once,
//! for every format (text, JSON, card).

use crate::magnetics::Waveform;

/// What a check is about (JSON `verdict.checks[].kind`).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum CheckKind {
    /// The actual flux against the design ceiling.
    Flux,
    /// The coil's build against the window.
    Window,
    /// The temperature rise against its limit.
    Heating,
    /// The highest current density against the limit.
    CurrentDensity,
    /// Whether the primary can pass the load's power at all.
    PrimaryCurrent,
    /// An output's full-load voltage against its target.
    Output,
    /// The hottest copper against the insulation's thermal class.
    InsulationClass,
}

impl CheckKind {
    /// The kind's key in JSON and in file-facing names.
    pub fn key(self) -> &'static str {
        match self {
            CheckKind::Flux => "flux",
            CheckKind::Window => "window",
            CheckKind::Heating => "heating",
            CheckKind::CurrentDensity => "current-density",
            CheckKind::PrimaryCurrent => "primary-current",
            CheckKind::Output => "output",
            CheckKind::InsulationClass => "insulation-class",
        }
    }
}

/// Where the design flux came from.
#[derive(Debug, Clone, PartialEq)]
pub enum FluxSource {
    /// `[limits] flux_density_t`.
    Given,
    /// Given in the job, above the sweep's recommendation.
    GivenAboveSweep,
    /// 0.9 × the sweep's IEC knee.
    Sweep,
    /// The steel's default; the steel's name.
    Steel(String),
}

/// The figures of one check.
#[derive(Debug, Clone, PartialEq)]
pub enum CheckFigures {
    /// Flux density, T.
    Flux {
        /// Actual peak flux, T.
        flux_t: f64,
        /// Ceiling, T.
        limit_t: f64,
        /// Where the design flux came from.
        source: FluxSource,
    },
    /// Window build, mm.
    Window {
        /// Total build, mm.
        build_mm: f64,
        /// Build available, mm.
        available_mm: f64,
        /// Copper fill.
        copper_fill: f64,
        /// A winding cannot get a single turn on a layer.
        no_turn_fits: bool,
    },
    /// Temperature rise, °C.
    Heating {
        /// Rise, °C.
        rise_c: f64,
        /// Allowed rise, °C.
        limit_c: f64,
    },
    /// Current density, A/mm².
    CurrentDensity {
        /// Highest among the windings whose wire was chosen, A/mm².
        highest_a_mm2: f64,
        /// The winding that has it.
        winding: String,
        /// Limit, A/mm².
        limit_a_mm2: f64,
    },
    /// The primary's current.
    PrimaryCurrent {
        /// Full-load primary current, A RMS.
        amps: f64,
    },
    /// An output's full-load voltage.
    Output {
        /// The output's name.
        winding: String,
        /// Full-load volts reached.
        volts_full_load: f64,
        /// Full-load current, A.
        amps: f64,
        /// Target volts.
        target_volts: f64,
        /// The most the winding can deliver at full load, V.
        max_volts: Option<f64>,
        /// Fixed turns: how far either way the volts may be, %.
        tolerance_pct: Option<f64>,
        /// Fixed turns and no volts to compare with: the check only reports.
        fixed_no_target: bool,
    },
    /// A rectified output's DC volts (a battery charger's mean charge current) at full load.
    DcOutput {
        /// The output's name.
        winding: String,
        /// DC volts reached at full load (a battery: the mean charge current, A).
        reached: f64,
        /// The target: DC volts (a battery: the charge current wanted, A).
        target: f64,
        /// The mean DC current (a battery: its terminal volts).
        other: f64,
        /// Whether the figure is a battery's charge current (A) rather than DC volts.
        charge_current: bool,
        /// The most the winding reaches at any turns, when short.
        max: Option<f64>,
        /// Fixed turns: how far either way the figure may be, %.
        tolerance_pct: Option<f64>,
    },
    /// The hottest copper against the insulation class.
    InsulationClass {
        /// Hot-spot copper temperature, °C.
        hot_spot_c: f64,
        /// The class letter (IEC 60085).
        class: &'static str,
        /// Its temperature, °C.
        limit_c: f64,
    },
}

/// One check of a verdict.
#[derive(Debug, Clone, PartialEq)]
pub struct Check {
    /// Whether it passes.
    pub ok: bool,
    /// Its figures.
    pub figures: CheckFigures,
}

impl Check {
    /// What the check is about.
    pub fn kind(&self) -> CheckKind {
        match self.figures {
            CheckFigures::Flux { .. } => CheckKind::Flux,
            CheckFigures::Window { .. } => CheckKind::Window,
            CheckFigures::Heating { .. } => CheckKind::Heating,
            CheckFigures::CurrentDensity { .. } => CheckKind::CurrentDensity,
            CheckFigures::PrimaryCurrent { .. } => CheckKind::PrimaryCurrent,
            CheckFigures::Output { .. } | CheckFigures::DcOutput { .. } => CheckKind::Output,
            CheckFigures::InsulationClass { .. } => CheckKind::InsulationClass,
        }
    }

    /// The check's name (JSON `verdict.checks[].name`): the kind in words, with the output's name.
    pub fn name(&self) -> String {
        match &self.figures {
            CheckFigures::Flux { .. } => "flux".to_string(),
            CheckFigures::Window { .. } => "window".to_string(),
            CheckFigures::Heating { .. } => "heating".to_string(),
            CheckFigures::CurrentDensity { .. } => "current density".to_string(),
            CheckFigures::PrimaryCurrent { .. } => "primary current".to_string(),
            CheckFigures::Output { winding, .. } | CheckFigures::DcOutput { winding, .. } => {
                format!("output {winding}")
            }
            CheckFigures::InsulationClass { .. } => "insulation class".to_string(),
        }
    }
}

/// The verdict.
#[derive(Debug, Clone, PartialEq)]
pub struct Verdict {
    /// All checks pass.
    pub ok: bool,
    /// The checks.
    pub checks: Vec<Check>,
}

impl Verdict {
    /// A verdict over checks.
    pub fn new(checks: Vec<Check>) -> Verdict {
        Verdict {
            ok: checks.iter().all(|c| c.ok),
            checks,
        }
    }

    /// The names of the checks that fail, in order.
    pub fn failed(&self) -> Vec<String> {
        self.checks
            .iter()
            .filter(|c| !c.ok)
            .map(Check::name)
            .collect()
    }

    /// Whether every check of a kind passes (true when there is none).
    pub fn passes(&self, kind: CheckKind) -> bool {
        self.checks
            .iter()
            .filter(|c| c.kind() == kind)
            .all(|c| c.ok)
    }
}

/// A warning or note on a plan or a probe report.
#[derive(Debug, Clone, PartialEq)]
pub enum Warning {
    /// The donor ran above the flux salvaged steel normally takes, T.
    DonorRunHard {
        /// The donor's flux, T.
        flux_t: f64,
        /// The flux above which a donor was run hard, T.
        hard_t: f64,
    },
    /// The donor's flux is implausibly low: a measurement is probably wrong.
    DonorFluxImplausible {
        /// The donor's flux, T.
        flux_t: f64,
    },
    /// A sweep that never reaches the IEC knee; `in_plan`: the plan's flux cap is unknown.
    SweepBelowKnee {
        /// Said of a plan (the flux cap is not known) rather than of a probe report.
        in_plan: bool,
    },
    /// The log-log slope never crosses 45° inside the sweep.
    NoTangentPoint,
    /// The donor ran above the sweep's recommended flux.
    DonorAboveRecommended {
        /// The donor's flux, T.
        donor_t: f64,
        /// The recommendation, T.
        recommended_t: f64,
    },
    /// No window given to `probe`: the path length assumes scrapless proportions.
    PathLengthEstimated,
    /// A given flux above the sweep's recommendation, kept as given.
    GivenFluxAboveSweep {
        /// Given flux, T.
        given_t: f64,
        /// The recommendation, T.
        recommended_t: f64,
    },
    /// The planned flux is above 0.9 × the IEC knee.
    FluxAboveKneeMargin {
        /// Planned flux, T.
        flux_t: f64,
        /// The margin, T.
        margin_t: f64,
        /// The IEC knee, T.
        knee_t: f64,
    },
    /// The planned flux is above the donor's own.
    FluxAboveDonor {
        /// Planned flux, T.
        flux_t: f64,
        /// The donor's, T.
        donor_t: f64,
    },
    /// A kept output runs the core above the donor's flux with no sweep to show the margin.
    KeptOutputAboveDonor {
        /// Planned over donor flux.
        ratio: f64,
    },
    /// Copper fill above what is easy to wind by hand.
    HardToWind {
        /// The fill.
        copper_fill: f64,
        /// The hand-winding limit.
        limit: f64,
    },
    /// A primary current that asks for strands or strip and short leads, A.
    HighPrimaryCurrent {
        /// Full-load primary current, A.
        amps: f64,
    },
    /// A square or quasi-square drive: core loss scaled by loss separation; harmonics reach the load.
    SquareDrive {
        /// Core loss over the sine figure at the same peak flux.
        loss_factor: f64,
    },
    /// The flux is past saturation: loss and efficiency figures are not estimates.
    PastSaturation {
        /// Planned flux, T.
        flux_t: f64,
        /// Where saturation begins, T.
        limit_t: f64,
    },
    /// A core length under 5 given as a bare number: millimetres were read, inches were perhaps meant.
    TinyLength {
        /// The key.
        key: String,
        /// The value read, mm.
        value_mm: f64,
    },
    /// Many round strands in hand: strip would suit better.
    ManyStrands {
        /// The winding.
        winding: String,
        /// Strands in hand.
        strands: u32,
    },
}

/// How a drive compares with the donor's own sine flux when a kept output sets the turns.
#[derive(Debug, Clone, PartialEq)]
pub struct KeptOutputNote {
    /// The kept output winding.
    pub winding: String,
    /// The drive's waveform.
    pub waveform: Waveform,
    /// Volts per turn (RMS).
    pub volts_per_turn: f64,
    /// Planned flux, T.
    pub flux_t: f64,
    /// The donor's flux, T.
    pub donor_flux_t: f64,
}

/// The most a kept output winding gives at the design flux: with the primary turns that hold the
/// flux to the design value, its full-load volts.
#[derive(Debug, Clone, PartialEq)]
pub struct KeptLimit {
    /// The kept output.
    pub winding: String,
    /// The design flux, T.
    pub flux_t: f64,
    /// Its full-load volts there, V RMS.
    pub volts: f64,
    /// Its target, V RMS.
    pub target_volts: f64,
}
