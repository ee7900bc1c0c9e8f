//! Small SVG charts: axes with ticks and unit labels, linear or logarithmic, lines, points and
//! labelled markers. Self-contained, no fonts beyond the generic families, greyscale-safe (markers
//! differ by shape and dash, not colour alone).

use std::fmt::Write as _;

/// An axis scale.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Scale {
    /// Linear.
    Linear,
    /// Base-10 logarithmic.
    Log,
}

/// A series of points joined by a line (and optionally dotted at each point).
#[derive(Debug, Clone)]
pub struct Series {
    /// Legend text.
    pub label: String,
    /// Points (x, y).
    pub points: Vec<(f64, f64)>,
    /// Draw a dot at each point.
    pub dots: bool,
    /// Dash pattern ("" for solid).
    pub dash: &'static str,
    /// Stroke colour.
    pub colour: &'static str,
    /// Plot against the right-hand axis.
    pub right_axis: bool,
}

/// A vertical marker line at an x value with a label.
#[derive(Debug, Clone)]
pub struct Marker {
    /// x position.
    pub x: f64,
    /// Label.
    pub label: String,
    /// Dash pattern.
    pub dash: &'static str,
}

/// A chart.
#[derive(Debug, Clone)]
pub struct Chart {
    /// Title.
    pub title: String,
    /// x axis label with unit.
    pub x_label: String,
    /// y axis label with unit.
    pub y_label: String,
    /// Right y axis label, if any series uses it.
    pub y2_label: Option<String>,
    /// x scale.
    pub x_scale: Scale,
    /// y scale.
    pub y_scale: Scale,
    /// Series.
    pub series: Vec<Series>,
    /// Markers.
    pub markers: Vec<Marker>,
}

const W: f64 = 720.0;
const H: f64 = 480.0;
const L: f64 = 80.0;
const R: f64 = 80.0;
const T: f64 = 50.0;
const B: f64 = 70.0;

/// Escapes text for XML.
pub fn esc(s: &str) -> String {
    s.replace('&', "&amp;")
        .replace('<', "&lt;")
        .replace('>', "&gt;")
        .replace('"', "&quot;")
}

struct Axis {
    scale: Scale,
    lo: f64,
    hi: f64,
}

impl Axis {
    fn new(scale: Scale, values: impl Iterator<Item = f64>, from_zero: bool) -> Axis {
        let vals: Vec<f64> = values
            .filter(|v| v.is_finite() && (scale == Scale::Linear || *v > 0.0))
            .collect();
        let (mut lo, mut hi) = vals
            .iter()
            .fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), &v| {
                (a.min(v), b.max(v))
            });
        if !lo.is_finite() || !hi.is_finite() {
            lo = 1.0;
            hi = 10.0;
        }
        match scale {
            Scale::Log => {
                lo /= 1.25;
                hi *= 1.25;
                if hi <= lo * 2.0 {
                    hi = lo * 2.0;
                }
            }
            Scale::Linear => {
                if from_zero && lo > 0.0 {
                    lo = 0.0;
                }
                if hi <= lo {
                    hi = lo + 1.0;
                }
                let step = nice_step((hi - lo) / 5.0);
                lo = (lo / step).floor() * step;
                hi = (hi / step).ceil() * step;
            }
        }
        Axis { scale, lo, hi }
    }
    fn frac(&self, v: f64) -> f64 {
        match self.scale {
            Scale::Linear => (v - self.lo) / (self.hi - self.lo),
            Scale::Log => {
                (v.max(1e-300).log10() - self.lo.log10()) / (self.hi.log10() - self.lo.log10())
            }
        }
    }
    fn ticks(&self) -> Vec<f64> {
        match self.scale {
            Scale::Log => {
                // 1-2-5 ticks inside the range; only decades when the range spans many.
                let decades = (self.hi / self.lo).log10();
                let mults: &[f64] = if decades > 4.0 {
                    &[1.0]
                } else {
                    &[1.0, 2.0, 5.0]
                };
                let mut t = Vec::new();
                let mut p = 10f64.powf(self.lo.log10().floor());
                if !(p.is_finite() && p > 0.0) {
                    return t;
                }
                // At most a double's range of decades, whatever the values.
                let mut decade = 0;
                while p <= self.hi && t.len() < 40 && decade < 700 {
                    decade += 1;
                    for m in mults {
                        let v = p * m;
                        if v >= self.lo && v <= self.hi {
                            t.push(v);
                        }
                    }
                    p *= 10.0;
                }
                t
            }
            Scale::Linear => {
                let step = nice_step((self.hi - self.lo) / 5.0);
                let mut t = Vec::new();
                let mut v = self.lo;
                while v <= self.hi + step * 1e-6 && t.len() < 40 {
                    t.push(v);
                    v += step;
                }
                t
            }
        }
    }
}

fn nice_step(raw: f64) -> f64 {
    if !(raw.is_finite() && raw > 0.0) {
        return 1.0;
    }
    let p = 10f64.powf(raw.log10().floor());
    let m = raw / p;
    let n = if m <= 1.0 {
        1.0
    } else if m <= 2.0 {
        2.0
    } else if m <= 5.0 {
        5.0
    } else {
        10.0
    };
    n * p
}

fn tick_label(v: f64) -> String {
    let a = v.abs();
    if a == 0.0 {
        "0".into()
    } else if !(0.01..1000.0).contains(&a) {
        format!("{v:.0e}")
    } else if a >= 10.0 {
        format!("{v:.0}")
    } else if a >= 1.0 {
        format!("{v:.1}")
    } else {
        format!("{v:.2}")
    }
}

/// Draws a chart as a standalone SVG document.
pub fn chart(c: &Chart) -> String {
    let x = Axis::new(
        c.x_scale,
        c.series
            .iter()
            .flat_map(|s| s.points.iter().map(|p| p.0))
            .chain(c.markers.iter().map(|m| m.x)),
        false,
    );
    let y = Axis::new(
        c.y_scale,
        c.series
            .iter()
            .filter(|s| !s.right_axis)
            .flat_map(|s| s.points.iter().map(|p| p.1)),
        true,
    );
    let y2 = Axis::new(
        Scale::Linear,
        c.series
            .iter()
            .filter(|s| s.right_axis)
            .flat_map(|s| s.points.iter().map(|p| p.1)),
        true,
    );
    let pl = Plot { x, y, y2 };
    let mut s = String::new();
    let _ = write!(
        s,
        r#"<svg xmlns="http://www.w3.org/2000/svg" width="{W}" height="{H}" viewBox="0 0 {W} {H}" font-family="sans-serif" font-size="12">"#
    );
    let _ = write!(
        s,
        r#"<rect x="0" y="0" width="{W}" height="{H}" fill="white"/>"#
    );
    let _ = write!(
        s,
        r#"<text x="{}" y="28" text-anchor="middle" font-size="15" font-weight="bold">{}</text>"#,
        W / 2.0,
        esc(&c.title)
    );
    let _ = write!(
        s,
        r#"<g class="axes" stroke="black" fill="none"><rect x="{L}" y="{T}" width="{}" height="{}"/></g>"#,
        W - L - R,
        H - T - B
    );
    axes(&mut s, c, &pl);
    series(&mut s, c, &pl);
    markers(&mut s, c, &pl);
    s += "</svg>\n";
    s
}

/// The three axes of a chart and how a value maps to the page.
struct Plot {
    x: Axis,
    y: Axis,
    y2: Axis,
}

const PW: f64 = W - L - R;
const PH: f64 = H - T - B;

impl Plot {
    fn px(&self, v: f64) -> f64 {
        L + self.x.frac(v).clamp(-0.05, 1.05) * PW
    }
    fn py(&self, a: &Axis, v: f64) -> f64 {
        T + PH - a.frac(v).clamp(-0.05, 1.05) * PH
    }
}

/// Grid lines, tick labels and axis labels.
fn axes(s: &mut String, c: &Chart, pl: &Plot) {
    let (pw, ph) = (PW, PH);
    let (x, y, y2) = (&pl.x, &pl.y, &pl.y2);
    let px = |v: f64| pl.px(v);
    let py = |a: &Axis, v: f64| pl.py(a, v);
    for t in x.ticks() {
        let xp = px(t);
        let _ = write!(
            s,
            r##"<line x1="{xp:.1}" y1="{T}" x2="{xp:.1}" y2="{:.1}" stroke="#ddd"/>"##,
            T + ph
        );
        let _ = write!(
            s,
            r#"<text x="{xp:.1}" y="{:.1}" text-anchor="middle">{}</text>"#,
            T + ph + 16.0,
            tick_label(t)
        );
    }
    for t in y.ticks() {
        let yp = py(y, t);
        let _ = write!(
            s,
            r##"<line x1="{L}" y1="{yp:.1}" x2="{:.1}" y2="{yp:.1}" stroke="#ddd"/>"##,
            L + pw
        );
        let _ = write!(
            s,
            r#"<text x="{:.1}" y="{:.1}" text-anchor="end">{}</text>"#,
            L - 6.0,
            yp + 4.0,
            tick_label(t)
        );
    }
    if let Some(lbl) = &c.y2_label {
        for t in y2.ticks() {
            let yp = py(y2, t);
            let _ = write!(
                s,
                r#"<text x="{:.1}" y="{:.1}" text-anchor="start">{}</text>"#,
                L + pw + 6.0,
                yp + 4.0,
                tick_label(t)
            );
        }
        let _ = write!(
            s,
            r#"<text class="axis-label" x="{:.1}" y="{:.1}" text-anchor="middle" transform="rotate(90 {:.1} {:.1})">{}</text>"#,
            W - 20.0,
            T + ph / 2.0,
            W - 20.0,
            T + ph / 2.0,
            esc(lbl)
        );
    }
    let _ = write!(
        s,
        r#"<text class="axis-label" x="{:.1}" y="{:.1}" text-anchor="middle">{}</text>"#,
        L + pw / 2.0,
        H - 30.0,
        esc(&c.x_label)
    );
    let _ = write!(
        s,
        r#"<text class="axis-label" x="20" y="{:.1}" text-anchor="middle" transform="rotate(-90 20 {:.1})">{}</text>"#,
        T + ph / 2.0,
        T + ph / 2.0,
        esc(&c.y_label)
    );
}

/// Each series as a line, dots and a legend entry.
fn series(s: &mut String, c: &Chart, pl: &Plot) {
    let (y, y2) = (&pl.y, &pl.y2);
    let px = |v: f64| pl.px(v);
    let py = |a: &Axis, v: f64| pl.py(a, v);
    for (k, se) in c.series.iter().enumerate() {
        let a = if se.right_axis { y2 } else { y };
        let pts: Vec<String> = se
            .points
            .iter()
            .filter(|p| p.0.is_finite() && p.1.is_finite())
            .map(|&(vx, vy)| format!("{:.1},{:.1}", px(vx), py(a, vy)))
            .collect();
        let dash = if se.dash.is_empty() {
            String::new()
        } else {
            format!(r#" stroke-dasharray="{}""#, se.dash)
        };
        let _ = write!(
            s,
            r#"<polyline class="series" fill="none" stroke="{}" stroke-width="2"{dash} points="{}"/>"#,
            se.colour,
            pts.join(" ")
        );
        if se.dots {
            for p in &pts {
                if let Some((a1, b1)) = p.split_once(',') {
                    let _ = write!(
                        s,
                        r#"<circle cx="{a1}" cy="{b1}" r="3" fill="{}"/>"#,
                        se.colour
                    );
                }
            }
        }
        let ly = T + 16.0 + 16.0 * k as f64;
        let _ = write!(
            s,
            r#"<line x1="{:.1}" y1="{ly:.1}" x2="{:.1}" y2="{ly:.1}" stroke="{}" stroke-width="2"{dash}/><text x="{:.1}" y="{:.1}">{}</text>"#,
            L + 10.0,
            L + 34.0,
            se.colour,
            L + 40.0,
            ly + 4.0,
            esc(&se.label)
        );
    }
}

/// Vertical markers with their legend entries.
fn markers(s: &mut String, c: &Chart, pl: &Plot) {
    let ph = PH;
    let px = |v: f64| pl.px(v);
    let n_series = c.series.len();
    for (k, m) in c.markers.iter().enumerate() {
        let xp = px(m.x);
        let ly = T + 16.0 + 16.0 * (n_series + k) as f64;
        let _ = write!(
            s,
            r#"<g class="marker"><line x1="{xp:.1}" y1="{T}" x2="{xp:.1}" y2="{:.1}" stroke="black" stroke-width="1.5" stroke-dasharray="{}"/><line x1="{:.1}" y1="{ly:.1}" x2="{:.1}" y2="{ly:.1}" stroke="black" stroke-width="1.5" stroke-dasharray="{}"/><text x="{:.1}" y="{:.1}">{}</text></g>"#,
            T + ph,
            m.dash,
            L + 10.0,
            L + 34.0,
            m.dash,
            L + 40.0,
            ly + 4.0,
            esc(&m.label)
        );
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn steps_are_nice() {
        assert_eq!(nice_step(0.37), 0.5);
        assert_eq!(nice_step(130.0), 200.0);
    }

    #[test]
    fn chart_has_axes_and_escapes_text() {
        let c = Chart {
            title: "a < b & c".into(),
            x_label: "volts (V)".into(),
            y_label: "amps (A)".into(),
            y2_label: None,
            x_scale: Scale::Log,
            y_scale: Scale::Log,
            series: vec![Series {
                label: "s".into(),
                points: vec![(1.0, 0.1), (10.0, 1.0)],
                dots: true,
                dash: "",
                colour: "black",
                right_axis: false,
            }],
            markers: vec![Marker {
                x: 3.0,
                label: "knee".into(),
                dash: "6 3",
            }],
        };
        let svg = chart(&c);
        assert!(svg.contains("a &lt; b &amp; c"));
        assert!(svg.contains("volts (V)") && svg.contains("class=\"marker\""));
    }
}
