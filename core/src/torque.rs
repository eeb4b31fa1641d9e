//! Drive torque loads: gravity, wind and inertial torque about each mount axis,
//! their utilisation of the drive ratings, and balance.
//!
//! **Axes and signs.** The primary axis is the unit vector `k` and the
//! secondary axis the unit vector `s` of [`crate::mount::StageFrames`], both
//! through the axis origin O. A torque is positive about that unit vector by
//! the right-hand rule: τ = Σ ((r − O) × F)·â, N·m, rig frame. The primary
//! axis carries the parts of the primary and the secondary stage; the secondary
//! axis only those of the secondary stage. Ground parts load neither.
//!
//! **Moments of inertia** about an axis through O along â come from each
//! part's mass model and the parallel-axis theorem,
//! I = â·I_cg·â + m·d⊥², with d⊥ the distance of the part's centre of gravity
//! from the axis. A distributed part is taken as its exposed shape centred on
//! its centre of gravity: solid cylinder I_axial = mR²/2,
//! I_transverse = m(3R² + L²)/12; solid box m(b² + c²)/12 about the axis of
//! edge a; thin-walled tube I_axial = mR², I_transverse = m(6R² + L²)/12; a
//! box's faces (uniform surface density) by [`thin_box_inertia_kg_m2`].
//!
//! **Which torque goes against which rating** (see [`DriveRating`]):
//! - *rated torque* ← the steady torque |gravity + wind at the mean speed|:
//!   the drive holds it for as long as the wind blows (tracking, holding);
//! - *repeated peak torque* ← steady torque + I·α: every slew start and stop of
//!   normal running adds the inertial torque on top of the steady load, taken
//!   in the unfavourable sense;
//! - *momentary peak torque* ← |gravity + wind at the gust speed| + I·α: a gust
//!   is a short event outside the normal cycle, and it may strike while a
//!   slew starts or stops (an emergency stop is itself such an event), so the
//!   inertial torque is added here too.
//!
//! A back-driven drive must never be counted as holding: the utilisations
//! assume the drive (or a brake) holds. **Caution:** an estimate from a static,
//! quasi-steady model; stay inside the mount maker's limits.

use crate::drive::DriveRating;
use crate::error::{Error, ErrorKind, Field};
use crate::math::{self, Vec3, STANDARD_GRAVITY_MPS2};
use crate::mount::{Pose, StageFrames};
use crate::rig::{Conditions, MassModel, Part, PartRole, Placement, Rig, RigSpec, Stage};
use crate::shape::Shape;
use crate::stability::ratio;
use crate::Tilt;

/// A mount axis.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(rename_all = "snake_case"))]
pub(crate) enum MountAxis {
    /// The primary axis `k` (right ascension, or azimuth).
    Primary,
    /// The secondary axis `s` (declination, or altitude).
    Secondary,
}

impl MountAxis {
    /// True when parts fixed to `stage` turn about this axis.
    #[must_use]
    pub fn carries(self, stage: Stage) -> bool {
        match (self, stage) {
            (_, Stage::Ground) | (MountAxis::Secondary, Stage::Primary) => false,
            (MountAxis::Primary, _) | (MountAxis::Secondary, Stage::Secondary) => true,
        }
    }

    /// The axis unit vector in the rig frame for a pose's frames (`k` or `s`).
    #[must_use]
    pub fn unit(self, frames: &StageFrames) -> Vec3 {
        match self {
            MountAxis::Primary => frames.primary_axis(),
            MountAxis::Secondary => frames.secondary_axis(),
        }
    }
}

/// Principal moments of inertia of a solid circular cylinder about its own
/// centre of gravity, kg·m²: `[axial, transverse]` = [mR²/2, m(3R² + L²)/12].
#[must_use]
pub fn solid_cylinder_inertia_kg_m2(mass_kg: f32, radius_m: f32, length_m: f32) -> [f32; 2] {
    let r2 = radius_m * radius_m;
    [
        0.5 * mass_kg * r2,
        mass_kg * (3.0 * r2 + length_m * length_m) / 12.0,
    ]
}

/// Principal moments of inertia of a thin-walled tube (all mass at radius R)
/// about its centre of gravity, kg·m²: `[axial, transverse]` =
/// [mR², m(6R² + L²)/12].
#[must_use]
pub fn thin_tube_inertia_kg_m2(mass_kg: f32, radius_m: f32, length_m: f32) -> [f32; 2] {
    let r2 = radius_m * radius_m;
    [
        mass_kg * r2,
        mass_kg * (6.0 * r2 + length_m * length_m) / 12.0,
    ]
}

/// Principal moments of inertia of a solid box with edges `size_m` = [a, b, c]
/// about axes through its centre parallel to the edges, kg·m²:
/// [m(b² + c²)/12, m(a² + c²)/12, m(a² + b²)/12].
#[must_use]
pub fn solid_box_inertia_kg_m2(mass_kg: f32, size_m: [f32; 3]) -> [f32; 3] {
    let [a, b, c] = size_m;
    let k = mass_kg / 12.0;
    [
        k * (b * b + c * c),
        k * (a * a + c * c),
        k * (a * a + b * b),
    ]
}

/// Principal moments of inertia of a box's six faces (closed thin shell of
/// uniform surface density, no volume mass) with edges `size_m` = [a, b, c],
/// about axes through its centre parallel to the edges, kg·m². Each face is a
/// thin plate moved by the parallel-axis theorem; a cube of side s gives
/// 5ms²/18. Zero for a box of zero surface area.
#[must_use]
pub fn thin_box_inertia_kg_m2(mass_kg: f32, size_m: [f32; 3]) -> [f32; 3] {
    let [a, b, c] = size_m;
    let area = 2.0 * (a * b + b * c + c * a);
    if area <= 0.0 {
        return [0.0; 3];
    }
    let sigma = mass_kg / area;
    // About the axis of edge `e`, the other edges `u`, `v`: two faces normal
    // to the axis (plates u×v), two at ±u/2 (plates e×v), two at ±v/2.
    let about = |e: f32, u: f32, v: f32| {
        2.0 * sigma
            * (u * v * (u * u + v * v) / 12.0
                + e * v * (u * u / 4.0 + v * v / 12.0)
                + e * u * (u * u / 12.0 + v * v / 4.0))
    };
    [about(a, b, c), about(b, a, c), about(c, a, b)]
}

/// Parallel-axis theorem: the moment of inertia about an axis at `distance_m`
/// from, and parallel to, a centroidal axis of moment `centroidal_kg_m2`,
/// I = I_cg + m·d², kg·m².
#[must_use]
pub fn parallel_axis_kg_m2(centroidal_kg_m2: f32, mass_kg: f32, distance_m: f32) -> f32 {
    centroidal_kg_m2 + mass_kg * distance_m * distance_m
}

/// Moment of inertia of the part about its own centre of gravity, about the
/// rig-frame unit direction `dir`, kg·m². `stage_axes` are the unit axes of the
/// part's stage frame in rig coordinates (from [`Placement::axes`]). A point
/// mass, or a distributed part without an exposed shape, gives 0.
#[must_use]
pub(crate) fn centroidal_inertia_kg_m2(part: &Part, stage_axes: &[Vec3; 3], dir: Vec3) -> f32 {
    let Some(x) = part.exposure else {
        return 0.0;
    };
    let m = part.mass_kg;
    match (part.mass_model, x.shape) {
        (MassModel::Point, _) => 0.0,
        (
            model,
            Shape::Cylinder {
                diameter_m,
                length_m,
                axis,
            },
        ) => {
            let local = Vec3::from_array(axis).normalized().unwrap_or(Vec3::Z);
            let [e1, e2, e3] = *stage_axes;
            let along = e1 * local.x + e2 * local.y + e3 * local.z;
            let c = math::clamp(along.dot(dir), -1.0, 1.0);
            let r = 0.5 * diameter_m;
            let [ia, it] = if model == MassModel::Shell {
                thin_tube_inertia_kg_m2(m, r, length_m)
            } else {
                solid_cylinder_inertia_kg_m2(m, r, length_m)
            };
            ia * c * c + it * (1.0 - c * c)
        }
        (model, Shape::Box { size_m, edges }) => {
            let i = if model == MassModel::Shell {
                thin_box_inertia_kg_m2(m, size_m)
            } else {
                solid_box_inertia_kg_m2(m, size_m)
            };
            let box_axes = crate::shape::box_axes(stage_axes, edges);
            i.iter()
                .zip(box_axes.iter())
                .map(|(ii, e)| {
                    let c = e.dot(dir);
                    ii * c * c
                })
                .sum()
        }
    }
}

/// Gravity, wind and inertia terms of one axis in one pose, before a wind
/// speed is chosen: torque = `gravity_nm` + q·`wind_nm_per_pa` for a dynamic
/// pressure q in Pa.
#[derive(Clone, Copy, Debug, Default, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize))]
pub struct AxisTerms {
    /// Gravity torque about the axis unit vector, N·m (right-hand rule).
    pub gravity_nm: f32,
    /// Wind torque about the axis unit vector per pascal of dynamic pressure,
    /// N·m/Pa, for the wind direction the terms were computed for.
    pub wind_nm_per_pa: f32,
    /// Moment of inertia of the turning parts about the axis, kg·m².
    pub inertia_kg_m2: f32,
}

impl AxisTerms {
    /// Gravity plus wind torque at dynamic pressure `q_pa`, N·m, signed.
    #[must_use]
    pub fn torque_nm(&self, q_pa: f32) -> f32 {
        self.gravity_nm + q_pa * self.wind_nm_per_pa
    }
}

/// The terms of both axes in one pose: `[primary, secondary]`.
pub type PoseTerms = [AxisTerms; 2];

/// Gravity torque and moment of inertia of both axes (`[primary, secondary]`)
/// for a placed rig; the wind terms are left 0. Uses the placement's gravity
/// (ground tilt included) and its cover state.
#[must_use]
pub(crate) fn gravity_terms(placement: &Placement<'_>) -> PoseTerms {
    let g = gravity_torques_nm(placement);
    let i = inertias_kg_m2(placement);
    let mut out = [AxisTerms::default(); 2];
    for ((t, gi), ii) in out.iter_mut().zip(g).zip(i) {
        t.gravity_nm = gi;
        t.inertia_kg_m2 = ii;
    }
    out
}

/// Gravity torque about both axes (`[primary, secondary]`), N·m, signed
/// about each axis unit vector: the `gravity_nm` of [`gravity_terms`].
#[must_use]
pub(crate) fn gravity_torques_nm(placement: &Placement<'_>) -> [f32; 2] {
    let frames = placement.frames();
    let origin = frames.origin_m;
    let mut out = [0.0_f32; 2];
    for p in placement.parts() {
        let moment = (p.cg_m - origin).cross(p.weight_n);
        for (axis, t) in [MountAxis::Primary, MountAxis::Secondary]
            .into_iter()
            .zip(out.iter_mut())
        {
            if axis.carries(p.part.stage) {
                *t += moment.dot(axis.unit(frames));
            }
        }
    }
    out
}

/// Moment of inertia of the turning parts about both axes (`[primary,
/// secondary]`), kg·m²: the `inertia_kg_m2` of [`gravity_terms`]. It
/// depends on the pose and cover state only, not on the ground tilt.
#[must_use]
pub(crate) fn inertias_kg_m2(placement: &Placement<'_>) -> [f32; 2] {
    let frames = placement.frames();
    let origin = frames.origin_m;
    let mut out = [0.0_f32; 2];
    for p in placement.parts() {
        let r = p.cg_m - origin;
        let stage_axes = placement.axes(p.part.stage);
        for (axis, t) in [MountAxis::Primary, MountAxis::Secondary]
            .into_iter()
            .zip(out.iter_mut())
        {
            if !axis.carries(p.part.stage) {
                continue;
            }
            let a = axis.unit(frames);
            let d = r.reject(a).norm();
            *t += parallel_axis_kg_m2(
                centroidal_inertia_kg_m2(&p.part, &stage_axes, a),
                p.part.mass_kg,
                d,
            );
        }
    }
    out
}

/// What a placement holds for one pose and cover state whatever the ground
/// tilt and the wind: the stage frames, the centre of gravity of everything
/// present and the moments of inertia about both axes. The guard keeps one
/// and computes it again only when the pose or the cover state changes;
/// every figure computed from it has the same bits as from a fresh
/// [`Rig::place`].
#[derive(Clone, Copy, Debug)]
pub(crate) struct Posed {
    /// The pose it is for.
    pose: Pose,
    /// The cover state it is for.
    cover_fitted: bool,
    /// Stage frames of the pose.
    pub frames: StageFrames,
    /// Centre of gravity of everything present, rig frame, metres.
    pub cg_m: Vec3,
    /// Moments of inertia about `[primary, secondary]`, kg·m².
    pub inertia_kg_m2: [f32; 2],
}

impl Posed {
    /// The pose-dependent figures of `rig` in `pose` with the cover fitted
    /// or not.
    ///
    /// # Errors
    /// A pose the mount cannot take.
    pub fn new(rig: &Rig, pose: Pose, cover_fitted: bool) -> Result<Posed, Error> {
        // The tilt moves gravity only, which none of these figures uses.
        let placement = rig.place(pose, Tilt::LEVEL, cover_fitted)?;
        Ok(Posed {
            pose,
            cover_fitted,
            frames: *placement.frames(),
            cg_m: placement.centre_of_gravity_m(),
            inertia_kg_m2: inertias_kg_m2(&placement),
        })
    }

    /// True when this is for exactly `pose` (the same bits of every angle,
    /// so that even the sign of a zero is the same) and `cover_fitted`.
    #[must_use]
    pub fn is_for(&self, pose: Pose, cover_fitted: bool) -> bool {
        self.cover_fitted == cover_fitted && pose_bits(self.pose) == pose_bits(pose)
    }
}

/// The pose's form, pier side and angles, as bits.
fn pose_bits(pose: Pose) -> (u8, u32, u32) {
    match pose {
        Pose::Axes {
            primary_rad,
            secondary_rad,
        } => (0, primary_rad.to_bits(), secondary_rad.to_bits()),
        Pose::Equatorial {
            hour_angle_rad,
            declination_rad,
            pier_side,
        } => (
            1 + pier_side as u8,
            hour_angle_rad.to_bits(),
            declination_rad.to_bits(),
        ),
        Pose::Horizontal {
            azimuth_rad,
            altitude_rad,
            pier_side,
        } => (
            3 + pier_side as u8,
            azimuth_rad.to_bits(),
            altitude_rad.to_bits(),
        ),
    }
}

/// Wind torque per pascal of dynamic pressure about both axes
/// (`[primary, secondary]`), N·m/Pa, for a wind from azimuth `from_rad`
/// (radians from north clockwise, meteorological convention), signed about
/// each axis unit vector. The fitted cover hides the parts marked under cover.
#[must_use]
pub(crate) fn wind_terms_nm_per_pa(placement: &Placement<'_>, from_rad: f32) -> [f32; 2] {
    let frames = placement.frames();
    let origin = frames.origin_m;
    let (k, s) = (frames.primary_axis(), frames.secondary_axis());
    let mut out = [0.0_f32; 2];
    for (part, cp, f) in placement.wind_loads(from_rad) {
        if part.stage == Stage::Ground {
            continue;
        }
        let m = (cp - origin).cross(f);
        if let Some(t) = out.first_mut() {
            *t += m.dot(k);
        }
        if part.stage == Stage::Secondary {
            if let Some(t) = out.get_mut(1) {
                *t += m.dot(s);
            }
        }
    }
    out
}

/// Gravity, inertia and wind terms of both axes for a wind from `from_rad`.
#[must_use]
pub(crate) fn pose_terms(placement: &Placement<'_>, from_rad: f32) -> PoseTerms {
    let mut t = gravity_terms(placement);
    let w = wind_terms_nm_per_pa(placement, from_rad);
    for (ti, wi) in t.iter_mut().zip(w) {
        ti.wind_nm_per_pa = wi;
    }
    t
}

/// Utilisation of one drive: the load ÷ the rating for each rating (1.0 is
/// the limit), capped at [`crate::stability::UTILISATION_CAP`].
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize))]
pub struct Utilisation {
    /// |steady torque| ÷ rated torque.
    pub rated: f32,
    /// (|steady torque| + I·α) ÷ repeated peak torque.
    pub repeated_peak: f32,
    /// (|gust torque| + I·α) ÷ momentary peak torque.
    pub momentary_peak: f32,
    /// The highest of the three.
    pub governing: f32,
}

impl Utilisation {
    /// The utilisations of `rating` for a steady torque, a gust torque (both
    /// N·m, either sign) and an inertial torque magnitude, N·m.
    #[must_use]
    pub fn of(rating: &DriveRating, steady_nm: f32, gust_nm: f32, inertial_nm: f32) -> Self {
        let i = inertial_nm.abs();
        let rated = ratio(steady_nm.abs(), rating.rated_nm);
        let repeated_peak = ratio(steady_nm.abs() + i, rating.repeated_peak_nm);
        let momentary_peak = ratio(gust_nm.abs() + i, rating.momentary_peak_nm);
        Utilisation {
            rated,
            repeated_peak,
            momentary_peak,
            governing: rated.max(repeated_peak).max(momentary_peak),
        }
    }
}

/// Every torque on one axis in one pose, N·m, signed about the axis unit
/// vector (right-hand rule), and its utilisation of the drive.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize))]
pub struct AxisTorque {
    /// Gravity torque, N·m.
    pub gravity_nm: f32,
    /// Wind torque at the mean wind speed, N·m.
    pub wind_mean_nm: f32,
    /// Wind torque at the gust speed, N·m.
    pub wind_gust_nm: f32,
    /// Steady torque: gravity + mean wind, N·m.
    pub steady_nm: f32,
    /// Gust torque: gravity + gust wind, N·m.
    pub gust_nm: f32,
    /// Moment of inertia of the turning parts about the axis, kg·m².
    pub inertia_kg_m2: f32,
    /// Inertial torque magnitude I·α at the configured slew acceleration, N·m
    /// (≥ 0; 0 when the rig has no drive data).
    pub inertial_nm: f32,
    /// Utilisation of the drive; `None` when the rig has no drive ratings.
    pub utilisation: Option<Utilisation>,
}

/// The torque loads of both axes in one set of conditions.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize))]
pub struct AxisLoads {
    /// Primary axis (about `k`).
    pub primary: AxisTorque,
    /// Secondary axis (about `s`).
    pub secondary: AxisTorque,
    /// Dynamic pressure of the mean wind, Pa.
    pub mean_pressure_pa: f32,
    /// Dynamic pressure of the gust, Pa.
    pub gust_pressure_pa: f32,
}

impl AxisLoads {
    /// The higher governing utilisation of the two axes; `None` without
    /// drive ratings.
    #[must_use]
    pub fn governing(&self) -> Option<f32> {
        match (self.primary.utilisation, self.secondary.utilisation) {
            (Some(a), Some(b)) => Some(a.governing.max(b.governing)),
            _ => None,
        }
    }
}

fn axis_torque(
    t: &AxisTerms,
    q_mean: f32,
    q_gust: f32,
    alpha: f32,
    rating: Option<&DriveRating>,
) -> AxisTorque {
    let steady = t.torque_nm(q_mean);
    let gust = t.torque_nm(q_gust);
    let inertial = t.inertia_kg_m2 * alpha;
    AxisTorque {
        gravity_nm: t.gravity_nm,
        wind_mean_nm: q_mean * t.wind_nm_per_pa,
        wind_gust_nm: q_gust * t.wind_nm_per_pa,
        steady_nm: steady,
        gust_nm: gust,
        inertia_kg_m2: t.inertia_kg_m2,
        inertial_nm: inertial,
        utilisation: rating.map(|r| Utilisation::of(r, steady, gust, inertial)),
    }
}

/// Which bodies are the payload (for balance and the payload envelope).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(rename_all = "snake_case"))]
pub enum PayloadPick {
    /// The secondary-stage bodies marked `under_cover` (what the cover
    /// shields: tube and what it carries); every secondary-stage body when
    /// none is marked.
    #[default]
    UnderCover,
    /// One body, by its index in [`RigSpec::bodies`]; it must be on the
    /// secondary stage.
    Body(u8),
}

/// A resolved payload choice.
#[derive(Clone, Copy, Debug)]
pub(crate) struct Payload {
    pick: PayloadPick,
    any_marked: bool,
}

impl Payload {
    /// Resolves `pick` against the rig's parts.
    pub(crate) fn resolve(rig: &Rig, pick: PayloadPick) -> Result<Payload, Error> {
        let any_marked = rig.parts().iter().any(|p| {
            matches!(p.role, PartRole::Body(_)) && p.stage == Stage::Secondary && p.under_cover
        });
        let me = Payload { pick, any_marked };
        if let PayloadPick::Body(i) = pick {
            let found = rig.parts().iter().find(|p| p.role == PartRole::Body(i));
            match found {
                Some(p) if p.stage == Stage::Secondary => {}
                Some(_) => {
                    let mut e = Error::new(ErrorKind::OutOfRange, Field::PayloadBody).at(i.into());
                    e.value = f32::from(i);
                    return Err(e);
                }
                None => {
                    let mut e = Error::new(ErrorKind::OutOfRange, Field::PayloadBody).at(i.into());
                    e.value = f32::from(i);
                    e.min = 0.0;
                    return Err(e);
                }
            }
        }
        if !rig.parts().iter().any(|p| me.contains(p)) {
            let mut e = Error::new(ErrorKind::TooFew, Field::Payload);
            e.min = 1.0;
            return Err(e);
        }
        Ok(me)
    }

    /// True when `p` is a payload part.
    pub(crate) fn contains(&self, p: &Part) -> bool {
        let PartRole::Body(i) = p.role else {
            return false;
        };
        match self.pick {
            PayloadPick::Body(j) => i == j,
            PayloadPick::UnderCover => {
                p.stage == Stage::Secondary && (p.under_cover || !self.any_marked)
            }
        }
    }

    /// True when body `i` of a description is a payload body.
    fn contains_spec(&self, spec: &RigSpec, i: usize) -> bool {
        let Some(b) = spec.bodies.get(i) else {
            return false;
        };
        match self.pick {
            PayloadPick::Body(j) => usize::from(j) == i,
            PayloadPick::UnderCover => {
                b.stage == Stage::Secondary && (b.under_cover || !self.any_marked)
            }
        }
    }
}

/// Balance of both axes, on level ground with the cover off.
///
/// The *static moment* of a set of parts about the axis origin O is
/// Σ m·(r − O), kg·m. Its component along `s` (the secondary axis, toward the
/// payload side) does not change with the pose; its component across `k`
/// gives the primary-axis gravity torque, largest when `s` is horizontal:
/// τ_max = g·|k × ẑ|·M_s (for an equatorial mount |k × ẑ| = cos φ, so
/// τ_max = g·cos φ·(Σ m·a − Σ M_cw·L), the classic balance condition
/// Σ m·a = Σ M_cw·L). For the secondary axis the components along the tube
/// `p` and `n` count; the largest secondary-axis gravity torque, again with
/// `s` horizontal, is g·|(M_p, M_n)|.
///
/// Counterweights move along `s` only, so they cannot remove a static moment
/// across it: the secondary stage's M_p and M_n (removed or reduced by the
/// payload slide) and any primary-stage part set off toward `q`. With both
/// of those zero, the balanced rig has no gravity torque on either axis in
/// any pose.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize))]
pub struct Balance {
    /// The payload the balance refers to.
    pub payload: PayloadPick,
    /// Static moment along `s` of everything turning about the primary axis,
    /// counterweights where they are, kg·m; positive: the payload side is
    /// heavy.
    pub primary_moment_kg_m: f32,
    /// Largest primary-axis gravity torque from that moment (with `s`
    /// horizontal), N·m, signed like the moment.
    pub primary_unbalance_nm: f32,
    /// Shift of all counterweights together along the shaft that balances the
    /// primary axis, metres, positive outward (away from the axis); `None`
    /// without counterweights.
    pub counterweight_shift_m: Option<f32>,
    /// Distance from the axis origin of the counterweights' common centre of
    /// gravity after that shift, metres (for a single weight: its position).
    pub counterweight_centre_m: Option<f32>,
    /// True when every counterweight after the shift still sits on the shaft
    /// (inner face beyond the axis origin, outer face within the shaft);
    /// `None` without counterweights or without a shaft.
    pub fits_on_shaft: Option<bool>,
    /// Primary-axis unbalance (largest gravity torque, N·m, sign as above) with
    /// the counterweights moved together until the outermost sits at the end
    /// of the shaft; `None` without counterweights or shaft.
    pub residual_at_shaft_end_nm: Option<f32>,
    /// Static moment of the secondary stage along the tube `p`, kg·m.
    pub secondary_moment_p_kg_m: f32,
    /// Static moment of the secondary stage along `n`, kg·m (sliding along
    /// the tube cannot remove it).
    pub secondary_moment_n_kg_m: f32,
    /// Largest secondary-axis gravity torque, g·|(M_p, M_n)|, N·m, ≥ 0.
    pub secondary_unbalance_nm: f32,
    /// Mass of the payload, kg.
    pub payload_mass_kg: f32,
    /// How far to slide the payload along the tube to null M_p, metres,
    /// positive toward the sky end (+p).
    pub payload_slide_m: f32,
    /// Secondary-axis gravity torque left after the slide (from M_n), N·m,
    /// ≥ 0, largest over poses.
    pub secondary_residual_nm: f32,
}

impl Balance {
    /// The description `spec` (the one the rig was built from) with every
    /// counterweight shifted by [`Balance::counterweight_shift_m`] and every
    /// payload body (centre of gravity and exposed shape) slid by
    /// [`Balance::payload_slide_m`] along the tube.
    ///
    /// # Errors
    /// [`ErrorKind::Unreachable`] when a shifted counterweight would come to
    /// lie on the payload side of the axis.
    pub fn balanced_spec(&self, spec: &RigSpec) -> Result<RigSpec, Error> {
        let mut out = spec.clone();
        if let Some(d) = self.counterweight_shift_m {
            for (i, c) in out.counterweights.iter_mut().enumerate() {
                c.distance_m += d;
                if c.distance_m < 0.0 {
                    let mut e = Error::new(ErrorKind::Unreachable, Field::CounterweightsDistanceM);
                    e.value = c.distance_m;
                    return Err(e.at(i));
                }
            }
        }
        let any_marked = spec
            .bodies
            .iter()
            .any(|b| b.stage == Stage::Secondary && b.under_cover);
        let payload = Payload {
            pick: self.payload,
            any_marked,
        };
        for i in 0..out.bodies.len() {
            if !payload.contains_spec(spec, i) {
                continue;
            }
            if let Some(b) = out.bodies.get_mut(i) {
                if let Some(y) = b.cg_m.get_mut(1) {
                    *y += self.payload_slide_m;
                }
                if let Some(x) = b.exposure.as_mut() {
                    if let Some(y) = x.centre_m.get_mut(1) {
                        *y += self.payload_slide_m;
                    }
                }
            }
        }
        Ok(out)
    }
}

fn no_drives() -> Error {
    let mut e = Error::new(ErrorKind::TooFew, Field::Drives);
    e.min = 1.0;
    e
}

impl Rig {
    /// Torque loads on both axes in conditions `c`, whose wind speed is taken
    /// as the **gust**; `mean_wind_mps` is the mean wind from the same
    /// direction (for example the 10-minute mean), which loads the drive
    /// continuously. Inertial torque uses the drives' slew acceleration.
    ///
    /// # Errors
    /// Invalid conditions, or a mean speed outside 0 to the gust speed.
    pub fn axis_loads(&self, c: &Conditions, mean_wind_mps: f32) -> Result<AxisLoads, Error> {
        c.validate()?;
        Error::check(Field::MeanWindMps, mean_wind_mps, 0.0, c.wind_speed_mps)?;
        let placement = self.place(c.pose, c.tilt, c.cover_fitted)?;
        let t = pose_terms(&placement, c.wind_from_rad);
        let q_mean = c.air.dynamic_pressure_pa(mean_wind_mps);
        let q_gust = c.air.dynamic_pressure_pa(c.wind_speed_mps);
        Ok(self.axis_loads_from(t, q_mean, q_gust))
    }

    /// [`Rig::axis_loads`] from the terms of both axes `t` and the dynamic
    /// pressures of the mean wind and the gust, Pa.
    #[must_use]
    pub(crate) fn axis_loads_from(&self, t: PoseTerms, q_mean: f32, q_gust: f32) -> AxisLoads {
        let drives = self.drives();
        let alpha = drives.map_or(0.0, |d| d.slew_acceleration_rad_per_s2);
        let [tp, ts] = t;
        AxisLoads {
            primary: axis_torque(&tp, q_mean, q_gust, alpha, drives.map(|d| &d.primary)),
            secondary: axis_torque(&ts, q_mean, q_gust, alpha, drives.map(|d| &d.secondary)),
            mean_pressure_pa: q_mean,
            gust_pressure_pa: q_gust,
        }
    }

    /// Gravity, wind-per-pascal and inertia terms of both axes in a pose, for
    /// a wind from `from_rad` (radians from north clockwise).
    ///
    /// # Errors
    /// An invalid pose or tilt.
    pub fn axis_terms(
        &self,
        pose: crate::mount::Pose,
        tilt: Tilt,
        cover_fitted: bool,
        from_rad: f32,
    ) -> Result<PoseTerms, Error> {
        Error::check(Field::WindFromRad, from_rad, -1e4, 1e4)?;
        let placement = self.place(pose, tilt, cover_fitted)?;
        Ok(pose_terms(&placement, from_rad))
    }

    /// Balance of both axes for the chosen payload, on level ground with the
    /// cover off (see [`Balance`]).
    ///
    /// # Errors
    /// A payload pick naming no secondary-stage body.
    pub fn balance(&self, pick: PayloadPick) -> Result<Balance, Error> {
        let payload = Payload::resolve(self, pick)?;
        let mut m_s = 0.0_f32;
        let (mut m_p, mut m_n) = (0.0_f32, 0.0_f32);
        let mut payload_kg = 0.0_f32;
        let (mut cw_kg, mut cw_moment) = (0.0_f32, 0.0_f32);
        let mut shaft_len: Option<f32> = None;
        for p in self.parts() {
            if p.role == PartRole::Cover || p.stage == Stage::Ground {
                continue;
            }
            // Both stage frames have `s` as their first axis.
            m_s += p.mass_kg * p.cg_m.x;
            if p.stage == Stage::Secondary {
                m_p += p.mass_kg * p.cg_m.y;
                m_n += p.mass_kg * p.cg_m.z;
            }
            if payload.contains(p) {
                payload_kg += p.mass_kg;
            }
            match p.role {
                PartRole::Counterweight(_) => {
                    cw_kg += p.mass_kg;
                    cw_moment += -p.cg_m.x * p.mass_kg;
                }
                PartRole::Shaft => shaft_len = Some(-2.0 * p.cg_m.x),
                _ => {}
            }
        }
        let g = STANDARD_GRAVITY_MPS2;
        let lever = self
            .mount()
            .frames_at(0.0, 0.0)
            .primary_axis()
            .cross(Vec3::Z)
            .norm();
        let to_nm = |moment: f32| g * lever * moment;
        let (shift, centre) = if cw_kg > 0.0 {
            let d = m_s / cw_kg;
            (Some(d), Some(cw_moment / cw_kg + d))
        } else {
            (None, None)
        };
        // Innermost and outermost faces of the weights as they stand.
        let (mut inner, mut outer) = (f32::INFINITY, f32::NEG_INFINITY);
        for p in self.parts() {
            if let PartRole::Counterweight(_) = p.role {
                let half = match p.exposure.map(|x| x.shape) {
                    Some(Shape::Cylinder { length_m, .. }) => 0.5 * length_m,
                    _ => 0.0,
                };
                inner = inner.min(-p.cg_m.x - half);
                outer = outer.max(-p.cg_m.x + half);
            }
        }
        let (fits, residual) = match (shift, shaft_len) {
            (Some(d), Some(len)) => {
                let fits = inner + d >= 0.0 && outer + d <= len;
                let to_end = len - outer;
                (Some(fits), Some(to_nm(m_s - cw_kg * to_end)))
            }
            _ => (None, None),
        };
        let slide = if payload_kg > 0.0 {
            -m_p / payload_kg
        } else {
            0.0
        };
        Ok(Balance {
            payload: pick,
            primary_moment_kg_m: m_s,
            primary_unbalance_nm: to_nm(m_s),
            counterweight_shift_m: shift,
            counterweight_centre_m: centre,
            fits_on_shaft: fits,
            residual_at_shaft_end_nm: residual,
            secondary_moment_p_kg_m: m_p,
            secondary_moment_n_kg_m: m_n,
            secondary_unbalance_nm: g * math::hypot(m_p, m_n),
            payload_mass_kg: payload_kg,
            payload_slide_m: slide,
            secondary_residual_nm: g * m_n.abs(),
        })
    }

    /// The drive ratings, or an error naming `drives` when the description
    /// gave none.
    ///
    /// # Errors
    /// [`ErrorKind::TooFew`] on `drives`.
    pub fn require_drives(&self) -> Result<&crate::drive::Drives, Error> {
        self.drives().ok_or_else(no_drives)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn thin_cube_is_five_eighteenths() {
        // Hollow cube about a centroidal axis: 5ms²/18 (standard table value,
        // from memory; derived here from six plates).
        let i = thin_box_inertia_kg_m2(3.0, [0.4, 0.4, 0.4]);
        for v in i {
            assert!((v - 5.0 * 3.0 * 0.16 / 18.0).abs() < 1e-6);
        }
    }

    #[test]
    fn box_and_cylinder_formulas() {
        let b = solid_box_inertia_kg_m2(12.0, [1.0, 2.0, 3.0]);
        assert!((b[0] - 13.0).abs() < 1e-5 && (b[2] - 5.0).abs() < 1e-5);
        let [a, t] = solid_cylinder_inertia_kg_m2(5.0, 0.1, 0.8);
        assert!((a - 0.025).abs() < 1e-6 && (t - 0.279_166_7).abs() < 1e-6);
    }
}
