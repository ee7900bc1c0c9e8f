//! Bad input of every class listed for `plan`: one line on stderr naming the file and the key, exit 2.

use crate::common::{edited, run, scratch, write, GOOD_JOB};

#[track_caller]
fn refused(name: &str, text: &str, key: &str) {
    let d = scratch(&format!("bad-{name}"));
    let p = write(&d, "job.toml", text);
    run(&["plan", &p])
        .code(2)
        .one_line_error()
        .stderr_has(&p)
        .stderr_has(key);
}

#[test]
fn every_bad_input_class_exits_2_naming_the_key() {
    let g = GOOD_JOB;
    refused("missing", &edited(g, "tongue_mm = 32.0\n", ""), "tongue_mm");
    refused(
        "unknown",
        &edited(g, "tongue_mm", "tongue_width_mm"),
        "tongue_width_mm",
    );
    refused(
        "unknown-lists-accepted",
        &edited(g, "stack_mm", "stak_mm"),
        "stack_mm",
    );
    refused(
        "negative",
        &edited(g, "tongue_mm = 32.0", "tongue_mm = -32.0"),
        "tongue_mm",
    );
    refused(
        "zero",
        &edited(g, "window_height_mm = 48.0", "window_height_mm = 0"),
        "window_height_mm",
    );
    refused(
        "stacking-low",
        &edited(
            g,
            "window_height_mm = 48.0",
            "window_height_mm = 48.0\nstacking_factor = 0.5",
        ),
        "stacking_factor",
    );
    refused(
        "stacking-high",
        &edited(
            g,
            "window_height_mm = 48.0",
            "window_height_mm = 48.0\nstacking_factor = 1.01",
        ),
        "stacking_factor",
    );
    refused(
        "flux",
        &edited(g, "[supply]", "[limits]\nflux_density_t = 2.2\n[supply]"),
        "flux_density_t",
    );
    refused(
        "freq-low",
        &edited(g, "frequency_hz = 50.0", "frequency_hz = 0.5"),
        "frequency_hz",
    );
    refused(
        "freq-high",
        &edited(g, "frequency_hz = 50.0", "frequency_hz = 2001"),
        "frequency_hz",
    );
    refused(
        "no-primary",
        &edited(g, "role = \"primary\"", "role = \"secondary\"\namps = 1.0"),
        "primary",
    );
    refused(
        "two-primaries",
        &edited(
            g,
            "role = \"secondary\"\nvolts = 28.0\namps = 4.0",
            "role = \"primary\"\nvolts = 28.0",
        ),
        "primary",
    );
    refused(
        "no-turn-fits",
        &edited(g, "amps = 4.0", "amps = 4.0\nsize = \"4.00\"\nstrands = 40"),
        "out",
    );
    refused("malformed", "[core\ntongue_mm = 3", "line 1");
    refused(
        "wrong-type",
        &edited(g, "volts = 230.0", "volts = \"lots\""),
        "volts",
    );
    refused(
        "unit",
        &edited(g, "stack_mm = 40.0", "stack_mm = \"12 furlongs\""),
        "stack_mm",
    );
    refused(
        "comma",
        &edited(g, "stack_mm = 40.0", "stack_mm = \"1,25 mm\""),
        "stack_mm",
    );
    refused(
        "duplicate",
        &edited(g, "name = \"out\"", "name = \"mains\""),
        "name",
    );
    refused(
        "waveform",
        &edited(
            g,
            "frequency_hz = 50.0",
            "frequency_hz = 50.0\nwaveform = \"sawtooth\"",
        ),
        "waveform",
    );
    refused(
        "duty",
        &edited(
            g,
            "frequency_hz = 50.0",
            "frequency_hz = 50.0\nwaveform = \"quasi-square\"\nduty = 1.5",
        ),
        "duty",
    );
    refused(
        "size",
        &edited(g, "amps = 4.0", "amps = 4.0\nsize = \"1.50\""),
        "size",
    );
    refused(
        "steel",
        &edited(
            g,
            "window_height_mm = 48.0",
            "window_height_mm = 48.0\nsteel = \"cheese\"",
        ),
        "steel",
    );
    refused("amps-missing", &edited(g, "amps = 4.0\n", ""), "amps");
    refused("nan", &edited(g, "volts = 28.0", "volts = nan"), "volts");
    refused("inf", &edited(g, "volts = 28.0", "volts = inf"), "volts");
    refused("empty", "", "empty");
    refused(
        "tap-above",
        &edited(g, "amps = 4.0", "amps = 4.0\ntaps_volts = [30.0]"),
        "taps_volts",
    );
}

#[test]
fn unreadable_paths_exit_2() {
    let d = scratch("unreadable");
    run(&["plan", &d.join("nope.toml").display().to_string()])
        .code(2)
        .one_line_error()
        .stderr_has("nope.toml");
    run(&["plan", &d.display().to_string()])
        .code(2)
        .one_line_error()
        .stderr_has("directory");
    let p = d.join("bin.toml");
    std::fs::write(&p, b"\xff\xfe\x00garbage").expect("write");
    run(&["plan", &p.display().to_string()])
        .code(2)
        .one_line_error()
        .stderr_has("UTF-8");
}

#[test]
fn unknown_flags_exit_2() {
    let r = run(&["plan", "--frobnicate"]);
    assert_eq!(r.code, 2);
    assert!(!r.stderr.contains("panicked"));
}
