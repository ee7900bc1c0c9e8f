//! The HTML bench card in a real headless Chromium: one page on every paper size when printed, the
//! footer and the last caution on it, a failing design's banner first; nothing laid over anything
//! else (a probe script measures the boxes in the rendered page); a screenshot that is not blank.
//! Skipped, with a notice, where no Chromium is installed (`.ci/run` installs Debian's).

use std::path::{Path, PathBuf};
use std::process::Command;

fn chromium() -> Option<PathBuf> {
    [
        "/usr/bin/chromium",
        "/usr/bin/chromium-browser",
        "/usr/bin/google-chrome",
    ]
    .iter()
    .map(PathBuf::from)
    .find(|p| p.exists())
}

/// Runs headless Chromium with a profile of its own; its output when it ran.
fn headless_run(browser: &Path, profile: &Path, args: &[String]) -> Option<std::process::Output> {
    Command::new(browser)
        .args([
            "--headless",
            "--no-sandbox",
            "--disable-gpu",
            "--disable-quic",
            "--no-first-run",
            "--disable-background-networking",
            "--disable-component-update",
            "--disable-sync",
            "--hide-scrollbars",
        ])
        .arg(format!("--user-data-dir={}", profile.display()))
        .args(args)
        .output()
        .ok()
}

fn headless(browser: &Path, profile: &Path, args: &[String]) -> bool {
    headless_run(browser, profile, args).is_some_and(|o| o.status.success())
}

/// Pages in a PDF: the page objects (`/Type /Page`, not `/Pages`).
fn pdf_pages(bytes: &[u8]) -> usize {
    let mut n = 0;
    let pat = b"/Type";
    let mut i = 0;
    while i + pat.len() < bytes.len() {
        if &bytes[i..i + pat.len()] == pat {
            let rest = &bytes[i + pat.len()..];
            let rest = &rest[rest.iter().take_while(|b| b.is_ascii_whitespace()).count()..];
            if rest.starts_with(b"/Page") && !rest.starts_with(b"/Pages") {
                n += 1;
            }
        }
        i += 1;
    }
    n
}

fn jobs() -> Vec<PathBuf> {
    let root = PathBuf::from(env!("CARGO_MANIFEST_DIR"));
    let mut v: Vec<PathBuf> = std::fs::read_dir(root.join("examples"))
        .expect("examples")
        .filter_map(|e| e.ok().map(|e| e.path()))
        .filter(|p| p.extension().is_some_and(|x| x == "toml"))
        .collect();
    v.push(root.join("tests/data/crowded_card.toml"));
    v.push(root.join("tests/data/eight_windings.toml"));
    v.push(root.join("tests/data/eight_windings_overfull.toml"));
    v.sort();
    v
}

/// A probe added to a copy of the card: every block inside the page's width, no winding box over
/// the cross-section, the legend clear of the drawing, everything drawn inside the drawing's box.
const PROBE: &str = r#"<script>
(function(){
 function hit(a,b){return a.right>b.left+0.5&&a.left<b.right-0.5&&a.bottom>b.top+0.5&&a.top<b.bottom-0.5;}
 var bad=[];var page=document.querySelector('.page').getBoundingClientRect();
 document.querySelectorAll('.page > *, .w, .xsec-box, .foot').forEach(function(b){
   var r=b.getBoundingClientRect(); if(r.right>page.right+1) bad.push('wider than the page: '+b.className+b.tagName);});
 var x=document.querySelector('.xsec-box').getBoundingClientRect();
 document.querySelectorAll('.w').forEach(function(w,i){ if(hit(w.getBoundingClientRect(),x)) bad.push('winding box '+(i+1)+' over the drawing');});
 var svg=document.querySelector('svg.xsec').getBoundingClientRect();
 var drawn=document.querySelectorAll('svg.xsec rect.winding, svg.xsec rect.overflow, svg.xsec rect.window, svg.xsec rect.clearance');
 document.querySelectorAll('svg.xsec .legend > *').forEach(function(l){var r=l.getBoundingClientRect();
   drawn.forEach(function(d){ if(hit(r,d.getBoundingClientRect())) bad.push('legend over '+d.getAttribute('class'));});
   if(r.right>svg.right+0.5||r.bottom>svg.bottom+0.5) bad.push('legend outside the drawing');});
 document.querySelectorAll('svg.xsec rect, svg.xsec text').forEach(function(e){var r=e.getBoundingClientRect();
   if(r.right>svg.right+1||r.bottom>svg.bottom+1) bad.push('outside the drawing: '+e.tagName+' '+(e.getAttribute('class')||e.textContent));});
 document.body.setAttribute('data-layout', bad.length? bad.join('; '):'clean');
})();
</script></body>"#;

/// Sheet sizes in PDF points (1/72 in): ISO 216 A5 and A4, US Letter.
const PAPERS: &[(&str, &str, &str)] = &[
    ("a5", "419.5", "595.2"),
    ("a4", "595.2", "841.8"),
    ("letter", "612", "792"),
];

fn card(job: &Path, html: &Path, paper: &str) {
    let st = Command::new(env!("CARGO_BIN_EXE_ironwind"))
        .args([
            "card",
            &job.display().to_string(),
            "--format",
            "html",
            "--paper",
            paper,
            "--output",
            &html.display().to_string(),
        ])
        .env("SOURCE_DATE_EPOCH", "1796169600")
        .status()
        .expect("ironwind runs");
    assert!(st.success(), "{}: card written", job.display());
}

#[test]
fn html_cards_print_on_one_page_of_every_paper_and_render() {
    let Some(browser) = chromium() else {
        println!("notice: no Chromium found; the browser test of the HTML card is skipped (apt-get install chromium)");
        return;
    };
    let dir = std::env::temp_dir().join(format!("ironwind-browser-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).expect("dir");
    for job in jobs() {
        let stem = job
            .file_stem()
            .and_then(|s| s.to_str())
            .unwrap_or("card")
            .to_string();
        let fails = Command::new(env!("CARGO_BIN_EXE_ironwind"))
            .args(["plan", &job.display().to_string(), "--strict"])
            .output()
            .expect("plan runs")
            .status
            .code()
            == Some(3);
        for (paper, w_pt, h_pt) in PAPERS {
            let html = dir.join(format!("{stem}-{paper}.html"));
            card(&job, &html, paper);
            let pdf = dir.join(format!("{stem}-{paper}.pdf"));
            let url = format!("file://{}", html.display());
            assert!(
                headless(
                    &browser,
                    &dir.join(format!("profile-{stem}-{paper}")),
                    &[
                        "--no-pdf-header-footer".into(),
                        format!("--print-to-pdf={}", pdf.display()),
                        url.clone()
                    ]
                ),
                "{stem} {paper}: chromium printed"
            );
            let bytes = std::fs::read(&pdf).expect("pdf");
            assert_eq!(pdf_pages(&bytes), 1, "{stem} {paper}: exactly one page");
            let text = String::from_utf8_lossy(&bytes);
            let near = |v: &str| {
                let v: f64 = v.parse().expect("number");
                [v.floor(), v.round(), v.ceil()]
                    .iter()
                    .any(|x| text.contains(&format!(" {x}")) || text.contains(&format!("{x:.1}")))
            };
            assert!(
                near(w_pt) && near(h_pt),
                "{stem} {paper}: media box {w_pt} × {h_pt} pt"
            );
            // Nothing clipped: the last caution and the footer are on the page; a failing design
            // opens with its banner (when poppler's pdftotext is installed).
            if let Ok(o) = Command::new("pdftotext").arg(&pdf).arg("-").output() {
                if o.status.success() {
                    let text = String::from_utf8_lossy(&o.stdout)
                        .split_whitespace()
                        .collect::<Vec<_>>()
                        .join(" ");
                    assert!(
                        text.contains("licensed practice"),
                        "{stem} {paper}: last caution"
                    );
                    assert!(
                        text.contains("2026-12-02"),
                        "{stem} {paper}: the footer's date"
                    );
                    assert!(text.contains("Winding card"), "{stem} {paper}: the title");
                    if fails {
                        assert!(
                            text.trim_start().starts_with("DOES NOT PASS"),
                            "{stem} {paper}: the banner comes first: {}",
                            &text[..text.len().min(120)]
                        );
                    }
                }
            }
            // Nothing over anything else.
            let probed = dir.join(format!("{stem}-{paper}-probe.html"));
            let page = std::fs::read_to_string(&html).expect("html");
            std::fs::write(&probed, page.replace("</body>", PROBE)).expect("probe");
            let dom = headless_run(
                &browser,
                &dir.join(format!("profile-dom-{stem}-{paper}")),
                &["--dump-dom".into(), format!("file://{}", probed.display())],
            )
            .expect("chromium runs");
            let dom = String::from_utf8_lossy(&dom.stdout);
            assert!(
                dom.contains("data-layout=\"clean\""),
                "{stem} {paper}: {}",
                dom.split("data-layout=\"")
                    .nth(1)
                    .and_then(|r| r.split('"').next())
                    .unwrap_or("no probe result")
            );
        }
        let url = format!("file://{}", dir.join(format!("{stem}-a5.html")).display());
        let png = dir.join(format!("{stem}.png"));
        assert!(
            headless(
                &browser,
                &dir.join(format!("profile-shot-{stem}")),
                &[
                    format!("--screenshot={}", png.display()),
                    "--window-size=600,850".into(),
                    url
                ]
            ),
            "{stem}: chromium took a screenshot"
        );
        let shot = std::fs::read(&png).expect("png");
        assert!(shot.starts_with(b"\x89PNG"), "{stem}: a PNG");
        // A blank white page compresses to a few hundred bytes; a rendered card is many kilobytes.
        assert!(
            shot.len() > 20_000,
            "{stem}: the screenshot is not blank ({} bytes)",
            shot.len()
        );
    }
}
