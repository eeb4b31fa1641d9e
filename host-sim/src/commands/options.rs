//! Numeric command-line options that may carry a unit (`"45 mph"`,
//! `"270 deg"`, `"90 min"`), checked against their accepted range. Every
//! command with such an option reads it through [`quantity_option`].

use crate::error::Error;

/// The accepted range of an option, for messages: `0 to 360 deg`, or
/// `more than 0 h, up to 9 h` when the lower bound is excluded.
fn range_text(lo: f64, hi: f64, lo_open: bool, unit: &str) -> String {
    use crate::input::located::fmt_g;
    if lo_open {
        format!("more than {} {unit}, up to {} {unit}", fmt_g(lo), fmt_g(hi))
    } else {
        format!("{} to {} {unit}", fmt_g(lo), fmt_g(hi))
    }
}

/// The accepted range and unit of a numeric option.
#[derive(Clone, Copy, Debug)]
pub struct OptionRange {
    /// Lowest accepted value, in `unit`.
    pub lo: f64,
    /// Highest accepted value, in `unit`.
    pub hi: f64,
    /// Whether `lo` itself is refused.
    pub lo_open: bool,
    /// The unit of a plain number and of the range in messages.
    pub unit: &'static str,
}

/// Reads a numeric command-line option that may carry a unit (`"45 mph"`,
/// `"270 deg"`, `"90 min"`; a plain number is in `range.unit`), checks
/// that it is finite and within the range, and returns it in SI.
///
/// # Errors
/// [`Error::Usage`] (exit code 2) naming the option, the value (bounded),
/// what is wrong and the accepted range.
pub fn quantity_option<D: crate::input::units::Dimension>(
    option: &str,
    text: &str,
    range: OptionRange,
) -> Result<f64, Error> {
    let accepted = range_text(range.lo, range.hi, range.lo_open, range.unit);
    let bad = |problem: String| {
        Error::Usage(format!(
            "{option} = \"{}\": {problem}",
            crate::input::located::bounded(text)
        ))
    };
    let q = crate::input::units::Quantity::<D>::parse_or(text, range.unit)
        .map_err(|e| bad(format!("{e}; accepted range {accepted}")))?;
    let unit = D::DIM.unit(range.unit).map_err(|e| bad(e.to_string()))?;
    let v = unit.from_si(q.si());
    let low_ok = if range.lo_open {
        v > range.lo
    } else {
        v >= range.lo
    };
    if v.is_finite() && q.si().is_finite() && low_ok && v <= range.hi {
        Ok(q.si())
    } else {
        Err(bad(format!(
            "outside the accepted range {accepted} (this value is {} {})",
            crate::input::located::fmt_g(v),
            range.unit
        )))
    }
}
