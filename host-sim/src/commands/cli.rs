//! Command-line interface: argument definitions and dispatch. `main.rs` only
//! parses and maps errors to exit codes (see [`crate::error::exit`]).

use std::io::Write;
use std::path::PathBuf;

use clap::{Args, Parser, Subcommand};

use crate::cautions::caution_paragraph;
use crate::commands::demo_data::{self, NightPlan};
use crate::commands::options::{quantity_option, OptionRange};
use crate::error::Error;

const AFTER_HELP: &str = concat!(
    "Exit codes: 0 success; 1 bad input (rig file, log profile or log); 2 bad command line; \
3 a file or folder cannot be read or written.\n\n",
    caution_paragraph!()
);

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
    Assess(crate::commands::assess::AssessArgs),
    /// Find the rig's centre of gravity from scale readings under its feet
    /// (level, one side lifted, tilted until a foot unloads).
    Weigh(crate::commands::weigh::WeighArgs),
    /// Replay a night's logs through the guard and summarise the closest approaches.
    Replay(crate::commands::replay::ReplayArgs),
    /// Write an invented windy night and demo rig, replay them and print the summary.
    Demo(crate::commands::replay::DemoArgs),
    /// Read live samples (JSON lines or CSV) on standard input and write one JSON verdict line per sample.
    Bridge(crate::commands::bridge::BridgeArgs),
    /// Write a rig file as a versioned, checksummed binary rig image for the C ABI (core/ffi).
    RigImage(crate::commands::rig_image::RigImageArgs),
    /// Write a commented starting rig file for a tripod or a pier with an
    /// equatorial or alt-azimuth mount (never over an existing file).
    StarterRig(crate::commands::starter::StarterRigArgs),
}

/// Arguments of `gen-demo`.
#[derive(Debug, Args)]
pub struct GenDemoArgs {
    /// Folder to write into (created if missing). Files of the same names
    /// are replaced only when standfast wrote them and they are unchanged,
    /// unless --replace is given.
    #[arg(long, value_name = "DIR")]
    pub out: PathBuf,
    /// Replace files of the same names in the --out folder even when
    /// standfast did not write them.
    #[arg(long)]
    pub replace: bool,
    /// Seed of the random streams; the same seed gives the same bytes.
    #[arg(long, default_value_t = 2025)]
    pub seed: u64,
    /// Write the benchmark log (one pre-merged 50 Hz file) instead of the
    /// demo night.
    #[arg(long)]
    pub bench: bool,
    /// Length of the benchmark log: hours, or a time with a unit ("90 min");
    /// more than 0, up to 240 h (24 h is 4 320 000 rows).
    #[arg(
        long,
        value_name = "H",
        default_value = "24",
        requires = "bench",
        allow_hyphen_values = true
    )]
    pub hours: String,
}

/// Accepted length of the benchmark log.
pub const BENCH_HOURS: OptionRange = OptionRange {
    lo: 0.0,
    hi: 240.0,
    lo_open: true,
    unit: "h",
};

/// Runs a parsed command, writing what a person reads to `out`.
///
/// # Errors
/// The library's [`Error`]; its [`Error::exit_code`] is the process exit code.
pub fn run(cli: &Cli, out: &mut dyn Write) -> Result<(), Error> {
    match &cli.command {
        Command::GenDemo(a) => gen_demo(a, out),
        Command::Assess(a) => crate::commands::assess::run(a, out),
        Command::Weigh(a) => crate::commands::weigh::run(a, out),
        Command::Replay(a) => crate::commands::replay::run_replay(a, out),
        Command::Demo(a) => crate::commands::replay::run_demo(a, out),
        Command::Bridge(a) => crate::commands::bridge::run_bridge(a, out),
        Command::RigImage(a) => crate::commands::rig_image::run(a, out),
        Command::StarterRig(a) => crate::commands::starter::run(a, out),
    }
}

fn gen_demo(a: &GenDemoArgs, out: &mut dyn Write) -> Result<(), Error> {
    let stdout = |e| Error::io("<standard output>", e);
    let hours =
        quantity_option::<crate::input::units::TimeDim>("--hours", &a.hours, BENCH_HOURS)? / 3600.0;
    let mut folder = crate::commands::output::OwnedFolder::open(&a.out, a.replace)?;
    if a.bench {
        folder.check(&[demo_data::BENCH_CSV, demo_data::BENCH_PROFILE_TOML])?;
        let b = demo_data::write_bench_log_in(&mut folder, a.seed, hours)?;
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
    folder.check(&demo_data::DEMO_LOG_FILES)?;
    let logs = demo_data::write_demo_logs_in(&mut folder, &plan)?;
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
