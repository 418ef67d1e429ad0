//! Reading a design file and running the pure pipeline on it.

use std::path::Path;

use crate::checks::{Finding, run_checks};
use crate::design::{Design, parse_design_bytes};
use crate::winding::{Winding, trace_winding};

/// A design read from disk, traced and checked.
#[derive(Clone, Debug)]
pub struct Checked {
    /// The resolved design.
    pub design: Design,
    /// The traced winding.
    pub winding: Winding,
    /// The rule findings.
    pub findings: Vec<Finding>,
}

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
    let winding = trace_winding(&design).map_err(|e| {
        eprintln!("error: {name}: the winding cannot be traced: {e}");
        2u8
    })?;
    let findings = run_checks(&design, &winding);
    Ok(Checked {
        design,
        winding,
        findings,
    })
}
