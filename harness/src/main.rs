//! The `calor` command: see `calor --help`.

use std::process::ExitCode;

fn main() -> ExitCode {
    calor_harness::cli::main()
}
