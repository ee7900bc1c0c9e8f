//! Every `ironwind` command in the README runs, as written (outputs redirected to a scratch folder).

use crate::common::{root, run_in, scratch};

fn words(line: &str) -> Vec<String> {
    let mut out = Vec::new();
    let mut cur = String::new();
    let mut quoted = false;
    for c in line.chars() {
        match c {
            '"' => quoted = !quoted,
            ' ' if !quoted => {
                if !cur.is_empty() {
                    out.push(std::mem::take(&mut cur));
                }
            }
            _ => cur.push(c),
        }
    }
    if !cur.is_empty() {
        out.push(cur);
    }
    out
}

#[test]
fn readme_commands_run() {
    let text = std::fs::read_to_string(root().join("README.md")).expect("README");
    let d = scratch("readme");
    let shelf = d.join("shelf.csv").display().to_string();
    let mut in_sh = false;
    let mut pending = String::new();
    let mut lines = Vec::new();
    for l in text.lines() {
        if l.starts_with("```") {
            in_sh = l.trim() == "```sh";
            continue;
        }
        if !in_sh {
            continue;
        }
        let l = l.trim_end();
        if let Some(head) = l.strip_suffix('\\') {
            pending += head;
            continue;
        }
        pending += l;
        let whole = std::mem::take(&mut pending);
        // `a && ironwind b`: two commands.
        for part in whole.split(" && ") {
            lines.push(part.to_string());
        }
    }
    let mut ran = 0;
    for line in lines {
        let line = line.split(" #").next().unwrap_or("").trim().to_string();
        let Some(rest) = line
            .strip_prefix("ironwind ")
            .or_else(|| line.strip_prefix("cargo run --release -- "))
        else {
            continue;
        };
        let (cmd, target) = match rest.split_once(" > ") {
            Some((c, t)) => (c.to_string(), Some(t.trim().to_string())),
            None => (rest.to_string(), None),
        };
        let args: Vec<String> = words(&cmd)
            .into_iter()
            .map(|a| match a.as_str() {
                "card.html" | "window.svg" | "sweep.svg" | "capacity.svg" | "cores.csv"
                | "job.toml" | "charger.toml" => d.join(&a).display().to_string(),
                // A home folder: the scratch folder's own, never the person's.
                _ if a.starts_with("~/") => d.join(&a[2..]).display().to_string(),
                _ => a,
            })
            .collect();
        let argv: Vec<&str> = args.iter().map(String::as_str).collect();
        if argv == ["new"] {
            // It asks on a terminal; `new_asks_on_a_terminal` (first_hour.rs) runs it.
            continue;
        }
        // The README's commands run from the repository's root (the child's directory, not ours).
        let r = run_in(&root(), &argv, &[("IRONWIND_SHELF", &shelf)]);
        assert_eq!(r.code, 0, "README: `{line}`: {}", r.stderr);
        if let Some(t) = target {
            let name = std::path::Path::new(&t)
                .file_name()
                .map(|f| f.to_string_lossy().into_owned())
                .unwrap_or_default();
            std::fs::write(d.join(name), r.stdout).expect("write");
        }
        ran += 1;
    }
    assert!(ran >= 20, "the README's commands ran ({ran})");
}
