//! Reading a design file and running the pure pipeline on it.

use std::path::Path;

use crate::checks::{Checked, check};
use crate::design::parse_design_bytes;

/// Reads, parses, traces and checks `path`. On failure the diagnostic is already printed to
/// stderr and the exit code (2) is returned.
pub fn load_design(path: &Path) -> Result<Checked, u8> {
    let name = path.display().to_string();
    let bytes = match std::fs::read(path) {
        Ok(b) => b,
        Err(e) => {
            eprintln!(
                "error: cannot read design file {name}: {e}\n  = hint: check the path; `armsheet new {name}` writes a starter design"
            );
            return Err(2);
        }
    };
    let design = parse_design_bytes(&bytes, &name).map_err(|d| {
        eprint!("{d}");
        2u8
    })?;
    Ok(check(design))
}
