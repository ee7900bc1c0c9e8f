//! The bench card: what a person works from with the core in one hand, in text, Markdown, HTML and
//! SVG (the cross-section of one window, to scale).
//!
//! Everything on it comes from the plan: checkpoints are the running turn count at the end of each
//! layer, the cut length is turns × mean turn + two leads, the 20 °C resistance is the hot one over the
//! IEC 60028 temperature factor, and the buy list totals each wire size with a spare allowance.

use super::json::{buy_list, BuyRow};
use super::svg::esc;
use super::{num, sig3, words, wrap, Charset, Format, Look};
use crate::geometry::Shape;
use crate::job::Role;
use crate::plan::{Plan, WindingPlan};
use crate::wire::{Conductor, KeptCopper};
use std::fmt::Write as _;

/// The sheet an HTML card is printed on.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum Paper {
    /// ISO 216 A5, 148 mm × 210 mm.
    #[default]
    A5,
    /// ISO 216 A4, 210 mm × 297 mm.
    A4,
    /// US Letter, 8.5 in × 11 in (215.9 mm × 279.4 mm).
    Letter,
}

impl Paper {
    /// Width and height, mm (ISO 216; Letter from its inches, 1 in = 25.4 mm).
    pub fn size_mm(self) -> (f64, f64) {
        match self {
            Paper::A5 => (148.0, 210.0),
            Paper::A4 => (210.0, 297.0),
            Paper::Letter => (215.9, 279.4),
        }
    }
    /// The CSS `@page` size keyword.
    fn css(self) -> &'static str {
        match self {
            Paper::A5 => "A5 portrait",
            Paper::A4 => "A4 portrait",
            Paper::Letter => "letter portrait",
        }
    }
}

/// The printed margin on every side, mm.
const MARGIN_MM: f64 = 7.0;

/// Card options.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CardOptions {
    /// Spare allowance on the buy list, fraction (0.10 = 10 %).
    pub spare: f64,
    /// Characters, units, colour (bold headings on a terminal) and width.
    pub look: Look,
    /// The sheet the HTML card is laid out for.
    pub paper: Paper,
    /// The date printed in the footer (year, month, day), when known.
    pub date: Option<(i64, u32, u32)>,
}

impl Default for CardOptions {
    fn default() -> Self {
        CardOptions {
            spare: 0.10,
            look: Look::default(),
            paper: Paper::A5,
            date: None,
        }
    }
}

/// The footer every card ends with: the job, the date, the tool's version.
pub fn footer_line(p: &Plan, o: &CardOptions) -> String {
    let date = match o.date {
        Some((y, m, d)) => format!("{y:04}-{m:02}-{d:02}"),
        None => "date not known".into(),
    };
    format!(
        "{} · {date} · ironwind {}",
        p.name,
        env!("CARGO_PKG_VERSION")
    )
}

impl CardOptions {
    fn ascii(&self) -> bool {
        self.look.charset == Charset::Ascii
    }
}

/// Writes the card in a format: text (the default), Markdown, HTML or SVG.
pub fn write(
    out: &mut dyn std::io::Write,
    p: &Plan,
    format: Format,
    o: &CardOptions,
) -> std::io::Result<()> {
    let text = match format {
        Format::Markdown => format!(
            "{}\n---\n\n{}\n",
            markdown_card(p, o).trim_end(),
            md(&footer_line(p, o))
        ),
        Format::Html => html_card(p, o),
        Format::Svg => svg_card(p),
        _ => {
            let foot = footer_line(p, o);
            let foot = if o.ascii() {
                super::asciify(&foot.replace('·', "-"))
            } else {
                foot
            };
            format!("{}\n\n{foot}\n", text_card(p, o).trim_end())
        }
    };
    out.write_all(text.as_bytes())
}

fn role_word(w: &WindingPlan) -> &'static str {
    match (w.role, w.kept) {
        (Role::Primary, false) => "PRIMARY",
        (Role::Primary, true) => "PRIMARY (kept donor winding)",
        (Role::Secondary, false) => "OUTPUT",
        (Role::Secondary, true) => "OUTPUT (kept donor winding)",
    }
}

fn wire_text(w: &WindingPlan) -> String {
    let c = &w.wire.conductor;
    if let Conductor::Kept {
        area_mm2, source, ..
    } = c
    {
        return match source {
            KeptCopper::Resistance => format!(
                "the donor's own (measured {} ohm at 20 C)",
                sig3(w.resistance_20c_ohm)
            ),
            KeptCopper::Build => format!(
                "the donor's own (copper estimated from its build: about {} mm2)",
                sig3(*area_mm2)
            ),
            KeptCopper::Current => format!(
                "the donor's own (not measured: copper taken as {} mm2 for its current; measure its resistance)",
                sig3(*area_mm2)
            ),
        };
    }
    let base = match c {
        Conductor::Round(r) => format!("{} ({}, {})", c.describe(), r.system.name(), w.grade_label),
        Conductor::Strip { insulation_mm, .. } => {
            format!("{} (insulated {} mm)", c.describe(), num(*insulation_mm, 2))
        }
        Conductor::Kept { .. } => "the donor's own".to_string(),
        Conductor::Measured { .. } => format!("{} ({})", c.describe(), w.grade_label),
        Conductor::Cable { .. } => c.describe(),
    };
    let strands = if w.wire.strands == 1 {
        "1 strand".to_string()
    } else {
        format!("{} strands in hand", w.wire.strands)
    };
    format!("{base}, {strands}")
}

fn core_line(p: &Plan, units: super::Units) -> String {
    let c = &p.core;
    if units == super::Units::Imperial {
        let i = |v: f64| num(v / crate::units::MM_PER_INCH, 3);
        return format!(
            "Core {}: tongue {} x stack {} in, window {} x {} in, Ae net {} in2, steel {}",
            if c.shape == Shape::Ei { "E-I" } else { "U-I" },
            i(c.tongue_mm),
            i(c.stack_mm),
            i(c.window_width_mm),
            i(c.window_height_mm),
            num(p.geometry.area_net_mm2 / 645.16, 3),
            p.steel.name
        );
    }
    format!(
        "Core {}: tongue {} x stack {} mm, window {} x {} mm, Ae net {} cm2, steel {}",
        if c.shape == Shape::Ei { "E-I" } else { "U-I" },
        num(c.tongue_mm, 1),
        num(c.stack_mm, 1),
        num(c.window_width_mm, 1),
        num(c.window_height_mm, 1),
        num(p.geometry.area_net_mm2 / 100.0, 2),
        p.steel.name
    )
}

fn drive_line(p: &Plan) -> String {
    let d = &p.drive;
    format!(
        "{} Hz {} | {} T peak | {} V per turn | {} turns per volt",
        num(d.frequency_hz, 0),
        d.waveform.name(),
        num(d.flux_density_t, 3),
        num(d.volts_per_turn, 4),
        num(1.0 / d.volts_per_turn, 3)
    )
}

fn volts_amps(p: &Plan, w: &WindingPlan) -> String {
    let unit = if w.role == Role::Primary
        && !matches!(p.drive.waveform, crate::magnetics::Waveform::Sine)
    {
        "V amplitude"
    } else {
        "V RMS"
    };
    match &w.dc {
        Some(d) => format!(
            "{}{} V DC, {} A ({}); winding {} V RMS, {} A RMS",
            if d.dual_rails { "± " } else { "" },
            num(d.volts_full_load, 2),
            sig3(d.amps),
            words::dc_load(d),
            num(w.volts, 2),
            sig3(w.amps)
        ),
        None => format!("{} {unit}, {} A", num(w.volts, 2), sig3(w.amps)),
    }
}

/// What the loads add to the bench checks: the idle current, the inrush, and a welder's
/// short-circuit current.
fn load_lines(p: &Plan) -> Vec<String> {
    let mut v = vec![format!(
        "idle primary current: about {} A RMS (predicted); switch-on inrush: {}",
        sig3(p.drive.idle_amps),
        words::inrush(&p.drive.inrush)
    )];
    for w in p.windings.iter().filter(|w| words::is_welder(w)) {
        if let Some(a) = w.short_circuit_amps.filter(|a| a.is_finite()) {
            v.push(words::short_circuit_headline(&w.name, a));
        }
    }
    v
}

fn half_coil_note(p: &Plan, w: &WindingPlan) -> Option<String> {
    (p.core.shape == Shape::Ui).then(|| {
        format!(
            "Two half-coils in series, fluxes adding: {} turns on leg 1, {} on leg 2. Layers and checkpoints are per leg (leg 2 ends at {}).",
            w.coil.coil_turns,
            w.turns - w.coil.coil_turns,
            w.turns - w.coil.coil_turns
        )
    })
}

fn insulation_note(p: &Plan, last: bool, look: &Look) -> String {
    let s = &p.settings;
    format!(
        "Insulation: {} between layers, {} after.",
        look.mm(s.interlayer_mm, 2),
        if last {
            format!("{} outer wrap", look.mm(s.outer_mm, 2))
        } else {
            look.mm(s.between_windings_mm, 2)
        }
    )
}

/// How to wind and bring out the leads: one coil, two halves (centre tap) or sections with their
/// link table; for a push-pull primary, what goes where; a fixed count, a split-bobbin section and a
/// load duty said so.
fn lead_note(w: &WindingPlan, k: usize) -> String {
    let n = k + 1;
    let t = w.turns;
    let mut s = if w.centre_tap && w.bifilar {
        format!(
            "Two halves wound together: take two strands in hand, mark them A and B, and wind {t} turns. Join A's finish to B's start: that joint is the centre tap M{n}. Leads: S{n} = A's start, M{n} = the joint, F{n} = B's finish."
        )
    } else if w.centre_tap {
        format!(
            "Two halves of {t} turns, one after the other in the same direction: at turn {t} bring out a loop, the centre tap M{n}, and wind on to turn {}. Leads: start S{n}, centre tap M{n}, finish F{n}.",
            2 * t
        )
    } else if w.sections > 1 {
        sections_note(w, n)
    } else {
        format!(
            "Leads: start S{n} (mark it before the first turn), finish F{n}; same winding direction as the others."
        )
    };
    if w.centre_tap && w.role == Role::Primary {
        s += &format!(
            " Push-pull: M{n} goes to the supply's positive, S{n} and F{n} to the two switches; each half carries {} A RMS.",
            sig3(w.section_amps)
        );
    }
    if w.turns_fixed {
        s += &format!(" {t} turns are fixed by the job.");
    }
    if w.load_duty < 1.0 {
        s += &format!(
            " Rated for its load on {} % of the time.",
            num(w.load_duty * 100.0, 0)
        );
    }
    s
}

/// Sections with their own leads, and the links for series and parallel.
fn sections_note(w: &WindingPlan, n: usize) -> String {
    let k = w.sections as usize;
    let letters: Vec<char> = ('a'..='z').take(k).collect();
    let leads: Vec<String> = letters.iter().map(|l| format!("S{n}{l}/F{n}{l}")).collect();
    let series: Vec<String> = letters
        .windows(2)
        .map(|p| format!("F{n}{} to S{n}{}", p[0], p[1]))
        .collect();
    let starts: Vec<String> = letters.iter().map(|l| format!("S{n}{l}")).collect();
    let finishes: Vec<String> = letters.iter().map(|l| format!("F{n}{l}")).collect();
    format!(
        "{k} sections of {} turns, {}, each with its own leads ({}). Links: in series for {} V, join {} and use S{n}{} and F{n}{}; in parallel for {} V, join {} together and {} together and use the two joints. Sections in parallel must have the same turns: check each section's resistance before joining them.",
        w.turns,
        if w.bifilar {
            "wound together (strands in hand)"
        } else {
            "one after the other in the same direction"
        },
        leads.join(", "),
        num(w.volts * k as f64, 1),
        series.join(", "),
        letters[0],
        letters[k - 1],
        num(w.volts, 1),
        starts.join(", "),
        finishes.join(", ")
    )
}

/// The turns as the card shows them: per half or section when there are several.
fn turns_text(w: &WindingPlan) -> String {
    if w.centre_tap {
        format!("{} + {}", w.turns, w.turns)
    } else if w.sections > 1 {
        format!("{} × {}", w.sections, w.turns)
    } else {
        w.turns.to_string()
    }
}

/// The bench checks, as lines of text.
fn bench_lines(p: &Plan) -> Vec<String> {
    let mut v = Vec::new();
    for w in &p.windings {
        let r = w.resistance_20c_ohm;
        v.push(if r < 0.5 {
            // Below what a hand meter's leads read (common practice): a known current and a
            // millivolt reading instead.
            let amps = if r < 0.01 { 10.0 } else { 1.0 };
            format!(
                "\"{}\": about {} ohm at 20 C, too low for a hand meter: pass {} A from a current-limited supply and read about {} mV across it",
                w.name,
                sig3(r),
                num(amps, 0),
                sig3(r * amps * 1000.0)
            )
        } else {
            format!(
                "\"{}\": meter should read about {} ohm at 20 C once wound",
                w.name,
                sig3(r)
            )
        });
    }
    for w in p.windings.iter().filter(|w| w.role == Role::Secondary) {
        v.push(format!(
            "\"{}\": about {} V RMS with no load at first power-up",
            w.name,
            num(w.volts_no_load, 1)
        ));
    }
    v.extend(load_lines(p));
    v.push(
        "After winding, measure these: the primary's volts, each output's no-load volts, each winding's ohms and the room temperature; write them in a measurement file (examples/measured/) and run `ironwind diagnose` to learn what went wrong, if anything."
            .to_string(),
    );
    v
}

/// The first power-up: through a series lamp for a mains primary (a sine drive of 100 V or more:
/// common practice), from a current-limited supply for a battery or inverter drive; and a true-RMS
/// meter for a square or quasi-square drive (an average-reading meter misreads it).
fn power_up_lines(p: &Plan) -> Vec<&'static str> {
    let mains = matches!(p.drive.waveform, crate::magnetics::Waveform::Sine)
        && p.drive.primary_rms_volts >= 100.0;
    let mut v = if mains {
        vec![
            "First power-up: through a series lamp (or a current-limited supply), no load, fuse in place.",
            "Lamp barely glows: measure the outputs. Lamp bright: stop, look for a short or a reversed half.",
            "Then the rated voltage through the fuse, still no load; then the load. Feel for heat every few minutes.",
        ]
    } else {
        vec![
            "First power-up: from a current-limited bench supply (or the battery through a fuse sized for the idle current), no load.",
            "Idle current small and steady: measure the outputs. Current at its limit: stop, look for a short or a reversed half.",
            "Then the full supply through the proper fuse, still no load; then the load. Feel for heat every few minutes.",
        ]
    };
    if !matches!(p.drive.waveform, crate::magnetics::Waveform::Sine) {
        v.push("A square or quasi-square wave misreads on an average-responding meter: read its volts and amps with a true-RMS meter.");
    }
    v
}

/// The first thing a card of a failing design says.
fn fail_banner(p: &Plan) -> String {
    format!(
        "DOES NOT PASS - DO NOT WIND THIS: {} fail. The turns below are what the plan computed, not a design to build; change the job and plan again.",
        p.verdict.failed().join(", ")
    )
}

fn verdict_line(p: &Plan) -> String {
    if p.losses.saturated {
        let failed = p.verdict.failed();
        return format!(
            "VERDICT: {} - the core runs at {} T, past saturation: no loss or efficiency figure means anything there",
            if p.verdict.ok { "checks pass" } else { "DOES NOT PASS" },
            num(p.drive.flux_density_t, 2)
        ) + &if failed.is_empty() {
            String::new()
        } else {
            format!(" ({})", failed.join(", "))
        };
    }
    if p.verdict.ok {
        format!(
            "VERDICT: every check passes (rise {} C, fill {}, efficiency {} %)",
            num(p.thermal.rise_c, 0),
            num(p.window.copper_fill, 2),
            num(p.losses.efficiency * 100.0, 0)
        )
    } else {
        let failed = p.verdict.failed();
        format!("VERDICT: DOES NOT PASS - {}", failed.join(", "))
    }
}

/// Two aligned rows, "layer" and "ends at turn", as many layers to a block as the width holds
/// (ten at most).
fn checkpoint_grid(w: &WindingPlan, width: usize) -> String {
    let mut s = String::new();
    let cps = &w.coil.checkpoints;
    let cell = cps
        .iter()
        .map(|t| t.to_string().len())
        .max()
        .unwrap_or(1)
        .max(3)
        + 2;
    let per = (width.saturating_sub(17) / cell).clamp(1, 10);
    for (b, chunk) in cps.chunks(per).enumerate() {
        let mut l1 = String::from("    layer        ");
        let mut l2 = String::from("    ends at turn ");
        for (i, t) in chunk.iter().enumerate() {
            l1 += &format!("{:>cell$}", b * per + i + 1);
            l2 += &format!("{:>cell$}", t);
        }
        s += l1.trim_end();
        s += "\n";
        s += l2.trim_end();
        s += "\n";
    }
    s
}

fn tap_text(w: &WindingPlan) -> Option<String> {
    (!w.taps.is_empty()).then(|| {
        w.taps
            .iter()
            .map(|t| format!("{} V: bring out a loop at turn {}", num(t.volts, 1), t.turn))
            .collect::<Vec<_>>()
            .join("; ")
            + if w.sections > 1 {
                " (on each section)"
            } else {
                ""
            }
    })
}

/// The text card: within the look's width (80 columns).
pub fn text_card(p: &Plan, o: &CardOptions) -> String {
    let width = o.look.width;
    let bold = |s: &str| {
        if o.look.color && !o.ascii() {
            format!("\x1b[1m{s}\x1b[0m")
        } else {
            s.to_string()
        }
    };
    let (rule, thin) = if o.ascii() {
        ("=".repeat(width), "-".repeat(width))
    } else {
        ("═".repeat(width), "─".repeat(width))
    };
    let mut s = String::new();
    s += &rule;
    s += "\n";
    if !p.verdict.ok {
        s += &bold(&wrap(&fail_banner(p), width, "", "  "));
        s += &rule;
        s += "\n";
    }
    s += &wrap(&format!("WINDING CARD: {}", p.name), width, "", "  ");
    s += &wrap(&core_line(p, o.look.units), width, "", "  ");
    s += &wrap(&drive_line(p), width, "", "  ");
    s += &rule;
    s += "\n";
    s += &wrap(
        "Wind in this order, innermost first, every winding in the SAME direction. Mark each start lead before the first turn.",
        width,
        "",
        "",
    );
    let n = p.windings.len();
    for (k, w) in p.windings.iter().enumerate() {
        s += &thin;
        s += "\n";
        s += &text_winding(p, w, k, k + 1 == n, &o.look, &bold);
    }
    s += &thin;
    s += "\n";
    s += &text_cut_and_checks(p, o, &bold);
    s += &thin;
    s += "\n";
    s += &bold(wrap(&verdict_line(p), width, "", "  ").trim_end());
    s += "\n";
    for w in &p.warnings {
        s += &wrap(&words::warning(w), width, "  ! ", "    ");
    }
    s += &bold("CAUTIONS");
    s += "\n";
    for c in p.cautions {
        s += &wrap(c, width, "  * ", "    ");
    }
    s += &rule;
    s += "\n";
    if o.ascii() {
        super::asciify(&s)
    } else {
        s
    }
}

/// One winding's block of the text card.
fn text_winding(
    p: &Plan,
    w: &WindingPlan,
    k: usize,
    last: bool,
    look: &Look,
    bold: &dyn Fn(&str) -> String,
) -> String {
    let width = look.width;
    let head = format!(
        "[{}] {} \"{}\"  {}",
        k + 1,
        role_word(w),
        w.name,
        volts_amps(p, w)
    );
    // Symbols become ASCII before the line is measured (± grows to three characters).
    let head = if look.charset == Charset::Ascii {
        super::asciify(&head)
    } else {
        head
    };
    let mut s = bold(wrap(&head, width, "", "    ").trim_end());
    s += "\n";
    if !p.verdict.ok {
        s += "    NOT TO BE WOUND: the design does not pass\n";
    }
    s += &bold(&format!("    TURNS {}", turns_text(w)));
    if w.kept {
        s += "   (counted by the test winding)\n";
    } else {
        s += &format!(
            "   {} per layer x {} layers\n",
            w.coil.turns_per_layer, w.coil.layers
        );
    }
    s += &wrap(&format!("wire: {}", wire_text(w)), width, "    ", "      ");
    if let Some(h) = half_coil_note(p, w) {
        s += &wrap(&h, width, "    ", "    ");
    }
    if w.kept {
        s += &wrap(
            "Kept on the core as it is: do not unwind; check it with the meter below.",
            width,
            "    ",
            "    ",
        );
    } else {
        s += &checkpoint_grid(w, width);
        if let Some(t) = tap_text(w) {
            s += &wrap(&format!("TAPS: {t}"), width, "    ", "      ");
        }
        s += &wrap(&lead_note(w, k), width, "    ", "    ");
    }
    s += &wrap(&insulation_note(p, last, look), width, "    ", "    ");
    s
}

/// The cut-and-buy list and the bench checks of the text card.
fn text_cut_and_checks(p: &Plan, o: &CardOptions, bold: &dyn Fn(&str) -> String) -> String {
    let width = o.look.width;
    let mut s = bold(&format!(
        "CUT AND BUY (spare {} %)",
        num(o.spare * 100.0, 0)
    ));
    s += "\n";
    for w in p.windings.iter().filter(|w| !w.kept) {
        s += &wrap(
            &format!(
                "\"{}\": cut {} per strand x {}{} ({} turns x {} mean turn + leads), {} copper",
                w.name,
                o.look.m(w.cut_length_m, 2),
                w.wire.strands,
                if w.sections > 1 {
                    format!(" x {} (one per half or section)", w.sections)
                } else {
                    String::new()
                },
                w.turns,
                o.look.mm(w.coil.mean_turn_mm, 0),
                o.look.g(w.copper_mass_g, 0)
            ),
            width,
            "  ",
            "    ",
        );
    }
    for b in buy_list(p, o.spare) {
        s += &wrap(&buy_text(&b, &o.look), width, "  buy: ", "    ");
    }
    s += &bold("BENCH CHECKS");
    s += "\n";
    for l in bench_lines(p) {
        s += &wrap(&l, width, "  ", "    ");
    }
    for l in power_up_lines(p) {
        s += &wrap(l, width, "  ", "    ");
    }
    s
}

fn buy_text(b: &BuyRow, look: &Look) -> String {
    let what = match b.system {
        "awg" => format!("AWG {}", b.size),
        "strip" => format!("strip {} mm", b.size),
        _ => format!("{} mm", b.size),
    };
    format!("{what}: {}, {}", look.m(b.length_m, 1), look.g(b.mass_g, 0))
}

/// Text for Markdown: HTML's specials escaped, so a name cannot carry markup into a page.
fn md(s: &str) -> String {
    s.replace('&', "&amp;")
        .replace('<', "&lt;")
        .replace('>', "&gt;")
}

/// The Markdown card.
pub fn markdown_card(p: &Plan, o: &CardOptions) -> String {
    let mut s = String::new();
    if !p.verdict.ok {
        let _ = writeln!(s, "> **{}**\n", md(&fail_banner(p)));
    }
    let _ = writeln!(s, "# Winding card: {}\n", md(&p.name));
    let _ = writeln!(s, "{}  \n{}\n", core_line(p, o.look.units), drive_line(p));
    let _ = writeln!(s, "Wind in this order, innermost first, every winding in the **same direction**. Mark each start lead before the first turn.\n");
    let n = p.windings.len();
    for (k, w) in p.windings.iter().enumerate() {
        let _ = writeln!(
            s,
            "## {}. {} \"{}\": {}{}\n",
            k + 1,
            role_word(w),
            md(&w.name),
            volts_amps(p, w),
            if p.verdict.ok {
                ""
            } else {
                " — *not to be wound: the design does not pass*"
            }
        );
        let _ = writeln!(
            s,
            "- **Turns: {}** — {} per layer × {} layers",
            turns_text(w),
            w.coil.turns_per_layer,
            w.coil.layers
        );
        let _ = writeln!(s, "- Wire: {}", wire_text(w));
        if let Some(h) = half_coil_note(p, w) {
            let _ = writeln!(s, "- {h}");
        }
        if w.kept {
            let _ = writeln!(s, "- Kept on the core as it is: do not unwind.");
        } else {
            let _ = writeln!(s, "- Layer ends at turn:\n");
            let _ = writeln!(
                s,
                "  | layer | {} |",
                (1..=w.coil.checkpoints.len())
                    .map(|k| k.to_string())
                    .collect::<Vec<_>>()
                    .join(" | ")
            );
            let _ = writeln!(s, "  |---|{}", "---:|".repeat(w.coil.checkpoints.len()));
            let _ = writeln!(
                s,
                "  | ends at turn | {} |\n",
                w.coil
                    .checkpoints
                    .iter()
                    .map(|t| format!("**{t}**"))
                    .collect::<Vec<_>>()
                    .join(" | ")
            );
            if let Some(t) = tap_text(w) {
                let _ = writeln!(s, "- **Taps:** {t}");
            }
            let _ = writeln!(s, "- {}", lead_note(w, k));
        }
        let _ = writeln!(s, "- {}\n", insulation_note(p, k + 1 == n, &o.look));
    }
    let _ = writeln!(s, "## Cut and buy (spare {} %)\n", num(o.spare * 100.0, 0));
    let _ = writeln!(
        s,
        "| winding | cut per strand (m) | strands | copper (g) |\n|---|---:|---:|---:|"
    );
    for w in p.windings.iter().filter(|w| !w.kept) {
        let _ = writeln!(
            s,
            "| {} | {} | {} | {} |",
            md(&w.name),
            num(w.cut_length_m, 2),
            w.wire.strands,
            num(w.copper_mass_g, 0)
        );
    }
    let _ = writeln!(s);
    for b in buy_list(p, o.spare) {
        let _ = writeln!(s, "- Buy {}", buy_text(&b, &o.look));
    }
    let _ = writeln!(s, "\n## Bench checks\n");
    for l in bench_lines(p) {
        let _ = writeln!(s, "- {}", md(&l));
    }
    for l in power_up_lines(p) {
        let _ = writeln!(s, "- {l}");
    }
    let _ = writeln!(s, "\n**{}**\n", md(&verdict_line(p)));
    for w in &p.warnings {
        let _ = writeln!(s, "> {}\n", md(&words::warning(w)));
    }
    let _ = writeln!(s, "## Cautions\n");
    for c in p.cautions {
        let _ = writeln!(s, "- {c}");
    }
    s
}

/// Hatching patterns, one per winding in turn (distinguishable in greyscale).
const PATTERNS: &[(&str, &str)] = &[
    (
        "hatch-a",
        r##"<pattern id="hatch-a" width="1.4" height="1.4" patternUnits="userSpaceOnUse" patternTransform="rotate(45)"><rect width="1.4" height="1.4" fill="#e8eef6"/><line x1="0" y1="0" x2="0" y2="1.4" stroke="#1f4e79" stroke-width="0.45"/></pattern>"##,
    ),
    (
        "hatch-b",
        r##"<pattern id="hatch-b" width="1.6" height="1.6" patternUnits="userSpaceOnUse"><rect width="1.6" height="1.6" fill="#f6efe4"/><path d="M0 0L1.6 1.6M1.6 0L0 1.6" stroke="#7a4a12" stroke-width="0.22"/></pattern>"##,
    ),
    (
        "hatch-c",
        r##"<pattern id="hatch-c" width="1.2" height="1.2" patternUnits="userSpaceOnUse"><rect width="1.2" height="1.2" fill="#eef5ea"/><circle cx="0.6" cy="0.6" r="0.3" fill="#2f5d1f"/></pattern>"##,
    ),
    (
        "hatch-d",
        r##"<pattern id="hatch-d" width="1.6" height="1.6" patternUnits="userSpaceOnUse" patternTransform="rotate(-45)"><rect width="1.6" height="1.6" fill="#f3eaf3"/><line x1="0" y1="0" x2="0" y2="1.6" stroke="#5b2a5b" stroke-width="0.35"/><line x1="0.8" y1="0" x2="0.8" y2="1.6" stroke="#5b2a5b" stroke-width="0.12"/></pattern>"##,
    ),
    (
        "hatch-e",
        r##"<pattern id="hatch-e" width="1.6" height="1.6" patternUnits="userSpaceOnUse"><rect width="1.6" height="1.6" fill="#fdf1e0"/><line x1="0" y1="0.8" x2="1.6" y2="0.8" stroke="#8a4b00" stroke-width="0.4"/></pattern>"##,
    ),
    (
        "hatch-f",
        r##"<pattern id="hatch-f" width="1.4" height="1.4" patternUnits="userSpaceOnUse"><rect width="1.4" height="1.4" fill="#e6f2f2"/><rect x="0.35" y="0.35" width="0.7" height="0.7" fill="#1f5f5f"/></pattern>"##,
    ),
    (
        "hatch-g",
        r##"<pattern id="hatch-g" width="1.8" height="1.8" patternUnits="userSpaceOnUse"><rect width="1.8" height="1.8" fill="#f5f5f5"/><path d="M0 0.9H1.8M0.9 0V1.8" stroke="#333" stroke-width="0.2"/></pattern>"##,
    ),
    (
        "hatch-h",
        r##"<pattern id="hatch-h" width="2" height="2" patternUnits="userSpaceOnUse" patternTransform="rotate(30)"><rect width="2" height="2" fill="#f7ecec"/><line x1="0" y1="0" x2="0" y2="2" stroke="#7a1f1f" stroke-width="0.7"/></pattern>"##,
    ),
];

/// Where the cross-section sits in its drawing, mm.
struct Frame {
    /// The tongue's face (the bobbin tube's inner face).
    x0: f64,
    /// The window's top.
    y0: f64,
    /// The first turn's end of the traverse.
    coil_top: f64,
    /// The traverse drawn.
    traverse: f64,
    /// The window's width available to one coil.
    avail_w: f64,
    /// The window's height.
    h: f64,
}

/// The cross-section of one window to scale, as an SVG element (no XML declaration). Every
/// winding, gap and layer line is placed where the layout put it (`CoilLayout::start_mm`,
/// `layer_boundaries_mm`), so the drawing and the plan's build agree.
pub fn cross_section_svg(p: &Plan, width_px: f64) -> String {
    let c = &p.core;
    let avail_w = match c.shape {
        Shape::Ei => c.window_width_mm,
        Shape::Ui => c.window_width_mm / 2.0,
    };
    let h = c.window_height_mm;
    // Drawing in mm with a margin for the tongue strip, labels and the scale bar.
    let tongue_strip = 6.0f64.min(c.tongue_mm / 2.0);
    let margin = 4.0;
    let f = Frame {
        x0: margin + tongue_strip,
        y0: margin,
        coil_top: margin + p.settings.bobbin_wall_mm + p.settings.margin_mm,
        traverse: p.window.traverse_mm.max(0.0),
        avail_w,
        h,
    };
    // The body first: the legend goes right of everything drawn (an overflow included), and the
    // view box grows to hold the drawing, the legend and the scale bar, whatever their count.
    let mut body = String::new();
    xsec_steel_and_bobbin(&mut body, p, &f, margin, tongue_strip);
    let x = xsec_windings(&mut body, p, &f);
    let reach = xsec_outer(&mut body, p, &f, x);
    body += "<g class=\"legend\">";
    let (legend_w, legend_bottom) = xsec_legend(&mut body, p, &f, reach + 3.0);
    body += "</g>";
    xsec_scale_bar(&mut body, &f);
    let vb_w = reach + 3.0 + legend_w + margin;
    let vb_h = (h + 2.0 * margin + 12.0).max(legend_bottom + margin);
    let px_h = width_px * vb_h / vb_w;
    let mut o = String::new();
    let _ = write!(
        o,
        r#"<svg xmlns="http://www.w3.org/2000/svg" class="xsec" width="{width_px:.0}" height="{px_h:.0}" viewBox="0 0 {vb_w:.2} {vb_h:.2}" font-family="sans-serif" font-size="2.6">"#
    );
    o += "<title>Cross-section of one window, to scale</title><defs>";
    for (_, pat) in PATTERNS {
        o += pat;
    }
    o += r##"<pattern id="steel" width="1.5" height="1.5" patternUnits="userSpaceOnUse"><rect width="1.5" height="1.5" fill="#9a9a9a"/><line x1="0" y1="1.5" x2="1.5" y2="0" stroke="#666" stroke-width="0.2"/></pattern>"##;
    o += "</defs>";
    o += &body;
    o += "</svg>";
    o
}

/// The tongue strip, the window and the bobbin's tube and flanges.
fn xsec_steel_and_bobbin(o: &mut String, p: &Plan, f: &Frame, margin: f64, tongue_strip: f64) {
    let (x0, y0, h) = (f.x0, f.y0, p.core.window_height_mm);
    let avail_w = f.avail_w;
    let _ = write!(
        o,
        r#"<rect x="{:.2}" y="{:.2}" width="{tongue_strip:.2}" height="{h:.2}" fill="url(#steel)"/>"#,
        margin, y0
    );
    let tx = margin + tongue_strip / 2.0 + 0.8;
    let ty = y0 + h / 2.0;
    let _ = write!(
        o,
        r#"<text x="{tx:.2}" y="{ty:.2}" transform="rotate(-90 {tx:.2} {ty:.2})" text-anchor="middle" font-size="2.4">tongue</text>"#
    );
    let _ = write!(
        o,
        r##"<rect class="window" x="{x0:.2}" y="{y0:.2}" width="{avail_w:.2}" height="{h:.2}" fill="white" stroke="#000" stroke-width="0.4"/>"##
    );
    let wall = p.settings.bobbin_wall_mm;
    let build_total = p.window.build_mm.min(avail_w);
    let _ = write!(
        o,
        r##"<rect class="bobbin" x="{x0:.2}" y="{y0:.2}" width="{wall:.2}" height="{h:.2}" fill="#c8b38a" stroke="#5a4a2a" stroke-width="0.2"/>"##
    );
    for fy in [y0, y0 + h - wall] {
        let _ = write!(
            o,
            r##"<rect class="bobbin" x="{x0:.2}" y="{fy:.2}" width="{build_total:.2}" height="{wall:.2}" fill="#c8b38a" stroke="#5a4a2a" stroke-width="0.2"/>"##
        );
    }
}

/// Each winding where the layout put it — its section's band of the traverse on a split bobbin —
/// the insulation between, its layer lines and its number; returns where the outermost ends.
fn xsec_windings(o: &mut String, p: &Plan, f: &Frame) -> f64 {
    let tube = f.x0 + p.settings.bobbin_wall_mm;
    let mut end = [tube, tube];
    let mut used = [false, false];
    for (k, w) in p.windings.iter().enumerate() {
        let slot = if w.coil.section == 2 { 1 } else { 0 };
        let (top, band) = if p.settings.split.is_some() {
            (f.coil_top + w.coil.offset_mm, w.coil.traverse_mm.max(0.0))
        } else {
            (f.coil_top, f.traverse)
        };
        let start = tube + w.coil.start_mm;
        if used[slot] {
            let x = end[slot];
            let gap = start - x;
            let _ = write!(
                o,
                r##"<rect class="insulation" x="{x:.2}" y="{top:.2}" width="{gap:.2}" height="{band:.2}" fill="#fff7b0" stroke="#8a7a00" stroke-width="0.1"/>"##
            );
        }
        used[slot] = true;
        let b = w.coil.build_mm.max(0.0);
        let (pat, _) = PATTERNS[k % PATTERNS.len()];
        let _ = write!(
            o,
            r##"<rect class="winding" x="{start:.2}" y="{top:.2}" width="{b:.2}" height="{band:.2}" fill="url(#{pat})" stroke="#000" stroke-width="0.3"/>"##
        );
        if w.coil.layers < 200 {
            for l in w.coil.layer_boundaries_mm() {
                let lx = tube + l;
                let _ = write!(
                    o,
                    r##"<line x1="{lx:.2}" y1="{top:.2}" x2="{lx:.2}" y2="{:.2}" stroke="#000" stroke-width="0.12"/>"##,
                    top + band
                );
            }
        }
        // Label: number in a white box at the middle.
        let cx = start + b / 2.0;
        // Numbers stepped down the band, so neighbours' boxes do not sit on each other.
        let n = p.windings.len().max(1) as f64;
        let step = ((band - 6.0) / n).max(4.0);
        let cy = top + 4.0 + (k as f64 * step) % (band - 6.0).max(1.0);
        let _ = write!(
            o,
            r##"<rect x="{:.2}" y="{:.2}" width="4" height="3.6" fill="white" stroke="#000" stroke-width="0.15"/><text x="{cx:.2}" y="{:.2}" text-anchor="middle" font-weight="bold">{}</text>"##,
            cx - 2.0,
            cy - 2.8,
            cy,
            k + 1
        );
        end[slot] = start + b;
    }
    if let Some(split) = p.settings.split {
        xsec_split_parts(o, p, f, tube, end, split);
        return end[0].max(end[1]) + p.settings.outer_mm;
    }
    end[0]
}

/// A split bobbin's divider and each section's outer wrap.
fn xsec_split_parts(
    o: &mut String,
    p: &Plan,
    f: &Frame,
    tube: f64,
    end: [f64; 2],
    split: crate::layout::Split,
) {
    let (first, _) = crate::layout::section_traverse(f.traverse, Some(split), 1);
    let y = f.coil_top + first;
    let w = (end[0].max(end[1]) + p.settings.outer_mm - tube).max(0.5);
    let d = split.divider_mm;
    let _ = write!(
        o,
        r##"<rect class="divider" x="{tube:.2}" y="{y:.2}" width="{w:.2}" height="{d:.2}" fill="#c8b38a" stroke="#5a4a2a" stroke-width="0.2"/>"##
    );
    let outer = p.settings.outer_mm;
    for sec in 1..=2u32 {
        let (band, offset) = crate::layout::section_traverse(f.traverse, Some(split), sec);
        let x = end[(sec - 1) as usize];
        let top = f.coil_top + offset;
        let _ = write!(
            o,
            r##"<rect class="insulation" x="{x:.2}" y="{top:.2}" width="{outer:.2}" height="{band:.2}" fill="#fff7b0" stroke="#8a7a00" stroke-width="0.1"/>"##
        );
    }
}

/// The outer wrap, the clearance (or the overflow past the window) and the outer leg; returns how
/// far right the drawing reaches (the outer leg's far side, or an overflow's end).
fn xsec_outer(o: &mut String, p: &Plan, f: &Frame, x: f64) -> f64 {
    let (coil_top, traverse, y0) = (f.coil_top, f.traverse, f.y0);
    let h = p.core.window_height_mm;
    let x = if p.settings.split.is_some() {
        // Each section's wrap is drawn with it.
        x
    } else {
        let outer = p.settings.outer_mm;
        let _ = write!(
            o,
            r##"<rect class="insulation" x="{x:.2}" y="{coil_top:.2}" width="{outer:.2}" height="{traverse:.2}" fill="#fff7b0" stroke="#8a7a00" stroke-width="0.1"/>"##
        );
        x + outer
    };
    let end = f.x0 + f.avail_w;
    if x < end {
        let tx = (x + end) / 2.0 + 0.8;
        let ty = y0 + h / 2.0;
        let _ = write!(
            o,
            r##"<rect class="clearance" x="{x:.2}" y="{y0:.2}" width="{:.2}" height="{h:.2}" fill="none" stroke="#444" stroke-width="0.2" stroke-dasharray="1 1"/><text x="{tx:.2}" y="{ty:.2}" font-size="2.2" transform="rotate(-90 {tx:.2} {ty:.2})" text-anchor="middle">clearance {} mm</text>"##,
            end - x,
            num(end - x, 1)
        );
    } else {
        let _ = write!(
            o,
            r##"<rect class="overflow" x="{end:.2}" y="{coil_top:.2}" width="{:.2}" height="{traverse:.2}" fill="none" stroke="#b00" stroke-width="0.5" stroke-dasharray="1.5 1"/>"##,
            x - end
        );
    }
    let _ = write!(
        o,
        r#"<rect x="{end:.2}" y="{y0:.2}" width="2" height="{h:.2}" fill="url(#steel)"/>"#
    );
    (end + 2.0).max(x)
}

/// The legend at the right: each winding's pattern, insulation and bobbin.
fn xsec_legend(o: &mut String, p: &Plan, f: &Frame, lx: f64) -> (f64, f64) {
    let y0 = f.y0;
    let key = |o: &mut String, ly: f64, fill: &str, stroke: &str, width: f64, text: &str| {
        let _ = write!(
            o,
            r##"<rect x="{lx:.2}" y="{ly:.2}" width="4" height="4" fill="{fill}" stroke="{stroke}" stroke-width="{width}"/><text x="{:.2}" y="{:.2}">{text}</text>"##,
            lx + 5.0,
            ly + 3.2
        );
    };
    // Text width at font size 2.6: about 0.6 of the size per character (a sans-serif's mean).
    let mut longest = "insulation".len();
    for (k, w) in p.windings.iter().enumerate() {
        let (pat, _) = PATTERNS[k % PATTERNS.len()];
        let ly = y0 + 2.0 + k as f64 * 6.0;
        let name = format!("{} {}", k + 1, w.name);
        longest = longest.max(name.chars().count());
        key(o, ly, &format!("url(#{pat})"), "#000", 0.2, &esc(&name));
    }
    let ly = y0 + 2.0 + p.windings.len() as f64 * 6.0;
    key(o, ly, "#fff7b0", "#8a7a00", 0.2, "insulation");
    let ly = ly + 6.0;
    key(o, ly, "#c8b38a", "#5a4a2a", 0.2, "bobbin");
    let mut bottom = ly + 5.0;
    if p.core.shape == Shape::Ui {
        let _ = write!(
            o,
            r#"<text x="{lx:.2}" y="{:.2}" font-size="2.2">U-I: one leg's half</text>"#,
            ly + 9.0
        );
        bottom = ly + 10.0;
        longest = longest.max(16);
    }
    (5.0 + longest as f64 * 2.6 * 0.6, bottom)
}

/// A scale bar: a round number of mm near a third of the window width.
fn xsec_scale_bar(o: &mut String, f: &Frame) {
    let x0 = f.x0;
    let bar = [1.0, 2.0, 5.0, 10.0, 20.0, 50.0, 100.0]
        .into_iter()
        .rfind(|b| *b <= f.avail_w.max(1.0))
        .unwrap_or(1.0);
    let by = f.y0 + f.h + 6.0;
    let x1 = x0 + bar;
    let _ = write!(
        o,
        r##"<g class="scale-bar"><line x1="{x0:.2}" y1="{by:.2}" x2="{x1:.2}" y2="{by:.2}" stroke="#000" stroke-width="0.6"/><line x1="{x0:.2}" y1="{:.2}" x2="{x0:.2}" y2="{:.2}" stroke="#000" stroke-width="0.4"/><line x1="{x1:.2}" y1="{:.2}" x2="{x1:.2}" y2="{:.2}" stroke="#000" stroke-width="0.4"/><text x="{:.2}" y="{:.2}">{} mm</text></g>"##,
        by - 1.2,
        by + 1.2,
        by - 1.2,
        by + 1.2,
        x0,
        by + 4.2,
        num(bar, 0)
    );
}

/// The SVG file: the cross-section alone, with an XML declaration.
pub fn svg_card(p: &Plan) -> String {
    // Sized in millimetres at 1:1 (the drawing's user unit is a millimetre), so it prints to
    // scale and can be held against the bobbin.
    let svg = cross_section_svg(p, 420.0);
    let svg = match (svg.find("width=\""), svg.find("viewBox=\"0 0 ")) {
        (Some(w), Some(vb)) if w < vb => {
            let dims: Vec<&str> = svg[vb + 13..].split(['"', ' ']).take(2).collect();
            match dims.as_slice() {
                [vw, vh] => format!(
                    "{}width=\"{vw}mm\" height=\"{vh}mm\" {}",
                    &svg[..w],
                    &svg[vb..]
                ),
                _ => svg,
            }
        }
        _ => svg,
    };
    format!("<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n{svg}\n")
}

const CSS: &str = r#"
.foot { font-size: 6pt; border-top: 0.2mm solid #777; margin-top: 1.5mm; padding-top: 0.5mm; display: flex; justify-content: space-between; }
* { box-sizing: border-box; }
html, body { margin: 0; padding: 0; }
body { font-family: "DejaVu Sans", "Liberation Sans", Arial, sans-serif; font-size: 7.6pt; line-height: 1.22; color: #000; background: #fff; }
h1 { font-size: 12pt; margin: 0 0 1mm 0; }
.sub { font-size: 7.4pt; margin: 0 0 1.5mm 0; }
.order { font-size: 7.4pt; margin: 0 0 1.5mm 0; font-weight: bold; }
.top { display: flex; gap: 3mm; align-items: flex-start; }
.windings { flex: 1 1 auto; min-width: 0; }
.w { border: 0.35mm solid #000; border-radius: 1mm; padding: 1mm 1.5mm; margin: 0 0 1.5mm 0; page-break-inside: avoid; }
.w h2 { font-size: 8.4pt; margin: 0 0 0.5mm 0; }
.turns { font-size: 15pt; font-weight: bold; }
.tpl { font-size: 8.4pt; font-weight: bold; }
.cp { font-size: 8.6pt; font-weight: bold; letter-spacing: 0.1pt; word-spacing: 1.2pt; }
.small { font-size: 6.6pt; }
.row { display: flex; gap: 2mm; align-items: center; flex-wrap: wrap; }
table.cpt { width: auto; margin: 0.5mm 0; font-size: 6.6pt; }
table.cpt td, table.cpt th { padding: 0.2mm 0.9mm; text-align: right; }
table.cpt td.cp { font-size: 9pt; font-weight: bold; }
table { border-collapse: collapse; width: 100%; font-size: 7pt; }
td, th { border: 0.2mm solid #777; padding: 0.3mm 1mm; text-align: left; }
td.n { text-align: right; }
.two { display: flex; gap: 3mm; margin: 1mm 0; }
.two > div { flex: 1 1 0; }
h3 { font-size: 8pt; margin: 0.8mm 0 0.5mm 0; }
.banner { font-weight: bold; font-size: 10pt; border: 0.8mm solid #000; background: #eee; padding: 1mm 2mm; margin: 0 0 1.5mm 0; }
.verdict { font-weight: bold; font-size: 8.6pt; border: 0.5mm solid #000; padding: 0.8mm 1.5mm; margin: 1mm 0; }
.verdict.fail { border-style: dashed; }
.w.void { border-style: dashed; background: repeating-linear-gradient(135deg, #fff 0 3mm, #f1f1f1 3mm 6mm); }
.stamp { font-weight: bold; letter-spacing: 0.2pt; border: 0.3mm solid #000; padding: 0 0.8mm; }
ul { margin: 0; padding-left: 3.5mm; }
.cautions { font-size: 6.2pt; line-height: 1.15; }
.warn { font-size: 6.6pt; }
.dense { font-size: 7pt; }
.dense .turns { font-size: 13pt; }
.dense .w { padding: 0.6mm 1.2mm; margin-bottom: 1mm; }
.dense .small, .dense .cautions { font-size: 5.9pt; }
.dense .cautions, .denser .cautions { columns: 2; column-gap: 4mm; }
.dense .cautions li, .denser .cautions li { break-inside: avoid; }
.denser { font-size: 6.4pt; line-height: 1.15; }
.denser .turns { font-size: 11pt; }
.denser .w { padding: 0.4mm 1mm; margin-bottom: 0.7mm; }
.denser .w h2 { font-size: 7.4pt; }
.denser .small, .denser .cautions, .denser .warn { font-size: 5.5pt; }
.denser table.cpt td.cp { font-size: 7.6pt; }
"#;

/// One winding's box on the HTML card.
fn html_winding(p: &Plan, w: &WindingPlan, k: usize, last: bool, look: &Look) -> String {
    let mut s = String::new();
    if p.verdict.ok {
        s += "<div class=\"w\">";
    } else {
        s += "<div class=\"w void\">";
    }
    let _ = write!(
        s,
        "<h2>{} &#160;{} &#8220;{}&#8221; &#8212; {}{}</h2>",
        k + 1,
        esc(role_word(w)),
        esc(&w.name),
        esc(&volts_amps(p, w)),
        if p.verdict.ok {
            ""
        } else {
            " <span class=\"stamp\">NOT TO BE WOUND</span>"
        }
    );
    let legs = if p.core.shape == Shape::Ui {
        format!(
            " &#160;(leg 1: {}, leg 2: {})",
            w.coil.coil_turns,
            w.turns - w.coil.coil_turns
        )
    } else {
        String::new()
    };
    if w.kept {
        let _ = write!(s, "<div><span class=\"turns\">{} turns</span>{legs} &#160; kept on the core as it is: do not unwind</div>", w.turns);
        let _ = write!(
            s,
            "<div class=\"small\">{} {}</div>",
            esc(&wire_text(w)),
            esc(&insulation_note(p, last, look))
        );
    } else {
        let _ = write!(
            s,
            "<div><span class=\"turns\">{} turns</span>{legs} &#160; <span class=\"tpl\">{} per layer &#215; {} layers</span></div>",
            esc(&turns_text(w)),
            w.coil.turns_per_layer,
            w.coil.layers
        );
        let _ = write!(s, "<div>{}</div>", esc(&wire_text(w)));
        // Twelve layers to a table: more wrap onto the next row, never past the page's edge.
        s += "<div class=\"row\">";
        for (c, chunk) in w.coil.checkpoints.chunks(12).enumerate() {
            s += "<table class=\"cpt\"><tr><th>layer</th>";
            for k in 1..=chunk.len() {
                let _ = write!(s, "<td>{}</td>", c * 12 + k);
            }
            s += "</tr><tr><th>ends at turn</th>";
            for t in chunk {
                let _ = write!(s, "<td class=\"cp\">{t}</td>");
            }
            s += "</tr></table>";
        }
        if let Some(t) = tap_text(w) {
            let _ = write!(s, "<div class=\"tpl\">Taps: {}</div>", esc(&t));
        }
        s += "</div>";
        let _ = write!(
            s,
            "<div class=\"small\">{} {}</div>",
            esc(&lead_note(w, k)),
            esc(&insulation_note(p, last, look))
        );
    }
    s += "</div>";
    s
}

/// The cut-and-buy list and the bench checks of the HTML card.
fn html_cut_and_checks(p: &Plan, o: &CardOptions) -> String {
    let mut s = String::new();
    s += "<div class=\"two\"><div>";
    let _ = write!(s, "<h3>Cut and buy (spare {} %)</h3><table><tr><th>winding</th><th>cut/strand m</th><th>strands</th><th>Cu g</th></tr>", num(o.spare * 100.0, 0));
    for w in p.windings.iter().filter(|w| !w.kept) {
        let _ = write!(
            s,
            "<tr><td>{}</td><td class=\"n\">{}</td><td class=\"n\">{}</td><td class=\"n\">{}</td></tr>",
            esc(&w.name),
            num(w.cut_length_m, 2),
            w.wire.strands,
            num(w.copper_mass_g, 0)
        );
    }
    s += "</table><ul class=\"small\">";
    for b in buy_list(p, o.spare) {
        let _ = write!(s, "<li>Buy {}</li>", esc(&buy_text(&b, &o.look)));
    }
    s += "</ul></div><div><h3>Bench checks</h3><table><tr><th>winding</th><th>&#937; at 20 &#176;C</th><th>no-load V</th></tr>";
    for w in &p.windings {
        let _ = write!(
            s,
            "<tr><td>{}</td><td class=\"n\">{}</td><td class=\"n\">{}</td></tr>",
            esc(&w.name),
            sig3(w.resistance_20c_ohm),
            if w.role == Role::Secondary {
                num(w.volts_no_load, 1)
            } else {
                "(supply)".to_string()
            }
        );
    }
    s += "</table><ul class=\"small\">";
    if let Some(i0) = p.drive.no_load_amps {
        let _ = write!(
            s,
            "<li>Idle primary current about {} A (from the sweep).</li>",
            sig3(i0)
        );
    }
    for l in power_up_lines(p) {
        let _ = write!(s, "<li>{}</li>", esc(l));
    }
    for l in load_lines(p) {
        s += &format!("<li>{}</li>", esc(&l));
    }
    s += "<li>After winding: the primary's volts, each output's no-load volts, each winding's ohms and the room temperature into a measurement file, then <code>ironwind diagnose</code>.</li>";
    s += "</ul></div></div>";
    s
}

/// The HTML card: one self-contained file, one A5 page when printed at 100 %.
pub fn html_card(p: &Plan, o: &CardOptions) -> String {
    let mut s = String::new();
    s += "<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\"/>";
    let _ = write!(s, "<title>Winding card: {}</title>", esc(&p.name));
    // More windings or layers than a roomy card holds: a denser type scale, still printed at 100 %.
    let load: usize = p.windings.len() * 3
        + p.windings
            .iter()
            .map(|w| w.coil.checkpoints.len().div_ceil(12) + usize::from(!w.taps.is_empty()))
            .sum::<usize>()
        + p.warnings.len()
        + usize::from(p.core.shape == Shape::Ui);
    // A bigger sheet holds more before the type must shrink.
    let room = (o.paper.size_mm().1 - 2.0 * MARGIN_MM) / 196.0;
    let load = (load as f64 / room).round() as usize;
    let density = if load > 12 {
        " denser"
    } else if load > 8 {
        " dense"
    } else {
        ""
    };
    // The page and the cross-section take the room the sheet has (the drawing about 28 % of the
    // printable width, up to 40 % of its height).
    let (paper_w, paper_h) = o.paper.size_mm();
    let page_w = paper_w - 2.0 * MARGIN_MM;
    let page_h = paper_h - 2.0 * MARGIN_MM;
    let xsec_w = (page_w * 0.28).round();
    let _ = write!(
        s,
        "<style>@page {{ size: {}; margin: {MARGIN_MM}mm; }}\n.page {{ width: {page_w:.1}mm; }}\n.xsec-box {{ flex: 0 0 {xsec_w}mm; text-align: center; font-size: 6.4pt; }}\n.xsec-box svg {{ width: {xsec_w}mm; height: auto; max-height: {:.0}mm; }}\n{CSS}</style></head><body><div class=\"page{density}\">",
        o.paper.css(),
        page_h * 0.4
    );
    if !p.verdict.ok {
        let _ = write!(s, "<div class=\"banner\">{}</div>", esc(&fail_banner(p)));
    }
    let _ = write!(s, "<h1>Winding card: {}</h1>", esc(&p.name));
    let _ = write!(
        s,
        "<p class=\"sub\">{}<br/>{}</p>",
        esc(&core_line(p, o.look.units)),
        esc(&drive_line(p))
    );
    s += "<p class=\"order\">Wind innermost first, every winding in the same direction. Mark each start lead before the first turn.";
    if p.core.shape == Shape::Ui {
        s += " U-I core: every winding is two half-coils in series, one per leg, fluxes adding; layers and checkpoints are per leg.";
    }
    s += "</p>";
    s += "<div class=\"top\"><div class=\"windings\">";
    let n = p.windings.len();
    for (k, w) in p.windings.iter().enumerate() {
        s += &html_winding(p, w, k, k + 1 == n, &o.look);
    }
    s += "</div><div class=\"xsec-box\">";
    s += &cross_section_svg(p, 160.0);
    s += "<div>One window, to scale</div></div></div>";
    s += &html_cut_and_checks(p, o);
    let _ = write!(
        s,
        "<div class=\"verdict{}\">{}</div>",
        if p.verdict.ok { "" } else { " fail" },
        esc(&verdict_line(p))
    );
    if !p.warnings.is_empty() {
        s += "<ul class=\"warn\">";
        for w in &p.warnings {
            let _ = write!(s, "<li>{}</li>", esc(&words::warning(w)));
        }
        s += "</ul>";
    }
    s += "<h3>Cautions</h3><ul class=\"cautions\">";
    for c in p.cautions {
        let _ = write!(s, "<li>{}</li>", esc(c));
    }
    s += "</ul>";
    let _ = write!(
        s,
        "<div class=\"foot\"><span>{}</span><span>not a safety approval: follow local codes</span></div>",
        esc(&footer_line(p, o))
    );
    s += "</div>";
    // Last resort for an unusually long card: draw the page smaller inside a box of the sheet's
    // printable height (less 1 mm), so it still prints on one page at 100 % scale.
    let _ = write!(
        s,
        "<script>var ironwindAvailMm={:.1};</script>",
        page_h - 1.0
    );
    s += "<script>(function(){var p=document.querySelector('.page');if(!p)return;var mm=96/25.4,avail=ironwindAvailMm*mm;var h=p.getBoundingClientRect().height;if(h>avail){var r=Math.max(0.3,0.92*avail/h);var f=document.createElement('div');f.className='fit';f.style.height=avail+'px';f.style.overflow='hidden';p.parentNode.insertBefore(f,p);f.appendChild(p);p.style.transformOrigin='0 0';p.style.transform='scale('+r+')';}})();</script>";
    s += "</body></html>\n";
    s
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn wrap_keeps_within_width() {
        let t = wrap(
            "one two three four five six seven eight nine ten",
            12,
            "  ",
            "    ",
        );
        assert!(t.lines().all(|l| l.chars().count() <= 12), "{t}");
        assert!(t.starts_with("  one"));
    }
}
