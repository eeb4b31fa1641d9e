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
use standfast::TiltReading;

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

/// The bits of a verdict's figures other than the tilt, as it gives them
/// (radians): they change only when the guard evaluates. Bits, not values,
/// so that a repeated NaN compares equal.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
struct Evaluated([u64; 10]);

impl Evaluated {
    fn of(v: &Verdict) -> Evaluated {
        // `None` is 2^32, which no `f32`'s bits are.
        let b = |x: Option<f32>| x.map_or(1 << 32, |x| u64::from(x.to_bits()));
        let drive = v.drive_utilisation;
        Evaluated([
            b(v.overturning_utilisation),
            b(v.predicted_utilisation),
            b(v.sliding_utilisation),
            b(drive.map(|d| d[0])),
            b(drive.map(|d| d[1])),
            b(v.tip_wind_mps),
            b(v.gust_mps),
            b(v.predicted_gust_mps),
            b(v.wind_from_rad),
            b(v.tilt_margin_rad),
        ])
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
    /// The last bucket's time range `[start, end)`, seconds: a record in it
    /// falls in the last bucket (exact: the width is a power of two times
    /// [`FIRST_WIDTH_S`], so `k * width_s` and the division are exact).
    #[serde(skip)]
    last_range_s: (f64, f64),
    /// The verdict figures other than the tilt last taken into the last
    /// bucket: a verdict that did not evaluate repeats them, and taking them
    /// again changes nothing ([`Figures::keep_extremes`] is idempotent), so
    /// only its tilt is compared.
    #[serde(skip)]
    last_evaluated: Option<Evaluated>,
    /// The pose last charted in the last bucket.
    #[serde(skip)]
    last_pose: Option<standfast::mount::Pose>,
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
    /// Of the tilt readings taken into the last bucket whose angle was
    /// computed, the steepest, with that angle in degrees. The bucket's
    /// highest tilt is at least that angle and only rises while the bucket
    /// is the last (a coarsening merges it into a wider one), so a reading
    /// [certainly less steep](TiltReading::certainly_less_steep_than) than
    /// this one cannot be the new highest: its angles are not computed.
    /// Reset when a new bucket opens.
    #[serde(skip)]
    tilt_screen: Option<(TiltReading, f32)>,
}

/// Makes `(r, deg)` the series' tilt screen when it is steeper than the
/// screen's (or there is none): `deg` is `r`'s magnitude in degrees, as
/// computed for the chart.
fn screen_with(screen: &mut Option<(TiltReading, f32)>, r: TiltReading, deg: f32) {
    if screen.is_none_or(|(_, d)| deg > d) {
        *screen = Some((r, deg));
    }
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
            last_range_s: (0.0, 0.0),
            last_evaluated: None,
            last_pose: None,
            top_overturning: None,
            cover_at_closest: None,
            wind_gap_s,
            last_wind_t_s: None,
            wind_gaps: Vec::new(),
            wind_gaps_not_kept: 0,
            pose_frame: None,
            tilt_screen: None,
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
    ///
    /// The common record (in the last bucket, between evaluations, no
    /// anemometer sample, the same pose) takes only this function's own
    /// lines; the rest is in helpers kept out of line, so that the common
    /// path stays short (and is inlined into the replay's loop).
    #[inline]
    pub fn push(&mut self, t_s: f64, v: &Verdict, wind_mps: Option<f64>, cover: Option<bool>) {
        let (lo, hi_s) = self.last_range_s;
        // In the last bucket (a NaN time takes the general path).
        if self.points.is_empty() || !(t_s >= lo && t_s < hi_s) {
            self.open_bucket_for(t_s);
        }
        // Between evaluations a verdict repeats the figures of the one
        // before (the core's contract for `Verdict::evaluated`, checked in
        // debug builds), which this bucket, and the highest overturning
        // utilisation, have taken already.
        let repeated = !v.evaluated && self.last_evaluated.is_some();
        debug_assert!(!repeated || self.last_evaluated == Some(Evaluated::of(v)));
        if !repeated {
            self.take_figures(v, cover);
        }
        if let Some(w) = wind_mps.filter(|w| w.is_finite()) {
            self.take_wind(t_s, w);
        }
        // The same pose as the bucket's last record's charts the same angles.
        if self.last_pose != Some(v.pose) {
            self.take_pose(v.pose);
        }
        let Some(p) = self.points.last_mut() else {
            return;
        };
        p.t_last_s = t_s;
        p.records = p.records.saturating_add(1);
        if repeated {
            // The tilt's angles only for a reading that may be the
            // bucket's highest (`tilt_screen`).
            if let Some(r) = &v.tilt {
                let screened = self
                    .tilt_screen
                    .is_some_and(|(s, _)| r.certainly_less_steep_than(&s));
                if !screened {
                    let deg = r.magnitude_rad().to_degrees();
                    p.peak.keep_higher_tilt(Some(deg), || {
                        Some(r.downhill_azimuth_rad().to_degrees())
                    });
                    screen_with(&mut self.tilt_screen, *r, deg);
                }
            }
        }
        if let Some(c) = cover {
            p.cover = Some(p.cover.unwrap_or(false) || c);
        }
        p.level = p.level.max(v.level);
    }

    /// The figures of an evaluating verdict `v` (or the first of the last
    /// bucket), with the cover state held then: the highest overturning
    /// utilisation and the last bucket's extremes.
    #[cold]
    #[inline(never)]
    fn take_figures(&mut self, v: &Verdict, cover: Option<bool>) {
        if let Some(u) = v.overturning_utilisation.filter(|u| u.is_finite()) {
            if self.top_overturning.is_none_or(|t| u > t) {
                self.top_overturning = Some(u);
                self.cover_at_closest = cover;
            }
        }
        let mut f = Figures::of(v);
        f.wind_from_deg = f.wind_from_deg.map(|d| d.rem_euclid(360.0));
        if let Some(p) = self.points.last_mut() {
            p.peak.keep_extremes(&f);
        }
        if let (Some(r), Some(deg)) = (v.tilt, f.tilt_deg) {
            screen_with(&mut self.tilt_screen, r, deg);
        }
        self.last_evaluated = Some(Evaluated::of(v));
    }

    /// An anemometer sample `w` (m/s, finite) at `t_s`: the wind gap it
    /// ends, if any, and the last bucket's wind figures.
    #[cold]
    #[inline(never)]
    fn take_wind(&mut self, t_s: f64, w: f64) {
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
        if let Some(p) = self.points.last_mut() {
            #[allow(clippy::cast_possible_truncation)] // m/s fit f32
            let w32 = w as f32;
            p.wind_max_mps = hi(p.wind_max_mps, Some(w32));
            p.wind_sum_mps += w;
            p.wind_n = p.wind_n.saturating_add(1);
        }
    }

    /// A pose other than the last bucket's last one: its angles, when in
    /// the series' frame.
    #[cold]
    #[inline(never)]
    fn take_pose(&mut self, pose: standfast::mount::Pose) {
        self.last_pose = Some(pose);
        let (frame, a, b) = pose_angles_deg(&pose);
        if *self.pose_frame.get_or_insert(frame) == frame {
            if let Some(p) = self.points.last_mut() {
                p.pose_a_deg = Some(a);
                p.pose_b_deg = Some(b);
            }
        }
    }

    /// Makes the bucket of a record at `t_s` the last one: coarsens until its
    /// index fits, and opens it unless it is the last one already. What was
    /// taken into the previous last bucket is forgotten.
    #[cold]
    #[inline(never)]
    fn open_bucket_for(&mut self, t_s: f64) {
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
            self.tilt_screen = None;
        }
        #[allow(clippy::cast_precision_loss)] // k < 2000
        let start = self.last_index as f64 * self.width_s;
        self.last_range_s = (start, start + self.width_s);
        self.last_evaluated = None;
        self.last_pose = None;
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use proptest::prelude::*;
    use standfast::sense::FaultSet;
    use standfast::{Millis, PierSide, Pose, Vec3};

    /// The reading of a tilt of `m` rad falling away toward `a` rad: the
    /// specific force (−sin m sin a, −sin m cos a, cos m).
    fn reading(m: f32, a: f32) -> Option<TiltReading> {
        let (sm, cm) = m.sin_cos();
        let (sa, ca) = a.sin_cos();
        TiltReading::of_specific_force(Vec3::new(-sm * sa, -sm * ca, cm))
    }

    /// A verdict as the guard gives it: `figures` stands for everything an
    /// evaluation sets, the tilt and pose for what changes every step.
    fn verdict(
        figures: u8,
        evaluated: bool,
        tilt: Option<(f32, f32)>,
        pose: u8,
        level: u8,
    ) -> Verdict {
        let f = f32::from(figures);
        let some = |x: f32| (figures % 7 != 0).then_some(x);
        Verdict {
            now: Millis(0),
            level: LEVELS[usize::from(level) % LEVELS.len()],
            overturning_utilisation: some(f / 40.0),
            predicted_utilisation: some(f / 30.0),
            sliding_utilisation: if figures % 5 == 0 {
                Some(f32::NAN)
            } else {
                some(f / 50.0)
            },
            drive_utilisation: some(f / 60.0).map(|d| [d, 1.0 - d]),
            tip_wind_mps: some(40.0 - f),
            gust_mps: some(f / 3.0),
            predicted_gust_mps: some(f / 2.0),
            wind_from_rad: some(f * 0.9 - 3.0),
            tilt: tilt.and_then(|(m, a)| reading(m, a)),
            tilt_margin_rad: some(0.3 - f / 1000.0),
            tilt_drift_rad_per_s: 0.0,
            pose: match pose % 3 {
                0 => Pose::Axes {
                    primary_rad: f32::from(pose) / 10.0,
                    secondary_rad: 0.2,
                },
                1 => Pose::Equatorial {
                    hour_angle_rad: f32::from(pose) / 20.0,
                    declination_rad: 0.5,
                    pier_side: PierSide::TubeEast,
                },
                _ => Pose::Equatorial {
                    hour_angle_rad: -0.25,
                    declination_rad: 0.5,
                    pier_side: PierSide::TubeWest,
                },
            },
            park_pose: None,
            faults: FaultSet::new(),
            events: Default::default(),
            events_lost: 0,
            evaluated,
        }
    }

    const LEVELS: [AlertLevel; 5] = [
        AlertLevel::Clear,
        AlertLevel::Watch,
        AlertLevel::ParkNow,
        AlertLevel::Alarm,
        AlertLevel::SensorFault,
    ];

    /// The series as the general path builds it: every record's bucket
    /// found by division, every verdict's figures taken whole.
    fn general(records: &[(f64, Verdict, Option<f64>, Option<bool>)]) -> Series {
        let mut s = Series::new();
        for (t, v, w, c) in records {
            s.open_bucket_for(*t);
            s.last_evaluated = None;
            s.last_pose = None;
            s.push(*t, v, *w, *c);
        }
        s
    }

    fn fast(records: &[(f64, Verdict, Option<f64>, Option<bool>)]) -> Series {
        let mut s = Series::new();
        for (t, v, w, c) in records {
            s.push(*t, v, *w, *c);
        }
        s
    }

    fn same(a: &Series, b: &Series) {
        assert_eq!(a.width_s, b.width_s);
        assert_eq!(a.points.len(), b.points.len());
        for (p, q) in a.points.iter().zip(&b.points) {
            // Bits, so that NaN figures compare too.
            assert_eq!(format!("{p:?}"), format!("{q:?}"));
        }
        assert_eq!(a.wind_gaps, b.wind_gaps);
        assert_eq!(a.top_overturning, b.top_overturning);
        assert_eq!(a.cover_at_closest, b.cover_at_closest);
        assert_eq!(a.pose_frame, b.pose_frame);
    }

    // Bucket edges: a record exactly at a bucket's start opens it, one an
    // ulp before stays in the previous one, at every width the coarsening
    // reaches (expected values from the module docs' rule, floor(t / width)).
    #[test]
    fn records_at_bucket_edges_fall_in_the_bucket_they_start() {
        let v = verdict(3, true, Some((0.01, 1.0)), 0, 0);
        let mut s = Series::new();
        s.push(0.0, &v, None, None);
        s.push(1.0_f64.next_down(), &v, None, None);
        s.push(1.0, &v, None, None);
        assert_eq!(s.points.len(), 2);
        assert_eq!(s.points[0].records, 2);
        assert_eq!(s.points[1].t_start_s, 1.0);
        // Past 2000 one-second buckets the width doubles, then doubles again.
        for k in 2..5000_u32 {
            s.push(f64::from(k), &v, None, None);
        }
        assert_eq!(s.width_s, 4.0);
        assert!(s.points.len() <= MAX_SERIES_POINTS);
        let last = s.points.last().map(|p| (p.t_start_s, p.records));
        assert_eq!(last, Some((4996.0, 4)));
        s.push(5000.0_f64.next_down(), &v, None, None);
        assert_eq!(s.points.last().map(|p| p.records), Some(5));
        s.push(5000.0, &v, None, None);
        assert_eq!(
            s.points.last().map(|p| (p.t_start_s, p.records)),
            Some((5000.0, 1))
        );
    }

    proptest! {
        #![proptest_config(ProptestConfig::with_cases(200))]
        /// The record-by-record shortcuts (the last bucket's time range, the
        /// figures of a verdict that did not evaluate, an unchanged pose)
        /// give the same series as the general path.
        #[test]
        fn shortcuts_give_the_general_series(
            steps in proptest::collection::vec(
                (0_u32..5, any::<bool>(), 0_u8..200, 0_u16..1000, 0_u8..4, 0_u8..5, any::<bool>(), 0_u8..3),
                1..400,
            ),
            dt_ms in 1_u32..4000,
        ) {
            let mut t = 0.0_f64;
            let mut figures = 0_u8;
            let mut records = Vec::new();
            for (gap, new_figures, f, tilt, pose, level, wind, cover) in steps {
                // Gaps of a step, a bucket, several buckets, or to an edge.
                t += match gap {
                    0 => f64::from(dt_ms) / 1000.0,
                    1 => 1.0,
                    2 => 37.0,
                    3 => t.floor() + 1.0 - t,
                    _ => 0.0,
                };
                if new_figures {
                    figures = f;
                }
                // Equal magnitudes toward different azimuths too (their
                // vectors differ, their angles may differ in the last bit),
                // and magnitudes a relative 0 to 2·10⁻⁴ apart, around the
                // tilt screen's margin.
                let m = f32::from(1 + tilt % 8) / 2_000.0 * (1.0 + f32::from(f % 16) * 1.5e-5);
                let tilt = (tilt >= 50).then(|| (m, f32::from(f) / 32.0));
                let v = verdict(figures, new_figures, tilt, pose, level);
                let w = wind.then_some(f64::from(f) / 10.0);
                let c = match cover { 0 => None, 1 => Some(false), _ => Some(true) };
                records.push((t, v, w, c));
            }
            same(&fast(&records), &general(&records));
        }
    }

    /// A bucket's cover is fitted when any of its records had the cover
    /// on; the series' top overturning utilisation, and the cover then,
    /// are the highest record's; a bucket charts its pose's angles in the
    /// series' frame (the first pose's), and none for a pose in another.
    #[test]
    fn cover_top_utilisation_and_pose_are_charted() {
        let mut s = Series::new();
        // One bucket (0 to 1 s), overturning utilisations 0.25, 0.75, 0.5.
        s.push(0.1, &verdict(10, true, None, 1, 0), None, Some(false));
        s.push(0.2, &verdict(30, true, None, 1, 0), None, Some(true));
        s.push(0.3, &verdict(20, true, None, 1, 0), None, Some(false));
        assert_eq!(s.points.len(), 1);
        assert_eq!(s.points[0].cover, Some(true));
        assert_eq!(s.top_overturning, Some(0.75));
        assert_eq!(s.cover_at_closest, Some(true));
        let (frame, a, b) = pose_angles_deg(&verdict(20, true, None, 1, 0).pose);
        assert_eq!(s.pose_frame, Some(frame));
        assert_eq!(
            (s.points[0].pose_a_deg, s.points[0].pose_b_deg),
            (Some(a), Some(b))
        );
        // Axes, not equatorial: not charted.
        s.push(1.5, &verdict(20, true, None, 0, 0), None, None);
        assert_eq!(s.points.len(), 2);
        assert_eq!(
            (s.points[1].pose_a_deg, s.points[1].pose_b_deg),
            (None, None)
        );
    }

    /// A wind gap is a silence longer than `wind_gap_s` (exactly that long
    /// is none); at most `MAX_WIND_GAPS` are kept, the others counted.
    #[test]
    fn wind_gaps_are_longer_than_the_limit_and_bounded() {
        let mut s = Series::with_wind_gap(10.0);
        let v = verdict(10, true, None, 1, 0);
        s.push(0.0, &v, Some(1.0), None);
        s.push(10.0, &v, Some(1.0), None);
        assert!(s.wind_gaps.is_empty());
        s.push(20.5, &v, Some(1.0), None);
        assert_eq!(s.wind_gaps, vec![(10.0, 20.5)]);
        let mut t = 20.5;
        for _ in 0..=MAX_WIND_GAPS {
            t += 11.0;
            s.push(t, &v, Some(1.0), None);
        }
        assert_eq!(s.wind_gaps.len(), MAX_WIND_GAPS);
        assert_eq!(s.wind_gaps_not_kept, 2);
    }

    /// The tilt screen is the steepest reading of the bucket whose angle
    /// was computed (only a steeper one replaces it, not an equal one),
    /// and a new bucket starts without one.
    #[test]
    fn the_tilt_screen_is_the_bucket_s_steepest_computed_reading() {
        let screen = |r: Option<TiltReading>| r.map(|r| (r, r.magnitude_rad().to_degrees()));
        let mut s = Series::new();
        s.push(0.1, &verdict(10, true, Some((0.02, 0.0)), 1, 0), None, None);
        assert_eq!(s.tilt_screen, screen(reading(0.02, 0.0)));
        // Not evaluated (the repeated path): steeper, then as steep toward
        // the south, then less steep.
        s.push(
            0.2,
            &verdict(10, false, Some((0.05, 0.0)), 1, 0),
            None,
            None,
        );
        let south = reading(0.05, core::f32::consts::PI);
        assert_eq!(
            south.map(|r| r.magnitude_rad().to_bits()),
            reading(0.05, 0.0).map(|r| r.magnitude_rad().to_bits())
        );
        s.push(
            0.3,
            &verdict(10, false, Some((0.05, core::f32::consts::PI)), 1, 0),
            None,
            None,
        );
        s.push(
            0.4,
            &verdict(10, false, Some((0.03, 1.0)), 1, 0),
            None,
            None,
        );
        assert_eq!(s.tilt_screen, screen(reading(0.05, 0.0)));
        s.push(1.5, &verdict(10, true, None, 1, 0), None, None);
        assert_eq!(s.tilt_screen, None);
    }
}
