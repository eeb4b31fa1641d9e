//! The centre of gravity of a whole rig from scale readings under its feet.
//!
//! A rig's weakest input is where its centre of gravity is, above all its
//! height. Weighing finds it without guessing:
//!
//! 1. **Level weighing.** A scale under every foot `i` (rig-frame ground
//!    position `p_i`), readings `F_i` (N). The total weight is `W = Σ F_i` and,
//!    by moment balance about two horizontal axes, the centre of gravity lies
//!    above `P = Σ F_i·p_i / W`.
//! 2. **Lift weighing** (the axle-lift method of ISO 10392 for road
//!    vehicles; SAE J874 hangs earth-moving machinery from one end instead;
//!    titles and scope checked, the standards' equations not seen, see
//!    `SOURCES.md`). Lift one side
//!    so the rig turns by θ about the line through the resting feet and weigh
//!    again, every foot still on a scale. Seen from the rig, "up" is now
//!    `u = cos θ·z + sin θ·t`, with `t` the horizontal unit vector from the
//!    resting line toward the lifted side. Moment balance about the centre of
//!    gravity `c` (`Σ F_i (p_i − c) × u = 0`) puts `c` on the line `P_θ + λ·u`;
//!    with the level result `c = P + z̄·z` this gives
//!    **`z̄ = (P − P_θ)·t / tan θ`**. θ comes from the lift height `h` over
//!    the distance `L` from the resting line to the lifted feet
//!    (`sin θ = h / L`) or from an inclinometer. The derivation is our own
//!    statics (rigid body, point feet, vertical scale forces); a foot that
//!    rolls on a ball of radius `r` adds `r` to `z̄` (not modelled here).
//! 3. **Tilt to unload** (the static stability angle of vehicles, from
//!    memory). Tilt the rig about one edge of its footprint until the feet
//!    off that edge just unload: the centre of gravity is then straight above
//!    the edge, so **`z̄ = d / tan θ_tip`** with `d` the horizontal distance
//!    from `P` to the edge.
//!
//! # Uncertainty
//! First-order propagation of independent errors (JCGM 100:2008, *Guide to
//! the expression of uncertainty in measurement*, eq. 10): each reading has
//! the standard uncertainty `u_F` the caller gives (a scale's resolution `r`
//! alone is a rectangular error of half-width `r/2`, so `u_F = r/√12`, GUM
//! §4.3.7 and F.2.2.1). With `∂(P·n)/∂F_i = (p_i − P)·n / W`:
//! `u(P·n) = u_F·√Σ((p_i − P)·n)² / W`; `u(W) = u_F·√N`;
//! `u(z̄)² = (u(D)/tan θ)² + (D·u(θ)/sin² θ)²` with `D` the shift or the
//! inset and `u(θ) = u(h)/(L·cos θ)` for a measured lift height. Heights
//! from the lift and the tip test are combined by inverse-variance weights.
//!
//! # Consistency checks
//! Hard errors (typed, nothing computed): a reading count that does not
//! match the feet, a non-finite reading, a reading below `−3·u_F`, a total
//! weight under `10·u_F`, a lift or tip angle outside 1° to 45°, resting feet
//! that are not on one line, lifted feet at unequal distances from it, a tip
//! edge that is not an edge of the support polygon. Soft checks (figures
//! and a verdict in [`Checks`], for the caller to refuse the result): the
//! lifted total differs from the level total, the centre moved across the
//! lift direction, the height is below ground, the two heights disagree, all
//! by more than three combined standard uncertainties.
//!
//! Frames: the rig frame of [`crate::frame`] (x east, y north, z up, feet at
//! z = 0). Forces in newtons; a caller with kilograms multiplies by
//! [`crate::math::STANDARD_GRAVITY_MPS2`].

use crate::error::{Error, ErrorKind, Field};
use crate::math::{self, Vec3, STANDARD_GRAVITY_MPS2};
use crate::support::Support;

/// Smallest lift or tip angle accepted, radians (1°): below it the height is
/// lost in the reading noise.
pub const MIN_ANGLE_RAD: f32 = 1.0 * math::PI / 180.0;
/// Largest lift or tip angle accepted, radians (45°).
pub const MAX_ANGLE_RAD: f32 = math::PI / 4.0;
/// Lift angle below which [`Checks::small_lift_angle`] is set, radians (5°;
/// common practice, no source: the height's uncertainty grows as 1/tan θ).
pub const SMALL_ANGLE_RAD: f32 = 5.0 * math::PI / 180.0;
/// How far a resting foot may lie off the resting line, or a lifted foot's
/// distance from it may differ from the others', metres (5 mm).
pub const LINE_TOLERANCE_M: f32 = 0.005;
/// Coverage factor of the soft checks: a difference beyond this many
/// combined standard uncertainties fails (k = 3, common practice, no source).
pub const COVERAGE_K: f32 = 3.0;
/// Largest standard uncertainty of one reading accepted, newtons.
pub const MAX_READING_UNCERTAINTY_N: f32 = 1.0e4;
/// Largest reading accepted, newtons (about 20 t).
pub const MAX_READING_N: f32 = 2.0e5;

/// How the rig was lifted for the second weighing.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum LiftGeometry {
    /// Some feet raised by a measured height; the rig turns about the line
    /// through the others.
    Feet {
        /// Bit `i` set when foot `i` (in the support's order) was raised.
        lifted_mask: u8,
        /// Height the lifted feet were raised by, metres.
        height_m: f32,
        /// Standard uncertainty of that height, metres.
        height_uncertainty_m: f32,
    },
    /// The rig turned by a measured angle (an inclinometer on the base).
    Angle {
        /// Azimuth of the raised side in the rig frame, radians from north
        /// clockwise (the direction `t` of the module docs).
        raised_toward_rad: f32,
        /// Tilt angle, radians, positive.
        angle_rad: f32,
        /// Standard uncertainty of the angle, radians.
        angle_uncertainty_rad: f32,
    },
}

/// The second weighing, with one side lifted.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Lift<'a> {
    /// How the rig was lifted.
    pub geometry: LiftGeometry,
    /// Readings under each foot while lifted, newtons, in the support's foot
    /// order.
    pub loads_n: &'a [f32],
}

/// The tilt-to-unload test: the rig tilted about the edge between two feet
/// until the feet off that edge unloaded.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct TipTest {
    /// The two feet of the edge (indices in the support's order).
    pub edge_feet: [u8; 2],
    /// Tilt at which the other feet unloaded, radians.
    pub angle_rad: f32,
    /// Standard uncertainty of that angle, radians.
    pub angle_uncertainty_rad: f32,
}

/// Everything measured.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Weighing<'a> {
    /// Readings under each foot on level ground, newtons, in the support's
    /// foot order.
    pub level_n: &'a [f32],
    /// Standard uncertainty of one reading, newtons (resolution r alone:
    /// r/√12).
    pub reading_uncertainty_n: f32,
    /// The lifted weighing, if made.
    pub lift: Option<Lift<'a>>,
    /// The tilt-to-unload test, if made.
    pub tip: Option<TipTest>,
}

/// A value and its standard uncertainty, in the unit the field names.
#[derive(Clone, Copy, Debug, PartialEq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct Estimate {
    /// The value.
    pub value: f32,
    /// Its standard uncertainty (one standard deviation), same unit.
    pub uncertainty: f32,
}

/// Soft consistency checks: each figure, its tolerance (three combined
/// standard uncertainties) and whether it passed.
#[derive(Clone, Copy, Debug, PartialEq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct Checks {
    /// Lifted total minus level total, newtons (`None` without a lift).
    pub lift_total_difference_n: Option<f32>,
    /// Tolerance of that difference, newtons.
    pub lift_total_tolerance_n: f32,
    /// Shift of the centre across the lift direction, metres (rig frame,
    /// along `z × t`); `None` without a lift.
    pub lift_cross_shift_m: Option<f32>,
    /// Tolerance of that shift, metres.
    pub lift_cross_tolerance_m: f32,
    /// Height from the lift minus height from the tip test, metres (`None`
    /// unless both were made).
    pub height_disagreement_m: Option<f32>,
    /// Tolerance of that disagreement, metres.
    pub height_disagreement_tolerance_m: f32,
    /// True when the lift angle is below [`SMALL_ANGLE_RAD`] (the height's
    /// uncertainty is then large; not a failure).
    pub small_lift_angle: bool,
    /// True when the height lies below the ground by more than its tolerance.
    pub height_below_ground: bool,
    /// True when every check passed.
    pub passed: bool,
}

/// The centre of gravity found by weighing.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct MeasuredCentre {
    /// Total mass, kg (level readings / standard gravity).
    pub mass_kg: Estimate,
    /// Horizontal position, rig frame x (east), metres.
    pub x_m: Estimate,
    /// Horizontal position, rig frame y (north), metres.
    pub y_m: Estimate,
    /// Height above the ground plane from the lift weighing, metres.
    pub height_from_lift_m: Option<Estimate>,
    /// Height from the tilt-to-unload test, metres.
    pub height_from_tip_m: Option<Estimate>,
    /// The two heights combined by inverse-variance weights (the one there
    /// is when only one test was made); `None` without either test.
    pub height_m: Option<Estimate>,
    /// Lift angle used, radians (`None` without a lift).
    pub lift_angle_rad: Option<f32>,
    /// The soft checks.
    pub checks: Checks,
}

impl MeasuredCentre {
    /// The centre of gravity as a rig-frame point, metres (`None` without a
    /// height).
    #[must_use]
    pub fn centre_m(&self) -> Option<Vec3> {
        self.height_m
            .map(|h| Vec3::new(self.x_m.value, self.y_m.value, h.value))
    }
}

/// Sum, first moment and the uncertainty of the projected centre along two
/// directions.
struct Sums {
    total_n: f32,
    centre_m: Vec3,
}

fn reading_error(field: Field, i: usize, v: f32, u: f32) -> Error {
    let mut e = Error::check(field, v, -COVERAGE_K * u, MAX_READING_N)
        .err()
        .unwrap_or(Error::new(ErrorKind::OutOfRange, field));
    e.index = Some(if i > 255 { 255 } else { i as u8 });
    e
}

fn sums(field: Field, support: &Support, loads_n: &[f32], u_n: f32) -> Result<Sums, Error> {
    let feet = support.feet();
    if loads_n.len() != feet.len() {
        let kind = if loads_n.len() < feet.len() {
            ErrorKind::TooFew
        } else {
            ErrorKind::TooMany
        };
        let mut e = Error::new(kind, field);
        e.value = loads_n.len() as f32;
        e.min = feet.len() as f32;
        e.max = feet.len() as f32;
        return Err(e);
    }
    let mut total = 0.0_f32;
    let mut moment = Vec3::ZERO;
    for (i, (f, foot)) in loads_n.iter().zip(feet).enumerate() {
        let ok = f.is_finite() && *f >= -COVERAGE_K * u_n && *f <= MAX_READING_N;
        if !ok {
            return Err(reading_error(field, i, *f, u_n));
        }
        total += *f;
        moment += Vec3::new(foot.position_m[0], foot.position_m[1], 0.0) * *f;
    }
    let min_total = 10.0 * u_n;
    if total.is_nan() || total < min_total {
        let mut e = Error::new(ErrorKind::OutOfRange, field);
        e.value = total;
        e.min = min_total;
        e.max = MAX_READING_N * feet.len() as f32;
        return Err(e);
    }
    Ok(Sums {
        total_n: total,
        centre_m: moment * (1.0 / total),
    })
}

/// Standard uncertainty of `P·n`, metres: `u_F·√Σ((p_i − P)·n)² / W`.
fn spread_uncertainty_m(support: &Support, s: &Sums, n: Vec3, u_n: f32) -> f32 {
    let mut q = 0.0_f32;
    for foot in support.feet() {
        let p = Vec3::new(foot.position_m[0], foot.position_m[1], 0.0);
        let d = (p - s.centre_m).dot(n);
        q += d * d;
    }
    u_n * math::sqrt(q) / s.total_n
}

fn check_angle(fields: [Field; 2], angle_rad: f32, u_rad: f32) -> Result<(), Error> {
    let [angle, uncertainty] = fields;
    Error::check(angle, angle_rad, MIN_ANGLE_RAD, MAX_ANGLE_RAD)?;
    Error::check(uncertainty, u_rad, 0.0, MAX_ANGLE_RAD)?;
    Ok(())
}

/// A turn of the rig: sin θ, cos θ, θ (radians) and the standard uncertainty
/// of θ (radians). Kept as sine and cosine so that a lift given by a height
/// never goes through an inverse sine and back (the coarse `micromath`
/// functions would move the height by several per cent).
#[derive(Clone, Copy)]
struct Turn {
    sin: f32,
    cos: f32,
    angle_rad: f32,
    u_rad: f32,
}

impl Turn {
    fn from_angle(angle_rad: f32, u_rad: f32) -> Turn {
        Turn {
            sin: math::sin(angle_rad),
            cos: math::cos(angle_rad),
            angle_rad,
            u_rad,
        }
    }
}

/// The lift direction `t` (unit, horizontal, toward the raised side) and
/// the turn.
fn lift_frame(support: &Support, g: LiftGeometry) -> Result<(Vec3, Turn), Error> {
    match g {
        LiftGeometry::Angle {
            raised_toward_rad,
            angle_rad,
            angle_uncertainty_rad,
        } => {
            Error::check(
                Field::WeighingLiftRaisedTowardRad,
                raised_toward_rad,
                -1e4,
                1e4,
            )?;
            check_angle(
                [
                    Field::WeighingLiftAngleRad,
                    Field::WeighingLiftAngleUncertaintyRad,
                ],
                angle_rad,
                angle_uncertainty_rad,
            )?;
            Ok((
                crate::frame::azimuth_unit(raised_toward_rad),
                Turn::from_angle(angle_rad, angle_uncertainty_rad),
            ))
        }
        LiftGeometry::Feet {
            lifted_mask,
            height_m,
            height_uncertainty_m,
        } => {
            Error::check(Field::WeighingLiftHeightM, height_m, 0.001, 2.0)?;
            Error::check(
                Field::WeighingLiftHeightUncertaintyM,
                height_uncertainty_m,
                0.0,
                height_m,
            )?;
            let points = |lifted: bool| {
                support
                    .feet()
                    .iter()
                    .enumerate()
                    .filter(move |(i, _)| {
                        let bit = u32::try_from(*i).ok().and_then(|s| 1_u32.checked_shl(s));
                        bit.is_some_and(|b| (u32::from(lifted_mask) & b != 0) == lifted)
                    })
                    .map(|(_, f)| Vec3::new(f.position_m[0], f.position_m[1], 0.0))
            };
            let bad_mask = || {
                let mut e = Error::new(ErrorKind::OutOfRange, Field::WeighingLiftLiftedMask);
                e.value = f32::from(lifted_mask);
                e
            };
            // The resting line: the two resting feet farthest apart.
            let mut best: Option<(Vec3, Vec3, f32)> = None;
            for a in points(false) {
                for b in points(false) {
                    let d = (b - a).norm();
                    if best.is_none_or(|(_, _, bd)| d > bd) {
                        best = Some((a, b, d));
                    }
                }
            }
            let Some((a, b, len)) = best else {
                return Err(bad_mask());
            };
            let Some(along) = (b - a).normalized().filter(|_| len > LINE_TOLERANCE_M) else {
                return Err(Error::new(
                    ErrorKind::TooFew,
                    Field::WeighingLiftRestingFeet,
                ));
            };
            for p in points(false) {
                if (p - a).reject(along).norm() > LINE_TOLERANCE_M {
                    return Err(Error::new(
                        ErrorKind::Inconsistent,
                        Field::WeighingLiftRestingFeet,
                    ));
                }
            }
            let (mut n, mut sum) = (0_u32, Vec3::ZERO);
            for p in points(true) {
                n += 1;
                sum += (p - a).reject(along);
            }
            if n == 0 {
                return Err(bad_mask());
            }
            let mean = sum * (1.0 / n as f32);
            let Some(t) = mean.normalized() else {
                return Err(bad_mask());
            };
            let base_m = mean.norm();
            for p in points(true) {
                let off = (p - a).reject(along);
                if (off.norm() - base_m).abs() > LINE_TOLERANCE_M || off.dot(t) <= 0.0 {
                    return Err(Error::new(
                        ErrorKind::Inconsistent,
                        Field::WeighingLiftLiftedFeet,
                    ));
                }
            }
            let s = height_m / base_m;
            Error::check(
                Field::WeighingLiftHeightM,
                height_m,
                0.001,
                base_m * core::f32::consts::FRAC_1_SQRT_2,
            )?;
            let s = math::clamp(s, 0.0, core::f32::consts::FRAC_1_SQRT_2);
            let c = math::sqrt(1.0 - s * s);
            let angle = math::asin(s);
            Error::check(
                Field::WeighingLiftAngleRad,
                angle,
                MIN_ANGLE_RAD,
                MAX_ANGLE_RAD,
            )?;
            let u = height_uncertainty_m / (base_m * c);
            Ok((
                t,
                Turn {
                    sin: s,
                    cos: c,
                    angle_rad: angle,
                    u_rad: u,
                },
            ))
        }
    }
}

/// Height and its uncertainty from a horizontal shift `d` (uncertainty
/// `u_d`) and a turn: `z̄ = d / tan θ`.
fn height_from(d_m: f32, u_d_m: f32, turn: Turn) -> Estimate {
    let t = turn.sin / turn.cos;
    let s = turn.sin;
    let a = u_d_m / t;
    let b = d_m * turn.u_rad / (s * s);
    Estimate {
        value: d_m / t,
        uncertainty: math::sqrt(a * a + b * b),
    }
}

/// The centre of gravity of a rig from its weighing (see the module docs).
///
/// # Errors
/// The hard errors listed in the module docs, naming the `weighing.*` field.
pub fn centre_from_weighing(support: &Support, w: &Weighing<'_>) -> Result<MeasuredCentre, Error> {
    let u_n = Error::check(
        Field::WeighingReadingUncertaintyN,
        w.reading_uncertainty_n,
        1e-6,
        MAX_READING_UNCERTAINTY_N,
    )?;
    let level = sums(Field::WeighingLevelN, support, w.level_n, u_n)?;
    let n_feet = support.feet().len() as f32;
    let g = STANDARD_GRAVITY_MPS2;
    let mass = Estimate {
        value: level.total_n / g,
        uncertainty: u_n * math::sqrt(n_feet) / g,
    };
    let x_m = Estimate {
        value: level.centre_m.x,
        uncertainty: spread_uncertainty_m(support, &level, Vec3::X, u_n),
    };
    let y_m = Estimate {
        value: level.centre_m.y,
        uncertainty: spread_uncertainty_m(support, &level, Vec3::Y, u_n),
    };
    let mut checks = Checks {
        passed: true,
        ..Checks::default()
    };

    let mut from_lift = None;
    let mut lift_angle = None;
    if let Some(l) = &w.lift {
        let (t, turn) = lift_frame(support, l.geometry)?;
        let lifted = sums(Field::WeighingLiftLoadsN, support, l.loads_n, u_n)?;
        let diff = lifted.total_n - level.total_n;
        let tol = COVERAGE_K * u_n * math::sqrt(2.0 * n_feet);
        checks.lift_total_difference_n = Some(diff);
        checks.lift_total_tolerance_n = tol;
        checks.passed &= diff.abs() <= tol;
        let shift = level.centre_m - lifted.centre_m;
        let across = Vec3::Z.cross(t);
        let u_of = |n: Vec3| {
            let a = spread_uncertainty_m(support, &level, n, u_n);
            let b = spread_uncertainty_m(support, &lifted, n, u_n);
            math::sqrt(a * a + b * b)
        };
        let cross = shift.dot(across);
        let cross_tol = COVERAGE_K * u_of(across);
        checks.lift_cross_shift_m = Some(cross);
        checks.lift_cross_tolerance_m = cross_tol;
        checks.passed &= cross.abs() <= cross_tol;
        checks.small_lift_angle = turn.angle_rad < SMALL_ANGLE_RAD;
        from_lift = Some(height_from(shift.dot(t), u_of(t), turn));
        lift_angle = Some(turn.angle_rad);
    }

    let mut from_tip = None;
    if let Some(tip) = &w.tip {
        check_angle(
            [
                Field::WeighingTipAngleRad,
                Field::WeighingTipAngleUncertaintyRad,
            ],
            tip.angle_rad,
            tip.angle_uncertainty_rad,
        )?;
        let [a, b] = tip.edge_feet;
        let edge = support
            .edges()
            .iter()
            .find(|e| (e.from == a && e.to == b) || (e.from == b && e.to == a))
            .ok_or(Error::new(
                ErrorKind::Inconsistent,
                Field::WeighingTipEdgeFeet,
            ))?;
        let d = edge.inset_m(level.centre_m);
        let u_d = spread_uncertainty_m(support, &level, edge.outward, u_n);
        from_tip = Some(height_from(
            d,
            u_d,
            Turn::from_angle(tip.angle_rad, tip.angle_uncertainty_rad),
        ));
    }

    let height = match (from_lift, from_tip) {
        (Some(a), Some(b)) => {
            let diff = a.value - b.value;
            let tol = COVERAGE_K * math::hypot(a.uncertainty, b.uncertainty);
            checks.height_disagreement_m = Some(diff);
            checks.height_disagreement_tolerance_m = tol;
            checks.passed &= diff.abs() <= tol;
            let wa = 1.0 / (a.uncertainty * a.uncertainty).max(1e-12);
            let wb = 1.0 / (b.uncertainty * b.uncertainty).max(1e-12);
            Some(Estimate {
                value: (wa * a.value + wb * b.value) / (wa + wb),
                uncertainty: 1.0 / math::sqrt(wa + wb),
            })
        }
        (Some(a), None) => Some(a),
        (None, b) => b,
    };
    if let Some(h) = height {
        if !h.value.is_finite() || !h.uncertainty.is_finite() {
            return Err(Error::new(ErrorKind::NotFinite, Field::WeighingHeightM));
        }
        checks.height_below_ground = h.value < -COVERAGE_K * h.uncertainty;
        checks.passed &= !checks.height_below_ground;
    }
    Ok(MeasuredCentre {
        mass_kg: mass,
        x_m,
        y_m,
        height_from_lift_m: from_lift,
        height_from_tip_m: from_tip,
        height_m: height,
        lift_angle_rad: lift_angle,
        checks,
    })
}
