//! The one helper that says what a core [`standfast::Error`] means in a
//! file's terms ([`core_problem`]): the rig file's loader, the weighing
//! file's reader, the what-if overrides and the errors met after loading
//! all word the core's errors through it.

use standfast::error::Unit;

use crate::input::located::fmt_g;

/// How the file shows a value of the core's unit `unit`: the unit's symbol
/// and the factor from the core's SI value (degrees for angles, as rig files
/// write them).
fn shown_unit(unit: Unit) -> (&'static str, f64) {
    match unit {
        Unit::Radian => ("deg", 180.0 / std::f64::consts::PI),
        Unit::RadianPerSecond => ("deg/s", 180.0 / std::f64::consts::PI),
        other => (other.symbol(), 1.0),
    }
}

/// What a core [`standfast::Error`] says, in the file's terms: the problem
/// and, where there is one, the accepted range in the file's units
/// (degrees for angles), without the core's internal field names.
#[must_use]
pub fn core_problem(e: &standfast::Error) -> String {
    let (unit, k) = shown_unit(e.unit());
    // Rounded to 4 decimals: the core's f32 limits carry float noise; a
    // small non-zero limit is written in exponent form, never as 0.
    let num = |x: f32| {
        let v = f64::from(x) * k;
        let r = (v * 1e4).round() / 1e4;
        if r == 0.0 && v != 0.0 {
            format!("{v:.3e}")
        } else {
            fmt_g(r)
        }
    };
    let sp = if unit.is_empty() { "" } else { " " };
    match e.kind {
        standfast::ErrorKind::OutOfRange | standfast::ErrorKind::NotFinite => {
            // A bound the core refuses itself (a scale of exactly 0) is
            // stated as excluded.
            let range = if e.value.to_bits() == e.min.to_bits() {
                format!("more than {}{sp}{unit}, up to {}", num(e.min), num(e.max))
            } else if e.value.to_bits() == e.max.to_bits() {
                format!("{}{sp}{unit} to less than {}", num(e.min), num(e.max))
            } else {
                format!("{} to {}", num(e.min), num(e.max))
            };
            format!(
                "outside the accepted range {range}{sp}{unit} (read as {}{sp}{unit})",
                num(e.value),
            )
        }
        standfast::ErrorKind::DuplicateFoot => {
            "two feet are less than 1 mm apart (accepted: feet at least 1 mm apart)".to_owned()
        }
        standfast::ErrorKind::CollinearFeet => {
            "the feet lie on one line and enclose no area (accepted: at least 3 feet not in a line)"
                .to_owned()
        }
        standfast::ErrorKind::TooMany => format!(
            "too many items (accepted: at most {})",
            fmt_g(f64::from(e.max))
        ),
        standfast::ErrorKind::TooFew => format!(
            "too few items (accepted: at least {})",
            fmt_g(f64::from(e.min))
        ),
        standfast::ErrorKind::ZeroDirection => {
            "the direction has zero length (accepted: any direction [x, y, z] not all 0)".to_owned()
        }
        standfast::ErrorKind::Unreachable => {
            "the requested result cannot be reached with these values".to_owned()
        }
        standfast::ErrorKind::Inconsistent => {
            "the measurements disagree with each other or with the geometry beyond their uncertainty"
                .to_owned()
        }
    }
}
