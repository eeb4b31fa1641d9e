//! Replay of a recorded log through the station, for the emulated board and
//! for host runs of the same code.
//!
//! The hardware is replaced at the trait boundary, nowhere else: an emulated
//! LIS3DH register file behind [`embedded_hal::i2c::I2c`] (so the driver's
//! transactions and scaling run unchanged), pins that hold a level, and a vane
//! that returns the logged direction. Time is the log's time.
//!
//! **Log format** (CSV, one header line, `#` lines are comments, blank lines
//! skipped):
//!
//! ```text
//! t_ms,accel_x,accel_y,accel_z,pulse_total,vane_from_deg,ha_deg,dec_deg
//! ```
//!
//! - `t_ms`: milliseconds, non-decreasing.
//! - `accel_x..z`: the accelerometer's raw output words (signed 16-bit, left
//!   justified, as OUT_X_L/H..OUT_Z_L/H hold them, sensor frame). All three
//!   empty: the sensor does not acknowledge its address in this row.
//! - `pulse_total`: the anemometer's running pulse total; empty when the
//!   counter delivered nothing in this row.
//! - `vane_from_deg`: azimuth the wind blows from, degrees; empty when the
//!   vane cannot be read.
//! - `ha_deg,dec_deg`: mount pose in degrees when the mount reported one;
//!   both empty otherwise.
//!
//! Every line is ASCII (comments included): a byte above 0x7F is an error
//! of its line ([`ReplayError::NotAscii`]). The lines are read as bytes,
//! without `core::str`'s UTF-8 checking and splitting, which would take
//! about 1 KiB of the board's flash.

use crate::event::{fmt_via_sink, Event, EventKind, TextSink};
#[cfg(doc)]
use crate::guard_adapter::example_guard_config;
use crate::guard_adapter::{example_guard, GuardRule};
use crate::lines::FailSafeLines;
use crate::lis3dh::{self, Lis3dh, RawSample};
use crate::pose::MountPose;
use crate::rule::{LimitRule, Limits};
use crate::station::{AxisMap, Station, StationConfig, StepInputs, StepReport};
use crate::wind::{Anemometer, AnemometerCal, PulseLatch, WindVane};
use core::borrow::BorrowMut;
use core::convert::Infallible;
use core::fmt;
use embedded_hal::digital::{ErrorType as PinErrorType, OutputPin};
use embedded_hal::i2c::{self, ErrorKind, NoAcknowledgeSource, Operation};
use standfast::guard::Guard;
use standfast::math;
use standfast::rig::Rig;
use standfast::Error;

/// The header line a replay log must start with (after comments).
pub const HEADER: &str = "t_ms,accel_x,accel_y,accel_z,pulse_total,vane_from_deg,ha_deg,dec_deg";

/// A LIS3DH register file on an emulated I2C bus: answers WHO_AM_I, keeps
/// written control registers, serves the output registers, auto-increments the
/// sub-address when its bit 7 is set, and can be told not to acknowledge.
#[derive(Clone, Debug)]
pub struct EmulatedLis3dh {
    address: u8,
    regs: [u8; 0x40],
    responding: bool,
}

impl EmulatedLis3dh {
    /// A powered-up sensor at 7-bit `address` with zero output.
    #[must_use]
    pub fn new(address: u8) -> Self {
        let mut regs = [0u8; 0x40];
        if let Some(r) = regs.get_mut(usize::from(lis3dh::reg::WHO_AM_I)) {
            *r = lis3dh::WHO_AM_I_VALUE;
        }
        // CTRL_REG1 resets to 0x07 (power-down, axes enabled), from memory.
        if let Some(r) = regs.get_mut(usize::from(lis3dh::reg::CTRL_REG1)) {
            *r = 0x07;
        }
        EmulatedLis3dh {
            address,
            regs,
            responding: true,
        }
    }

    /// Sets the output registers to `raw`, or makes the sensor stop
    /// acknowledging (`None`) until the next call with `Some`.
    pub fn set_output(&mut self, raw: Option<RawSample>) {
        self.responding = raw.is_some();
        if let Some(raw) = raw {
            let base = usize::from(lis3dh::reg::OUT_X_L);
            for (i, b) in raw.to_bytes().into_iter().enumerate() {
                if let Some(r) = self.regs.get_mut(base + i) {
                    *r = b;
                }
            }
        }
    }

    /// A register's current value.
    #[must_use]
    pub fn register(&self, sub_address: u8) -> u8 {
        self.regs
            .get(usize::from(sub_address & 0x3F))
            .copied()
            .unwrap_or(0)
    }

    /// Whether a register accepts writes (the control and threshold registers).
    const fn writable(sub: u8) -> bool {
        matches!(sub, 0x1E..=0x26 | 0x2E | 0x30..=0x3F)
    }
}

impl i2c::ErrorType for EmulatedLis3dh {
    type Error = ErrorKind;
}

impl i2c::I2c for EmulatedLis3dh {
    fn transaction(
        &mut self,
        address: u8,
        operations: &mut [Operation<'_>],
    ) -> Result<(), Self::Error> {
        if address != self.address || !self.responding {
            return Err(ErrorKind::NoAcknowledge(NoAcknowledgeSource::Address));
        }
        let mut sub: Option<u8> = None;
        let mut increment = false;
        for op in operations {
            match op {
                Operation::Write(bytes) => {
                    for &b in bytes.iter() {
                        match sub {
                            None => {
                                sub = Some(b & 0x7F);
                                increment = b & 0x80 != 0;
                            }
                            Some(s) => {
                                if Self::writable(s) {
                                    if let Some(r) = self.regs.get_mut(usize::from(s)) {
                                        *r = b;
                                    }
                                }
                                if increment {
                                    sub = Some((s + 1) & 0x3F);
                                }
                            }
                        }
                    }
                }
                Operation::Read(buf) => {
                    let mut s = sub.unwrap_or(0);
                    for b in buf.iter_mut() {
                        *b = self.register(s);
                        if increment {
                            s = (s + 1) & 0x3F;
                        }
                    }
                    sub = Some(s);
                }
            }
        }
        Ok(())
    }
}

/// An output pin that only remembers its level.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
pub struct MemoryPin {
    /// Current level: `true` high (energised).
    pub high: bool,
}

impl PinErrorType for MemoryPin {
    type Error = Infallible;
}

impl OutputPin for MemoryPin {
    fn set_low(&mut self) -> Result<(), Infallible> {
        self.high = false;
        Ok(())
    }
    fn set_high(&mut self) -> Result<(), Infallible> {
        self.high = true;
        Ok(())
    }
}

/// The vane cannot be read.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct VaneUnreadable;

/// A vane that returns a direction set from outside.
#[derive(Clone, Copy, Debug, Default, PartialEq)]
pub struct ScriptedVane {
    /// The next reading (radians, from, clockwise from north); `None` fails.
    pub from_rad: Option<f32>,
}

impl WindVane for ScriptedVane {
    type Error = VaneUnreadable;
    fn direction_from_rad(&mut self) -> Result<f32, VaneUnreadable> {
        self.from_rad.ok_or(VaneUnreadable)
    }
}

/// One parsed log row.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Row {
    /// Time, ms.
    pub t_ms: u64,
    /// Raw accelerometer words, or `None` for a non-acknowledging sensor.
    pub accel: Option<RawSample>,
    /// Anemometer running pulse total, if delivered.
    pub pulse_total: Option<u32>,
    /// Vane direction, degrees (from), if readable.
    pub vane_from_deg: Option<f32>,
    /// Mount pose, if reported.
    pub pose: Option<MountPose>,
}

/// What is wrong with a log line. Lines are counted from 1.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum ReplayError {
    /// The first non-comment line is not [`HEADER`].
    Header {
        /// Line number.
        line: u32,
    },
    /// Not eight comma-separated fields.
    Columns {
        /// Line number.
        line: u32,
    },
    /// A field does not parse or is out of range.
    Field {
        /// Line number.
        line: u32,
        /// Column name.
        column: &'static str,
    },
    /// The time went backwards.
    TimeBackwards {
        /// Line number.
        line: u32,
    },
    /// A line is longer than the line buffer.
    TooLong {
        /// Line number.
        line: u32,
    },
    /// A line holds a byte that is not ASCII (above 0x7F).
    NotAscii {
        /// Line number.
        line: u32,
    },
}

impl ReplayError {
    /// Writes the error's line (without a line ending) into `out`, as
    /// `Display` does: `error line=<n> reason=<reason>[ <key>=<value>]`.
    pub fn write_text(&self, out: &mut (impl TextSink + ?Sized)) {
        let (line, reason) = match *self {
            ReplayError::Header { line } => (line, "header"),
            ReplayError::Columns { line } => (line, "columns"),
            ReplayError::Field { line, .. } => (line, "field"),
            ReplayError::TimeBackwards { line } => (line, "time_backwards"),
            ReplayError::TooLong { line } => (line, "too_long"),
            ReplayError::NotAscii { line } => (line, "not_ascii"),
        };
        out.text("error line=");
        out.decimal(u64::from(line));
        out.text(" reason=");
        out.text(reason);
        match *self {
            ReplayError::Header { .. } => {
                out.text(" expected=");
                out.text(HEADER);
            }
            ReplayError::Field { column, .. } => {
                out.text(" column=");
                out.text(column);
            }
            _ => {}
        }
    }
}

impl fmt::Display for ReplayError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        fmt_via_sink(f, |out| self.write_text(out))
    }
}

/// Reads a decimal integer as the standard library's `FromStr` for the
/// integer types reads one: an optional `+` (or `-` when `signed`), then
/// at least one ASCII digit and nothing else. Returns whether it is
/// negative and its magnitude; [`BadNumber`] for anything else, or a
/// magnitude above `u64::MAX`.
fn integer(s: &[u8], signed: bool) -> Result<(bool, u64), BadNumber> {
    let (negative, digits) = match s.split_first() {
        Some((b'-', rest)) if signed => (true, rest),
        Some((b'+', rest)) => (false, rest),
        _ => (false, s),
    };
    if digits.is_empty() {
        return Err(BadNumber);
    }
    let mut n: u64 = 0;
    for &b in digits {
        n = n
            .checked_mul(10)
            .and_then(|n| n.checked_add(u64::from(decimal_digit(b).ok()?)))
            .ok_or(BadNumber)?;
    }
    Ok((negative, n))
}

/// An integer field in `min..=max`, as `str::parse` of the integer type
/// of that range reads it (a `-` only when `min` is negative);
/// `Ok(None)` when empty or blank. One function for the log's three
/// integer types (`u64`, `i16`, `u32`), not one parser each.
fn integer_field(
    s: &[u8],
    min: i64,
    max: u64,
    line: u32,
    column: &'static str,
) -> Result<Option<u64>, ReplayError> {
    let s = s.trim_ascii();
    if s.is_empty() {
        return Ok(None);
    }
    match integer(s, min < 0) {
        Ok((false, n)) if n <= max => Ok(Some(n)),
        // Negative: returned as its two's complement, which the caller
        // narrows to its type.
        Ok((true, n)) if n <= min.unsigned_abs() => Ok(Some(n.wrapping_neg())),
        _ => Err(ReplayError::Field { line, column }),
    }
}

/// An accelerometer word, as `str::parse::<i16>` reads it; `Ok(None)` when
/// empty or blank.
fn word_field(s: &[u8], line: u32, column: &'static str) -> Result<Option<i16>, ReplayError> {
    let n = integer_field(
        s,
        i16::MIN.into(),
        i16::MAX.unsigned_abs().into(),
        line,
        column,
    )?;
    // In i16's range (checked above): the low 16 bits are the word.
    #[allow(clippy::cast_possible_truncation)]
    Ok(n.map(|n| n as i16))
}

/// A field that [`parse_degrees`] does not accept.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct BadNumber;

/// Most decimal places [`parse_degrees`] accepts (milli-degree resolution).
pub const DEGREE_DECIMALS: u32 = 3;

/// Parses a decimal number of degrees with at most [`DEGREE_DECIMALS`]
/// decimal places and at most six integer digits (`-30`, `247`, `20.125`,
/// `.5`, `+1.0`) by fixed-point arithmetic: the digits are read as an integer
/// count of milli-degrees and divided by 1000 once, in `f32`. No exponent,
/// no `inf`/`nan`. An empty (or all-blank) field is `Ok(None)`.
///
/// This avoids the standard library's correctly-rounded float parser, whose
/// tables take about 15 KiB of flash; a milli-degree count up to 999,999,999
/// is exact in integers, and the one `f32` division is correctly rounded, so
/// the result is the same on every IEEE-754 machine (host and Cortex-M4F).
///
/// # Errors
/// [`BadNumber`] for anything else (a sign alone, two points, a fourth decimal,
/// a seventh integer digit, any other character).
pub fn parse_degrees(s: impl AsRef<[u8]>) -> Result<Option<f32>, BadNumber> {
    degrees_of(s.as_ref())
}

fn degrees_of(s: &[u8]) -> Result<Option<f32>, BadNumber> {
    let s = s.trim_ascii();
    if s.is_empty() {
        return Ok(None);
    }
    let (negative, digits) = match s.split_first() {
        Some((b'-', rest)) => (true, rest),
        Some((b'+', rest)) => (false, rest),
        _ => (false, s),
    };
    let (int_part, frac_part) = match digits.iter().position(|&b| b == b'.') {
        Some(i) => (
            digits.get(..i).ok_or(BadNumber)?,
            digits.get(i + 1..).ok_or(BadNumber)?,
        ),
        None => (digits, &[][..]),
    };
    if (int_part.is_empty() && frac_part.is_empty())
        || int_part.len() > 6
        || frac_part.len() > DEGREE_DECIMALS as usize
    {
        return Err(BadNumber);
    }
    let mut milli: i32 = 0;
    for &b in int_part {
        milli = milli * 10 + i32::from(decimal_digit(b)?);
    }
    let mut places = 0;
    for &b in frac_part {
        milli = milli * 10 + i32::from(decimal_digit(b)?);
        places += 1;
    }
    for _ in places..DEGREE_DECIMALS {
        milli *= 10;
    }
    let milli = if negative { -milli } else { milli };
    // |milli| < 10^9 < 2^30: the conversion to f32 rounds once, the division
    // once more; both are IEEE-754 operations with one defined result.
    #[allow(clippy::cast_precision_loss)]
    Ok(Some(milli as f32 / 1000.0))
}

fn decimal_digit(b: u8) -> Result<u8, BadNumber> {
    if b.is_ascii_digit() {
        Ok(b - b'0')
    } else {
        Err(BadNumber)
    }
}

fn degrees(s: &[u8], line: u32, column: &'static str) -> Result<Option<f32>, ReplayError> {
    degrees_of(s).map_err(|BadNumber| ReplayError::Field { line, column })
}

/// Parses one data line (not the header), given as bytes or text.
///
/// # Errors
/// [`ReplayError::Columns`] or [`ReplayError::Field`].
pub fn parse_row(text: impl AsRef<[u8]>, line: u32) -> Result<Row, ReplayError> {
    row_of(text.as_ref(), line)
}

fn row_of(text: &[u8], line: u32) -> Result<Row, ReplayError> {
    let mut it = text.split(|&b| b == b',');
    let mut next = || it.next().ok_or(ReplayError::Columns { line });
    let t = next()?;
    let (ax, ay, az) = (next()?, next()?, next()?);
    let (p, v, ha, dec) = (next()?, next()?, next()?, next()?);
    if it.next().is_some() {
        return Err(ReplayError::Columns { line });
    }
    let t_ms = integer_field(t, 0, u64::MAX, line, "t_ms")?.ok_or(ReplayError::Field {
        line,
        column: "t_ms",
    })?;
    let accel = match (
        word_field(ax, line, "accel_x")?,
        word_field(ay, line, "accel_y")?,
        word_field(az, line, "accel_z")?,
    ) {
        (Some(x), Some(y), Some(z)) => Some(RawSample { words: [x, y, z] }),
        (None, None, None) => None,
        _ => {
            return Err(ReplayError::Field {
                line,
                column: "accel_x",
            })
        }
    };
    let pulse_total = integer_field(p, 0, u32::MAX.into(), line, "pulse_total")?;
    // At most u32::MAX (checked above).
    #[allow(clippy::cast_possible_truncation)]
    let pulse_total = pulse_total.map(|n| n as u32);
    let vane_from_deg = degrees(v, line, "vane_from_deg")?;
    let pose = match (degrees(ha, line, "ha_deg")?, degrees(dec, line, "dec_deg")?) {
        (Some(h), Some(d)) => Some(
            MountPose::new(math::deg_to_rad(h), math::deg_to_rad(d)).map_err(|_| {
                ReplayError::Field {
                    line,
                    column: "ha_deg",
                }
            })?,
        ),
        (None, None) => None,
        _ => {
            return Err(ReplayError::Field {
                line,
                column: "ha_deg",
            })
        }
    };
    Ok(Row {
        t_ms,
        accel,
        pulse_total,
        vane_from_deg,
        pose,
    })
}

/// The invented example set-up the replay runs with: a 10 Hz loop, an
/// anemometer of 0.75 m/s per Hz plus 0.3 m/s stalling below 0.5 Hz, and
/// limits of 12 m/s (park), 18 m/s (alarm), 2° tilt (alarm) held 5 s. These
/// figures are invented for the demonstration; take real ones from your
/// anemometer's calibration sheet and your rig's assessment.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct ReplaySetup {
    /// Station settings.
    pub station: StationConfig,
    /// Accelerometer settings.
    pub accel: lis3dh::Config,
    /// Anemometer calibration.
    pub anemometer: AnemometerCal,
    /// Anemometer gate, ms.
    pub gate_ms: u32,
    /// Limits of the [`LimitRule`].
    pub limits: Limits,
}

impl ReplaySetup {
    /// The example set-up described on [`ReplaySetup`].
    #[must_use]
    pub const fn example() -> Self {
        ReplaySetup {
            station: StationConfig {
                period_ms: 100,
                accel_stale_ms: 250,
                wind_stale_ms: 3000,
                vane_stale_ms: 3000,
                fault_clear_ms: 2000,
                verify_every_steps: 10,
                mounting: AxisMap::IDENTITY,
            },
            accel: lis3dh::Config {
                rate: lis3dh::DataRate::Hz50,
                range: lis3dh::Range::G2,
            },
            anemometer: AnemometerCal {
                slope_mps_per_hz: 0.75,
                offset_mps: 0.3,
                stall_hz: 0.5,
            },
            gate_ms: 1000,
            limits: Limits {
                park_wind_mps: 12.0,
                alarm_wind_mps: 18.0,
                // 2° = 0.034906585 rad.
                alarm_tilt_rad: 0.034_906_585,
                hold_ms: 5000,
            },
        }
    }

    /// The example set-up at a 100 Hz loop (10 ms period), for the
    /// instruction count of the guard step at that rate (`ci.sh`): as
    /// [`ReplaySetup::example`], with the accelerometer at 200 Hz (at least
    /// twice the loop rate) and its configuration read back every 100 steps
    /// (once a second, as at 10 Hz). Invented for the demonstration.
    #[must_use]
    pub const fn example_100hz() -> Self {
        let mut s = Self::example();
        s.station.period_ms = 10;
        s.station.verify_every_steps = 100;
        s.accel.rate = lis3dh::DataRate::Hz200;
        s
    }
}

/// The station as the replay builds it: the Standfast guard for a borrowed
/// rig (held as `G`, see [`GuardRule`]), with the [`LimitRule`] as backstop.
pub type ReplayStation<'r, G = Guard<'r>> =
    Station<EmulatedLis3dh, ScriptedVane, MemoryPin, MemoryPin, GuardRule<'r, G>>;

/// Feeds log lines to a station over emulated hardware. `G` is how the
/// guard is held: by value ([`Replay::new`]) or borrowed
/// ([`Replay::with_guard`], the bare-metal binary's way: the guard built in
/// place in a `static` of its own).
#[derive(Debug)]
pub struct Replay<'r, G = Guard<'r>> {
    station: ReplayStation<'r, G>,
    line: u32,
    header_seen: bool,
    last_t_ms: Option<u64>,
    rows: u32,
    guard_level: standfast::guard::AlertLevel,
    guard_events: heapless::Vec<Event, GUARD_EVENTS>,
}

/// Most guard-only events one step gives: its raised faults and one level change.
pub const GUARD_EVENTS: usize = standfast::guard::MAX_EVENTS + 1;

impl<'r> Replay<'r> {
    /// A replay with `setup`, decided by the guard for `rig`
    /// ([`example_guard`]: [`example_guard_config`], started at t = 0 ms) with
    /// the [`LimitRule`] of `setup` as backstop; the emulated sensor sits at
    /// address 0x18.
    ///
    /// # Errors
    /// An invalid guard configuration.
    pub fn new(setup: &ReplaySetup, rig: &'r Rig) -> Result<Self, Error> {
        Ok(Replay::with_guard(setup, example_guard(rig, 0)?))
    }
}

impl<'r, G: BorrowMut<Guard<'r>>> Replay<'r, G> {
    /// A replay with `setup`, decided by `guard` (a fresh one, owned or
    /// borrowed; [`example_guard`] makes the replay's) with the [`LimitRule`]
    /// of `setup` as backstop; the emulated sensor sits at address 0x18.
    pub fn with_guard(setup: &ReplaySetup, guard: G) -> Self {
        let bus = EmulatedLis3dh::new(lis3dh::ADDRESS_SA0_LOW);
        let station = Station::new(
            setup.station,
            Lis3dh::new(bus, lis3dh::ADDRESS_SA0_LOW, setup.accel),
            Anemometer::new(setup.anemometer, setup.gate_ms),
            ScriptedVane::default(),
            FailSafeLines::new(MemoryPin::default(), MemoryPin::default()),
            GuardRule::with_guard(guard, Some(LimitRule::new(setup.limits))),
        );
        // The guard's level before the first step: the one it starts in
        // (`sensor_fault`, it cannot judge the rig before its sensors have
        // given readings), so no level event is invented for step one.
        let guard_level = station.rule().guard_level();
        Replay {
            station,
            line: 0,
            header_seen: false,
            last_t_ms: None,
            rows: 0,
            guard_level,
            guard_events: heapless::Vec::new(),
        }
    }

    /// The guard's own events of the last step, without the backstop and
    /// the station: the faults it raised, then its level change (names as
    /// [`standfast::guard::AlertLevel::name`], starting from the level the guard
    /// starts in, `sensor_fault`). The
    /// binaries print them as `guard event ...` lines; host-sim's
    /// `standfast replay --events` writes the same lines for the same rig and
    /// inputs (compared by `ci.sh`).
    #[must_use]
    pub fn guard_events(&self) -> &[Event] {
        &self.guard_events
    }

    /// Data rows stepped so far.
    #[must_use]
    pub const fn rows(&self) -> u32 {
        self.rows
    }

    /// The station.
    #[must_use]
    pub const fn station(&self) -> &ReplayStation<'r, G> {
        &self.station
    }

    /// Feeds the next line of the log (without its line ending), as bytes
    /// or text. Returns the step's report for a data row, `None` for the
    /// header, comments and blank lines.
    ///
    /// # Errors
    /// A [`ReplayError`] naming the line; the station is not stepped. A
    /// line with a byte that is not ASCII is [`ReplayError::NotAscii`],
    /// whatever else it holds.
    pub fn feed_line(&mut self, text: impl AsRef<[u8]>) -> Result<Option<StepReport>, ReplayError> {
        self.feed_bytes(text.as_ref())
    }

    fn feed_bytes(&mut self, text: &[u8]) -> Result<Option<StepReport>, ReplayError> {
        self.line = self.line.saturating_add(1);
        let line = self.line;
        if !text.is_ascii() {
            return Err(ReplayError::NotAscii { line });
        }
        let mut text = text;
        while let Some(rest) = text.strip_suffix(b"\r") {
            text = rest;
        }
        if text.trim_ascii().is_empty() || text.starts_with(b"#") {
            return Ok(None);
        }
        if !self.header_seen {
            if text.trim_ascii() != HEADER.as_bytes() {
                return Err(ReplayError::Header { line });
            }
            self.header_seen = true;
            return Ok(None);
        }
        let row = row_of(text, line)?;
        if self.last_t_ms.is_some_and(|t| row.t_ms < t) {
            return Err(ReplayError::TimeBackwards { line });
        }
        self.last_t_ms = Some(row.t_ms);
        Ok(Some(self.step_row(&row)))
    }

    /// Counts a line the caller could not read (too long for its buffer).
    #[must_use]
    pub fn too_long(&mut self) -> ReplayError {
        self.line = self.line.saturating_add(1);
        ReplayError::TooLong { line: self.line }
    }

    fn step_row(&mut self, row: &Row) -> StepReport {
        self.rows = self.rows.saturating_add(1);
        self.station.hardware().0.set_output(row.accel);
        self.station.hardware().1.from_rad = row.vane_from_deg.map(math::deg_to_rad);
        let inputs = StepInputs {
            pulses: row.pulse_total.map(|total| PulseLatch {
                total,
                at_ms: row.t_ms,
            }),
            pose: row.pose,
        };
        let report = self.station.step(row.t_ms, inputs);
        self.guard_events.clear();
        for e in &report.events {
            if let EventKind::RuleFault(_) = e.kind {
                let _ = self.guard_events.push(*e);
            }
        }
        let level = self.station.rule().guard_level();
        if level != self.guard_level {
            let _ = self.guard_events.push(Event {
                // The log's time never goes back (checked), so it is the station's.
                t_ms: row.t_ms,
                kind: EventKind::AlertLevel {
                    from: self.guard_level.name(),
                    to: level.name(),
                },
            });
            self.guard_level = level;
        }
        report
    }
}

/// Splits a byte stream read in chunks into lines of at most `N` bytes.
#[derive(Debug)]
pub struct LineSplitter<const N: usize> {
    buf: heapless::Vec<u8, N>,
    overflow: bool,
}

/// One line from a [`LineSplitter`].
#[derive(Debug, PartialEq, Eq)]
pub enum SplitLine<'a> {
    /// A complete line, without its `\n`, as read (the splitter does not
    /// look at its encoding; [`Replay::feed_line`] rejects bytes that are
    /// not ASCII).
    Text(&'a [u8]),
    /// A line longer than the buffer: its bytes are lost.
    TooLong,
}

impl<const N: usize> Default for LineSplitter<N> {
    fn default() -> Self {
        Self::new()
    }
}

impl<const N: usize> LineSplitter<N> {
    /// An empty splitter.
    #[must_use]
    pub const fn new() -> Self {
        LineSplitter {
            buf: heapless::Vec::new(),
            overflow: false,
        }
    }

    /// Feeds a chunk; calls `each` for every line it completes, in order.
    /// Stops early and returns `Err` with `each`'s error.
    ///
    /// # Errors
    /// Whatever `each` returns.
    pub fn feed<E>(
        &mut self,
        chunk: &[u8],
        mut each: impl FnMut(SplitLine<'_>) -> Result<(), E>,
    ) -> Result<(), E> {
        for &b in chunk {
            if b == b'\n' {
                self.emit(&mut each)?;
            } else if self.buf.push(b).is_err() {
                self.overflow = true;
            }
        }
        Ok(())
    }

    /// Emits the last line when the stream did not end with `\n`.
    ///
    /// # Errors
    /// Whatever `each` returns.
    pub fn finish<E>(
        &mut self,
        mut each: impl FnMut(SplitLine<'_>) -> Result<(), E>,
    ) -> Result<(), E> {
        if self.buf.is_empty() && !self.overflow {
            return Ok(());
        }
        self.emit(&mut each)
    }

    fn emit<E>(&mut self, each: &mut impl FnMut(SplitLine<'_>) -> Result<(), E>) -> Result<(), E> {
        let r = if self.overflow {
            each(SplitLine::TooLong)
        } else {
            each(SplitLine::Text(&self.buf))
        };
        self.buf.clear();
        self.overflow = false;
        r
    }
}
