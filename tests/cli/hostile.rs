//! Hostile input: no hang, no panic, nothing lost or overwritten, every message whole.

use crate::common::{edited, run, scratch, write, GOOD_JOB};
use std::os::unix::fs::PermissionsExt;
use std::process::{Command, Stdio};

#[test]
fn a_fifo_is_refused_not_read() {
    let d = scratch("fifo");
    let fifo = d.join("pipe");
    let made = Command::new("mkfifo").arg(&fifo).status();
    if !made.is_ok_and(|s| s.success()) {
        eprintln!("notice: no mkfifo here; skipped");
        return;
    }
    let f = fifo.display().to_string();
    run(&["plan", &f])
        .code(2)
        .one_line_error()
        .stderr_has("regular file");
    run(&["shelf", "--shelf", &f, "list"])
        .code(2)
        .one_line_error()
        .stderr_has("regular file");
}

#[test]
fn a_stderr_that_cannot_be_written_is_no_panic() {
    let Ok(full) = std::fs::OpenOptions::new().write(true).open("/dev/full") else {
        return;
    };
    let out = Command::new(env!("CARGO_BIN_EXE_ironwind"))
        .args(["plan", "/no/such/job.toml"])
        .stdout(Stdio::null())
        .stderr(full)
        .status()
        .expect("runs");
    assert_eq!(out.code(), Some(2), "the exit code stands, no panic (101)");
}

#[test]
fn an_output_over_an_input_is_refused() {
    let d = scratch("overwrite");
    let job = write(&d, "job.toml", GOOD_JOB);
    let before = std::fs::read_to_string(&job).expect("job");
    run(&["card", &job, "-o", &job])
        .code(2)
        .one_line_error()
        .stderr_has("--output");
    run(&["rate", &job, "--plot", &job])
        .code(2)
        .one_line_error()
        .stderr_has("--plot");
    assert_eq!(
        std::fs::read_to_string(&job).expect("job"),
        before,
        "nothing lost"
    );
    let sweep = d.join("sweep.csv");
    std::fs::copy("examples/ups_donor_sweep.csv", &sweep).expect("copy");
    let s = sweep.display().to_string();
    run(&[
        "probe",
        "--sweep",
        &s,
        "--sweep-turns",
        "511",
        "--tongue",
        "38",
        "--stack",
        "50",
        "--plot",
        &s,
    ])
    .code(2)
    .one_line_error()
    .stderr_has("--plot");
    // A card written over an older one keeps the old file's mode (written whole, then renamed).
    let card = d.join("card.txt");
    std::fs::write(&card, "old").expect("old");
    std::fs::set_permissions(&card, std::fs::Permissions::from_mode(0o600)).expect("mode");
    run(&["card", &job, "-o", &card.display().to_string()]).ok();
    let meta = std::fs::metadata(&card).expect("card");
    assert_eq!(meta.permissions().mode() & 0o777, 0o600);
    assert!(std::fs::read_to_string(&card)
        .expect("card")
        .contains("WINDING CARD"));
}

#[test]
fn the_shelf_through_a_link_keeps_its_mode_and_its_ids() {
    let d = scratch("shelf-edge");
    let real = d.join("real.csv");
    let link = d.join("link.csv");
    let s = real.display().to_string();
    run(&[
        "shelf", "--shelf", &s, "add", "--label", "a", "--tongue", "30", "--stack", "30",
        "--window", "10x30",
    ])
    .ok();
    std::fs::set_permissions(&real, std::fs::Permissions::from_mode(0o600)).expect("mode");
    std::os::unix::fs::symlink(&real, &link).expect("link");
    let l = link.display().to_string();
    run(&[
        "shelf", "--shelf", &l, "add", "--label", "b", "--tongue", "30", "--stack", "30",
        "--window", "10x30",
    ])
    .ok();
    assert!(
        std::fs::symlink_metadata(&link)
            .expect("link")
            .file_type()
            .is_symlink(),
        "the link stays a link"
    );
    let text = std::fs::read_to_string(&real).expect("real");
    assert!(text.contains(",b,"), "the row reached the real shelf");
    assert_eq!(
        std::fs::metadata(&real).expect("real").permissions().mode() & 0o777,
        0o600
    );
    // An id at the edge: no wrap to 0, no duplicate; a clear refusal.
    let edge = text.replace("\n1,a,", "\n18446744073709551615,a,");
    std::fs::write(&real, edge).expect("edge");
    run(&[
        "shelf", "--shelf", &s, "add", "--label", "c", "--tongue", "30", "--stack", "30",
        "--window", "10x30",
    ])
    .code(2)
    .one_line_error()
    .stderr_has("ids stop at");
}

#[test]
fn absurd_values_are_refused_quickly() {
    let d = scratch("absurd");
    let tiny = edited(GOOD_JOB, "volts = 28.0", "volts = 5e-324");
    let p = write(&d, "tiny.toml", &tiny);
    run(&["rate", &p])
        .code(2)
        .one_line_error()
        .stderr_has("0.001");
    let huge = edited(GOOD_JOB, "frequency_hz = 50.0", "frequency_hz = 1.0");
    let huge = edited(&huge, "volts = 230.0", "volts = 100000.0");
    let p = write(&d, "huge.toml", &huge);
    run(&["card", &p, "--format", "markdown"])
        .code(2)
        .one_line_error()
        .stderr_has("100000 turns");
    let sweep = write(
        &d,
        "tiny.csv",
        "volts,amps\n1e-320,1e-320\n2e-320,1e-319\n3e-320,1e-318\n4e-320,1\n",
    );
    run(&[
        "probe",
        "--sweep",
        &sweep,
        "--sweep-turns",
        "10",
        "--tongue",
        "30",
        "--stack",
        "30",
        "--plot",
        &d.join("x.svg").display().to_string(),
    ])
    .code(2)
    .one_line_error();
}

#[test]
fn text_from_files_cannot_act_on_a_terminal_or_a_spreadsheet() {
    let d = scratch("hygiene");
    // A right-to-left override in a winding's name is refused, naming the key.
    let bidi = edited(GOOD_JOB, "name = \"out\"", "name = \"o\u{202e}ut\"");
    run(&["plan", &write(&d, "bidi.toml", &bidi)])
        .code(2)
        .one_line_error()
        .stderr_has("name");
    // An escape sequence in a shelf cell is shown, not obeyed.
    let shelf = write(
        &d,
        "shelf.csv",
        "id,label,shape,tongue_mm,stack_mm,window_width_mm,window_height_mm,stacking_factor,steel,mass_g,volts_per_turn,notes,added\n1,core,ei,38,62,19,57,0.95,unknown,,,,2026-11-20\u{1b}[31m\n",
    );
    let out = run(&["shelf", "--shelf", &shelf, "list"]).stdout;
    assert!(!out.contains('\u{1b}'), "{out}");
    // A winding named like a formula leads with ' in the CSV schedule.
    let formula = edited(GOOD_JOB, "name = \"out\"", "name = \"=SUM(A1)\"");
    let csv = run(&["plan", &write(&d, "f.toml", &formula), "--format", "csv"])
        .ok()
        .stdout;
    assert!(csv.contains("'=SUM(A1)"), "{csv}");
    // Markup in a name is text in the Markdown card.
    let html = edited(GOOD_JOB, "name = \"out\"", "name = \"<b>out</b>\"");
    let md = run(&["card", &write(&d, "h.toml", &html), "--format", "markdown"])
        .ok()
        .stdout;
    assert!(md.contains("&lt;b&gt;out") && !md.contains("<b>"), "{md}");
}

#[test]
fn long_messages_are_whole() {
    // The accepted keys at the end of a message were once cut at 120 characters.
    let d = scratch("long-message");
    let bad = edited(
        GOOD_JOB,
        "stack_mm = 40.0",
        "stack_mm = 40.0\nzz_unknown = 1",
    );
    run(&["plan", &write(&d, "k.toml", &bad)])
        .code(2)
        .one_line_error()
        .stderr_has("`mass_g`");
}

#[test]
fn a_large_shelf_lists_as_it_is_read() {
    // Past 5000 cores in id order the listing streams; every format stays whole and the same rows.
    let d = scratch("big-shelf");
    let mut text = String::from("id,label,shape,tongue_mm,stack_mm,window_width_mm,window_height_mm,stacking_factor,steel,mass_g,volts_per_turn,notes,added\n");
    for id in 1..=6000 {
        text += &format!(
            "{id},core {id},ei,{},40,16,48,0.95,unknown,,,,2026-11-20\n",
            20 + id % 30
        );
    }
    text += "6001,bad row,zz,1,1,1,1,0.95,unknown,,,,2026-11-20\n";
    let shelf = write(&d, "big.csv", &text);
    let t = run(&["shelf", "--shelf", &shelf, "list"]).ok();
    assert!(
        t.stdout.ends_with(&format!("6000 cores on {shelf}\n")),
        "{}",
        &t.stdout[t.stdout.len() - 200..]
    );
    assert!(
        t.stderr.contains("line 6002"),
        "the bad row is named: {}",
        t.stderr
    );
    let j = run(&["shelf", "--shelf", &shelf, "list", "--format", "json"])
        .ok()
        .json();
    assert_eq!(j["cores"].as_array().expect("cores").len(), 6000);
    assert_eq!(j["bad_rows"].as_array().expect("bad").len(), 1);
    assert_eq!(j["cores"][5999]["id"], 6000);
    let csv = run(&["shelf", "--shelf", &shelf, "list", "--format", "csv"])
        .ok()
        .stdout;
    assert_eq!(csv.lines().count(), 6001, "header and every good row");
}
