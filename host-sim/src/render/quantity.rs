//! Figures as the text summary, the headline and the HTML tables write
//! them: one number format for all three.

/// `v` with `digits` decimals and its unit, `-` when there is none. A space
/// stands between the number and the unit (`10.6 m/s`, `49 %`) except
/// before the degree sign of a plane angle (`0.51°`), as the SI writes them
/// (SI Brochure, 9th edition, 2019, section 5.4.3; from memory).
#[must_use]
pub fn figure_text(v: Option<f32>, unit: &str, digits: usize) -> String {
    match v {
        None => "-".to_owned(),
        Some(x) if unit == "°" => format!("{x:.digits$}°"),
        Some(x) => format!("{x:.digits$} {unit}"),
    }
}

/// A direction, degrees clockwise from north, taken into [0, 360) and
/// written in whole degrees (`285°`); `-` when there is none.
#[must_use]
pub fn direction_text(v_deg: Option<f32>) -> String {
    figure_text(v_deg.map(|d| d.rem_euclid(360.0)), "°", 0)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_space_before_every_unit_but_the_degree_sign() {
        assert_eq!(figure_text(Some(10.64), "m/s", 1), "10.6 m/s");
        assert_eq!(figure_text(Some(49.0), "%", 0), "49 %");
        assert_eq!(figure_text(Some(0.514), "°", 2), "0.51°");
        assert_eq!(figure_text(None, "m/s", 1), "-");
        assert_eq!(figure_text(None, "°", 2), "-");
    }

    #[test]
    fn directions_are_taken_into_a_turn() {
        assert_eq!(direction_text(Some(285.2)), "285°");
        assert_eq!(direction_text(Some(-75.0)), "285°");
        assert_eq!(direction_text(Some(720.0 + 90.0)), "90°");
        assert_eq!(direction_text(Some(0.0)), "0°");
        assert_eq!(direction_text(None), "-");
    }
}
