//! A bounded time series of a replay, for the report's charts.
//!
//! The replay pushes every verdict; the series keeps per-interval buckets
//! (the highest utilisations, gust and tilt, the mean wind, the direction of
//! the highest gust, the most severe level). Buckets start [`FIRST_WIDTH_S`]
//! wide; whenever a record would open bucket number [`MAX_SERIES_POINTS`],
//! neighbouring buckets are merged in pairs and the width doubles. So the
//! series never holds more than [`MAX_SERIES_POINTS`] buckets, whatever the
//! log's length, and a log of length T ends with buckets between T/2000 and
//! T/1000 wide (at least [`FIRST_WIDTH_S`]).
//!
//! Times are seconds since the first record; utilisations are
//! dimensionless (1.0 is the limit); speeds m/s; angles degrees (wind from,
//! clockwise from north; tilt from the vertical).

use serde::Serialize;
use standfast::guard::{AlertLevel, Verdict};

use crate::model::figures::Figures;

/// Most buckets a series holds.
pub const MAX_SERIES_POINTS: usize = 2000;

/// Width of the buckets at the start, seconds.
pub const FIRST_WIDTH_S: f64 = 1.0;

/// One bucket of the series.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct SeriesPoint {
    /// Start of the bucket, seconds since the first record.
    pub t_start_s: f64,
    /// Time of the bucket's last record, seconds since the first record.
    pub t_last_s: f64,
    /// The extremes of the bucket's verdicts ([`Figures::keep_extremes`]):
    /// the highest utilisations, gust (with its direction, degrees from 0
    /// to 360 clockwise from north) and tilt, the lowest tip wind speed.
    pub peak: Figures,
    /// Highest wind speed held at a record (the anemometer's highest
    /// sample), m/s.
    pub wind_max_mps: Option<f32>,
    /// Sum of the wind speeds held at each record, m/s (for the mean).
    wind_sum_mps: f64,
    /// Records with a wind speed.
    wind_n: u32,
    /// Cover state: fitted when it was fitted at any record of the bucket,
    /// off when known and never fitted, `None` when no record knew it.
    pub cover: Option<bool>,
    /// The pose's first angle at the bucket's last record, degrees: hour
    /// angle (positive west), azimuth, or the primary axis angle, as
    /// [`Series::pose_frame`] says.
    pub pose_a_deg: Option<f32>,
    /// The pose's second angle at the bucket's last record, degrees:
    /// declination, altitude, or the secondary axis angle.
    pub pose_b_deg: Option<f32>,
    /// Most severe level in the bucket.
    pub level: AlertLevel,
    /// Records in the bucket.
    pub records: u32,
}

impl SeriesPoint {
    fn empty(t_start_s: f64, t_s: f64) -> SeriesPoint {
        SeriesPoint {
            t_start_s,
            t_last_s: t_s,
            peak: Figures::default(),
            wind_max_mps: None,
            wind_sum_mps: 0.0,
            wind_n: 0,
            cover: None,
            pose_a_deg: None,
            pose_b_deg: None,
            level: AlertLevel::Clear,
            records: 0,
        }
    }

    /// Mean of the wind speed held at the bucket's records, m/s.
    #[must_use]
    pub fn wind_mean_mps(&self) -> Option<f32> {
        if self.wind_n == 0 {
            None
        } else {
            #[allow(clippy::cast_possible_truncation)] // m/s fit f32
            Some((self.wind_sum_mps / f64::from(self.wind_n)) as f32)
        }
    }

    fn merge(&mut self, o: &SeriesPoint) {
        self.t_last_s = self.t_last_s.max(o.t_last_s);
        self.peak.keep_extremes(&o.peak);
        self.wind_max_mps = hi(self.wind_max_mps, o.wind_max_mps);
        self.wind_sum_mps += o.wind_sum_mps;
        self.wind_n = self.wind_n.saturating_add(o.wind_n);
        self.cover = match (self.cover, o.cover) {
            (Some(a), Some(b)) => Some(a || b),
            (a, b) => a.or(b),
        };
        if o.pose_a_deg.is_some() {
            self.pose_a_deg = o.pose_a_deg;
            self.pose_b_deg = o.pose_b_deg;
        }
        self.level = self.level.max(o.level);
        self.records = self.records.saturating_add(o.records);
    }
}

/// The higher of two optional values (a finite value beats `None`).
fn hi(a: Option<f32>, b: Option<f32>) -> Option<f32> {
    match (a, b.filter(|x| x.is_finite())) {
        (Some(x), Some(y)) => Some(if y > x { y } else { x }),
        (None, y) => y,
        (x, None) => x,
    }
}

/// A pose's frame and its two angles in degrees (hour angle positive west
/// and declination; azimuth and altitude; primary and secondary axis).
#[must_use]
pub fn pose_angles_deg(p: &standfast::mount::Pose) -> (&'static str, f32, f32) {
    use standfast::mount::Pose;
    match *p {
        Pose::Axes {
            primary_rad,
            secondary_rad,
        } => ("axes", primary_rad.to_degrees(), secondary_rad.to_degrees()),
        Pose::Equatorial {
            hour_angle_rad,
            declination_rad,
            ..
        } => (
            "equatorial",
            hour_angle_rad.to_degrees(),
            declination_rad.to_degrees(),
        ),
        Pose::Horizontal {
            azimuth_rad,
            altitude_rad,
            ..
        } => (
            "horizontal",
            azimuth_rad.to_degrees(),
            altitude_rad.to_degrees(),
        ),
    }
}

/// The bounded series of one rig in a replay.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Series {
    /// Width of every bucket, seconds.
    pub width_s: f64,
    /// Buckets with at least one record, in time order.
    pub points: Vec<SeriesPoint>,
    /// Index (`t_start_s / width_s`) of the last bucket.
    last_index: u64,
    /// Highest overturning utilisation pushed (strictly rising, as the
    /// replay's closest approach).
    top_overturning: Option<f32>,
    /// Cover state held at the record of the highest overturning utilisation.
    pub cover_at_closest: Option<bool>,
    /// A wind gap is longer than this without an anemometer sample, seconds
    /// (the rig's `wind_stale`, the guard's own limit).
    pub wind_gap_s: f64,
    /// Time of the last anemometer sample, seconds since the first record.
    last_wind_t_s: Option<f64>,
    /// Intervals `(from, to)` without an anemometer sample for longer than
    /// `wind_gap_s`, in time order; at most [`MAX_WIND_GAPS`] kept.
    pub wind_gaps: Vec<(f64, f64)>,
    /// Wind gaps beyond [`MAX_WIND_GAPS`], counted.
    pub wind_gaps_not_kept: u64,
    /// The frame of the pose angles: `equatorial`, `horizontal` or `axes`
    /// (the first pose's; a pose in another frame is not charted).
    pub pose_frame: Option<&'static str>,
}

/// Most wind gaps a series keeps.
pub const MAX_WIND_GAPS: usize = 200;

impl Default for Series {
    fn default() -> Self {
        Series::new()
    }
}

impl Series {
    /// An empty series; wind gaps longer than 10 s are kept (the core's
    /// default `wind_stale`).
    #[must_use]
    pub fn new() -> Series {
        Series::with_wind_gap(10.0)
    }

    /// An empty series keeping wind gaps longer than `wind_gap_s` seconds.
    #[must_use]
    pub fn with_wind_gap(wind_gap_s: f64) -> Series {
        Series {
            width_s: FIRST_WIDTH_S,
            points: Vec::with_capacity(MAX_SERIES_POINTS),
            last_index: 0,
            top_overturning: None,
            cover_at_closest: None,
            wind_gap_s,
            last_wind_t_s: None,
            wind_gaps: Vec::new(),
            wind_gaps_not_kept: 0,
            pose_frame: None,
        }
    }

    fn index_of(&self, t_s: f64) -> u64 {
        let k = (t_s.max(0.0) / self.width_s).floor();
        // Saturating float-to-int conversion; times are far below 2^53 s.
        #[allow(clippy::cast_possible_truncation, clippy::cast_sign_loss)]
        let k = k as u64;
        k
    }

    /// Merges buckets in pairs and doubles the width.
    fn coarsen(&mut self) {
        self.width_s *= 2.0;
        let mut merged: Vec<SeriesPoint> = Vec::with_capacity(MAX_SERIES_POINTS);
        let mut last: Option<u64> = None;
        for p in &self.points {
            let k = self.index_of(p.t_start_s);
            match merged.last_mut() {
                Some(m) if last == Some(k) => m.merge(p),
                _ => {
                    #[allow(clippy::cast_precision_loss)] // k < 2^53
                    let start = k as f64 * self.width_s;
                    let mut m = SeriesPoint::empty(start, p.t_last_s);
                    m.merge(p);
                    merged.push(m);
                    last = Some(k);
                }
            }
        }
        self.last_index = last.unwrap_or(0);
        self.points = merged;
    }

    /// Adds one verdict at `t_s` seconds since the first record, with the
    /// anemometer's sample at that record (m/s; `None` when the record has
    /// no new one) and the cover state held then.
    pub fn push(&mut self, t_s: f64, v: &Verdict, wind_mps: Option<f64>, cover: Option<bool>) {
        let mut k = self.index_of(t_s);
        while k >= MAX_SERIES_POINTS as u64 {
            self.coarsen();
            k = self.index_of(t_s);
        }
        if self.points.is_empty() || k != self.last_index {
            #[allow(clippy::cast_precision_loss)] // k < 2000
            let start = k as f64 * self.width_s;
            self.points.push(SeriesPoint::empty(start, t_s));
            self.last_index = k;
        }
        if let Some(u) = v.overturning_utilisation.filter(|u| u.is_finite()) {
            if self.top_overturning.is_none_or(|t| u > t) {
                self.top_overturning = Some(u);
                self.cover_at_closest = cover;
            }
        }
        let Some(p) = self.points.last_mut() else {
            return;
        };
        p.t_last_s = t_s;
        p.records = p.records.saturating_add(1);
        let mut f = Figures::of(v);
        f.wind_from_deg = f.wind_from_deg.map(|d| d.rem_euclid(360.0));
        p.peak.keep_extremes(&f);
        if let Some(w) = wind_mps.filter(|w| w.is_finite()) {
            if let Some(last) = self.last_wind_t_s {
                if t_s - last > self.wind_gap_s {
                    if self.wind_gaps.len() < MAX_WIND_GAPS {
                        self.wind_gaps.push((last, t_s));
                    } else {
                        self.wind_gaps_not_kept = self.wind_gaps_not_kept.saturating_add(1);
                    }
                }
            }
            self.last_wind_t_s = Some(t_s);
            #[allow(clippy::cast_possible_truncation)] // m/s fit f32
            let w32 = w as f32;
            p.wind_max_mps = hi(p.wind_max_mps, Some(w32));
            p.wind_sum_mps += w;
            p.wind_n = p.wind_n.saturating_add(1);
        }
        if let Some(c) = cover {
            p.cover = Some(p.cover.unwrap_or(false) || c);
        }
        let (frame, a, b) = pose_angles_deg(&v.pose);
        if *self.pose_frame.get_or_insert(frame) == frame {
            p.pose_a_deg = Some(a);
            p.pose_b_deg = Some(b);
        }
        p.level = p.level.max(v.level);
    }
}
