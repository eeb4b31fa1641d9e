//! A verdict's figures in the units every output shows them in: the one
//! verdict-shaped type of the host. The bridge's JSON line carries it
//! whole (flattened, in this order), the verdict CSV writes it, and a
//! replay's closest approach is built from it.
//!
//! Utilisations are dimensionless (1.0 tips, slides or overloads); speeds
//! m/s at rig height; angles degrees (directions clockwise from north, the
//! direction the wind blows from; tilt from the vertical).

use serde::Serialize;
use standfast::guard::Verdict;

/// The figures of one guard verdict, in report units.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
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
        Figures {
            overturning_utilisation: v.overturning_utilisation,
            predicted_utilisation: v.predicted_utilisation,
            sliding_utilisation: v.sliding_utilisation,
            drive_utilisation: v.drive_utilisation,
            tip_wind_mps: v.tip_wind_mps,
            gust_mps: v.gust_mps,
            predicted_gust_mps: v.predicted_gust_mps,
            wind_from_deg: v.wind_from_rad.map(f32::to_degrees),
            tilt_deg: v.tilt.map(|t| t.magnitude_rad.to_degrees()),
            tilt_downhill_deg: v.tilt.map(|t| t.downhill_azimuth_rad.to_degrees()),
            tilt_margin_deg: v.tilt_margin_rad.map(f32::to_degrees),
        }
    }

    /// The governing drive utilisation of axis `i` (0 primary, 1 secondary).
    #[must_use]
    pub fn drive(&self, i: usize) -> Option<f32> {
        self.drive_utilisation.and_then(|d| d.get(i).copied())
    }
}
