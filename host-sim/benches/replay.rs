//! Replay throughput: the 24-hour 50 Hz benchmark log (4 320 000 rows,
//! `gen-demo --bench`, written once into `target/standfast-bench/`) read and
//! merged alone, then replayed in full through the guard with the demo rig
//! (`host-sim/demo/rig.toml`). Prints both times (best of a few runs), the
//! rows per second and the ratio of the full replay to the parse alone.
//!
//! Run with `cargo bench -p standfast-sim --bench replay`. Set
//! `STANDFAST_BENCH_HOURS` for a shorter log, `STANDFAST_BENCH_RUNS` for
//! the number of runs (default 3), and `STANDFAST_BENCH_ONLY=parse` or
//! `=replay` to run one half (for a profiler).
//!
//! **Instruction counts** (deterministic, whatever the machine's load):
//! `host-sim/benches/callgrind.sh` runs this bench once under
//! `valgrind --tool=callgrind` with `STANDFAST_BENCH_RUNS=1`, dumping the
//! counters at the entry of [`replay_pass`], so that one run gives the
//! parse-only count (start-up and [`parse_pass`]) and the full replay's
//! count (both threads) separately; see BENCHMARKS.md.
//!
//! The full replay runs on two threads (reading and merging on one, the
//! guard on the other), so beside the wall time the bench prints the CPU
//! time of the process (user and system, all threads, from
//! `/proc/self/stat` on Linux) of the same run: the work a single core
//! would have to do.

use std::hint::black_box;
use std::path::PathBuf;
use std::time::Instant;

use standfast_sim::commands::demo_data::{write_bench_log, BENCH_PROFILE_TOML};
use standfast_sim::input::log::{ErrorPolicy, LogProfile, Merger};
use standfast_sim::input::rigfile::LoadedRig;
use standfast_sim::model::replay::{replay, ReplayOptions};

/// CPU time of this process so far (user and system, all threads), in
/// seconds, from `/proc/self/stat` (Linux; `None` elsewhere). Clock ticks
/// are taken as 100 per second, the Linux user-space value.
#[allow(clippy::cast_precision_loss)]
fn cpu_s() -> Option<f64> {
    let stat = std::fs::read_to_string("/proc/self/stat").ok()?;
    // Fields after the command name (which is in parentheses): state is
    // field 3, utime 14 and stime 15.
    let rest = stat.get(stat.rfind(')')? + 2..)?;
    let mut fields = rest.split_whitespace().skip(11);
    let utime: u64 = fields.next()?.parse().ok()?;
    let stime: u64 = fields.next()?.parse().ok()?;
    Some((utime + stime) as f64 / 100.0)
}

/// Runs `f` and returns (wall seconds, CPU seconds).
fn timed(f: impl FnOnce()) -> (f64, Option<f64>) {
    let c = cpu_s();
    let t = Instant::now();
    f();
    let wall = t.elapsed().as_secs_f64();
    (wall, cpu_s().zip(c).map(|(b, a)| b - a))
}

/// The 1-, 5- and 15-minute load averages (`/proc/loadavg`, Linux), to
/// print beside the times: on a shared machine they say how much the other
/// processes took.
fn load_average() -> String {
    std::fs::read_to_string("/proc/loadavg").map_or_else(
        |_| "unknown".to_owned(),
        |s| s.split_whitespace().take(3).collect::<Vec<_>>().join(" "),
    )
}

fn env_or<T: std::str::FromStr>(name: &str, default: T) -> T {
    std::env::var(name)
        .ok()
        .and_then(|h| h.parse().ok())
        .unwrap_or(default)
}

/// The parse-only pass: reads and merges the whole log (`Merger` to the
/// end), nothing else; returns the rows read. Not inlined, so that a
/// profiler can attribute its cost (`callgrind.sh` dumps at the entry of
/// [`replay_pass`]).
#[inline(never)]
fn parse_pass(profile: &LogProfile) -> u64 {
    let mut m = Merger::open(profile, ErrorPolicy::Stop).expect("open");
    let mut acc = 0.0;
    // Lent, as the replay reads them.
    while let Some(r) = m.next_record_ref().expect("read") {
        acc += r.accel_mps2.map_or(0.0, |a| a[2]);
    }
    black_box(acc);
    m.rows()
}

/// The full replay pass (the guard on a second thread, as `standfast
/// replay` runs it, without its output files); returns the rows read and
/// the highest overturning utilisation. Not inlined (see [`parse_pass`]).
#[inline(never)]
fn replay_pass(rig: &LoadedRig, profile: &LogProfile) -> (u64, Option<f32>) {
    let mut m = Merger::open(profile, ErrorPolicy::Stop).expect("open");
    let rep = replay(
        std::slice::from_ref(rig),
        &mut m,
        ReplayOptions::default(),
        None,
    )
    .expect("replay");
    let highest = rep.rigs[0].overturning.as_ref().map(|a| a.utilisation);
    black_box(&rep);
    (m.rows(), highest)
}

#[allow(clippy::cast_precision_loss)]
fn main() {
    let hours: f64 = env_or("STANDFAST_BENCH_HOURS", 24.0);
    let runs: usize = env_or("STANDFAST_BENCH_RUNS", 3).max(1);
    let only: String = env_or("STANDFAST_BENCH_ONLY", String::new());
    let (parse_runs, replay_runs) = match only.as_str() {
        "parse" => (runs, 0),
        "replay" => (0, runs),
        _ => (runs, runs),
    };
    let root = PathBuf::from(env!("CARGO_MANIFEST_DIR"));
    let dir = root
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
    let rig = standfast_sim::input::rigfile::load(&root.join("demo/rig.toml")).expect("demo rig");

    println!("load average before: {}", load_average());
    let mut parse_best = f64::INFINITY;
    let mut parse_cpu = None;
    let mut rows = 0;
    for _ in 0..parse_runs {
        let (wall, cpu) = timed(|| rows = parse_pass(&profile));
        if wall < parse_best {
            (parse_best, parse_cpu) = (wall, cpu);
        }
    }

    let mut replay_best = f64::INFINITY;
    let mut replay_cpu = None;
    let mut highest = None;
    for _ in 0..replay_runs {
        let (wall, cpu) = timed(|| (rows, highest) = replay_pass(&rig, &profile));
        if wall < replay_best {
            (replay_best, replay_cpu) = (wall, cpu);
        }
    }

    let rate = |s: f64| rows as f64 / s;
    let cpu = |c: Option<f64>| c.map_or_else(|| "unknown".to_owned(), |c| format!("{c:.2} s"));
    println!(
        "parse and merge: {rows} rows in {parse_best:.3} s (best of {runs}; CPU {}), {:.0} rows/s",
        cpu(parse_cpu),
        rate(parse_best)
    );
    println!(
        "full replay (demo rig, 2 threads): {rows} rows in {replay_best:.3} s (best of {runs}; CPU {}), {:.0} rows/s; highest overturning utilisation {highest:?}",
        cpu(replay_cpu),
        rate(replay_best)
    );
    println!("load average after: {}", load_average());
    println!(
        "replay / parse = {:.2} (the guard adds {:.0} %)",
        replay_best / parse_best,
        (replay_best / parse_best - 1.0) * 100.0
    );
}
