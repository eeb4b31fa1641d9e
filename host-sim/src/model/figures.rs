//! A verdict's figures in the units every output shows them in: the one
//! verdict-shaped type of the host. The bridge's JSON line carries it
//! whole (flattened, in this order), the verdict CSV writes it, a replay's
//! closest approach and a park request's moments hold it, a chart bucket
//! holds the extremes of its verdicts in it ([`Figures::keep_extremes`]),
//! and a what-if line holds a rig's closest approach in it.
//!
//! Utilisations are dimensionless (1.0 tips, slides or overloads); speeds
//! m/s at rig height; angles degrees (directions clockwise from north, the
//! direction the wind blows from; tilt from the vertical).

use serde::Serialize;
use standfast::guard::Verdict;

/// The figures of one guard verdict, in report units (or the extremes of
/// several, see [`Figures::keep_extremes`]).
#[derive(Clone, Copy, Debug, Default, PartialEq, Serialize)]
pub struct Figures {
    /// Overturning utilisation at the peak gust now.
    pub overturning_utilisation: Option<f32>,
    /// Overturning utilisation predicted for the end of a park.
    pub predicted_utilisation: Option<f32>,
    /// Sliding utilisation at the peak gust now.
    pub sliding_utilisation: Option<f32>,
    /// Governing drive utilisation, [primary, secondary].
    pub drive_utilisation: Option<[f32; 2]>,
    /// Wind speed that would tip the rig in this pose and direction, m/s.
    pub tip_wind_mps: Option<f32>,
    /// Gust the figures are for, m/s.
    pub gust_mps: Option<f32>,
    /// Gust predicted for the end of a park, m/s.
    pub predicted_gust_mps: Option<f32>,
    /// Direction used (the worst one when not measured), degrees.
    pub wind_from_deg: Option<f32>,
    /// Ground tilt, degrees.
    pub tilt_deg: Option<f32>,
    /// Downhill azimuth, degrees clockwise from north.
    pub tilt_downhill_deg: Option<f32>,
    /// Extra tilt that would tip the rig with no wind, degrees.
    pub tilt_margin_deg: Option<f32>,
}

impl Figures {
    /// The figures of verdict `v`, radians turned into degrees.
    #[must_use]
    pub fn of(v: &Verdict) -> Figures {
        let tilt = v.tilt.map(|r| r.tilt());
        Figures {
            overturning_utilisation: v.overturning_utilisation,
            predicted_utilisation: v.predicted_utilisation,
            sliding_utilisation: v.sliding_utilisation,
            drive_utilisation: v.drive_utilisation,
            tip_wind_mps: v.tip_wind_mps,
            gust_mps: v.gust_mps,
            predicted_gust_mps: v.predicted_gust_mps,
            wind_from_deg: v.wind_from_rad.map(f32::to_degrees),
            tilt_deg: tilt.map(|t| t.magnitude_rad.to_degrees()),
            tilt_downhill_deg: tilt.map(|t| t.downhill_azimuth_rad.to_degrees()),
            tilt_margin_deg: v.tilt_margin_rad.map(f32::to_degrees),
        }
    }

    /// The governing drive utilisation of axis `i` (0 primary, 1 secondary).
    #[must_use]
    pub fn drive(&self, i: usize) -> Option<f32> {
        self.drive_utilisation.and_then(|d| d.get(i).copied())
    }

    /// Keeps the extremes of `self` and `o`, figure by figure: the higher
    /// utilisations (each drive axis on its own), gusts and tilt, the lower
    /// tip wind and tilt margin. The direction goes with the higher gust and
    /// the downhill azimuth with the larger tilt; on a tie `self` keeps its
    /// own. A figure that is not finite never replaces one (a `None` or
    /// non-finite figure of `self` is replaced by a finite one of `o`).
    pub fn keep_extremes(&mut self, o: &Figures) {
        self.overturning_utilisation = hi(self.overturning_utilisation, o.overturning_utilisation);
        self.predicted_utilisation = hi(self.predicted_utilisation, o.predicted_utilisation);
        self.sliding_utilisation = hi(self.sliding_utilisation, o.sliding_utilisation);
        self.drive_utilisation = match (self.drive_utilisation, o.drive_utilisation) {
            (Some([a0, a1]), Some([b0, b1])) => Some([
                hi(Some(a0), Some(b0)).unwrap_or(a0),
                hi(Some(a1), Some(b1)).unwrap_or(a1),
            ]),
            (None, b) => b,
            (a, None) => a,
        };
        self.tip_wind_mps = lo(self.tip_wind_mps, o.tip_wind_mps);
        if takes(self.gust_mps, o.gust_mps) {
            self.gust_mps = o.gust_mps;
            self.wind_from_deg = o.wind_from_deg;
        }
        self.predicted_gust_mps = hi(self.predicted_gust_mps, o.predicted_gust_mps);
        self.keep_higher_tilt(o.tilt_deg, || o.tilt_downhill_deg);
        self.tilt_margin_deg = lo(self.tilt_margin_deg, o.tilt_margin_deg);
    }

    /// The tilt part of [`Figures::keep_extremes`]: takes `tilt_deg` with its
    /// downhill azimuth (`downhill_deg`, asked only then) when it is finite
    /// and larger than the tilt kept (or none is kept).
    pub fn keep_higher_tilt(
        &mut self,
        tilt_deg: Option<f32>,
        downhill_deg: impl FnOnce() -> Option<f32>,
    ) {
        if takes(self.tilt_deg, tilt_deg) {
            self.tilt_deg = tilt_deg;
            self.tilt_downhill_deg = downhill_deg();
        }
    }
}

/// Whether `b` is finite and above `a` (or `a` is `None` or not finite).
fn takes(a: Option<f32>, b: Option<f32>) -> bool {
    match (a.filter(|x| x.is_finite()), b.filter(|x| x.is_finite())) {
        (_, None) => false,
        (None, Some(_)) => true,
        (Some(x), Some(y)) => y > x,
    }
}

/// The higher of two optional values (a finite value beats `None`).
fn hi(a: Option<f32>, b: Option<f32>) -> Option<f32> {
    if takes(a, b) {
        b
    } else {
        a
    }
}

/// The lower of two optional values (a finite value beats `None`).
fn lo(a: Option<f32>, b: Option<f32>) -> Option<f32> {
    match (a.filter(|x| x.is_finite()), b.filter(|x| x.is_finite())) {
        (Some(x), Some(y)) => Some(if y < x { y } else { x }),
        (None, Some(y)) => Some(y),
        _ => a,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn f(u: f32, gust: f32, from: f32, tip: f32, tilt: f32, downhill: f32) -> Figures {
        Figures {
            overturning_utilisation: Some(u),
            drive_utilisation: Some([u, 1.0 - u]),
            gust_mps: Some(gust),
            wind_from_deg: Some(from),
            tip_wind_mps: Some(tip),
            tilt_deg: Some(tilt),
            tilt_downhill_deg: Some(downhill),
            ..Figures::default()
        }
    }

    // Expected values worked by hand from the documented rule.
    #[test]
    fn extremes_keep_each_figure_with_its_companion() {
        let mut a = f(0.2, 8.0, 90.0, 30.0, 0.5, 10.0);
        a.keep_extremes(&f(0.3, 6.0, 180.0, 20.0, 0.7, 200.0));
        assert_eq!(a.overturning_utilisation, Some(0.3));
        assert_eq!(a.drive_utilisation, Some([0.3, 0.8]));
        // The direction stays with the higher gust, the azimuth with the tilt.
        assert_eq!((a.gust_mps, a.wind_from_deg), (Some(8.0), Some(90.0)));
        assert_eq!((a.tilt_deg, a.tilt_downhill_deg), (Some(0.7), Some(200.0)));
        assert_eq!(a.tip_wind_mps, Some(20.0));
        // Ties keep the first.
        a.keep_extremes(&f(0.1, 8.0, 270.0, 25.0, 0.7, 300.0));
        assert_eq!(
            (a.wind_from_deg, a.tilt_downhill_deg),
            (Some(90.0), Some(200.0))
        );
    }

    #[test]
    fn extremes_never_take_a_missing_or_non_finite_figure() {
        let mut a = f(0.2, 8.0, 90.0, 30.0, 0.5, 10.0);
        a.keep_extremes(&f(f32::NAN, f32::INFINITY, 0.0, f32::NAN, f32::NAN, 0.0));
        assert_eq!(a, f(0.2, 8.0, 90.0, 30.0, 0.5, 10.0));
        a.keep_extremes(&Figures::default());
        assert_eq!(a, f(0.2, 8.0, 90.0, 30.0, 0.5, 10.0));
        let mut empty = Figures::default();
        empty.keep_extremes(&a);
        assert_eq!(empty, a);
    }
}
