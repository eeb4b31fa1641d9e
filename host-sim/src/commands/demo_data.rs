//! Invented demo data: a windy night on an invented rig, and a long log for
//! the throughput benchmark.
//!
//! Everything here is made up and reproducible: the same seed gives the same
//! bytes (a ChaCha8 generator with one stream per log, and fixed-decimal
//! output).
//!
//! **Wind.** The along-wind and cross-wind fluctuations are first-order
//! Gauss–Markov (Ornstein–Uhlenbeck) processes, the simplest stochastic
//! model with an integral time scale:
//! `x[k+1] = a·x[k] + σ·√(1 − a²)·n[k]`, `a = exp(−Δt/T)`, which is the exact
//! discretisation of `dx = −x/T dt + σ√(2/T) dW`. The standard deviation is
//! `σ_u = I_v · U` with the turbulence intensity of EN 1991-1-4 §4.4,
//! eq. (4.7) with `k_I = 1` and `c_0 = 1` (flat terrain):
//! `I_v(z) = 1 / ln(z / z0)` for `z ≥ z_min`, `I_v(z_min)` below, with `z0`
//! and `z_min` from EN 1991-1-4 Table 4.1. The integral time scale is
//! `T = L(z) / U` with the turbulence length scale of EN 1991-1-4 Annex B,
//! eq. (B.1): `L(z) = 300 m · (z / 200 m)^α`, `α = 0.67 + 0.05·ln(z0)`
//! (z0 in m), `L(z_min)` below `z_min` (from memory). The cross-wind
//! component has `σ_v = 0.75 σ_u` and a third of the time scale (typical
//! surface-layer ratios, from memory).

use std::io::Write;
use std::path::{Path, PathBuf};

use rand::{Rng, SeedableRng};
use rand_chacha::ChaCha8Rng;

use crate::commands::output::OwnedFolder;
use crate::error::Error;
use crate::input::log::time::{write_iso8601, Timestamp, NS_PER_S};

/// Terrain categories of EN 1991-1-4 Table 4.1: the core's type (one
/// `TerrainCategory` in the project); the demo's turbulence model reads its
/// table in f64 below.
pub use standfast::sense::TerrainCategory;

/// Roughness length z0 of `terrain`, m (EN 1991-1-4 Table 4.1), in f64 for
/// the demo's turbulence model (the core keeps the same table in f32).
#[must_use]
pub fn z0_m(terrain: TerrainCategory) -> f64 {
    match terrain {
        TerrainCategory::Cat0Sea => 0.003,
        TerrainCategory::CatIFlat => 0.01,
        TerrainCategory::CatIIOpen => 0.05,
        TerrainCategory::CatIIISuburban => 0.3,
        TerrainCategory::CatIVUrban => 1.0,
    }
}

/// Minimum height z_min of `terrain`, m (EN 1991-1-4 Table 4.1), in f64.
#[must_use]
pub fn z_min_m(terrain: TerrainCategory) -> f64 {
    match terrain {
        TerrainCategory::Cat0Sea | TerrainCategory::CatIFlat => 1.0,
        TerrainCategory::CatIIOpen => 2.0,
        TerrainCategory::CatIIISuburban => 5.0,
        TerrainCategory::CatIVUrban => 10.0,
    }
}

/// Turbulence intensity at height `z_m` over flat terrain of `terrain`,
/// EN 1991-1-4 eq. (4.7) with `k_I = c_0 = 1`: `1 / ln(max(z, z_min) / z0)`.
#[must_use]
pub fn turbulence_intensity(terrain: TerrainCategory, z_m: f64) -> f64 {
    1.0 / (z_m.max(z_min_m(terrain)) / z0_m(terrain)).ln()
}

/// Integral length scale of along-wind turbulence at `z_m`, m, EN 1991-1-4
/// Annex B eq. (B.1) (from memory): `300 (z/200)^α`, `α = 0.67 + 0.05 ln z0`.
#[must_use]
pub fn integral_length_scale_m(terrain: TerrainCategory, z_m: f64) -> f64 {
    let alpha = 0.67 + 0.05 * z0_m(terrain).ln();
    300.0 * (z_m.max(z_min_m(terrain)) / 200.0).powf(alpha)
}

/// Standard normal variates by the Box–Muller transform over a seeded
/// ChaCha8 stream.
#[derive(Clone, Debug)]
pub struct Normal {
    rng: ChaCha8Rng,
    spare: Option<f64>,
}

impl Normal {
    /// A generator on `stream` of `seed` (streams are independent).
    #[must_use]
    pub fn new(seed: u64, stream: u64) -> Normal {
        let mut rng = ChaCha8Rng::seed_from_u64(seed);
        rng.set_stream(stream);
        Normal { rng, spare: None }
    }

    /// A uniform variate in [0, 1).
    pub fn uniform(&mut self) -> f64 {
        self.rng.random::<f64>()
    }

    /// A standard normal variate.
    pub fn sample(&mut self) -> f64 {
        if let Some(s) = self.spare.take() {
            return s;
        }
        // u1 in (0, 1] so that ln(u1) is finite.
        let u1 = 1.0 - self.uniform();
        let u2 = self.uniform();
        let r = (-2.0 * u1.ln()).sqrt();
        let phi = core::f64::consts::TAU * u2;
        self.spare = Some(r * phi.sin());
        r * phi.cos()
    }
}

/// First-order Gauss–Markov (Ornstein–Uhlenbeck) process, zero mean.
#[derive(Clone, Copy, Debug, Default)]
pub struct GaussMarkov {
    /// Current value.
    pub x: f64,
}

impl GaussMarkov {
    /// Advances by `dt_s` with standard deviation `sigma` and integral time
    /// scale `tau_s`, using the standard normal variate `n`.
    pub fn step(&mut self, dt_s: f64, sigma: f64, tau_s: f64, n: f64) -> f64 {
        let a = (-dt_s / tau_s.max(1e-6)).exp();
        self.x = a * self.x + sigma * (1.0 - a * a).max(0.0).sqrt() * n;
        self.x
    }
}

/// Where the anemometer stands.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct WindSite {
    /// Terrain category around the site.
    pub terrain: TerrainCategory,
    /// Anemometer height above ground, m.
    pub height_m: f64,
}

impl WindSite {
    /// Turbulence intensity at the anemometer ([`turbulence_intensity`]).
    #[must_use]
    pub fn intensity(&self) -> f64 {
        turbulence_intensity(self.terrain, self.height_m)
    }

    /// Integral length scale at the anemometer, m.
    #[must_use]
    pub fn length_scale_m(&self) -> f64 {
        integral_length_scale_m(self.terrain, self.height_m)
    }
}

/// One point of the invented wind series (not the guard's
/// [`standfast::guard::WindSample`], the one wind sample type the host uses).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct WindPoint {
    /// Seconds since the start.
    pub t_s: f64,
    /// Horizontal speed, m/s.
    pub speed_mps: f64,
    /// Direction the wind blows from, degrees clockwise from north, [0, 360).
    pub from_deg: f64,
    /// The imposed mean speed at this time, m/s.
    pub mean_mps: f64,
}

/// Wind samples every `dt_s` for `n` steps around a mean given by
/// `mean(t_s) -> (speed m/s, from deg)`.
pub fn wind_series(
    site: &WindSite,
    mean: impl Fn(f64) -> (f64, f64),
    dt_s: f64,
    n: usize,
    seed: u64,
) -> Vec<WindPoint> {
    let mut normal = Normal::new(seed, 1);
    let iv = site.intensity();
    let l_m = site.length_scale_m();
    let mut u = GaussMarkov::default();
    let mut v = GaussMarkov::default();
    let mut out = Vec::with_capacity(n);
    let mut first = true;
    #[allow(clippy::cast_precision_loss)]
    for k in 0..n {
        let t = k as f64 * dt_s;
        let (mean_u, from) = mean(t);
        let mean_u = mean_u.max(0.3);
        let sigma_u = iv * mean_u;
        let tau = l_m / mean_u;
        if first {
            // Start in the stationary distribution.
            u.x = sigma_u * normal.sample();
            v.x = 0.75 * sigma_u * normal.sample();
            first = false;
        } else {
            u.step(dt_s, sigma_u, tau, normal.sample());
            v.step(dt_s, 0.75 * sigma_u, tau / 3.0, normal.sample());
        }
        let along = mean_u + u.x;
        let speed = along.hypot(v.x);
        let dir = (from + v.x.atan2(along.max(0.05)).to_degrees()).rem_euclid(360.0);
        out.push(WindPoint {
            t_s: t,
            speed_mps: speed,
            from_deg: dir,
            mean_mps: mean_u,
        });
    }
    out
}

/// The invented night: what happens when.
#[derive(Clone, Debug, PartialEq)]
pub struct NightPlan {
    /// Seed of all random streams.
    pub seed: u64,
    /// Start of the logs (UTC).
    pub start: Timestamp,
    /// Length of the logs, s.
    pub duration_s: f64,
    /// Accelerometer rate, Hz.
    pub accel_hz: f64,
    /// The anemometer's site.
    pub site: WindSite,
    /// Mean wind before the front, m/s, and its direction (from), deg.
    pub wind_before: (f64, f64),
    /// Mean wind after the front, m/s, and its direction (from), deg.
    pub wind_after: (f64, f64),
    /// Mean wind at the end of the night, m/s (eases from `wind_after`).
    pub wind_end_mps: f64,
    /// Time the front passes (middle of the ramp), s from the start.
    pub front_at_s: f64,
    /// Duration of the ramp in mean speed and direction, s.
    pub front_ramp_s: f64,
    /// Anemometer drop-out (start s, length s): rows missing from the wind
    /// log, to show gap reporting.
    pub wind_dropout: Option<(f64, f64)>,
    /// Tilt at the start, deg, and the extra tilt the sinking leg adds with
    /// its time constant, deg and s; downhill azimuth of the sinking, deg.
    pub tilt_start_deg: f64,
    /// Extra tilt from the sinking leg at the end of its settling, deg.
    pub sink_deg: f64,
    /// Settling time constant of the sinking leg, s.
    pub sink_tau_s: f64,
    /// Downhill azimuth toward the sinking leg, deg from north clockwise.
    pub sink_azimuth_deg: f64,
    /// Tilt jitter per unit dynamic pressure of the wind, deg/Pa.
    pub rock_deg_per_pa: f64,
    /// Accelerometer noise, standard deviation per axis, g.
    pub accel_noise_g: f64,
    /// Time the mount parks, s from the start.
    pub park_at_s: f64,
    /// Time the cover is fitted, s from the start (after dawn).
    pub cover_at_s: f64,
    /// Zone offset of the anemometer logger's clock, s east of UTC.
    pub wind_zone_s: i32,
}

impl NightPlan {
    /// The default invented night: 21:00 to 06:00 UTC, a front at 01:00
    /// taking the mean wind at 3 m from 3 to 9.5 m/s while it veers from 200°
    /// to 285°, a leg sinking 0.45° over the night, two targets each with a
    /// meridian flip, park at 05:12 and the cover fitted at 05:21.
    #[must_use]
    pub fn windy_night(seed: u64) -> NightPlan {
        NightPlan {
            seed,
            // 2025-11-14T21:00:00Z
            start: Timestamp::from_unix_ns(1_763_154_000 * NS_PER_S),
            duration_s: 9.0 * 3600.0,
            accel_hz: 50.0,
            site: WindSite {
                terrain: TerrainCategory::CatIIOpen,
                height_m: 3.0,
            },
            wind_before: (3.0, 200.0),
            wind_after: (9.5, 285.0),
            wind_end_mps: 6.5,
            front_at_s: 4.0 * 3600.0,
            front_ramp_s: 3600.0,
            wind_dropout: Some((6.5 * 3600.0, 45.0)),
            tilt_start_deg: 0.08,
            sink_deg: 0.45,
            sink_tau_s: 3.0 * 3600.0,
            sink_azimuth_deg: 130.0,
            rock_deg_per_pa: 2e-4,
            accel_noise_g: 0.0015,
            park_at_s: 8.2 * 3600.0,
            cover_at_s: 8.35 * 3600.0,
            wind_zone_s: 3600,
        }
    }

    /// Mean wind speed (m/s) and direction (from, deg) at `t_s`.
    #[must_use]
    pub fn mean_wind(&self, t_s: f64) -> (f64, f64) {
        // Smooth step 0 → 1 across the front.
        let s = 0.5 * (1.0 + ((t_s - self.front_at_s) / (0.5 * self.front_ramp_s)).tanh());
        let (u0, d0) = self.wind_before;
        let (u1, d1) = self.wind_after;
        // After the front the wind eases toward `wind_end_mps`.
        let after_s = (t_s - self.front_at_s - self.front_ramp_s).max(0.0);
        let rest = (self.duration_s - self.front_at_s - self.front_ramp_s).max(1.0);
        let u_after = u1 + (self.wind_end_mps - u1) * (after_s / rest).min(1.0);
        (u0 + (u_after - u0) * s, d0 + (d1 - d0) * s)
    }

    /// Tilt of the ground normal from the sinking leg alone, deg.
    #[must_use]
    pub fn sink_tilt_deg(&self, t_s: f64) -> f64 {
        self.tilt_start_deg + self.sink_deg * (1.0 - (-t_s / self.sink_tau_s).exp())
    }

    /// The wind at 1 Hz over the whole night.
    #[must_use]
    #[allow(clippy::cast_possible_truncation, clippy::cast_sign_loss)]
    pub fn wind(&self) -> Vec<WindPoint> {
        let n = self.duration_s.max(0.0) as usize + 1;
        wind_series(&self.site, |t| self.mean_wind(t), 1.0, n, self.seed)
    }
}

/// Files written by [`write_demo_logs`].
#[derive(Clone, Debug, PartialEq)]
pub struct DemoLogs {
    /// The anemometer log (1 Hz, ISO 8601 with zone, km/h).
    pub wind_csv: PathBuf,
    /// The accelerometer log (50 Hz, epoch seconds, raw counts).
    pub accel_csv: PathBuf,
    /// The mount log (irregular, ISO 8601 without zone).
    pub mount_csv: PathBuf,
    /// The log profile describing the three files.
    pub profile_toml: PathBuf,
}

/// File names used by [`write_demo_logs`].
pub const DEMO_WIND_CSV: &str = "night-wind.csv";
/// Accelerometer log file name.
pub const DEMO_ACCEL_CSV: &str = "night-accel.csv";
/// Mount log file name.
pub const DEMO_MOUNT_CSV: &str = "night-mount.csv";
/// Log profile file name.
pub const DEMO_PROFILE_TOML: &str = "night-log-profile.toml";

/// Counts per g of the invented accelerometer (16-bit at ±2 g).
pub const ACCEL_COUNTS_PER_G: f64 = 16_384.0;

/// The files [`write_demo_logs`] writes, by name.
pub const DEMO_LOG_FILES: [&str; 4] = [
    DEMO_WIND_CSV,
    DEMO_ACCEL_CSV,
    DEMO_MOUNT_CSV,
    DEMO_PROFILE_TOML,
];

/// Writes the night's three logs and their profile into `dir` (created if
/// missing), each atomically. Files of those names already there are
/// replaced only when this command wrote them and they are unchanged (see
/// [`OwnedFolder`]). The rig file for the demo is written by the rig module.
///
/// # Errors
/// [`Error::Usage`] when a file there was not written by this command;
/// [`Error::Io`] when the folder or a file cannot be written.
pub fn write_demo_logs(dir: &Path, plan: &NightPlan) -> Result<DemoLogs, Error> {
    let mut folder = OwnedFolder::open(dir, false)?;
    folder.check(&DEMO_LOG_FILES)?;
    write_demo_logs_in(&mut folder, plan)
}

/// As [`write_demo_logs`], into a folder already opened and checked.
///
/// # Errors
/// [`Error::Io`] when the folder or a file cannot be written.
pub fn write_demo_logs_in(folder: &mut OwnedFolder, plan: &NightPlan) -> Result<DemoLogs, Error> {
    let wind = plan.wind();
    let dir = folder.dir().to_path_buf();
    let logs = DemoLogs {
        wind_csv: dir.join(DEMO_WIND_CSV),
        accel_csv: dir.join(DEMO_ACCEL_CSV),
        mount_csv: dir.join(DEMO_MOUNT_CSV),
        profile_toml: dir.join(DEMO_PROFILE_TOML),
    };
    let mut w = folder.create(DEMO_WIND_CSV)?;
    write_wind_log(&mut w, plan, &wind).map_err(|e| Error::io(&logs.wind_csv, e))?;
    folder.commit(w)?;
    let mut w = folder.create(DEMO_ACCEL_CSV)?;
    write_accel_log(&mut w, plan, &wind).map_err(|e| Error::io(&logs.accel_csv, e))?;
    folder.commit(w)?;
    let mut w = folder.create(DEMO_MOUNT_CSV)?;
    write_mount_log(&mut w, plan).map_err(|e| Error::io(&logs.mount_csv, e))?;
    folder.commit(w)?;
    folder.write(DEMO_PROFILE_TOML, demo_profile_toml().as_bytes())?;
    Ok(logs)
}

/// The log profile for the demo night's files.
#[must_use]
pub fn demo_profile_toml() -> String {
    format!(
        r#"# Log profile for the invented demo night (standfast gen-demo).
# Paths are relative to this file.
[log]
on_error = "skip"   # "stop" ends the read at the first bad row
gap = "10 s"        # default gap length for the files below

# Cup anemometer with temperature and pressure, 1 Hz, logger clock in local
# time with its zone offset written.
[[log.file]]
name = "anemometer"
path = "{wind}"
time = {{ column = "time", format = "iso8601" }}
gap = "5 s"
[log.file.columns]
wind_speed = {{ column = "speed_kmh", unit = "km/h" }}
wind_direction = {{ column = "dir_deg", unit = "deg" }}
air_temperature = {{ column = "temp_c", unit = "°C" }}
pressure = {{ column = "press_hpa", unit = "hPa" }}

# Three-axis accelerometer on the tripod head, 50 Hz, raw 16-bit counts at
# ±2 g ({cpg} counts per g). Sensor x points north, sensor y west.
[[log.file]]
name = "accelerometer"
path = "{accel}"
time = {{ column = "t", format = "epoch_s" }}
gap = "0.5 s"
accel_axes = ["-y", "x", "z"]   # rig x (east) = -sensor y, rig y (north) = sensor x
[log.file.columns]
accel_x = {{ column = "ax", unit = "g", scale = {scale:e} }}
accel_y = {{ column = "ay", unit = "g", scale = {scale:e} }}
accel_z = {{ column = "az", unit = "g", scale = {scale:e} }}

# Mount controller log, written on change and every few seconds, UTC
# without a zone.
[[log.file]]
name = "mount"
path = "{mount}"
time = {{ column = "timestamp", format = "iso8601", zone = "Z" }}
gap = "90 s"
[log.file.columns]
hour_angle = {{ column = "ha_h", unit = "hourangle" }}
declination = {{ column = "dec_deg", unit = "deg" }}
pier_side = {{ column = "pier" }}
cover_fitted = {{ column = "cover" }}
"#,
        wind = DEMO_WIND_CSV,
        accel = DEMO_ACCEL_CSV,
        mount = DEMO_MOUNT_CSV,
        cpg = ACCEL_COUNTS_PER_G,
        scale = 1.0 / ACCEL_COUNTS_PER_G,
    )
}

/// Appends `v` rounded to `decimals` places (fast fixed-point formatting).
#[allow(clippy::cast_possible_truncation)]
pub fn push_fixed(buf: &mut Vec<u8>, v: f64, decimals: u32) {
    let scale = 10_i64.pow(decimals);
    let scaled = (v * scale as f64).round() as i64;
    if scaled < 0 {
        buf.push(b'-');
    }
    let a = scaled.unsigned_abs();
    let scale_u = scale.unsigned_abs();
    push_uint(buf, a / scale_u);
    if decimals > 0 {
        buf.push(b'.');
        let frac = a % scale_u;
        let mut div = scale_u / 10;
        while div > 0 {
            buf.push(b'0' + u8::try_from((frac / div) % 10).unwrap_or(0));
            div /= 10;
        }
    }
}

/// Appends an unsigned integer.
pub fn push_uint(buf: &mut Vec<u8>, mut v: u64) {
    let mut tmp = [0u8; 20];
    let mut i = tmp.len();
    loop {
        i -= 1;
        if let Some(d) = tmp.get_mut(i) {
            *d = b'0' + u8::try_from(v % 10).unwrap_or(0);
        }
        v /= 10;
        if v == 0 || i == 0 {
            break;
        }
    }
    buf.extend_from_slice(tmp.get(i..).unwrap_or(&[]));
}

/// Appends a signed integer.
pub fn push_int(buf: &mut Vec<u8>, v: i64) {
    if v < 0 {
        buf.push(b'-');
    }
    push_uint(buf, v.unsigned_abs());
}

/// Appends epoch seconds with two decimals, exactly from nanoseconds.
fn push_epoch_centis(buf: &mut Vec<u8>, t: Timestamp) {
    let ns = t.unix_ns();
    let centis = ns.div_euclid(10_000_000);
    push_int(buf, centis.div_euclid(100));
    buf.push(b'.');
    let c = u8::try_from(centis.rem_euclid(100)).unwrap_or(0);
    buf.push(b'0' + c / 10);
    buf.push(b'0' + c % 10);
}

/// Writes the 1 Hz anemometer log.
///
/// # Errors
/// Any write error.
pub fn write_wind_log(
    w: &mut impl Write,
    plan: &NightPlan,
    wind: &[WindPoint],
) -> std::io::Result<()> {
    let mut normal = Normal::new(plan.seed, 2);
    let mut buf = Vec::with_capacity(64);
    let mut iso = String::with_capacity(32);
    w.write_all(b"time,speed_kmh,dir_deg,temp_c,press_hpa\n")?;
    for s in wind {
        let n_t = normal.sample();
        let n_p = normal.sample();
        if let Some((a, len)) = plan.wind_dropout {
            if s.t_s >= a && s.t_s < a + len {
                continue;
            }
        }
        let front = 0.5 * (1.0 + ((s.t_s - plan.front_at_s) / (0.5 * plan.front_ramp_s)).tanh());
        let temp_c = 9.5 - 4.0 * front - 0.5 * s.t_s / plan.duration_s + 0.05 * n_t;
        let trough = (-((s.t_s - plan.front_at_s) / 5400.0).powi(2)).exp();
        let press_hpa = 1006.0 - 4.0 * trough + 4.0 * front + 0.02 * n_p;
        buf.clear();
        iso.clear();
        write_iso8601(
            &mut iso,
            plan.start.plus_s(s.t_s),
            0,
            plan.wind_zone_s,
            true,
        );
        buf.extend_from_slice(iso.as_bytes());
        buf.push(b',');
        push_fixed(&mut buf, s.speed_mps * 3.6, 1);
        buf.push(b',');
        push_fixed(&mut buf, s.from_deg, 0);
        buf.push(b',');
        push_fixed(&mut buf, temp_c, 1);
        buf.push(b',');
        push_fixed(&mut buf, press_hpa, 1);
        buf.push(b'\n');
        w.write_all(&buf)?;
    }
    Ok(())
}

/// Wind speed at `t_s` linearly interpolated in a 1 Hz series.
#[allow(clippy::cast_possible_truncation, clippy::cast_sign_loss)]
fn wind_at(wind: &[WindPoint], t_s: f64) -> (f64, f64) {
    let i = t_s.max(0.0).floor() as usize;
    match (wind.get(i), wind.get(i + 1)) {
        (Some(a), Some(b)) => {
            let f = t_s - a.t_s;
            (a.speed_mps + (b.speed_mps - a.speed_mps) * f, a.from_deg)
        }
        (Some(a), None) => (a.speed_mps, a.from_deg),
        _ => (0.0, 0.0),
    }
}

/// Specific force (g units) in the rig frame for a horizontal tilt vector
/// `(tx, ty)` (deg, pointing downhill): the sensor reads the opposite of
/// gravity, so its horizontal part points uphill.
fn specific_force_g(tx_deg: f64, ty_deg: f64) -> [f64; 3] {
    let mag = tx_deg.hypot(ty_deg).to_radians();
    if mag == 0.0 {
        return [0.0, 0.0, 1.0];
    }
    let (sx, sy) = (tx_deg.to_radians() / mag, ty_deg.to_radians() / mag);
    [-mag.sin() * sx, -mag.sin() * sy, mag.cos()]
}

/// Writes the accelerometer log: raw counts, sensor x north, sensor y west.
///
/// # Errors
/// Any write error.
#[allow(
    clippy::cast_possible_truncation,
    clippy::cast_sign_loss,
    clippy::cast_precision_loss
)]
pub fn write_accel_log(
    w: &mut impl Write,
    plan: &NightPlan,
    wind: &[WindPoint],
) -> std::io::Result<()> {
    let mut normal = Normal::new(plan.seed, 3);
    let mut rock = GaussMarkov::default();
    let n = (plan.duration_s * plan.accel_hz).max(0.0) as u64;
    let dt = 1.0 / plan.accel_hz;
    let step_ns = (1e9 / plan.accel_hz).round() as i64;
    let (saz, caz) = plan.sink_azimuth_deg.to_radians().sin_cos();
    let mut buf = Vec::with_capacity(1 << 16);
    w.write_all(b"t,ax,ay,az\n")?;
    for k in 0..n {
        let t_s = k as f64 * dt;
        let t = Timestamp::from_unix_ns(plan.start.unix_ns() + step_ns * k as i64);
        let sink = plan.sink_tilt_deg(t_s);
        let (v, from_deg) = wind_at(wind, t_s);
        // Dynamic pressure with ρ = 1.25 kg/m³ (EN 1991-1-4 §4.5 recommended value).
        let q_pa = 0.5 * 1.25 * v * v;
        // The head rocks downwind with the gust, with a short memory (0.5 s).
        let r = rock.step(dt, 0.3, 0.5, normal.sample());
        let rock_deg = plan.rock_deg_per_pa * q_pa * (1.0 + r);
        let (sw, cw) = (from_deg + 180.0).to_radians().sin_cos();
        let tx = sink * saz + rock_deg * sw;
        let ty = sink * caz + rock_deg * cw;
        let f = specific_force_g(tx, ty);
        let noise = plan.accel_noise_g;
        let rig = [
            f[0] + noise * normal.sample(),
            f[1] + noise * normal.sample(),
            f[2] + noise * normal.sample(),
        ];
        // Sensor x = rig y (north), sensor y = −rig x (west), sensor z = rig z.
        let sensor = [rig[1], -rig[0], rig[2]];
        push_epoch_centis(&mut buf, t);
        for s in sensor {
            buf.push(b',');
            push_int(&mut buf, (s * ACCEL_COUNTS_PER_G).round() as i64);
        }
        buf.push(b'\n');
        if buf.len() > (1 << 16) - 64 {
            w.write_all(&buf)?;
            buf.clear();
        }
    }
    w.write_all(&buf)
}

/// Sidereal hours of hour angle per solar hour (common value, from memory:
/// 1.002 737 909).
pub const SIDEREAL_PER_SOLAR: f64 = 1.002_737_909;

/// The mount's state in the invented night.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct MountState {
    /// Hour angle, hours, positive west.
    pub ha_h: f64,
    /// Declination, deg.
    pub dec_deg: f64,
    /// Tube west of the pier (true) or east (false).
    pub tube_west: bool,
    /// Cover fitted.
    pub cover: bool,
}

impl NightPlan {
    /// Start of the second target, s.
    fn second_target_s(&self) -> f64 {
        6.0 * 3600.0
    }

    /// Times of the mount's events (flips, target change, park, cover), s.
    #[must_use]
    pub fn mount_events_s(&self) -> Vec<f64> {
        let flip_a = (0.1 + 2.5) / SIDEREAL_PER_SOLAR * 3600.0;
        let b = self.second_target_s();
        let flip_b = b + (0.1 + 1.0) / SIDEREAL_PER_SOLAR * 3600.0;
        vec![flip_a, b, flip_b, self.park_at_s, self.cover_at_s]
    }

    /// The mount's state at `t_s`: target A (dec +22°) from hour angle −2.5 h,
    /// target B (dec +48°) from −1.0 h at 03:00 UTC, a meridian flip for
    /// each at +0.1 h (tube from west of the pier to east), then park with
    /// the tube at the pole, and the cover.
    #[must_use]
    pub fn mount_state(&self, t_s: f64) -> MountState {
        let ev = self.mount_events_s();
        let at = |i: usize| ev.get(i).copied().unwrap_or(f64::INFINITY);
        let cover = t_s >= at(4);
        if t_s >= at(3) {
            return MountState {
                ha_h: -6.0,
                dec_deg: 90.0,
                tube_west: true,
                cover,
            };
        }
        let sid_h = |t0: f64| (t_s - t0) / 3600.0 * SIDEREAL_PER_SOLAR;
        if t_s >= at(1) {
            MountState {
                ha_h: -1.0 + sid_h(at(1)),
                dec_deg: 48.0,
                tube_west: t_s < at(2),
                cover,
            }
        } else {
            MountState {
                ha_h: -2.5 + sid_h(0.0),
                dec_deg: 22.0,
                tube_west: t_s < at(0),
                cover,
            }
        }
    }
}

/// Writes the mount log: a row on each event and at irregular intervals
/// (2 s plus an exponential wait of mean 18 s, at most 60 s), times with
/// milliseconds, UTC, no zone.
///
/// # Errors
/// Any write error.
#[allow(clippy::cast_possible_truncation)]
pub fn write_mount_log(w: &mut impl Write, plan: &NightPlan) -> std::io::Result<()> {
    let mut normal = Normal::new(plan.seed, 4);
    let mut events = plan.mount_events_s();
    events.retain(|e| *e > 0.0 && *e < plan.duration_s);
    let mut ev = events.into_iter().peekable();
    let mut buf = Vec::with_capacity(96);
    let mut iso = String::with_capacity(32);
    w.write_all(b"timestamp,ha_h,dec_deg,pier,cover\n")?;
    let mut t_s = 0.0;
    while t_s < plan.duration_s {
        let s = plan.mount_state(t_s);
        buf.clear();
        iso.clear();
        write_iso8601(&mut iso, plan.start.plus_s(t_s), 3, 0, false);
        buf.extend_from_slice(iso.as_bytes());
        buf.push(b',');
        push_fixed(&mut buf, s.ha_h, 5);
        buf.push(b',');
        push_fixed(&mut buf, s.dec_deg, 4);
        buf.extend_from_slice(if s.tube_west { b",west," } else { b",east," });
        buf.push(if s.cover { b'1' } else { b'0' });
        buf.push(b'\n');
        w.write_all(&buf)?;
        // Millisecond steps so that every written time is distinct.
        let wait = (2.0 - 18.0 * (1.0 - normal.uniform()).ln()).min(60.0);
        let mut next = ((t_s + wait) * 1000.0).round() / 1000.0;
        if let Some(&e) = ev.peek() {
            if e <= next {
                // Rounded up, so that the row shows the state after the event.
                next = ((e * 1000.0).ceil() / 1000.0).max(t_s + 0.001);
                ev.next();
            }
        }
        t_s = next;
    }
    Ok(())
}

/// Files written by [`write_bench_log`].
#[derive(Clone, Debug, PartialEq)]
pub struct BenchLog {
    /// The pre-merged 50 Hz log.
    pub csv: PathBuf,
    /// Its profile.
    pub profile_toml: PathBuf,
    /// Data rows written.
    pub rows: u64,
}

/// Benchmark log file name.
pub const BENCH_CSV: &str = "bench-24h-50hz.csv";
/// Benchmark profile file name.
pub const BENCH_PROFILE_TOML: &str = "bench-log-profile.toml";

/// Writes a pre-merged log of `hours` at 50 Hz (24 h: 4 320 000 rows) into
/// `dir`: accelerometer counts on every row, wind on every 50th (1 Hz),
/// mount on every 500th (0.1 Hz), empty cells otherwise. Uses the windy
/// night's models, stretched to `hours`. Existing files are replaced only
/// when this command wrote them and they are unchanged (see
/// [`OwnedFolder`]).
///
/// # Errors
/// [`Error::Usage`] when a file there was not written by this command;
/// [`Error::Io`] when the folder or a file cannot be written.
pub fn write_bench_log(dir: &Path, seed: u64, hours: f64) -> Result<BenchLog, Error> {
    let mut folder = OwnedFolder::open(dir, false)?;
    folder.check(&[BENCH_CSV, BENCH_PROFILE_TOML])?;
    write_bench_log_in(&mut folder, seed, hours)
}

/// As [`write_bench_log`], into a folder already opened and checked.
///
/// # Errors
/// [`Error::Io`] when the folder or a file cannot be written.
#[allow(
    clippy::cast_possible_truncation,
    clippy::cast_sign_loss,
    clippy::cast_precision_loss
)]
pub fn write_bench_log_in(
    folder: &mut OwnedFolder,
    seed: u64,
    hours: f64,
) -> Result<BenchLog, Error> {
    let dir = folder.dir().to_path_buf();
    let csv = dir.join(BENCH_CSV);
    let profile_toml = dir.join(BENCH_PROFILE_TOML);
    let mut plan = NightPlan::windy_night(seed);
    plan.duration_s = hours * 3600.0;
    plan.front_at_s = plan.duration_s * 0.45;
    plan.wind_dropout = None;
    let wind = plan.wind();
    let mut normal = Normal::new(seed, 5);
    let rows = (plan.duration_s * 50.0) as u64;
    let mut w = folder.create(BENCH_CSV)?;
    let io = |e| Error::io(&csv, e);
    w.write_all(b"t,ax,ay,az,wind_mps,wind_from_deg,ha_deg,dec_deg,pier,cover\n")
        .map_err(io)?;
    let mut buf = Vec::with_capacity(1 << 16);
    let (saz, caz) = plan.sink_azimuth_deg.to_radians().sin_cos();
    for k in 0..rows {
        let t_s = k as f64 / 50.0;
        let t = Timestamp::from_unix_ns(plan.start.unix_ns() + 20_000_000 * k as i64);
        let sink = plan.sink_tilt_deg(t_s);
        let f = specific_force_g(sink * saz, sink * caz);
        push_epoch_centis(&mut buf, t);
        for a in f {
            buf.push(b',');
            let noisy = a + plan.accel_noise_g * normal.sample();
            push_int(&mut buf, (noisy * ACCEL_COUNTS_PER_G).round() as i64);
        }
        if k % 50 == 0 {
            let s = wind.get((k / 50) as usize).copied();
            let (v, d) = s.map_or((0.0, 0.0), |s| (s.speed_mps, s.from_deg));
            buf.push(b',');
            push_fixed(&mut buf, v, 2);
            buf.push(b',');
            push_fixed(&mut buf, d, 1);
        } else {
            buf.extend_from_slice(b",,");
        }
        if k % 500 == 0 {
            // Track one target across the whole period, flipping at the meridian.
            let ha_h = -4.0 + (t_s / 3600.0 * SIDEREAL_PER_SOLAR) % 8.0;
            buf.push(b',');
            push_fixed(&mut buf, ha_h * 15.0, 4);
            buf.extend_from_slice(b",30.0000,");
            buf.extend_from_slice(if ha_h < 0.1 { b"W" } else { b"E" });
            buf.extend_from_slice(b",0");
        } else {
            buf.extend_from_slice(b",,,,");
        }
        buf.push(b'\n');
        if buf.len() > (1 << 16) - 128 {
            w.write_all(&buf).map_err(io)?;
            buf.clear();
        }
    }
    w.write_all(&buf).map_err(io)?;
    folder.commit(w)?;
    let profile = format!(
        r#"# Log profile of the benchmark log (standfast gen-demo --bench).
[log]
on_error = "stop"
[[log.file]]
name = "bench"
path = "{BENCH_CSV}"
time = {{ column = "t", format = "epoch_s" }}
gap = "1 s"
[log.file.columns]
accel_x = {{ column = "ax", unit = "g", scale = {s:e} }}
accel_y = {{ column = "ay", unit = "g", scale = {s:e} }}
accel_z = {{ column = "az", unit = "g", scale = {s:e} }}
wind_speed = {{ column = "wind_mps", unit = "m/s" }}
wind_direction = {{ column = "wind_from_deg", unit = "deg" }}
hour_angle = {{ column = "ha_deg", unit = "deg" }}
declination = {{ column = "dec_deg", unit = "deg" }}
pier_side = {{ column = "pier" }}
cover_fitted = {{ column = "cover" }}
"#,
        s = 1.0 / ACCEL_COUNTS_PER_G
    );
    folder.write(BENCH_PROFILE_TOML, profile.as_bytes())?;
    Ok(BenchLog {
        csv,
        profile_toml,
        rows,
    })
}
