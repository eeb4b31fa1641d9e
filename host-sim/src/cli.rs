//! Command-line interface: argument definitions and dispatch. `main.rs` only
//! parses and maps errors to exit codes (see [`crate::error::exit`]).

use std::io::Write;
use std::path::PathBuf;

use clap::{Args, Parser, Subcommand};

use crate::demo_data::{self, NightPlan};
use crate::error::Error;

/// Cautions printed with every result a person reads.
pub const CAUTION: &str = "Caution: Standfast's figures are estimates from a simplified static model. \
Secure the rig anyway, stay inside the mount maker's limits, and defer to local codes and licensed engineers.";

const AFTER_HELP: &str = "\
Exit codes: 0 success; 1 bad input (rig file, log profile or log); 2 bad command line; 3 a file or folder cannot be read or written.

Caution: Standfast's figures are estimates from a simplified static model. Secure the rig anyway, \
stay inside the mount maker's limits, and defer to local codes and licensed engineers.";

/// How close is a telescope rig left outdoors to tipping, sliding or
/// overloading its drives?
#[derive(Debug, Parser)]
#[command(name = "standfast", version, about, after_help = AFTER_HELP)]
pub struct Cli {
    /// What to do.
    #[command(subcommand)]
    pub command: Command,
}

/// The subcommands.
#[derive(Debug, Subcommand)]
pub enum Command {
    /// Write invented demo data: a windy night's logs with their log profile,
    /// or (with --bench) a long 50 Hz log for the throughput benchmark.
    GenDemo(GenDemoArgs),
    /// Assess a rig file without logs (tip wind, torques, ballast, tripod orientation).
    Assess(crate::assess::AssessArgs),
    /// Find the rig's centre of gravity from scale readings under its feet
    /// (level, one side lifted, tilted until a foot unloads).
    Weigh(crate::weigh::WeighArgs),
    /// Replay a night's logs through the guard and summarise the closest approaches.
    Replay(crate::replay::ReplayArgs),
    /// Write an invented windy night and demo rig, replay them and print the summary.
    Demo(crate::replay::DemoArgs),
    /// Read live samples (JSON lines or CSV) on standard input and write one JSON verdict line per sample.
    Bridge(crate::bridge::BridgeArgs),
    /// Write a rig file as a versioned, checksummed binary rig image for the C ABI (core/ffi).
    RigImage(crate::rig_image::RigImageArgs),
}

/// Arguments of `gen-demo`.
#[derive(Debug, Args)]
pub struct GenDemoArgs {
    /// Folder to write into (created if missing; files in it are replaced).
    #[arg(long, value_name = "DIR")]
    pub out: PathBuf,
    /// Seed of the random streams; the same seed gives the same bytes.
    #[arg(long, default_value_t = 2025)]
    pub seed: u64,
    /// Write the benchmark log (one pre-merged 50 Hz file) instead of the
    /// demo night.
    #[arg(long)]
    pub bench: bool,
    /// Length of the benchmark log in hours (24 h is 4 320 000 rows).
    #[arg(long, default_value_t = 24.0, requires = "bench", value_parser = parse_hours)]
    pub hours: f64,
}

fn parse_hours(s: &str) -> Result<f64, String> {
    let h: f64 = s
        .parse()
        .map_err(|_| format!("\"{s}\" is not a number of hours"))?;
    if h.is_finite() && h > 0.0 && h <= 240.0 {
        Ok(h)
    } else {
        Err(format!("{s} h is outside the accepted range 0 to 240 h"))
    }
}

/// Runs a parsed command, writing what a person reads to `out`.
///
/// # Errors
/// The library's [`Error`]; its [`Error::exit_code`] is the process exit code.
pub fn run(cli: &Cli, out: &mut dyn Write) -> Result<(), Error> {
    match &cli.command {
        Command::GenDemo(a) => gen_demo(a, out),
        Command::Assess(a) => crate::assess::run(a, out),
        Command::Weigh(a) => crate::weigh::run(a, out),
        Command::Replay(a) => crate::replay::run_replay(a, out),
        Command::Demo(a) => crate::replay::run_demo(a, out),
        Command::Bridge(a) => crate::bridge::run_bridge(a, out),
        Command::RigImage(a) => crate::rig_image::run(a, out),
    }
}

fn gen_demo(a: &GenDemoArgs, out: &mut dyn Write) -> Result<(), Error> {
    let stdout = |e| Error::io("<standard output>", e);
    if a.bench {
        let b = demo_data::write_bench_log(&a.out, a.seed, a.hours)?;
        writeln!(
            out,
            "wrote {} rows of invented 50 Hz data:\n  {}\n  {}",
            b.rows,
            b.csv.display(),
            b.profile_toml.display()
        )
        .map_err(stdout)?;
        return Ok(());
    }
    let plan = NightPlan::windy_night(a.seed);
    let logs = demo_data::write_demo_logs(&a.out, &plan)?;
    writeln!(
        out,
        "wrote an invented windy night (seed {}):\n  {}\n  {}\n  {}\n  {}\nAll data are invented; no real rig or site is described.",
        a.seed,
        logs.wind_csv.display(),
        logs.accel_csv.display(),
        logs.mount_csv.display(),
        logs.profile_toml.display()
    )
    .map_err(stdout)?;
    Ok(())
}
