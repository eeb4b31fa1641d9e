//! The guard's gust bookkeeping between evaluations: the 3-s gust of the
//! present fine wind bin (cached until the next wind sample), and the
//! one-minute gust maxima from which the rise of a strengthening wind is
//! estimated.

use crate::sense::{div_rem_ms, Millis, FINE_BIN_MS};

/// Minutes of one-minute gust maxima kept to estimate a rising wind.
pub const GUST_HISTORY_MIN: usize = 10;

/// The 3-s gust for one fine wind bin (index `now / FINE_BIN_MS`), kept until
/// the next wind sample: between wind samples the gust changes only from one
/// bin to the next, so steps that do not evaluate the physics need no full
/// wind report. Only a cache: its answers equal a fresh computation's.
#[derive(Clone, Copy, Debug, Default)]
pub(super) struct GustCache {
    entry: Option<(u64, Option<f32>)>,
}

impl GustCache {
    /// Forgets the cached gust (a wind sample arrived).
    pub(super) fn invalidate(&mut self) {
        self.entry = None;
    }

    /// Records the gust computed at `now`, m/s.
    pub(super) fn put(&mut self, now: Millis, gust_mps: Option<f32>) {
        self.entry = Some((div_rem_ms(now.0, FINE_BIN_MS).0, gust_mps));
    }

    /// The gust at `now`, m/s, and whether it was computed now: the cached
    /// one for the same bin (`false`), or `compute()` (then cached; `true`).
    #[inline]
    pub(super) fn get_or(
        &mut self,
        now: Millis,
        compute: impl FnOnce() -> Option<f32>,
    ) -> (Option<f32>, bool) {
        let bin = div_rem_ms(now.0, FINE_BIN_MS).0;
        match self.entry {
            Some((b, g)) if b == bin => (g, false),
            _ => {
                let g = compute();
                self.entry = Some((bin, g));
                (g, true)
            }
        }
    }
}

/// One-minute gust maxima, m/s, newest first (minute index `now / 60 000`).
#[derive(Clone, Copy, Debug)]
pub(super) struct GustHistory {
    minutes_mps: [f32; GUST_HISTORY_MIN],
    minute_index: u64,
}

impl GustHistory {
    /// An empty history starting in the minute of `now`.
    pub(super) fn new(now: Millis) -> Self {
        GustHistory {
            minutes_mps: [0.0; GUST_HISTORY_MIN],
            minute_index: div_rem_ms(now.0, 60_000).0,
        }
    }

    /// Takes the 3-s gust at `now`, m/s: a new minute starts a new maximum
    /// (minutes without a step hold 0: no gust seen); the present minute
    /// keeps the largest gust seen in it.
    pub(super) fn track(&mut self, now: Millis, gust_3s_mps: Option<f32>) {
        let minute = div_rem_ms(now.0, 60_000).0;
        if minute != self.minute_index {
            let steps = minute.saturating_sub(self.minute_index);
            // Shift the maxima `steps` minutes older (at most the whole
            // history) with empty minutes in front, in one copy: the same as
            // `steps` single rotations, without `rotate_right`'s overlapping
            // copy (`memmove`, 1.6 KiB of flash on a Cortex-M that nothing
            // else needs).
            let shift =
                usize::try_from(steps).map_or(GUST_HISTORY_MIN, |s| s.min(GUST_HISTORY_MIN));
            let older = self.minutes_mps;
            for (i, m) in self.minutes_mps.iter_mut().enumerate() {
                *m = i
                    .checked_sub(shift)
                    .and_then(|j| older.get(j))
                    .copied()
                    .unwrap_or(0.0);
            }
            self.minute_index = minute;
        }
        if let (Some(g), Some(first)) = (gust_3s_mps, self.minutes_mps.first_mut()) {
            if g > *first {
                *first = g;
            }
        }
    }

    /// Tests only: the one-minute maxima, m/s, newest first, and the
    /// present minute's index.
    #[cfg(test)]
    pub(super) fn minutes(&self) -> ([f32; GUST_HISTORY_MIN], u64) {
        (self.minutes_mps, self.minute_index)
    }

    /// Rise rate of the gust, m/s per s: the slope between the mean of the
    /// last two one-minute maxima and of the two five minutes before, never
    /// negative; 0 while those older minutes hold no gust.
    pub(super) fn rise_mps_per_s(&self) -> f32 {
        let m = &self.minutes_mps;
        let (Some(a0), Some(a1), Some(b0), Some(b1)) = (m.first(), m.get(1), m.get(5), m.get(6))
        else {
            return 0.0;
        };
        if *b0 <= 0.0 || *b1 <= 0.0 {
            return 0.0;
        }
        (((a0 + a1) - (b0 + b1)) * 0.5 / 300.0).max(0.0)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::sense::{WindConfig, WindStats};

    /// The cached gust equals a fresh `WindStats::gust_3s_mps` at every step
    /// of an irregular schedule: steps at 70 ms, wind samples now and then,
    /// silences longer than the 3-s window, across minute boundaries.
    #[test]
    fn the_cache_answers_as_a_fresh_computation() {
        let mut w = WindStats::new(WindConfig::default(), Millis(0)).unwrap();
        let mut cache = GustCache::default();
        let mut fresh_differs_from_last = 0;
        let mut last = None;
        for k in 0..20_000_u64 {
            let now = Millis(k * 70);
            // Samples in bursts: 4 s on at 1 Hz-ish, then 7 s off.
            if (k * 70) % 11_000 < 4_000 && k % 13 == 0 {
                let v = 5.0 + ((k / 13) % 9) as f32;
                w.push(now, v, Some(0.3)).unwrap();
                cache.invalidate();
            }
            let fresh = w.gust_3s_mps(now);
            let cached = cache.get_or(now, || w.gust_3s_mps(now)).0;
            assert_eq!(cached, fresh, "at {} ms", now.0);
            if fresh != last {
                fresh_differs_from_last += 1;
            }
            last = fresh;
        }
        // The schedule does exercise changes between samples.
        assert!(fresh_differs_from_last > 100);
    }

    /// A minute is a whole number of fine bins: a step in the same bin is
    /// in the same minute (the guard tracks a cached gust only once).
    #[test]
    fn a_minute_is_whole_fine_bins() {
        assert_eq!(60_000 % FINE_BIN_MS, 0);
    }

    /// `put` serves the same bin, not the next.
    #[test]
    fn a_put_serves_its_bin_only() {
        let mut cache = GustCache::default();
        cache.put(Millis(1_000), Some(7.0));
        assert_eq!(
            cache.get_or(Millis(1_000 + FINE_BIN_MS - 1), || None),
            (Some(7.0), false)
        );
        assert_eq!(
            cache.get_or(Millis(1_000 + FINE_BIN_MS), || Some(8.0)),
            (Some(8.0), true)
        );
        cache.invalidate();
        assert_eq!(
            cache.get_or(Millis(1_000 + FINE_BIN_MS), || Some(9.0)),
            (Some(9.0), true)
        );
    }

    /// A gust ramping at 0.5 m/s per minute, read at the end of a minute:
    /// the estimated rise is the ramp's rate, 0.5/60 m/s per s (each
    /// minute's maximum is its last value, so the two two-minute means lie
    /// exactly 300 s apart on the line; hand check). Before seven minutes
    /// are known, and for a falling wind, 0.
    #[test]
    fn the_rise_of_a_ramp_is_its_rate() {
        let mut h = GustHistory::new(Millis(0));
        let ramp = |t_ms: u64| 5.0 + 0.5 * (t_ms as f32 / 60_000.0);
        for k in 0..(11 * 60) {
            let t = k * 1000;
            h.track(Millis(t), Some(ramp(t)));
            if k < 6 * 60 {
                assert_eq!(h.rise_mps_per_s(), 0.0, "at {k} s");
            }
        }
        let rate = h.rise_mps_per_s();
        assert!((rate - 0.5 / 60.0).abs() < 1e-5, "{rate}");

        let mut falling = GustHistory::new(Millis(0));
        for k in 0..=(11 * 60) {
            falling.track(Millis(k * 1000), Some(20.0 - 0.01 * k as f32));
        }
        assert_eq!(falling.rise_mps_per_s(), 0.0);
    }

    /// A jump of several minutes shifts the maxima as that many single
    /// rotations did.
    #[test]
    fn a_jump_of_minutes_shifts_as_single_rotations_do() {
        // Reference: `steps` single rotations with an empty minute in front
        // (core's `slice::rotate_right`), the history's former update.
        let n = GUST_HISTORY_MIN as u64;
        for jump in 0..=n + 3 {
            let mut h = GustHistory::new(Millis(0));
            for k in 0..n {
                h.track(Millis(k * 60_000 + 7), Some(1.0 + k as f32));
            }
            let mut expect = h.minutes_mps;
            for _ in 0..jump.min(n) {
                expect.rotate_right(1);
                if let Some(first) = expect.first_mut() {
                    *first = 0.0;
                }
            }
            let minute = h.minute_index + jump;
            h.track(Millis(minute * 60_000 + 11), None);
            assert_eq!(h.minutes_mps, expect, "jump of {jump} minutes");
            assert_eq!(h.minute_index, minute);
        }
    }

    /// Minutes without a step hold no gust; a silence longer than the history
    /// empties it.
    #[test]
    fn silent_minutes_hold_no_gust() {
        let mut h = GustHistory::new(Millis(0));
        h.track(Millis(0), Some(10.0));
        h.track(Millis(3 * 60_000 + 5), Some(4.0));
        assert_eq!(h.minutes_mps[..4], [4.0, 0.0, 0.0, 10.0]);
        h.track(Millis(3 * 60_000 + 9), Some(3.0));
        assert_eq!(h.minutes_mps[0], 4.0, "the minute keeps its largest gust");
        h.track(Millis(30 * 60_000), None);
        assert_eq!(h.minutes_mps, [0.0; GUST_HISTORY_MIN]);
        assert_eq!(h.minute_index, 30);
    }
}
