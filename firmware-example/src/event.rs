//! Events and their one-line text format.
//!
//! Every event prints as one line:
//!
//! ```text
//! event t_ms=<u64> kind=<name>[ <key>=<value>]...
//! ```
//!
//! Kinds and keys:
//!
//! | kind | keys | meaning |
//! |---|---|---|
//! | `started` | | the station took its first step; both lines are de-energised |
//! | `park_on` / `park_off` | | the park line was de-energised / energised |
//! | `alarm_on` / `alarm_off` | | the alarm line was de-energised / energised |
//! | `fault` | `source=accel\|wind\|vane cause=bus\|device\|config_lost\|stale` | a sensor became unusable |
//! | `fault_cleared` | `source=...` | the sensor has been healthy for the clearing time |
//! | `level` | `from=<level> to=<level>` | the rule's level changed (before the first step it counts as `clear`) |
//! | `fault` | `sensor=<name> class=<name>` | the rule (the guard) raised a sensor fault of its own |
//! | `late` | `gap_ms=<u32>` | more than two periods passed since the previous step |
//! | `line_error` | `line=park\|alarm` | an output pin reported an error; the step is not complete |
//!
//! The same lines come from the emulated board and from a host replay, so
//! the two can be compared with `diff`.
//!
//! **One writer for both.** [`Event::write_text`] writes a line piece by
//! piece into any [`TextSink`], with its own decimal conversion
//! ([`decimal`]), so a board can print events without `core::fmt` (about
//! 3 KiB of flash with its integer formatting and 64-bit division); the
//! `Display` impl, which the host replay prints with, goes through the same
//! function, so the two texts are the same by construction.

use core::fmt;

/// Where a line of text goes, piece by piece (a serial port, a semihosting
/// stream, a buffer, or a `core::fmt::Formatter` through `Display`).
pub trait TextSink {
    /// Appends `b`, UTF-8 text (the writers of this crate give ASCII only).
    /// Bytes, not `&str`, so that a board can write digits and the bytes of
    /// its log without `core::str::from_utf8` (its checker and 256-byte
    /// table would take about 0.6 KiB of flash).
    fn bytes(&mut self, b: &[u8]);

    /// Appends `s`.
    fn text(&mut self, s: &str) {
        self.bytes(s.as_bytes());
    }

    /// Appends `n` in decimal, as `{}` formats an unsigned integer (no sign,
    /// no leading zeros, `0` for zero), by [`decimal`].
    fn decimal(&mut self, n: u64) {
        let digits = decimal(n);
        self.bytes(digits.as_bytes());
    }
}

/// Powers of ten from 10^19 (the largest below `u64::MAX`) down to 1.
const POWERS_OF_TEN: [u64; 20] = [
    10_000_000_000_000_000_000,
    1_000_000_000_000_000_000,
    100_000_000_000_000_000,
    10_000_000_000_000_000,
    1_000_000_000_000_000,
    100_000_000_000_000,
    10_000_000_000_000,
    1_000_000_000_000,
    100_000_000_000,
    10_000_000_000,
    1_000_000_000,
    100_000_000,
    10_000_000,
    1_000_000,
    100_000,
    10_000,
    1_000,
    100,
    10,
    1,
];

/// The decimal digits of a `u64` (at most 20), as [`decimal`] makes them.
#[derive(Clone, Copy, Debug)]
pub struct Decimal {
    digits: [u8; 20],
    len: usize,
}

impl Decimal {
    /// The digits as ASCII bytes.
    #[must_use]
    pub fn as_bytes(&self) -> &[u8] {
        self.digits.get(..self.len).unwrap_or(&[])
    }

    /// The digits as text.
    #[must_use]
    pub fn as_str(&self) -> &str {
        core::str::from_utf8(self.as_bytes()).unwrap_or("")
    }
}

/// `n` in decimal, the same text as `format!("{n}")`, computed by repeated
/// subtraction of powers of ten: no division, so a 32-bit target links no
/// 64-bit division routine for it (at most 9 subtractions per digit).
#[must_use]
pub fn decimal(mut n: u64) -> Decimal {
    // Zeros, not '0's: every digit below `len` is written; a fill with a
    // byte other than zero would link the board's `memset` (184 B) for it.
    let mut out = Decimal {
        digits: [0; 20],
        len: 0,
    };
    for (i, p) in POWERS_OF_TEN.iter().enumerate() {
        let mut digit = b'0';
        while n >= *p {
            n -= *p;
            digit += 1;
        }
        // Leading zeros are skipped; the units digit always counts.
        if digit != b'0' || out.len > 0 || i == POWERS_OF_TEN.len() - 1 {
            if let Some(d) = out.digits.get_mut(out.len) {
                *d = digit;
            }
            out.len += 1;
        }
    }
    out
}

/// A [`TextSink`] over a `Formatter`, keeping its first error.
struct FmtSink<'a, 'b> {
    f: &'a mut fmt::Formatter<'b>,
    result: fmt::Result,
}

impl TextSink for FmtSink<'_, '_> {
    fn bytes(&mut self, b: &[u8]) {
        // Not UTF-8 (no writer of this crate gives that) is a formatting
        // error, never text passed on unchecked.
        match core::str::from_utf8(b) {
            Ok(s) => self.text(s),
            Err(_) => self.result = Err(fmt::Error),
        }
    }

    fn text(&mut self, s: &str) {
        if self.result.is_ok() {
            self.result = self.f.write_str(s);
        }
    }
}

/// Formats through [`TextSink`]: `write` gets the sink and writes the text.
pub(crate) fn fmt_via_sink(
    f: &mut fmt::Formatter<'_>,
    write: impl FnOnce(&mut dyn TextSink),
) -> fmt::Result {
    let mut sink = FmtSink { f, result: Ok(()) };
    write(&mut sink);
    sink.result
}

/// A sensor the station watches.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Source {
    /// The accelerometer.
    Accel,
    /// The anemometer's pulse latches (wind speed).
    Wind,
    /// The wind-direction vane.
    Vane,
}

impl Source {
    /// Name in event lines.
    #[must_use]
    pub const fn name(self) -> &'static str {
        match self {
            Source::Accel => "accel",
            Source::Wind => "wind",
            Source::Vane => "vane",
        }
    }
}

/// Why a sensor became unusable.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum SensorLoss {
    /// Bus errors for longer than the sensor's stale limit.
    Bus,
    /// The device is not the expected one.
    Device,
    /// The device lost its configuration.
    ConfigLost,
    /// No fresh reading for longer than the sensor's stale limit.
    Stale,
}

impl SensorLoss {
    /// Name in event lines.
    #[must_use]
    pub const fn name(self) -> &'static str {
        match self {
            SensorLoss::Bus => "bus",
            SensorLoss::Device => "device",
            SensorLoss::ConfigLost => "config_lost",
            SensorLoss::Stale => "stale",
        }
    }
}

/// Which output line.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Line {
    /// The park-request line.
    Park,
    /// The alarm line.
    Alarm,
}

/// What happened.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum EventKind {
    /// First step.
    Started,
    /// Park line de-energised (`true`) or energised (`false`).
    Park(bool),
    /// Alarm line de-energised (`true`) or energised (`false`).
    Alarm(bool),
    /// A sensor became unusable.
    Fault(Source, SensorLoss),
    /// A sensor is usable again.
    FaultCleared(Source),
    /// The rule's level changed (names as [`crate::Decision::level`];
    /// the guard's are [`standfast::guard::AlertLevel::name`]).
    AlertLevel {
        /// The level before.
        from: &'static str,
        /// The level now.
        to: &'static str,
    },
    /// The rule raised a sensor fault of its own (the guard's
    /// [`standfast::guard::Event::FaultRaised`]), named by
    /// [`crate::rule::RaisedFault`].
    RuleFault(crate::rule::RaisedFault),
    /// The rule lost this many events of one step for lack of room
    /// ([`crate::rule::Rule::events_lost`]).
    EventsLost(u16),
    /// Milliseconds since the previous step, when over two periods.
    Late(u32),
    /// An output pin reported an error.
    LineError(Line),
}

/// An event at a time on the station's clock.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Event {
    /// Milliseconds on the station's clock (the log's clock in a replay).
    pub t_ms: u64,
    /// What happened.
    pub kind: EventKind,
}

impl Event {
    /// Writes the event's line (without a line ending) into `out`: the text
    /// of the module docs' format, the same as `Display` gives.
    pub fn write_text(&self, out: &mut (impl TextSink + ?Sized)) {
        out.text("event t_ms=");
        out.decimal(self.t_ms);
        out.text(" kind=");
        match self.kind {
            EventKind::Started => out.text("started"),
            EventKind::Park(true) => out.text("park_on"),
            EventKind::Park(false) => out.text("park_off"),
            EventKind::Alarm(true) => out.text("alarm_on"),
            EventKind::Alarm(false) => out.text("alarm_off"),
            EventKind::Fault(s, c) => {
                out.text("fault source=");
                out.text(s.name());
                out.text(" cause=");
                out.text(c.name());
            }
            EventKind::FaultCleared(s) => {
                out.text("fault_cleared source=");
                out.text(s.name());
            }
            EventKind::AlertLevel { from, to } => {
                out.text("level from=");
                out.text(from);
                out.text(" to=");
                out.text(to);
            }
            EventKind::RuleFault(r) => {
                out.text("fault sensor=");
                out.text(r.sensor);
                out.text(" class=");
                out.text(r.class);
            }
            EventKind::EventsLost(n) => {
                out.text("events_lost count=");
                out.decimal(u64::from(n));
            }
            EventKind::Late(gap_ms) => {
                out.text("late gap_ms=");
                out.decimal(u64::from(gap_ms));
            }
            EventKind::LineError(Line::Park) => out.text("line_error line=park"),
            EventKind::LineError(Line::Alarm) => out.text("line_error line=alarm"),
        }
    }
}

impl fmt::Display for Event {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        fmt_via_sink(f, |out| self.write_text(out))
    }
}

#[cfg(test)]
mod tests {
    use super::decimal;

    /// Against the standard library's integer formatting (`format!`).
    #[test]
    fn decimal_is_the_standard_formatting() {
        let mut probes = vec![0, 1, 9, 10, 11, 99, 100, 101, 120_000, u64::from(u32::MAX)];
        probes.extend([
            u64::MAX,
            u64::MAX - 1,
            10_000_000_000_000_000_000,
            9_999_999_999_999_999_999,
        ]);
        for k in 0..20 {
            let p = 10u64.pow(k);
            probes.extend([p - 1, p, p + 1]);
        }
        let mut x: u64 = 0x9e37_79b9_7f4a_7c15;
        for _ in 0..10_000 {
            // xorshift64: spread over every digit count.
            x ^= x << 13;
            x ^= x >> 7;
            x ^= x << 17;
            probes.push(x >> (x % 64));
        }
        for n in probes {
            assert_eq!(decimal(n).as_str(), n.to_string(), "{n}");
        }
    }
}
