//! The two output lines, park request and alarm, with the fail-safe convention.
//!
//! **Fail-safe convention.** Each line is *energised* (driven high, relay
//! pulled in, opto-coupler LED lit) while all is well, and *de-energised*
//! (low) to request a park or raise the alarm. A microcontroller held in
//! reset, a hung loop stopped by the watchdog, a cut wire or lost power all
//! leave the lines de-energised, which the receiving side reads as "park" and
//! "alarm". Nothing has to work for the safe request to be made; something has
//! to keep working for it to be withheld.
//!
//! Consequences the integrator must accept: the alarm sounds at every
//! power-up until the station has seen healthy sensors (a few seconds), and a
//! broken wire raises the alarm rather than hiding.

use embedded_hal::digital::OutputPin;

/// What the two lines say.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct LineState {
    /// Park requested: the park line is de-energised (low).
    pub park_requested: bool,
    /// Alarm raised: the alarm line is de-energised (low).
    pub alarm_raised: bool,
}

impl LineState {
    /// Both requests made: what the lines show with no power, in reset or
    /// after a fault.
    pub const SAFE: LineState = LineState {
        park_requested: true,
        alarm_raised: true,
    };
    /// No request: both lines energised.
    pub const ALL_WELL: LineState = LineState {
        park_requested: false,
        alarm_raised: false,
    };
}

/// A line that could not be driven.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum LineError<PE, AE> {
    /// The park line's pin reported an error.
    Park(PE),
    /// The alarm line's pin reported an error.
    Alarm(AE),
}

/// The park and alarm lines on two [`OutputPin`]s, high = energised = all well.
///
/// Configure the pins push-pull, low at reset, with a pull-down on the board
/// (or on the receiving side) so an unpowered or floating output reads low.
#[derive(Debug)]
pub struct FailSafeLines<P, A> {
    park: P,
    alarm: A,
    state: LineState,
}

impl<P: OutputPin, A: OutputPin> FailSafeLines<P, A> {
    /// Takes the two pins. Does not drive them: they are assumed to be low
    /// (de-energised) from reset, so the state starts at [`LineState::SAFE`].
    pub const fn new(park: P, alarm: A) -> Self {
        FailSafeLines {
            park,
            alarm,
            state: LineState::SAFE,
        }
    }

    /// The state last driven successfully ([`LineState::SAFE`] after an error).
    pub const fn state(&self) -> LineState {
        self.state
    }

    /// Drives both lines to `want`: the park line first, then the alarm line.
    /// Every call writes both pins, so a pin disturbed between steps is set
    /// right at the next one.
    ///
    /// # Errors
    /// The first pin error. On any error both lines are then driven low
    /// (best effort, errors ignored) and the state becomes [`LineState::SAFE`].
    pub fn drive(&mut self, want: LineState) -> Result<(), LineError<P::Error, A::Error>> {
        let park = if want.park_requested {
            self.park.set_low()
        } else {
            self.park.set_high()
        };
        if let Err(e) = park {
            self.fall_back();
            return Err(LineError::Park(e));
        }
        let alarm = if want.alarm_raised {
            self.alarm.set_low()
        } else {
            self.alarm.set_high()
        };
        if let Err(e) = alarm {
            self.fall_back();
            return Err(LineError::Alarm(e));
        }
        self.state = want;
        Ok(())
    }

    fn fall_back(&mut self) {
        // Best effort: the pin that failed may fail again; the watchdog (not
        // fed after a failed step) resets the chip, which lowers both anyway.
        let _ = self.park.set_low();
        let _ = self.alarm.set_low();
        self.state = LineState::SAFE;
    }

    /// Gives the pins back.
    pub fn release(self) -> (P, A) {
        (self.park, self.alarm)
    }
}
