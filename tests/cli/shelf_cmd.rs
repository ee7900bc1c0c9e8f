//! `ironwind shelf`: the inventory, its file, and ranking.

use crate::common::{example_jobs, run, run_with, scratch, write};
use std::process::{Command, Stdio};

fn shelf(dir: &std::path::Path) -> String {
    dir.join("shelf.csv").display().to_string()
}

fn sh(path: &str, args: &[&str]) -> crate::common::Ran {
    let mut a = vec!["shelf", "--shelf", path];
    a.extend_from_slice(args);
    run(&a)
}

#[test]
fn add_list_show_edit_remove_and_exact_decimals() {
    let d = scratch("shelf-basic");
    let s = shelf(&d);
    let id = sh(
        &s,
        &[
            "add",
            "--label",
            "grey UPS core",
            "--tongue",
            "38.10",
            "--stack",
            "62",
            "--window",
            "19x57",
            "--format",
            "json",
        ],
    )
    .ok()
    .json();
    assert_eq!(id["id"], 1);
    assert_eq!(
        sh(
            &s,
            &[
                "add",
                "--label",
                "inch core",
                "--tongue",
                "1.25 in",
                "--stack",
                "31.50",
                "--window",
                "16x48"
            ]
        )
        .ok()
        .stdout
        .trim(),
        "2"
    );
    let list = sh(&s, &["list", "--format", "json"]).ok().json();
    let cores = list["cores"].as_array().expect("cores");
    assert_eq!(cores.len(), 2);
    assert_eq!(cores[0]["label"], "grey UPS core");
    // Kept exactly as typed: "38.10" and "31.50" survive, inches keep their unit.
    assert_eq!(cores[0]["typed"]["tongue_mm"], "38.10");
    assert_eq!(cores[1]["typed"]["stack_mm"], "31.50");
    assert_eq!(cores[1]["typed"]["tongue_mm"], "1.25 in");
    assert_eq!(cores[1]["tongue_mm"].as_f64(), Some(31.75));
    let text = std::fs::read_to_string(&s).expect("shelf file");
    assert!(text.contains(",38.10,") && text.contains(",31.50,"));
    sh(&s, &["show", "2"]).ok().stdout_has("inch core");
    sh(
        &s,
        &["edit", "2", "--stack", "40.00", "--notes", "re-measured"],
    )
    .ok();
    let one = sh(&s, &["show", "2", "--format", "json"]).ok().json();
    assert_eq!(one["typed"]["stack_mm"], "40.00");
    sh(&s, &["edit", "2", "--stack", "-4"])
        .code(2)
        .one_line_error()
        .stderr_has("--stack");
    sh(&s, &["remove", "1"]).ok();
    sh(&s, &["show", "1"]).code(2).one_line_error();
    // Sorting keys.
    sh(
        &s,
        &[
            "add", "--label", "big", "--tongue", "50", "--stack", "80", "--window", "25x75",
        ],
    )
    .ok();
    let sorted = sh(&s, &["list", "--sort", "area-product", "--format", "json"])
        .ok()
        .json();
    assert_eq!(sorted["cores"][0]["label"], "big");
}

#[test]
fn export_neutralises_formula_cells_and_import_round_trips() {
    let d = scratch("shelf-export");
    let s = shelf(&d);
    for label in ["=HYPERLINK(\"x\")", "+1", "-1", "@SUM(A1)", "\tTAB"] {
        sh(
            &s,
            &[
                "add", "--label", label, "--tongue", "30", "--stack", "40", "--window", "15x45",
                "--notes", "=1+1",
            ],
        )
        .ok();
    }
    let csv = sh(&s, &["export", "--format", "csv"]).ok().stdout;
    let mut rdr = csv::Reader::from_reader(csv.as_bytes());
    for rec in rdr.records() {
        let rec = rec.expect("row");
        for k in [1, 11] {
            let cell = rec.get(k).expect("cell");
            assert!(
                !cell.starts_with(['=', '+', '-', '@', '\t', '\r']),
                "neutralised: {cell:?}"
            );
        }
    }
    // Import: exact decimals survive a round trip through the import format.
    let imp = write(&d, "imp.csv", "label,shape,tongue_mm,stack_mm,window_width_mm,window_height_mm,stacking_factor,steel,mass_g,volts_per_turn,notes\nbench core,ei,31.50,40.00,15.75,47.25,0.960,M400-50A,1234.5,0.2250,kept dry\nempty defaults,,30,40,15,45,,,,,\n");
    let s2 = shelf(&scratch("shelf-import"));
    sh(&s2, &["import", &imp]).ok().stdout_has("imported 2");
    let j = sh(&s2, &["list", "--format", "json"]).ok().json();
    let t = &j["cores"][0]["typed"];
    assert_eq!(
        (
            t["tongue_mm"].as_str(),
            t["stack_mm"].as_str(),
            t["stacking_factor"].as_str(),
            t["volts_per_turn"].as_str()
        ),
        (Some("31.50"), Some("40.00"), Some("0.960"), Some("0.2250"))
    );
    assert_eq!(
        j["cores"][1]["typed"]["stacking_factor"], "0.95",
        "empty cells take the defaults"
    );
    assert_eq!(j["cores"][1]["steel"], "unknown");
    // Bad rows: reported by line; nothing imported without --skip-bad.
    let bad = write(&d, "bad.csv", "label,shape,tongue_mm,stack_mm,window_width_mm,window_height_mm,stacking_factor,steel,mass_g,volts_per_turn,notes\ngood,ei,30,40,15,45,,,,,\nbad,ei,abc,40,15,45,,,,,\nworse,xx,30,40,15,45,,,,,\n");
    let s3 = shelf(&scratch("shelf-bad-import"));
    sh(&s3, &["import", &bad])
        .code(2)
        .one_line_error()
        .stderr_has("line 3")
        .stderr_has("line");
    assert!(
        !std::path::Path::new(&s3).exists()
            || sh(&s3, &["list", "--format", "json"]).ok().json()["cores"]
                .as_array()
                .map(|a| a.len())
                == Some(0)
    );
    let r = sh(&s3, &["import", &bad, "--skip-bad"]).ok();
    assert!(r.stdout.contains("imported 1"));
    assert!(r.stderr.contains("line 3") && r.stderr.contains("line 4"));
}

#[test]
fn a_bad_row_still_lists_and_nothing_is_rewritten() {
    let d = scratch("shelf-badrow");
    let s = shelf(&d);
    let text = "id,label,shape,tongue_mm,stack_mm,window_width_mm,window_height_mm,stacking_factor,steel,mass_g,volts_per_turn,notes,added\n1,a,ei,30,40,15,45,0.95,unknown,,,,2026-01-01\n2,b,ei,thirty,40,15,45,0.95,unknown,,,,2026-01-01\n3,c,ei,31,40,15,45,0.95,unknown,,,,2026-01-01\n";
    std::fs::write(&s, text).expect("write");
    let r = sh(&s, &["list", "--format", "json"]).ok();
    assert_eq!(r.json()["cores"].as_array().map(|a| a.len()), Some(2));
    assert!(r.stderr.contains("line 3"), "{}", r.stderr);
    sh(
        &s,
        &[
            "add", "--label", "x", "--tongue", "30", "--stack", "40", "--window", "15x45",
        ],
    )
    .code(2)
    .one_line_error()
    .stderr_has("line 3");
    assert_eq!(
        std::fs::read_to_string(&s).expect("read"),
        text,
        "nothing rewritten"
    );
    sh(&s, &["remove", "2"]).ok();
    sh(
        &s,
        &[
            "add", "--label", "x", "--tongue", "30", "--stack", "40", "--window", "15x45",
        ],
    )
    .ok();
}

#[test]
fn a_shelf_that_cannot_be_written_fails_with_exit_1_and_loses_nothing() {
    // A directory nobody can create files in: /proc refuses new files even to root.
    let s = "/proc/ironwind-test-shelf.csv";
    let r = sh(
        s,
        &[
            "add", "--label", "x", "--tongue", "30", "--stack", "40", "--window", "15x45",
        ],
    );
    assert_eq!(r.code, 1, "{}", r.stderr);
    assert!(r.stderr.starts_with("error: ") && r.stderr.contains("ironwind-test-shelf.csv"));
    // And a read-only directory, where permissions apply (not as root).
    let d = scratch("shelf-ro");
    let s = shelf(&d);
    sh(
        &s,
        &[
            "add", "--label", "keep me", "--tongue", "30", "--stack", "40", "--window", "15x45",
        ],
    )
    .ok();
    let before = std::fs::read_to_string(&s).expect("shelf");
    let ro = Command::new("chmod")
        .arg("555")
        .arg(&d)
        .status()
        .map(|st| st.success())
        .unwrap_or(false);
    let probe = d.join("probe");
    let writable = std::fs::write(&probe, b"x").is_ok();
    let _ = std::fs::remove_file(&probe);
    if ro && !writable {
        let r = sh(
            &s,
            &[
                "add", "--label", "y", "--tongue", "30", "--stack", "40", "--window", "15x45",
            ],
        );
        assert_eq!(r.code, 1, "{}", r.stderr);
    }
    let _ = Command::new("chmod").arg("755").arg(&d).status();
    assert_eq!(
        std::fs::read_to_string(&s).expect("shelf"),
        before,
        "nothing lost"
    );
}

#[test]
fn kill_9_during_adds_never_tears_the_shelf() {
    let d = scratch("shelf-kill");
    let s = shelf(&d);
    let mut acked: Vec<u64> = Vec::new();
    let mut seed: u64 = std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .map(|t| t.as_nanos() as u64)
        .unwrap_or(7);
    for k in 0..40 {
        seed = seed
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        let delay_us = (seed >> 33) % 6000;
        let mut child = Command::new(env!("CARGO_BIN_EXE_ironwind"))
            .args([
                "shelf",
                "--shelf",
                &s,
                "add",
                "--label",
                &format!("core {k}"),
                "--tongue",
                "30",
                "--stack",
                "40",
                "--window",
                "15x45",
            ])
            .stdout(Stdio::piped())
            .stderr(Stdio::null())
            .spawn()
            .expect("spawn");
        std::thread::sleep(std::time::Duration::from_micros(delay_us));
        let _ = child.kill(); // SIGKILL
        let out = child.wait_with_output().expect("wait");
        if let Ok(id) = String::from_utf8_lossy(&out.stdout).trim().parse::<u64>() {
            acked.push(id);
        }
        // After every kill the shelf parses whole.
        let j = sh(&s, &["list", "--format", "json"]).ok().json();
        assert_eq!(
            j["bad_rows"].as_array().map(|a| a.len()),
            Some(0),
            "no torn row after kill {k}"
        );
    }
    let j = sh(&s, &["list", "--format", "json"]).ok().json();
    let ids: Vec<u64> = j["cores"]
        .as_array()
        .expect("cores")
        .iter()
        .filter_map(|c| c["id"].as_u64())
        .collect();
    for id in &acked {
        assert!(ids.contains(id), "acknowledged id {id} is on the shelf");
    }
}

#[test]
fn concurrent_adds_lose_nothing() {
    let d = scratch("shelf-conc");
    let s = shelf(&d);
    let children: Vec<_> = (0..4)
        .map(|p| {
            let s = s.clone();
            std::thread::spawn(move || {
                (0..8)
                    .map(|k| {
                        let r = run(&[
                            "shelf",
                            "--shelf",
                            &s,
                            "add",
                            "--label",
                            &format!("p{p} k{k}"),
                            "--tongue",
                            "30",
                            "--stack",
                            "40",
                            "--window",
                            "15x45",
                        ]);
                        assert_eq!(r.code, 0, "{}", r.stderr);
                        r.stdout.trim().parse::<u64>().expect("id")
                    })
                    .collect::<Vec<u64>>()
            })
        })
        .collect();
    let mut all: Vec<u64> = children
        .into_iter()
        .flat_map(|h| h.join().expect("thread"))
        .collect();
    all.sort();
    all.dedup();
    assert_eq!(all.len(), 32, "every add got its own id");
    let j = sh(&s, &["list", "--format", "json"]).ok().json();
    assert_eq!(j["cores"].as_array().map(|a| a.len()), Some(32));
}

#[test]
fn rank_agrees_with_planning_each_core() {
    let d = scratch("shelf-rank");
    let s = shelf(&d);
    let cores = [
        ("small", "20", "25", "10x30"),
        ("medium", "32", "40", "16x48"),
        ("large", "44", "60", "22x66"),
        ("tall", "35", "45", "17.5x52.5"),
    ];
    for (label, t, st, w) in cores {
        sh(
            &s,
            &[
                "add", "--label", label, "--tongue", t, "--stack", st, "--window", w,
            ],
        )
        .ok();
    }
    let job = example_jobs()
        .into_iter()
        .find(|p| p.ends_with("garage_charger.toml"))
        .expect("job");
    let job = job.display().to_string();
    let r = sh(&s, &["rank", &job, "--format", "json"]).ok().json();
    let ranked = r["ranked"].as_array().expect("ranked");
    assert_eq!(ranked.len(), 4);
    let text = std::fs::read_to_string(&job).expect("job text");
    for item in ranked {
        let (label, t, st, w) = cores.iter().find(|c| c.0 == item["label"]).expect("core");
        let (ww, wh) = w.split_once('x').expect("window");
        let e = crate::common::edited(&text, "tongue_mm = 38.0", &format!("tongue_mm = {t}"));
        let e = crate::common::edited(&e, "stack_mm = 50.0", &format!("stack_mm = {st}"));
        let e = crate::common::edited(
            &e,
            "window_width_mm = 19.0",
            &format!("window_width_mm = {ww}"),
        );
        let edited = crate::common::edited(
            &e,
            "window_height_mm = 57.0",
            &format!("window_height_mm = {wh}"),
        );
        let p = write(&d, &format!("{label}.toml"), &edited);
        let plan = run(&["plan", &p, "--format", "json"]);
        let ok = plan.code == 0 && plan.json()["verdict"]["ok"] == true;
        assert_eq!(
            item["carries"].as_bool(),
            Some(ok),
            "{label}: rank agrees with its own plan"
        );
        assert!(item["margin_pct"].as_f64().is_some() && item["limit"].as_str().is_some());
    }
    // Carrying cores first, by margin.
    let flags: Vec<bool> = ranked
        .iter()
        .map(|r| r["carries"].as_bool().unwrap_or(false))
        .collect();
    assert!(flags.windows(2).all(|w| w[0] >= w[1]));
    let top = sh(&s, &["rank", &job, "--top", "2", "--format", "json"])
        .ok()
        .json();
    assert_eq!(top["ranked"].as_array().map(|a| a.len()), Some(2));
    // Quiet when piped: no progress bar on stderr.
    let r = run_with(&["shelf", "--shelf", &s, "rank", &job], None, &[]);
    assert!(r.stderr.is_empty(), "{}", r.stderr);
}

#[test]
fn an_export_imports_back_whole() {
    let d = scratch("shelf-roundtrip");
    let s = shelf(&d);
    sh(
        &s,
        &[
            "add",
            "--label",
            "=looks like a formula",
            "--tongue",
            "31.50",
            "--stack",
            "1.5 in",
            "--window",
            "15.75x47.25",
            "--notes",
            "-kept dry",
        ],
    )
    .ok();
    let csv = sh(&s, &["export", "--format", "csv"]).ok().stdout;
    let p = write(&d, "export.csv", &csv);
    let s2 = shelf(&scratch("shelf-roundtrip-2"));
    sh(&s2, &["import", &p]).ok();
    let a = sh(&s, &["list", "--format", "json"]).ok().json();
    let b = sh(&s2, &["list", "--format", "json"]).ok().json();
    assert_eq!(
        a["cores"][0]["typed"], b["cores"][0]["typed"],
        "labels, notes and decimals come back as typed"
    );
}

#[test]
fn the_shelf_has_a_home_without_home() {
    // No HOME, no XDG_DATA_HOME, no IRONWIND_SHELF: the data folder still resolves (from the
    // account database) and the command says where the shelf is.
    let out = std::process::Command::new(env!("CARGO_BIN_EXE_ironwind"))
        .args(["shelf", "list", "--format", "text"])
        .env_remove("HOME")
        .env_remove("XDG_DATA_HOME")
        .env_remove("IRONWIND_SHELF")
        .env("NO_COLOR", "1")
        .output()
        .expect("runs");
    let all = format!(
        "{}{}",
        String::from_utf8_lossy(&out.stdout),
        String::from_utf8_lossy(&out.stderr)
    );
    // An account with no home in the database is told how to name the shelf, without a panic.
    if out.status.success() {
        assert!(all.contains("shelf.csv"), "{all}");
    } else {
        assert_eq!(out.status.code(), Some(1), "{all}");
        assert!(
            all.starts_with("error: ") && all.contains("IRONWIND_SHELF"),
            "{all}"
        );
    }
}
