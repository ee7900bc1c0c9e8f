//! Any bytes as a job file: parse, and when it parses, plan it, render every format and rate it.
#![no_main]
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    let Ok(text) = std::str::from_utf8(data) else { return };
    let loader = |_: &str| -> ironwind::Result<(String, Vec<ironwind::probe::SweepPoint>)> {
        // A fixed, valid sweep: the fuzzer explores the job, not the file system.
        let pts = (1..=8).map(|k| ironwind::probe::SweepPoint { volts: 20.0 * k as f64, amps: 0.01 * (k * k) as f64 }).collect();
        Ok(("sweep.csv".into(), pts))
    };
    if let Ok(job) = ironwind::job::parse_job(text, "fuzz.toml", &loader) {
        let plan = ironwind::plan::plan(&job);
        let _ = ironwind::plan::check_windable(&plan, "fuzz.toml");
        let mut out = Vec::new();
        let _ = ironwind::render::plan::write(&mut out, &plan, ironwind::render::Format::Text, &ironwind::render::Look::default());
        let _ = ironwind::render::json::write_plan(&mut out, &plan);
        let _ = ironwind::render::csv::write_schedule(&mut out, &plan);
        let opts = ironwind::render::card::CardOptions::default();
        let _ = ironwind::render::card::text_card(&plan, &opts);
        let _ = ironwind::render::card::html_card(&plan, &opts);
        let _ = ironwind::render::card::svg_card(&plan);
        if job.windings.len() <= 4 {
            let _ = ironwind::capacity::capacity(&job);
        }
    }
});
