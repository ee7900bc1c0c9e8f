//! The HTML bench card in a real headless Chromium: one A5 page when printed, and a screenshot that
//! is not blank. Skipped, with a notice, where no Chromium is installed (`.ci/run` installs Debian's).

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

fn headless(browser: &Path, profile: &Path, args: &[String]) -> bool {
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
        .map(|o| o.status.success())
        .unwrap_or(false)
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
    v.sort();
    v
}

#[test]
fn html_cards_print_on_one_a5_page_and_render() {
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
        let html = dir.join(format!("{stem}.html"));
        let st = Command::new(env!("CARGO_BIN_EXE_ironwind"))
            .args([
                "card",
                &job.display().to_string(),
                "--format",
                "html",
                "--output",
                &html.display().to_string(),
            ])
            .status()
            .expect("ironwind runs");
        assert!(st.success(), "{stem}: card written");
        let pdf = dir.join(format!("{stem}.pdf"));
        let url = format!("file://{}", html.display());
        assert!(
            headless(
                &browser,
                &dir.join(format!("profile-{stem}")),
                &[
                    "--no-pdf-header-footer".into(),
                    format!("--print-to-pdf={}", pdf.display()),
                    url.clone()
                ]
            ),
            "{stem}: chromium printed"
        );
        let bytes = std::fs::read(&pdf).expect("pdf");
        assert_eq!(
            pdf_pages(&bytes),
            1,
            "{stem}: the card prints on exactly one A5 page"
        );
        // A5 portrait is 419.5 × 595.3 pt.
        let text = String::from_utf8_lossy(&bytes);
        assert!(
            text.contains("419.5") || text.contains("420") || text.contains("419"),
            "{stem}: A5 media box"
        );
        // Nothing clipped: the last caution is on the page (when poppler's pdftotext is installed).
        if let Ok(o) = Command::new("pdftotext").arg(&pdf).arg("-").output() {
            if o.status.success() {
                let text = String::from_utf8_lossy(&o.stdout)
                    .split_whitespace()
                    .collect::<Vec<_>>()
                    .join(" ");
                assert!(
                    text.contains("licensed practice"),
                    "{stem}: the last caution is printed"
                );
                assert!(
                    text.contains("Winding card"),
                    "{stem}: the title is printed"
                );
            }
        }
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
