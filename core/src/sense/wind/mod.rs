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
//!
//! **Modules, by concern**: `profile` (the height profile), `config` (the
//! configuration and report both sources share), `channel` (per-channel
//! checks), `binned` (the anemometer's binned statistics, [`WindStats`]),
//! `mean_only` (a mean-only station, [`MeanWind`]). Their items are
//! re-exported here, so paths stay `sense::wind::…` and `sense::…`.

mod binned;
mod channel;
mod config;
mod mean_only;
mod profile;

pub use binned::{WindStats, COARSE_BINS, COARSE_BIN_MS, FINE_BINS, FINE_BIN_MS};
pub use config::{GustBasis, WindConfig, WindDirection, WindReport};
pub use mean_only::MeanWind;
pub use profile::{gust_from_mean, log_profile_factor, TerrainCategory};

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn sizes_are_fixed_and_small() {
        assert!(core::mem::size_of::<WindStats>() <= 3072);
        assert!(core::mem::size_of::<MeanWind>() <= 192);
    }
}
