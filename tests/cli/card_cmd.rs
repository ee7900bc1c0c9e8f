//! `ironwind card`: every example's card in every format.

use crate::common::{example_jobs, run, scratch, write, GOOD_JOB};

#[test]
fn text_cards_fit_80_columns_and_hold_every_part() {
    for p in example_jobs() {
        let path = p.display().to_string();
        for extra in [&[][..], &["--ascii"][..]] {
            let mut args = vec!["card", path.as_str()];
            args.extend_from_slice(extra);
            let r = run(&args).ok();
            for line in r.stdout.lines() {
                assert!(
                    line.chars().count() <= 80,
                    "{path}: {} columns: {line}",
                    line.chars().count()
                );
            }
            if !extra.is_empty() {
                assert!(r.stdout.is_ascii(), "{path}: --ascii is plain ASCII");
            }
            assert!(!r.stdout.contains('\u{1b}'), "no colour when piped");
            // In order: title, windings, cut and buy, bench checks, verdict, cautions.
            let order = [
                "WINDING CARD",
                "[1]",
                "CUT AND BUY",
                "BENCH CHECKS",
                "VERDICT",
                "CAUTIONS",
            ];
            let mut at = 0;
            for part in order {
                let found = r.stdout[at..]
                    .find(part)
                    .unwrap_or_else(|| panic!("{path}: {part} after byte {at}"));
                at += found;
            }
        }
    }
}

#[test]
fn text_card_checkpoints_match_the_plan() {
    for p in example_jobs() {
        let path = p.display().to_string();
        let json = run(&["plan", &path, "--format", "json"]).ok().json();
        let card = run(&["card", &path]).ok().stdout;
        for w in json["windings"].as_array().expect("windings") {
            if w["kept"] == true {
                continue;
            }
            let cps: Vec<String> = w["checkpoints"]
                .as_array()
                .expect("cps")
                .iter()
                .map(|c| c.to_string())
                .collect();
            let row = card
                .lines()
                .filter(|l| l.trim_start().starts_with("ends at turn"))
                .map(|l| {
                    l.split_whitespace()
                        .skip(3)
                        .map(str::to_string)
                        .collect::<Vec<_>>()
                })
                .find(|cells| {
                    cells.first() == cps.first() && cells.last() == cps.iter().take(10).next_back()
                })
                .unwrap_or_else(|| panic!("{path}: checkpoints of {} on the card", w["name"]));
            assert_eq!(row, cps.iter().take(10).cloned().collect::<Vec<_>>());
        }
    }
}

#[test]
fn markdown_html_and_svg_cards() {
    let d = scratch("cards");
    for p in example_jobs() {
        let path = p.display().to_string();
        let md = run(&["card", &path, "--format", "markdown"]).ok().stdout;
        assert!(md.starts_with("# Winding card: "));
        assert!(md.contains("## Cautions"));
        let out = d.join("card.html");
        run(&[
            "card",
            &path,
            "--format",
            "html",
            "--output",
            &out.display().to_string(),
        ])
        .ok();
        let html = std::fs::read_to_string(&out).expect("html written");
        let doc = roxmltree::Document::parse_with_options(
            &html,
            roxmltree::ParsingOptions {
                allow_dtd: true,
                ..Default::default()
            },
        )
        .unwrap_or_else(|e| panic!("{path}: the HTML card parses: {e}"));
        // Self-contained: no external references of any kind.
        for n in doc.descendants().filter(|n| n.is_element()) {
            for a in n.attributes() {
                let v = a.value();
                let external = matches!(a.name(), "src" | "href")
                    || v.contains("http://") && a.name() != "xmlns"
                    || v.contains("https://");
                assert!(!external, "{path}: external reference {}={v}", a.name());
            }
        }
        assert!(
            !html.contains("@import") && !html.contains("url(http"),
            "{path}: no external CSS"
        );
        assert!(html.contains("size: A5 portrait"));
        assert!(
            doc.descendants().any(|n| n.has_tag_name("svg")),
            "inline cross-section"
        );
        assert!(
            doc.descendants()
                .any(|n| n.attribute("class") == Some("scale-bar")),
            "scale bar"
        );
        let svg = run(&["card", &path, "--format", "svg"]).ok().stdout;
        let sdoc = roxmltree::Document::parse(&svg).expect("SVG parses");
        let windings = sdoc
            .descendants()
            .filter(|n| n.attribute("class") == Some("winding"))
            .count();
        let json = run(&["plan", &path, "--format", "json"]).ok().json();
        assert_eq!(
            windings,
            json["windings"].as_array().expect("w").len(),
            "one band per winding"
        );
        // Distinguishable in greyscale: every band has its own pattern.
        let fills: std::collections::BTreeSet<&str> = sdoc
            .descendants()
            .filter(|n| n.attribute("class") == Some("winding"))
            .filter_map(|n| n.attribute("fill"))
            .collect();
        assert_eq!(fills.len(), windings.min(4));
    }
}

#[test]
fn demo_card_and_spare() {
    let r = run(&["demo", "--card"]).ok();
    assert!(r.stdout.contains("CUT AND BUY (spare 10 %)"));
    let d = scratch("spare");
    let p = write(&d, "job.toml", GOOD_JOB);
    run(&["card", &p, "--spare", "25"])
        .ok()
        .stdout_has("spare 25 %");
    run(&["card", &p, "--spare", "-1"])
        .code(2)
        .one_line_error()
        .stderr_has("--spare");
    run(&[
        "card",
        &p,
        "--format",
        "html",
        "--output",
        &d.join("no/such/dir/card.html").display().to_string(),
    ])
    .code(1)
    .one_line_error();
}

#[test]
fn buy_list_totals_each_size_with_the_spare() {
    for p in example_jobs() {
        let j = run(&["plan", &p.display().to_string(), "--format", "json"])
            .ok()
            .json();
        for b in j["buy"].as_array().expect("buy") {
            let expected: f64 = j["windings"]
                .as_array()
                .expect("w")
                .iter()
                .filter(|w| {
                    w["kept"] == false
                        && w["conductor"]["size"] == b["size"]
                        && w["conductor"]["system"] == b["system"]
                })
                .map(|w| {
                    w["cut_length_m"].as_f64().unwrap_or(0.0)
                        * w["strands"].as_f64().unwrap_or(0.0)
                        * w["sections"].as_f64().unwrap_or(0.0)
                        * 1.10
                })
                .sum();
            approx::assert_relative_eq!(
                b["length_m"].as_f64().expect("len"),
                expected,
                max_relative = 1e-12
            );
        }
    }
}

/// Foils in hand lie on each other: each layer is every foil thick. The drawing's layer lines must
/// be spread evenly across the whole band the plan's build gives (a layer of n foils plus the
/// interlayer between two), not crowded at the start as a single foil's thickness would put them.
#[test]
fn strip_foils_in_hand_are_drawn_to_scale() {
    let d = scratch("card-strip");
    let job = crate::common::edited(
        GOOD_JOB,
        "amps = 4.0",
        "amps = 20.0\nstrip_mm = [20.0, 0.3]\nstrands = 3",
    );
    let job = crate::common::edited(&job, "volts = 28.0", "volts = 6.0");
    let path = write(&d, "strip.toml", &job);
    let plan = run(&["plan", &path, "--format", "json"]).ok().json();
    let w = &plan["windings"][1];
    let layers = w["layers"].as_u64().expect("layers") as usize;
    let build = w["build_mm"].as_f64().expect("build");
    let interlayer = plan["settings"]["interlayer_mm"].as_f64().expect("il");
    assert!(layers >= 3, "a strip winding of several layers: {layers}");
    let svg = run(&["card", &path, "--format", "svg"]).ok().stdout;
    let doc = roxmltree::Document::parse(&svg).expect("SVG parses");
    let num = |n: &roxmltree::Node, a: &str| -> f64 {
        n.attribute(a).expect("attribute").parse().expect("number")
    };
    let band = doc
        .descendants()
        .filter(|n| n.attribute("class") == Some("winding"))
        .nth(1)
        .expect("the second winding's band");
    let (x, width) = (num(&band, "x"), num(&band, "width"));
    // Drawn in mm at 1:1 inside the viewBox, rounded to 0.01 mm.
    const DRAWN: f64 = 0.011;
    assert!(
        (width - build).abs() < DRAWN,
        "band {width} vs build {build}"
    );
    let mut lines: Vec<f64> = doc
        .descendants()
        .filter(|n| n.has_tag_name("line") && n.attribute("stroke-width") == Some("0.12"))
        .map(|n| num(&n, "x1"))
        .filter(|&lx| lx > x && lx < x + width)
        .collect();
    lines.sort_by(f64::total_cmp);
    assert_eq!(lines.len(), layers - 1, "one line between each two layers");
    // By hand: a layer is 3 foils of 0.3 + 0.1 mm insulation = 1.2 mm; the pitch of the lines is a
    // layer plus the interlayer, and the last line sits one layer (plus half an interlayer) inside
    // the band's outer face.
    let pitch = 3.0 * 0.4 + interlayer;
    for pair in lines.windows(2) {
        assert!((pair[1] - pair[0] - pitch).abs() < 2.0 * DRAWN, "{lines:?}");
    }
    let last_gap = x + width - lines[layers - 2];
    assert!(
        (last_gap - (1.2 + interlayer / 2.0)).abs() < 2.0 * DRAWN,
        "last line {last_gap} mm inside the band"
    );
}
