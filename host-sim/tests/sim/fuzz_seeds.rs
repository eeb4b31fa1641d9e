//! The fuzz targets' seed corpora (host-sim/fuzz/corpus/, committed) run
//! through the same checks on stable Rust, so a broken promise shows in
//! `cargo test` too: nothing panics, every error names its location and
//! stays bounded (host-sim/src/fuzzing.rs).

use std::path::PathBuf;

use standfast_sim::fuzzing;

fn seeds(target: &str) -> Vec<(PathBuf, Vec<u8>)> {
    let dir = PathBuf::from(env!("CARGO_MANIFEST_DIR"))
        .join("fuzz/corpus")
        .join(target);
    let mut out: Vec<(PathBuf, Vec<u8>)> = std::fs::read_dir(&dir)
        .unwrap()
        .map(|e| e.unwrap().path())
        .filter(|p| {
            p.file_name()
                .is_some_and(|n| n.to_string_lossy().starts_with("seed-"))
        })
        .map(|p| {
            let data = std::fs::read(&p).unwrap();
            (p, data)
        })
        .collect();
    out.sort();
    assert!(
        out.len() >= 2,
        "{target}: too few seeds in {}",
        dir.display()
    );
    out
}

#[test]
fn rig_file_seeds() {
    for (_, d) in seeds("rig_file") {
        fuzzing::rig_file(&d);
    }
}

#[test]
fn log_profile_seeds() {
    for (_, d) in seeds("log_profile") {
        fuzzing::log_profile(&d);
    }
}

#[test]
fn csv_merge_seeds() {
    for (_, d) in seeds("csv_merge") {
        fuzzing::csv_merge(&d);
    }
}

#[test]
fn units_seeds() {
    for (_, d) in seeds("units") {
        fuzzing::units(&d);
    }
}

#[test]
fn bridge_line_seeds() {
    for (_, d) in seeds("bridge_line") {
        fuzzing::bridge_lines(&d);
    }
}

/// Inputs far larger than a fuzzer tries by default: a 256 KiB value in each
/// parser still gives a bounded message.
#[test]
fn huge_values_give_bounded_messages() {
    let big = "9".repeat(1 << 18);
    fuzzing::units(big.as_bytes());
    fuzzing::units(format!("1 {big}").as_bytes());
    // Number-like text the old parser retried at every length (quadratic:
    // minutes for this one); now one pass.
    fuzzing::units("1e".repeat(1 << 17).as_bytes());
    fuzzing::rig_file(format!("[site]\nlatitude = \"{}\"\n", "1e".repeat(1 << 17)).as_bytes());
    fuzzing::rig_file(format!("[site]\nlatitude = \"{big}x\"\n").as_bytes());
    fuzzing::rig_file(format!("[site]\n{big}x = 1\n").as_bytes());
    fuzzing::log_profile(format!("[log]\ngap = \"1 {big}\"\n").as_bytes());
    fuzzing::csv_merge(format!("\0t,ax,ay,az,v\n1763154000,0,0,1,x{big}\n").as_bytes());
    fuzzing::bridge_lines(format!("\0{{\"t_ms\": 0, \"wind_mps\": \"{big}\"}}\n").as_bytes());
    fuzzing::bridge_lines(format!("\0{{\"{big}\": 0}}\n").as_bytes());
}

#[test]
fn weighing_file_seeds() {
    for (_, d) in seeds("weighing_file") {
        fuzzing::weighing_file(&d);
    }
}
