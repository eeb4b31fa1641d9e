//! The `standfast` command. All work is done in the `standfast_sim` library;
//! this file parses the command line and turns errors into exit codes
//! (0 ok, 1 bad input, 2 bad command line, 3 I/O; see `standfast --help`).

use std::process::ExitCode;

use clap::Parser;
use standfast_sim::commands::cli::{run, Cli};

fn main() -> ExitCode {
    // Usage errors exit with code 2 from inside `parse`.
    let cli = Cli::parse();
    let stdout = std::io::stdout();
    let mut out = stdout.lock();
    match run(&cli, &mut out) {
        Ok(()) => ExitCode::SUCCESS,
        Err(e) => {
            eprintln!("standfast: error: {e}");
            ExitCode::from(e.exit_code())
        }
    }
}
