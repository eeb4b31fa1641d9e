//! Tension in the most loaded screw of a bolt pattern under an axial pull and
//! a bending moment, and the load a counterweight shaft puts on its joint.
//!
//! **Joint frame.** The screws lie in the joint plane, at positions (x, y) in
//! millimetres in any right-handed frame of that plane; z is the joint normal
//! pointing toward the attached part (the shaft). An axial load along +z
//! pulls the attached part away and puts the screws in tension (positive).
//! The moment is the one the attached part exerts on the joint, as a vector
//! (moment_x, moment_y) in N·m by the right-hand rule: a moment about +x
//! loads the screws at +y in tension.
//!
//! **Rule.** The flange is rigid and the screws stretch in proportion to
//! their distance from a pivot line: `F_i = P/n + M·y_i/Σ y_j²` with y_i the
//! signed distance of screw i from the pivot line, positive on the tension
//! side. This is the bending analogue of Shigley's secondary shear
//! F = M·r/Σr² (Shigley, *Mechanical Engineering Design*, ch. 8).
//!
//! - [`PivotLine::Centroid`]: the flange turns about its centroid. When the
//!   moment lies along a principal axis of the pattern (any pattern
//!   symmetric about the moment axis, and an equally spaced circle of n ≥ 3
//!   for every direction) the neutral axis is parallel to the moment and the
//!   rule above applies as written. Otherwise the neutral axis tilts and the
//!   forces come from the pattern's second moments Sxx, Syy, Sxy
//!   (unsymmetric bending): `F_i = P/n + A·y_i − B·x_i` with
//!   `A = (Mx·Sxx + My·Sxy)/D`, `B = (My·Syy + Mx·Sxy)/D`,
//!   `D = Sxx·Syy − Sxy²`, which keeps both moment components in equilibrium.
//! - [`PivotLine::Heel`]: the flange tips about a fixed edge parallel to the
//!   moment vector; y is measured from that edge. The edge contact carries
//!   the rest (including any moment component along the screws' line).
//!
//! Screw preload is not modelled: the forces are the shares of the external
//! load. A negative force means the rule puts that screw on the compression
//! side, where the flange, not the screw, carries the load.

use crate::error::{Error, ErrorKind, Field};
use crate::math::{self, STANDARD_GRAVITY_MPS2};

/// Most screws a pattern may hold.
pub const MAX_SCREWS: usize = 8;

/// Largest screw coordinate accepted, mm.
const MAX_COORD_MM: f32 = 10_000.0;

/// Moments below this magnitude, N·m, count as no moment.
const NEGLIGIBLE_MOMENT_NM: f32 = 1e-6;

/// Screw positions of a joint, mm, in the joint frame (see the
/// [module](self)); 1 to [`MAX_SCREWS`] screws.
#[derive(Clone, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct BoltPattern {
    screws_mm: heapless::Vec<[f32; 2], MAX_SCREWS>,
}

/// Where the flange pivots under the moment.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub enum PivotLine {
    /// The neutral axis passes through the centroid of the screw pattern
    /// (parallel to the moment vector when the moment lies along a principal
    /// axis of the pattern; see the [module](self)). The conservative choice
    /// for a thick flange: the most loaded screw has the largest share.
    Centroid,
    /// The flange tips about a heel line parallel to the moment vector, on
    /// the compression side at `offset_mm` from the pattern centroid (for a
    /// round flange of radius R_f centred on the pattern, `offset_mm = R_f`).
    /// Every screw must lie on the tension side of the heel.
    Heel {
        /// Distance from the pattern centroid to the heel line, mm, ≥ 0.
        offset_mm: f32,
    },
}

/// External load on a joint: axial pull and bending moment (joint frame, see
/// the [module](self)).
#[derive(Clone, Copy, Debug, Default, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct JointLoad {
    /// Axial force along +z, N; positive pulls the screws (tension).
    pub axial_n: f32,
    /// Moment about the joint x axis, N·m (right-hand rule).
    pub moment_x_nm: f32,
    /// Moment about the joint y axis, N·m (right-hand rule).
    pub moment_y_nm: f32,
}

/// Screw forces from [`BoltPattern::tensions`]. Forces in N, positive =
/// tension.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct BoltGroupResult {
    /// Force on each screw in pattern order, N; entries from `count` on are 0.
    /// A negative value means the linear rule puts that screw on the
    /// compression side: the flange, not the screw, carries it there.
    pub forces_n: [f32; MAX_SCREWS],
    /// Number of screws.
    pub count: usize,
    /// Largest force (the most loaded screw), N.
    pub max_n: f32,
    /// Index of the most loaded screw in pattern order.
    pub max_index: usize,
    /// Smallest force, N.
    pub min_n: f32,
    /// Σ y_j² about the neutral axis (centroid pivot) or heel line, mm²
    /// (0 when there is no moment).
    pub sum_sq_lever_mm2: f32,
}

impl BoltPattern {
    /// A pattern from screw positions `[x, y]` in mm. Two screws may share a
    /// position (their loads simply add up in the rule).
    ///
    /// # Errors
    /// [`ErrorKind::TooFew`] / [`ErrorKind::TooMany`] on `bolt_pattern.screws_mm`
    /// for 0 or more than [`MAX_SCREWS`] screws; a coordinate not finite or
    /// beyond ±10 000 mm (with the screw's index).
    pub fn new(positions_mm: &[[f32; 2]]) -> Result<BoltPattern, Error> {
        let count_err = |kind| Error {
            kind,
            field: Field::BoltPatternScrewsMm,
            index: None,
            value: positions_mm.len() as f32,
            min: 1.0,
            max: MAX_SCREWS as f32,
        };
        if positions_mm.is_empty() {
            return Err(count_err(ErrorKind::TooFew));
        }
        let mut screws_mm = heapless::Vec::new();
        for (i, p) in positions_mm.iter().enumerate() {
            for c in p {
                Error::check(Field::BoltPatternScrewsMm, *c, -MAX_COORD_MM, MAX_COORD_MM)
                    .map_err(|e| e.at(i))?;
            }
            screws_mm
                .push(*p)
                .map_err(|_| count_err(ErrorKind::TooMany))?;
        }
        Ok(BoltPattern { screws_mm })
    }

    /// `n` screws equally spaced on a circle of radius `radius_mm` about the
    /// origin, the first at angle `phase_rad` from +x toward +y.
    ///
    /// # Errors
    /// `bolt_pattern.count` outside 1 to [`MAX_SCREWS`];
    /// `bolt_pattern.radius_mm` outside 0 to 10 000 mm; `bolt_pattern.phase_rad`
    /// not finite or beyond ±10⁴ rad.
    pub fn circle(n: usize, radius_mm: f32, phase_rad: f32) -> Result<BoltPattern, Error> {
        let nf = n as f32;
        Error::check(Field::BoltPatternCount, nf, 1.0, MAX_SCREWS as f32)?;
        let r = Error::check(Field::BoltPatternRadiusMm, radius_mm, 0.0, MAX_COORD_MM)?;
        let phase = Error::check(Field::BoltPatternPhaseRad, phase_rad, -1e4, 1e4)?;
        let mut screws_mm = heapless::Vec::new();
        for i in 0..n {
            let a = phase + math::TAU * (i as f32) / nf;
            // n ≤ MAX_SCREWS was checked, so push cannot fail; the result is
            // still handled rather than assumed.
            screws_mm
                .push([r * math::cos(a), r * math::sin(a)])
                .map_err(|_| Error::new(ErrorKind::TooMany, Field::BoltPatternCount))?;
        }
        Ok(BoltPattern { screws_mm })
    }

    /// Screw positions `[x, y]`, mm.
    #[must_use]
    pub fn positions_mm(&self) -> &[[f32; 2]] {
        &self.screws_mm
    }

    /// Number of screws.
    #[must_use]
    pub fn len(&self) -> usize {
        self.screws_mm.len()
    }

    /// Always false: a pattern holds at least one screw.
    #[must_use]
    pub fn is_empty(&self) -> bool {
        self.screws_mm.is_empty()
    }

    /// Centroid of the screw positions `[x, y]`, mm.
    #[must_use]
    pub fn centroid_mm(&self) -> [f32; 2] {
        let n = self.screws_mm.len().max(1) as f32;
        let (sx, sy) = self
            .screws_mm
            .iter()
            .fold((0.0, 0.0), |(ax, ay), p| (ax + p[0], ay + p[1]));
        [sx / n, sy / n]
    }

    /// Force on every screw under `load`, by the linear rule about `pivot`
    /// (see the [module](self)).
    ///
    /// # Errors
    /// `joint_load.axial_n` outside ±10⁷ N, `joint_load.moment_x_nm` /
    /// `moment_y_nm` outside ±10⁶ N·m; `bolt_pattern.pivot.offset_mm`
    /// outside the range that keeps every screw on the tension side of the
    /// heel (min = the smallest such offset) or beyond 10 000 mm;
    /// [`ErrorKind::Unreachable`] on `bolt_pattern.screws_mm` when a moment
    /// acts that the pattern cannot resist: a single screw, or all screws on
    /// one line through the centroid while the moment has a component along
    /// that line (centroid pivot), or every screw on the heel line.
    pub fn tensions(&self, load: JointLoad, pivot: PivotLine) -> Result<BoltGroupResult, Error> {
        let p = Error::check(Field::JointLoadAxialN, load.axial_n, -1e7, 1e7)?;
        let mx = Error::check(Field::JointLoadMomentXNm, load.moment_x_nm, -1e6, 1e6)?;
        let my = Error::check(Field::JointLoadMomentYNm, load.moment_y_nm, -1e6, 1e6)?;
        let n = self.screws_mm.len();
        let share = p / (n.max(1) as f32);
        let mut forces_n = [0.0; MAX_SCREWS];
        let mut sum_sq = 0.0;
        if math::hypot(mx, my) > NEGLIGIBLE_MOMENT_NM {
            sum_sq = self.bending_shares(mx * 1000.0, my * 1000.0, pivot, &mut forces_n)?;
        }
        for f in forces_n.iter_mut().take(n) {
            *f += share;
        }
        let mut max_n = f32::NEG_INFINITY;
        let mut min_n = f32::INFINITY;
        let mut max_index = 0;
        for (i, f) in forces_n.iter().take(n).enumerate() {
            if *f > max_n {
                max_n = *f;
                max_index = i;
            }
            min_n = min_n.min(*f);
        }
        Ok(BoltGroupResult {
            forces_n,
            count: n,
            max_n,
            max_index,
            min_n,
            sum_sq_lever_mm2: sum_sq,
        })
    }
}

impl BoltPattern {
    /// Screw positions relative to the centroid, mm.
    fn relative(&self) -> impl Iterator<Item = (f32, f32)> + '_ {
        let c = self.centroid_mm();
        self.screws_mm
            .iter()
            .map(move |q| (q[0] - c[0], q[1] - c[1]))
    }

    /// Writes the bending share of each screw (N) into `out` for a moment
    /// (mx, my) in N·mm and returns Σ (distance from the neutral axis)², mm².
    fn bending_shares(
        &self,
        mx_nmm: f32,
        my_nmm: f32,
        pivot: PivotLine,
        out: &mut [f32; MAX_SCREWS],
    ) -> Result<f32, Error> {
        let cannot_resist = |v: f32| Error {
            kind: ErrorKind::Unreachable,
            field: Field::BoltPatternScrewsMm,
            index: None,
            value: v,
            min: f32::NAN,
            max: f32::NAN,
        };
        let m = math::hypot(mx_nmm, my_nmm);
        let (ux, uy) = (mx_nmm / m, my_nmm / m);
        // Signed distance from the line through the centroid along the moment
        // vector: (û × r)·ẑ, positive where the moment pulls.
        let lever = |(x, y): (f32, f32)| ux * y - uy * x;

        if let PivotLine::Heel { offset_mm } = pivot {
            let need = self.relative().map(|r| -lever(r)).fold(0.0_f32, f32::max);
            let shift = Error::check(
                Field::BoltPatternPivotOffsetMm,
                offset_mm,
                need,
                MAX_COORD_MM,
            )?;
            let sum_sq: f32 = self
                .relative()
                .map(|r| {
                    let y = lever(r) + shift;
                    y * y
                })
                .sum();
            if sum_sq <= 1e-6 {
                return Err(cannot_resist(sum_sq));
            }
            for (f, r) in out.iter_mut().zip(self.relative()) {
                *f = m * (lever(r) + shift) / sum_sq;
            }
            return Ok(sum_sq);
        }

        // Centroid pivot: rigid-flange rotation about the centroid, screw
        // force F = A·y − B·x, with A and B from moment equilibrium using the
        // pattern's second moments (unsymmetric bending).
        let (mut sxx, mut syy, mut sxy) = (0.0_f32, 0.0_f32, 0.0_f32);
        for (x, y) in self.relative() {
            sxx += x * x;
            syy += y * y;
            sxy += x * y;
        }
        let det = sxx * syy - sxy * sxy;
        let scale = (sxx + syy) * (sxx + syy);
        if det > 1e-6 * scale && det > 0.0 {
            let a = (mx_nmm * sxx + my_nmm * sxy) / det;
            let b = (my_nmm * syy + mx_nmm * sxy) / det;
            let mut sum_f2 = 0.0;
            for (f, (x, y)) in out.iter_mut().zip(self.relative()) {
                *f = a * y - b * x;
                sum_f2 += *f * *f;
            }
            let g2 = a * a + b * b;
            return Ok(if g2 > 0.0 { sum_f2 / g2 } else { 0.0 });
        }
        // All screws on one line (or one point): the line resists only a
        // moment whose vector is perpendicular to it.
        let sum_sq: f32 = self.relative().map(|r| lever(r) * lever(r)).sum();
        if sum_sq <= 1e-6 {
            return Err(cannot_resist(sum_sq));
        }
        let (mut rx, mut ry) = (0.0_f32, 0.0_f32);
        for (f, r) in out.iter_mut().zip(self.relative()) {
            *f = m * lever(r) / sum_sq;
            rx += r.1 * *f;
            ry -= r.0 * *f;
        }
        let residual = math::hypot(rx - mx_nmm, ry - my_nmm);
        if residual > 1e-3 * m {
            return Err(cannot_resist(residual / 1000.0));
        }
        Ok(sum_sq)
    }
}

/// Design tension, N, of the most loaded of `n` ≥ 3 screws equally spaced on
/// a circle of radius `radius_mm` under a moment `moment_nm` about an axis
/// through the centre: `2·M/(n·R)`. Σy² = n·R²/2 for every orientation of
/// the pattern; the value is reached when a screw lies on the line through
/// the centre perpendicular to the moment vector, and is an upper bound for
/// other orientations (for example 1/√2 of it for four screws turned 45°).
///
/// # Errors
/// `bolt_circle.count` outside 3 to 1000; `bolt_circle.radius_mm` outside
/// 0.1 to 10 000 mm; `bolt_circle.moment_nm` outside 0 to 10⁶ N·m.
pub fn circle_max_tension_n(n: usize, radius_mm: f32, moment_nm: f32) -> Result<f32, Error> {
    let nf = Error::check(Field::BoltCircleCount, n as f32, 3.0, 1000.0)?;
    let r = Error::check(Field::BoltCircleRadiusMm, radius_mm, 0.1, MAX_COORD_MM)?;
    let m = Error::check(Field::BoltCircleMomentNm, moment_nm, 0.0, 1e6)?;
    Ok(2.0 * m * 1000.0 / (nf * r))
}

/// Load at the root of a counterweight shaft: the axial pull along the shaft
/// and the bending moment, from counterweights on it.
///
/// The shaft points from its joint toward its free end. `angle_from_vertical_rad`
/// is the angle between that direction and straight down: 0 = hanging
/// vertically below the joint (pure axial pull, the counterweight tries to
/// draw the shaft out of its joint), π/2 = horizontal (pure bending, the full
/// moment weight × lever), π = pointing straight up (pure axial push).
#[derive(Clone, Copy, Debug, Default, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct ShaftLoad {
    /// Force along the shaft at the joint, N; positive pulls the shaft out of
    /// the joint (tension in its screws or thread).
    pub axial_n: f32,
    /// Bending moment at the joint, N·m, ≥ 0; it tends to swing the shaft
    /// down. Apply it about the joint axis that is horizontal and
    /// perpendicular to the shaft.
    pub moment_nm: f32,
}

impl ShaftLoad {
    /// Load of a counterweight of `mass_kg` whose centre of mass is
    /// `lever_arm_m` metres along the shaft from the joint (the shaft root),
    /// with the shaft at `angle_from_vertical_rad` from hanging straight down
    /// (see [`ShaftLoad`]). Axial `m·g·cos θ`, moment `m·g·L·sin θ`, with
    /// g = 9.80665 m/s².
    ///
    /// # Errors
    /// `shaft_load.mass_kg` outside 0 to 10 000 kg; `shaft_load.lever_arm_m`
    /// outside 0 to 100 m; `shaft_load.angle_from_vertical_rad` outside 0 to π.
    pub fn counterweight(
        mass_kg: f32,
        lever_arm_m: f32,
        angle_from_vertical_rad: f32,
    ) -> Result<ShaftLoad, Error> {
        let m = Error::check(Field::ShaftLoadMassKg, mass_kg, 0.0, 1e4)?;
        let l = Error::check(Field::ShaftLoadLeverArmM, lever_arm_m, 0.0, 100.0)?;
        let a = Error::check(
            Field::ShaftLoadAngleFromVerticalRad,
            angle_from_vertical_rad,
            0.0,
            math::PI,
        )?;
        let w = m * STANDARD_GRAVITY_MPS2;
        Ok(ShaftLoad {
            axial_n: w * math::cos(a),
            // sin θ ≥ 0 on [0, π]; clamp away rounding below zero.
            moment_nm: (w * l * math::sin(a)).max(0.0),
        })
    }

    /// This load as a [`JointLoad`] with the moment about the joint x axis
    /// (so the screws at +y are the ones pulled): lay out the pattern so
    /// that +y points up, away from the way the shaft swings.
    #[must_use]
    pub fn as_joint_load(&self) -> JointLoad {
        JointLoad {
            axial_n: self.axial_n,
            moment_x_nm: self.moment_nm,
            moment_y_nm: 0.0,
        }
    }
}

impl core::ops::Add for ShaftLoad {
    type Output = ShaftLoad;
    /// Sum of two loads on the same shaft at the same angle (for example
    /// several counterweights and the shaft's own weight).
    fn add(self, o: ShaftLoad) -> ShaftLoad {
        ShaftLoad {
            axial_n: self.axial_n + o.axial_n,
            moment_nm: self.moment_nm + o.moment_nm,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn axial_only_shares_equally() {
        let p = BoltPattern::circle(4, 30.0, 0.3).unwrap();
        let r = p
            .tensions(
                JointLoad {
                    axial_n: 400.0,
                    ..JointLoad::default()
                },
                PivotLine::Centroid,
            )
            .unwrap();
        for f in &r.forces_n[..4] {
            assert!((f - 100.0).abs() < 1e-4);
        }
        assert!(r.forces_n[4].abs() < 1e-9);
    }

    #[test]
    fn moment_about_x_pulls_positive_y() {
        let p = BoltPattern::new(&[[0.0, 50.0], [0.0, -50.0]]).unwrap();
        let load = JointLoad {
            moment_x_nm: 10.0,
            ..JointLoad::default()
        };
        let r = p.tensions(load, PivotLine::Centroid).unwrap();
        assert_eq!(r.max_index, 0);
        // 10 000 N·mm · 50 / (2 · 2500) = 100 N.
        assert!((r.max_n - 100.0).abs() < 1e-3);
        assert!((r.min_n + 100.0).abs() < 1e-3);
    }

    #[test]
    fn pattern_on_the_moment_axis_cannot_resist() {
        let p = BoltPattern::new(&[[-50.0, 0.0], [50.0, 0.0]]).unwrap();
        let load = JointLoad {
            moment_x_nm: 10.0,
            ..JointLoad::default()
        };
        let e = p.tensions(load, PivotLine::Centroid).unwrap_err();
        assert_eq!(e.kind, ErrorKind::Unreachable);
    }

    #[test]
    fn heel_inside_the_pattern_is_rejected() {
        let p = BoltPattern::circle(6, 40.0, 0.0).unwrap();
        let load = JointLoad {
            moment_y_nm: 10.0,
            ..JointLoad::default()
        };
        let e = p
            .tensions(load, PivotLine::Heel { offset_mm: 20.0 })
            .unwrap_err();
        assert_eq!(e.field, Field::BoltPatternPivotOffsetMm);
        assert!((e.min - 40.0).abs() < 1e-3);
    }

    #[test]
    fn pattern_size_limits() {
        assert_eq!(BoltPattern::new(&[]).unwrap_err().kind, ErrorKind::TooFew);
        let nine = [[0.0, 0.0]; 9];
        assert_eq!(
            BoltPattern::new(&nine).unwrap_err().kind,
            ErrorKind::TooMany
        );
        let e = BoltPattern::new(&[[0.0, 0.0], [f32::NAN, 1.0]]).unwrap_err();
        assert_eq!(e.index, Some(1));
    }

    #[test]
    fn counterweight_angles() {
        let hang = ShaftLoad::counterweight(5.0, 0.2, 0.0).unwrap();
        assert!((hang.axial_n - 5.0 * STANDARD_GRAVITY_MPS2).abs() < 1e-3);
        assert!(hang.moment_nm.abs() < 1e-6);
        let flat = ShaftLoad::counterweight(5.0, 0.2, math::PI / 2.0).unwrap();
        assert!(flat.axial_n.abs() < 1e-4);
        assert!((flat.moment_nm - 5.0 * STANDARD_GRAVITY_MPS2 * 0.2).abs() < 1e-4);
        assert!(ShaftLoad::counterweight(5.0, 0.2, 4.0).is_err());
    }
}
