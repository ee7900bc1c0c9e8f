//! Units at the edges: lengths typed by a person, in millimetres or inches.
//!
//! Inside ironwind every quantity is SI or millimetres, with the unit in the field name
//! (`tongue_mm`, `flux_density_t`). A person with an imperial rule may write a length as a string
//! with its unit: `"1.25 in"`, `"31.75 mm"`, `"3.2 cm"`. The inch is exactly 25.4 mm (the 1959
//! international yard and pound agreement; SI Brochure, 9th edition, table 8 lists non-SI units).

use serde::de::{self, Deserializer, Visitor};
use serde::Deserialize;
use std::fmt;

/// Millimetres in one inch, exact by definition.
pub const MM_PER_INCH: f64 = 25.4;

/// A length as a person typed it, with its value in millimetres.
#[derive(Debug, Clone, PartialEq)]
pub struct LengthInput {
    /// The value in millimetres.
    pub mm: f64,
    /// The text as typed (a bare number is kept as its decimal text).
    pub text: String,
}

/// Parses `"31.75"`, `"31.75 mm"`, `"1.25 in"`, `"1.25\""`, `"3.2 cm"` or `"0.05 m"` into millimetres.
///
/// A comma as the decimal mark, an unknown unit or a value that is not finite is refused with a
/// sentence saying what is accepted.
pub fn parse_length_mm(text: &str) -> Result<f64, String> {
    const ACCEPTED: &str =
        "a number of millimetres, or a number with a unit: mm, cm, m, in (\"1.25 in\", \"1 1/4 in\", \"3/4\\\"\")";
    let t = text.trim();
    if t.is_empty() {
        return Err(format!("empty length; expected {ACCEPTED}"));
    }
    if let Some(inches) = fractional_inches(t) {
        return Ok(inches * MM_PER_INCH);
    }
    let split = t
        .find(|c: char| {
            !(c.is_ascii_digit() || c == '.' || c == '-' || c == '+' || c == 'e' || c == 'E')
        })
        .unwrap_or(t.len());
    // "e" may begin a unit name only if nothing numeric follows; no unit here starts with e.
    let (num, unit) = t.split_at(split);
    let num = num.trim();
    let unit = unit.trim();
    if num.is_empty() {
        return Err(format!("no number; expected {ACCEPTED}"));
    }
    let value: f64 = num
        .parse()
        .map_err(|_| format!("`{num}` is not a number; expected {ACCEPTED}"))?;
    if !value.is_finite() {
        return Err(format!("not a finite number; expected {ACCEPTED}"));
    }
    let factor = match unit.to_ascii_lowercase().as_str() {
        "" | "mm" => 1.0,
        "cm" => 10.0,
        "m" => 1000.0,
        "in" | "inch" | "inches" | "\"" => MM_PER_INCH,
        other => {
            let hint =
                crate::input::did_you_mean(other, &["mm", "cm", "m", "in", "inch", "inches"])
                    .map(|k| format!(" (did you mean `{k}`?)"))
                    .unwrap_or_default();
            return Err(format!("unknown unit `{other}`{hint}; expected {ACCEPTED}"));
        }
    };
    Ok(value * factor)
}

/// Inches written the way a US rule reads: `"1 1/4 in"`, `"1-1/4 in"`, `"3/4\""`, `"3/4 inch"`.
/// None when the text has no fraction.
fn fractional_inches(t: &str) -> Option<f64> {
    let lower = t.to_ascii_lowercase();
    let body = ["inches", "inch", "in", "\""]
        .iter()
        .find_map(|u| lower.strip_suffix(u))?
        .trim();
    let (whole, frac) = match body.rsplit_once([' ', '-']) {
        Some((w, f)) if f.contains('/') => (w.trim(), f.trim()),
        _ if body.contains('/') => ("0", body),
        _ => return None,
    };
    let (num, den) = frac.split_once('/')?;
    let (num, den): (u32, u32) = (num.trim().parse().ok()?, den.trim().parse().ok()?);
    let whole: u32 = whole.parse().ok()?;
    (den > 0 && num < den && den <= 128).then(|| whole as f64 + num as f64 / den as f64)
}

impl<'de> Deserialize<'de> for LengthInput {
    fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        struct V;
        impl Visitor<'_> for V {
            type Value = LengthInput;
            fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
                f.write_str(
                    "a length: a number of mm, or a string like \"1.25 in\" or \"31.75 mm\"",
                )
            }
            fn visit_f64<E: de::Error>(self, v: f64) -> Result<LengthInput, E> {
                Ok(LengthInput {
                    mm: v,
                    text: format!("{v}"),
                })
            }
            fn visit_i64<E: de::Error>(self, v: i64) -> Result<LengthInput, E> {
                Ok(LengthInput {
                    mm: v as f64,
                    text: format!("{v}"),
                })
            }
            fn visit_u64<E: de::Error>(self, v: u64) -> Result<LengthInput, E> {
                Ok(LengthInput {
                    mm: v as f64,
                    text: format!("{v}"),
                })
            }
            fn visit_str<E: de::Error>(self, v: &str) -> Result<LengthInput, E> {
                parse_length_mm(v)
                    .map(|mm| LengthInput {
                        mm,
                        text: v.trim().to_string(),
                    })
                    .map_err(|m| E::custom(format!("`{v}`: {m}")))
            }
        }
        d.deserialize_any(V)
    }
}

/// Parses a window given as `WxH` in millimetres (`16x48`, `19 x 57`, `0.75inx2.25in`).
pub fn parse_window(text: &str) -> Result<(f64, f64), String> {
    let lower = text.to_ascii_lowercase();
    let parts: Vec<&str> = lower.split(['x', '×']).map(str::trim).collect();
    // "0.75inx2.25in" splits cleanly; "in" contains no x.
    if parts.len() != 2 {
        return Err("expected WIDTHxHEIGHT in mm, like 16x48".to_string());
    }
    let w = parse_length_mm(parts[0])?;
    let h = parse_length_mm(parts[1])?;
    Ok((w, h))
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    /// Tolerance for exact unit conversions.
    const EXACT: f64 = 1e-12;

    #[track_caller]
    fn case(text: &str, mm: f64) {
        let got = parse_length_mm(text).expect("parses");
        assert_relative_eq!(got, mm, max_relative = EXACT);
    }

    #[test]
    fn inch_is_25_4_mm_by_definition() {
        // International yard and pound agreement (1959): 1 in = 25.4 mm exactly.
        case("1.25 in", 31.75);
        case("1.25in", 31.75);
        case("2\"", 50.8);
        case("31.75 mm", 31.75);
        case("3.2 cm", 32.0);
        case("0.05 m", 50.0);
        case("  40 ", 40.0);
    }

    #[test]
    fn refuses_what_a_person_may_mistype() {
        assert!(parse_length_mm("1,25 mm").is_err());
        assert!(parse_length_mm("12 furlongs").is_err());
        assert!(parse_length_mm("").is_err());
        assert!(parse_length_mm("mm").is_err());
        assert!(parse_length_mm("inf mm").is_err());
    }

    #[test]
    fn window_pairs() {
        assert_eq!(parse_window("16x48"), Ok((16.0, 48.0)));
        assert_eq!(parse_window("19 X 57"), Ok((19.0, 57.0)));
        let (w, h) = parse_window("0.75inx2.25in").expect("parses");
        assert_relative_eq!(w, 19.05, max_relative = EXACT);
        assert_relative_eq!(h, 57.15, max_relative = EXACT);
        assert!(parse_window("16").is_err());
    }
}

#[cfg(test)]
mod fraction_tests {
    use super::*;

    #[test]
    fn fractional_inches_as_a_us_rule_reads_them() {
        // 1 1/4 in = 1.25 in = 31.75 mm exactly (the inch is 25.4 mm by definition).
        for (text, mm) in [
            ("1 1/4 in", 31.75),
            ("1-1/4 in", 31.75),
            ("3/4\"", 19.05),
            ("3/4 inch", 19.05),
            ("2 1/2 inches", 63.5),
        ] {
            let got = parse_length_mm(text).expect(text);
            assert!((got - mm).abs() < 1e-9, "{text}: {got}");
        }
        assert!(
            parse_length_mm("5/4 in").is_err(),
            "an improper fraction is refused"
        );
        let e = parse_length_mm("12 furlongs").expect_err("unknown");
        assert!(e.contains("unknown unit"), "{e}");
        let e = parse_length_mm("12 inc").expect_err("close");
        assert!(e.contains("did you mean `in"), "{e}");
    }
}
