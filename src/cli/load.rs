//! Reading a design file and running the pure pipeline on it.
//!
//! Part of the `cli` stage: the one place a design file is read.

use std::path::Path;

use super::error::CliError;
use crate::checks::{Checked, check};
use crate::design::parse_design_bytes;

/// Reads, parses, traces and checks `path`; an unreadable or invalid file is a [`CliError`]
/// (exit 2), reported by the caller.
pub fn load_design(path: &Path) -> Result<Checked, CliError> {
    let bytes = std::fs::read(path).map_err(|source| CliError::Read {
        path: path.to_path_buf(),
        source,
    })?;
    let design = parse_design_bytes(&bytes, &path.display().to_string())?;
    Ok(check(design))
}
