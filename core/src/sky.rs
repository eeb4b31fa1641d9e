//! Worst case over the sky, the payload envelope and the safest park pose.
//!
//! **Sky grid.** Poses are sampled on a grid ([`SkyGrid`]): for an equatorial
//! mount hour angle H = −π + i·2π/N₁ (i = 0..N₁) and declination
//! δ = −π/2 + j·π/(N₂ − 1) (j = 0..N₂, both poles included), on one or both
//! pier sides; for an alt-azimuth mount azimuth A = i·2π/N₁ and altitude from
//! the horizon limit to the zenith in N₂ steps. A pose is kept when the tube's
//! altitude on level ground, sin h = sin φ·sin δ + cos φ·cos δ·cos H, is at or
//! above the horizon limit. Wind directions are sampled as d = k·2π/N_d
//! (radians from north clockwise, k = 0..N_d).
//!
//! **Cost.** The scan evaluates, per kept pose, the gravity and inertia terms
//! once and, per wind direction, one `Loads` (the overturning terms of every
//! support edge) and the axis wind terms: about poses × N_d × (edges + 2)
//! passes over the parts. The lowest tip wind of the grid is then refined at
//! its pose by [`Rig::worst_wind`] (72 directions and a golden-section
//! search), once. Measured by `cargo bench -p standfast` (bench `sky`) on a
//! shared two-core x86-64 host, for an invented equatorial rig of eight parts
//! on a tripod: a 15° grid above 10° (280 poses) with 16 directions takes
//! about 18 ms; a 10° grid (598 poses) with 12 directions about 28 ms; at
//! most about 4 µs per pose and direction.
//!
//! **Caution.** Results hold only at the sampled poses and directions and only
//! as far as the static model holds; a finer grid may find a slightly worse
//! pose. Secure the rig anyway and stay inside the mount maker's limits.

use crate::air::Air;
use crate::error::{Error, ErrorKind, Field};
use crate::frame::Tilt;
use crate::math::{self, Vec3, PI, STANDARD_GRAVITY_MPS2, TAU};
use crate::mount::{MountGeometry, MountKind, PierSide, Pose};
use crate::rig::{Conditions, PartRole, Rig, Stage, MAX_PART_MASS_KG};
use crate::stability::{ratio, Loads};
use crate::torque::{
    centroidal_inertia_kg_m2, gravity_terms, parallel_axis_kg_m2, MountAxis, Payload, PayloadPick,
};
use heapless::Vec;

/// Most rows of a payload envelope table.
pub const MAX_ENVELOPE_ROWS: usize = 16;
/// Most samples along either grid axis.
pub const MAX_GRID_STEPS: u16 = 721;
/// Most wind directions in a scan.
pub const MAX_WIND_DIRECTIONS: u16 = 360;

/// The grid of poses a scan visits (see the module docs).
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct SkyGrid {
    /// Samples over a full turn of hour angle (or azimuth), 1 to 721.
    pub primary_steps: u16,
    /// Samples of declination from −90° to +90° (or of altitude from the
    /// horizon limit to the zenith), both ends included, 2 to 721.
    pub secondary_steps: u16,
    /// Lowest tube altitude kept, radians, −π/2 to π/2.
    pub horizon_limit_rad: f32,
    /// Visit both pier sides (equatorial mounts only).
    pub both_pier_sides: bool,
}

impl SkyGrid {
    /// A grid of about `step_rad` spacing on both axes, both pier sides, above
    /// `horizon_limit_rad`.
    #[must_use]
    pub fn with_step(step_rad: f32, horizon_limit_rad: f32) -> SkyGrid {
        let step = math::clamp(step_rad, TAU / 720.0, PI);
        let n1 = math::floor(TAU / step + 0.5);
        let n2 = math::floor(PI / step + 0.5) + 1.0;
        SkyGrid {
            primary_steps: clamp_steps(n1, 1),
            secondary_steps: clamp_steps(n2, 2),
            horizon_limit_rad,
            both_pier_sides: true,
        }
    }

    /// Checks the step counts and the horizon limit.
    ///
    /// # Errors
    /// The first field out of range.
    pub fn validate(&self) -> Result<(), Error> {
        Error::check(
            Field::SkyGridPrimarySteps,
            f32::from(self.primary_steps),
            1.0,
            f32::from(MAX_GRID_STEPS),
        )?;
        Error::check(
            Field::SkyGridSecondarySteps,
            f32::from(self.secondary_steps),
            2.0,
            f32::from(MAX_GRID_STEPS),
        )?;
        Error::check(
            Field::SkyGridHorizonLimitRad,
            self.horizon_limit_rad,
            -PI / 2.0,
            PI / 2.0,
        )?;
        Ok(())
    }

    /// The poses of the grid kept for `mount`, in a fixed order (pier side,
    /// then declination or altitude, then hour angle or azimuth). Equatorial
    /// poses are [`Pose::Equatorial`], alt-azimuth ones [`Pose::Horizontal`].
    #[must_use]
    pub fn poses(&self, mount: &MountGeometry) -> GridPoses {
        let sides: u32 = if self.both_pier_sides && mount.kind == MountKind::Equatorial {
            2
        } else {
            1
        };
        GridPoses {
            grid: *self,
            kind: mount.kind,
            sin_lat: math::sin(mount.latitude_rad),
            cos_lat: math::cos(mount.latitude_rad),
            sin_limit: math::sin(self.horizon_limit_rad),
            index: 0,
            total: sides * u32::from(self.primary_steps) * u32::from(self.secondary_steps),
        }
    }
}

fn clamp_steps(n: f32, lo: u16) -> u16 {
    // Clamped first; float-to-integer `as` saturates and maps NaN to 0.
    (math::clamp(n, f32::from(lo), f32::from(MAX_GRID_STEPS)) as u16).max(lo)
}

/// Iterator over the kept poses of a [`SkyGrid`].
#[derive(Clone, Debug)]
pub struct GridPoses {
    grid: SkyGrid,
    kind: MountKind,
    sin_lat: f32,
    cos_lat: f32,
    sin_limit: f32,
    index: u32,
    total: u32,
}

/// A grid index as `f32`: grid indices stay below 2 × 721², exact in `f32`.
fn index_f32(v: u32) -> f32 {
    v as f32
}

impl Iterator for GridPoses {
    type Item = Pose;

    fn next(&mut self) -> Option<Pose> {
        let n1 = u32::from(self.grid.primary_steps.max(1));
        let n2 = u32::from(self.grid.secondary_steps.max(2));
        while self.index < self.total {
            let k = self.index;
            self.index += 1;
            let i = k % n1;
            let j = (k / n1) % n2;
            let side = if k / (n1 * n2) == 0 {
                PierSide::TubeEast
            } else {
                PierSide::TubeWest
            };
            let fi = index_f32(i);
            let fj = index_f32(j) / index_f32(n2 - 1);
            match self.kind {
                MountKind::Equatorial => {
                    let h = -PI + fi * TAU / index_f32(n1);
                    let d = -PI / 2.0 + fj * PI;
                    let sin_alt =
                        self.sin_lat * math::sin(d) + self.cos_lat * math::cos(d) * math::cos(h);
                    if sin_alt + 1e-6 < self.sin_limit {
                        continue;
                    }
                    return Some(Pose::Equatorial {
                        hour_angle_rad: h,
                        declination_rad: d,
                        pier_side: side,
                    });
                }
                MountKind::AltAzimuth => {
                    let lo = math::clamp(self.grid.horizon_limit_rad, -PI / 2.0, PI / 2.0);
                    return Some(Pose::Horizontal {
                        azimuth_rad: fi * TAU / index_f32(n1),
                        altitude_rad: lo + fj * (PI / 2.0 - lo),
                        pier_side: side,
                    });
                }
            }
        }
        None
    }
}

/// Wind direction `k` of `n` evenly spaced over a full turn, radians from
/// north clockwise: k·2π/n.
#[must_use]
pub fn direction_rad(k: u16, n: u16) -> f32 {
    f32::from(k) * TAU / f32::from(n.max(1))
}

/// What a sky scan looks for.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct SkyScan {
    /// The poses.
    pub grid: SkyGrid,
    /// Wind directions sampled at each pose, 1 to 360 (12 to 16 is usual).
    pub wind_directions: u16,
    /// Wind speed for the axis torques (the wind observed in), m/s.
    pub wind_speed_mps: f32,
    /// Air density.
    pub air: Air,
    /// Ground tilt.
    pub tilt: Tilt,
}

impl SkyScan {
    /// Checks the grid, the direction count and the wind speed.
    ///
    /// # Errors
    /// The first field out of range.
    pub fn validate(&self) -> Result<(), Error> {
        self.grid.validate()?;
        Error::check(
            Field::SkyScanWindDirections,
            f32::from(self.wind_directions),
            1.0,
            f32::from(MAX_WIND_DIRECTIONS),
        )?;
        Error::check(Field::SkyScanWindSpeedMps, self.wind_speed_mps, 0.0, 100.0)?;
        Tilt::new(self.tilt.magnitude_rad, self.tilt.downhill_azimuth_rad)?;
        Ok(())
    }
}

/// The pose of the highest steady torque on one axis.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize))]
pub struct AxisExtreme {
    /// The pose.
    pub pose: Pose,
    /// Direction of the wind that gives it, radians from north clockwise.
    pub wind_from_rad: f32,
    /// Gravity torque there, N·m, signed about the axis unit vector.
    pub gravity_nm: f32,
    /// Wind torque there, N·m, signed.
    pub wind_nm: f32,
    /// Gravity + wind, N·m, signed; its magnitude is the scan's maximum.
    pub steady_nm: f32,
    /// |steady| ÷ rated torque; `None` without drive ratings.
    pub rated_utilisation: Option<f32>,
}

/// The pose of the lowest tip wind speed.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize))]
pub struct TipExtreme {
    /// The pose.
    pub pose: Pose,
    /// Lowest wind speed that tips the rig there, m/s: the lower of the
    /// grid's sampled directions and a refinement over all directions at that
    /// pose; `None` if no wind can tip it in any pose scanned.
    pub tip_wind_mps: Option<f32>,
    /// Direction that wind blows from, radians from north clockwise.
    pub from_rad: f32,
}

/// The worst cases of a sky scan.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize))]
pub struct SkyWorst {
    /// Highest |gravity + wind| torque on the primary axis.
    pub primary: AxisExtreme,
    /// Highest |gravity + wind| torque on the secondary axis.
    pub secondary: AxisExtreme,
    /// Largest moment of inertia met on each axis, `[primary, secondary]`,
    /// kg·m².
    pub max_inertia_kg_m2: [f32; 2],
    /// Lowest tip wind speed.
    pub tip: TipExtreme,
    /// Poses evaluated.
    pub poses_checked: u32,
}

fn empty_extreme(pose: Pose) -> AxisExtreme {
    AxisExtreme {
        pose,
        wind_from_rad: 0.0,
        gravity_nm: 0.0,
        wind_nm: 0.0,
        steady_nm: 0.0,
        rated_utilisation: None,
    }
}

fn no_pose() -> Error {
    let mut e = Error::new(ErrorKind::TooFew, Field::SkyGrid);
    e.min = 1.0;
    e
}

/// The lightest and heaviest payload that keep the drives within their
/// ratings over the whole grid.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize))]
pub struct MassRange {
    /// Lightest payload, kg (above 0 when the counterweights alone overload
    /// a drive).
    pub lightest_kg: f32,
    /// Heaviest payload, kg.
    pub heaviest_kg: f32,
    /// True when nothing limited the heaviest payload below
    /// [`MAX_PART_MASS_KG`] (the value then is that cap).
    pub capped: bool,
}

/// A payload centre-of-gravity position in the secondary-stage frame.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct PayloadOffset {
    /// Offset a along the secondary axis `s`, metres, positive to the payload
    /// side (away from the counterweights).
    pub along_secondary_axis_m: f32,
    /// Offset b along the tube `p`, metres, positive toward the sky end.
    pub along_tube_m: f32,
}

/// One row of a payload envelope.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize))]
pub struct EnvelopeRow {
    /// Where the payload's centre of gravity sits.
    pub offset: PayloadOffset,
    /// Payload masses that fit with the counterweights where they are;
    /// `None` when no mass fits.
    pub with_counterweights: Option<MassRange>,
    /// Payload masses that fit with the counterweights removed (the shaft
    /// stays); `None` when no mass fits.
    pub without_counterweights: Option<MassRange>,
}

/// Feasible interval of m ≥ 0 under constraints k·m ≤ r.
#[derive(Clone, Copy, Debug)]
struct Interval {
    lo: f32,
    hi: f32,
    capped: bool,
}

impl Interval {
    const FULL: Interval = Interval {
        lo: 0.0,
        hi: MAX_PART_MASS_KG,
        capped: true,
    };

    fn limit(&mut self, k: f32, r: f32) {
        if k > 1e-9 {
            let m = r / k;
            if m < self.hi {
                self.hi = m;
                self.capped = false;
            }
        } else if k < -1e-9 {
            self.lo = self.lo.max(r / k);
        } else if r < 0.0 {
            self.lo = f32::INFINITY;
        }
    }

    /// |A + mB| + C + mD ≤ P.
    fn within(&mut self, a: f32, b: f32, c: f32, d: f32, p: f32) {
        self.limit(b + d, p - a - c);
        self.limit(d - b, p + a - c);
    }

    fn range(self) -> Option<MassRange> {
        (self.lo <= self.hi && self.hi >= 0.0).then_some(MassRange {
            lightest_kg: self.lo.max(0.0),
            heaviest_kg: self.hi,
            capped: self.capped,
        })
    }
}

/// A request for the safest park pose.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct ParkRequest {
    /// Direction the wind blows from, radians from north clockwise.
    pub wind_from_rad: f32,
    /// Design wind speed (a gust), m/s.
    pub wind_speed_mps: f32,
    /// Air density.
    pub air: Air,
    /// Ground tilt.
    pub tilt: Tilt,
    /// True if the cover will be fitted in the park pose.
    pub cover_fitted: bool,
    /// Poses to scan besides the home pose and the extra ones; `None` for
    /// none.
    pub scan: Option<SkyGrid>,
}

/// One park candidate and its utilisations at the requested wind.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize))]
pub struct ParkCandidate {
    /// The pose.
    pub pose: Pose,
    /// Highest overturning utilisation of any support edge (1.0 tips).
    pub overturning_utilisation: f32,
    /// |gravity + wind torque| ÷ rated torque, `[primary, secondary]`; 0
    /// without drive ratings.
    pub axis_utilisation: [f32; 2],
    /// The score: the highest of the three utilisations.
    pub score: f32,
}

/// The safest park pose found.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize))]
pub struct ParkChoice {
    /// The candidate of lowest score (ties: lowest sum of utilisations, then
    /// the first visited: home, the extra poses, the scan).
    pub best: ParkCandidate,
    /// The mount's home pose, for comparison.
    pub home: ParkCandidate,
    /// home score − best score (≥ 0): how much utilisation the move saves.
    pub gain: f32,
    /// Candidates evaluated.
    pub candidates: u32,
}

impl Rig {
    /// Scans the sky grid for the highest steady (gravity + wind) torque on
    /// each axis and the lowest tip wind speed, with the cover off. The axis
    /// torques use `scan.wind_speed_mps` from each sampled direction; the tip
    /// wind is independent of that speed. See the module docs for the cost.
    ///
    /// # Errors
    /// An invalid scan, or a grid that keeps no pose.
    pub fn sky_scan(&self, scan: &SkyScan) -> Result<SkyWorst, Error> {
        scan.validate()?;
        let q = scan.air.dynamic_pressure_pa(scan.wind_speed_mps);
        let mut primary: Option<AxisExtreme> = None;
        let mut secondary: Option<AxisExtreme> = None;
        let mut max_i = [0.0_f32; 2];
        let mut tip: Option<(f32, Pose, f32)> = None;
        let mut first: Option<Pose> = None;
        let mut checked = 0_u32;
        let nd = scan.wind_directions;
        for pose in scan.grid.poses(self.mount()) {
            let placement = self.place(pose, scan.tilt, false)?;
            first.get_or_insert(pose);
            checked = checked.saturating_add(1);
            let g = gravity_terms(&placement);
            for (m, t) in max_i.iter_mut().zip(g.iter()) {
                *m = m.max(t.inertia_kg_m2);
            }
            for k in 0..nd {
                let d = direction_rad(k, nd);
                // One pass over the wind loads for the axes and the edges.
                let loads = Loads::with_axes(&placement, d);
                let w = loads.axis_wind_nm_per_pa();
                for ((slot, gt), wt) in [&mut primary, &mut secondary]
                    .into_iter()
                    .zip(g.iter())
                    .zip(w)
                {
                    let wind = q * wt;
                    let steady = gt.gravity_nm + wind;
                    if slot.is_none_or(|e| steady.abs() > e.steady_nm.abs()) {
                        *slot = Some(AxisExtreme {
                            pose,
                            wind_from_rad: d,
                            gravity_nm: gt.gravity_nm,
                            wind_nm: wind,
                            steady_nm: steady,
                            rated_utilisation: None,
                        });
                    }
                }
                if let Some(qt) = loads.tip_pressure_pa() {
                    if tip.is_none_or(|(b, _, _)| qt < b) {
                        tip = Some((qt, pose, d));
                    }
                }
            }
        }
        let first = first.ok_or_else(no_pose)?;
        let mut primary = primary.unwrap_or(empty_extreme(first));
        let mut secondary = secondary.unwrap_or(empty_extreme(first));
        if let Some(d) = self.drives() {
            primary.rated_utilisation = Some(ratio(primary.steady_nm.abs(), d.primary.rated_nm));
            secondary.rated_utilisation =
                Some(ratio(secondary.steady_nm.abs(), d.secondary.rated_nm));
        }
        let tip = match tip {
            Some((q_coarse, pose, d_coarse)) => {
                let c = Conditions {
                    tilt: scan.tilt,
                    air: scan.air,
                    ..Conditions::calm(pose)
                };
                let w = self.worst_wind(&c)?;
                let coarse = scan.air.speed_for_pressure_mps(q_coarse);
                // The refinement searches other directions than the grid's;
                // keep whichever is lower so the result never exceeds a
                // sampled value.
                match w.tip_wind_mps {
                    Some(v) if v <= coarse => TipExtreme {
                        pose,
                        tip_wind_mps: Some(v),
                        from_rad: w.from_rad,
                    },
                    _ => TipExtreme {
                        pose,
                        tip_wind_mps: Some(coarse),
                        from_rad: d_coarse,
                    },
                }
            }
            None => TipExtreme {
                pose: first,
                tip_wind_mps: None,
                from_rad: 0.0,
            },
        };
        Ok(SkyWorst {
            primary,
            secondary,
            max_inertia_kg_m2: max_i,
            tip,
            poses_checked: checked,
        })
    }

    /// The payload envelope: for each payload centre-of-gravity offset, the
    /// range of payload mass that keeps both drives within their ratings at
    /// every pose of `grid`, in calm air on level ground with the cover off.
    ///
    /// The payload bodies chosen by `pick` are replaced by one point mass m at
    /// the offset (`n` offset 0); everything else stays. At each pose and on
    /// each axis the gravity torque A + m·B must stay within the rated torque,
    /// and |A + m·B| + (I₀ + m·d²)·α within the repeated peak torque (α the
    /// drives' slew acceleration, d the payload's distance from the axis);
    /// each condition is linear in m on either side of A + m·B = 0, so the
    /// feasible masses form an interval, intersected over the grid. Without
    /// counterweights, the counterweights are removed and the shaft stays.
    /// Wind is not included: leave margin for it (see [`Rig::sky_scan`]).
    ///
    /// # Errors
    /// No drive ratings, an invalid grid or offset, a bad payload pick, more
    /// offsets than [`MAX_ENVELOPE_ROWS`], or a grid that keeps no pose.
    pub fn payload_envelope(
        &self,
        grid: &SkyGrid,
        pick: PayloadPick,
        offsets: &[PayloadOffset],
    ) -> Result<Vec<EnvelopeRow, MAX_ENVELOPE_ROWS>, Error> {
        grid.validate()?;
        let drives = *self.require_drives()?;
        let payload = Payload::resolve(self, pick)?;
        if offsets.len() > MAX_ENVELOPE_ROWS {
            let mut e = Error::new(ErrorKind::TooMany, Field::PayloadEnvelopeOffsets);
            e.max = 16.0;
            return Err(e);
        }
        let mut state: Vec<(PayloadOffset, Interval, Interval), MAX_ENVELOPE_ROWS> = Vec::new();
        for (i, o) in offsets.iter().enumerate() {
            Error::check(
                Field::PayloadEnvelopeOffsets,
                o.along_secondary_axis_m,
                -5.0,
                5.0,
            )
            .map_err(|e| e.at(i))?;
            Error::check(Field::PayloadEnvelopeOffsets, o.along_tube_m, -5.0, 5.0)
                .map_err(|e| e.at(i))?;
            let _ = state.push((*o, Interval::FULL, Interval::FULL));
        }
        let alpha = drives.slew_acceleration_rad_per_s2;
        let ratings = [drives.primary, drives.secondary];
        let g = STANDARD_GRAVITY_MPS2;
        let mut any = false;
        for pose in grid.poses(self.mount()) {
            any = true;
            let placement = self.place(pose, Tilt::LEVEL, false)?;
            let frames = *placement.frames();
            let origin = frames.origin_m;
            let gravity = placement.gravity_unit() * g;
            // [axis] → (torque, inertia) of the rest, and of the counterweights.
            let mut rest = [(0.0_f32, 0.0_f32); 2];
            let mut cw = [(0.0_f32, 0.0_f32); 2];
            for p in placement.parts() {
                if p.part.stage == Stage::Ground || payload.contains(&p.part) {
                    continue;
                }
                let r = p.cg_m - origin;
                let moment = r.cross(p.weight_n);
                let stage_axes = placement.axes(p.part.stage);
                let target = if matches!(p.part.role, PartRole::Counterweight(_)) {
                    &mut cw
                } else {
                    &mut rest
                };
                for (axis, t) in [MountAxis::Primary, MountAxis::Secondary]
                    .into_iter()
                    .zip(target.iter_mut())
                {
                    if !axis.carries(p.part.stage) {
                        continue;
                    }
                    let a = axis.unit(&frames);
                    t.0 += moment.dot(a);
                    t.1 += parallel_axis_kg_m2(
                        centroidal_inertia_kg_m2(&p.part, &stage_axes, a),
                        p.part.mass_kg,
                        r.reject(a).norm(),
                    );
                }
            }
            for (o, with, without) in state.iter_mut() {
                let local = Vec3::new(o.along_secondary_axis_m, o.along_tube_m, 0.0);
                let r = placement.to_rig(Stage::Secondary, local) - origin;
                let per_kg = r.cross(gravity);
                for (((axis, rating), base), extra) in [MountAxis::Primary, MountAxis::Secondary]
                    .into_iter()
                    .zip(ratings.iter())
                    .zip(rest.iter())
                    .zip(cw.iter())
                {
                    let a = axis.unit(&frames);
                    let b = per_kg.dot(a);
                    let dist = r.reject(a).norm();
                    let d = dist * dist * alpha;
                    for (iv, (t0, i0)) in [
                        (&mut *with, (base.0 + extra.0, base.1 + extra.1)),
                        (&mut *without, *base),
                    ] {
                        iv.within(t0, b, 0.0, 0.0, rating.rated_nm);
                        iv.within(t0, b, i0 * alpha, d, rating.repeated_peak_nm);
                    }
                }
            }
        }
        if !any {
            return Err(no_pose());
        }
        let mut out: Vec<EnvelopeRow, MAX_ENVELOPE_ROWS> = Vec::new();
        for (o, with, without) in state {
            let _ = out.push(EnvelopeRow {
                offset: o,
                with_counterweights: with.range(),
                without_counterweights: without.range(),
            });
        }
        Ok(out)
    }

    /// Evaluates one park candidate (see [`ParkCandidate`]).
    ///
    /// # Errors
    /// An invalid pose or request.
    pub fn park_candidate(&self, req: &ParkRequest, pose: Pose) -> Result<ParkCandidate, Error> {
        let placement = self.place(pose, req.tilt, req.cover_fitted)?;
        let q = req.air.dynamic_pressure_pa(req.wind_speed_mps);
        let drives = self.drives();
        // One pass over the wind loads for the edges and, with drives, the
        // axes (the values of `wind_terms_nm_per_pa`).
        let loads = if drives.is_some() {
            Loads::with_axes(&placement, req.wind_from_rad)
        } else {
            Loads::new(&placement, req.wind_from_rad)
        };
        let over = loads.max_utilisation(q);
        let mut axis = [0.0_f32; 2];
        if let Some(d) = drives {
            let (g, w) = (loads.axis_gravity_nm(), loads.axis_wind_nm_per_pa());
            for (((u, gi), wi), r) in axis.iter_mut().zip(g).zip(w).zip([d.primary, d.secondary]) {
                *u = ratio((gi + q * wi).abs(), r.rated_nm);
            }
        }
        let [a0, a1] = axis;
        Ok(ParkCandidate {
            pose,
            overturning_utilisation: over,
            axis_utilisation: axis,
            score: over.max(a0).max(a1),
        })
    }

    /// The safest park pose for a wind of given direction and speed: among the
    /// home pose, the `extra` poses (for example the mount's own park poses)
    /// and the poses of `req.scan`, the one whose **score** — the highest of
    /// the overturning utilisation and the two axis utilisations
    /// |gravity + wind| ÷ rated torque — is lowest. The rated (continuous)
    /// torque is used because a parked drive or brake holds the wind for as
    /// long as it blows. Taking the maximum means the pose is chosen for its
    /// weakest link. Typical winners turn the tube end-on to the wind with
    /// the counterweights low.
    ///
    /// # Errors
    /// An invalid request, scan or extra pose (indexed).
    pub fn safest_park(&self, req: &ParkRequest, extra: &[Pose]) -> Result<ParkChoice, Error> {
        Error::check(Field::ParkWindSpeedMps, req.wind_speed_mps, 0.0, 100.0)?;
        Error::check(Field::ParkWindFromRad, req.wind_from_rad, -1e4, 1e4)?;
        if let Some(s) = &req.scan {
            s.validate()?;
        }
        let home = self.park_candidate(req, self.mount().home_pose())?;
        let mut best = home;
        let mut count = 1_u32;
        let better = |c: &ParkCandidate, b: &ParkCandidate| {
            let sum = |x: &ParkCandidate| {
                x.overturning_utilisation + x.axis_utilisation.iter().sum::<f32>()
            };
            c.score < b.score || (c.score == b.score && sum(c) < sum(b))
        };
        for (i, p) in extra.iter().enumerate() {
            let c = self.park_candidate(req, *p).map_err(|e| e.at(i))?;
            count = count.saturating_add(1);
            if better(&c, &best) {
                best = c;
            }
        }
        if let Some(grid) = &req.scan {
            for p in grid.poses(self.mount()) {
                let c = self.park_candidate(req, p)?;
                count = count.saturating_add(1);
                if better(&c, &best) {
                    best = c;
                }
            }
        }
        Ok(ParkChoice {
            best,
            home,
            gain: (home.score - best.score).max(0.0),
            candidates: count,
        })
    }
}
