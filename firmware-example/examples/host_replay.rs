//! Replays a log on the host through the same station the emulated board
//! runs, printing the same event lines, so the two outputs can be compared:
//!
//! ```text
//! cargo run -p standfast-firmware --example host_replay -- firmware-example/replay/short-night.csv
//! ```
//!
//! A second argument `--rate-100hz` runs the station at 100 Hz
//! (`ReplaySetup::example_100hz`), as the emulated binary does with the same word.
use standfast_firmware::guard_adapter::example_rig;
use standfast_firmware::replay::{Replay, ReplaySetup};
use std::process::ExitCode;

fn main() -> ExitCode {
    let mut args = std::env::args().skip(1);
    let Some(path) = args.next() else {
        eprintln!("usage: host_replay <log.csv> [--rate-100hz]");
        return ExitCode::from(2);
    };
    let setup = match args.next().as_deref() {
        None => ReplaySetup::example(),
        Some("--rate-100hz") => ReplaySetup::example_100hz(),
        Some(other) => {
            eprintln!("error: unknown option {other:?} (accepted: --rate-100hz)");
            return ExitCode::from(2);
        }
    };
    // Bytes, as the board reads them: a line that is not ASCII is an error
    // of its line here too (`reason=not_ascii`), not of the whole file.
    let bytes = match std::fs::read(&path) {
        Ok(t) => t,
        Err(e) => {
            eprintln!("error: cannot read {path}: {e}");
            return ExitCode::from(2);
        }
    };
    // The rig lives in main's frame; the guard inside the replay borrows it.
    let rig = match example_rig() {
        Ok(r) => r,
        Err(e) => {
            eprintln!("error: example rig: {e:?}");
            return ExitCode::from(5);
        }
    };
    let mut replay = match Replay::new(&setup, &rig) {
        Ok(r) => r,
        Err(e) => {
            eprintln!("error: guard: {e:?}");
            return ExitCode::from(5);
        }
    };
    let mut events = 0u32;
    let body = bytes.strip_suffix(b"\n").unwrap_or(&bytes);
    for line in body.split(|&b| b == b'\n') {
        match replay.feed_line(line) {
            Ok(Some(report)) => {
                for e in &report.events {
                    println!("{e}");
                    events += 1;
                }
                for e in replay.guard_events() {
                    println!("guard {e}");
                }
            }
            Ok(None) => {}
            Err(e) => {
                println!("{e}");
                return ExitCode::from(3);
            }
        }
    }
    println!("summary rows={} events={events}", replay.rows());
    ExitCode::SUCCESS
}
