//! A wind source that reports only mean speeds ([`MeanWind`]): the gust is
//! the mean times a gust factor.

use crate::error::Error;
use crate::sense::fault::{Fault, FaultSet, Sensor};
use crate::sense::Millis;

use super::channel::{check_direction, check_speed, Channel, FaultLimits};
use super::config::{GustBasis, WindConfig, WindDirection, WindReport};
use super::profile::gust_from_mean;

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
        Ok(Self::started(config, config.height_factor()?, now))
    }

    /// [`MeanWind::new`] for a `config` already validated, with its
    /// `height_factor`: infallible (see [`WindStats`](crate::sense::WindStats)'s).
    pub(crate) fn started(config: WindConfig, height_factor: f32, now: Millis) -> Self {
        MeanWind {
            config,
            height_factor,
            start: now,
            latest: None,
            latest_from_rad: None,
            speed: Channel::new(now),
            direction: Channel::new(now),
        }
    }

    /// Feeds one reported 10-minute mean speed at the anemometer (m/s) and,
    /// if given, its mean from-direction (radians from north clockwise).
    ///
    /// # Errors
    /// As [`WindStats::push`](crate::sense::WindStats::push).
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

    /// The faults active at `now` (as [`WindStats::faults`](crate::sense::WindStats::faults)).
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

    /// Ten-minute means from a 10 m mast for a rig 2 m up; stale after an
    /// hour, stuck after 30 minutes of one value.
    fn config() -> WindConfig {
        WindConfig {
            anemometer_height_m: 10.0,
            rig_height_m: 2.0,
            stale_after_s: 3600.0,
            stuck_after_s: 1800.0,
            expect_direction: true,
            ..WindConfig::default()
        }
    }

    fn has(set: &FaultSet, sensor: Sensor, class: &str) -> bool {
        set.iter()
            .any(|f| f.sensor() == sensor && f.class_code() == class)
    }

    #[test]
    fn mean_and_gust_at_rig_height() {
        let c = config();
        let hf = c.height_factor().unwrap();
        assert!(hf < 1.0);
        let mut m = MeanWind::new(c, Millis(0)).unwrap();
        assert_eq!(m.report(Millis(0)).direction, WindDirection::NoData);
        m.push(Millis(600_000), 8.0, Some(1.0)).unwrap();
        let r = m.report(Millis(600_000));
        assert_eq!(r.mean_10min_mps, Some(8.0 * hf));
        assert_eq!(
            r.gust_3s_mps,
            Some(gust_from_mean(8.0 * hf, c.mean_gust_factor))
        );
        assert_eq!(r.peak_gust_mps, r.gust_3s_mps);
        assert_eq!(r.gust_factor, Some(c.mean_gust_factor));
        assert_eq!(r.direction, WindDirection::Reported { from_rad: 1.0 });
        // Without a direction the direction is unknown, not the old one.
        m.push(Millis(1_200_000), 8.5, None).unwrap();
        assert_eq!(
            m.report(Millis(1_200_000)).direction,
            WindDirection::Unknown
        );
    }

    #[test]
    fn two_means_at_one_time_stamp_are_both_taken() {
        let mut m = MeanWind::new(config(), Millis(0)).unwrap();
        m.push(Millis(600_000), 5.0, None).unwrap();
        assert_eq!(m.push(Millis(600_000), 6.0, None), Ok(()));
        assert!(m.push(Millis(599_999), 6.0, None).is_err());
    }

    /// Calm is judged on the mean at the mast against `calm_below_mps`,
    /// the same in `push` and `report` (the report holds the mean at rig
    /// height, so it scales the threshold by the height factor).
    #[test]
    fn calm_is_below_the_calm_speed_at_the_mast() {
        let c = config(); // calm below 0.5 m/s
        let mut m = MeanWind::new(c, Millis(0)).unwrap();
        m.push(Millis(1000), c.calm_below_mps, Some(2.0)).unwrap();
        assert_eq!(
            m.report(Millis(1000)).direction,
            WindDirection::Reported { from_rad: 2.0 }
        );
        m.push(Millis(2000), 0.6, Some(2.0)).unwrap();
        assert!(matches!(
            m.report(Millis(2000)).direction,
            WindDirection::Reported { .. }
        ));
        m.push(Millis(3000), 0.49, Some(2.0)).unwrap();
        assert_eq!(m.report(Millis(3000)).direction, WindDirection::Calm);
    }

    /// A repeated mean of zero is a calm, not a stuck anemometer; a repeated
    /// non-zero mean for longer than the stuck time is. The same for the
    /// direction: repeated in calm is fine, repeated in wind is stuck.
    #[test]
    fn stuck_only_when_a_moving_reading_repeats() {
        let mut m = MeanWind::new(config(), Millis(0)).unwrap();
        let mut t = 0;
        while t <= 3_600_000 {
            m.push(Millis(t), 0.0, Some(3.0)).unwrap();
            t += 600_000;
        }
        let f = m.faults(Millis(3_600_000));
        assert!(!has(&f, Sensor::WindSpeed, "stuck"), "{f:?}");
        assert!(!has(&f, Sensor::WindDirection, "stuck"), "{f:?}");

        let mut m = MeanWind::new(config(), Millis(0)).unwrap();
        let mut t = 0;
        while t <= 3_600_000 {
            m.push(Millis(t), 6.0, Some(3.0)).unwrap();
            t += 600_000;
        }
        let f = m.faults(Millis(3_600_000));
        assert!(has(&f, Sensor::WindSpeed, "stuck"), "{f:?}");
        assert!(has(&f, Sensor::WindDirection, "stuck"), "{f:?}");
    }

    /// A mean of exactly the calm speed is not calm: its repeated direction
    /// counts toward stuck.
    #[test]
    fn direction_at_the_calm_speed_can_be_stuck() {
        let c = config();
        let mut m = MeanWind::new(c, Millis(0)).unwrap();
        let mut t = 0;
        while t <= 3_600_000 {
            m.push(Millis(t), c.calm_below_mps, Some(3.0)).unwrap();
            t += 600_000;
        }
        let f = m.faults(Millis(3_600_000));
        assert!(has(&f, Sensor::WindDirection, "stuck"), "{f:?}");
    }
}
