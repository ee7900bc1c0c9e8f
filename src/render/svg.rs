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

/// A marker line with a label: vertical at an x value, or horizontal at a y value.
#[derive(Debug, Clone)]
pub struct Marker {
    /// Position: an x value, or a y value (left axis) when `horizontal`.
    pub x: f64,
    /// A horizontal line at a y value.
    pub horizontal: bool,
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
    /// Right y axis label, if any series uses it (or it mirrors the left axis).
    pub y2_label: Option<String>,
    /// The right axis as the left one in other units: right value = left value × this factor
    /// (a sweep's volts read as tesla). Series then stay on the left axis.
    pub y2_mirror: Option<f64>,
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
    /// A linear axis's tick step.
    step: f64,
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
                return Axis {
                    scale,
                    lo,
                    hi,
                    step,
                };
            }
        }
        Axis {
            scale,
            lo,
            hi,
            step: 1.0,
        }
    }
    /// A linear axis from zero (or below) with exactly `intervals` nice steps, so its ticks fall
    /// on another axis's grid lines.
    fn aligned(values: impl Iterator<Item = f64>, intervals: usize) -> Axis {
        let n = intervals.max(1) as f64;
        let (mut lo, mut hi) = values
            .filter(|v| v.is_finite())
            .fold((0.0f64, f64::NEG_INFINITY), |(a, b), v| {
                (a.min(v), b.max(v))
            });
        if !hi.is_finite() || hi <= lo {
            hi = lo + 1.0;
        }
        let mut step = nice_step((hi - lo) / n);
        for _ in 0..60 {
            let start = (lo / step).floor() * step;
            if start + step * n >= hi {
                lo = start;
                break;
            }
            step = nice_step(step * 1.0001);
        }
        Axis {
            scale: Scale::Linear,
            lo,
            hi: lo + step * n,
            step,
        }
    }
    fn frac(&self, v: f64) -> f64 {
        match self.scale {
            Scale::Linear => (v - self.lo) / (self.hi - self.lo),
            Scale::Log => {
                (v.max(1e-300).log10() - self.lo.log10()) / (self.hi.log10() - self.lo.log10())
            }
        }
    }
    /// A log axis's ticks at the given multiples of each decade inside the range.
    fn log_ticks(&self, mults: &[f64]) -> Vec<f64> {
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
    fn ticks(&self) -> Vec<f64> {
        match self.scale {
            Scale::Log => {
                // Decades when the range spans many, else 1-2-5, else every digit; a range too
                // narrow for any of them gets evenly stepped ticks.
                let decades = (self.hi / self.lo).log10();
                let sets: [&[f64]; 3] = [
                    &[1.0],
                    &[1.0, 2.0, 5.0],
                    &[1.0, 2.0, 3.0, 4.0, 5.0, 6.0, 7.0, 8.0, 9.0],
                ];
                let first = if decades > 4.0 { 0 } else { 1 };
                for mults in &sets[first..] {
                    let t = self.log_ticks(mults);
                    if t.len() >= 3 {
                        return t;
                    }
                }
                let step = nice_step((self.hi - self.lo) / 4.0);
                let mut t = Vec::new();
                let mut v = (self.lo / step).ceil() * step;
                while v <= self.hi && t.len() < 40 {
                    t.push(v);
                    v += step;
                }
                t
            }
            Scale::Linear => {
                let step = self.step;
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

/// A tick label read back as a number ("250", "2.5×10^-7").
fn label_value(label: &str) -> Option<f64> {
    match label.split_once("×10^") {
        Some((m, e)) => Some(m.parse::<f64>().ok()? * 10f64.powi(e.parse().ok()?)),
        None => label.parse().ok(),
    }
}

/// Labels for a set of ticks: plain numbers from 0.001 to below a million, else a mantissa and a
/// power of ten; as few decimals as keep neighbouring labels apart (never "2e3, 2e3").
pub fn tick_labels(ticks: &[f64]) -> Vec<String> {
    let big = ticks.iter().map(|v| v.abs()).fold(0.0, f64::max);
    let small = ticks
        .iter()
        .map(|v| v.abs())
        .filter(|v| *v > 0.0)
        .fold(f64::INFINITY, f64::min);
    let sci = big >= 1e6 || small < 1e-3;
    let one = |v: f64, d: usize| -> String {
        if v == 0.0 {
            "0".into()
        } else if sci {
            let e = v.abs().log10().floor() as i32;
            let m = v / 10f64.powi(e);
            // A mantissa that rounds to 10 moves to the next power.
            let (m, e) = if format!("{:.*}", d, m.abs()).starts_with("10") {
                (m / 10.0, e + 1)
            } else {
                (m, e)
            };
            format!("{m:.d$}×10^{e}")
        } else {
            format!("{v:.d$}")
        }
    };
    // How near each tick's label must read: a hundredth of the gap to its nearest neighbour.
    let gap = |k: usize| -> f64 {
        let before = k.checked_sub(1).map(|j| (ticks[k] - ticks[j]).abs());
        let after = ticks.get(k + 1).map(|n| (n - ticks[k]).abs());
        match (before, after) {
            (Some(x), Some(y)) => x.min(y),
            (Some(x), None) | (None, Some(x)) => x,
            (None, None) => ticks[k].abs(),
        }
    };
    for d in 0..=8 {
        let labels: Vec<String> = ticks.iter().map(|&v| one(v, d)).collect();
        let distinct = labels.windows(2).all(|w| w[0] != w[1]);
        let faithful = labels.iter().enumerate().all(|(k, l)| {
            label_value(l).is_some_and(|x| (x - ticks[k]).abs() <= 0.01 * gap(k) + 1e-300)
        });
        if distinct && faithful {
            return labels;
        }
    }
    ticks.iter().map(|&v| one(v, 8)).collect()
}

/// Draws a chart as a standalone SVG document: the plot, its axes, and below them a legend that
/// never lies over the data.
pub fn chart(c: &Chart) -> String {
    let x = Axis::new(
        c.x_scale,
        c.series
            .iter()
            .flat_map(|s| s.points.iter().map(|p| p.0))
            .chain(c.markers.iter().filter(|m| !m.horizontal).map(|m| m.x)),
        false,
    );
    let y = Axis::new(
        c.y_scale,
        c.series
            .iter()
            .filter(|s| !s.right_axis || c.y2_mirror.is_some())
            .flat_map(|s| s.points.iter().map(|p| p.1))
            .chain(c.markers.iter().filter(|m| m.horizontal).map(|m| m.x)),
        true,
    );
    // A right axis of its own shares the left one's grid (when the left is linear).
    let right: Vec<f64> = c
        .series
        .iter()
        .filter(|s| s.right_axis)
        .flat_map(|s| s.points.iter().map(|p| p.1))
        .collect();
    let y2 = if y.scale == Scale::Linear {
        Axis::aligned(right.into_iter(), y.ticks().len().saturating_sub(1))
    } else {
        Axis::new(Scale::Linear, right.into_iter(), true)
    };
    let pl = Plot { x, y, y2 };
    let rows = c.series.len() + c.markers.len();
    let total_h = H + 8.0 + 16.0 * rows as f64;
    let mut s = String::new();
    let _ = write!(
        s,
        r#"<svg xmlns="http://www.w3.org/2000/svg" width="{W}" height="{total_h}" viewBox="0 0 {W} {total_h}" font-family="sans-serif" font-size="12">"#
    );
    let _ = write!(
        s,
        r#"<rect x="0" y="0" width="{W}" height="{total_h}" fill="white"/>"#
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

/// Legend row `k`'s baseline, below the x axis's label.
fn legend_y(k: usize) -> f64 {
    H + 4.0 + 16.0 * k as f64
}

/// Ticks of the right axis in its own units and where each sits on the page.
fn right_ticks(c: &Chart, pl: &Plot) -> Vec<(String, f64)> {
    match c.y2_mirror {
        Some(k) if k.is_finite() && k > 0.0 => {
            // The left axis's range in the right's units, ticked on its own nice values.
            let shown = Axis::new(pl.y.scale, [pl.y.lo * k, pl.y.hi * k].into_iter(), false);
            let ticks: Vec<f64> = shown
                .ticks()
                .into_iter()
                .filter(|t| *t >= pl.y.lo * k * (1.0 - 1e-9) && *t <= pl.y.hi * k * (1.0 + 1e-9))
                .collect();
            let labels = tick_labels(&ticks);
            ticks
                .iter()
                .zip(labels)
                .map(|(t, l)| (l, pl.py(&pl.y, t / k)))
                .collect()
        }
        _ => {
            let ticks = pl.y2.ticks();
            let labels = tick_labels(&ticks);
            ticks
                .iter()
                .zip(labels)
                .map(|(t, l)| (l, pl.py(&pl.y2, *t)))
                .collect()
        }
    }
}

/// Grid lines, tick labels and axis labels.
fn axes(s: &mut String, c: &Chart, pl: &Plot) {
    let (pw, ph) = (PW, PH);
    let (x, y) = (&pl.x, &pl.y);
    let xt = x.ticks();
    for (t, label) in xt.iter().zip(tick_labels(&xt)) {
        let xp = pl.px(*t);
        let _ = write!(
            s,
            r##"<line class="grid" x1="{xp:.1}" y1="{T}" x2="{xp:.1}" y2="{:.1}" stroke="#ddd"/>"##,
            T + ph
        );
        let _ = write!(
            s,
            r#"<text class="tick-x" x="{xp:.1}" y="{:.1}" text-anchor="middle">{label}</text>"#,
            T + ph + 16.0,
        );
    }
    let yt = y.ticks();
    for (t, label) in yt.iter().zip(tick_labels(&yt)) {
        let yp = pl.py(y, *t);
        let _ = write!(
            s,
            r##"<line class="grid" x1="{L}" y1="{yp:.1}" x2="{:.1}" y2="{yp:.1}" stroke="#ddd"/>"##,
            L + pw
        );
        let _ = write!(
            s,
            r#"<text class="tick-y" x="{:.1}" y="{:.1}" text-anchor="end">{label}</text>"#,
            L - 6.0,
            yp + 4.0,
        );
    }
    if let Some(lbl) = &c.y2_label {
        let own_grid = c.y2_mirror.is_some() || y.scale != Scale::Linear;
        for (label, yp) in right_ticks(c, pl) {
            if own_grid {
                // Ticks of their own: a short mark inside the frame at each.
                let _ = write!(
                    s,
                    r#"<line class="tick-mark" x1="{:.1}" y1="{yp:.1}" x2="{:.1}" y2="{yp:.1}" stroke="black"/>"#,
                    L + pw - 6.0,
                    L + pw
                );
            }
            let _ = write!(
                s,
                r#"<text class="tick-y2" data-y="{yp:.1}" x="{:.1}" y="{:.1}" text-anchor="start">{label}</text>"#,
                L + pw + 6.0,
                yp + 4.0,
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

/// Each series as a line and dots, and its legend entry below the plot.
fn series(s: &mut String, c: &Chart, pl: &Plot) {
    let (y, y2) = (&pl.y, &pl.y2);
    for (k, se) in c.series.iter().enumerate() {
        let a = if se.right_axis && c.y2_mirror.is_none() {
            y2
        } else {
            y
        };
        let pts: Vec<String> = se
            .points
            .iter()
            .filter(|p| p.0.is_finite() && p.1.is_finite())
            .map(|&(vx, vy)| format!("{:.1},{:.1}", pl.px(vx), pl.py(a, vy)))
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
        let ly = legend_y(k);
        let _ = write!(
            s,
            r#"<g class="legend"><line x1="{:.1}" y1="{ly:.1}" x2="{:.1}" y2="{ly:.1}" stroke="{}" stroke-width="2"{dash}/><text x="{:.1}" y="{:.1}">{}</text></g>"#,
            L + 10.0,
            L + 34.0,
            se.colour,
            L + 40.0,
            ly + 4.0,
            esc(&se.label)
        );
    }
}

/// Marker lines (vertical at an x, horizontal at a y) with their legend entries below the plot.
fn markers(s: &mut String, c: &Chart, pl: &Plot) {
    let n_series = c.series.len();
    for (k, m) in c.markers.iter().enumerate() {
        let (x1, y1, x2, y2) = if m.horizontal {
            let yp = pl.py(&pl.y, m.x);
            (L, yp, L + PW, yp)
        } else {
            let xp = pl.px(m.x);
            (xp, T, xp, T + PH)
        };
        let ly = legend_y(n_series + k);
        let _ = write!(
            s,
            r#"<g class="marker"><line x1="{x1:.1}" y1="{y1:.1}" x2="{x2:.1}" y2="{y2:.1}" stroke="black" stroke-width="1.5" stroke-dasharray="{}"/></g><g class="legend"><line x1="{:.1}" y1="{ly:.1}" x2="{:.1}" y2="{ly:.1}" stroke="black" stroke-width="1.5" stroke-dasharray="{}"/><text x="{:.1}" y="{:.1}">{}</text></g>"#,
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
            y2_mirror: None,
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
                horizontal: false,
                label: "knee".into(),
                dash: "6 3",
            }],
        };
        let svg = chart(&c);
        assert!(svg.contains("a &lt; b &amp; c"));
        assert!(svg.contains("volts (V)") && svg.contains("class=\"marker\""));
    }

    /// A label read back as a number ("2.5×10^-7" too).
    fn read(label: &str) -> f64 {
        match label.split_once("×10^") {
            Some((m, e)) => {
                m.parse::<f64>().expect("mantissa") * 10f64.powi(e.parse().expect("power"))
            }
            None => label.parse().expect("number"),
        }
    }

    #[test]
    fn tick_labels_are_distinct_and_true_at_every_scale() {
        // Spans from a nanounit to a teraunit, offsets from zero to far above the span: every
        // axis's labels differ from their neighbours and read back within 1 % of a tick step.
        for exp in -9..=12 {
            for (lo_mult, span_mult) in [
                (0.0, 1.0),
                (1.0, 0.3),
                (7.0, 0.02),
                (-2.0, 5.0),
                (123.0, 1.7),
            ] {
                let span = 10f64.powi(exp) * span_mult;
                let lo = 10f64.powi(exp) * lo_mult;
                for scale in [Scale::Linear, Scale::Log] {
                    if scale == Scale::Log && lo <= 0.0 {
                        continue;
                    }
                    let axis = Axis::new(scale, [lo, lo + span].into_iter(), false);
                    let ticks = axis.ticks();
                    assert!(
                        ticks.len() >= 2,
                        "{exp} {lo_mult} {span_mult} {scale:?}: {ticks:?}"
                    );
                    let labels = tick_labels(&ticks);
                    for w in labels.windows(2) {
                        assert_ne!(w[0], w[1], "{exp} {scale:?}: {labels:?}");
                    }
                    for (k, (t, l)) in ticks.iter().zip(&labels).enumerate() {
                        let gap = if k + 1 < ticks.len() {
                            ticks[k + 1] - t
                        } else {
                            t - ticks[k - 1]
                        };
                        assert!(
                            (read(l) - t).abs() <= 0.01 * gap.abs() + 1e-300,
                            "{l} for {t} (gap {gap}): {labels:?}"
                        );
                    }
                }
            }
        }
    }

    fn two_axis_chart(mirror: Option<f64>) -> Chart {
        Chart {
            title: "t".into(),
            x_label: "x".into(),
            y_label: "y".into(),
            y2_label: Some("y2".into()),
            y2_mirror: mirror,
            x_scale: Scale::Linear,
            y_scale: Scale::Linear,
            series: vec![
                Series {
                    label: "left".into(),
                    points: vec![(0.8, 130.0), (1.2, 170.0), (1.7, 265.0)],
                    dots: true,
                    dash: "",
                    colour: "black",
                    right_axis: false,
                },
                Series {
                    label: "right".into(),
                    points: vec![(0.8, 19.7), (1.2, 22.4), (1.7, 33.7)],
                    dots: true,
                    dash: "5 3",
                    colour: "black",
                    right_axis: true,
                },
            ],
            markers: vec![Marker {
                x: 1.2,
                horizontal: false,
                label: "chosen".into(),
                dash: "2 2",
            }],
        }
    }

    /// Every number after `key="` in the text.
    fn attrs(svg: &str, key: &str) -> Vec<f64> {
        svg.split(&format!("{key}=\""))
            .skip(1)
            .filter_map(|r| r.split('"').next()?.parse().ok())
            .collect()
    }

    #[test]
    fn right_ticks_sit_on_the_left_grid() {
        let svg = chart(&two_axis_chart(None));
        let grid: Vec<f64> = svg
            .split("<line class=\"grid\" x1=\"80\"")
            .skip(1)
            .filter_map(|r| r.split("y1=\"").nth(1)?.split('"').next()?.parse().ok())
            .collect();
        let right = attrs(&svg, "data-y");
        assert!(right.len() >= 3, "{svg}");
        for y in right {
            assert!(
                grid.iter().any(|g| (g - y).abs() < 0.11),
                "right tick at {y} is off the grid {grid:?}"
            );
        }
    }

    #[test]
    fn the_legend_is_below_the_plot() {
        let svg = chart(&two_axis_chart(Some(0.005)));
        for part in svg.split("<g class=\"legend\">").skip(1) {
            let part = part.split("</g>").next().unwrap_or("");
            for y in attrs(part, "y1").into_iter().chain(attrs(part, "y")) {
                assert!(y > H - 30.0, "legend at y {y} is inside the plot");
            }
        }
        // The data stays inside the frame.
        for pts in svg.split("points=\"").skip(1) {
            for p in pts.split('"').next().unwrap_or("").split_whitespace() {
                let y: f64 = p.split(',').nth(1).and_then(|v| v.parse().ok()).expect("y");
                assert!((T..=T + PH).contains(&y), "{y}");
            }
        }
    }
}
