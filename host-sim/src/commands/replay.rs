//! `standfast replay` and `standfast demo`: their arguments, opening the
//! logs, the outputs (verdict CSV, HTML report, event lines) written
//! atomically, and the summary on standard output.

use std::io::Write;

use crate::commands::output::{check_paths, AtomicFile, OwnedFolder, Role};
use crate::commands::progress::Spinner;
use crate::error::Error;
use crate::input::log::Merger;
use crate::input::rigfile::LoadedRig;
use crate::model::replay::{replay, ReplayObserver, ReplayOptions, ReplayReport};
use crate::render::verdicts::{verdict_line, VERDICT_HEADER};

/// Arguments of `replay`.
#[derive(Debug, clap::Args)]
pub struct ReplayArgs {
    /// Rig file (TOML); repeat for several rigs on the same logs, each with
    /// its own guard.
    #[arg(long = "rig", value_name = "RIG.toml", required = true)]
    pub rigs: Vec<std::path::PathBuf>,
    /// Log profile (a TOML file with a `[log]` section). Default: the
    /// `[log]` section of the first rig file.
    #[arg(long, value_name = "PROFILE.toml")]
    pub profile: Option<std::path::PathBuf>,
    /// Log files replacing the profile's `[[log.file]]` paths, in the
    /// profile's order (as many as it lists). Default: the profile's paths.
    #[arg(value_name = "LOGS")]
    pub logs: Vec<std::path::PathBuf>,
    /// Print the summary as JSON instead of text.
    #[arg(long)]
    pub json: bool,
    /// Write the guard's verdicts as CSV to this file.
    #[arg(long, value_name = "FILE")]
    pub verdicts: Option<std::path::PathBuf>,
    /// With --verdicts: write every N-th record (records with a level change
    /// or fault always).
    #[arg(long, value_name = "N", default_value_t = 1, requires = "verdicts",
          value_parser = clap::value_parser!(u64).range(1..))]
    pub every: u64,
    /// Also write a self-contained HTML report with charts to this file.
    #[arg(long, value_name = "FILE")]
    pub html: Option<std::path::PathBuf>,
    /// What to do with a bad log row (malformed, out of order, duplicate):
    /// `stop` at the first one (exit 1, the rows before it replayed), or
    /// `skip` it, report and count it. Overrides the profile's `on_error`.
    #[arg(long, value_name = "POLICY", value_parser = ["stop", "skip"])]
    pub on_error: Option<String>,
    /// Also replay a variant of the first rig with this override, side by
    /// side (repeatable; all apply to one variant): ballast=MASS@X,Y,Z,
    /// cover=on|off|as-logged, watch_utilisation=, park_utilisation=,
    /// alarm_utilisation=, time_to_park=, friction=, tie_down=.
    #[arg(long = "what-if", value_name = "KEY=VALUE")]
    pub what_if: Vec<String>,
    /// Write the first rig's level changes and faults as the firmware
    /// example's event lines to this file (see `event_lines`).
    #[arg(long, value_name = "FILE")]
    pub events: Option<std::path::PathBuf>,
    /// Local time zone of the summary's and the HTML report's times, as an
    /// offset east of UTC: +hh:mm, -hh:mm or Z (-23:59 to +23:59), e.g.
    /// +02:00. Default: the offset the logs write (UTC when they write
    /// none). JSON and CSV times stay ISO 8601 UTC.
    #[arg(long, value_name = "±hh:mm", allow_hyphen_values = true)]
    pub utc_offset: Option<String>,
}

/// Reads `--utc-offset`: seconds east of UTC.
///
/// # Errors
/// [`Error::Usage`] (exit code 2) naming the option, the value (bounded),
/// the forms accepted and the range.
pub fn utc_offset_option(text: &str) -> Result<i32, Error> {
    // An empty value would read as no offset at all (UTC): refused, so a
    // missing value is never taken for a zone.
    let parsed = if text.trim().is_empty() {
        Err(String::new())
    } else {
        crate::input::log::time::parse_offset(text)
    };
    parsed.map_err(|_| {
        Error::Usage(format!(
            "--utc-offset = \"{}\": not a zone offset; write +hh:mm, -hh:mm or Z, in the accepted range -23:59 to +23:59 (e.g. +02:00)",
            crate::input::located::bounded(text)
        ))
    })
}

/// Arguments of `demo`.
#[derive(Debug, clap::Args)]
pub struct DemoArgs {
    /// Folder for the invented night's logs, profile, rig file, verdicts and
    /// report (created if missing; about 66 MB for the whole night). Default:
    /// `standfast-demo` in cargo's target folder when the command runs from
    /// one (`cargo run`), else `standfast-demo` in the current folder; the
    /// command prints the folder it used. Files of the same names are
    /// replaced only when standfast wrote them and they are unchanged,
    /// unless --replace is given.
    #[arg(long, value_name = "DIR")]
    pub out: Option<std::path::PathBuf>,
    /// Replace files of the same names in the --out folder even when
    /// standfast did not write them (for example your own rig.toml).
    #[arg(long)]
    pub replace: bool,
    /// Seed of the invented night.
    #[arg(long, default_value_t = 2025)]
    pub seed: u64,
    /// Length of the night: hours, or a time with a unit ("90 min"); more
    /// than 0, up to 9 h (default: the whole invented night, 9 h); shorter
    /// nights replay faster.
    #[arg(long, value_name = "H", allow_hyphen_values = true)]
    pub hours: Option<String>,
    /// Print the summary as JSON instead of text.
    #[arg(long)]
    pub json: bool,
}

/// Accepted length of the demo night.
pub const DEMO_HOURS: crate::commands::options::OptionRange =
    crate::commands::options::OptionRange {
        lo: 0.0,
        hi: 9.0,
        lo_open: true,
        unit: "h",
    };

/// The files `standfast demo` writes into its folder.
pub const DEMO_FILES: [&str; 7] = [
    crate::commands::demo_data::DEMO_WIND_CSV,
    crate::commands::demo_data::DEMO_ACCEL_CSV,
    crate::commands::demo_data::DEMO_MOUNT_CSV,
    crate::commands::demo_data::DEMO_PROFILE_TOML,
    "rig.toml",
    "verdicts.csv",
    "report.html",
];

/// The demo rig file (invented), as shipped in `host-sim/demo/rig.toml`.
pub const DEMO_RIG_TOML: &str = include_str!("../../demo/rig.toml");

/// Opens the merge of a profile, with the profile's paths optionally
/// replaced by `logs`.
///
/// # Errors
/// [`Error::Input`] when the count of `logs` does not match the profile;
/// the merge's errors.
pub fn open_logs(profile: &std::path::Path, logs: &[std::path::PathBuf]) -> Result<Merger, Error> {
    open_logs_with(profile, logs, None)
}

/// As [`open_logs`], with the profile's bad-row policy replaced by `policy`
/// when given.
///
/// # Errors
/// As [`open_logs`].
pub fn open_logs_with(
    profile: &std::path::Path,
    logs: &[std::path::PathBuf],
    policy: Option<crate::input::log::ErrorPolicy>,
) -> Result<Merger, Error> {
    let p = load_profile(profile, logs)?;
    Ok(Merger::open(&p, policy.unwrap_or(p.on_error))?)
}

/// Reads a log profile and replaces its files' paths by `logs` when given.
///
/// # Errors
/// [`Error::Input`] when the count of `logs` does not match the profile;
/// the profile's errors.
pub fn load_profile(
    profile: &std::path::Path,
    logs: &[std::path::PathBuf],
) -> Result<crate::input::log::LogProfile, Error> {
    let mut p = crate::input::log::LogProfile::load(profile)?;
    if !logs.is_empty() {
        if logs.len() != p.files.len() {
            return Err(Error::Usage(format!(
                "{} log files given on the command line but the profile {} lists {} \
                 (give as many as it lists, in its order, or none)",
                logs.len(),
                profile.display(),
                p.files.len()
            )));
        }
        for (f, l) in p.files.iter_mut().zip(logs) {
            f.path.clone_from(l);
            l.display().to_string().clone_into(&mut f.label);
        }
    }
    Ok(p)
}

/// What a command's replay does with the model's progress and verdicts:
/// draws the spinner and writes the verdict CSV (when asked).
pub struct ReplayOutputs<'a> {
    spinner: Spinner,
    verdicts: Option<(&'a mut dyn Write, String)>,
    line: Vec<u8>,
}

impl<'a> ReplayOutputs<'a> {
    /// The spinner, and the verdict CSV into `verdicts` (the writer and the
    /// name its I/O errors give) when given; writes the CSV's header.
    ///
    /// # Errors
    /// [`Error::Io`] when the header cannot be written.
    pub fn new(verdicts: Option<(&'a mut dyn Write, &str)>) -> Result<ReplayOutputs<'a>, Error> {
        let verdicts = match verdicts {
            Some((w, name)) => {
                w.write_all(VERDICT_HEADER.as_bytes())
                    .map_err(|e| Error::io(name, e))?;
                Some((w, name.to_owned()))
            }
            None => None,
        };
        Ok(ReplayOutputs {
            spinner: Spinner::new(),
            verdicts,
            line: Vec::new(),
        })
    }
}

impl ReplayObserver for ReplayOutputs<'_> {
    fn progress(&mut self, p: crate::model::replay::Progress) {
        self.spinner.set(p);
    }

    fn verdict(
        &mut self,
        time: crate::input::log::Timestamp,
        t_s: f64,
        rig: usize,
        v: &standfast::guard::Verdict,
        cover: Option<bool>,
    ) -> Result<(), Error> {
        if let Some((w, name)) = self.verdicts.as_mut() {
            self.line.clear();
            verdict_line(&mut self.line, time, t_s, rig, v, cover);
            w.write_all(&self.line)
                .map_err(|e| Error::io(name.as_str(), e))?;
        }
        Ok(())
    }

    fn wants_verdicts(&self) -> bool {
        self.verdicts.is_some()
    }

    fn finished(&mut self) -> Result<(), Error> {
        self.spinner.finish();
        if let Some((w, name)) = self.verdicts.as_mut() {
            w.flush().map_err(|e| Error::io(name.as_str(), e))?;
        }
        Ok(())
    }
}

/// Runs the replay, writing the verdict CSV (when asked) into a temporary
/// file that the caller commits.
fn replay_files(
    rigs: &[LoadedRig],
    merger: &mut Merger,
    every: u64,
    verdicts: Option<&std::path::Path>,
) -> Result<(ReplayReport, Option<AtomicFile>), Error> {
    let options = ReplayOptions {
        verdicts_every: every,
    };
    let mut file = match verdicts {
        Some(path) => Some((AtomicFile::create(path)?, path.display().to_string())),
        None => None,
    };
    let mut outputs = ReplayOutputs::new(
        file.as_mut()
            .map(|(w, name)| (w as &mut dyn Write, name.as_str())),
    )?;
    let rep = replay(rigs, merger, options, Some(&mut outputs))?;
    drop(outputs);
    Ok((rep, file.map(|(w, _)| w)))
}

/// A whole output in a temporary file, for committing with the others.
fn pending(path: &std::path::Path, text: &str) -> Result<AtomicFile, Error> {
    let mut f = AtomicFile::create(path)?;
    f.write_all(text.as_bytes())
        .map_err(|e| Error::io(path, e))?;
    Ok(f)
}

/// Runs `standfast replay`.
///
/// Outputs (`--verdicts`, `--html`, `--events`) that are the same file as
/// an input or as each other are refused before anything is read or
/// written; all outputs are written to temporary files and renamed into
/// place only when the whole run has succeeded.
///
/// # Errors
/// Bad rig file, profile or log ([`Error::Input`], [`Error::Log`]); an
/// output path refused ([`Error::Usage`]); files that cannot be read or
/// written ([`Error::Io`]).
pub fn run_replay(a: &ReplayArgs, out: &mut dyn Write) -> Result<(), Error> {
    let mut outputs = Vec::new();
    if let Some(p) = &a.verdicts {
        outputs.push(Role::new("--verdicts", p));
    }
    if let Some(p) = &a.html {
        outputs.push(Role::new("--html", p));
    }
    if let Some(p) = &a.events {
        outputs.push(Role::new("--events", p));
    }
    let mut inputs: Vec<Role<'_>> = a
        .rigs
        .iter()
        .map(|r| Role::new("the rig file", r))
        .collect();
    if let Some(p) = &a.profile {
        inputs.push(Role::new("the log profile", p));
    }
    inputs.extend(a.logs.iter().map(|l| Role::new("the log", l)));
    check_paths(&inputs, &outputs)?;
    let utc_offset_s = a.utc_offset.as_deref().map(utc_offset_option).transpose()?;
    let overrides = a
        .what_if
        .iter()
        .map(|t| crate::model::whatif::parse_override(t))
        .collect::<Result<Vec<_>, _>>()?;

    let rigs = a
        .rigs
        .iter()
        .map(|p| crate::input::rigfile::load(p))
        .collect::<Result<Vec<_>, _>>()?;
    let mut rigs = rigs;
    if let (false, Some(base)) = (overrides.is_empty(), rigs.first()) {
        rigs.push(crate::model::whatif::variant(base, &overrides, &a.what_if)?);
    }
    let profile = match (&a.profile, a.rigs.first()) {
        (Some(p), _) => p.clone(),
        (None, Some(r)) => r.clone(),
        (None, None) => std::path::PathBuf::new(),
    };
    let policy = a.on_error.as_deref().map(|p| {
        if p == "stop" {
            crate::input::log::ErrorPolicy::Stop
        } else {
            crate::input::log::ErrorPolicy::Skip
        }
    });
    let p = load_profile(&profile, &a.logs)?;
    // The profile's own log paths, known only now: checked before any is
    // opened.
    let log_paths: Vec<Role<'_>> = p
        .files
        .iter()
        .map(|f| Role::new("the log", &f.path))
        .collect();
    check_paths(&log_paths, &outputs)?;
    let mut merger = Merger::open(&p, policy.unwrap_or(p.on_error))?;
    let (mut rep, verdict_file) = replay_files(&rigs, &mut merger, a.every, a.verdicts.as_deref())?;
    rep.local_offset_s = utc_offset_s.or_else(|| crate::input::log::zone::written_offset_s(&p));
    let mut files: Vec<AtomicFile> = verdict_file.into_iter().collect();
    if let Some(path) = &a.events {
        files.push(pending(path, &crate::render::event_lines::lines(&rep)?)?);
    }
    if let Some(h) = &a.html {
        let charts = crate::model::charts::replay_charts(&rep, &rigs)?;
        files.push(pending(
            h,
            &crate::render::report::replay_html(&rep, &charts),
        )?);
    }
    let mut summary = Vec::new();
    crate::render::summary::write(&rep, a.json, &mut summary)?;
    for f in files {
        f.commit()?;
    }
    out.write_all(&summary)
        .map_err(|e| Error::io("<standard output>", e))?;
    if let Some(h) = &a.html {
        if !a.json {
            writeln!(out, "Report written to {}", h.display())
                .map_err(|e| Error::io("<standard output>", e))?;
        }
    }
    if let Some(v) = &a.verdicts {
        if !a.json {
            writeln!(out, "Verdicts written to {}", v.display())
                .map_err(|e| Error::io("<standard output>", e))?;
        }
    }
    Ok(())
}

/// The demo's default folder: `standfast-demo` in cargo's target folder
/// when the executable `exe` lies in one (a folder holding the
/// `CACHEDIR.TAG` cargo writes there, up to three levels above the
/// executable: `target/debug/`, `target/<triple>/release/`), else
/// `standfast-demo` in `cwd`.
#[must_use]
pub fn demo_dir_for(exe: &std::path::Path, cwd: &std::path::Path) -> std::path::PathBuf {
    exe.ancestors()
        .skip(1)
        .take(3)
        .find(|d| d.join("CACHEDIR.TAG").is_file())
        .map_or_else(|| cwd.join("standfast-demo"), |t| t.join("standfast-demo"))
}

/// Total size of the named files in `dir`, bytes (files that cannot be
/// read count 0: the size is only reported).
fn files_size(dir: &std::path::Path, names: &[&str]) -> u64 {
    names
        .iter()
        .filter_map(|n| std::fs::metadata(dir.join(n)).ok())
        .map(|m| m.len())
        .sum()
}

/// Runs `standfast demo`: writes the invented night and rig into the
/// folder, replays them and prints the summary and the paths written.
///
/// # Errors
/// As [`run_replay`]; [`Error::Io`] when the folder cannot be written.
pub fn run_demo(a: &DemoArgs, out: &mut dyn Write) -> Result<(), Error> {
    let hours = match &a.hours {
        Some(h) => Some(
            crate::commands::options::quantity_option::<crate::input::units::TimeDim>(
                "--hours", h, DEMO_HOURS,
            )? / 3600.0,
        ),
        None => None,
    };
    let out_dir = a.out.clone().unwrap_or_else(|| {
        let exe = std::env::current_exe().unwrap_or_default();
        demo_dir_for(&exe, std::path::Path::new("."))
    });
    let mut folder = OwnedFolder::open(&out_dir, a.replace)?;
    folder.check(&DEMO_FILES)?;
    let mut plan = crate::commands::demo_data::NightPlan::windy_night(a.seed);
    if let Some(h) = hours {
        plan.duration_s = h * 3600.0;
    }
    let logs = crate::commands::demo_data::write_demo_logs_in(&mut folder, &plan)?;
    let rig_path = folder.write("rig.toml", DEMO_RIG_TOML.as_bytes())?;
    let rig = crate::input::rigfile::load(&rig_path)?;
    let verdicts = out_dir.join("verdicts.csv");
    let profile = load_profile(&logs.profile_toml, &[])?;
    let mut merger = Merger::open(&profile, profile.on_error)?;
    let (mut rep, verdict_file) =
        replay_files(std::slice::from_ref(&rig), &mut merger, 10, Some(&verdicts))?;
    rep.local_offset_s = crate::input::log::zone::written_offset_s(&profile);
    let report = out_dir.join("report.html");
    let page = pending(
        &report,
        &crate::render::report::replay_html(
            &rep,
            &crate::model::charts::replay_charts(&rep, std::slice::from_ref(&rig))?,
        ),
    )?;
    if let Some(v) = verdict_file {
        folder.commit(v)?;
    }
    folder.commit(page)?;
    crate::render::summary::write(&rep, a.json, out)?;
    if !a.json {
        #[allow(clippy::cast_precision_loss)] // sizes far below 2^53
        let size_mb = files_size(&out_dir, &DEMO_FILES) as f64 / 1e6;
        writeln!(out, "\nReport: {}", report.display())
            .map_err(|e| Error::io("<standard output>", e))?;
        writeln!(
            out,
            "\nAn invented windy night (seed {}); no real rig or site is described. Files written in {} ({:.1} MB in all):\n  {}\n  {}\n  {}\n  {}\n  {}\n  {} (every 10th record)",
            a.seed,
            out_dir.display(),
            size_mb,
            rig_path.display(),
            logs.wind_csv.display(),
            logs.accel_csv.display(),
            logs.mount_csv.display(),
            logs.profile_toml.display(),
            verdicts.display()
        )
        .map_err(|e| Error::io("<standard output>", e))?;
    }
    Ok(())
}
