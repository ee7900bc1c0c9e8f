//! The winding schedule as CSV, one row per winding, full precision.

use crate::plan::Plan;
use serde::Serialize;
use std::io::Write;

/// One CSV row.
#[derive(Debug, Serialize)]
pub struct ScheduleRow {
    /// Winding name (a spreadsheet formula neutralised: `=`, `+`, `-`, `@` lead with `'`).
    pub name: String,
    /// Role.
    pub role: &'static str,
    /// Kept donor winding.
    pub kept: bool,
    /// Target volts.
    pub volts: f64,
    /// Amps.
    pub amps: f64,
    /// Turns.
    pub turns: u32,
    /// Wire system.
    pub system: &'static str,
    /// Wire size.
    pub size: String,
    /// Strands in hand.
    pub strands: u32,
    /// Overall diameter (build direction), mm.
    pub overall_mm: f64,
    /// Current density, A/mm².
    pub current_density_a_mm2: f64,
    /// Turns per layer.
    pub turns_per_layer: u32,
    /// Layers.
    pub layers: u32,
    /// Build, mm.
    pub build_mm: f64,
    /// Mean turn, mm.
    pub mean_turn_mm: f64,
    /// Wound length, m.
    pub length_m: f64,
    /// Cut length, m.
    pub cut_length_m: f64,
    /// Hot resistance, Ω.
    pub resistance_ohm: f64,
    /// 20 °C resistance, Ω.
    pub resistance_20c_ohm: f64,
    /// Copper loss, W.
    pub copper_loss_w: f64,
    /// No-load volts.
    pub volts_no_load: f64,
    /// Full-load volts.
    pub volts_full_load: f64,
    /// RMS current of one half or section, A.
    pub rms_amps: f64,
    /// Peak current, A.
    pub peak_amps: f64,
    /// A rectified output's mean DC volts at full load (empty for AC).
    pub dc_volts: Option<f64>,
    /// A rectified output's mean DC current (empty for AC).
    pub dc_amps: Option<f64>,
    /// Leakage inductance referred to the winding, H.
    pub leakage_h: f64,
    /// Short-circuit current with the primary at rated volts, A (empty for the primary).
    pub short_circuit_amps: Option<f64>,
}

/// Writes the schedule.
pub fn write_schedule(out: &mut dyn Write, plan: &Plan) -> std::io::Result<()> {
    let mut w = csv::Writer::from_writer(out);
    for p in &plan.windings {
        w.serialize(ScheduleRow {
            name: crate::shelf::neutralise(&p.name),
            role: p.role.name(),
            kept: p.kept,
            volts: p.volts,
            amps: p.amps,
            turns: p.turns,
            system: p.wire.conductor.system_name(),
            size: p.wire.conductor.size_label(),
            strands: p.wire.strands,
            overall_mm: p.wire.conductor.build_mm(),
            current_density_a_mm2: p.current_density_a_mm2,
            turns_per_layer: p.coil.turns_per_layer,
            layers: p.coil.layers,
            build_mm: p.coil.build_mm,
            mean_turn_mm: p.coil.mean_turn_mm,
            length_m: p.length_m,
            cut_length_m: p.cut_length_m,
            resistance_ohm: p.resistance_ohm,
            resistance_20c_ohm: p.resistance_20c_ohm,
            copper_loss_w: p.copper_loss_w,
            volts_no_load: p.volts_no_load,
            volts_full_load: p.volts_full_load,
            rms_amps: p.section_amps,
            peak_amps: p.peak_amps,
            dc_volts: p.dc.as_ref().map(|d| d.volts_full_load),
            dc_amps: p.dc.as_ref().map(|d| d.amps),
            leakage_h: p.leakage_h,
            short_circuit_amps: p.short_circuit_amps.filter(|a| a.is_finite()),
        })
        .map_err(|e| match e.into_kind() {
            csv::ErrorKind::Io(io) => io,
            other => std::io::Error::other(format!("{other:?}")),
        })?;
    }
    w.flush()
}
