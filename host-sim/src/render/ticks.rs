//! Tick arithmetic shared by the chart writer ([`super::svg`]) and the
//! wall-clock axes ([`super::clock`]).

/// Ticks at multiples of `step` from the first at or above `min` to the
/// last at or below `max` (a small tolerance for rounding).
#[must_use]
pub fn ticks_with_step(min: f64, max: f64, step: f64) -> Vec<f64> {
    let mut out = Vec::new();
    if step.is_nan() || step <= 0.0 || !min.is_finite() || !max.is_finite() || max < min {
        return out;
    }
    let first = (min / step - 1e-9).ceil();
    let mut k = first;
    while k * step <= max + step * 1e-9 && out.len() < 1000 {
        let v = k * step;
        out.push(if v.abs() < step * 1e-9 { 0.0 } else { v });
        k += 1.0;
    }
    out
}
