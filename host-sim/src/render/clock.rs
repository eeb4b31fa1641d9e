//! Wall-clock time on the report's time axes: local time at the offset the
//! logs carry (UTC when they carry none), with UTC kept for tooltips and
//! tables.
//!
//! The replay measures time in seconds since its first record; a [`Clock`]
//! turns such a time into local wall time (`hh:mm`) and into ISO 8601 UTC.
//! The offset comes from the logs
//! ([`crate::input::log::zone::written_offset_s`]): the first
//! ISO 8601 time column whose first row writes a zone offset other than
//! UTC, or whose profile sets a zone other than UTC. This is for display
//! only: the replay itself works in UTC throughout.

use crate::input::log::Timestamp;

/// Local wall time for the report's axes.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Clock {
    /// The first record, seconds since 1970-01-01T00:00:00Z.
    pub start_unix_s: f64,
    /// Local offset east of UTC, seconds (0: the axes show UTC).
    pub offset_s: i32,
}

impl Clock {
    /// A clock from the report's first record (ISO 8601, as the replay
    /// writes it) and the local offset; `None` when the first record's time
    /// is missing or unreadable (the axes then show time since the first
    /// record).
    #[must_use]
    pub fn from_start(start: Option<&str>, offset_s: Option<i32>) -> Option<Clock> {
        let t = crate::input::log::time::parse_iso8601(start?, 0).ok()?;
        Some(Clock {
            start_unix_s: t.unix_s(),
            offset_s: offset_s.unwrap_or(0),
        })
    }

    /// Local seconds since local midnight of 1970-01-01 at time `t_s`
    /// (seconds since the first record).
    #[must_use]
    pub fn local_s(&self, t_s: f64) -> f64 {
        self.start_unix_s + f64::from(self.offset_s) + t_s
    }

    /// Ticks at whole multiples of `step_s` in local time between `x0_s`
    /// and `x1_s` (seconds since the first record), returned as seconds
    /// since the first record.
    #[must_use]
    pub fn ticks(&self, x0_s: f64, x1_s: f64, step_s: f64) -> Vec<f64> {
        let base = self.local_s(0.0);
        super::ticks::ticks_with_step(base + x0_s, base + x1_s, step_s)
            .into_iter()
            .map(|t| t - base)
            .collect()
    }

    /// Local wall time at `t_s` as `hh:mm` (`hh:mm:ss` when `step_s` is
    /// under a minute).
    #[must_use]
    pub fn label(&self, t_s: f64, step_s: f64) -> String {
        #[allow(clippy::cast_possible_truncation)] // within ±2^53 s
        let s = self.local_s(t_s).round() as i64;
        let d = s.rem_euclid(86_400);
        if step_s < 60.0 {
            format!("{:02}:{:02}:{:02}", d / 3600, (d / 60) % 60, d % 60)
        } else {
            format!("{:02}:{:02}", d / 3600, (d / 60) % 60)
        }
    }

    /// The offset as `UTC+hh:mm` (`UTC` for 0).
    #[must_use]
    pub fn zone_text(&self) -> String {
        if self.offset_s == 0 {
            return "UTC".to_owned();
        }
        let sign = if self.offset_s < 0 { '-' } else { '+' };
        let a = self.offset_s.unsigned_abs();
        format!("UTC{sign}{:02}:{:02}", a / 3600, (a / 60) % 60)
    }

    /// `t_s` as ISO 8601 UTC to the second.
    #[must_use]
    pub fn utc_text(&self, t_s: f64) -> String {
        Timestamp::from_unix_s(self.start_unix_s + t_s).to_iso8601(0)
    }

    /// `t_s` as local date and time to the second followed by the zone
    /// (`2025-11-15 05:21:00 UTC+01:00`): the tables' and the text
    /// summary's notation.
    #[must_use]
    pub fn local_datetime_text(&self, t_s: f64) -> String {
        let t = Timestamp::from_unix_s((self.start_unix_s + t_s).round());
        let iso = t.to_iso8601_offset(0, self.offset_s);
        let (date, rest) = iso.split_once('T').unwrap_or((iso.as_str(), ""));
        let time: String = rest.chars().take(8).collect();
        format!("{date} {time} {}", self.zone_text())
    }

    /// `t_s` as local `hh:mm:ss` followed by the zone (`05:21:00 UTC+01:00`).
    #[must_use]
    pub fn local_text(&self, t_s: f64) -> String {
        format!("{} {}", self.label(t_s, 1.0), self.zone_text())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn local_labels_and_ticks_follow_the_offset() {
        let c = Clock::from_start(Some("2025-11-14T21:00:00.000Z"), Some(3600)).unwrap();
        assert_eq!(c.label(0.0, 3600.0), "22:00");
        // 05:21 local is 04:21 UTC, 7 h 21 min after the start.
        assert_eq!(c.label(7.0 * 3600.0 + 21.0 * 60.0, 60.0), "05:21");
        assert_eq!(c.local_text(30.0), "22:00:30 UTC+01:00");
        assert_eq!(c.utc_text(30.0), "2025-11-14T21:00:30Z");
        // Ticks fall on whole local hours even when the start does not.
        let c = Clock::from_start(Some("2025-11-14T21:10:00Z"), Some(-19_800)).unwrap();
        let t = c.ticks(0.0, 7200.0, 3600.0);
        let labels: Vec<String> = t.iter().map(|x| c.label(*x, 3600.0)).collect();
        assert_eq!(labels, ["16:00", "17:00"]);
        assert_eq!(c.zone_text(), "UTC-05:30");
    }

    #[test]
    fn local_date_and_time_cross_midnight() {
        // 23:30 UTC on 14 November is 00:30 on the 15th at UTC+01:00 and
        // 18:00 on the 14th at UTC-05:30 (an offset is local time minus
        // UTC, as ISO 8601 writes it; common practice, no source).
        let c = Clock::from_start(Some("2025-11-14T23:00:00Z"), Some(3600)).unwrap();
        assert_eq!(
            c.local_datetime_text(1800.0),
            "2025-11-15 00:30:00 UTC+01:00"
        );
        let c = Clock::from_start(Some("2025-11-14T23:00:00Z"), Some(-19_800)).unwrap();
        assert_eq!(
            c.local_datetime_text(1800.0),
            "2025-11-14 18:00:00 UTC-05:30"
        );
        let c = Clock::from_start(Some("2025-11-14T23:00:00Z"), None).unwrap();
        assert_eq!(c.local_datetime_text(0.4), "2025-11-14 23:00:00 UTC");
    }
}
