//! The reports' own colours, chosen to stay apart for readers with the
//! common red–green colour vision deficiencies.
//!
//! Two sets are used side by side on one chart: the [`SERIES`] colours for
//! lines (never more than these five on one chart; threshold lines are
//! [`INK`] with their own dash pattern and a written label), and the
//! [`LEVEL`] colours for the guard's levels (the level band and the event
//! markers). The tests simulate deuteranopia and protanopia (full severity)
//! and check that within each set every pair stays at least
//! [`MIN_DISTANCE_DE76`] apart in CIELAB (CIE 1976 colour difference).

/// Lines: deep blue.
pub const BLUE: &str = "#14457f";
/// Lines: pink.
pub const PINK: &str = "#e8609a";
/// Lines: amber.
pub const AMBER: &str = "#d99a12";
/// Lines and text: near black (also every threshold line).
pub const INK: &str = "#2e2e2e";
/// Lines: pale blue (raw samples behind the figures that matter).
pub const PALE_BLUE: &str = "#a9cdee";

/// The line colours, in the order charts take them.
pub const SERIES: [&str; 5] = [BLUE, PINK, AMBER, INK, PALE_BLUE];

/// Level colours in the replay's level order (clear, watch, park now,
/// alarm, sensor fault): pale green, yellow, rust, dark wine, violet blue.
pub const LEVEL: [&str; 5] = ["#cfe6d4", "#e6c13f", "#b8641c", "#6e1430", "#5465c4"];

/// Least CIE 1976 colour difference (ΔE*ab) between two colours of one set,
/// for normal vision and under the simulated deficiencies. About 2.3 is a
/// just-noticeable difference (Sharma, *Digital Color Imaging Handbook*,
/// 2003, ch. 1); 20 keeps thin lines apart at a glance (common practice,
/// no source).
pub const MIN_DISTANCE_DE76: f64 = 20.0;

/// A `#rrggbb` colour as sRGB components in 0..=1; `None` for anything else.
#[must_use]
pub fn srgb(hex: &str) -> Option<[f64; 3]> {
    let h = hex.strip_prefix('#')?;
    if h.len() != 6 {
        return None;
    }
    let c = |i: usize| {
        h.get(i..i + 2)
            .and_then(|s| u8::from_str_radix(s, 16).ok())
            .map(|v| f64::from(v) / 255.0)
    };
    Some([c(0)?, c(2)?, c(4)?])
}

/// sRGB component to linear light (IEC 61966-2-1:1999).
fn linear(c: f64) -> f64 {
    if c <= 0.040_45 {
        c / 12.92
    } else {
        ((c + 0.055) / 1.055).powf(2.4)
    }
}

/// Linear sRGB to CIELAB under D65 (IEC 61966-2-1 matrix; CIE 15:2004
/// for L*a*b*).
#[must_use]
pub fn lab_of_linear(rgb: [f64; 3]) -> [f64; 3] {
    let [r, g, b] = rgb;
    let x = 0.4124 * r + 0.3576 * g + 0.1805 * b;
    let y = 0.2126 * r + 0.7152 * g + 0.0722 * b;
    let z = 0.0193 * r + 0.1192 * g + 0.9505 * b;
    let f = |t: f64| {
        if t > 216.0 / 24389.0 {
            t.cbrt()
        } else {
            (24389.0 / 27.0 * t + 16.0) / 116.0
        }
    };
    let (fx, fy, fz) = (f(x / 0.950_47), f(y), f(z / 1.088_83));
    [116.0 * fy - 16.0, 500.0 * (fx - fy), 200.0 * (fy - fz)]
}

/// Simulated deuteranopia, full severity, on linear RGB (Machado, Oliveira
/// and Fernandes, "A physiologically-based model for simulation of color
/// vision deficiency", IEEE TVCG 15(6), 2009, table for severity 1.0; the
/// values as several public colour libraries transcribe them, the paper's
/// table itself not seen: `SOURCES.md`).
pub const DEUTERANOPIA: [[f64; 3]; 3] = [
    [0.367_322, 0.860_646, -0.227_968],
    [0.280_085, 0.672_501, 0.047_413],
    [-0.011_820, 0.042_940, 0.968_881],
];

/// Simulated protanopia, full severity, on linear RGB (Machado et al. 2009,
/// as [`DEUTERANOPIA`]).
pub const PROTANOPIA: [[f64; 3]; 3] = [
    [0.152_286, 1.052_583, -0.204_868],
    [0.114_503, 0.786_281, 0.099_216],
    [-0.003_882, -0.048_116, 1.051_998],
];

/// Normal vision (identity).
pub const NORMAL: [[f64; 3]; 3] = [[1.0, 0.0, 0.0], [0.0, 1.0, 0.0], [0.0, 0.0, 1.0]];

/// The CIELAB colour a reader with vision `m` sees for `hex`.
#[must_use]
pub fn seen(hex: &str, m: &[[f64; 3]; 3]) -> Option<[f64; 3]> {
    let c = srgb(hex)?.map(linear);
    let row = |r: &[f64; 3]| (r[0] * c[0] + r[1] * c[1] + r[2] * c[2]).clamp(0.0, 1.0);
    Some(lab_of_linear([row(&m[0]), row(&m[1]), row(&m[2])]))
}

/// CIE 1976 colour difference.
#[must_use]
pub fn delta_e76(a: [f64; 3], b: [f64; 3]) -> f64 {
    ((a[0] - b[0]).powi(2) + (a[1] - b[1]).powi(2) + (a[2] - b[2]).powi(2)).sqrt()
}

/// The closest pair of a set for vision `m`: `(ΔE, a, b)`.
#[must_use]
pub fn closest_pair<'a>(set: &[&'a str], m: &[[f64; 3]; 3]) -> Option<(f64, &'a str, &'a str)> {
    let mut best: Option<(f64, &str, &str)> = None;
    for (i, a) in set.iter().enumerate() {
        for b in set.iter().skip(i + 1) {
            let d = delta_e76(seen(a, m)?, seen(b, m)?);
            if best.is_none_or(|x| d < x.0) {
                best = Some((d, a, b));
            }
        }
    }
    best
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn lab_matches_published_white_and_primaries() {
        // CIE 15:2004: the white point is L* 100, a* = b* = 0; sRGB red is
        // about L* 53.2, a* 80.1, b* 67.2 (Lindbloom's calculator; values
        // from memory).
        let w = seen("#ffffff", &NORMAL).unwrap();
        assert!((w[0] - 100.0).abs() < 0.05 && w[1].abs() < 0.05 && w[2].abs() < 0.05);
        let r = seen("#ff0000", &NORMAL).unwrap();
        assert!((r[0] - 53.2).abs() < 0.3, "{r:?}");
        assert!((r[1] - 80.1).abs() < 0.5, "{r:?}");
        assert!((r[2] - 67.2).abs() < 0.5, "{r:?}");
    }

    #[test]
    fn simulation_rows_keep_greys_grey() {
        // Machado et al. 2009 normalise each matrix so that white maps to
        // white: every row sums to 1 (a check of the transcription).
        for m in [&DEUTERANOPIA, &PROTANOPIA] {
            for row in m {
                assert!((row.iter().sum::<f64>() - 1.0).abs() < 1e-5, "{row:?}");
            }
        }
    }

    #[test]
    fn the_simulations_merge_red_and_green() {
        // What the simulation is for: pure red and a green of the same
        // lightness differ a lot for normal vision and far less for the
        // deficiencies (Machado et al. 2009, fig. 1).
        let set = ["#d03030", "#3f8f3f"];
        let n = closest_pair(&set, &NORMAL).unwrap().0;
        let d = closest_pair(&set, &DEUTERANOPIA).unwrap().0;
        let p = closest_pair(&set, &PROTANOPIA).unwrap().0;
        assert!(n > 60.0 && d < n / 2.0 && p < n / 2.0, "{n} {d} {p}");
    }

    #[test]
    fn each_set_stays_apart_for_colour_blind_readers() {
        for (name, set) in [("series", &SERIES[..]), ("level", &LEVEL[..])] {
            for (vision, m) in [
                ("normal", &NORMAL),
                ("deuteranopia", &DEUTERANOPIA),
                ("protanopia", &PROTANOPIA),
            ] {
                let (d, a, b) = closest_pair(set, m).unwrap();
                assert!(
                    d >= MIN_DISTANCE_DE76,
                    "{name} colours {a} and {b} are only ΔE {d:.1} apart for {vision}"
                );
            }
        }
    }

    #[test]
    fn no_colour_is_a_framework_default() {
        // The colours the reports used before (five of them a CSS
        // framework's defaults) are not reused.
        let old = [
            "#2b6cb0", "#c05621", "#2f855a", "#6b46c1", "#4a5568", "#d69e2e",
        ];
        for c in SERIES.iter().chain(LEVEL.iter()) {
            assert!(!old.contains(c), "{c}");
        }
    }
}
