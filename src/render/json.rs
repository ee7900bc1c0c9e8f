//! The plan as JSON: serialize-only rows apart from the domain types, full precision.
//!
//! The keys are a contract (DESIGN.md, "JSON of plan"); `tests/` holds a typed mirror with
//! `deny_unknown_fields` that fails when a key goes missing or appears unannounced.

use super::words;
use crate::plan::{Plan, WindingPlan};
use crate::wire::Conductor;
use serde::Serialize;
use std::io::Write;

/// Default spare allowance on the buy list, fraction.
pub const DEFAULT_SPARE: f64 = 0.10;

/// The plan's JSON document.
#[derive(Debug, Serialize)]
pub struct PlanJson<'a> {
    /// Job name.
    pub name: &'a str,
    /// Core.
    pub core: CoreJson<'a>,
    /// Drive.
    pub drive: DriveJson<'a>,
    /// Windings.
    pub windings: Vec<WindingJson<'a>>,
    /// Window.
    pub window: WindowJson,
    /// Losses.
    pub losses: LossesJson,
    /// Heating.
    pub thermal: ThermalJson,
    /// Probe results (null without a probe).
    pub probe: Option<ProbeJson>,
    /// The settings the plan used (limits, wire, insulation), so a plan can be planned again.
    pub settings: SettingsJson,
    /// What to buy.
    pub buy: Vec<BuyRow>,
    /// Verdict.
    pub verdict: VerdictJson,
    /// Warnings.
    pub warnings: Vec<String>,
    /// Cautions.
    pub cautions: &'a [&'a str],
}

/// Core keys.
#[derive(Debug, Serialize)]
pub struct CoreJson<'a> {
    /// `ei` or `ui`.
    pub shape: &'a str,
    /// Tongue, mm.
    pub tongue_mm: f64,
    /// Stack, mm.
    pub stack_mm: f64,
    /// Window width, mm.
    pub window_width_mm: f64,
    /// Window height, mm.
    pub window_height_mm: f64,
    /// Stacking factor.
    pub stacking_factor: f64,
    /// Steel name.
    pub steel: &'a str,
    /// Steel kind.
    pub steel_kind: &'a str,
    /// Specific loss used, W/kg at 1.5 T 50 Hz (estimate).
    pub steel_loss_w_per_kg: f64,
    /// Gross area, mm².
    pub area_gross_mm2: f64,
    /// Net area, mm².
    pub area_net_mm2: f64,
    /// Window area, mm².
    pub window_area_mm2: f64,
    /// Area product, cm⁴.
    pub area_product_cm4: f64,
    /// Mass, kg.
    pub mass_kg: f64,
    /// Whether the mass was measured.
    pub mass_measured: bool,
    /// Path length, mm.
    pub path_length_mm: f64,
}

/// Drive keys.
#[derive(Debug, Serialize)]
pub struct DriveJson<'a> {
    /// Frequency, Hz.
    pub frequency_hz: f64,
    /// Waveform name.
    pub waveform: &'a str,
    /// Duty (1 unless quasi-square).
    pub duty: f64,
    /// Actual flux, T.
    pub flux_density_t: f64,
    /// Design flux, T.
    pub design_flux_t: f64,
    /// Where the design flux came from.
    pub flux_source: String,
    /// Flux ceiling, T.
    pub flux_limit_t: f64,
    /// Volts per turn.
    pub volts_per_turn: f64,
    /// Turns per volt.
    pub turns_per_volt: f64,
    /// Primary RMS volts.
    pub primary_rms_volts: f64,
    /// Primary current, A.
    pub primary_amps: f64,
    /// Predicted no-load current, A (null without a sweep).
    pub no_load_amps: Option<f64>,
    /// Flux over the donor's flux (null without a test winding).
    pub flux_vs_donor: Option<f64>,
    /// The kept-output comparison of drive and donor (null otherwise).
    pub kept_output_note: Option<String>,
    /// The most a kept output gives at the design flux (null otherwise).
    pub kept_limit: Option<KeptLimitJson<'a>>,
    /// Magnetising current, A RMS (steel table and joints, or the sweep).
    pub magnetising_amps: f64,
    /// Predicted idle current (magnetising and core-loss currents), A RMS.
    pub idle_amps: f64,
    /// Switch-on inrush, first half cycle (Specht's estimate), A peak.
    pub inrush_peak_amps: f64,
    /// The inrush over the rated primary current.
    pub inrush_multiple: f64,
    /// Series resistance holding the inrush to 10 × rated, Ω (0: none needed).
    pub soft_start_ohm: f64,
}

/// A rectified output's DC figures.
#[derive(Debug, Serialize)]
pub struct DcJson {
    /// `bridge`, `centre-tap` or `half-wave`.
    pub rectifier: &'static str,
    /// `capacitor`, `choke`, `battery` or `resistive`.
    pub filter: &'static str,
    /// A bridge on a centre-tapped winding: ± rails (the figures are each rail's).
    pub dual_rails: bool,
    /// The job's DC volts (a battery: its EMF), V.
    pub target_volts: f64,
    /// The job's DC amps (a battery: the charge current wanted), A.
    pub target_amps: f64,
    /// Mean DC volts at full load, V.
    pub volts_full_load: f64,
    /// DC volts with no load, V.
    pub volts_no_load: f64,
    /// Ripple peak to peak, V.
    pub ripple_pp_v: f64,
    /// Mean DC current, A.
    pub amps: f64,
    /// DC power, W (both rails).
    pub power_w: f64,
    /// The winding's VA over the DC power.
    pub va_per_dc_w: f64,
    /// Drop of one diode, V.
    pub diode_drop_v: f64,
}

/// The most a kept output gives at the design flux.
#[derive(Debug, Serialize)]
pub struct KeptLimitJson<'a> {
    /// The kept output.
    pub winding: &'a str,
    /// The design flux, T.
    pub flux_t: f64,
    /// Its full-load volts there.
    pub volts_full_load: f64,
    /// The sentence.
    pub detail: String,
}

/// Conductor keys.
#[derive(Debug, Serialize)]
pub struct ConductorJson {
    /// `metric`, `awg` or `strip`.
    pub system: &'static str,
    /// Size label.
    pub size: String,
    /// Enamel grade or build.
    pub grade: String,
    /// Bare diameter or strip thickness, mm.
    pub bare_mm: f64,
    /// Overall diameter or insulated strip thickness, mm.
    pub overall_mm: f64,
    /// Along the traverse: overall diameter or insulated strip width, mm.
    pub overall_width_mm: f64,
    /// Copper area of one strand, mm².
    pub area_mm2: f64,
}

/// A tap.
#[derive(Debug, Serialize)]
pub struct TapJson {
    /// Volts.
    pub volts: f64,
    /// Turn number.
    pub turn: u32,
}

/// Winding keys.
#[derive(Debug, Serialize)]
pub struct WindingJson<'a> {
    /// Name.
    pub name: &'a str,
    /// Role.
    pub role: &'static str,
    /// Kept donor winding.
    pub kept: bool,
    /// Target volts.
    pub volts: f64,
    /// Full-load amps.
    pub amps: f64,
    /// Turns, per half or section.
    pub turns: u32,
    /// Halves or sections: 2 for a centre tap, N for sections, 1 otherwise.
    pub sections: u32,
    /// RMS current in one half or section, A.
    pub section_amps: f64,
    /// RMS current of one half or section, A (the primary: its whole current).
    pub rms_amps: f64,
    /// Peak current, A.
    pub peak_amps: f64,
    /// Each pulse of current of a rectified output, electrical degrees (null otherwise).
    pub conduction_deg: Option<f64>,
    /// V_rms·I_rms of the whole winding, VA.
    pub va: f64,
    /// Power to the load, W (0 for the primary).
    pub output_w: f64,
    /// The load's power factor.
    pub power_factor: f64,
    /// Leakage inductance referred to this winding (one half or section), H.
    pub leakage_h: f64,
    /// Leakage reactance referred to it, Ω.
    pub leakage_reactance_ohm: f64,
    /// Short-circuit impedance referred to it, Ω (null for the primary).
    pub short_circuit_ohm: Option<f64>,
    /// Current with it shorted, the primary at rated volts, A (null for the primary).
    pub short_circuit_amps: Option<f64>,
    /// A rectified output's DC figures (null for AC).
    pub dc: Option<DcJson>,
    /// Centre-tapped.
    pub centre_tap: bool,
    /// Halves or sections wound together.
    pub bifilar: bool,
    /// Turns fixed by the job.
    pub turns_fixed: bool,
    /// Its section of a split bobbin (1 or 2; 1 on a single bobbin).
    pub section: u32,
    /// Fraction of the time its load is on.
    pub load_duty: f64,
    /// The copper's own rise in one on-time, °C (null without on_time_s).
    pub adiabatic_rise_c: Option<f64>,
    /// Turns on one coil (half for `ui`).
    pub coil_turns: u32,
    /// Strands in hand.
    pub strands: u32,
    /// Conductor.
    pub conductor: ConductorJson,
    /// Current density, A/mm².
    pub current_density_a_mm2: f64,
    /// Turns per layer.
    pub turns_per_layer: u32,
    /// Layers.
    pub layers: u32,
    /// Build, mm.
    pub build_mm: f64,
    /// The traverse it winds on (its section's share on a split bobbin), mm.
    pub traverse_mm: f64,
    /// Running turn count at the end of each layer.
    pub checkpoints: &'a [u32],
    /// Mean turn, mm.
    pub mean_turn_mm: f64,
    /// Wound length, m.
    pub length_m: f64,
    /// Cut length with leads, m (per strand).
    pub cut_length_m: f64,
    /// Hot resistance, Ω.
    pub resistance_ohm: f64,
    /// 20 °C resistance, Ω.
    pub resistance_20c_ohm: f64,
    /// Copper loss, W.
    pub copper_loss_w: f64,
    /// Copper mass, g.
    pub copper_mass_g: f64,
    /// No-load volts.
    pub volts_no_load: f64,
    /// Full-load volts.
    pub volts_full_load: f64,
    /// Regulation (V_NL − V_FL)/V_FL, % (null on the primary).
    pub regulation_pct: Option<f64>,
    /// The most this winding delivers at full load, V.
    pub max_volts_full_load: Option<f64>,
    /// Taps.
    pub taps: Vec<TapJson>,
}

/// Window keys.
#[derive(Debug, Serialize)]
pub struct WindowJson {
    /// Copper fill.
    pub copper_fill: f64,
    /// Total build, mm.
    pub build_mm: f64,
    /// Available, mm.
    pub available_mm: f64,
    /// Traverse, mm.
    pub traverse_mm: f64,
    /// Fits.
    pub fits: bool,
}

/// Loss keys.
#[derive(Debug, Serialize)]
pub struct LossesJson {
    /// Core loss, W.
    pub core_w: f64,
    /// Copper loss, W.
    pub copper_w: f64,
    /// Output power, W.
    pub output_w: f64,
    /// Efficiency.
    pub efficiency: f64,
    /// The worst output's regulation, %.
    pub regulation_pct: f64,
    /// Core loss over the sine figure at the same peak flux (loss separation).
    pub core_waveform_factor: f64,
    /// Past saturation: the loss figures are not estimates.
    pub saturated: bool,
}

/// Thermal keys.
#[derive(Debug, Serialize)]
pub struct ThermalJson {
    /// Surface, cm².
    pub surface_cm2: f64,
    /// Rise, °C.
    pub rise_c: f64,
    /// Ambient, °C.
    pub ambient_c: f64,
    /// Hot winding temperature, °C.
    pub hot_c: f64,
    /// Allowed rise, °C.
    pub max_rise_c: f64,
    /// Time-averaged copper loss, W.
    pub average_copper_w: f64,
    /// Hottest copper, °C.
    pub hot_spot_c: f64,
    /// Insulation class letter (IEC 60085).
    pub insulation_class: &'static str,
    /// Its temperature, °C.
    pub insulation_class_c: f64,
}

/// Probe keys.
#[derive(Debug, Serialize)]
pub struct ProbeJson {
    /// Volts per turn.
    pub volts_per_turn: Option<f64>,
    /// Donor flux, T.
    pub donor_flux_t: Option<f64>,
    /// IEC knee volts.
    pub knee_volts: Option<f64>,
    /// IEC knee flux, T.
    pub knee_flux_t: Option<f64>,
    /// 45° tangent flux, T.
    pub tangent_flux_t: Option<f64>,
    /// Recommended flux, T.
    pub recommended_flux_t: Option<f64>,
}

/// The settings a plan used.
#[derive(Debug, Serialize)]
pub struct SettingsJson {
    /// Current density limit, A/mm².
    pub current_density_a_mm2: f64,
    /// Wire system for automatic choices.
    pub system: &'static str,
    /// Enamel grade (1 or 2).
    pub grade: u8,
    /// Thickest single strand, mm.
    pub max_strand_mm: f64,
    /// Winding pitch factor.
    pub pitch: f64,
    /// Bobbin wall, mm.
    pub bobbin_wall_mm: f64,
    /// Margin at each end of the traverse, mm.
    pub margin_mm: f64,
    /// Insulation between layers, mm.
    pub interlayer_mm: f64,
    /// Insulation between windings, mm.
    pub between_windings_mm: f64,
    /// Outer wrap, mm.
    pub outer_mm: f64,
    /// Clearance to the outer leg, mm.
    pub clearance_mm: f64,
    /// Lead length per end, m.
    pub lead_m: f64,
}

/// A buy-list row.
#[derive(Debug, Clone, Serialize)]
pub struct BuyRow {
    /// Size label.
    pub size: String,
    /// System.
    pub system: &'static str,
    /// Length with spare, m.
    pub length_m: f64,
    /// Mass with spare, g.
    pub mass_g: f64,
    /// Spare allowance, %.
    pub spare_pct: f64,
}

/// A check.
#[derive(Debug, Serialize)]
pub struct CheckJson {
    /// Name.
    pub name: String,
    /// What it is about: flux, window, heating, current-density, primary-current, output.
    pub kind: &'static str,
    /// Passes.
    pub ok: bool,
    /// Detail.
    pub detail: String,
}

/// Verdict.
#[derive(Debug, Serialize)]
pub struct VerdictJson {
    /// All pass.
    pub ok: bool,
    /// Checks.
    pub checks: Vec<CheckJson>,
}

/// The wire to buy, grouped by size: every strand's cut length, with a spare allowance.
pub fn buy_list(plan: &Plan, spare: f64) -> Vec<BuyRow> {
    let mut rows: Vec<BuyRow> = Vec::new();
    for w in plan.windings.iter().filter(|w| !w.kept) {
        let size = w.wire.conductor.size_label();
        let system = w.wire.conductor.system_name();
        let strands = w.wire.strands as f64 * w.sections as f64;
        let len = w.cut_length_m * strands * (1.0 + spare);
        let mass = w.copper_mass_g * (1.0 + spare);
        match rows
            .iter_mut()
            .find(|r| r.size == size && r.system == system)
        {
            Some(r) => {
                r.length_m += len;
                r.mass_g += mass;
            }
            None => rows.push(BuyRow {
                size,
                system,
                length_m: len,
                mass_g: mass,
                spare_pct: spare * 100.0,
            }),
        }
    }
    rows
}

fn core_json(plan: &Plan) -> CoreJson<'_> {
    let g = &plan.geometry;
    CoreJson {
        shape: plan.core.shape.name(),
        tongue_mm: plan.core.tongue_mm,
        stack_mm: plan.core.stack_mm,
        window_width_mm: plan.core.window_width_mm,
        window_height_mm: plan.core.window_height_mm,
        stacking_factor: plan.core.stacking_factor,
        steel: &plan.steel.name,
        steel_kind: &plan.steel.kind,
        steel_loss_w_per_kg: plan.steel.loss_w_per_kg_1t5,
        area_gross_mm2: g.area_gross_mm2,
        area_net_mm2: g.area_net_mm2,
        window_area_mm2: g.window_area_mm2,
        area_product_cm4: g.area_product_cm4,
        mass_kg: g.mass_kg,
        mass_measured: g.mass_measured,
        path_length_mm: g.path_length_mm,
    }
}

fn drive_json(plan: &Plan) -> DriveJson<'_> {
    DriveJson {
        frequency_hz: plan.drive.frequency_hz,
        waveform: plan.drive.waveform.name(),
        duty: match plan.drive.waveform {
            crate::magnetics::Waveform::QuasiSquare { duty } => duty,
            _ => 1.0,
        },
        flux_density_t: plan.drive.flux_density_t,
        design_flux_t: plan.drive.design_flux_t,
        flux_source: words::flux_source(&plan.drive.flux_source),
        flux_limit_t: plan.drive.flux_limit_t,
        volts_per_turn: plan.drive.volts_per_turn,
        turns_per_volt: 1.0 / plan.drive.volts_per_turn,
        primary_rms_volts: plan.drive.primary_rms_volts,
        primary_amps: plan.drive.primary_amps,
        no_load_amps: plan.drive.no_load_amps,
        flux_vs_donor: plan.drive.flux_vs_donor,
        kept_output_note: plan
            .drive
            .kept_output_note
            .as_ref()
            .map(words::kept_output_note),
        kept_limit: plan.drive.kept_limit.as_ref().map(|k| KeptLimitJson {
            winding: &k.winding,
            flux_t: k.flux_t,
            volts_full_load: k.volts,
            detail: words::kept_limit(k),
        }),
        magnetising_amps: plan.drive.magnetising_amps,
        idle_amps: plan.drive.idle_amps,
        inrush_peak_amps: plan.drive.inrush.peak_amps,
        inrush_multiple: plan.drive.inrush.multiple_of_rated,
        soft_start_ohm: plan.drive.inrush.soft_start_ohm,
    }
}

fn winding_json(w: &WindingPlan) -> WindingJson<'_> {
    let c = &w.wire.conductor;
    WindingJson {
        name: &w.name,
        role: w.role.name(),
        kept: w.kept,
        volts: w.volts,
        amps: w.amps,
        turns: w.turns,
        sections: w.sections,
        section_amps: w.section_amps,
        rms_amps: w.section_amps,
        peak_amps: w.peak_amps,
        conduction_deg: w.dc.as_ref().map(|d| d.conduction_deg),
        va: w.va,
        output_w: w.output_w,
        power_factor: w.power_factor,
        leakage_h: w.leakage_h,
        leakage_reactance_ohm: w.leakage_reactance_ohm,
        short_circuit_ohm: w.short_circuit_ohm.filter(|v| v.is_finite()),
        short_circuit_amps: w.short_circuit_amps.filter(|v| v.is_finite()),
        dc: w.dc.as_ref().map(|d| DcJson {
            rectifier: d.load.rectifier.name(),
            filter: d.load.filter.name(),
            dual_rails: d.dual_rails,
            target_volts: d.load.dc_volts,
            target_amps: d.load.dc_amps,
            volts_full_load: d.volts_full_load,
            volts_no_load: d.volts_no_load,
            ripple_pp_v: d.ripple_pp_v,
            amps: d.amps,
            power_w: d.power_w,
            va_per_dc_w: d.va_per_dc_w,
            diode_drop_v: d.load.diode_drop_v,
        }),
        centre_tap: w.centre_tap,
        bifilar: w.bifilar,
        turns_fixed: w.turns_fixed,
        section: w.bobbin_section,
        load_duty: w.load_duty,
        adiabatic_rise_c: w.adiabatic_rise_c,
        coil_turns: w.coil.coil_turns,
        strands: w.wire.strands,
        conductor: ConductorJson {
            system: c.system_name(),
            size: c.size_label(),
            grade: w.grade_label.to_string(),
            bare_mm: c.bare_mm(),
            overall_mm: c.build_mm(),
            overall_width_mm: c.traverse_mm(),
            area_mm2: c.area_mm2(),
        },
        current_density_a_mm2: w.current_density_a_mm2,
        turns_per_layer: w.coil.turns_per_layer,
        layers: w.coil.layers,
        build_mm: w.coil.build_mm,
        traverse_mm: w.coil.traverse_mm,
        checkpoints: &w.coil.checkpoints,
        mean_turn_mm: w.coil.mean_turn_mm,
        length_m: w.length_m,
        cut_length_m: w.cut_length_m,
        resistance_ohm: w.resistance_ohm,
        resistance_20c_ohm: w.resistance_20c_ohm,
        copper_loss_w: w.copper_loss_w,
        copper_mass_g: w.copper_mass_g,
        volts_no_load: w.volts_no_load,
        volts_full_load: w.volts_full_load,
        regulation_pct: w.regulation_pct,
        max_volts_full_load: w.max_volts_full_load.filter(|v| v.is_finite()),
        taps: w
            .taps
            .iter()
            .map(|t| TapJson {
                volts: t.volts,
                turn: t.turn,
            })
            .collect(),
    }
}

fn settings_json(plan: &Plan) -> SettingsJson {
    SettingsJson {
        current_density_a_mm2: plan.current_density_limit_a_mm2,
        system: plan.system.name(),
        grade: if plan.grade == crate::wire::Grade::One {
            1
        } else {
            2
        },
        max_strand_mm: plan.max_strand_mm,
        pitch: plan.settings.pitch,
        bobbin_wall_mm: plan.settings.bobbin_wall_mm,
        margin_mm: plan.settings.margin_mm,
        interlayer_mm: plan.settings.interlayer_mm,
        between_windings_mm: plan.settings.between_windings_mm,
        outer_mm: plan.settings.outer_mm,
        clearance_mm: plan.settings.clearance_mm,
        lead_m: plan.lead_m,
    }
}

fn verdict_json(plan: &Plan) -> VerdictJson {
    VerdictJson {
        ok: plan.verdict.ok,
        checks: plan
            .verdict
            .checks
            .iter()
            .map(|c| CheckJson {
                name: c.name(),
                kind: c.kind().key(),
                ok: c.ok,
                detail: words::check_detail(c),
            })
            .collect(),
    }
}

/// Builds the JSON document of a plan.
pub fn plan_json(plan: &Plan, spare: f64) -> PlanJson<'_> {
    PlanJson {
        name: &plan.name,
        core: core_json(plan),
        drive: drive_json(plan),
        windings: plan.windings.iter().map(winding_json).collect(),
        window: WindowJson {
            copper_fill: plan.window.copper_fill,
            build_mm: plan.window.build_mm,
            available_mm: plan.window.available_mm,
            traverse_mm: plan.window.traverse_mm,
            fits: plan.window.fits,
        },
        losses: LossesJson {
            core_w: plan.losses.core_w,
            copper_w: plan.losses.copper_w,
            output_w: plan.losses.output_w,
            efficiency: plan.losses.efficiency,
            regulation_pct: plan.losses.regulation_pct,
            core_waveform_factor: plan.losses.core_waveform_factor,
            saturated: plan.losses.saturated,
        },
        thermal: ThermalJson {
            surface_cm2: plan.thermal.surface_cm2,
            rise_c: plan.thermal.rise_c,
            ambient_c: plan.thermal.ambient_c,
            hot_c: plan.thermal.hot_c,
            max_rise_c: plan.thermal.max_rise_c,
            average_copper_w: plan.thermal.average_copper_w,
            hot_spot_c: plan.thermal.hot_spot_c,
            insulation_class: plan.thermal.insulation_class.letter(),
            insulation_class_c: plan.thermal.insulation_class.limit_c(),
        },
        probe: plan.probe.as_ref().map(|p| ProbeJson {
            volts_per_turn: p.volts_per_turn,
            donor_flux_t: p.donor_flux_t,
            knee_volts: p.knee_volts,
            knee_flux_t: p.knee_flux_t,
            tangent_flux_t: p.tangent_flux_t,
            recommended_flux_t: p.recommended_flux_t,
        }),
        settings: settings_json(plan),
        buy: buy_list(plan, spare),
        verdict: verdict_json(plan),
        warnings: plan.warnings.iter().map(words::warning).collect(),
        cautions: plan.cautions,
    }
}

/// Writes any serializable value as pretty JSON with a trailing newline.
pub fn write_json<T: Serialize>(out: &mut dyn Write, value: &T) -> std::io::Result<()> {
    serde_json::to_writer_pretty(&mut *out, value).map_err(|e| match e.io_error_kind() {
        // Keep the kind, so a closed pipe stays a closed pipe.
        Some(kind) => std::io::Error::new(kind, e),
        None => std::io::Error::other(e),
    })?;
    writeln!(out)
}

/// Writes the plan as JSON.
pub fn write_plan(out: &mut dyn Write, plan: &Plan) -> std::io::Result<()> {
    write_json(out, &plan_json(plan, DEFAULT_SPARE))
}

/// Whether a conductor is strip (used by renderers).
pub fn is_strip(c: &Conductor) -> bool {
    matches!(c, Conductor::Strip { .. })
}
