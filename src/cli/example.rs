//! `ironwind example [NAME]`: the bundled example jobs, built into the binary, listed or printed.

use super::out_err;
use crate::error::{Error, Result};
use std::io::Write;

/// The examples: name, a line about it, the job file's text.
const EXAMPLES: &[(&str, &str)] = &[
    (
        "garage_charger",
        include_str!("../../examples/garage_charger.toml"),
    ),
    (
        "amplifier_rails_40v",
        include_str!("../../examples/amplifier_rails_40v.toml"),
    ),
    (
        "cabin_inverter_24v",
        include_str!("../../examples/cabin_inverter_24v.toml"),
    ),
    (
        "bench_supply_120v_ui",
        include_str!("../../examples/bench_supply_120v_ui.toml"),
    ),
    (
        "ups_donor_inverter",
        include_str!("../../examples/ups_donor_inverter.toml"),
    ),
    (
        "pushpull_inverter_24v",
        include_str!("../../examples/pushpull_inverter_24v.toml"),
    ),
    (
        "dual_primary_bench_supply",
        include_str!("../../examples/dual_primary_bench_supply.toml"),
    ),
    (
        "split_bobbin_rewind",
        include_str!("../../examples/split_bobbin_rewind.toml"),
    ),
    (
        "spot_welder_donor",
        include_str!("../../examples/spot_welder_donor.toml"),
    ),
    (
        "measured/garage_charger",
        include_str!("../../examples/measured/garage_charger.toml"),
    ),
];

/// Arguments of `ironwind example`.
#[derive(Debug, clap::Args)]
pub(super) struct Args {
    /// The example to print (without a name: the list)
    name: Option<String>,
}

pub(super) fn run(out: &mut dyn Write, a: Args, quiet: bool) -> Result<i32> {
    match a.name {
        None => {
            for (name, text) in EXAMPLES {
                let title = text
                    .lines()
                    .find_map(|l| l.strip_prefix("name = "))
                    .map(|n| n.trim_matches('"'))
                    .unwrap_or("measurements for diagnose");
                writeln!(out, "{name:<28} {title}").map_err(out_err)?;
            }
            if quiet {
                return Ok(0);
            }
            writeln!(
                out,
                "\nPrint one into a file and plan it:\n  ironwind example garage_charger > job.toml\n  ironwind plan job.toml"
            )
            .map_err(out_err)?;
        }
        Some(n) => {
            let key = n.trim().trim_end_matches(".toml");
            let Some((_, text)) = EXAMPLES.iter().find(|(name, _)| *name == key) else {
                let names: Vec<&str> = EXAMPLES.iter().map(|(n, _)| *n).collect();
                return Err(Error::bad_value(
                    "command line",
                    "NAME",
                    format!("\"{}\"", crate::error::short_value(&n)),
                    format!("must be one of {}", names.join(", ")),
                ));
            };
            out.write_all(text.as_bytes()).map_err(out_err)?;
        }
    }
    Ok(0)
}
