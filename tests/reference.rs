//! docs/job-file.md lists every key the parsers accept, and no other: for each table the parser's
//! own list (what serde names when it refuses an unknown key) must equal the page's.

use ironwind::job::parse_job;

const GOOD: &str = "[core]\ntongue_mm = 32\nstack_mm = 40\nwindow_width_mm = 16\nwindow_height_mm = 48\n[supply]\nfrequency_hz = 50\n[[winding]]\nname = \"p\"\nrole = \"primary\"\nvolts = 230\n[[winding]]\nname = \"s\"\nrole = \"secondary\"\nvolts = 24\namps = 1\n";

/// The keys of one `### [table]` section of the page.
fn documented(page: &str, part: &str, table: &str) -> Vec<String> {
    let start = page.find(part).expect("part");
    let rest = &page[start..];
    let head = format!("### {table}\n");
    let at = rest
        .find(&head)
        .unwrap_or_else(|| panic!("{table} documented"));
    rest[at + head.len()..]
        .lines()
        .skip_while(|l| !l.starts_with('|'))
        .take_while(|l| l.starts_with('|'))
        .skip(2)
        .filter_map(|l| l.split('|').nth(1).map(|k| k.trim().to_string()))
        .collect()
}

/// The keys the parser names when it refuses `zz_unknown` in the text.
fn accepted(text: &str) -> Vec<String> {
    let e = parse_job(text, "t", &|_| Err(ironwind::Error::Failed("none".into())))
        .expect_err("unknown key refused")
        .to_string();
    keys_of(&e)
}

fn keys_of(message: &str) -> Vec<String> {
    let list = message
        .split("expected one of ")
        .nth(1)
        .unwrap_or_else(|| panic!("the parser lists its keys: {message}"));
    list.split(", ")
        .map(|k| k.trim().trim_matches('`').to_string())
        .collect()
}

fn same(mut a: Vec<String>, mut b: Vec<String>, what: &str) {
    a.sort();
    b.sort();
    assert_eq!(
        a, b,
        "{what}: the parser's keys (left) and docs/job-file.md's (right)"
    );
}

#[test]
fn every_job_key_is_documented_and_every_documented_key_parses() {
    let page = std::fs::read_to_string("docs/job-file.md").expect("docs/job-file.md");
    for (table, text) in [
        (
            "[core]",
            GOOD.replace("[core]\n", "[core]\nzz_unknown = 1\n"),
        ),
        (
            "[supply]",
            GOOD.replace("[supply]\n", "[supply]\nzz_unknown = 1\n"),
        ),
        (
            "[limits]",
            GOOD.replace("[supply]\n", "[limits]\nzz_unknown = 1\n[supply]\n"),
        ),
        (
            "[wire]",
            GOOD.replace("[supply]\n", "[wire]\nzz_unknown = 1\n[supply]\n"),
        ),
        (
            "[insulation]",
            GOOD.replace("[supply]\n", "[insulation]\nzz_unknown = 1\n[supply]\n"),
        ),
        (
            "[probe]",
            GOOD.replace("[supply]\n", "[probe]\nzz_unknown = 1\n[supply]\n"),
        ),
        (
            "[[winding]] (innermost first)",
            GOOD.replace("amps = 1\n", "amps = 1\nzz_unknown = 1\n"),
        ),
    ] {
        assert!(text.contains("zz_unknown"), "{table}: the edit applies");
        same(
            accepted(&text),
            documented(&page, "## Job file", table),
            table,
        );
    }
}

#[test]
fn every_measurement_key_is_documented() {
    let page = std::fs::read_to_string("docs/job-file.md").expect("docs/job-file.md");
    let job = parse_job(GOOD, "t", &|_| Err(ironwind::Error::Failed("none".into()))).expect("job");
    let plan = ironwind::plan::plan(&job);
    for (table, text) in [
        ("top level", "applied_volts = 230\nzz_unknown = 1\n"),
        (
            "[[winding]]",
            "applied_volts = 230\n[[winding]]\nname = \"s\"\nzz_unknown = 1\n",
        ),
    ] {
        let e = ironwind::diagnose::parse_measured(text, "m", &plan)
            .expect_err("refused")
            .to_string();
        // `winding` is the table documented on its own.
        let keys: Vec<String> = keys_of(&e).into_iter().filter(|k| k != "winding").collect();
        same(keys, documented(&page, "## Measurement file", table), table);
    }
}
