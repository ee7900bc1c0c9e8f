//! `ironwind completions SHELL`: a shell completion script.

use super::out_err;
use crate::error::Result;
use clap::ValueEnum;
use std::io::Write;

#[derive(Debug, Clone, Copy, ValueEnum, PartialEq, Eq)]
enum ShellArg {
    Bash,
    Zsh,
    Fish,
    Powershell,
}

/// Arguments of `ironwind completions`.
#[derive(Debug, clap::Args)]
pub(super) struct Args {
    /// The shell
    #[arg(value_enum)]
    shell: ShellArg,
}

pub(super) fn run(out: &mut dyn Write, a: Args, mut cmd: clap::Command) -> Result<i32> {
    let sh = match a.shell {
        ShellArg::Bash => clap_complete::Shell::Bash,
        ShellArg::Zsh => clap_complete::Shell::Zsh,
        ShellArg::Fish => clap_complete::Shell::Fish,
        ShellArg::Powershell => clap_complete::Shell::PowerShell,
    };
    let mut buf = Vec::new();
    clap_complete::generate(sh, &mut cmd, "ironwind", &mut buf);
    out.write_all(&buf).map_err(out_err)?;
    Ok(0)
}
