//! Wind-exposed shapes, their projected areas and drag coefficients.
//!
//! The drag force on a shape is F = q·Σ(C_d·A) along the wind, applied at the
//! shape's centre of pressure (its geometric centre here). Lift and the
//! shielding of one part by another are neglected; both make the estimate
//! conservative for the bluff parts of a telescope rig.
//!
//! A cylinder is split by the cross-flow principle (common practice, no
//! source): the broadside part of its projected area, d·L·sinψ, takes the
//! cross-flow coefficient and the end part, (π/4)·d²·|cosψ|, the axial-flow
//! coefficient, where ψ is the angle between the axis and the wind.
//!
//! Default drag coefficients come from Hoerner, *Fluid-Dynamic Drag* (1965),
//! as reproduced in the *Aeronautical Engineer's Data Book*, Fig. 5.13b:
//! finite circular cylinders at subcritical Reynolds number, free ends.

use crate::error::{Error, Field};
use crate::math::{self, Vec3};
use core::f32::consts::LN_2;

/// Cross-flow drag coefficient of a finite circular cylinder with free ends by
/// length-to-diameter ratio (Hoerner 1965 via the *Aeronautical Engineer's Data
/// Book*, Fig. 5.13b): l/d = 1, 2, 5, 10, 40; 1.20 beyond (2-D cylinder).
pub const CYLINDER_CROSS_CD: [(f32, f32); 5] = [
    (1.0, 0.63),
    (2.0, 0.68),
    (5.0, 0.74),
    (10.0, 0.82),
    (40.0, 0.98),
];
/// Cross-flow drag coefficient of an infinitely long cylinder (same source).
pub const CYLINDER_CROSS_CD_INFINITE: f32 = 1.20;
/// Axial-flow (end-on) drag coefficient of a circular cylinder by l/d, on
/// its end area π·d²/4: l/d = 0 (a thin disc) 1.17 and l/d = 0.5 1.15 from
/// Hoerner, *Fluid-Dynamic Drag* (1965), ch. 3 (from memory, not yet checked
/// against the printed table); l/d = 1, 2, 4, 7: 0.91, 0.85, 0.87, 0.99
/// (Hoerner 1965 via the *Aeronautical Engineer's Data Book*, Fig. 5.13b).
/// Interpolated linearly in l/d (the table starts at l/d = 0, where ln
/// cannot go); held constant beyond l/d = 7. Counterweight discs
/// (l/d ≈ 0.2 to 0.6) take about 1.15, not the 0.91 of l/d = 1.
pub const CYLINDER_AXIAL_CD: [(f32, f32); 6] = [
    (0.0, 1.17),
    (0.5, 1.15),
    (1.0, 0.91),
    (2.0, 0.85),
    (4.0, 0.87),
    (7.0, 0.99),
];
/// Drag coefficient of a square flat plate normal to the flow, 1.17 (Hoerner
/// 1965 via the *Aeronautical Engineer's Data Book*, Fig. 5.13b), used for
/// every face of a box: a box face-on is no bluffer than a thin plate.
pub const BOX_FACE_CD: f32 = 1.17;

/// Largest dimension accepted for any shape, metres.
pub const MAX_SHAPE_SIZE_M: f32 = 10.0;

/// The geometry of a wind-exposed part.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(rename_all = "snake_case"))]
pub enum Shape {
    /// A solid circular cylinder along a given axis.
    Cylinder {
        /// Diameter, metres.
        diameter_m: f32,
        /// Length along the axis, metres.
        length_m: f32,
        /// Axis direction in the frame of the body's stage (any length).
        axis: [f32; 3],
    },
    /// A rectangular box, by default with its edges along the three axes of
    /// the body's stage frame.
    Box {
        /// Edge lengths along the box's first, second and third edge
        /// directions, m.
        size_m: [f32; 3],
        /// Directions of the box's first and second edges in the stage frame
        /// (any length; the second is made perpendicular to the first, the
        /// third is their cross product); `None` for the stage frame's axes.
        #[cfg_attr(feature = "serde", serde(default))]
        edges: Option<[[f32; 3]; 2]>,
    },
}

/// A wind-exposed shape, its centre of pressure and an optional drag
/// coefficient overriding the default.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct Exposure {
    /// The geometry.
    pub shape: Shape,
    /// Centre of pressure in the body's stage frame, metres.
    pub centre_m: [f32; 3],
    /// Drag coefficient for broadside flow on a cylinder (on its side area
    /// d·L), or for every face of a box; `None` takes the published default
    /// ([`cylinder_cross_cd`], [`BOX_FACE_CD`]).
    #[cfg_attr(feature = "serde", serde(default))]
    pub drag_coefficient: Option<f32>,
    /// Drag coefficient of a cylinder in end-on flow (on its end area
    /// π·d²/4); `None` takes the published default ([`cylinder_axial_cd`]).
    /// Must be `None` for a box.
    #[cfg_attr(feature = "serde", serde(default))]
    pub end_drag_coefficient: Option<f32>,
}

/// Linear interpolation in a table of (x, y) pairs sorted by x; the end values
/// hold outside the table.
#[must_use]
pub(crate) fn interpolate(table: &[(f32, f32)], x: f32) -> f32 {
    let (Some(first), Some(last)) = (table.first(), table.last()) else {
        return 0.0;
    };
    if x <= first.0 {
        return first.1;
    }
    if x >= last.0 {
        return last.1;
    }
    for w in table.windows(2) {
        if let [a, b] = w {
            if x <= b.0 {
                let t = (x - a.0) / (b.0 - a.0);
                return a.1 + t * (b.1 - a.1);
            }
        }
    }
    last.1
}

/// Default cross-flow drag coefficient of a cylinder of aspect ratio l/d:
/// interpolated in [`CYLINDER_CROSS_CD`] linearly in ln(l/d) (the source's
/// plot has a logarithmic l/d axis), 0.63 held below l/d = 1, rising from
/// 0.98 at l/d = 40 to 1.20 at l/d = 1000 (also linear in ln(l/d)) and held
/// there. Example: l/d = 7.5 gives 0.74 + (0.82 − 0.74)·ln 1.5 / ln 2 = 0.787.
#[must_use]
pub fn cylinder_cross_cd(aspect: f32) -> f32 {
    let (Some(first), Some(last)) = (CYLINDER_CROSS_CD.first(), CYLINDER_CROSS_CD.last()) else {
        return CYLINDER_CROSS_CD_INFINITE;
    };
    if aspect.is_nan() || aspect <= first.0 {
        return first.1;
    }
    if aspect >= 40.0 {
        let t = math::clamp(math::ln(aspect / 40.0) / math::ln(25.0), 0.0, 1.0);
        return 0.98 + t * (CYLINDER_CROSS_CD_INFINITE - 0.98);
    }
    for (w, step_ln) in CYLINDER_CROSS_CD.windows(2).zip(CROSS_CD_STEP_LN) {
        if let [a, b] = w {
            if aspect <= b.0 {
                // ln(b/a) of the table's step: the constant, but under the
                // fast back end, whose logarithm is not libm's.
                let step_ln = if math::FAST_MATH {
                    math::ln(b.0 / a.0)
                } else {
                    step_ln
                };
                let t = math::ln(aspect / a.0) / step_ln;
                return a.1 + t * (b.1 - a.1);
            }
        }
    }
    last.1
}

/// ln(b/a) of each step (a, b) of [`CYLINDER_CROSS_CD`]'s l/d: ln 2, ln 2.5,
/// ln 2 and ln 4, the bits `math::ln` gives them under the default back end
/// (tested), so that an interpolation takes one logarithm, not two.
const CROSS_CD_STEP_LN: [f32; 4] = [LN_2, 0.916_290_76, LN_2, 2.0 * LN_2];

/// Default end-on drag coefficient of a cylinder of aspect ratio l/d, on its
/// end area ([`CYLINDER_AXIAL_CD`], linear in l/d).
#[must_use]
pub fn cylinder_axial_cd(aspect: f32) -> f32 {
    interpolate(&CYLINDER_AXIAL_CD, aspect)
}

/// The unit edge directions of a box in rig coordinates, from the stage
/// frame's axes (rig coordinates) and the box's optional edge directions in
/// the stage frame; `None` when the edges are zero or parallel.
#[must_use]
pub(crate) fn box_frame(stage_axes: &[Vec3; 3], edges: Option<[Vec3; 2]>) -> Option<[Vec3; 3]> {
    let Some([a, b]) = edges else {
        return Some(*stage_axes);
    };
    let [e1, e2, e3] = *stage_axes;
    let to_rig = |v: Vec3| e1 * v.x + e2 * v.y + e3 * v.z;
    let u = to_rig(a).normalized()?;
    let v = to_rig(b).reject(u).normalized()?;
    Some([u, v, u.cross(v)])
}

/// [`box_frame`] for a validated box, falling back to the stage axes.
#[must_use]
pub(crate) fn box_axes(stage_axes: &[Vec3; 3], edges: Option<[[f32; 3]; 2]>) -> [Vec3; 3] {
    let e = edges.map(|[a, b]| [Vec3::from_array(a), Vec3::from_array(b)]);
    box_frame(stage_axes, e).unwrap_or(*stage_axes)
}

impl Exposure {
    /// Checks sizes, axis and drag coefficient.
    ///
    /// # Errors
    /// A non-finite value; a size outside 1 mm to 10 m; a zero axis; a drag
    /// coefficient outside 0.1 to 3.
    pub fn validate(&self) -> Result<(), Error> {
        match self.shape {
            Shape::Cylinder {
                diameter_m,
                length_m,
                axis,
            } => {
                Error::check(
                    Field::ExposureDiameterM,
                    diameter_m,
                    0.001,
                    MAX_SHAPE_SIZE_M,
                )?;
                Error::check(Field::ExposureLengthM, length_m, 0.001, MAX_SHAPE_SIZE_M)?;
                let a = Vec3::from_array(axis);
                Error::check_vec(Field::ExposureAxis, a, -1e3, 1e3)?;
                if a.normalized().is_none() {
                    return Err(Error::new(
                        crate::ErrorKind::ZeroDirection,
                        Field::ExposureAxis,
                    ));
                }
            }
            Shape::Box { size_m, edges } => {
                for s in size_m {
                    Error::check(Field::ExposureSizeM, s, 0.001, MAX_SHAPE_SIZE_M)?;
                }
                if let Some([a, b]) = edges {
                    let (a, b) = (Vec3::from_array(a), Vec3::from_array(b));
                    Error::check_vec(Field::ExposureEdges, a, -1e3, 1e3)?;
                    Error::check_vec(Field::ExposureEdges, b, -1e3, 1e3)?;
                    if box_frame(&[Vec3::X, Vec3::Y, Vec3::Z], Some([a, b])).is_none() {
                        return Err(Error::new(
                            crate::ErrorKind::ZeroDirection,
                            Field::ExposureEdges,
                        ));
                    }
                }
            }
        }
        Error::check_vec(
            Field::ExposureCentreM,
            Vec3::from_array(self.centre_m),
            -MAX_SHAPE_SIZE_M,
            MAX_SHAPE_SIZE_M,
        )?;
        if let Some(cd) = self.drag_coefficient {
            Error::check(Field::ExposureDragCoefficient, cd, 0.1, 3.0)?;
        }
        if let Some(cd) = self.end_drag_coefficient {
            Error::check(Field::ExposureEndDragCoefficient, cd, 0.1, 3.0)?;
            if matches!(self.shape, Shape::Box { .. }) {
                return Err(Error::new(
                    crate::ErrorKind::OutOfRange,
                    Field::ExposureEndDragCoefficient,
                ));
            }
        }
        Ok(())
    }

    /// Σ(C_d·A), m², for a wind along the unit vector `wind` given in the same
    /// frame as `axes` (the stage frame's three unit axes, in rig coordinates).
    #[must_use]
    pub fn drag_area_m2(&self, axes: &[Vec3; 3], wind: Vec3) -> f32 {
        match self.shape {
            Shape::Cylinder {
                diameter_m,
                length_m,
                axis,
            } => {
                let local = Vec3::from_array(axis).normalized().unwrap_or(Vec3::Z);
                let [e1, e2, e3] = *axes;
                let a = e1 * local.x + e2 * local.y + e3 * local.z;
                let cos_psi = math::clamp(a.dot(wind), -1.0, 1.0);
                let sin_psi = math::sqrt(1.0 - cos_psi * cos_psi);
                let aspect = length_m / diameter_m;
                let cd_cross = self
                    .drag_coefficient
                    .unwrap_or_else(|| cylinder_cross_cd(aspect));
                let side = diameter_m * length_m * sin_psi;
                let end = 0.25 * math::PI * diameter_m * diameter_m * cos_psi.abs();
                let cd_end = self
                    .end_drag_coefficient
                    .unwrap_or_else(|| cylinder_axial_cd(aspect));
                cd_cross * side + cd_end * end
            }
            Shape::Box { size_m, edges } => {
                let cd = self.drag_coefficient.unwrap_or(BOX_FACE_CD);
                let [e1, e2, e3] = box_axes(axes, edges);
                let [sx, sy, sz] = size_m;
                cd * (sy * sz * e1.dot(wind).abs()
                    + sx * sz * e2.dot(wind).abs()
                    + sx * sy * e3.dot(wind).abs())
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    const RIG_AXES: [Vec3; 3] = [Vec3::X, Vec3::Y, Vec3::Z];

    #[test]
    fn broadside_cylinder_catches_more_than_end_on() {
        let e = Exposure {
            shape: Shape::Cylinder {
                diameter_m: 0.2,
                length_m: 1.0,
                axis: [0.0, 1.0, 0.0],
            },
            centre_m: [0.0; 3],
            drag_coefficient: None,
            end_drag_coefficient: None,
        };
        let broad = e.drag_area_m2(&RIG_AXES, Vec3::X);
        let end = e.drag_area_m2(&RIG_AXES, Vec3::Y);
        assert!((broad - 0.74 * 0.2).abs() < 1e-5);
        assert!(end < broad / 3.0);
    }

    #[test]
    fn cd_table_interpolates_and_holds() {
        assert!((cylinder_cross_cd(5.0) - 0.74).abs() < 1e-6);
        // Between the table's points, linear in ln(l/d) as documented.
        let t = (7.5_f32 / 5.0).ln() / 2.0_f32.ln();
        assert!((cylinder_cross_cd(7.5) - (0.74 + t * 0.08)).abs() < 1e-5);
        assert!((cylinder_cross_cd(0.5) - 0.63).abs() < 1e-6);
        assert!((cylinder_cross_cd(1.0e4) - 1.2).abs() < 1e-6);
    }

    /// The table's step logarithms are those `math::ln` computes, to the
    /// bit (under the default back end, the one that uses them).
    #[test]
    fn cross_cd_step_logarithms_are_math_ln() {
        let steps = CYLINDER_CROSS_CD.windows(2).zip(CROSS_CD_STEP_LN);
        assert_eq!(steps.clone().count(), CYLINDER_CROSS_CD.len() - 1);
        if !math::FAST_MATH {
            for (w, step_ln) in steps {
                if let [a, b] = w {
                    assert_eq!(
                        step_ln.to_bits(),
                        math::ln(b.0 / a.0).to_bits(),
                        "{a:?} {b:?}"
                    );
                }
            }
        }
    }

    #[test]
    fn box_area_by_face() {
        let e = Exposure {
            shape: Shape::Box {
                size_m: [1.0, 2.0, 3.0],
                edges: None,
            },
            centre_m: [0.0; 3],
            drag_coefficient: Some(1.0),
            end_drag_coefficient: None,
        };
        assert!((e.drag_area_m2(&RIG_AXES, Vec3::X) - 6.0).abs() < 1e-6);
        assert!((e.drag_area_m2(&RIG_AXES, Vec3::Z) - 2.0).abs() < 1e-6);
    }

    #[test]
    fn turned_box_shows_its_turned_faces() {
        // The same box turned a quarter turn about z: its 1 m edge now lies
        // along y, so wind along x meets the 1 × 3 face.
        let e = Exposure {
            shape: Shape::Box {
                size_m: [1.0, 2.0, 3.0],
                edges: Some([[0.0, 1.0, 0.0], [-1.0, 0.0, 0.0]]),
            },
            centre_m: [0.0; 3],
            drag_coefficient: Some(1.0),
            end_drag_coefficient: None,
        };
        assert!((e.drag_area_m2(&RIG_AXES, Vec3::X) - 3.0).abs() < 1e-6);
        assert!((e.drag_area_m2(&RIG_AXES, Vec3::Y) - 6.0).abs() < 1e-6);
        let parallel = Exposure {
            shape: Shape::Box {
                size_m: [1.0, 2.0, 3.0],
                edges: Some([[1.0, 0.0, 0.0], [2.0, 0.0, 0.0]]),
            },
            ..e
        };
        assert!(parallel.validate().is_err());
    }
}
