//! Drive ratings of the mount's two axes, in the strain-wave and worm-gear
//! trade's terms.

use crate::error::{Error, Field};

/// Torque ratings of one axis drive at its output, N·m.
///
/// - *rated torque*: the continuous output torque the drive holds over its
///   rated life (tracking, holding against steady wind and unbalance);
/// - *repeated peak torque*: the limit for the torque peaks of normal starts
///   and stops (slews);
/// - *momentary peak torque*: emergencies only (gust impacts, collisions); it
///   must not occur in normal running and the number of events is limited.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct DriveRating {
    /// Rated (continuous) torque, N·m.
    pub rated_nm: f32,
    /// Repeated peak torque, N·m (≥ rated).
    pub repeated_peak_nm: f32,
    /// Momentary peak torque, N·m (≥ repeated peak).
    pub momentary_peak_nm: f32,
}

impl DriveRating {
    /// Checks the ratings are positive and ordered.
    ///
    /// # Errors
    /// A non-finite or non-positive rating, or peaks below the rated torque.
    pub fn validate(&self, field: Field) -> Result<(), Error> {
        Error::check(field, self.rated_nm, 1e-3, 1e5)?;
        Error::check(field, self.repeated_peak_nm, self.rated_nm, 1e5)?;
        Error::check(field, self.momentary_peak_nm, self.repeated_peak_nm, 1e5)?;
        Ok(())
    }
}

/// The drives of both axes and the slew acceleration they must give.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct Drives {
    /// Primary axis (right ascension, or azimuth).
    pub primary: DriveRating,
    /// Secondary axis (declination, or altitude).
    pub secondary: DriveRating,
    /// Angular acceleration of a slew start or stop on either axis, rad/s².
    #[cfg_attr(feature = "serde", serde(default))]
    pub slew_acceleration_rad_per_s2: f32,
}

impl Drives {
    /// Checks both ratings and the slew acceleration (0 to 10 rad/s²).
    ///
    /// # Errors
    /// The first invalid field.
    pub fn validate(&self) -> Result<(), Error> {
        self.primary.validate(Field::DrivesPrimary)?;
        self.secondary.validate(Field::DrivesSecondary)?;
        Error::check(
            Field::DrivesSlewAccelerationRadPerS2,
            self.slew_acceleration_rad_per_s2,
            0.0,
            10.0,
        )?;
        Ok(())
    }
}
