//! Any bytes as a shelf file or an import file: read them, and rank a small job on what reads.
#![no_main]
use libfuzzer_sys::fuzz_target;

const JOB: &str = "[core]\ntongue_mm = 32\nstack_mm = 40\nwindow_width_mm = 16\nwindow_height_mm = 48\n[supply]\nfrequency_hz = 50\n[[winding]]\nname = \"p\"\nrole = \"primary\"\nvolts = 230\n[[winding]]\nname = \"s\"\nrole = \"secondary\"\nvolts = 24\namps = 2\n";

fuzz_target!(|data: &[u8]| {
    let Ok(text) = std::str::from_utf8(data) else { return };
    if let Ok(shelf) = ironwind::shelf::parse_shelf("fuzz.csv", text) {
        let entries: Vec<_> = shelf.entries.iter().map(|(e, _)| e.clone()).collect();
        let again = ironwind::shelf::shelf_text(&entries);
        let back = ironwind::shelf::parse_shelf("again.csv", &again).expect("a shelf written by ironwind reads back");
        assert_eq!(back.entries.len(), entries.len(), "round trip keeps every good row");
        let _ = ironwind::shelf::export_csv(&entries);
        if let Ok(job) = ironwind::job::parse_job(JOB, "job", &|_| Err(ironwind::Error::Failed("none".into()))) {
            let _ = ironwind::shelf::rank(&job, &shelf.entries, 1, &|_| {});
        }
    }
    let _ = ironwind::shelf::parse_import("fuzz.csv", text);
});
