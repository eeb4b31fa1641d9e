//! What both wind sources share: their configuration ([`WindConfig`]) and
//! their report ([`WindReport`], [`WindDirection`], [`GustBasis`]).

use crate::error::{Error, Field};

use super::profile::{log_profile_factor, TerrainCategory};

/// Configuration of [`WindStats`](crate::sense::WindStats) and [`MeanWind`](crate::sense::MeanWind). Defaults are listed per
/// field with the reason for each.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct WindConfig {
    /// Anemometer height above ground, m. Default 2 m (same as the rig).
    pub anemometer_height_m: f32,
    /// Height the wind is wanted at (the rig's centre of wind load), m.
    /// Default 2 m: a mounted telescope's tube and head.
    pub rig_height_m: f32,
    /// Terrain around the site. Default category II (open field).
    pub terrain: TerrainCategory,
    /// Window of the peak gust, s, up to 600. Default 600 s, the WMO period
    /// over which gusts are reported with the 10-min mean.
    pub peak_window_s: f32,
    /// Window of the direction mean, s, up to 600. Default 600 s, the same
    /// as the speed mean.
    pub direction_window_s: f32,
    /// Speed (at the anemometer) below which a sample counts as calm and its
    /// direction is ignored, m/s. Default 0.5 m/s: below about 1 kt vanes
    /// do not align and WMO codes report calm (from memory).
    pub calm_below_mps: f32,
    /// Circular standard deviation above which the direction is reported as
    /// variable, radians. Default 60° (1.047 rad): from memory, aviation
    /// reports name a direction variable when it swings through 60° or more.
    pub variable_spread_rad: f32,
    /// Highest physically plausible speed sample, m/s. Default 100 m/s:
    /// above the strongest gusts ever measured near the ground (about
    /// 113 m/s in a tropical cyclone, from memory) only in tornadoes; any
    /// reading beyond is a sensor or wiring error for a telescope site.
    pub max_speed_mps: f32,
    /// Time without a sample before [`Fault::Stale`](crate::sense::Fault::Stale), s. Default 10 s: ten
    /// samples of a 1 Hz logger or 40 of a 4 Hz gust anemometer; the gust
    /// window is 3 s. For a [`MeanWind`](crate::sense::MeanWind) source set at least its reporting
    /// period plus a margin (for example 660 s for 10-min statistics).
    pub stale_after_s: f32,
    /// Time of identical non-zero speed readings (or identical direction
    /// readings while the speed is above calm) before [`Fault::Stuck`](crate::sense::Fault::Stuck), s;
    /// 0 disables. Default 300 s: real wind never holds a cup or sonic
    /// reading to the last digit for five minutes. A zero speed is never
    /// called stuck: it cannot be told from calm.
    pub stuck_after_s: f32,
    /// Whether the source sends a direction; when true, a missing direction
    /// for `stale_after_s` is a [`Fault::Stale`](crate::sense::Fault::Stale) of the direction sensor.
    /// Default true.
    pub expect_direction: bool,
    /// Gust factor (3-s gust / 10-min mean) for a mean-only source
    /// ([`MeanWind`](crate::sense::MeanWind)). Default 1.45, the open-terrain value of
    /// [`TerrainCategory::default_gust_factor`]; choose by terrain.
    pub mean_gust_factor: f32,
}

impl Default for WindConfig {
    fn default() -> Self {
        WindConfig {
            anemometer_height_m: 2.0,
            rig_height_m: 2.0,
            terrain: TerrainCategory::CatIIOpen,
            peak_window_s: 600.0,
            direction_window_s: 600.0,
            calm_below_mps: 0.5,
            variable_spread_rad: core::f32::consts::FRAC_PI_3,
            max_speed_mps: 100.0,
            stale_after_s: 10.0,
            stuck_after_s: 300.0,
            expect_direction: true,
            mean_gust_factor: 1.45,
        }
    }
}

impl WindConfig {
    /// Checks every field.
    ///
    /// # Errors
    /// The first non-finite or out-of-range field, named `guard.wind.<field>`.
    pub fn validate(&self) -> Result<(), Error> {
        log_profile_factor(self.anemometer_height_m, self.rig_height_m, self.terrain)?;
        Error::check(Field::WindPeakWindowS, self.peak_window_s, 3.0, 600.0)?;
        Error::check(
            Field::WindDirectionWindowS,
            self.direction_window_s,
            10.0,
            600.0,
        )?;
        Error::check(Field::WindCalmBelowMps, self.calm_below_mps, 0.0, 5.0)?;
        Error::check(
            Field::WindVariableSpreadRad,
            self.variable_spread_rad,
            0.0,
            10.0,
        )?;
        Error::check(Field::WindMaxSpeedMps, self.max_speed_mps, 1.0, 150.0)?;
        Error::check(Field::WindStaleAfterS, self.stale_after_s, 1e-3, 86_400.0)?;
        Error::check(Field::WindStuckAfterS, self.stuck_after_s, 0.0, 86_400.0)?;
        Error::check(Field::WindMeanGustFactor, self.mean_gust_factor, 1.0, 3.0)?;
        Ok(())
    }

    /// The height correction factor anemometer → rig (see
    /// [`log_profile_factor`]).
    ///
    /// # Errors
    /// As [`log_profile_factor`].
    pub fn height_factor(&self) -> Result<f32, Error> {
        log_profile_factor(self.anemometer_height_m, self.rig_height_m, self.terrain)
    }
}

/// Where the wind comes from over the direction window.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum WindDirection {
    /// No sample in the window.
    NoData,
    /// More than half of the window's samples were below the calm speed:
    /// direction undefined.
    Calm,
    /// Wind, but no usable direction sample in the window.
    Unknown,
    /// A defined direction.
    Defined {
        /// Circular (unit-vector) mean of the from-direction, radians from
        /// north clockwise, in [0, 2π).
        from_rad: f32,
        /// Circular standard deviation √(−2 ln R̄), radians.
        spread_rad: f32,
        /// Mean resultant length R̄ in [0, 1] (1: all samples agree).
        resultant_length: f32,
    },
    /// The direction swings more than `variable_spread_rad`; the mean is
    /// given but carries little meaning.
    Variable {
        /// Circular mean, radians from north clockwise, in [0, 2π).
        from_rad: f32,
        /// Circular standard deviation, radians.
        spread_rad: f32,
        /// Mean resultant length R̄ in [0, 1].
        resultant_length: f32,
    },
    /// A direction reported by a mean-only source; its spread is unknown.
    Reported {
        /// Reported from-direction, radians from north clockwise.
        from_rad: f32,
    },
}

impl WindDirection {
    /// The from-direction in radians when one is known (defined, variable
    /// or reported).
    #[must_use]
    pub fn from_rad(&self) -> Option<f32> {
        match *self {
            WindDirection::Defined { from_rad, .. }
            | WindDirection::Variable { from_rad, .. }
            | WindDirection::Reported { from_rad } => Some(from_rad),
            _ => None,
        }
    }
}

/// How the gust figures of a [`WindReport`] were obtained.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum GustBasis {
    /// Measured: maxima of the 3-s running mean.
    Measured,
    /// Estimated from a mean speed times this gust factor.
    FromMean {
        /// The gust factor applied.
        factor: f32,
    },
}

/// Wind statistics at one moment, at rig height, m/s.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct WindReport {
    /// The latest 3-s running mean (ending at the 0.25 s bin containing the
    /// report time), m/s; `None` with no sample in the last 3 s or before
    /// 3 s of record.
    pub gust_3s_mps: Option<f32>,
    /// Peak gust: the largest 3-s running mean within the peak window, m/s.
    pub peak_gust_mps: Option<f32>,
    /// Mean speed over the last 10 min (590–600 s), m/s.
    pub mean_10min_mps: Option<f32>,
    /// Length of record the mean covers, s (600 once the record is long
    /// enough; less after start-up, when the mean is less representative).
    pub mean_span_s: f32,
    /// Gust factor: peak gust / 10-min mean; `None` when the mean is below
    /// the calm speed.
    pub gust_factor: Option<f32>,
    /// Direction summary over the direction window.
    pub direction: WindDirection,
    /// Measured or estimated gusts.
    pub basis: GustBasis,
}

impl WindReport {
    /// The speed a guard should use: the peak gust, else the latest gust,
    /// else the mean × `fallback_gust_factor`; `None` with no data.
    #[must_use]
    pub fn design_gust_mps(&self, fallback_gust_factor: f32) -> Option<f32> {
        self.peak_gust_mps
            .or(self.gust_3s_mps)
            .or(self.mean_10min_mps.map(|m| m * fallback_gust_factor))
    }
}
