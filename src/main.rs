//! The `armsheet` binary: parse the arguments, run, map to an exit code.

use std::process::ExitCode;

fn main() -> ExitCode {
    ExitCode::from(armsheet::cli::run_from_env())
}
