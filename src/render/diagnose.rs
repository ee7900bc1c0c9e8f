//! `ironwind diagnose`: what the readings say, as text or JSON (`findings[]` with `kind`,
//! `winding`, `turns`, `size`, `evidence` and `fix`).

use super::{num, sig3, Format, Look};
use crate::diagnose::{Diagnosis, Evidence, Finding, FindingKind};
use serde::Serialize;
use std::io::Write;

#[derive(Serialize)]
struct FindingJson<'a> {
    rank: usize,
    kind: &'static str,
    winding: &'a str,
    turns: Option<u32>,
    size: Option<&'a str>,
    evidence: String,
    fix: String,
}

#[derive(Serialize)]
struct DiagnosisJson<'a> {
    job: &'a str,
    applied_volts: f64,
    temperature_c: f64,
    volts_per_turn: f64,
    findings: Vec<FindingJson<'a>>,
}

/// Writes the diagnosis in a format: text or JSON.
pub fn write(
    out: &mut dyn Write,
    d: &Diagnosis,
    format: Format,
    look: &Look,
) -> std::io::Result<()> {
    if format == Format::Json {
        return super::json::write_json(
            out,
            &DiagnosisJson {
                job: &d.job,
                applied_volts: d.measured.applied_volts,
                temperature_c: d.measured.temperature_c,
                volts_per_turn: d.volts_per_turn,
                findings: d
                    .findings
                    .iter()
                    .enumerate()
                    .map(|(k, f)| FindingJson {
                        rank: k + 1,
                        kind: f.kind.key(),
                        winding: &f.winding,
                        turns: f.turns,
                        size: f.size.as_deref(),
                        evidence: evidence(f),
                        fix: fix(f),
                    })
                    .collect(),
            },
        );
    }
    let mut s = format!(
        "{}\n",
        look.heading(&format!("ironwind diagnose: {}", d.job))
    );
    s += &super::wrap(
        &format!(
            "readings at {} V on the primary, resistances at {} °C (corrected to 20 °C, IEC 60028)",
            num(d.measured.applied_volts, 1),
            num(d.measured.temperature_c, 0)
        ),
        look.width,
        "",
        "  ",
    );
    s += "\n";
    let mut rows = vec![vec![
        "#".to_string(),
        "finding".into(),
        "winding".into(),
        "evidence".into(),
        "what to do".into(),
    ]];
    for (k, f) in d.findings.iter().enumerate() {
        rows.push(vec![
            (k + 1).to_string(),
            look.mark(f.kind.key(), f.kind == FindingKind::AsPlanned),
            f.winding.clone(),
            evidence(f),
            fix(f),
        ]);
    }
    if d.findings.is_empty() {
        s += "no readings to compare: give volts or ohms of a winding, or idle watts\n";
    } else {
        s += &super::wrap_table(rows, look);
    }
    s += "\n";
    s += &super::wrap(
        &format!(
            "volts per turn these readings imply: {} V{}",
            num(d.volts_per_turn, 4),
            if look.quiet {
                ""
            } else {
                " (keep it on the shelf with `--record ID`)"
            }
        ),
        look.width,
        "",
        "  ",
    );
    out.write_all(look.finish(s).as_bytes())
}

/// The evidence of a finding, in one sentence.
pub fn evidence(f: &Finding) -> String {
    match &f.evidence {
        Evidence::AsPlanned {
            volts_pct,
            ohms_pct,
            tolerances,
        } => {
            let mut parts = Vec::new();
            if let Some(v) = volts_pct {
                parts.push(format!("volts {v:+.1} % (meter ±{:.0} %)", tolerances.0));
            }
            if let Some(r) = ohms_pct {
                parts.push(format!("ohms {r:+.1} % at 20 °C (±{:.0} %)", tolerances.1));
            }
            format!("within the meter's tolerance: {}", parts.join(", "))
        }
        Evidence::Turns {
            measured_volts,
            expected_volts,
            estimated,
            planned,
            all_outputs,
            ohms_agree,
            alternative,
            ..
        } => {
            let mut s = format!(
                "reads {} V where {} V was expected: about {} turns where {planned} were planned",
                num(*measured_volts, 2),
                num(*expected_volts, 2),
                num(*estimated, 1)
            );
            if *all_outputs {
                s += "; every output is off by the same ratio, so the primary is";
            }
            match ohms_agree {
                Some(true) => s += "; its resistance agrees",
                Some(false) => s += "; its resistance does not agree",
                None => {}
            }
            if *alternative {
                s += "; with one output a miscount of either winding reads the same";
            }
            s
        }
        Evidence::Wire {
            r20,
            expected,
            planned,
            fits,
        } => format!(
            "{} Ω at 20 °C where {} Ω was expected with {planned}: the resistance fits {fits}",
            sig3(*r20),
            sig3(*expected)
        ),
        Evidence::ShortedTurn {
            measured,
            predicted,
            watts,
        } => format!(
            "idle {} {} against about {} {} predicted (× {}): a shorted turn, or laminations shorted together or a gap in the stack",
            sig3(*measured),
            if *watts { "W" } else { "A" },
            sig3(*predicted),
            if *watts { "W" } else { "A" },
            num(measured / predicted, 1)
        ),
        Evidence::Reversed {
            measured_volts,
            expected_volts,
            sections,
            reversed,
        } => format!(
            "{} V end to end where {} V was expected: {reversed} of {sections} halves or sections joined the wrong way round",
            num(*measured_volts, 2),
            num(*expected_volts, 2)
        ),
        Evidence::Unknown {
            measured_volts,
            expected_volts,
        } => format!(
            "reads {} V where {} V was expected: nothing the plan explains (a broken lead, an open joint, the wrong winding on the meter)",
            num(*measured_volts, 2),
            num(*expected_volts, 2)
        ),
    }
}

/// What to do about a finding.
pub fn fix(f: &Finding) -> String {
    let name = &f.winding;
    match &f.evidence {
        Evidence::AsPlanned { .. } => "nothing".to_string(),
        Evidence::Turns {
            estimated,
            planned,
            turns_per_layer,
            ..
        } => {
            let k = (estimated - *planned as f64).round() as i64;
            let layer = if *turns_per_layer > 0 && k.unsigned_abs() as u32 == *turns_per_layer {
                " (a whole layer)"
            } else {
                ""
            };
            if k > 0 {
                format!("about {k} turns over{layer}: unwind {k} turns from the outer layer of \"{name}\"")
            } else if k < 0 {
                format!("about {} turns short{layer}: add {} turns to \"{name}\" in the same direction", -k, -k)
            } else {
                format!("within a turn of plan on \"{name}\": check the meter and the applied volts")
            }
        }
        Evidence::Wire { fits, .. } => format!(
            "\"{name}\" seems wound with {fits}: rewind it with the planned wire, or plan again with size = \"{fits}\" to see what it does"
        ),
        Evidence::ShortedTurn { .. } => {
            "switch off: find the hot spot after a minute on the lamp; unwind and look for damaged enamel, and check the laminations are insulated and the stack complete".to_string()
        }
        Evidence::Reversed { .. } => format!(
            "swap the two leads of one half or section of \"{name}\" at its joint (the centre tap or the link)"
        ),
        Evidence::Unknown { .. } => format!(
            "check the leads and joints of \"{name}\" with the ohmmeter before anything else"
        ),
    }
}

/// The dated note `diagnose --record` keeps on the shelf.
pub fn shelf_note(date: &str, d: &Diagnosis) -> String {
    let kinds: Vec<String> = d
        .findings
        .iter()
        .filter(|f| f.kind != FindingKind::AsPlanned)
        .map(|f| format!("{} {}", f.kind.key(), f.winding))
        .collect();
    format!(
        "measured {date}: {} V per turn at {} V ({}){}",
        num(d.volts_per_turn, 4),
        num(d.measured.applied_volts, 1),
        d.job,
        if kinds.is_empty() {
            ", as planned".to_string()
        } else {
            format!(", found {}", kinds.join(", "))
        }
    )
}
