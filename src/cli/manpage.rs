//! `ironwind manpage`: the manual page (roff).

use super::out_err;
use crate::error::{Error, Result};
use std::io::Write;

pub(super) fn run(out: &mut dyn Write, cmd: clap::Command) -> Result<i32> {
    let mut buf = Vec::new();
    clap_mangen::Man::new(cmd)
        .render(&mut buf)
        .map_err(|e| Error::Failed(format!("cannot render the manual page: {e}")))?;
    out.write_all(&buf).map_err(out_err)?;
    Ok(0)
}
