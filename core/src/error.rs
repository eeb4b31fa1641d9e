//! Typed errors. Every error names the offending field, the value and the
//! accepted range, so a host can turn it into a message a person can act on.

use core::fmt;

/// What is wrong with a value.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum ErrorKind {
    /// The value is NaN or infinite.
    NotFinite,
    /// The value lies outside `[min, max]` (see [`Error::min`], [`Error::max`]).
    OutOfRange,
    /// Two feet are closer than 1 mm.
    DuplicateFoot,
    /// All feet lie on (or within 1 mm of) one line: no support area.
    CollinearFeet,
    /// More items than the fixed capacity allows (see [`Error::max`]).
    TooMany,
    /// Fewer items than needed (see [`Error::min`]).
    TooFew,
    /// A direction vector has zero length.
    ZeroDirection,
    /// A requested quantity cannot be reached (for example ballast placed
    /// outside the support polygon can never stabilise the rig).
    Unreachable,
    /// Measurements disagree with each other or with the geometry beyond
    /// their uncertainty (for example scale readings after a lift that do not
    /// fit the feet lifted).
    Inconsistent,
}

/// The error type of the crate: a field name, its index where the field is a
/// list, the offending value and the accepted range.
///
/// `field` is a dotted path such as `"support.feet"` or `"bodies.mass_kg"`;
/// `index` says which element of a list (0-based) when it matters.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Error {
    /// What is wrong.
    pub kind: ErrorKind,
    /// Dotted path of the field, in the names of the configuration types.
    pub field: &'static str,
    /// Index within a list field, if any.
    pub index: Option<u8>,
    /// The offending value (NaN when there is no single value).
    pub value: f32,
    /// Smallest accepted value (or count), NaN when not applicable.
    pub min: f32,
    /// Largest accepted value (or count), NaN when not applicable.
    pub max: f32,
}

impl Error {
    /// An error of `kind` on `field` without a value or range.
    #[must_use]
    pub const fn new(kind: ErrorKind, field: &'static str) -> Self {
        Error {
            kind,
            field,
            index: None,
            value: f32::NAN,
            min: f32::NAN,
            max: f32::NAN,
        }
    }

    /// The same error about element `i` of a list field.
    #[must_use]
    pub const fn at(mut self, i: usize) -> Self {
        self.index = Some(if i > 255 { 255 } else { i as u8 });
        self
    }

    /// Checks that `value` is finite and within `[min, max]`.
    ///
    /// # Errors
    /// [`ErrorKind::NotFinite`] or [`ErrorKind::OutOfRange`] naming `field`.
    pub fn check(field: &'static str, value: f32, min: f32, max: f32) -> Result<f32, Error> {
        let base = Error {
            kind: ErrorKind::NotFinite,
            field,
            index: None,
            value,
            min,
            max,
        };
        if !value.is_finite() {
            Err(base)
        } else if value < min || value > max {
            Err(Error {
                kind: ErrorKind::OutOfRange,
                ..base
            })
        } else {
            Ok(value)
        }
    }

    /// Checks every component of a vector against `[min, max]`.
    ///
    /// # Errors
    /// As [`Error::check`], for the first bad component.
    pub fn check_vec(
        field: &'static str,
        v: crate::math::Vec3,
        min: f32,
        max: f32,
    ) -> Result<crate::math::Vec3, Error> {
        Error::check(field, v.x, min, max)?;
        Error::check(field, v.y, min, max)?;
        Error::check(field, v.z, min, max)?;
        Ok(v)
    }
}

impl fmt::Display for Error {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.field)?;
        if let Some(i) = self.index {
            write!(f, "[{i}]")?;
        }
        match self.kind {
            ErrorKind::NotFinite => write!(f, ": value {} is not a finite number", self.value),
            ErrorKind::OutOfRange => write!(
                f,
                ": value {} is outside the accepted range {} to {}",
                self.value, self.min, self.max
            ),
            ErrorKind::DuplicateFoot => f.write_str(": two feet are less than 1 mm apart"),
            ErrorKind::CollinearFeet => {
                f.write_str(": the feet lie on one line and enclose no area")
            }
            ErrorKind::TooMany => write!(f, ": more than {} items", self.max),
            ErrorKind::TooFew => write!(f, ": fewer than {} items", self.min),
            ErrorKind::ZeroDirection => f.write_str(": direction vector has zero length"),
            ErrorKind::Unreachable => f.write_str(": the requested result cannot be reached"),
            ErrorKind::Inconsistent => {
                f.write_str(": the measurements disagree with each other or with the geometry")
            }
        }
    }
}

impl core::error::Error for Error {}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn check_reports_value_and_range() {
        let e = Error::check("rig.mass_kg", -1.0, 0.0, 10.0).unwrap_err();
        assert_eq!(e.kind, ErrorKind::OutOfRange);
        assert_eq!(e.value, -1.0);
        assert_eq!(e.max, 10.0);
        let e = Error::check("rig.mass_kg", f32::NAN, 0.0, 10.0).unwrap_err();
        assert_eq!(e.kind, ErrorKind::NotFinite);
    }
}
