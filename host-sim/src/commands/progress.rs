//! The replay's progress on the terminal, drawn on standard error only when
//! it is a terminal: a bar with the percentage, the records read and the
//! time left (ETA) when the logs' size is known, else a spinner counting
//! records. The model reports progress through
//! [`crate::model::replay::ReplayObserver`] as a
//! [`crate::model::replay::Progress`]; this module draws it. The line's text
//! comes from [`progress_line`], a pure function.

use crate::model::replay::Progress;
use crate::render::headline::{hms, thousands};

/// Width of the bar, characters.
const BAR_CHARS: usize = 24;

/// Least share read before an ETA is given: before it the rate says too
/// little (common practice, no source).
const ETA_FROM_FRACTION: f64 = 0.01;

/// Seconds left when `fraction` of the work took `elapsed_s`, at the same
/// rate: `elapsed × (1 − f) / f`; `None` before 1 % of the work is done or
/// for values that are not finite.
#[must_use]
pub fn eta_s(elapsed_s: f64, fraction: f64) -> Option<f64> {
    (fraction.is_finite()
        && elapsed_s.is_finite()
        && elapsed_s >= 0.0
        && fraction >= ETA_FROM_FRACTION)
        .then(|| elapsed_s * (1.0 - fraction.min(1.0)) / fraction)
}

/// The progress line: `[#####·······] 42 % 1,234,567 records, ETA 0:01:23`
/// when the share read is known, else `replaying: 1,234,567 records,
/// 0:00:12 so far`.
#[must_use]
pub fn progress_line(p: Progress, elapsed_s: f64) -> String {
    let records = thousands(p.records);
    match p.fraction.filter(|f| f.is_finite()) {
        Some(f) => {
            let f = f.clamp(0.0, 1.0);
            #[allow(clippy::cast_possible_truncation, clippy::cast_sign_loss)]
            let full = ((f * BAR_CHARS as f64).floor() as usize).min(BAR_CHARS);
            #[allow(clippy::cast_possible_truncation, clippy::cast_sign_loss)]
            let pct = (f * 100.0).floor() as u32;
            format!(
                "[{}{}] {pct:>3} % {records} records, ETA {}",
                "#".repeat(full),
                "·".repeat(BAR_CHARS - full),
                eta_s(elapsed_s, f).map_or_else(|| "-:--:--".to_owned(), hms)
            )
        }
        None => format!("replaying: {records} records, {} so far", hms(elapsed_s)),
    }
}

/// The replay's progress on standard error, drawn only when standard error
/// is a terminal.
pub struct Spinner {
    bar: indicatif::ProgressBar,
    started: std::time::Instant,
}

impl Spinner {
    /// A new progress line (hidden when standard error is not a terminal).
    #[must_use]
    pub fn new() -> Spinner {
        Spinner {
            bar: progress_bar(),
            started: std::time::Instant::now(),
        }
    }

    /// Shows the progress `p`.
    pub fn set(&self, p: Progress) {
        let elapsed_s = self.started.elapsed().as_secs_f64();
        self.bar.set_message(progress_line(p, elapsed_s));
        self.bar.tick();
    }

    /// Clears the line from the terminal.
    pub fn finish(&self) {
        self.bar.finish_and_clear();
    }
}

impl Default for Spinner {
    fn default() -> Self {
        Spinner::new()
    }
}

/// The indicatif line behind a [`Spinner`]: it only draws the message
/// [`progress_line`] writes.
fn progress_bar() -> indicatif::ProgressBar {
    use std::io::IsTerminal;
    let target = if std::io::stderr().is_terminal() {
        indicatif::ProgressDrawTarget::stderr()
    } else {
        indicatif::ProgressDrawTarget::hidden()
    };
    let pb = indicatif::ProgressBar::with_draw_target(None, target);
    pb.set_style(
        indicatif::ProgressStyle::with_template("{msg}")
            .unwrap_or_else(|_| indicatif::ProgressStyle::default_spinner()),
    );
    pb
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_known_span_gives_a_bar_a_percentage_and_an_eta() {
        // 25 % read in 30 s: 90 s left at the same rate (30 × 0.75 / 0.25).
        let line = progress_line(
            Progress {
                records: 1_234_567,
                fraction: Some(0.25),
            },
            30.0,
        );
        assert_eq!(
            line,
            "[######··················]  25 % 1,234,567 records, ETA 0:01:30"
        );
        assert_eq!(eta_s(30.0, 0.25), Some(90.0));
        assert_eq!(eta_s(30.0, 1.0), Some(0.0));
        // Too early to say, or nonsense in: no ETA rather than a wrong one.
        assert_eq!(eta_s(1.0, 0.001), None);
        assert_eq!(eta_s(f64::NAN, 0.5), None);
        assert_eq!(eta_s(1.0, f64::NAN), None);
        let early = progress_line(
            Progress {
                records: 0,
                fraction: Some(0.0),
            },
            0.2,
        );
        assert_eq!(
            early,
            "[························]   0 % 0 records, ETA -:--:--"
        );
        let done = progress_line(
            Progress {
                records: 10,
                fraction: Some(1.5),
            },
            5.0,
        );
        assert!(
            done.starts_with("[########################] 100 %"),
            "{done}"
        );
    }

    #[test]
    fn an_unknown_span_counts_records_without_a_rate() {
        let line = progress_line(
            Progress {
                records: 65_536,
                fraction: None,
            },
            75.0,
        );
        assert_eq!(line, "replaying: 65,536 records, 0:01:15 so far");
    }
}
