//! Wind statistics from an anemometer: 3-second gust, 10-minute mean, peak
//! gust, gust factor, circular mean of direction; the logarithmic height
//! correction; the gust of a mean-only source.
//!
//! **Definitions** (WMO-No. 8, Part I, Ch. 5): the mean wind is the 10-minute
//! average (§5.1.1); a gust is the maximum of the 3-second running mean
//! (§5.8.2), which WMO suggests computing from samples every 0.25 s, i.e. a
//! running mean of 12 samples at 4 Hz (§5.8.3).
//!
//! **Fixed-memory design.** Samples at any rate, regular or not, are summed
//! into time bins aligned to the caller's epoch:
//! - [`FINE_BINS`] = 12 *fine* bins of [`FINE_BIN_MS`] = 250 ms make the
//!   3-second window. The running mean is evaluated at every fine-bin
//!   boundary as (sum of all samples in the last 12 bins) / (their count):
//!   the plain mean of the samples of the last 3 s, with the window stepping
//!   in 0.25 s steps. At 4 Hz this is WMO's 12-sample running mean; at 1 Hz
//!   it is the mean of 3 samples; at 20 Hz of 60. A 3-s mean is formed only
//!   once 3 s have passed since the first sample, so the start of a record
//!   never yields a short-window "gust".
//! - [`COARSE_BINS`] = 60 *coarse* bins of [`COARSE_BIN_MS`] = 10 s make the
//!   10-minute window. Each holds the sum and count of speeds, the largest
//!   3-s mean whose window ended in it, and the direction unit-vector sums.
//!   The 10-minute mean is the sample mean over the last 60 coarse bins
//!   (the one containing `now` and the 59 before: 590 to 600 s of data).
//!
//! Samples within a window are weighted equally, so an irregular rate
//! weights busy stretches more; feed a steady rate where you can.
//!
//! **Height.** Speeds are corrected to the rig's height on entry by the
//! logarithmic profile of EN 1991-1-4 (eq. 4.4: v_m(z) ∝ ln(z/z0) for
//! z ≥ z_min), so every output is at rig height. The profile describes the
//! mean wind; applying it to gusts is an approximation (gust factors rise
//! nearer the ground), so keep the anemometer near rig height when you can.

use crate::error::Error;
use crate::math::{self, TAU};

use super::fault::{Fault, FaultSet, Sensor};
use super::{ms_to_s, s_to_ms, Millis};

/// Number of fine bins in the 3-second gust window (WMO-No. 8 §5.8.2: 3 s =
/// 12 × 0.25 s).
pub const FINE_BINS: usize = 12;
/// Width of a fine bin, ms (WMO-No. 8 §5.8.3: 4 Hz sampling for gusts).
pub const FINE_BIN_MS: u64 = 250;
/// Number of coarse bins in the 10-minute window.
pub const COARSE_BINS: usize = 60;
/// Width of a coarse bin, ms.
pub const COARSE_BIN_MS: u64 = 10_000;
/// Length of the mean window, ms (WMO-No. 8 §5.1.1: 10 min).
const MEAN_WINDOW_MS: u64 = 600_000;

/// Terrain category of EN 1991-1-4 Table 4.1, which fixes the roughness
/// length z0 and the minimum height z_min of the logarithmic wind profile.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub enum TerrainCategory {
    /// Category 0: sea or coastal area exposed to the open sea.
    /// z0 = 0.003 m, z_min = 1 m.
    Cat0Sea,
    /// Category I: lakes or flat, horizontal land with negligible vegetation.
    /// z0 = 0.01 m, z_min = 1 m.
    CatIFlat,
    /// Category II: low vegetation (grass) and isolated obstacles at least
    /// 20 obstacle heights apart. z0 = 0.05 m, z_min = 2 m. Default: the
    /// usual open observing field.
    #[default]
    CatIIOpen,
    /// Category III: regular cover of vegetation or buildings, isolated
    /// obstacles at most 20 heights apart (villages, suburbs, forest).
    /// z0 = 0.3 m, z_min = 5 m.
    CatIIISuburban,
    /// Category IV: at least 15 % of the surface covered by buildings of
    /// average height above 15 m. z0 = 1.0 m, z_min = 10 m.
    CatIVUrban,
}

impl TerrainCategory {
    /// Roughness length z0, metres (EN 1991-1-4 Table 4.1).
    #[must_use]
    pub const fn roughness_length_m(self) -> f32 {
        match self {
            TerrainCategory::Cat0Sea => 0.003,
            TerrainCategory::CatIFlat => 0.01,
            TerrainCategory::CatIIOpen => 0.05,
            TerrainCategory::CatIIISuburban => 0.3,
            TerrainCategory::CatIVUrban => 1.0,
        }
    }

    /// Minimum height z_min, metres (EN 1991-1-4 Table 4.1): below it the
    /// profile is held at its z_min value.
    #[must_use]
    pub const fn min_height_m(self) -> f32 {
        match self {
            TerrainCategory::Cat0Sea | TerrainCategory::CatIFlat => 1.0,
            TerrainCategory::CatIIOpen => 2.0,
            TerrainCategory::CatIIISuburban => 5.0,
            TerrainCategory::CatIVUrban => 10.0,
        }
    }

    /// Ratio of 3-s gust to 10-min mean to use when only means are known.
    /// Open terrain (0, I, II): 1.45 (Durst 1960 curve gives 1.43, ESDU
    /// 1.45). Category III: 1.7 (WMO/TD-No. 1555 in-land 1.66; EN 1991-1-4
    /// √(1 + 7·I_v) = 1.73 at 10 m). Category IV: 2.0 (EN 1991-1-4
    /// √(1 + 7·I_v)). Rougher ground gusts harder relative to its mean.
    #[must_use]
    pub const fn default_gust_factor(self) -> f32 {
        match self {
            TerrainCategory::Cat0Sea | TerrainCategory::CatIFlat | TerrainCategory::CatIIOpen => {
                1.45
            }
            TerrainCategory::CatIIISuburban => 1.7,
            TerrainCategory::CatIVUrban => 2.0,
        }
    }
}

/// Factor v(z_to)/v(z_from) of the logarithmic mean-wind profile of
/// EN 1991-1-4 (eq. 4.4, c_r(z) = k_r·ln(z/z0)): ln(z_to/z0) / ln(z_from/z0),
/// with each height raised to the category's z_min first. Heights in metres
/// above ground.
///
/// # Errors
/// A height that is non-finite or outside 0.01 to 200 m (the code's z_max).
pub fn log_profile_factor(
    z_from_m: f32,
    z_to_m: f32,
    terrain: TerrainCategory,
) -> Result<f32, Error> {
    Error::check("wind.z_from_m", z_from_m, 0.01, 200.0)?;
    Error::check("wind.z_to_m", z_to_m, 0.01, 200.0)?;
    let z0 = terrain.roughness_length_m();
    let zmin = terrain.min_height_m();
    let from = math::ln(z_from_m.max(zmin) / z0);
    let to = math::ln(z_to_m.max(zmin) / z0);
    Ok(to / from)
}

/// The gust estimated from a mean speed: `mean_mps · gust_factor` (both at
/// the same height; m/s).
#[must_use]
pub fn gust_from_mean(mean_mps: f32, gust_factor: f32) -> f32 {
    mean_mps * gust_factor
}

/// Configuration of [`WindStats`] and [`MeanWind`]. Defaults are listed per
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
    /// Time without a sample before [`Fault::Stale`], s. Default 10 s: ten
    /// samples of a 1 Hz logger or 40 of a 4 Hz gust anemometer; the gust
    /// window is 3 s. For a [`MeanWind`] source set at least its reporting
    /// period plus a margin (for example 660 s for 10-min statistics).
    pub stale_after_s: f32,
    /// Time of identical non-zero speed readings (or identical direction
    /// readings while the speed is above calm) before [`Fault::Stuck`], s;
    /// 0 disables. Default 300 s: real wind never holds a cup or sonic
    /// reading to the last digit for five minutes. A zero speed is never
    /// called stuck: it cannot be told from calm.
    pub stuck_after_s: f32,
    /// Whether the source sends a direction; when true, a missing direction
    /// for `stale_after_s` is a [`Fault::Stale`] of the direction sensor.
    /// Default true.
    pub expect_direction: bool,
    /// Gust factor (3-s gust / 10-min mean) for a mean-only source
    /// ([`MeanWind`]). Default 1.45, the open-terrain value of
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
    /// The first non-finite or out-of-range field, named `wind.<field>`.
    pub fn validate(&self) -> Result<(), Error> {
        log_profile_factor(self.anemometer_height_m, self.rig_height_m, self.terrain)?;
        Error::check("wind.peak_window_s", self.peak_window_s, 3.0, 600.0)?;
        Error::check(
            "wind.direction_window_s",
            self.direction_window_s,
            10.0,
            600.0,
        )?;
        Error::check("wind.calm_below_mps", self.calm_below_mps, 0.0, 5.0)?;
        Error::check(
            "wind.variable_spread_rad",
            self.variable_spread_rad,
            0.0,
            10.0,
        )?;
        Error::check("wind.max_speed_mps", self.max_speed_mps, 1.0, 150.0)?;
        Error::check("wind.stale_after_s", self.stale_after_s, 1e-3, 86_400.0)?;
        Error::check("wind.stuck_after_s", self.stuck_after_s, 0.0, 86_400.0)?;
        Error::check("wind.mean_gust_factor", self.mean_gust_factor, 1.0, 3.0)?;
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

#[derive(Clone, Copy, Debug, Default)]
struct FineBin {
    id: u64,
    sum_mps: f32,
    count: u32,
}

#[derive(Clone, Copy, Debug, Default)]
struct CoarseBin {
    id: u64,
    sum_mps: f32,
    count: u32,
    calm_count: u32,
    /// Largest 3-s mean ending in this bin; negative when none.
    gust_max_mps: f32,
    dir_sin: f32,
    dir_cos: f32,
    dir_count: u32,
}

impl CoarseBin {
    const fn empty(id: u64) -> Self {
        CoarseBin {
            id,
            sum_mps: 0.0,
            count: 0,
            calm_count: 0,
            gust_max_mps: -1.0,
            dir_sin: 0.0,
            dir_cos: 0.0,
            dir_count: 0,
        }
    }
}

/// Ring-buffer slot of absolute bin number `id`.
fn slot(id: u64, n: usize) -> usize {
    let n64 = u64::try_from(n).unwrap_or(1).max(1);
    usize::try_from(id % n64).unwrap_or(0)
}

/// Number of whole coarse bins covering `s` seconds, 1 to [`COARSE_BINS`].
fn coarse_bins_for(s: f32) -> u64 {
    let ms = s_to_ms(s);
    let n = ms.div_ceil(COARSE_BIN_MS).max(1);
    n.min(u64::try_from(COARSE_BINS).unwrap_or(60))
}

/// Tracks stuck readings and rejected samples of one channel.
#[derive(Clone, Copy, Debug)]
struct Channel {
    last: Option<Millis>,
    last_bits: u32,
    same_since: Millis,
    rejection: Option<Fault>,
}

impl Channel {
    const fn new(now: Millis) -> Self {
        Channel {
            last: None,
            last_bits: 0,
            same_since: now,
            rejection: None,
        }
    }

    /// Records a valid value; `count_as_stuck_candidate` false resets the
    /// stuck timer (zero speed, or direction in calm).
    fn accept(&mut self, now: Millis, value: f32, count_as_stuck_candidate: bool) {
        let b = value.to_bits();
        if !count_as_stuck_candidate || b != self.last_bits || self.last.is_none() {
            self.same_since = now;
        }
        self.last_bits = b;
        self.last = Some(now);
        self.rejection = None;
    }

    fn reject(&mut self, now: Millis, f: Fault) {
        self.last = Some(now);
        self.rejection = Some(f);
    }

    fn faults(
        &self,
        set: &mut FaultSet,
        sensor: Sensor,
        now: Millis,
        start: Millis,
        limits: FaultLimits,
    ) {
        if let Some(f) = self.rejection {
            set.push(f);
        }
        let silent_ms = now.since(self.last.unwrap_or(start));
        if silent_ms > limits.stale_ms {
            set.push(Fault::Stale { sensor, silent_ms });
        }
        if let Some(last) = self.last {
            let unchanged_ms = last.since(self.same_since);
            if limits.stuck_ms.is_some_and(|limit| unchanged_ms > limit) {
                set.push(Fault::Stuck {
                    sensor,
                    unchanged_ms,
                });
            }
        }
    }
}

/// The configuration's stale and stuck times in whole ms (`s_to_ms`; no
/// stuck limit when `stuck_after_s` is 0).
#[derive(Clone, Copy, Debug)]
struct FaultLimits {
    stale_ms: u64,
    stuck_ms: Option<u64>,
}

impl FaultLimits {
    fn of(c: &WindConfig) -> FaultLimits {
        FaultLimits {
            stale_ms: s_to_ms(c.stale_after_s),
            stuck_ms: (c.stuck_after_s > 0.0).then(|| s_to_ms(c.stuck_after_s)),
        }
    }
}

fn check_speed(speed_mps: f32, c: &WindConfig) -> Result<f32, Fault> {
    let sensor = Sensor::WindSpeed;
    if !speed_mps.is_finite() {
        Err(Fault::NotFinite { sensor })
    } else if !(0.0..=c.max_speed_mps).contains(&speed_mps) {
        Err(Fault::OutOfRange {
            sensor,
            value: speed_mps,
        })
    } else {
        Ok(speed_mps)
    }
}

fn check_direction(from_rad: f32) -> Result<f32, Fault> {
    let sensor = Sensor::WindDirection;
    if !from_rad.is_finite() {
        Err(Fault::NotFinite { sensor })
    } else if !(0.0..=TAU).contains(&from_rad) {
        Err(Fault::OutOfRange {
            sensor,
            value: from_rad,
        })
    } else {
        Ok(from_rad)
    }
}

/// Wind statistics from speed and direction samples at any rate.
///
/// Memory: `core::mem::size_of::<WindStats>()` is a compile-time constant
/// below 3 KiB (2800 bytes on x86-64: 12 fine bins, 60 coarse bins and the configuration;
/// checked by a unit test); nothing is allocated.
#[derive(Clone, Debug)]
pub struct WindStats {
    config: WindConfig,
    height_factor: f32,
    start: Millis,
    first_sample: Option<Millis>,
    last_sample: Option<Millis>,
    /// Absolute number of the newest fine bin holding data.
    newest_fine: Option<u64>,
    fine: [FineBin; FINE_BINS],
    coarse: [CoarseBin; COARSE_BINS],
    latest_gust_mps: Option<f32>,
    speed: Channel,
    direction: Channel,
    /// Fault time limits, computed once from the configuration.
    limits: FaultLimits,
}

impl WindStats {
    /// Statistics started at `now` (stale time counts from here).
    ///
    /// # Errors
    /// As [`WindConfig::validate`].
    pub fn new(config: WindConfig, now: Millis) -> Result<Self, Error> {
        config.validate()?;
        Ok(WindStats {
            config,
            height_factor: config.height_factor()?,
            start: now,
            first_sample: None,
            last_sample: None,
            newest_fine: None,
            fine: [FineBin {
                id: u64::MAX,
                ..FineBin::default()
            }; FINE_BINS],
            coarse: [CoarseBin::empty(u64::MAX); COARSE_BINS],
            latest_gust_mps: None,
            speed: Channel::new(now),
            direction: Channel::new(now),
            limits: FaultLimits::of(&config),
        })
    }

    /// The configuration in use.
    #[must_use]
    pub fn config(&self) -> &WindConfig {
        &self.config
    }

    /// The height factor applied to every speed (anemometer → rig).
    #[must_use]
    pub fn height_factor(&self) -> f32 {
        self.height_factor
    }

    /// Feeds one sample taken at `now`: speed at the anemometer in m/s and,
    /// if the source has one, the direction the wind blows *from* in radians
    /// from north clockwise, 0 to 2π.
    ///
    /// # Errors
    /// The rejected part and the reason: [`Fault::TimeReversed`] (whole
    /// sample dropped), [`Fault::NotFinite`] or [`Fault::OutOfRange`] of the
    /// speed (whole sample dropped) or of the direction (the speed is still
    /// used, the direction dropped).
    pub fn push(
        &mut self,
        now: Millis,
        speed_mps: f32,
        from_rad: Option<f32>,
    ) -> Result<(), Fault> {
        if self.last_sample.is_some_and(|t| now < t) {
            return Err(Fault::TimeReversed {
                sensor: Sensor::WindSpeed,
            });
        }
        self.last_sample = Some(now);
        let speed = match check_speed(speed_mps, &self.config) {
            Ok(s) => s,
            Err(f) => {
                self.speed.reject(now, f);
                return Err(f);
            }
        };
        self.speed.accept(now, speed, speed > 0.0);
        let calm = speed < self.config.calm_below_mps;
        let dir = match from_rad.map(check_direction) {
            Some(Ok(d)) => {
                self.direction.accept(now, d, !calm);
                Ok(Some(d))
            }
            Some(Err(f)) => {
                self.direction.reject(now, f);
                Err(f)
            }
            None => Ok(None),
        };
        self.add(now, speed * self.height_factor, calm, dir.unwrap_or(None));
        dir.map(|_| ())
    }

    fn add(&mut self, now: Millis, v_mps: f32, calm: bool, from_rad: Option<f32>) {
        if self.first_sample.is_none() {
            self.first_sample = Some(now);
        }
        let b = now.0 / FINE_BIN_MS;
        if let Some(c) = self.newest_fine {
            if b > c {
                // Close the boundaries after bins c ..= b−1 (at most 12 can
                // still hold data in their window).
                let last = (b - 1).min(c.saturating_add(11));
                let mut k = c;
                while k <= last {
                    if let Some(m) = self.fine_mean_ending(k) {
                        self.record_gust(k, m);
                    }
                    k = k.saturating_add(1);
                }
            }
        }
        if self.newest_fine.is_none_or(|c| b >= c) {
            self.newest_fine = Some(b);
        }
        if let Some(f) = self.fine.get_mut(slot(b, FINE_BINS)) {
            if f.id != b {
                *f = FineBin {
                    id: b,
                    sum_mps: 0.0,
                    count: 0,
                };
            }
            f.sum_mps += v_mps;
            f.count = f.count.saturating_add(1);
        }
        let cb = self.coarse_mut(now.0 / COARSE_BIN_MS);
        if let Some(cb) = cb {
            cb.sum_mps += v_mps;
            cb.count = cb.count.saturating_add(1);
            if calm {
                cb.calm_count = cb.calm_count.saturating_add(1);
            } else if let Some(d) = from_rad {
                cb.dir_sin += math::sin(d);
                cb.dir_cos += math::cos(d);
                cb.dir_count = cb.dir_count.saturating_add(1);
            }
        }
    }

    /// The coarse bin of absolute number `id`, emptied first if its slot
    /// held an older bin.
    fn coarse_mut(&mut self, id: u64) -> Option<&mut CoarseBin> {
        let cb = self.coarse.get_mut(slot(id, COARSE_BINS))?;
        if cb.id != id {
            *cb = CoarseBin::empty(id);
        }
        Some(cb)
    }

    /// Mean of the samples in fine bins k−11 ..= k, if the record already
    /// spans the whole window and the window holds a sample.
    fn fine_mean_ending(&self, k: u64) -> Option<f32> {
        let first = self.first_sample?.0 / FINE_BIN_MS;
        let n = u64::try_from(FINE_BINS).unwrap_or(12);
        if k < first.saturating_add(n - 1) {
            return None;
        }
        let lo = k.saturating_add(1).saturating_sub(n);
        let (sum, count) = self
            .fine
            .iter()
            .filter(|f| f.id >= lo && f.id <= k)
            .fold((0.0_f32, 0_u32), |(s, c), f| {
                (s + f.sum_mps, c.saturating_add(f.count))
            });
        (count > 0).then(|| sum / count_f32(count))
    }

    fn record_gust(&mut self, k: u64, m: f32) {
        self.latest_gust_mps = Some(m);
        if let Some(cb) = self.coarse_mut(k.saturating_mul(FINE_BIN_MS) / COARSE_BIN_MS) {
            if m > cb.gust_max_mps {
                cb.gust_max_mps = m;
            }
        }
    }

    /// Coarse bins within the last `n` bins up to and including the one
    /// containing `now`.
    fn recent(&self, now: Millis, n: u64) -> impl Iterator<Item = &CoarseBin> {
        let cur = now.0 / COARSE_BIN_MS;
        let lo = cur.saturating_add(1).saturating_sub(n);
        self.coarse
            .iter()
            .filter(move |b| b.id >= lo && b.id <= cur)
    }

    /// The latest 3-s running mean at rig height as of `now`, m/s: the
    /// same value as [`WindReport::gust_3s_mps`] of [`WindStats::report`]
    /// at `now`, without the rest of the report (a dozen bins summed
    /// instead of the peak, mean and direction windows). `None` with no
    /// sample in the last 3 s or before 3 s of record.
    #[must_use]
    pub fn gust_3s_mps(&self, now: Millis) -> Option<f32> {
        let now_bin = now.0 / FINE_BIN_MS;
        match self.newest_fine {
            Some(c) if now_bin >= c => self.fine_mean_ending(now_bin),
            _ => None,
        }
    }

    /// The statistics as of `now` (normally the time of the latest sample).
    #[must_use]
    pub fn report(&self, now: Millis) -> WindReport {
        // 3-s means at the boundaries not yet closed by a later sample.
        let now_bin = now.0 / FINE_BIN_MS;
        let mut gust_now = None;
        let mut open_peak: Option<f32> = None;
        if let Some(c) = self.newest_fine {
            let last = now_bin.min(c.saturating_add(11));
            let mut k = c;
            while k <= last {
                if let Some(m) = self.fine_mean_ending(k) {
                    open_peak = Some(open_peak.map_or(m, |p| p.max(m)));
                }
                k = k.saturating_add(1);
            }
            if now_bin >= c {
                gust_now = self.fine_mean_ending(now_bin);
            }
        }
        let peak_n = coarse_bins_for(self.config.peak_window_s);
        let closed_peak = self
            .recent(now, peak_n)
            .map(|b| b.gust_max_mps)
            .filter(|g| *g >= 0.0)
            .fold(None, |acc: Option<f32>, g| {
                Some(acc.map_or(g, |a| a.max(g)))
            });
        let peak = match (closed_peak, open_peak) {
            (Some(a), Some(b)) => Some(a.max(b)),
            (a, b) => a.or(b),
        };
        let mean_n = MEAN_WINDOW_MS / COARSE_BIN_MS;
        let (sum, count) = self
            .recent(now, mean_n)
            .fold((0.0_f32, 0_u32), |(s, c), b| {
                (s + b.sum_mps, c.saturating_add(b.count))
            });
        let mean = (count > 0).then(|| sum / count_f32(count));
        let mean_span_s = self
            .first_sample
            .map_or(0.0, |f| ms_to_s(now.since(f).min(MEAN_WINDOW_MS)));
        let gust_factor = match (peak, mean) {
            (Some(p), Some(m)) if m >= self.config.calm_below_mps && m > 0.0 => Some(p / m),
            _ => None,
        };
        WindReport {
            gust_3s_mps: gust_now,
            peak_gust_mps: peak,
            mean_10min_mps: mean,
            mean_span_s,
            gust_factor,
            direction: self.direction_summary(now),
            basis: GustBasis::Measured,
        }
    }

    fn direction_summary(&self, now: Millis) -> WindDirection {
        let n = coarse_bins_for(self.config.direction_window_s);
        let (mut count, mut calm, mut dn) = (0_u32, 0_u32, 0_u32);
        let (mut s, mut c) = (0.0_f32, 0.0_f32);
        for b in self.recent(now, n) {
            count = count.saturating_add(b.count);
            calm = calm.saturating_add(b.calm_count);
            dn = dn.saturating_add(b.dir_count);
            s += b.dir_sin;
            c += b.dir_cos;
        }
        if count == 0 {
            return WindDirection::NoData;
        }
        if calm.saturating_mul(2) > count {
            return WindDirection::Calm;
        }
        if dn == 0 {
            return WindDirection::Unknown;
        }
        let (from_rad, spread_rad, resultant_length) = circular_stats(s, c, dn);
        if spread_rad > self.config.variable_spread_rad {
            WindDirection::Variable {
                from_rad,
                spread_rad,
                resultant_length,
            }
        } else {
            WindDirection::Defined {
                from_rad,
                spread_rad,
                resultant_length,
            }
        }
    }

    /// The faults active at `now`: rejected latest samples, stale or stuck
    /// speed and direction channels.
    #[must_use]
    pub fn faults(&self, now: Millis) -> FaultSet {
        let mut set = FaultSet::new();
        self.faults_into(now, &mut set);
        set
    }

    /// Adds the faults of [`WindStats::faults`] to `set` (no set built and
    /// copied on every step).
    pub(crate) fn faults_into(&self, now: Millis, set: &mut FaultSet) {
        let c = &self.config;
        let l = self.limits;
        self.speed
            .faults(set, Sensor::WindSpeed, now, self.start, l);
        if c.expect_direction {
            self.direction
                .faults(set, Sensor::WindDirection, now, self.start, l);
        } else if let Some(f) = self.direction.rejection {
            set.push(f);
        }
    }
}

/// `u32 → f32`; exact below 2²⁴, nearest above (counts here stay far below).
#[allow(clippy::cast_precision_loss)]
fn count_f32(n: u32) -> f32 {
    n as f32
}

/// Circular mean direction (radians, [0, 2π)), circular standard deviation
/// √(−2 ln R̄) (radians) and mean resultant length R̄ from sums of sin and
/// cos over `n` unit vectors (Mardia & Jupp, *Directional Statistics*, 2000,
/// §2.2–2.3, from memory).
fn circular_stats(sum_sin: f32, sum_cos: f32, n: u32) -> (f32, f32, f32) {
    let r = math::clamp(
        math::hypot(sum_sin, sum_cos) / count_f32(n.max(1)),
        0.0,
        1.0,
    );
    let mean = math::wrap_tau(math::atan2(sum_sin, sum_cos));
    let spread = if r > 0.0 {
        math::sqrt((-2.0 * math::ln(r)).max(0.0))
    } else {
        f32::INFINITY
    };
    (mean, spread, r)
}

/// Wind from a source that gives only mean speeds (for example 10-minute
/// statistics of a remote station): the gust is the mean times the
/// configured gust factor (`mean_gust_factor`, chosen by terrain).
///
/// Memory: a compile-time constant below 192 bytes; nothing is allocated.
#[derive(Clone, Debug)]
pub struct MeanWind {
    config: WindConfig,
    height_factor: f32,
    start: Millis,
    latest: Option<(Millis, f32)>,
    latest_from_rad: Option<f32>,
    speed: Channel,
    direction: Channel,
}

impl MeanWind {
    /// A mean-only source started at `now`.
    ///
    /// # Errors
    /// As [`WindConfig::validate`].
    pub fn new(config: WindConfig, now: Millis) -> Result<Self, Error> {
        config.validate()?;
        Ok(MeanWind {
            config,
            height_factor: config.height_factor()?,
            start: now,
            latest: None,
            latest_from_rad: None,
            speed: Channel::new(now),
            direction: Channel::new(now),
        })
    }

    /// Feeds one reported 10-minute mean speed at the anemometer (m/s) and,
    /// if given, its mean from-direction (radians from north clockwise).
    ///
    /// # Errors
    /// As [`WindStats::push`].
    pub fn push(&mut self, now: Millis, mean_mps: f32, from_rad: Option<f32>) -> Result<(), Fault> {
        if self.latest.is_some_and(|(t, _)| now < t) {
            return Err(Fault::TimeReversed {
                sensor: Sensor::WindSpeed,
            });
        }
        let mean = match check_speed(mean_mps, &self.config) {
            Ok(m) => m,
            Err(f) => {
                self.speed.reject(now, f);
                return Err(f);
            }
        };
        self.speed.accept(now, mean, mean > 0.0);
        self.latest = Some((now, mean * self.height_factor));
        let calm = mean < self.config.calm_below_mps;
        match from_rad.map(check_direction) {
            Some(Ok(d)) => {
                self.direction.accept(now, d, !calm);
                self.latest_from_rad = Some(d);
                Ok(())
            }
            Some(Err(f)) => {
                self.direction.reject(now, f);
                self.latest_from_rad = None;
                Err(f)
            }
            None => {
                self.latest_from_rad = None;
                Ok(())
            }
        }
    }

    /// The estimate from the latest mean (stale data is flagged by
    /// [`MeanWind::faults`], not hidden here).
    #[must_use]
    pub fn report(&self, _now: Millis) -> WindReport {
        let factor = self.config.mean_gust_factor;
        let mean = self.latest.map(|(_, m)| m);
        let gust = mean.map(|m| gust_from_mean(m, factor));
        let direction = match (mean, self.latest_from_rad) {
            (None, _) => WindDirection::NoData,
            (Some(m), _) if m < self.config.calm_below_mps * self.height_factor => {
                WindDirection::Calm
            }
            (Some(_), Some(d)) => WindDirection::Reported { from_rad: d },
            (Some(_), None) => WindDirection::Unknown,
        };
        WindReport {
            gust_3s_mps: gust,
            peak_gust_mps: gust,
            mean_10min_mps: mean,
            mean_span_s: if mean.is_some() { 600.0 } else { 0.0 },
            gust_factor: mean.map(|_| factor),
            direction,
            basis: GustBasis::FromMean { factor },
        }
    }

    /// The faults active at `now` (as [`WindStats::faults`]).
    #[must_use]
    pub fn faults(&self, now: Millis) -> FaultSet {
        let mut set = FaultSet::new();
        let c = &self.config;
        let l = FaultLimits::of(c);
        self.speed
            .faults(&mut set, Sensor::WindSpeed, now, self.start, l);
        if c.expect_direction {
            self.direction
                .faults(&mut set, Sensor::WindDirection, now, self.start, l);
        } else if let Some(f) = self.direction.rejection {
            set.push(f);
        }
        set
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn sizes_are_fixed_and_small() {
        assert!(core::mem::size_of::<WindStats>() <= 3072);
        assert!(core::mem::size_of::<MeanWind>() <= 192);
    }

    #[test]
    fn slot_wraps() {
        assert_eq!(slot(12, FINE_BINS), 0);
        assert_eq!(slot(61, COARSE_BINS), 1);
        assert_eq!(coarse_bins_for(600.0), 60);
        assert_eq!(coarse_bins_for(15.0), 2);
        assert_eq!(coarse_bins_for(0.0), 1);
    }
}
