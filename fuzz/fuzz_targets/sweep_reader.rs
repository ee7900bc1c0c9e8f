//! Any bytes as a sweep CSV: read it, and when it reads, find the knees and draw the chart.
#![no_main]
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    if let Ok(points) = ironwind::probe::read_sweep("fuzz.csv", data) {
        let pairs: Vec<(f64, f64)> = points.iter().map(|p| (p.volts, p.amps)).collect();
        if let Ok(curve) = ironwind::magnetics::ExcitationCurve::new(&pairs) {
            let run = ironwind::probe::probe_run(None, Some((&curve, 100)), 50.0, 1000.0, 200.0, false);
            let _ = ironwind::render::probe::sweep_chart(&run);
        }
    }
});
