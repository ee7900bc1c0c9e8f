//! Speed figures for the README: plan cost against process start-up, the capacity search against the
//! brute-force scan, and shelf ranking at 10 000 and 100 000 cores. Run with `cargo bench`.
//! Figures are wall-clock on the machine at hand; `plans_evaluated` is the machine-independent cost.

use ironwind::capacity::{capacity, scan};
use ironwind::job::parse_job;
use ironwind::plan::plan;
use ironwind::shelf::{parse_shelf, rank, HEADER};
use std::path::PathBuf;
use std::process::Command;
use std::time::Instant;

fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

fn load(name: &str) -> ironwind::job::Job {
    let dir = root().join("examples");
    let text = std::fs::read_to_string(dir.join(name)).expect("example");
    parse_job(&text, name, &|rel| {
        let p = dir.join(rel);
        let t = std::fs::read_to_string(&p)
            .map_err(|e| ironwind::Error::io(p.display().to_string(), "read", &e))?;
        Ok((
            p.display().to_string(),
            ironwind::probe::read_sweep("sweep", t.as_bytes())?,
        ))
    })
    .expect("job")
}

fn per_run(n: usize, mut f: impl FnMut()) -> f64 {
    let t = Instant::now();
    for _ in 0..n {
        f();
    }
    t.elapsed().as_secs_f64() / n as f64
}

fn generated_shelf(n: usize, seed: u64) -> String {
    let mut s = seed;
    let mut next = || {
        s = s
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        ((s >> 11) as f64) / ((1u64 << 53) as f64)
    };
    let mut text = HEADER.join(",") + "\n";
    for id in 1..=n {
        let a = 15.0 + 45.0 * next();
        let st = a * (0.8 + 1.2 * next());
        let w = a * (0.4 + 0.4 * next());
        let h = w * (2.5 + 1.0 * next());
        let shape = if next() < 0.8 { "ei" } else { "ui" };
        text += &format!(
            "{id},core {id},{shape},{a:.2},{st:.2},{w:.2},{h:.2},0.95,unknown,,,,2026-01-01\n"
        );
    }
    text
}

/// A job with two rectified outputs (a charger's battery and ± rails) on one core: the plan, and
/// `rate`'s search against its scan.
fn rectified() {
    let text = include_str!("../tests/data/two_rectified.toml");
    let job = parse_job(text, "two_rectified.toml", &|_| {
        Err(ironwind::Error::Failed("no sweep".into()))
    })
    .expect("job");
    let t = per_run(2_000, || {
        std::hint::black_box(plan(std::hint::black_box(&job)));
    });
    println!("\ntwo rectified outputs (tests/data/two_rectified.toml)");
    println!("  plan (library)               {:8.1} µs", t * 1e6);
    let mut c = capacity(&job);
    let ts = per_run(20, || c = capacity(&job));
    let mut sc = scan(&job);
    let tc = per_run(1, || sc = scan(&job));
    println!(
        "  rate search {:7.2} ms ({} plans), scan {:8.1} ms ({} plans): {:5.0}× faster; {:.1} vs {:.1} W ({:+.2} %)",
        ts * 1e3,
        c.plans_evaluated,
        tc * 1e3,
        sc.plans_evaluated,
        tc / ts,
        c.max_va,
        sc.max_va,
        (c.max_va / sc.max_va - 1.0) * 100.0
    );
}

fn main() {
    let bin = root().join("target/release/ironwind");
    println!("ironwind speed figures\n");

    if std::env::args().any(|a| a == "--rectified-only") {
        rectified();
        return;
    }
    println!("plan (library, one full plan):");
    for name in [
        "garage_charger.toml",
        "amplifier_rails_40v.toml",
        "cabin_inverter_24v.toml",
        "bench_supply_120v_ui.toml",
        "ups_donor_inverter.toml",
    ] {
        let job = load(name);
        let t = per_run(20_000, || {
            std::hint::black_box(plan(std::hint::black_box(&job)));
        });
        println!("  {name:<28} {:8.2} µs", t * 1e6);
    }
    if bin.exists() {
        let job = root().join("examples/garage_charger.toml");
        let plan_s = per_run(100, || {
            let _ = Command::new(&bin)
                .arg("plan")
                .arg(&job)
                .arg("--format")
                .arg("json")
                .output();
        });
        let ver_s = per_run(100, || {
            let _ = Command::new(&bin).arg("--version").output();
        });
        println!(
            "  process: `ironwind plan` {:.2} ms, `ironwind --version` {:.2} ms (ratio {:.2})",
            plan_s * 1e3,
            ver_s * 1e3,
            plan_s / ver_s
        );
    } else {
        println!("  (build with `cargo build --release` to time whole processes)");
    }

    rectified();

    println!("\nrate: capacity search against the brute-force scan");
    for name in [
        "garage_charger.toml",
        "amplifier_rails_40v.toml",
        "cabin_inverter_24v.toml",
        "bench_supply_120v_ui.toml",
        "ups_donor_inverter.toml",
    ] {
        let job = load(name);
        let mut c = capacity(&job);
        let ts = per_run(50, || c = capacity(&job));
        let mut sc = scan(&job);
        let tc = per_run(1, || sc = scan(&job));
        println!(
            "  {name:<28} search {:7.3} ms ({:>4} plans), scan {:8.1} ms ({:>6} plans): {:6.0}× faster, {:5.0}× fewer plans; {:.1} vs {:.1} VA",
            ts * 1e3,
            c.plans_evaluated,
            tc * 1e3,
            sc.plans_evaluated,
            tc / ts,
            sc.plans_evaluated as f64 / c.plans_evaluated as f64,
            c.max_va,
            sc.max_va
        );
    }

    println!("\nshelf rank (library: parse the shelf text, plan the job on every core, sort)");
    let job = load("garage_charger.toml");
    let threads = std::thread::available_parallelism()
        .map(|n| n.get())
        .unwrap_or(1);
    let mut times = Vec::new();
    for n in [10_000usize, 100_000] {
        let text = generated_shelf(n, 42);
        let t = Instant::now();
        let shelf = parse_shelf("generated", &text).expect("shelf");
        let ranked = rank(&job, &shelf.entries, threads, &|_| {});
        let e = t.elapsed().as_secs_f64();
        times.push(e);
        let carry = ranked.iter().filter(|r| r.carries).count();
        println!(
            "  {n:>7} cores on {threads} threads: {:7.1} ms ({carry} carry it)",
            e * 1e3
        );
    }
    println!("  10× the cores cost {:.2}× the time", times[1] / times[0]);
    if bin.exists() {
        let dir = std::env::temp_dir().join(format!("ironwind-bench-{}", std::process::id()));
        let _ = std::fs::create_dir_all(&dir);
        let shelf_path = dir.join("shelf.csv");
        std::fs::write(&shelf_path, generated_shelf(100_000, 7)).expect("write shelf");
        let t = Instant::now();
        let out = Command::new(&bin)
            .args(["shelf", "--shelf"])
            .arg(&shelf_path)
            .args(["rank"])
            .arg(root().join("examples/garage_charger.toml"))
            .args(["--top", "10", "--format", "json"])
            .output()
            .expect("rank");
        println!(
            "  whole command `ironwind shelf rank` on 100 000 cores: {:.0} ms (exit {})",
            t.elapsed().as_secs_f64() * 1e3,
            out.status.code().unwrap_or(-1)
        );
        // A million cores listed as they are read (the whole command, every format).
        let shelf_path = dir.join("million.csv");
        std::fs::write(&shelf_path, generated_shelf(1_000_000, 11)).expect("write shelf");
        for format in ["text", "json", "csv"] {
            let t = Instant::now();
            let out = Command::new(&bin)
                .args(["shelf", "--shelf"])
                .arg(&shelf_path)
                .args(["list", "--format", format])
                .stdout(std::process::Stdio::null())
                .status()
                .expect("list");
            println!(
                "  whole command `ironwind shelf list --format {format}` on 1 000 000 cores: {:.0} ms (exit {})",
                t.elapsed().as_secs_f64() * 1e3,
                out.code().unwrap_or(-1)
            );
        }
        println!("\nworst cases inside the accepted ranges (whole commands)");
        worst_cases(&bin, &dir);
        let _ = std::fs::remove_dir_all(&dir);
    }
}

/// Jobs at the edges of what the parser accepts: 32 windings, 100 kV, 1 Hz and 2 kHz, the largest
/// core; each command timed as a whole process.
fn worst_cases(bin: &std::path::Path, dir: &std::path::Path) {
    let mut many = String::from("[core]\ntongue_mm = 1000\nstack_mm = 1000\nwindow_width_mm = 1000\nwindow_height_mm = 1000\n[supply]\nfrequency_hz = 2000\n[[winding]]\nname = \"p\"\nrole = \"primary\"\nvolts = 100000\n");
    for k in 1..32 {
        many += &format!(
            "[[winding]]\nname = \"s{k}\"\nrole = \"secondary\"\nvolts = {}\namps = 10000\n",
            k * 1000
        );
    }
    let slow = "[core]\ntongue_mm = 1000\nstack_mm = 1000\nwindow_width_mm = 1\nwindow_height_mm = 1000\n[supply]\nfrequency_hz = 1\n[[winding]]\nname = \"p\"\nrole = \"primary\"\nvolts = 100000\n[[winding]]\nname = \"s\"\nrole = \"secondary\"\nvolts = 0.001\namps = 0.000001\n".to_string();
    for (name, text) in [
        ("32 windings, 2 kHz, 100 kV", many),
        ("1 Hz, 100 kV, a 1 mm window", slow),
    ] {
        let job = dir.join("worst.toml");
        std::fs::write(&job, text).expect("job");
        for args in [
            vec!["plan"],
            vec!["card", "--format", "markdown"],
            vec!["rate"],
        ] {
            let t = Instant::now();
            let out = Command::new(bin)
                .args(&args[..1])
                .arg(&job)
                .args(&args[1..])
                .stdout(std::process::Stdio::null())
                .stderr(std::process::Stdio::null())
                .status()
                .expect("runs");
            println!(
                "  {name}: `ironwind {}` {:.0} ms (exit {})",
                args.join(" "),
                t.elapsed().as_secs_f64() * 1e3,
                out.code().unwrap_or(-1)
            );
        }
    }
}
