//! The support polygon: the feet the rig stands on and the edges it can tip about.
//!
//! Feet lie in the ground plane z = 0 of the rig frame ([`crate::frame`]). The
//! support polygon is the convex hull of the feet; a foot inside the hull
//! carries load but no edge runs through it. Edges are ordered
//! counter-clockwise seen from above, so the inside lies to the left of each.

use crate::error::{Error, ErrorKind, Field};
use crate::frame;
use crate::math::{self, Vec3};
use heapless::Vec;

/// Most feet a support may have (a pier base plate with eight bolts, say).
pub const MAX_FEET: usize = 8;
/// Fewest feet a support may have.
pub const MIN_FEET: usize = 3;
/// Feet closer than this, in metres, are duplicates.
pub const MIN_FOOT_SPACING_M: f32 = 0.001;
/// Largest foot distance from the origin accepted, metres.
pub const MAX_FOOT_RADIUS_M: f32 = 10.0;

/// One foot: its position in the ground plane and the rated pull of its
/// tie-down (a stake, a strap to a ground anchor), if any.
#[derive(Clone, Copy, Debug, PartialEq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct Foot {
    /// Position `[x, y]` in the rig frame, metres (x east, y north).
    pub position_m: [f32; 2],
    /// Rated pull of the tie-down holding this foot down, newtons; 0 for none.
    /// Counted as a downward force at the foot when it resists lift-off.
    #[cfg_attr(feature = "serde", serde(default))]
    pub tie_down_n: f32,
}

/// One edge of the support polygon, from foot `from` to foot `to`
/// (counter-clockwise, inside on the left).
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Edge {
    /// Index of the foot the edge starts at.
    pub from: u8,
    /// Index of the foot the edge ends at.
    pub to: u8,
    /// Start point, rig frame, metres (z = 0).
    pub a_m: Vec3,
    /// Unit vector along the edge, rig frame.
    pub along: Vec3,
    /// Unit vector in the ground plane pointing out of the polygon, rig frame.
    pub outward: Vec3,
}

impl Edge {
    /// Azimuth of the outward normal, radians from north clockwise: the
    /// direction the rig falls when it tips about this edge.
    #[must_use]
    pub fn outward_azimuth_rad(&self) -> f32 {
        frame::azimuth_of(self.outward)
    }

    /// Moment about this edge, N·m, of force `f_n` applied at `point_m` (both rig
    /// frame). Positive tips the rig outward over the edge; negative holds it.
    #[must_use]
    pub fn moment_nm(&self, point_m: Vec3, f_n: Vec3) -> f32 {
        (point_m - self.a_m).cross(f_n).dot(self.along)
    }

    /// Signed distance of a ground point from the edge line, metres; positive
    /// inside the polygon.
    #[must_use]
    pub fn inset_m(&self, point_m: Vec3) -> f32 {
        -(point_m - self.a_m).dot(self.outward)
    }

    /// [`Edge::moment_nm`] of an edge of a [`Support`], which lies in the
    /// ground plane (`a_m.z` and `along.z` are +0, as [`Support::new`] makes
    /// them), N·m: the z component of `(point − a) × f` meets the 0 of
    /// `along`, so it is left out, and the height `point.z − a.z` is
    /// `point.z` to the bit (so its products with `f` are the same for every
    /// edge, which the compiler can take out of a loop over the edges). For
    /// finite inputs the same value as [`Edge::moment_nm`], to the bit but
    /// for the sign of a zero result (a zero is no moment either way: the
    /// callers add it to no side, or take it off a side that is ≥ +0, which
    /// leaves it unchanged).
    #[must_use]
    pub(crate) fn ground_moment_nm(&self, point_m: Vec3, f_n: Vec3) -> f32 {
        let (dx, dy, h) = (point_m.x - self.a_m.x, point_m.y - self.a_m.y, point_m.z);
        (dy * f_n.z - h * f_n.y) * self.along.x + (h * f_n.x - dx * f_n.z) * self.along.y
    }

    /// The moments about an edge of a [`Support`] (as
    /// [`Edge::ground_moment_nm`]) of a weight `w_n` at `point_m` split into
    /// its parts normal to and along the ground, `(0, 0, w.z)` and
    /// `(w.x, w.y, 0)`, N·m: the products with their zero components left
    /// out. For finite inputs the same values as [`Edge::moment_nm`] of
    /// `Vec3::Z * w.z` and of `w − Vec3::Z * w.z`, to the bit but for the
    /// sign of a zero result, as there.
    #[must_use]
    pub(crate) fn weight_moments_nm(&self, point_m: Vec3, w_n: Vec3) -> (f32, f32) {
        let (dx, dy, h) = (point_m.x - self.a_m.x, point_m.y - self.a_m.y, point_m.z);
        (
            dy * w_n.z * self.along.x - dx * w_n.z * self.along.y,
            h * w_n.x * self.along.y - h * w_n.y * self.along.x,
        )
    }
}

/// A validated support polygon.
#[derive(Clone, Debug, PartialEq)]
pub struct Support {
    feet: Vec<Foot, MAX_FEET>,
    edges: Vec<Edge, MAX_FEET>,
}

impl Support {
    /// A support from feet at arbitrary positions (unequal legs, a base plate).
    ///
    /// # Errors
    /// Fewer than 3 or more than [`MAX_FEET`] feet; a non-finite or far-out
    /// position; a negative tie-down rating; two feet within 1 mm; all feet on
    /// one line.
    pub fn new(feet: &[Foot]) -> Result<Support, Error> {
        if feet.len() < MIN_FEET {
            let mut e = Error::new(ErrorKind::TooFew, Field::SupportFeet);
            e.min = MIN_FEET as f32;
            e.value = feet.len() as f32;
            return Err(e);
        }
        let mut list: Vec<Foot, MAX_FEET> = Vec::new();
        for (i, f) in feet.iter().enumerate() {
            for c in f.position_m {
                Error::check(
                    Field::SupportFeetPositionM,
                    c,
                    -MAX_FOOT_RADIUS_M,
                    MAX_FOOT_RADIUS_M,
                )
                .map_err(|e| e.at(i))?;
            }
            Error::check(Field::SupportFeetTieDownN, f.tie_down_n, 0.0, 1.0e5)
                .map_err(|e| e.at(i))?;
            for (j, g) in list.iter().enumerate() {
                let d = math::hypot(
                    f.position_m[0] - g.position_m[0],
                    f.position_m[1] - g.position_m[1],
                );
                if d < MIN_FOOT_SPACING_M {
                    let mut e = Error::new(ErrorKind::DuplicateFoot, Field::SupportFeet).at(i);
                    e.value = j as f32;
                    return Err(e);
                }
            }
            list.push(*f).map_err(|_| {
                let mut e = Error::new(ErrorKind::TooMany, Field::SupportFeet);
                e.max = MAX_FEET as f32;
                e.value = feet.len() as f32;
                e
            })?;
        }
        let edges = hull_edges(&list)?;
        Ok(Support { feet: list, edges })
    }

    /// A three-legged stand with its feet equally spaced on a circle of radius
    /// `foot_circle_radius_m` about the origin, the first foot at azimuth
    /// `first_leg_azimuth_rad` (from north, clockwise) and the others 120° and
    /// 240° further clockwise. No tie-downs.
    ///
    /// # Errors
    /// Radius outside 0.05 to 10 m; non-finite azimuth.
    ///
    /// # Examples
    /// ```
    /// use standfast::Support;
    /// let tripod = Support::tripod(0.45, 0.0)?; // one leg due north
    /// let north = tripod.feet()[0].position_m;
    /// assert!(north[0].abs() < 1e-6 && (north[1] - 0.45).abs() < 1e-6);
    /// # Ok::<(), standfast::Error>(())
    /// ```
    pub fn tripod(foot_circle_radius_m: f32, first_leg_azimuth_rad: f32) -> Result<Support, Error> {
        Error::check(
            Field::SupportFootCircleRadiusM,
            foot_circle_radius_m,
            0.05,
            MAX_FOOT_RADIUS_M,
        )?;
        Error::check(
            Field::SupportFirstLegAzimuthRad,
            first_leg_azimuth_rad,
            -1e4,
            1e4,
        )?;
        let mut feet = [Foot::default(); 3];
        for (k, f) in feet.iter_mut().enumerate() {
            let az = first_leg_azimuth_rad + k as f32 * (math::TAU / 3.0);
            let u = frame::azimuth_unit(az) * foot_circle_radius_m;
            f.position_m = [u.x, u.y];
        }
        Support::new(&feet)
    }

    /// `count` feet equally spaced on a circle of radius `radius_m` about the
    /// origin, the first at azimuth `first_azimuth_rad` (from north,
    /// clockwise), the others following clockwise. No tie-downs.
    ///
    /// # Errors
    /// A count outside 3 to [`MAX_FEET`]; a radius outside 0.05 to 10 m; a
    /// non-finite azimuth.
    pub fn on_circle(
        count: usize,
        radius_m: f32,
        first_azimuth_rad: f32,
    ) -> Result<Support, Error> {
        Error::check(
            Field::SupportFeet,
            count as f32,
            MIN_FEET as f32,
            MAX_FEET as f32,
        )?;
        Error::check(
            Field::SupportFootCircleRadiusM,
            radius_m,
            0.05,
            MAX_FOOT_RADIUS_M,
        )?;
        Error::check(
            Field::SupportFirstLegAzimuthRad,
            first_azimuth_rad,
            -1e4,
            1e4,
        )?;
        let mut feet: Vec<Foot, MAX_FEET> = Vec::new();
        let step = math::TAU / count as f32;
        for k in 0..count {
            let u = frame::azimuth_unit(first_azimuth_rad + k as f32 * step) * radius_m;
            feet.push(Foot {
                position_m: [u.x, u.y],
                tie_down_n: 0.0,
            })
            .map_err(|_| Error::new(ErrorKind::TooMany, Field::SupportFeet))?;
        }
        Support::new(&feet)
    }

    /// A pier: a column standing on `anchor_count` anchor bolts on a circle
    /// of radius `anchor_circle_radius_m` (the base flange's bolt circle),
    /// the first anchor due north, each anchor rated to hold
    /// `anchor_pull_n` newtons down (0 for a pier that only stands on its
    /// base).
    ///
    /// # Errors
    /// As [`Support::on_circle`]; a pull outside 0 to 100 kN.
    ///
    /// # Examples
    /// ```
    /// use standfast::Support;
    /// let pier = Support::pier(4, 0.15, 5_000.0)?; // four anchors, 5 kN each
    /// assert_eq!(pier.feet().len(), 4);
    /// assert_eq!(pier.feet()[0].tie_down_n, 5_000.0);
    /// # Ok::<(), standfast::Error>(())
    /// ```
    pub fn pier(
        anchor_count: usize,
        anchor_circle_radius_m: f32,
        anchor_pull_n: f32,
    ) -> Result<Support, Error> {
        Error::check(Field::SupportFeetTieDownN, anchor_pull_n, 0.0, 1.0e5)?;
        let base = Support::on_circle(anchor_count, anchor_circle_radius_m, 0.0)?;
        base.with_tie_downs(anchor_pull_n)
    }

    /// A rectangular plate (a base board, a flat platform) resting on its
    /// four corners, centred on the origin, `size_m = [east-west, north-south]`
    /// metres. No tie-downs.
    ///
    /// # Errors
    /// A side outside 0.05 to 10 m.
    ///
    /// # Examples
    /// ```
    /// use standfast::Support;
    /// let plate = Support::plate([0.6, 0.4])?;
    /// assert_eq!(plate.edges().len(), 4);
    /// # Ok::<(), standfast::Error>(())
    /// ```
    pub fn plate(size_m: [f32; 2]) -> Result<Support, Error> {
        let [w, d] = size_m;
        Error::check(Field::SupportPlateSizeM, w, 0.05, MAX_FOOT_RADIUS_M)?;
        Error::check(Field::SupportPlateSizeM, d, 0.05, MAX_FOOT_RADIUS_M)?;
        let (x, y) = (0.5 * w, 0.5 * d);
        let corner = |px: f32, py: f32| Foot {
            position_m: [px, py],
            tie_down_n: 0.0,
        };
        Support::new(&[corner(-x, -y), corner(x, -y), corner(x, y), corner(-x, y)])
    }

    /// The same support with every foot's tie-down rated `pull_n` newtons.
    ///
    /// # Errors
    /// A pull outside 0 to 100 kN.
    pub fn with_tie_downs(&self, pull_n: f32) -> Result<Support, Error> {
        Error::check(Field::SupportFeetTieDownN, pull_n, 0.0, 1.0e5)?;
        let mut feet = self.feet.clone();
        for f in &mut feet {
            f.tie_down_n = pull_n;
        }
        Ok(Support {
            feet,
            edges: self.edges.clone(),
        })
    }

    /// A tripod from its leg spread: the distance between two feet, metres.
    /// The foot circle radius is spread/√3.
    ///
    /// # Errors
    /// As [`Support::tripod`].
    pub fn tripod_from_spread(
        leg_spread_m: f32,
        first_leg_azimuth_rad: f32,
    ) -> Result<Support, Error> {
        Error::check(Field::SupportLegSpreadM, leg_spread_m, 0.08, 17.0)?;
        Support::tripod(leg_spread_m / math::sqrt(3.0), first_leg_azimuth_rad)
    }

    /// The feet, in the order given.
    #[must_use]
    pub fn feet(&self) -> &[Foot] {
        &self.feet
    }

    /// The feet as the fixed-capacity list a [`crate::rig::RigSpec`] holds
    /// (a copy; it cannot overflow, a support has at most [`MAX_FEET`]).
    #[must_use]
    pub fn feet_list(&self) -> Vec<Foot, MAX_FEET> {
        self.feet.clone()
    }

    /// The edges of the support polygon, counter-clockwise.
    #[must_use]
    pub fn edges(&self) -> &[Edge] {
        &self.edges
    }

    /// Position of foot `i` as a rig-frame point (z = 0), if it exists.
    #[must_use]
    pub fn foot_point_m(&self, i: usize) -> Option<Vec3> {
        self.feet
            .get(i)
            .map(|f| Vec3::new(f.position_m[0], f.position_m[1], 0.0))
    }

    /// Smallest distance, metres, from a ground point to the polygon's edges;
    /// negative when the point is outside.
    #[must_use]
    pub fn inset_m(&self, point_m: Vec3) -> f32 {
        self.edges
            .iter()
            .map(|e| e.inset_m(point_m))
            .fold(f32::INFINITY, f32::min)
    }

    /// The same support turned about the vertical axis by `angle_rad`
    /// (clockwise seen from above, like an azimuth).
    ///
    /// # Errors
    /// Never for a valid support and finite angle; kept for uniformity.
    pub fn rotated(&self, angle_rad: f32) -> Result<Support, Error> {
        let mut feet: Vec<Foot, MAX_FEET> = Vec::new();
        for f in &self.feet {
            let p = rotate_cw([f.position_m[0], f.position_m[1]], angle_rad);
            let _ = feet.push(Foot {
                position_m: p,
                tie_down_n: f.tie_down_n,
            });
        }
        Support::new(&feet)
    }
}

/// A ground-plane point turned clockwise (seen from above) by `angle_rad`.
#[must_use]
pub fn rotate_cw(p: [f32; 2], angle_rad: f32) -> [f32; 2] {
    let (s, c) = (math::sin(angle_rad), math::cos(angle_rad));
    [p[0] * c + p[1] * s, -p[0] * s + p[1] * c]
}

fn cross2(o: [f32; 2], a: [f32; 2], b: [f32; 2]) -> f32 {
    (a[0] - o[0]) * (b[1] - o[1]) - (a[1] - o[1]) * (b[0] - o[0])
}

/// Convex hull (Andrew's monotone chain) as counter-clockwise edges.
fn hull_edges(feet: &[Foot]) -> Result<Vec<Edge, MAX_FEET>, Error> {
    let collinear = Error::new(ErrorKind::CollinearFeet, Field::SupportFeet);
    // Sort indices by (x, y) with an insertion sort: at most eight items.
    let mut idx: Vec<u8, MAX_FEET> = Vec::new();
    for i in 0..feet.len() {
        let _ = idx.push(i as u8);
    }
    let pos = |i: u8| feet.get(usize::from(i)).map_or([0.0; 2], |f| f.position_m);
    for i in 1..idx.len() {
        let mut j = i;
        while j > 0 {
            let (Some(&a), Some(&b)) = (idx.get(j - 1), idx.get(j)) else {
                break;
            };
            let (pa, pb) = (pos(a), pos(b));
            if pa[0] > pb[0] || (pa[0] == pb[0] && pa[1] > pb[1]) {
                idx.swap(j - 1, j);
                j -= 1;
            } else {
                break;
            }
        }
    }
    // Lower then upper chain; a point is dropped unless it turns left by more
    // than a tolerance (so collinear feet do not make zero-length edges).
    let tol = 1e-7_f32;
    let mut hull: Vec<u8, 16> = Vec::new();
    let build = |hull: &mut Vec<u8, 16>, i: u8, floor: usize| {
        while hull.len() >= floor + 2 {
            let n = hull.len();
            let (Some(&o), Some(&a)) = (hull.get(n - 2), hull.get(n - 1)) else {
                break;
            };
            if cross2(pos(o), pos(a), pos(i)) <= tol {
                hull.pop();
            } else {
                break;
            }
        }
        let _ = hull.push(i);
    };
    for &i in &idx {
        build(&mut hull, i, 0);
    }
    let lower = hull.len();
    for &i in idx.iter().rev().skip(1) {
        build(&mut hull, i, lower - 1);
    }
    hull.pop(); // last point repeats the first
    if hull.len() < 3 {
        return Err(collinear);
    }
    // Area check: reject slivers narrower than 1 mm.
    let mut area2 = 0.0_f32;
    let mut perim = 0.0_f32;
    let mut edges: Vec<Edge, MAX_FEET> = Vec::new();
    for k in 0..hull.len() {
        let (Some(&i), Some(&j)) = (hull.get(k), hull.get((k + 1) % hull.len())) else {
            return Err(collinear);
        };
        let (a, b) = (pos(i), pos(j));
        area2 += a[0] * b[1] - b[0] * a[1];
        let av = Vec3::new(a[0], a[1], 0.0);
        let d = Vec3::new(b[0], b[1], 0.0) - av;
        perim += d.norm();
        let along = d.normalized().ok_or(collinear)?;
        let outward = Vec3::new(along.y, -along.x, 0.0);
        let _ = edges.push(Edge {
            from: i,
            to: j,
            a_m: av,
            along,
            outward,
        });
    }
    if area2 * 0.5 < MIN_FOOT_SPACING_M * perim * 0.5 {
        return Err(collinear);
    }
    Ok(edges)
}

/// Tests only: five feet at irregular places around the origin (rig frame,
/// m), with the tie-down forces `tie_down_n` (N), in order.
#[cfg(test)]
pub(crate) fn irregular_feet(tie_down_n: [f32; 5]) -> Vec<Foot, MAX_FEET> {
    [
        [0.5, 0.1],
        [0.2, 0.6],
        [-0.45, 0.3],
        [-0.3, -0.5],
        [0.35, -0.4],
    ]
    .iter()
    .zip(tie_down_n)
    .map(|(&position_m, tie_down_n)| Foot {
        position_m,
        tie_down_n,
    })
    .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Four feet on a circle of radius r stand on a square of side r·√2
    /// and the support edge is r/√2 from the centre (plane geometry).
    #[test]
    fn four_feet_on_a_circle_make_a_square() {
        let s = Support::on_circle(4, 0.5, 0.0).unwrap();
        assert_eq!(s.edges().len(), 4);
        let inset = s.inset_m(Vec3::ZERO);
        assert!((inset - 0.5 / core::f32::consts::SQRT_2).abs() < 1e-6);
        assert!(Support::on_circle(2, 0.5, 0.0).is_err());
        assert!(Support::on_circle(MAX_FEET + 1, 0.5, 0.0).is_err());
    }

    /// A pier carries its anchors' rating on every foot; a plate of 0.6 m ×
    /// 0.4 m is 0.2 m inset from its centre (the half of the short side).
    #[test]
    fn pier_and_plate() {
        let p = Support::pier(3, 0.2, 2500.0).unwrap();
        assert!(p.feet().iter().all(|f| f.tie_down_n == 2500.0));
        assert!(Support::pier(3, 0.2, -1.0).is_err());
        let plate = Support::plate([0.6, 0.4]).unwrap();
        assert!((plate.inset_m(Vec3::ZERO) - 0.2).abs() < 1e-6);
        assert!(Support::plate([0.0, 0.4]).is_err());
    }

    fn foot(x: f32, y: f32) -> Foot {
        Foot {
            position_m: [x, y],
            tie_down_n: 0.0,
        }
    }

    #[test]
    fn square_with_inner_foot_has_four_edges() {
        let s = Support::new(&[
            foot(1.0, 1.0),
            foot(-1.0, 1.0),
            foot(0.0, 0.1),
            foot(-1.0, -1.0),
            foot(1.0, -1.0),
        ])
        .unwrap();
        assert_eq!(s.edges().len(), 4);
        for e in s.edges() {
            assert!((e.inset_m(Vec3::ZERO) - 1.0).abs() < 1e-6);
        }
    }

    #[test]
    fn collinear_and_duplicate_rejected() {
        let e = Support::new(&[foot(0.0, 0.0), foot(1.0, 0.0), foot(2.0, 0.0)]).unwrap_err();
        assert_eq!(e.kind, ErrorKind::CollinearFeet);
        let e = Support::new(&[foot(0.0, 0.0), foot(1.0, 0.0), foot(1.0, 0.0005)]).unwrap_err();
        assert_eq!(e.kind, ErrorKind::DuplicateFoot);
        assert_eq!(e.index, Some(2));
        let e = Support::new(&[foot(0.0, 0.0), foot(1.0, 0.0)]).unwrap_err();
        assert_eq!(e.kind, ErrorKind::TooFew);
    }

    #[test]
    fn tripod_inradius_is_half_circumradius() {
        let s = Support::tripod(0.5, 0.3).unwrap();
        assert_eq!(s.edges().len(), 3);
        for e in s.edges() {
            assert!((e.inset_m(Vec3::ZERO) - 0.25).abs() < 1e-5);
        }
    }

    #[test]
    fn positive_moment_tips_outward() {
        let s = Support::tripod(0.5, 0.0).unwrap();
        for e in s.edges() {
            // A push along the outward normal at height tips over the edge.
            assert!(e.moment_nm(Vec3::new(0.0, 0.0, 1.0), e.outward) > 0.0);
            // Weight at the centre holds.
            assert!(e.moment_nm(Vec3::ZERO, Vec3::new(0.0, 0.0, -10.0)) < 0.0);
        }
    }

    /// What `Edge::ground_moment_nm` and `Edge::weight_moments_nm` rest on:
    /// every edge of a support starts on the ground and runs along it
    /// (`a_m.z` and `along.z` are +0, bit for bit), whatever the feet.
    #[test]
    fn support_edges_lie_in_the_ground_plane() {
        let irregular = Support::new(&irregular_feet([10.0; 5])).unwrap();
        let supports = [
            Support::tripod(0.475, 0.0).unwrap(),
            Support::tripod(0.3, 2.1).unwrap(),
            irregular.rotated(0.7).unwrap(),
            irregular,
        ];
        for s in &supports {
            for e in s.edges() {
                assert_eq!((e.a_m.z.to_bits(), e.along.z.to_bits()), (0, 0), "{e:?}");
            }
        }
    }
}
