//! Binned wind statistics from an anemometer ([`WindStats`]): the 3-second
//! gust from fine bins, the 10-minute mean, peak gust, gust factor and the
//! circular mean of direction from coarse bins, in fixed memory.

use crate::error::Error;
use crate::math;
use crate::sense::fault::{Fault, FaultSet, Sensor};
use crate::sense::{div_rem_ms, ms_to_s, s_to_ms, Millis};

use super::channel::{check_direction, check_speed, Channel, FaultLimits};
use super::config::{GustBasis, WindConfig, WindDirection, WindReport};

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

/// The coarse bins' sums over the report's windows
/// ([`WindStats::report`]).
#[derive(Clone, Copy, Debug, Default)]
struct Windows {
    /// Largest 3-s mean of the closed bins in the peak window, m/s.
    peak: Option<f32>,
    /// Sum of the speeds in the mean window, m/s, and their number.
    mean_sum: f32,
    mean_count: u32,
    /// Samples, calm samples and samples with a direction in the direction
    /// window, and the sums of the sines and cosines of their directions.
    count: u32,
    calm: u32,
    dn: u32,
    s: f32,
    c: f32,
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
    usize::try_from(div_rem_ms(id, n64).1).unwrap_or(0)
}

/// The absolute number of the bin of `width_ms` holding `t_ms` (`t_ms /
/// width_ms`, by [`div_rem_ms`]).
fn bin_of(t_ms: u64, width_ms: u64) -> u64 {
    div_rem_ms(t_ms, width_ms).0
}

/// `lo ≤ id ≤ k` for `lo ≤ k`, in one comparison: `k − id` (wrapping) is at
/// most `k − lo` exactly for those ids, and an id above `k` wraps to more
/// than `k` (tested against the two comparisons).
fn within(id: u64, lo: u64, k: u64) -> bool {
    k.wrapping_sub(id) <= k.wrapping_sub(lo)
}

/// Number of whole coarse bins covering `s` seconds, 1 to [`COARSE_BINS`].
fn coarse_bins_for(s: f32) -> u64 {
    let ms = s_to_ms(s);
    let (q, r) = div_rem_ms(ms, COARSE_BIN_MS);
    let n = q.saturating_add(u64::from(r > 0)).max(1);
    n.min(u64::try_from(COARSE_BINS).unwrap_or(60))
}

/// Wind statistics from speed and direction samples at any rate.
///
/// Memory: `core::mem::size_of::<WindStats>()` is a compile-time constant
/// below 3 KiB (2840 bytes on x86-64: 12 fine bins, 60 coarse bins and the configuration;
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
    /// `Some(t)`: [`WindStats::faults_into`] adds nothing at any `now` up to
    /// `t` ms ([`WindStats::quiet_until`]); kept from one sample to the next.
    faults_quiet_until: Option<u64>,
    /// Tests only: every closed boundary's mean computed afresh (the
    /// reference of the reuse in [`WindStats::add`]).
    #[cfg(test)]
    always_fresh: bool,
}

impl WindStats {
    /// Statistics started at `now` (stale time counts from here).
    ///
    /// # Errors
    /// As [`WindConfig::validate`].
    pub fn new(config: WindConfig, now: Millis) -> Result<Self, Error> {
        config.validate()?;
        Ok(Self::started(config, config.height_factor()?, now))
    }

    /// [`WindStats::new`] for a `config` already validated, with its
    /// `height_factor` ([`WindConfig::height_factor`]): infallible, so the
    /// guard builds its 2.8 KiB of statistics in place, with no `Result` of
    /// them on the stack.
    pub(crate) fn started(config: WindConfig, height_factor: f32, now: Millis) -> Self {
        let (fresh, limits) = (Channel::new(now), FaultLimits::of(&config));
        WindStats {
            config,
            height_factor,
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
            speed: fresh,
            direction: fresh,
            limits,
            // Both channels are fresh (no rejection, nothing stuck): quiet
            // until they turn stale.
            faults_quiet_until: Some(fresh.stale_after(now, limits)),
            #[cfg(test)]
            always_fresh: false,
        }
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
        let pushed = self.take_sample(now, speed_mps, from_rad);
        // The channels changed (or, for a reversed time stamp, did not):
        // the fault deadline is renewed either way.
        self.faults_quiet_until = self.quiet_until();
        pushed
    }

    /// [`WindStats::push`] without the renewal of the fault deadline.
    fn take_sample(
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
        let b = bin_of(now.0, FINE_BIN_MS);
        if let Some(c) = self.newest_fine {
            if b > c {
                // Close the boundaries after bins c ..= b−1 (at most 12 can
                // still hold data in their window).
                let last = (b - 1).min(c.saturating_add(11));
                let mut k = c;
                let mut prev: Option<f32> = None;
                while k <= last {
                    // From the second boundary on (k > c, the newest bin) no
                    // bin enters the window; when none leaves it either (no
                    // bin k − 12), it holds the same bins as at k − 1, so the
                    // mean there, if there was one, is this one to the bit
                    // (the same sum, in the same order, of the same bins).
                    let m = match prev {
                        Some(p) if !self.holds_fine(k.checked_sub(12)) => Some(p),
                        _ => self.fine_mean_ending(k),
                    };
                    #[cfg(test)]
                    let m = if self.always_fresh {
                        self.fine_mean_ending(k)
                    } else {
                        m
                    };
                    if let Some(m) = m {
                        self.record_gust(k, m);
                    }
                    prev = m;
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
        let cb = self.coarse_mut(bin_of(now.0, COARSE_BIN_MS));
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
        let first = bin_of(self.first_sample?.0, FINE_BIN_MS);
        let n = u64::try_from(FINE_BINS).unwrap_or(12);
        if k < first.saturating_add(n - 1) {
            return None;
        }
        let lo = k.saturating_add(1).saturating_sub(n);
        let (sum, count) = self
            .fine
            .iter()
            .filter(|f| within(f.id, lo, k))
            .fold((0.0_f32, 0_u32), |(s, c), f| {
                (s + f.sum_mps, c.saturating_add(f.count))
            });
        (count > 0).then(|| sum / count_f32(count))
    }

    /// True when the fine ring holds bin `id` (`None`: no bin).
    fn holds_fine(&self, id: Option<u64>) -> bool {
        id.is_some_and(|id| self.fine.iter().any(|f| f.id == id))
    }

    fn record_gust(&mut self, k: u64, m: f32) {
        self.latest_gust_mps = Some(m);
        if let Some(cb) = self.coarse_mut(bin_of(k.saturating_mul(FINE_BIN_MS), COARSE_BIN_MS)) {
            if m > cb.gust_max_mps {
                cb.gust_max_mps = m;
            }
        }
    }

    /// The latest 3-s running mean at rig height as of `now`, m/s: the
    /// same value as [`WindReport::gust_3s_mps`] of [`WindStats::report`]
    /// at `now`, without the rest of the report (a dozen bins summed
    /// instead of the peak, mean and direction windows). `None` with no
    /// sample in the last 3 s or before 3 s of record.
    #[must_use]
    pub fn gust_3s_mps(&self, now: Millis) -> Option<f32> {
        let now_bin = bin_of(now.0, FINE_BIN_MS);
        match self.newest_fine {
            Some(c) if now_bin >= c => self.fine_mean_ending(now_bin),
            _ => None,
        }
    }

    /// The statistics as of `now` (normally the time of the latest sample).
    #[must_use]
    pub fn report(&self, now: Millis) -> WindReport {
        // 3-s means at the boundaries not yet closed by a later sample.
        let now_bin = bin_of(now.0, FINE_BIN_MS);
        let mut gust_now = None;
        let mut open_peak: Option<f32> = None;
        if let Some(c) = self.newest_fine {
            let last = now_bin.min(c.saturating_add(11));
            let mut k = c;
            // The mean ending at `last`, the loop's last (when it ran).
            let mut at_last = None;
            while k <= last {
                at_last = self.fine_mean_ending(k);
                if let Some(m) = at_last {
                    open_peak = Some(open_peak.map_or(m, |p| p.max(m)));
                }
                k = k.saturating_add(1);
            }
            // The 3-s mean ending now: the loop's last when that is now's
            // bin (the usual case), not computed twice.
            if now_bin >= c {
                gust_now = if last == now_bin {
                    at_last
                } else {
                    self.fine_mean_ending(now_bin)
                };
            }
        }
        let w = self.windows(now);
        let closed_peak = w.peak;
        let peak = match (closed_peak, open_peak) {
            (Some(a), Some(b)) => Some(a.max(b)),
            (a, b) => a.or(b),
        };
        let (sum, count) = (w.mean_sum, w.mean_count);
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
            direction: self.direction_summary(&w),
            basis: GustBasis::Measured,
        }
    }

    /// The sums of the closed and open coarse bins over the peak, mean and
    /// direction windows as of `now`, in one pass over the ring: each
    /// window's values are folded in the ring's order, as three separate
    /// passes would fold them.
    fn windows(&self, now: Millis) -> Windows {
        let cur = bin_of(now.0, COARSE_BIN_MS);
        let lo = |n: u64| cur.saturating_add(1).saturating_sub(n);
        let peak_lo = lo(coarse_bins_for(self.config.peak_window_s));
        let mean_lo = lo(MEAN_WINDOW_MS / COARSE_BIN_MS);
        let dir_lo = lo(coarse_bins_for(self.config.direction_window_s));
        let mut w = Windows::default();
        for b in self.coarse.iter().filter(|b| b.id <= cur) {
            if b.id >= peak_lo && b.gust_max_mps >= 0.0 {
                let g = b.gust_max_mps;
                w.peak = Some(w.peak.map_or(g, |a| a.max(g)));
            }
            if b.id >= mean_lo {
                w.mean_sum += b.sum_mps;
                w.mean_count = w.mean_count.saturating_add(b.count);
            }
            if b.id >= dir_lo {
                w.count = w.count.saturating_add(b.count);
                w.calm = w.calm.saturating_add(b.calm_count);
                w.dn = w.dn.saturating_add(b.dir_count);
                w.s += b.dir_sin;
                w.c += b.dir_cos;
            }
        }
        w
    }

    fn direction_summary(&self, w: &Windows) -> WindDirection {
        let (count, calm, dn, s, c) = (w.count, w.calm, w.dn, w.s, w.c);
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
    /// copied on every step). Up to the deadline kept since the last sample
    /// ([`WindStats::quiet_until`]) there is none, and nothing is checked.
    pub(crate) fn faults_into(&self, now: Millis, set: &mut FaultSet) {
        if self.faults_quiet_until.is_some_and(|t| now.0 <= t) {
            return;
        }
        self.check_faults_into(now, set);
    }

    /// [`WindStats::faults_into`] without the deadline: every channel
    /// checked.
    fn check_faults_into(&self, now: Millis, set: &mut FaultSet) {
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

    /// The last time stamp, ms, up to which [`WindStats::faults`] is empty,
    /// as the channels stand; `None` when it is not empty even then. The
    /// only fault that depends on `now` is a channel's stale one, absent up
    /// to the earliest instant a checked channel turns stale; every other
    /// (a rejected sample, a stuck reading) depends on the samples alone,
    /// so the faults there are those of every earlier `now`, and the answer
    /// holds until the next sample.
    fn quiet_until(&self) -> Option<u64> {
        let (l, start) = (self.limits, self.start);
        let mut until = self.speed.stale_after(start, l);
        if self.config.expect_direction {
            until = until.min(self.direction.stale_after(start, l));
        }
        let mut set = FaultSet::new();
        self.check_faults_into(Millis(until), &mut set);
        set.is_empty().then_some(until)
    }

    /// Tests only: the fault deadline kept now.
    #[cfg(test)]
    pub(crate) fn fault_deadline(&self) -> Option<u64> {
        self.faults_quiet_until
    }

    /// Tests only: forgets the fault deadline, so that the next
    /// [`WindStats::faults_into`] checks every channel.
    #[cfg(test)]
    pub(crate) fn forget_fault_deadline(&mut self) {
        self.faults_quiet_until = None;
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

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn slot_wraps() {
        assert_eq!(slot(12, FINE_BINS), 0);
        assert_eq!(slot(61, COARSE_BINS), 1);
        assert_eq!(coarse_bins_for(600.0), 60);
        assert_eq!(coarse_bins_for(15.0), 2);
        assert_eq!(coarse_bins_for(0.0), 1);
    }

    #[test]
    fn within_is_the_two_comparisons() {
        let edges = [0, 1, 2, 10, 11, 12, 13, 1_000, u64::MAX - 13, u64::MAX - 12];
        let edges = edges.iter().chain(&[u64::MAX - 11, u64::MAX - 1, u64::MAX]);
        for &k in edges.clone() {
            for &lo in edges.clone().filter(|&&lo| lo <= k) {
                for &id in edges.clone() {
                    for id in [id, k.wrapping_sub(id), lo.wrapping_add(id)] {
                        assert_eq!(within(id, lo, k), lo <= id && id <= k, "{id} {lo} {k}");
                    }
                }
            }
        }
    }

    /// A deterministic stream of `u32` (xorshift32) from a non-zero seed.
    fn xorshift32(mut seed: u32) -> impl FnMut() -> u32 {
        move || {
            seed ^= seed << 13;
            seed ^= seed >> 17;
            seed ^= seed << 5;
            seed
        }
    }

    fn stats(config: WindConfig, start_ms: u64) -> WindStats {
        WindStats::new(config, Millis(start_ms)).unwrap()
    }

    /// `speed(t)` every `step_ms` over [from_ms, to_ms], direction west.
    fn feed(w: &mut WindStats, from_ms: u64, to_ms: u64, step_ms: u64, speed: impl Fn(u64) -> f32) {
        let mut t = from_ms;
        while t <= to_ms {
            w.push(Millis(t), speed(t), Some(4.712_389)).unwrap();
            t += step_ms;
        }
    }

    #[test]
    fn height_factor_is_the_configurations() {
        let config = WindConfig {
            anemometer_height_m: 10.0,
            rig_height_m: 2.0,
            ..WindConfig::default()
        };
        let w = stats(config, 0);
        assert_eq!(w.height_factor(), config.height_factor().unwrap());
        assert!(w.height_factor() < 1.0, "lower is calmer");
        // Every speed is scaled by it: 3 s of 10 m/s at the mast.
        let mut w = w;
        feed(&mut w, 0, 4000, 100, |_| 10.0);
        let g = w.gust_3s_mps(Millis(4000)).unwrap();
        assert!((g - 10.0 * w.height_factor()).abs() < 1e-4, "{g}");
    }

    /// The first 3-s mean exists once the record spans a whole 3-s window
    /// (12 bins of 250 ms), counted from the first sample whatever the
    /// clock's epoch, and not one bin earlier.
    #[test]
    fn first_gust_after_exactly_three_seconds_of_record() {
        for start in [0_u64, 10_000, 123_250] {
            let mut w = stats(WindConfig::default(), start);
            feed(&mut w, start, start + 2749, 50, |_| 6.0);
            // Bin of start + 2 750 ms is the 12th: the window is complete.
            assert_eq!(w.gust_3s_mps(Millis(start + 2700)), None, "start {start}");
            assert_eq!(w.report(Millis(start + 2700)).gust_3s_mps, None);
            feed(&mut w, start + 2750, start + 2750, 50, |_| 6.0);
            assert_eq!(
                w.gust_3s_mps(Millis(start + 2750)),
                Some(6.0),
                "start {start}"
            );
        }
    }

    /// The 3-s mean holds only the last 3 s; the ten-minute mean only the
    /// last ten minutes (60 bins of 10 s); the peak includes the present,
    /// not yet closed, 3-s mean.
    #[test]
    fn windows_forget_what_lies_outside_them() {
        let mut w = stats(WindConfig::default(), 0);
        feed(&mut w, 0, 5_950, 50, |_| 5.0);
        feed(&mut w, 6_000, 9_000, 50, |_| 9.0);
        assert_eq!(w.gust_3s_mps(Millis(9_000)), Some(9.0));
        let r = w.report(Millis(9_000));
        assert_eq!(r.gust_3s_mps, Some(9.0));
        assert_eq!(r.peak_gust_mps, Some(9.0), "the open 3-s mean counts");
        // The mean of what was fed: 120 samples of 5, 61 of 9.
        let want = (120.0 * 5.0 + 61.0 * 9.0) / 181.0;
        assert!((r.mean_10min_mps.unwrap() - want).abs() < 1e-4);

        // Twenty minutes: ten at 4 m/s, then ten at 8 m/s (one sample a
        // second). The ten-minute mean holds the last 60 coarse bins only.
        let mut w = stats(WindConfig::default(), 0);
        feed(&mut w, 0, 599_000, 1000, |_| 4.0);
        feed(&mut w, 600_000, 1_199_000, 1000, |_| 8.0);
        let r = w.report(Millis(1_199_000));
        assert_eq!(r.mean_10min_mps, Some(8.0));
        assert!((r.mean_span_s - 600.0).abs() < 1e-3);
        assert_eq!(r.gust_factor, Some(1.0));
    }

    #[test]
    fn asking_before_the_newest_sample_gives_no_gust() {
        let mut w = stats(WindConfig::default(), 0);
        feed(&mut w, 0, 6_000, 100, |_| 7.0);
        // A time in an earlier bin than the newest sample's: not a "now".
        assert_eq!(w.gust_3s_mps(Millis(5_000)), None);
        assert_eq!(w.report(Millis(5_000)).gust_3s_mps, None);
        assert_eq!(w.gust_3s_mps(Millis(6_000)), Some(7.0));
    }

    /// With calm set at 0 and no wind at all, there is no gust factor (not
    /// a division by zero).
    #[test]
    fn no_gust_factor_in_dead_calm() {
        let config = WindConfig {
            calm_below_mps: 0.0,
            ..WindConfig::default()
        };
        let mut w = stats(config, 0);
        let mut t = 0;
        while t <= 20_000 {
            w.push(Millis(t), 0.0, None).unwrap();
            t += 100;
        }
        let r = w.report(Millis(20_000));
        assert_eq!(r.mean_10min_mps, Some(0.0));
        assert_eq!(r.gust_factor, None);
    }

    #[test]
    fn two_samples_at_one_time_stamp_are_both_taken() {
        let mut w = stats(WindConfig::default(), 0);
        w.push(Millis(1000), 4.0, Some(1.0)).unwrap();
        assert_eq!(w.push(Millis(1000), 6.0, Some(1.0)), Ok(()));
        assert!(w.push(Millis(999), 6.0, Some(1.0)).is_err());
    }

    /// Calm is "below" its speed: a wind of exactly that speed has a
    /// direction.
    #[test]
    fn wind_at_the_calm_speed_is_not_calm() {
        let config = WindConfig::default();
        let mut w = stats(config, 0);
        feed(&mut w, 0, 30_000, 500, |_| config.calm_below_mps);
        assert!(
            matches!(
                w.report(Millis(30_000)).direction,
                WindDirection::Defined { .. }
            ),
            "{:?}",
            w.report(Millis(30_000)).direction
        );
        let mut w = stats(config, 0);
        feed(&mut w, 0, 30_000, 500, |_| config.calm_below_mps * 0.99);
        assert_eq!(w.report(Millis(30_000)).direction, WindDirection::Calm);
    }

    /// The direction is called calm when more than half the samples are
    /// calm: exactly half is not.
    #[test]
    fn calm_needs_more_than_half_the_samples() {
        let config = WindConfig::default();
        let mut w = stats(config, 0);
        // Alternating 0.2 m/s (calm) and 3 m/s from the west: half calm.
        feed(&mut w, 0, 29_500, 500, |t| {
            if (t / 500) % 2 == 0 {
                0.2
            } else {
                3.0
            }
        });
        let d = w.report(Millis(29_500)).direction;
        assert!(matches!(d, WindDirection::Defined { .. }), "{d:?}");
        // One calm sample more tips it.
        w.push(Millis(29_600), 0.2, Some(4.712_389)).unwrap();
        assert_eq!(w.report(Millis(29_600)).direction, WindDirection::Calm);
    }

    /// Every field of the wind configuration, just outside its documented
    /// range, is refused under its own name; the bounds are accepted.
    #[test]
    fn wind_config_each_field_refused_under_its_name() {
        use crate::error::Field;
        let d = WindConfig::default();
        assert_eq!(d.validate(), Ok(()));
        type Set = fn(&mut WindConfig, f32);
        let fields: [(Field, Set, f32, f32); 8] = [
            (
                Field::WindPeakWindowS,
                |c, v| c.peak_window_s = v,
                3.0,
                600.0,
            ),
            (
                Field::WindDirectionWindowS,
                |c, v| c.direction_window_s = v,
                10.0,
                600.0,
            ),
            (
                Field::WindCalmBelowMps,
                |c, v| c.calm_below_mps = v,
                0.0,
                5.0,
            ),
            (
                Field::WindVariableSpreadRad,
                |c, v| c.variable_spread_rad = v,
                0.0,
                10.0,
            ),
            (
                Field::WindMaxSpeedMps,
                |c, v| c.max_speed_mps = v,
                1.0,
                150.0,
            ),
            (
                Field::WindStaleAfterS,
                |c, v| c.stale_after_s = v,
                1e-3,
                86_400.0,
            ),
            (
                Field::WindStuckAfterS,
                |c, v| c.stuck_after_s = v,
                0.0,
                86_400.0,
            ),
            (
                Field::WindMeanGustFactor,
                |c, v| c.mean_gust_factor = v,
                1.0,
                3.0,
            ),
        ];
        crate::sense::each_field_refused_under_its_name(d, WindConfig::validate, &fields);
    }

    /// The guard's speed: the peak gust, else the latest 3-s mean, else the
    /// mean times the fallback factor, else none.
    #[test]
    fn design_gust_takes_the_first_figure_there_is() {
        let r = WindReport {
            gust_3s_mps: Some(7.0),
            peak_gust_mps: Some(9.0),
            mean_10min_mps: Some(5.0),
            mean_span_s: 600.0,
            gust_factor: Some(1.8),
            direction: WindDirection::NoData,
            basis: GustBasis::Measured,
        };
        assert_eq!(r.design_gust_mps(1.5), Some(9.0));
        let r = WindReport {
            peak_gust_mps: None,
            ..r
        };
        assert_eq!(r.design_gust_mps(1.5), Some(7.0));
        let r = WindReport {
            gust_3s_mps: None,
            ..r
        };
        assert_eq!(r.design_gust_mps(1.5), Some(7.5));
        let r = WindReport {
            mean_10min_mps: None,
            ..r
        };
        assert_eq!(r.design_gust_mps(1.5), None);
    }

    /// The speed channel's stale and stuck faults start 1 ms past their
    /// limits; a stuck time of 0 disables the stuck check.
    #[test]
    fn wind_stale_and_stuck_start_one_millisecond_past_their_limits() {
        let has = |w: &WindStats, t: u64, class: &str| {
            w.faults(Millis(t))
                .iter()
                .any(|f| f.class_code() == class && f.sensor() == Sensor::WindSpeed)
        };
        let config = WindConfig {
            stale_after_s: 5.0,
            stuck_after_s: 60.0,
            ..WindConfig::default()
        };
        let mut w = stats(config, 0);
        w.push(Millis(1000), 3.0, None).unwrap();
        assert!(!has(&w, 6000, "stale"));
        assert!(has(&w, 6001, "stale"));

        let mut w = stats(config, 0);
        feed(&mut w, 0, 60_000, 1000, |_| 3.0);
        assert!(!has(&w, 60_000, "stuck"));
        w.push(Millis(60_001), 3.0, None).unwrap();
        assert!(has(&w, 60_001, "stuck"));

        let off = WindConfig {
            stuck_after_s: 0.0,
            ..config
        };
        let mut w = stats(off, 0);
        feed(&mut w, 0, 120_000, 1000, |_| 3.0);
        assert!(!has(&w, 120_000, "stuck"), "stuck check disabled");
    }

    /// After a gap, the rings still hold bins from before it: the 3-s and
    /// ten-minute windows must take only the bins inside them.
    #[test]
    fn bins_left_from_before_a_gap_stay_out_of_the_windows() {
        let mut w = stats(WindConfig::default(), 0);
        feed(&mut w, 0, 3_000, 50, |_| 20.0);
        // Silence until 10 s, then one sample of 5 m/s.
        w.push(Millis(10_000), 5.0, Some(4.712_389)).unwrap();
        assert_eq!(w.gust_3s_mps(Millis(10_000)), Some(5.0));

        // Five minutes at 4 m/s, ten minutes of silence, one minute at
        // 8 m/s: the ten-minute mean is of the last minute only.
        let mut w = stats(WindConfig::default(), 0);
        feed(&mut w, 0, 300_000, 1000, |_| 4.0);
        feed(&mut w, 900_000, 960_000, 1000, |_| 8.0);
        assert_eq!(w.report(Millis(960_000)).mean_10min_mps, Some(8.0));
    }

    /// Ten minutes after the last sample the ten-minute mean is gone: no
    /// figure rather than 0/0.
    #[test]
    fn no_mean_when_the_window_holds_no_sample() {
        let mut w = stats(WindConfig::default(), 0);
        feed(&mut w, 0, 10_000, 100, |_| 6.0);
        assert_eq!(w.report(Millis(10_000)).mean_10min_mps, Some(6.0));
        let r = w.report(Millis(700_000));
        assert_eq!(r.mean_10min_mps, None);
        assert_eq!(r.gust_factor, None);
    }

    /// The report's 3-s gust, taken from its open-boundary loop when that
    /// ends at now's bin, has the bits of the mean ending there computed
    /// afresh (as the report computed it before), and of `gust_3s_mps`:
    /// samples at irregular steps with gaps, reports at, between and long
    /// after the samples.
    #[test]
    fn the_reports_gust_is_the_mean_ending_now_to_the_bit() {
        let mut w = stats(WindConfig::default(), 0);
        let mut next = xorshift32(0x2545_f491_u32);
        let mut t = 0_u64;
        for _ in 0..3_000 {
            let r = next();
            // Mostly 20 ms to 1.3 s; now and then a gap of up to 8 s.
            t += if r % 50 == 0 {
                u64::from(r % 8_000)
            } else {
                20 + u64::from(r % 1_280)
            };
            let speed = f32::from_bits(0x3f80_0000 | (next() >> 9)) * 7.0;
            let _ = w.push(Millis(t), speed, Some(1.0));
            for later in [0, 1, 250, 2_999, 3_000, 9_000] {
                let now = Millis(t + later);
                let now_bin = bin_of(now.0, FINE_BIN_MS);
                let fresh = match w.newest_fine {
                    Some(c) if now_bin >= c => w.fine_mean_ending(now_bin),
                    _ => None,
                };
                let got = w.report(now).gust_3s_mps;
                assert_eq!(
                    got.map(f32::to_bits),
                    fresh.map(f32::to_bits),
                    "t {t} + {later}"
                );
                assert_eq!(got.map(f32::to_bits), w.gust_3s_mps(now).map(f32::to_bits));
            }
        }
    }

    /// The closed boundaries' gusts with the mean reused where the window
    /// holds the same bins have the bits of those computed afresh at every
    /// boundary: the same latest gust and the same largest gust in every
    /// coarse bin, after every sample of a trace at irregular steps (one
    /// to many fine bins apart, gaps of up to 8 s), and the same reports.
    #[test]
    fn reused_boundary_means_are_the_fresh_ones() {
        let mut w = stats(WindConfig::default(), 0);
        let mut fresh = w.clone();
        fresh.always_fresh = true;
        let mut next = xorshift32(0x9e37_79b9_u32);
        let mut t = 0_u64;
        for _ in 0..6_000 {
            let r = next();
            t += match r % 10 {
                0 => u64::from(r % 8_000),
                1..=3 => 250 * u64::from(r % 6),
                _ => 20 + u64::from(r % 1_280),
            };
            let speed = f32::from_bits(0x3f80_0000 | (next() >> 9)) * 9.0 - 8.0;
            let from = (r % 7 != 0).then_some(2.0);
            let a = w.push(Millis(t), speed, from);
            let b = fresh.push(Millis(t), speed, from);
            assert_eq!(a, b);
            assert_eq!(
                w.latest_gust_mps.map(f32::to_bits),
                fresh.latest_gust_mps.map(f32::to_bits),
                "t {t}"
            );
            for (x, y) in w.coarse.iter().zip(&fresh.coarse) {
                assert_eq!(
                    (x.id, x.gust_max_mps.to_bits()),
                    (y.id, y.gust_max_mps.to_bits())
                );
            }
            let (x, y) = (w.report(Millis(t)), fresh.report(Millis(t)));
            assert_eq!(x, y);
            assert_eq!(
                x.peak_gust_mps.map(f32::to_bits),
                y.peak_gust_mps.map(f32::to_bits)
            );
        }
    }
}
