//! `ironwind manpage [COMMAND…] [--dir DIR]`: the manual pages (roff). The main page names one
//! page per command (`ironwind-plan(1)`, `ironwind-shelf-add(1)` …); each is printed by naming its
//! command, or all are written into a folder with `--dir`.

use super::out_err;
use crate::error::{Error, Result};
use std::io::Write;
use std::path::PathBuf;

/// Arguments of `ironwind manpage`.
#[derive(Debug, clap::Args)]
pub(super) struct Args {
    /// A command's page (`plan`, `shelf add`, `shelf-add` …); without one, the main page
    command: Vec<String>,
    /// Write every page (ironwind.1 and ironwind-COMMAND.1 for each command) into this folder
    #[arg(long)]
    dir: Option<PathBuf>,
}

/// One page's roff.
fn page(cmd: &clap::Command) -> Result<Vec<u8>> {
    let mut buf = Vec::new();
    clap_mangen::Man::new(cmd.clone())
        .render(&mut buf)
        .map_err(|e| Error::Failed(format!("cannot render the manual page: {e}")))?;
    Ok(buf)
}

/// The command tree without clap's built-in `help` commands (their pages would not exist).
fn no_help(cmd: clap::Command) -> clap::Command {
    let names: Vec<String> = cmd
        .get_subcommands()
        .map(|s| s.get_name().to_string())
        .collect();
    let mut cmd = cmd.disable_help_subcommand(true);
    for n in names {
        cmd = cmd.mut_subcommand(n, no_help);
    }
    cmd
}

/// Every page under `cmd`, each named by its path (`ironwind-shelf-add`).
fn pages(cmd: &clap::Command, name: &str, out: &mut Vec<(String, clap::Command)>) {
    // clap keeps names as 'static strings; one small name per page, for the process's life.
    let full: &'static str = Box::leak(name.to_string().into_boxed_str());
    out.push((
        name.to_string(),
        cmd.clone().name(full).version(super::version_text()),
    ));
    for s in cmd.get_subcommands() {
        pages(s, &format!("{name}-{}", s.get_name()), out);
    }
}

pub(super) fn run(out: &mut dyn Write, a: Args, root: clap::Command) -> Result<i32> {
    let mut root = no_help(root);
    root.build();
    let mut all = Vec::new();
    pages(&root, "ironwind", &mut all);
    if let Some(dir) = &a.dir {
        std::fs::create_dir_all(dir)
            .map_err(|e| Error::io(dir.display().to_string(), "cannot create", &e))?;
        for (name, cmd) in &all {
            super::write_file(&dir.join(format!("{name}.1")), &page(cmd)?)?;
        }
        super::note_always(&format!("wrote {} pages into {}", all.len(), dir.display()));
        return Ok(0);
    }
    let wanted = if a.command.is_empty() {
        "ironwind".to_string()
    } else {
        format!("ironwind-{}", a.command.join("-"))
    };
    let Some((_, cmd)) = all.iter().find(|(n, _)| *n == wanted) else {
        let names: Vec<&str> = all
            .iter()
            .skip(1)
            .map(|(n, _)| n.trim_start_matches("ironwind-"))
            .collect();
        return Err(Error::bad_value(
            "command line",
            "COMMAND",
            format!("\"{}\"", crate::error::short_value(&a.command.join(" "))),
            format!("must be one of {}", names.join(", ")),
        ));
    };
    out.write_all(&page(cmd)?).map_err(out_err)?;
    Ok(0)
}
