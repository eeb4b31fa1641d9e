//! The replay's progress on the terminal: a spinner on standard error
//! counting records, drawn only when standard error is a terminal. The
//! model reports progress through [`crate::model::replay::ReplayObserver`];
//! this module draws it.

/// A spinner on standard error counting records, drawn only when standard
/// error is a terminal.
pub struct Spinner {
    bar: indicatif::ProgressBar,
}

impl Spinner {
    /// A new spinner (hidden when standard error is not a terminal).
    #[must_use]
    pub fn new() -> Spinner {
        Spinner {
            bar: progress_bar(),
        }
    }

    /// Shows `records` read so far.
    pub fn set(&self, records: u64) {
        self.bar.set_position(records);
    }

    /// Clears the spinner from the terminal.
    pub fn finish(&self) {
        self.bar.finish_and_clear();
    }
}

impl Default for Spinner {
    fn default() -> Self {
        Spinner::new()
    }
}

/// The indicatif bar behind a [`Spinner`].
fn progress_bar() -> indicatif::ProgressBar {
    use std::io::IsTerminal;
    let target = if std::io::stderr().is_terminal() {
        indicatif::ProgressDrawTarget::stderr()
    } else {
        indicatif::ProgressDrawTarget::hidden()
    };
    let pb = indicatif::ProgressBar::with_draw_target(None, target);
    pb.set_style(
        indicatif::ProgressStyle::with_template(
            "{spinner} replaying: {human_pos} records, {per_sec}, {elapsed}",
        )
        .unwrap_or_else(|_| indicatif::ProgressStyle::default_spinner()),
    );
    pb
}
