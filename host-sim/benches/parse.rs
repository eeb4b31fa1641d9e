//! Throughput of reading a long log: writes the 24-hour 50 Hz benchmark log
//! (4 320 000 rows, `gen-demo --bench`) once into `target/standfast-bench/`,
//! then times the streaming CSV parse and merge alone.
//!
//! Run with `cargo bench -p standfast-sim --bench parse`. Set
//! `STANDFAST_BENCH_HOURS` for a shorter log.

use std::hint::black_box;
use std::path::PathBuf;
use std::time::Instant;

use standfast_sim::commands::demo_data::{write_bench_log, BENCH_PROFILE_TOML};
use standfast_sim::input::log::{ErrorPolicy, LogProfile, Merger};

fn main() {
    let hours: f64 = std::env::var("STANDFAST_BENCH_HOURS")
        .ok()
        .and_then(|h| h.parse().ok())
        .unwrap_or(24.0);
    let dir = PathBuf::from(env!("CARGO_MANIFEST_DIR"))
        .join("../target/standfast-bench")
        .join(format!("{hours}h"));
    let profile_path = dir.join(BENCH_PROFILE_TOML);
    if !profile_path.is_file() {
        let t = Instant::now();
        let b = write_bench_log(&dir, 1, hours).expect("write the benchmark log");
        println!(
            "generated {} rows in {:.2} s",
            b.rows,
            t.elapsed().as_secs_f64()
        );
    }
    let profile = LogProfile::load(&profile_path).expect("profile");
    let mut best = f64::INFINITY;
    let mut rows = 0;
    for _ in 0..3 {
        let t = Instant::now();
        let mut m = Merger::open(&profile, ErrorPolicy::Stop).expect("open");
        let mut acc = 0.0;
        while let Some(r) = m.next_record().expect("read") {
            acc += r.accel_mps2.map_or(0.0, |a| a[2]);
        }
        black_box(acc);
        rows = m.rows();
        best = best.min(t.elapsed().as_secs_f64());
    }
    #[allow(clippy::cast_precision_loss)]
    let rate = rows as f64 / best;
    println!("parse and merge: {rows} rows in {best:.3} s (best of 3), {rate:.0} rows/s");
}
