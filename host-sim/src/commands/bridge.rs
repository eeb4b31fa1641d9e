//! The live bridge: samples in on standard input, one guard verdict per line
//! out on standard output.
//!
//! `standfast bridge --rig RIG.toml [--format json|csv] [--clock sample|wall]
//! [--on-change CMD]` reads one sample per line (JSON lines, or CSV with a
//! header line), steps one core [`Guard`] per sample and writes one JSON
//! line per sample, flushed at once, so another program can hold a pipe open
//! and read its answer after each line it writes.
//!
//! **Input schema** (JSON keys and CSV column names; every field is optional
//! except the time with `--clock sample`; units are in the names):
//!
//! | name | meaning | accepted |
//! |---|---|---|
//! | `t_ms` | sample time, whole milliseconds since any epoch | integer ≥ 0 |
//! | `t_s` | sample time, seconds since any epoch (instead of `t_ms`) | ≥ 0 |
//! | `accel_g` | accelerometer `[x, y, z]` in g, rig frame (x east, y north, z up) | each −16 to 16 |
//! | `accel_x_g`, `accel_y_g`, `accel_z_g` | the same, one per field (all three together) | each −16 to 16 |
//! | `wind_mps` | wind speed at the anemometer, m/s | 0 to the rig's `wind.max_speed_mps` |
//! | `wind_from_deg` | direction the wind blows from, degrees clockwise from north | 0 to 360 |
//! | `ha_deg`, `dec_deg` | hour angle (positive west) and declination, degrees | −180 to 180, −90 to 90 |
//! | `pier_side` | `tube_east` or `tube_west` | |
//! | `primary_axis_deg`, `secondary_axis_deg` | mechanical axis angles, degrees (instead of hour angle and declination) | −360 to 360 |
//! | `cover` | cover fitted | `true`/`false` (CSV also `1`/`0`) |
//! | `temp_c`, `pressure_hpa` | air temperature, °C, and station pressure, hPa | −90 to 60, 300 to 1100 |
//! | `ack` | acknowledge a latched alarm before this step | `true`/`false` |
//!
//! Pose and air values hold until changed: a line that gives only `dec_deg`
//! reuses the last hour angle and pier side (tube east until one is given).
//! A line that completes no pose (a declination with no hour angle ever
//! seen) or no air state (a temperature with no pressure ever seen) is an
//! error. The ±16 g bound is the largest full scale of common MEMS
//! accelerometers (common practice, no source); the air bounds enclose the
//! recorded surface extremes (−89.2 °C, 56.7 °C; from memory) and station
//! pressures up to about 9 km of altitude.
//!
//! **Time.** With `--clock sample` (the default) the sample's own time is
//! used; a time earlier than the previous accepted one, or more than
//! [`MAX_STEP_MS`] (one hour) after it, is an error for that line and does
//! not move the clock (equal times are accepted). With `--clock wall` the bridge reads a
//! monotonic clock (milliseconds since start) and ignores `t_ms`/`t_s`; this
//! is the only place the command reads a clock, the core never does.
//!
//! **Output.** One JSON object per non-blank input line (blank lines and the
//! CSV header give nothing): a verdict (see [`VerdictLine`], in [`crate::render::bridge_lines`]) or an error
//! `{"line": N, "error": "..."}`. Errors are also written to standard
//! error; they never stop the stream. The command ends with exit code 0 at
//! the end of input. The cautions are written once to standard error at
//! start.
//!
//! **State changes.** With `--on-change CMD`, every level change spawns
//! `sh -c CMD` with `STANDFAST_LEVEL`, `STANDFAST_PREVIOUS_LEVEL`,
//! `STANDFAST_T_MS` and `STANDFAST_CAUSE` in its environment, standard input
//! from nothing and standard output to the bridge's standard error (standard
//! output stays machine-readable). The bridge does not wait: children are
//! reaped after later lines and waited for at the end of input. Spawn
//! failures and non-zero exits are reported on standard error.
//!
//! **Caution.** A verdict is an estimate from a static model and live sensors;
//! it does not replace securing the rig.

use std::io::{BufRead, Write};
use std::path::PathBuf;
use std::process::{Child, Command, Stdio};
use std::time::Instant;

use clap::{Args, ValueEnum};
use standfast::guard::{Guard, GuardConfig};
use standfast::sense::{Millis, Mounting};

use crate::cautions::CAUTIONS;
use crate::error::Error;
use crate::input::bounded::{bounded_to, MAX_PROBLEM_CHARS};
use crate::input::rigfile::{self, LoadedRig};
pub use crate::input::samples::{parse_json_line, Checked, CsvHeader, Held, Sample, FIELDS};
pub use crate::render::bridge_lines::{cause_name, ErrorLine, EventOut, PoseOut, VerdictLine};

/// Input line format.
#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum, Default)]
pub enum InputFormat {
    /// One JSON object per line.
    #[default]
    Json,
    /// CSV: a header line of field names, then one sample per line.
    Csv,
}

/// Where the time of a step comes from.
#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum, Default)]
pub enum ClockKind {
    /// The sample's `t_ms` or `t_s`.
    #[default]
    Sample,
    /// A monotonic wall clock, milliseconds since the bridge started.
    Wall,
}

/// Arguments of `bridge`.
#[derive(Debug, Args)]
pub struct BridgeArgs {
    /// The rig file.
    #[arg(long, value_name = "RIG.toml")]
    pub rig: PathBuf,
    /// Input line format.
    #[arg(long, value_enum, default_value_t = InputFormat::Json)]
    pub format: InputFormat,
    /// Command run with `sh -c` on every level change (environment:
    /// STANDFAST_LEVEL, STANDFAST_PREVIOUS_LEVEL, STANDFAST_T_MS, STANDFAST_CAUSE).
    #[arg(long, value_name = "CMD")]
    pub on_change: Option<String>,
    /// Time source: the samples' own time, or the wall clock since start.
    #[arg(long, value_enum, default_value_t = ClockKind::Sample)]
    pub clock: ClockKind,
}

/// What one input line gave.
#[derive(Clone, Debug, PartialEq)]
pub enum Answer {
    /// Nothing (a blank line or the CSV header).
    Nothing,
    /// A verdict.
    Verdict(Box<VerdictLine>),
    /// An error for this line; the stream goes on.
    Error(String),
}

/// Largest step forward of a sample's time over the last accepted one, ms
/// (one hour). A line further ahead is answered with an error and does not
/// move the guard's clock, so one far-off time stamp cannot make every
/// later good line "earlier" and refused. A stream that really resumes
/// after a longer pause needs a new bridge. (With no sample for that long
/// the guard has long reported its sensors stale.)
pub const MAX_STEP_MS: u64 = 3_600_000;

/// The bridge state: the rig, the guard (started at the first usable time)
/// and the values that hold between lines.
pub struct Bridge<'r> {
    rig: &'r LoadedRig,
    config: GuardConfig,
    format: InputFormat,
    header: Option<CsvHeader>,
    guard: Option<Guard<'r>>,
    held: Held,
    last_t: Option<Millis>,
}

impl<'r> Bridge<'r> {
    /// A bridge for a loaded rig. Accelerometer samples arrive in g in the
    /// rig frame, so the rig file's accelerometer scale and mounting are
    /// replaced by 1 g per unit and the identity mounting.
    #[must_use]
    pub fn new(rig: &'r LoadedRig, format: InputFormat) -> Bridge<'r> {
        let mut config = rig.guard.clone();
        config.tilt.scale_g_per_count = 1.0;
        config.tilt.mounting = Mounting::IDENTITY;
        Bridge {
            rig,
            config,
            format,
            header: None,
            guard: None,
            held: Held::default(),
            last_t: None,
        }
    }

    /// Starts the guard at `now` if not yet started.
    ///
    /// # Errors
    /// The core refuses the configuration.
    pub fn start(&mut self, now: Millis) -> Result<(), Error> {
        if self.guard.is_none() {
            let g = Guard::new(&self.rig.rig, self.config.clone(), now).map_err(|e| {
                crate::input::rigfile::after_load_error(
                    &self.rig.file,
                    "the guard cannot start",
                    &e,
                )
            })?;
            let mut g = g;
            // The site's air until measured air arrives.
            g.set_air(self.rig.air);
            self.guard = Some(g);
        }
        Ok(())
    }

    /// Handles input line `n` (from 1). `wall` is the wall-clock time with
    /// `--clock wall`, `None` to use the sample's time.
    ///
    /// # Errors
    /// Only when the guard cannot start (a rig-file problem); line problems
    /// are [`Answer::Error`].
    pub fn line(&mut self, n: u64, text: &str, wall: Option<Millis>) -> Result<Answer, Error> {
        Ok(match self.line_unbounded(n, text, wall)? {
            Answer::Error(e) => Answer::Error(bounded_to(&e, MAX_PROBLEM_CHARS)),
            other => other,
        })
    }

    fn line_unbounded(
        &mut self,
        n: u64,
        text: &str,
        wall: Option<Millis>,
    ) -> Result<Answer, Error> {
        let text = text.trim();
        if text.is_empty() {
            return Ok(Answer::Nothing);
        }
        let sample = match self.format {
            InputFormat::Json => parse_json_line(text),
            InputFormat::Csv => match &self.header {
                None => {
                    return Ok(match CsvHeader::parse(text) {
                        Ok(h) => {
                            self.header = Some(h);
                            Answer::Nothing
                        }
                        Err(e) => Answer::Error(format!("header: {e}")),
                    })
                }
                Some(h) => h.parse_row(text),
            },
        };
        let sample = match sample {
            Ok(s) => s,
            Err(e) => return Ok(Answer::Error(e)),
        };
        let mut held = self.held;
        let checked = match held.check(&sample, f64::from(self.config.wind.max_speed_mps)) {
            Ok(c) => c,
            Err(e) => return Ok(Answer::Error(e)),
        };
        let now = match (wall, checked.t) {
            (Some(w), _) => w,
            (None, Some(t)) => t,
            (None, None) => return Ok(Answer::Error("a sample needs t_ms or t_s".into())),
        };
        if let Some(last) = self.last_t {
            if now < last {
                return Ok(Answer::Error(format!(
                    "time went backwards: {} ms after {} ms (accepted: {} to {} ms)",
                    now.0,
                    last.0,
                    last.0,
                    last.0.saturating_add(MAX_STEP_MS)
                )));
            }
            if wall.is_none() && now.0 - last.0 > MAX_STEP_MS {
                return Ok(Answer::Error(format!(
                    "time jumps {} ms ahead of the last accepted sample ({} ms); \
                     accepted: {} to {} ms (at most {} s ahead); line not used, the clock stays",
                    now.0 - last.0,
                    last.0,
                    last.0,
                    last.0.saturating_add(MAX_STEP_MS),
                    MAX_STEP_MS / 1000
                )));
            }
        }
        self.start(now)?;
        let Some(guard) = self.guard.as_mut() else {
            return Ok(Answer::Error("the guard is not running".into()));
        };
        self.held = held;
        self.last_t = Some(now);
        if checked.ack {
            guard.acknowledge();
        }
        let v = guard.step(now, &checked.inputs);
        Ok(Answer::Verdict(Box::new(VerdictLine::new(
            n,
            &v,
            checked.ack,
        ))))
    }
}

/// Spawned `--on-change` commands not yet reaped.
struct Hooks {
    command: Option<String>,
    children: Vec<Child>,
}

impl Hooks {
    fn fire(&mut self, v: &VerdictLine, err: &mut dyn Write) {
        let Some(cmd) = &self.command else { return };
        for e in &v.events {
            let EventOut::LevelChanged { from, to, cause } = e else {
                continue;
            };
            let stdout = Stdio::from(std::io::stderr());
            let spawned = Command::new("sh")
                .arg("-c")
                .arg(cmd)
                .env("STANDFAST_LEVEL", to)
                .env("STANDFAST_PREVIOUS_LEVEL", from)
                .env("STANDFAST_T_MS", v.t_ms.to_string())
                .env("STANDFAST_CAUSE", cause)
                .stdin(Stdio::null())
                .stdout(stdout)
                .spawn();
            match spawned {
                Ok(c) => self.children.push(c),
                Err(e) => {
                    let _ = writeln!(
                        err,
                        "standfast bridge: --on-change command did not start: {e}"
                    );
                }
            }
        }
    }

    fn reap(&mut self, err: &mut dyn Write) {
        self.children.retain_mut(|c| match c.try_wait() {
            Ok(Some(status)) => {
                report_exit(status, err);
                false
            }
            Ok(None) => true,
            Err(e) => {
                let _ = writeln!(err, "standfast bridge: --on-change command: {e}");
                false
            }
        });
    }

    fn wait_all(&mut self, err: &mut dyn Write) {
        for mut c in self.children.drain(..) {
            match c.wait() {
                Ok(status) => report_exit(status, err),
                Err(e) => {
                    let _ = writeln!(err, "standfast bridge: --on-change command: {e}");
                }
            }
        }
    }
}

fn report_exit(status: std::process::ExitStatus, err: &mut dyn Write) {
    if !status.success() {
        let _ = writeln!(
            err,
            "standfast bridge: --on-change command ended with {status}"
        );
    }
}

/// Runs the bridge over `input`, writing verdict and error lines to `out`
/// (flushed after each) and cautions, errors and hook reports to `err`.
///
/// # Errors
/// The rig file cannot be used, or `out` cannot be written (the reader went
/// away). Bad lines are not errors.
pub fn run(
    args: &BridgeArgs,
    input: &mut dyn BufRead,
    out: &mut dyn Write,
    err: &mut dyn Write,
) -> Result<(), Error> {
    let rig = rigfile::load(&args.rig)?;
    for c in CAUTIONS {
        let _ = writeln!(err, "caution: {c}");
    }
    let mut bridge = Bridge::new(&rig, args.format);
    let started = Instant::now();
    if args.clock == ClockKind::Wall {
        bridge.start(Millis(0))?;
    }
    let mut hooks = Hooks {
        command: args.on_change.clone(),
        children: Vec::new(),
    };
    let stdout_err = |e| Error::io("<standard output>", e);
    let mut buf = String::new();
    let mut n: u64 = 0;
    loop {
        buf.clear();
        let read = input.read_line(&mut buf);
        n = n.saturating_add(1);
        let answer = match read {
            Ok(0) => break,
            Ok(_) => {
                let wall = (args.clock == ClockKind::Wall).then(|| {
                    Millis(u64::try_from(started.elapsed().as_millis()).unwrap_or(u64::MAX))
                });
                bridge.line(n, &buf, wall)?
            }
            Err(e) if e.kind() == std::io::ErrorKind::InvalidData => Answer::Error(bounded_to(
                &format!("cannot read the line: {e}"),
                MAX_PROBLEM_CHARS,
            )),
            Err(e) => return Err(Error::io("<standard input>", e)),
        };
        match answer {
            Answer::Nothing => {}
            Answer::Verdict(v) => {
                serde_json::to_writer(&mut *out, &v).map_err(|e| stdout_err(e.into()))?;
                writeln!(out).map_err(stdout_err)?;
                out.flush().map_err(stdout_err)?;
                hooks.fire(&v, err);
            }
            Answer::Error(msg) => {
                let _ = writeln!(err, "standfast bridge: line {n}: {msg}");
                serde_json::to_writer(
                    &mut *out,
                    &ErrorLine {
                        line: n,
                        error: &msg,
                    },
                )
                .map_err(|e| stdout_err(e.into()))?;
                writeln!(out).map_err(stdout_err)?;
                out.flush().map_err(stdout_err)?;
            }
        }
        hooks.reap(err);
    }
    hooks.wait_all(err);
    Ok(())
}

/// `standfast bridge` on the process's standard input and error.
///
/// # Errors
/// As [`run`].
pub fn run_bridge(args: &BridgeArgs, out: &mut dyn Write) -> Result<(), Error> {
    let stdin = std::io::stdin();
    let mut input = stdin.lock();
    let stderr = std::io::stderr();
    let mut err = stderr.lock();
    run(args, &mut input, out, &mut err)
}
