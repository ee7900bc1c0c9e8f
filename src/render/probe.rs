//! `ironwind probe`: a test winding and a magnetisation sweep, as text, JSON and an SVG chart.

use super::{num, pairs, sig3, table, words, Format, Look, Units};
use crate::probe::ProbeReport;
use serde::Serialize;
use std::io::Write;

#[derive(Serialize)]
struct ProbeJson<'a> {
    #[serde(flatten)]
    report: &'a ProbeReport,
    warnings: Vec<String>,
}

/// Writes the report in a format: text or JSON.
pub fn write(
    out: &mut dyn Write,
    r: &ProbeReport,
    format: Format,
    look: &Look,
) -> std::io::Result<()> {
    if format == Format::Json {
        return super::json::write_json(
            out,
            &ProbeJson {
                report: r,
                warnings: r.warnings.iter().map(words::warning).collect(),
            },
        );
    }
    write!(out, "{}", look.finish(probe_text(r, look)))
}

fn test_section(r: &ProbeReport, look: &Look) -> String {
    let (Some(v), Some(tpv), Some(n), Some(b)) = (
        r.volts_per_turn,
        r.turns_per_volt,
        r.powered_turns,
        r.donor_flux_t,
    ) else {
        return String::new();
    };
    let mut s = look.heading("Test winding");
    s += "\n";
    s += &pairs(
        &[
            ("volts per turn", format!("{} V", num(v, 4))),
            ("turns per volt", num(tpv, 4)),
            ("powered winding", format!("about {} turns", num(n, 0))),
            (
                "donor ran at",
                format!(
                    "{} T peak (net area {}, sine)",
                    num(b, 3),
                    look.mm2(r.area_net_mm2, 1)
                ),
            ),
        ],
        look,
    );
    s
}

fn sweep_section(r: &ProbeReport, look: &Look) -> String {
    let mut s = look.heading(&format!(
        "Magnetisation sweep ({} turns, {} Hz)",
        r.sweep_turns.unwrap_or(0),
        num(r.frequency_hz, 1)
    ));
    s += "\n";
    let imperial = look.units == Units::Imperial;
    let mut rows = vec![vec![
        "volts".to_string(),
        "amps".into(),
        "B peak T".into(),
        "H peak A/m (approx.)".into(),
    ]];
    if imperial {
        rows[0].push("H peak A/in".into());
    }
    for p in &r.points {
        let mut row = vec![
            num(p.volts, 2),
            sig3(p.amps),
            num(p.flux_t, 3),
            num(p.field_a_per_m, 0),
        ];
        if imperial {
            row.push(num(p.field_a_per_m * 0.0254, 1));
        }
        rows.push(row);
    }
    s += &table(rows, 0, look);
    let opt = |v: Option<f64>, d: usize, unit: &str| {
        v.map(|x| format!("{} {unit}", num(x, d)))
            .unwrap_or_else(|| "not reached".to_string())
    };
    s += &pairs(
        &[
            (
                "IEC 61869-2 knee",
                format!(
                    "{} = {}",
                    opt(r.knee_volts, 2, "V"),
                    opt(r.knee_flux_t, 3, "T")
                ),
            ),
            (
                "45° log-log tangent",
                format!(
                    "{} = {}",
                    opt(r.tangent_volts, 2, "V"),
                    opt(r.tangent_flux_t, 3, "T")
                ),
            ),
            (
                "recommended maximum",
                format!(
                    "{} (0.9 × the IEC knee flux)",
                    opt(r.recommended_flux_t, 3, "T")
                ),
            ),
        ],
        look,
    );
    if imperial {
        s += &format!(
            "path length le {} (field strength)\n",
            look.mm(r.path_length_mm, 1)
        );
    }
    s
}

/// The report as text.
pub fn probe_text(r: &ProbeReport, look: &Look) -> String {
    let mut s = test_section(r, look);
    if !r.points.is_empty() {
        if !s.is_empty() {
            s += "\n";
        }
        s += &sweep_section(r, look);
    }
    if !r.warnings.is_empty() {
        s += &format!("\n{}\n", look.heading("Warnings"));
        for w in &r.warnings {
            let mark = format!("  {} ", look.mark("!", false));
            s += &super::wrap(&words::warning(w), look.width, &mark, "    ");
        }
    }
    s += "\n";
    s += &super::wrap("Caution: power probe tests only through a fuse and a current limit (series lamp or isolating variable transformer); remove a microwave-oven donor's high-voltage winding first; keep one hand away.", look.width, "", "  ");
    s
}

/// The sweep as a log-log SVG chart the way an excitation curve is drawn: exciting current across,
/// winding volts up, with the peak flux density those volts mean on a second scale at the right;
/// both knees and the recommended operating point as horizontal lines.
pub fn sweep_chart(run: &ProbeReport) -> String {
    use super::svg::{chart, Chart, Marker, Scale, Series};
    let vpt = run
        .points
        .first()
        .map(|p| p.volts / p.flux_t)
        .unwrap_or(1.0);
    let tesla_per_volt = Some(1.0 / vpt).filter(|k| k.is_finite() && *k > 0.0);
    let mut markers = Vec::new();
    if let (Some(v), Some(b)) = (run.knee_volts, run.knee_flux_t) {
        markers.push(Marker {
            x: v,
            horizontal: true,
            label: format!("IEC knee {v:.1} V, {b:.2} T"),
            dash: "8 4",
        });
    }
    if let (Some(v), Some(b)) = (run.tangent_volts, run.tangent_flux_t) {
        markers.push(Marker {
            x: v,
            horizontal: true,
            label: format!("45° tangent {v:.1} V, {b:.2} T"),
            dash: "2 3",
        });
    }
    if let Some(b) = run.recommended_flux_t {
        markers.push(Marker {
            x: b * vpt,
            horizontal: true,
            label: format!("recommended max {b:.2} T"),
            dash: "",
        });
    }
    chart(&Chart {
        title: format!(
            "Magnetisation sweep, {} turns, {} Hz",
            run.sweep_turns.unwrap_or(0),
            run.frequency_hz
        ),
        x_label: "exciting current (A RMS), log scale".into(),
        y_label: "winding voltage (V RMS), log scale".into(),
        y2_label: tesla_per_volt.map(|_| "peak flux density (T)".into()),
        y2_mirror: tesla_per_volt,
        x_scale: Scale::Log,
        y_scale: Scale::Log,
        series: vec![Series {
            label: "measured".into(),
            points: run.points.iter().map(|p| (p.amps, p.volts)).collect(),
            dots: true,
            dash: "",
            colour: "#1f4e79",
            right_axis: false,
        }],
        markers,
    })
}
