//! `ironwind wire`.

use crate::common::run;

#[test]
fn list_both_systems() {
    run(&["wire", "--list", "--system", "awg"])
        .ok()
        .stdout_has("AWG");
    let j = run(&["wire", "--list", "--format", "json"]).ok().json();
    assert_eq!(
        j.as_array().expect("rows").len(),
        33,
        "ISO 3 R20 0.100–4.00 mm"
    );
}

#[test]
fn choice_for_a_current() {
    // 12 A at 3 A/mm² = 4 mm²; one 2.0 mm strand is 3.14 mm², so two strands of 1.60 mm (DESIGN.md rule).
    let j = run(&["wire", "--amps", "12", "--density", "3", "--format", "json"])
        .ok()
        .json();
    assert_eq!(j["strands"], 2);
    assert_eq!(j["size"], "1.60");
    run(&["wire", "--amps", "0", "--density", "3"])
        .code(2)
        .one_line_error()
        .stderr_has("--amps");
}

#[test]
fn imperial_units_list_awg_first() {
    crate::common::run(&["wire", "--list", "--units", "imperial"])
        .ok()
        .stdout_has("AWG");
}

#[test]
fn a_closed_pipe_is_not_a_failure() {
    // `ironwind … | head`: output larger than a pipe's buffer, the reader gone after a few bytes.
    use std::io::Read;
    use std::process::{Command, Stdio};
    let d = crate::common::scratch("pipe");
    let shelf = d.join("shelf.csv");
    let mut text = String::from("id,label,shape,tongue_mm,stack_mm,window_width_mm,window_height_mm,stacking_factor,steel,mass_g,volts_per_turn,notes,added\n");
    for i in 1..=4000 {
        text += &format!("{i},core {i},ei,30,40,15,45,0.95,unknown,,,,2026-01-01\n");
    }
    std::fs::write(&shelf, text).expect("shelf");
    for format in ["text", "json", "csv"] {
        let mut child = Command::new(env!("CARGO_BIN_EXE_ironwind"))
            .args([
                "shelf",
                "--shelf",
                &shelf.display().to_string(),
                "list",
                "--format",
                format,
            ])
            .stdout(Stdio::piped())
            .stderr(Stdio::piped())
            .spawn()
            .expect("spawn");
        let mut buf = [0u8; 64];
        let mut pipe = child.stdout.take().expect("stdout");
        let _ = pipe.read(&mut buf);
        drop(pipe);
        let out = child.wait_with_output().expect("wait");
        assert_eq!(
            out.status.code(),
            Some(0),
            "{format}: {}",
            String::from_utf8_lossy(&out.stderr)
        );
        assert!(
            out.stderr.is_empty(),
            "{format}: {}",
            String::from_utf8_lossy(&out.stderr)
        );
    }
}
