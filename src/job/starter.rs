//! A new job file written from a few answers (`ironwind new`): the core, the supply and each
//! winding, with every optional key present as a comment that names its unit and default, so the
//! file is its own first reference. The text is checked by parsing it back ([`super::parse_job`])
//! before it is written anywhere.

use crate::geometry::Shape;
use crate::wire::System;

/// One output winding of a new job.
#[derive(Debug, Clone, PartialEq)]
pub struct StarterOutput {
    /// The winding's name.
    pub name: String,
    /// RMS volts at full load.
    pub volts: f64,
    /// RMS amperes at full load.
    pub amps: f64,
    /// A centre tap (two halves, each `volts`).
    pub centre_tap: bool,
}

/// The answers a new job is written from. Lengths are millimetres; `typed_*` keep what the person
/// typed ("1.25 in") for a comment beside the converted number.
#[derive(Debug, Clone, PartialEq)]
pub struct Starter {
    /// The job's name.
    pub name: String,
    /// Lamination shape.
    pub shape: Shape,
    /// Tongue width, mm, and as typed.
    pub tongue_mm: (f64, String),
    /// Stack depth, mm, and as typed.
    pub stack_mm: (f64, String),
    /// Window width and height, mm, and as typed.
    pub window_mm: (f64, f64, String),
    /// Steel: "unknown", "non-oriented", "grain-oriented" or a grade.
    pub steel: String,
    /// Supply frequency, Hz.
    pub frequency_hz: f64,
    /// "sine", "square" or "quasi-square".
    pub waveform: String,
    /// Primary volts (RMS; the amplitude for square drives).
    pub primary_volts: f64,
    /// A centre-tapped (push-pull) primary.
    pub primary_centre_tap: bool,
    /// The outputs, innermost first after the primary.
    pub outputs: Vec<StarterOutput>,
    /// Wire table for automatic choices.
    pub system: System,
}

/// A TOML basic string: quoted, with the characters TOML escapes escaped.
fn quoted(s: &str) -> String {
    let mut out = String::with_capacity(s.len() + 2);
    out.push('"');
    for ch in s.chars() {
        match ch {
            '"' => out.push_str("\\\""),
            '\\' => out.push_str("\\\\"),
            '\n' => out.push_str("\\n"),
            '\t' => out.push_str("\\t"),
            '\r' => out.push_str("\\r"),
            c if c.is_control() => out.push_str(&format!("\\u{:04X}", c as u32)),
            c => out.push(c),
        }
    }
    out.push('"');
    out
}

/// A number as short as it reads (no trailing zeros), always valid TOML.
fn num(v: f64) -> String {
    let s = format!("{v:.4}");
    let s = s.trim_end_matches('0').trim_end_matches('.');
    if s.is_empty() || s == "-" {
        "0".into()
    } else {
        s.into()
    }
}

/// A length key: the millimetres, and what was typed when it was not plain millimetres.
fn length_line(key: &str, mm: f64, typed: &str) -> String {
    let typed = typed.trim();
    let plain = !typed.contains("in") && !typed.contains('"') && !typed.contains('\'');
    if plain || typed.is_empty() {
        format!("{key} = {}\n", num(mm))
    } else {
        format!(
            "{key} = {}   # typed {}\n",
            num(mm),
            quoted(typed).replace('\\', "/")
        )
    }
}

/// The job file's text.
pub fn starter_text(s: &Starter) -> String {
    let mut t = String::new();
    t.push_str("# A job for ironwind, written by `ironwind new`. Plan it with:\n");
    t.push_str(
        "#   ironwind plan THIS_FILE        (and `ironwind card THIS_FILE` for the bench card)\n",
    );
    t.push_str("# Every key, its unit, default and accepted range: docs/job-file.md.\n");
    t.push_str("# Lengths are millimetres, or a string with a unit: \"1.25 in\", \"1 1/4 in\".\n");
    t.push_str(
        "# Mains and inverter outputs can kill, and a microwave-oven core's own secondary\n",
    );
    t.push_str(
        "# is lethal: follow local codes and licensed practice. A plan is not a safety approval.\n",
    );
    t.push_str(&format!("name = {}\n\n", quoted(&s.name)));

    t.push_str("[core]\n");
    let shape = match s.shape {
        Shape::Ei => "ei",
        Shape::Ui => "ui",
    };
    t.push_str(&format!(
        "shape = \"{shape}\"            # \"ei\" or \"ui\"\n"
    ));
    t.push_str(&length_line("tongue_mm", s.tongue_mm.0, &s.tongue_mm.1));
    t.push_str(&length_line("stack_mm", s.stack_mm.0, &s.stack_mm.1));
    t.push_str(&length_line(
        "window_width_mm",
        s.window_mm.0,
        &s.window_mm.2,
    ));
    t.push_str(&length_line(
        "window_height_mm",
        s.window_mm.1,
        &s.window_mm.2,
    ));
    t.push_str(&format!(
        "steel = {}   # \"unknown\", \"non-oriented\", \"grain-oriented\" or a grade like \"M400-50A\"\n",
        quoted(&s.steel)
    ));
    t.push_str("# stacking_factor = 0.95     # net over gross iron\n");
    t.push_str("# bobbin_wall_mm = 1.5\n");
    t.push_str("# bobbin = \"single\"         # or \"split\" (two sections side by side)\n");
    t.push_str(
        "# mass_g = 0                 # the weighed core, grams (else from the outline)\n\n",
    );

    t.push_str("[supply]\n");
    t.push_str(&format!("frequency_hz = {}\n", num(s.frequency_hz)));
    t.push_str(&format!(
        "waveform = {}   # \"sine\", \"square\" or \"quasi-square\"\n\n",
        quoted(&s.waveform)
    ));

    t.push_str("[limits]\n");
    t.push_str("# flux_density_t = 1.3       # design peak flux, T (default: the steel's)\n");
    t.push_str("# current_density_a_mm2 = 3.0\n");
    t.push_str("# ambient_c = 30\n");
    t.push_str("# max_rise_c = 50\n");
    t.push_str("# insulation_class = \"B\"    # A, E, B, F or H\n\n");

    t.push_str("[wire]\n");
    let system = match s.system {
        System::Metric => "metric",
        System::Awg => "awg",
        System::Swg => "swg",
    };
    t.push_str(&format!(
        "system = \"{system}\"       # \"metric\", \"awg\" or \"swg\"\n"
    ));
    t.push_str("# max_strand_mm = 2.0        # thicker than this: parallel strands\n\n");

    t.push_str("# The windings, innermost first.\n");
    t.push_str("[[winding]]\nname = \"primary\"\nrole = \"primary\"\n");
    t.push_str(&format!("volts = {}\n", num(s.primary_volts)));
    if s.primary_centre_tap {
        t.push_str("centre_tap = true          # push-pull: two halves, each at these volts\n");
    }
    t.push('\n');
    for o in &s.outputs {
        t.push_str("[[winding]]\n");
        t.push_str(&format!(
            "name = {}\nrole = \"secondary\"\n",
            quoted(&o.name)
        ));
        t.push_str(&format!(
            "volts = {}\namps = {}\n",
            num(o.volts),
            num(o.amps)
        ));
        if o.centre_tap {
            t.push_str("centre_tap = true          # two halves, each at these volts\n");
        }
        t.push_str(
            "# taps_volts = []           # taps along the winding, volts from its start\n\n",
        );
    }
    t
}

#[cfg(test)]
mod tests {
    use super::*;

    fn starter() -> Starter {
        Starter {
            name: "bench \"test\" job".into(),
            shape: Shape::Ei,
            tongue_mm: (31.75, "1.25 in".into()),
            stack_mm: (40.0, "40".into()),
            window_mm: (16.0, 48.0, "16x48".into()),
            steel: "unknown".into(),
            frequency_hz: 50.0,
            waveform: "sine".into(),
            primary_volts: 230.0,
            primary_centre_tap: false,
            outputs: vec![StarterOutput {
                name: "out".into(),
                volts: 24.0,
                amps: 2.5,
                centre_tap: true,
            }],
            system: System::Metric,
        }
    }

    #[test]
    fn written_job_parses_back_to_the_answers() {
        let text = starter_text(&starter());
        let job = crate::job::parse_job(&text, "new", &|_| {
            Err(crate::error::Error::Failed("no sweep".into()))
        })
        .expect("parses");
        assert_eq!(job.name, "bench \"test\" job");
        approx::assert_relative_eq!(job.core.tongue_mm, 31.75, max_relative = 1e-9);
        approx::assert_relative_eq!(job.core.window_height_mm, 48.0, max_relative = 1e-9);
        assert_eq!(job.windings.len(), 2);
        assert!(text.contains("# typed \"1.25 in\""), "{text}");
    }

    #[test]
    fn numbers_are_short_and_valid() {
        assert_eq!(num(24.0), "24");
        assert_eq!(num(2.5), "2.5");
        assert_eq!(num(0.0), "0");
        assert_eq!(num(31.75), "31.75");
    }
}
