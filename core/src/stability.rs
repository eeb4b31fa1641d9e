//! Overturning and sliding: the static stability of a placed rig under wind.
//!
//! **Tipping.** For every edge of the support polygon the moment of each force
//! about the edge line is computed (sign: positive tips the rig outward over
//! the edge, see [`Edge::moment_nm`]); each weight is taken as two forces, its
//! components normal to and along the ground plane, so that on a slope the
//! downhill pull counts as overturning. Positive moments add up to the
//! *overturning* moment, negative ones to the *stabilising* moment; tie-downs
//! on feet off the edge add their rated pull to the stabilising side. The
//! **utilisation** of an edge is overturning ÷ stabilising: 1.0 is the point of
//! tipping. The **margin** is stabilising − overturning, N·m. The critical edge
//! is the one of highest utilisation.
//!
//! Gravity moments do not depend on the wind, and wind moments scale with the
//! dynamic pressure q, so every edge's net moment is G + q·K: the tipping
//! pressure, and with it the **tip wind speed**, is found in closed form.
//!
//! **Sliding.** The force along the ground (weight component from tilt plus
//! wind) against the static friction of the normal force, μ·N. Tie-downs are
//! not counted against sliding.
//!
//! The model is static and quasi-steady: it uses the wind speed given (use a
//! gust), rigid parts and no dynamic amplification. It is an estimate.

use crate::error::{Error, ErrorKind, Field};
use crate::math::{self, Vec3, STANDARD_GRAVITY_MPS2, TAU};
use crate::rig::{Conditions, Placement, Rig, Stage};
use crate::support::{Edge, MAX_FEET};
use heapless::Vec;

/// Utilisations are capped at this value (reached when nothing stabilises).
pub const UTILISATION_CAP: f32 = 1.0e6;
/// Directions in the coarse scan of a full turn (every 5°) before refinement.
pub const DIRECTION_STEPS: usize = 72;

/// Moments about one edge of the support polygon.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize))]
pub struct EdgeLoad {
    /// Index of the foot the edge starts at (counter-clockwise order).
    pub from_foot: u8,
    /// Index of the foot the edge ends at.
    pub to_foot: u8,
    /// Azimuth the rig would fall toward over this edge, radians from north
    /// clockwise.
    pub outward_azimuth_rad: f32,
    /// Sum of moments tipping the rig over the edge, N·m, ≥ 0.
    pub overturning_nm: f32,
    /// Sum of moments holding it, N·m, ≥ 0.
    pub stabilising_nm: f32,
    /// overturning ÷ stabilising (1.0 tips), capped at [`UTILISATION_CAP`].
    pub utilisation: f32,
    /// stabilising − overturning, N·m (negative: tipping).
    pub margin_nm: f32,
}

/// Sliding check.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize))]
pub struct Sliding {
    /// Force along the ground plane, N.
    pub tangential_n: f32,
    /// Force pressing the feet into the ground, N (negative: lift-off).
    pub normal_n: f32,
    /// Static friction capacity μ·N, N (0 when lifted).
    pub capacity_n: f32,
    /// tangential ÷ capacity (1.0 slides), capped at [`UTILISATION_CAP`].
    pub utilisation: f32,
}

/// The stability of a rig in given conditions.
/// # Examples
/// An invented rig (hidden lines build it) in a 10 m/s wind from the west:
/// ```
/// use standfast::math::deg_to_rad;
/// use standfast::{Conditions, Pose};
/// # use standfast::rig::Stage;
/// # use standfast::{BodySpec, MountGeometry, Rig, RigSpec, Support};
/// # let spec = RigSpec::new(
/// #     &Support::tripod(0.45, 0.0)?,
/// #     MountGeometry::alt_azimuth(deg_to_rad(47.0), [0.0, 0.0, 1.25]),
/// #     0.3,
/// # )
/// # .with_body(BodySpec::optical_tube(5.0, 0.12, 0.7, [0.15, 0.1, 0.0]))?
/// # .with_body(BodySpec::point(Stage::Ground, 4.0, [0.0, 0.0, 1.1]))?;
/// # let rig = Rig::new(&spec)?;
/// let pose = Pose::Axes { primary_rad: 0.0, secondary_rad: deg_to_rad(60.0) };
/// let c = Conditions { wind_speed_mps: 10.0, wind_from_rad: deg_to_rad(270.0), ..Conditions::calm(pose) };
/// let f = rig.stability_figures(&c)?;
/// // Utilisation 1.0 tips; the tip wind from the same direction is above 10 m/s
/// // exactly when the critical edge is below 1.
/// assert!(f.critical.utilisation < 1.0);
/// assert!(f.tip_wind_mps.is_some_and(|v| v > 10.0));
/// assert!(f.sliding.utilisation >= 0.0);
/// # Ok::<(), standfast::Error>(())
/// ```
#[derive(Clone, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize))]
pub struct StabilityFigures {
    /// Every edge, counter-clockwise.
    pub edges: Vec<EdgeLoad, MAX_FEET>,
    /// The edge of highest utilisation (the first in `edges` on a tie).
    pub critical: EdgeLoad,
    /// The sliding check.
    pub sliding: Sliding,
    /// Dynamic pressure of the wind, Pa.
    pub dynamic_pressure_pa: f32,
    /// Magnitude of the total wind force, N.
    pub wind_force_n: f32,
    /// Total weight, N.
    pub weight_n: f32,
    /// Centre of gravity of the rig, rig frame, metres.
    pub centre_of_gravity_m: Vec3,
    /// Wind speed from the same direction that would tip the rig, m/s; `None`
    /// if wind from this direction cannot tip it; 0 if it tips without wind.
    pub tip_wind_mps: Option<f32>,
    /// Wind speed from the same direction that would slide the rig, m/s;
    /// `None` if it cannot.
    pub slide_wind_mps: Option<f32>,
}

/// Gravity and wind moment terms of one edge: net moment = gravity + q·wind.
#[derive(Clone, Copy, Debug, Default, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub(crate) struct EdgeTerms {
    /// Overturning moment of the weights, N·m.
    pub gravity_over_nm: f32,
    /// Stabilising moment of the weights, N·m.
    pub gravity_stab_nm: f32,
    /// Overturning wind moment per pascal of dynamic pressure, N·m/Pa.
    pub wind_over_nm_per_pa: f32,
    /// Stabilising wind moment per pascal, N·m/Pa.
    pub wind_stab_nm_per_pa: f32,
    /// Stabilising moment of the tie-downs of feet off this edge, N·m.
    pub tie_stab_nm: f32,
}

impl EdgeTerms {
    /// Overturning and stabilising moments at dynamic pressure `q_pa`.
    #[must_use]
    pub fn at(&self, q_pa: f32) -> (f32, f32) {
        (
            self.gravity_over_nm + q_pa * self.wind_over_nm_per_pa,
            self.gravity_stab_nm + q_pa * self.wind_stab_nm_per_pa + self.tie_stab_nm,
        )
    }

    /// Dynamic pressure at which the net moment reaches zero, Pa: 0 if already
    /// tipping without wind, `None` if wind cannot tip the rig over this edge.
    #[must_use]
    pub fn tip_pressure_pa(&self) -> Option<f32> {
        let base = self.gravity_over_nm - self.gravity_stab_nm - self.tie_stab_nm;
        let k = self.wind_over_nm_per_pa - self.wind_stab_nm_per_pa;
        if base >= 0.0 {
            Some(0.0)
        } else if k > 0.0 {
            Some(-base / k)
        } else {
            None
        }
    }
}

/// Overturning ÷ stabilising, in [0, [`UTILISATION_CAP`]]; NaN if either is.
///
/// With nothing stabilising (`stab` ≤ 0) the result is the cap when anything
/// overturns, and 1.0 when nothing does either: neutral equilibrium, on the
/// point of moving, never read as safe.
#[must_use]
pub(crate) fn ratio(over: f32, stab: f32) -> f32 {
    if stab > 0.0 || stab.is_nan() {
        math::clamp(over / stab, 0.0, UTILISATION_CAP)
    } else if over > 0.0 {
        UTILISATION_CAP
    } else {
        1.0
    }
}

/// Adds a moment to the overturning side when positive, else takes it off
/// the stabilising side. The sides start at +0 and only grow, so a zero
/// moment of either sign leaves both as they are (`+0 − ±0` is +0): the
/// sums do not depend on the sign of a zero moment.
fn split(m: f32, over: &mut f32, stab: &mut f32) {
    if m > 0.0 {
        *over += m;
    } else {
        *stab -= m;
    }
}

/// Sums of forces and moments used for sliding and foot reactions.
#[derive(Clone, Copy, Debug, Default, PartialEq)]
struct Resultant {
    gravity_n: Vec3,
    gravity_moment_nm: Vec3,
    wind_n_per_pa: Vec3,
    wind_moment_nm_per_pa: Vec3,
}

/// Wind-direction-specific loads on a placed rig.
#[derive(Clone, Debug)]
pub(crate) struct Loads {
    terms: Vec<EdgeTerms, MAX_FEET>,
    resultant: Resultant,
    /// Wind torque per pascal about the primary and secondary axes, N·m/Pa
    /// (as [`crate::torque::wind_terms_nm_per_pa`]); zero unless asked for.
    axis_wind_nm_per_pa: [f32; 2],
    /// Gravity torque about the primary and secondary axes, N·m (as
    /// [`crate::torque::gravity_torques_nm`]); zero unless asked for.
    axis_gravity_nm: [f32; 2],
}

impl Loads {
    /// Computes the edge terms and resultants for a wind from `from_rad`.
    #[must_use]
    pub fn new(placement: &Placement<'_>, from_rad: f32) -> Loads {
        Loads::build(placement, from_rad, false)
    }

    /// [`Loads::new`], and the wind torque per pascal and the gravity torque
    /// about both mount axes ([`Loads::axis_wind_nm_per_pa`],
    /// [`Loads::axis_gravity_nm`]) from the same placed parts and wind
    /// loads: the same values as [`crate::torque::wind_terms_nm_per_pa`] and
    /// [`crate::torque::gravity_torques_nm`] give, with one computation of
    /// every part's position, weight and drag area instead of two.
    #[must_use]
    pub fn with_axes(placement: &Placement<'_>, from_rad: f32) -> Loads {
        Loads::build(placement, from_rad, true)
    }

    /// Wind torque per pascal about `[primary, secondary]`, N·m/Pa, signed
    /// about each axis unit vector (0 from [`Loads::new`]).
    #[must_use]
    pub fn axis_wind_nm_per_pa(&self) -> [f32; 2] {
        self.axis_wind_nm_per_pa
    }

    /// Gravity torque about `[primary, secondary]`, N·m, signed about each
    /// axis unit vector (0 from [`Loads::new`]).
    #[must_use]
    pub fn axis_gravity_nm(&self) -> [f32; 2] {
        self.axis_gravity_nm
    }

    /// [`Loads::new`] (`axes` false) or [`Loads::with_axes`] (`axes` true).
    pub(crate) fn build(placement: &Placement<'_>, from_rad: f32, axes: bool) -> Loads {
        let support = placement.rig().support();
        let mut terms: Vec<EdgeTerms, MAX_FEET> = Vec::new();
        let mut r = Resultant::default();
        let frames = placement.frames();
        let (origin, k, s) = (
            frames.origin_m,
            frames.primary_axis(),
            frames.secondary_axis(),
        );
        let (mut axis_wind, mut axis_gravity) = ([0.0_f32; 2], [0.0_f32; 2]);
        let edges = support.edges();
        // Every edge's accumulators, with the tie-downs of the feet off it
        // (the edges are at most `MAX_FEET`, the capacity, so no push fails).
        for e in edges {
            let mut t = EdgeTerms::default();
            for (i, foot) in support.feet().iter().enumerate() {
                if i == usize::from(e.from) || i == usize::from(e.to) || foot.tie_down_n <= 0.0 {
                    continue;
                }
                let at = Vec3::new(foot.position_m[0], foot.position_m[1], 0.0);
                let m = e.moment_nm(at, Vec3::new(0.0, 0.0, -foot.tie_down_n));
                if m < 0.0 {
                    t.tie_stab_nm -= m;
                }
            }
            let _ = terms.push(t);
        }
        // One pass over the placed parts, then one over the wind loads: each
        // edge's sums take the parts in the same order as an edge-by-edge
        // pass would, so every sum has the same bits.
        for p in placement.parts() {
            r.gravity_n += p.weight_n;
            r.gravity_moment_nm += p.cg_m.cross(p.weight_n);
            // The same sums, in the same order, as `gravity_torques_nm`.
            if axes && p.part.stage != Stage::Ground {
                let m = (p.cg_m - origin).cross(p.weight_n);
                let [tk, ts] = &mut axis_gravity;
                *tk += m.dot(k);
                if p.part.stage == Stage::Secondary {
                    *ts += m.dot(s);
                }
            }
            // The weight is split into its parts normal to and along the
            // ground, so a slope shows as an overturning moment W·sinθ·h
            // against a stabilising W·cosθ·d, as in slope checks of mobile
            // cranes and platforms: the moments of `Vec3::Z * w.z` and of
            // `w − Vec3::Z * w.z`, normal first, without the products with
            // their zero components (`Edge::weight_moments_nm`).
            for (e, t) in edges.iter().zip(terms.iter_mut()) {
                let (normal, along_ground) = e.weight_moments_nm(p.cg_m, p.weight_n);
                for m in [normal, along_ground] {
                    split(m, &mut t.gravity_over_nm, &mut t.gravity_stab_nm);
                }
            }
        }
        for (part, cp, f) in placement.wind_loads(from_rad) {
            r.wind_n_per_pa += f;
            r.wind_moment_nm_per_pa += cp.cross(f);
            // The same sums, in the same order, as `wind_terms_nm_per_pa`.
            if axes && part.stage != Stage::Ground {
                let m = (cp - origin).cross(f);
                let [tk, ts] = &mut axis_wind;
                *tk += m.dot(k);
                if part.stage == Stage::Secondary {
                    *ts += m.dot(s);
                }
            }
            for (e, t) in edges.iter().zip(terms.iter_mut()) {
                split(
                    e.ground_moment_nm(cp, f),
                    &mut t.wind_over_nm_per_pa,
                    &mut t.wind_stab_nm_per_pa,
                );
            }
        }
        Loads {
            terms,
            resultant: r,
            axis_wind_nm_per_pa: axis_wind,
            axis_gravity_nm: axis_gravity,
        }
    }

    /// The terms of each edge, in the order of [`crate::support::Support::edges`].
    #[must_use]
    pub fn terms(&self) -> &[EdgeTerms] {
        &self.terms
    }

    /// Lowest dynamic pressure that tips the rig over any edge, Pa; `None`
    /// if wind from this direction cannot tip it.
    #[must_use]
    pub fn tip_pressure_pa(&self) -> Option<f32> {
        self.terms
            .iter()
            .filter_map(EdgeTerms::tip_pressure_pa)
            .reduce(f32::min)
    }

    /// Highest edge utilisation at dynamic pressure `q_pa` (0 with no edge;
    /// NaN if any edge's is: a figure that cannot be computed is never
    /// passed over).
    #[must_use]
    pub fn max_utilisation(&self, q_pa: f32) -> f32 {
        let mut best = 0.0_f32;
        for t in &self.terms {
            let (o, s) = t.at(q_pa);
            let u = ratio(o, s);
            if u.is_nan() {
                return f32::NAN;
            }
            best = best.max(u);
        }
        best
    }

    /// Utilisation of the critical edge at dynamic pressure `q_pa`: the
    /// `critical.utilisation` of [`Rig::stability_figures`] (the first edge
    /// of highest utilisation), without the other figures; `None` with no
    /// edge.
    #[must_use]
    pub fn critical_utilisation(&self, q_pa: f32) -> Option<f32> {
        self.terms.iter().fold(None, |acc: Option<f32>, t| {
            let (o, s) = t.at(q_pa);
            let u = ratio(o, s);
            match acc {
                Some(a) if a >= u => Some(a),
                _ => Some(u),
            }
        })
    }

    /// Sliding check at dynamic pressure `q_pa` with friction coefficient `mu`.
    #[must_use]
    pub fn sliding(&self, q_pa: f32, mu: f32) -> Sliding {
        let f = self.resultant.gravity_n + self.resultant.wind_n_per_pa * q_pa;
        let normal = -f.z;
        let tangential = math::hypot(f.x, f.y);
        let capacity = if normal > 0.0 { mu * normal } else { 0.0 };
        Sliding {
            tangential_n: tangential,
            normal_n: normal,
            capacity_n: capacity,
            utilisation: ratio(tangential, capacity),
        }
    }

    /// Lowest dynamic pressure at which the rig slides, Pa; `None` if it cannot
    /// (the wind presses it down, or friction grows faster than the push).
    #[must_use]
    pub fn slide_pressure_pa(&self, mu: f32) -> Option<f32> {
        if self.sliding(0.0, mu).utilisation >= 1.0 {
            return Some(0.0);
        }
        // |G + qW|_t = μ·(−(G + qW)_z): a quadratic in q. Bisection on
        // the monotone part is simpler and robust; bracket by doubling from
        // 100 Pa up to 100·2¹⁶ Pa ≈ 6.6·10⁶ Pa (a wind of about 3,300 m/s in
        // sea-level air, far beyond any the model accepts).
        let mut lo = 0.0_f32;
        let mut hi = 100.0_f32;
        let mut found = false;
        for _ in 0..17 {
            if self.sliding(hi, mu).utilisation >= 1.0 {
                found = true;
                break;
            }
            lo = hi;
            hi *= 2.0;
        }
        if !found {
            return None;
        }
        for _ in 0..40 {
            let mid = 0.5 * (lo + hi);
            if self.sliding(mid, mu).utilisation >= 1.0 {
                hi = mid;
            } else {
                lo = mid;
            }
        }
        Some(hi)
    }

    /// Vertical (ground-normal) reaction on each foot of a three-foot support,
    /// newtons, positive pressing down, at dynamic pressure `q_pa`; `None` for
    /// other supports (statically indeterminate). A negative value means that
    /// foot would lift: the rig tips about the opposite edge.
    #[must_use]
    pub fn foot_reactions_n(&self, placement: &Placement<'_>, q_pa: f32) -> Option<[f32; 3]> {
        let s = placement.rig().support();
        let (p0, p1, p2) = (s.foot_point_m(0)?, s.foot_point_m(1)?, s.foot_point_m(2)?);
        if s.feet().len() != 3 {
            return None;
        }
        let r = &self.resultant;
        let f = r.gravity_n + r.wind_n_per_pa * q_pa;
        let m = r.gravity_moment_nm + r.wind_moment_nm_per_pa * q_pa;
        // Σ R_i = −F_z ; Σ y_i R_i = −M_x ; Σ −x_i R_i = −M_y  (R_i along +z).
        let a = [[1.0, 1.0, 1.0], [p0.y, p1.y, p2.y], [-p0.x, -p1.x, -p2.x]];
        let b = [-f.z, -m.x, -m.y];
        solve3(a, b)
    }
}

fn det3(a: [[f32; 3]; 3]) -> f32 {
    let [[a00, a01, a02], [a10, a11, a12], [a20, a21, a22]] = a;
    a00 * (a11 * a22 - a12 * a21) - a01 * (a10 * a22 - a12 * a20) + a02 * (a10 * a21 - a11 * a20)
}

fn solve3(a: [[f32; 3]; 3], b: [f32; 3]) -> Option<[f32; 3]> {
    let d = det3(a);
    if d.abs() < 1e-9 {
        return None;
    }
    let mut out = [0.0; 3];
    for (k, o) in out.iter_mut().enumerate() {
        let mut m = a;
        for (row, bv) in m.iter_mut().zip(b) {
            if let Some(c) = row.get_mut(k) {
                *c = bv;
            }
        }
        *o = det3(m) / d;
    }
    Some(out)
}

fn edge_load(e: &Edge, t: &EdgeTerms, q_pa: f32) -> EdgeLoad {
    let (o, s) = t.at(q_pa);
    EdgeLoad {
        from_foot: e.from,
        to_foot: e.to,
        outward_azimuth_rad: e.outward_azimuth_rad(),
        overturning_nm: o,
        stabilising_nm: s,
        utilisation: ratio(o, s),
        margin_nm: s - o,
    }
}

/// Scans a full turn of directions for the largest value of `f` (coarse steps
/// of 5°, then golden-section refinement around the best), returning the value
/// and the direction in radians [0, 2π); on a tie the first direction
/// scanned from north.
pub(crate) fn scan_directions(mut f: impl FnMut(f32) -> f32) -> (f32, f32) {
    let step = TAU / DIRECTION_STEPS as f32;
    let mut best = (f32::NEG_INFINITY, 0.0_f32);
    for k in 0..DIRECTION_STEPS {
        let d = k as f32 * step;
        let v = f(d);
        if v > best.0 {
            best = (v, d);
        }
    }
    let (mut a, mut b) = (best.1 - step, best.1 + step);
    let r = 0.618_034_f32;
    let mut c = b - r * (b - a);
    let mut d = a + r * (b - a);
    let (mut fc, mut fd) = (f(c), f(d));
    for _ in 0..24 {
        if fc > fd {
            b = d;
            d = c;
            fd = fc;
            c = b - r * (b - a);
            fc = f(c);
        } else {
            a = c;
            c = d;
            fc = fd;
            d = a + r * (b - a);
            fd = f(d);
        }
    }
    let (v, x) = if fc > fd { (fc, c) } else { (fd, d) };
    if v > best.0 {
        (v, math::wrap_tau(x))
    } else {
        (best.0, math::wrap_tau(best.1))
    }
}

/// The highest edge utilisation over all wind directions at dynamic
/// pressure `q_pa` for a placed rig, and the direction it comes from
/// ([`Rig::worst_direction_utilisation`]).
pub(crate) fn worst_direction_in(placement: &Placement<'_>, q_pa: f32) -> (f32, f32) {
    scan_directions(|d| Loads::new(placement, d).max_utilisation(q_pa))
}

/// The lowest tip wind speed over all directions.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize))]
pub struct WorstWind {
    /// Lowest wind speed that tips the rig, m/s (`None`: no wind can).
    pub tip_wind_mps: Option<f32>,
    /// The direction it blows from, radians from north clockwise.
    pub from_rad: f32,
}

/// How much more ground tilt, with no wind, would tip the rig.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize))]
pub struct TiltMargin {
    /// Extra tilt, radians (0 when already tipping). Tie-downs not counted.
    pub extra_rad: f32,
    /// Downhill azimuth of that extra tilt in the rig frame, radians.
    pub downhill_azimuth_rad: f32,
    /// Index of the edge it tips over.
    pub edge: u8,
}

/// Ballast needed to meet a target utilisation ([`Rig::ballast_needed`]).
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize))]
pub struct BallastNeed {
    /// Ballast mass, kg (0: none needed).
    pub mass_kg: f32,
    /// Wind direction that governs, radians from north clockwise.
    pub worst_from_rad: f32,
}

/// Tie-down pull needed to meet a target utilisation
/// ([`Rig::tie_down_needed`]).
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize))]
pub struct TieDownNeed {
    /// Rated pull of the tie-down on every foot, N (0: none needed).
    pub pull_per_foot_n: f32,
    /// Wind direction that governs, radians from north clockwise.
    pub worst_from_rad: f32,
}

impl Rig {
    /// Stability in the given conditions.
    ///
    /// # Errors
    /// Invalid conditions (non-finite or out-of-range wind, tilt, pose, air).
    pub fn stability_figures(&self, c: &Conditions) -> Result<StabilityFigures, Error> {
        c.validate()?;
        let placement = self.place(c.pose, c.tilt, c.cover_fitted)?;
        let loads = Loads::new(&placement, c.wind_from_rad);
        self.figures(c, &placement, &loads)
    }

    /// [`Rig::stability_figures`] for `c`, and the critical-edge utilisation at a second
    /// wind speed `other_speed_mps` (m/s, same direction, pose, tilt, cover
    /// and air): the same value as `assess` at that speed gives in
    /// `critical.utilisation`. The placement and wind loads, which do not
    /// depend on the speed, are computed once.
    ///
    /// The second speed may exceed [`crate::rig::MAX_WIND_SPEED_MPS`] (a
    /// predicted gust with allowances): every edge's net moment is
    /// `G + q·K` at any pressure, so the figure stays defined and grows with
    /// the speed. `None` only for a negative or non-finite second speed.
    ///
    /// # Errors
    /// As [`Rig::stability_figures`] for `c`.
    pub fn stability_figures_with_utilisation_at(
        &self,
        c: &Conditions,
        other_speed_mps: f32,
    ) -> Result<(StabilityFigures, Option<f32>), Error> {
        c.validate()?;
        let placement = self.place(c.pose, c.tilt, c.cover_fitted)?;
        let loads = Loads::new(&placement, c.wind_from_rad);
        let a = self.figures(c, &placement, &loads)?;
        let u = if other_speed_mps.is_finite() && other_speed_mps >= 0.0 {
            let q = c.air.dynamic_pressure_pa(other_speed_mps);
            self.edge_loads(&loads, q).1.map(|e| e.utilisation)
        } else {
            None
        };
        Ok((a, u))
    }

    /// Every edge's load at dynamic pressure `q_pa`, and the critical one
    /// (the first of highest utilisation; `None` without edges).
    fn edge_loads(&self, loads: &Loads, q_pa: f32) -> (Vec<EdgeLoad, MAX_FEET>, Option<EdgeLoad>) {
        let mut edges: Vec<EdgeLoad, MAX_FEET> = Vec::new();
        for (e, t) in self.support().edges().iter().zip(loads.terms()) {
            let _ = edges.push(edge_load(e, t, q_pa));
        }
        let critical = edges
            .iter()
            .copied()
            .fold(None, |acc: Option<EdgeLoad>, e| match acc {
                Some(a) if a.utilisation >= e.utilisation => Some(a),
                _ => Some(e),
            });
        (edges, critical)
    }

    /// The assessment of `c` from its placement and loads.
    fn figures(
        &self,
        c: &Conditions,
        placement: &Placement<'_>,
        loads: &Loads,
    ) -> Result<StabilityFigures, Error> {
        let q = c.air.dynamic_pressure_pa(c.wind_speed_mps);
        let (edges, critical) = self.edge_loads(loads, q);
        let critical = critical.ok_or(Error::new(ErrorKind::TooFew, Field::SupportFeet))?;
        let r = loads.resultant;
        Ok(StabilityFigures {
            critical,
            edges,
            sliding: loads.sliding(q, self.friction_coefficient()),
            dynamic_pressure_pa: q,
            wind_force_n: (r.wind_n_per_pa * q).norm(),
            weight_n: r.gravity_n.norm(),
            centre_of_gravity_m: placement.centre_of_gravity_m(),
            tip_wind_mps: loads
                .tip_pressure_pa()
                .map(|qt| c.air.speed_for_pressure_mps(qt)),
            slide_wind_mps: loads
                .slide_pressure_pa(self.friction_coefficient())
                .map(|qs| c.air.speed_for_pressure_mps(qs)),
        })
    }

    /// The lowest tip wind speed over all wind directions for a pose, tilt and
    /// cover state, and the direction it comes from.
    ///
    /// # Errors
    /// Invalid pose or tilt.
    pub fn worst_wind(&self, c: &Conditions) -> Result<WorstWind, Error> {
        c.validate()?;
        let placement = self.place(c.pose, c.tilt, c.cover_fitted)?;
        let (neg_q, from) = scan_directions(|d| {
            Loads::new(&placement, d)
                .tip_pressure_pa()
                .map_or(-f32::MAX, |q| -q)
        });
        let tip = if neg_q <= -f32::MAX {
            None
        } else {
            Some(c.air.speed_for_pressure_mps(-neg_q))
        };
        Ok(WorstWind {
            tip_wind_mps: tip,
            from_rad: from,
        })
    }

    /// The highest edge utilisation over all wind directions at the wind speed
    /// of `c`, and the direction it comes from (for wind of unknown or
    /// variable direction).
    ///
    /// # Errors
    /// Invalid conditions.
    pub fn worst_direction_utilisation(&self, c: &Conditions) -> Result<(f32, f32), Error> {
        c.validate()?;
        let placement = self.place(c.pose, c.tilt, c.cover_fitted)?;
        let q = c.air.dynamic_pressure_pa(c.wind_speed_mps);
        Ok(worst_direction_in(&placement, q))
    }

    /// Extra ground tilt that would tip the rig with no wind, and its downhill
    /// direction. The centre of gravity of everything present must cross an
    /// edge: for each edge, the angle about the edge line between the present
    /// up direction and the line from the edge to the centre of gravity.
    ///
    /// # Errors
    /// Invalid pose or tilt.
    pub fn tilt_margin(&self, c: &Conditions) -> Result<TiltMargin, Error> {
        c.validate()?;
        let placement = self.place(c.pose, c.tilt, c.cover_fitted)?;
        self.tilt_margin_in(&placement, placement.centre_of_gravity_m())
    }

    /// [`Rig::tilt_margin`] of a placement whose centre of gravity `cg` (rig
    /// frame, metres: [`Placement::centre_of_gravity_m`], which depends on
    /// the pose and cover only) is already known.
    ///
    /// # Errors
    /// A support without edges.
    pub(crate) fn tilt_margin_in(
        &self,
        placement: &Placement<'_>,
        cg: Vec3,
    ) -> Result<TiltMargin, Error> {
        // The downhill azimuth is worked out for the lowest edge only.
        self.lowest_tilt_edge(placement, cg)
            .map(|(extra, i, e)| TiltMargin {
                extra_rad: extra,
                downhill_azimuth_rad: e.outward_azimuth_rad(),
                edge: i as u8,
            })
            .ok_or(Error::new(ErrorKind::TooFew, Field::SupportFeet))
    }

    /// The `extra_rad` of [`Rig::tilt_margin_in`] alone (the same bits),
    /// without the downhill azimuth: for the guard, which shows the extra
    /// tilt only.
    ///
    /// # Errors
    /// A support without edges.
    pub(crate) fn extra_tilt_in(&self, placement: &Placement<'_>, cg: Vec3) -> Result<f32, Error> {
        self.lowest_tilt_edge(placement, cg)
            .map(|(extra, _, _)| extra)
            .ok_or(Error::new(ErrorKind::TooFew, Field::SupportFeet))
    }

    /// The lowest extra tilt over the support's edges ([`Rig::tilt_margin`])
    /// with its edge's index and edge (the first on a tie); `None` without
    /// edges.
    fn lowest_tilt_edge(&self, placement: &Placement<'_>, cg: Vec3) -> Option<(f32, usize, &Edge)> {
        let up = -placement.gravity_unit();
        let mut best: Option<(f32, usize, &Edge)> = None;
        for (i, e) in self.support().edges().iter().enumerate() {
            let r = (cg - e.a_m).reject(e.along);
            let u = up.reject(e.along);
            // Signed angle from u to r about the edge; positive means the CoG
            // is on the inner side (stable).
            let s = u.cross(r).dot(e.along);
            let angle = math::atan2(-s, u.dot(r));
            let extra = angle.max(0.0);
            if best.is_none_or(|(b, _, _)| extra < b) {
                best = Some((extra, i, e));
            }
        }
        best
    }

    /// Ballast mass at `position_m` (rig frame) needed to keep every edge's
    /// utilisation at or below `target` for a wind of `design_speed_mps` from
    /// the worst direction, in the pose, tilt, cover state and air of `c`
    /// (its wind speed and direction are ignored).
    ///
    /// # Errors
    /// Invalid conditions or target (0.1 to 1.0); [`ErrorKind::Unreachable`]
    /// when the position lies outside the support polygon.
    pub fn ballast_needed(
        &self,
        c: &Conditions,
        design_speed_mps: f32,
        target: f32,
        position_m: Vec3,
    ) -> Result<BallastNeed, Error> {
        c.validate()?;
        Error::check(Field::DesignSpeedMps, design_speed_mps, 0.0, 100.0)?;
        Error::check(Field::TargetUtilisation, target, 0.1, 1.0)?;
        Error::check_vec(Field::BallastPositionM, position_m, -5.0, 5.0)?;
        if self
            .support()
            .inset_m(Vec3::new(position_m.x, position_m.y, 0.0))
            <= 0.0
        {
            let mut e = Error::new(ErrorKind::Unreachable, Field::BallastPositionM);
            e.value = position_m.x;
            return Err(e);
        }
        let placement = self.place(c.pose, c.tilt, c.cover_fitted)?;
        let q = c.air.dynamic_pressure_pa(design_speed_mps);
        let g = placement.gravity_unit() * STANDARD_GRAVITY_MPS2;
        let edges = self.support().edges();
        let (mass, from) = scan_directions(|d| {
            let loads = Loads::new(&placement, d);
            let mut need = 0.0_f32;
            for (e, t) in edges.iter().zip(loads.terms()) {
                let (o, s) = t.at(q);
                let per_kg = -e.moment_nm(position_m, g);
                if o > target * s {
                    // Ballast that does not steady an edge over its target
                    // (on a slope, placed high) cannot meet the target.
                    need = if per_kg > 0.0 {
                        need.max((o - target * s) / (target * per_kg))
                    } else {
                        f32::INFINITY
                    };
                }
            }
            need
        });
        if !mass.is_finite() {
            let mut e = Error::new(ErrorKind::Unreachable, Field::BallastPositionM);
            e.value = position_m.z;
            return Err(e);
        }
        Ok(BallastNeed {
            mass_kg: mass,
            worst_from_rad: from,
        })
    }

    /// Tie-down pull per foot, the same on every foot, needed to keep every
    /// edge's utilisation at or below `target` for a wind of
    /// `design_speed_mps` from the worst direction; present tie-downs are
    /// replaced, not added to.
    ///
    /// # Errors
    /// Invalid conditions or target.
    pub fn tie_down_needed(
        &self,
        c: &Conditions,
        design_speed_mps: f32,
        target: f32,
    ) -> Result<TieDownNeed, Error> {
        c.validate()?;
        Error::check(Field::DesignSpeedMps, design_speed_mps, 0.0, 100.0)?;
        Error::check(Field::TargetUtilisation, target, 0.1, 1.0)?;
        let bare = self.with_tie_downs(0.0)?;
        let placement = bare.place(c.pose, c.tilt, c.cover_fitted)?;
        let q = c.air.dynamic_pressure_pa(design_speed_mps);
        let support = bare.support();
        let (pull, from) = scan_directions(|d| {
            let loads = Loads::new(&placement, d);
            let mut need = 0.0_f32;
            for (e, t) in support.edges().iter().zip(loads.terms()) {
                let (o, s) = t.at(q);
                let arm: f32 = (0..support.feet().len())
                    .filter(|&i| i != usize::from(e.from) && i != usize::from(e.to))
                    .filter_map(|i| support.foot_point_m(i))
                    .map(|p| e.inset_m(p).max(0.0))
                    .sum();
                if o > target * s && arm > 0.0 {
                    need = need.max((o - target * s) / (target * arm));
                }
            }
            need
        });
        Ok(TieDownNeed {
            pull_per_foot_n: pull,
            worst_from_rad: from,
        })
    }

    /// Vertical reaction on each foot of a three-foot support in conditions
    /// `c`, newtons (positive presses down); `None` for other supports.
    ///
    /// # Errors
    /// Invalid conditions.
    pub fn foot_reactions_n(&self, c: &Conditions) -> Result<Option<[f32; 3]>, Error> {
        c.validate()?;
        let placement = self.place(c.pose, c.tilt, c.cover_fitted)?;
        let loads = Loads::new(&placement, c.wind_from_rad);
        Ok(loads.foot_reactions_n(&placement, c.air.dynamic_pressure_pa(c.wind_speed_mps)))
    }
}

#[cfg(test)]
mod tests {
    //! The definitions of the edge terms and the ratio (no outside source:
    //! they are this module's own conventions, documented above).
    use super::*;
    use crate::frame::Tilt;
    use crate::mount::Pose;

    const TERMS: EdgeTerms = EdgeTerms {
        gravity_over_nm: 1.0,
        gravity_stab_nm: 10.0,
        wind_over_nm_per_pa: 0.5,
        wind_stab_nm_per_pa: 0.25,
        tie_stab_nm: 3.0,
    };

    #[test]
    fn edge_moments_add_wind_and_tie_downs_on_their_sides() {
        assert_eq!(TERMS.at(0.0), (1.0, 13.0));
        assert_eq!(TERMS.at(4.0), (3.0, 14.0));
    }

    #[test]
    fn tip_pressure_nets_wind_against_gravity_and_ties() {
        // base = 1 − 10 − 3 = −12 N·m; k = 0.5 − 0.25 = 0.25 N·m/Pa.
        assert_eq!(TERMS.tip_pressure_pa(), Some(48.0));
        // Wind that steadies as much as it overturns cannot tip.
        let even = EdgeTerms {
            wind_stab_nm_per_pa: 0.5,
            ..TERMS
        };
        assert_eq!(even.tip_pressure_pa(), None);
        // Balanced on the edge: tipping already, whatever the wind does.
        let balanced = EdgeTerms {
            gravity_over_nm: 13.0,
            wind_stab_nm_per_pa: 0.5,
            ..TERMS
        };
        assert_eq!(balanced.tip_pressure_pa(), Some(0.0));
        // Just inside the edge, a steadying wind cannot tip it.
        let inside = EdgeTerms {
            gravity_over_nm: 12.9,
            ..balanced
        };
        assert_eq!(inside.tip_pressure_pa(), None);
    }

    #[test]
    fn ratio_is_capped_and_never_reads_nothing_as_safe() {
        assert_eq!(ratio(1.0, 4.0), 0.25);
        assert_eq!(ratio(0.0, 4.0), 0.0);
        assert_eq!(ratio(3.0e6, 1.0), UTILISATION_CAP);
        assert_eq!(ratio(1.0, 1.0e-30), UTILISATION_CAP);
        assert_eq!(ratio(1.0, 0.0), UTILISATION_CAP);
        assert_eq!(ratio(1.0, -2.0), UTILISATION_CAP);
        assert_eq!(ratio(0.0, 0.0), 1.0);
        assert!(ratio(f32::NAN, 1.0).is_nan());
        assert!(ratio(1.0, f32::NAN).is_nan());
    }

    /// Angular distance between two directions, radians, in [0, π].
    fn apart(a: f32, b: f32) -> f32 {
        let d = math::wrap_tau(a - b);
        d.min(TAU - d)
    }

    #[test]
    fn the_scan_finds_a_narrow_peak_between_coarse_steps() {
        // A narrow peak (height 1, half-width 0.1 rad) at 200.3°, between
        // the 5° steps, and a broad lower one (0.5) at 40°.
        let peak = 200.3_f32.to_radians();
        let broad = 40.0_f32.to_radians();
        let f = |d: f32| {
            let n = 1.0 - (apart(d, peak) / 0.1) * (apart(d, peak) / 0.1);
            let b = 0.5 - 0.1 * apart(d, broad) * apart(d, broad);
            n.max(b)
        };
        let (v, at) = scan_directions(f);
        assert!(apart(at, peak) < 1e-3, "found {}°", at.to_degrees());
        assert!(v > 1.0 - 1e-4, "{v}");
    }

    #[test]
    fn the_scan_finds_a_narrow_peak_wherever_it_lies() {
        // A peak of half-width 0.05 rad (2.9°) at every whole degree, beside
        // a low broad one: the 5° steps always land within 2.5° of it (value
        // above 0.24, over the broad 0.1), so the scan must find it each
        // time, to 0.06° after refinement.
        for k in 0..360 {
            let peak = (k as f32 + 0.5).to_radians();
            let f = |d: f32| {
                let x = apart(d, peak) / 0.05;
                (1.0 - x * x).max(0.1 - 0.01 * apart(d, peak + 2.0))
            };
            let (v, at) = scan_directions(f);
            assert!(
                apart(at, peak) < 1e-3,
                "peak at {k}.5°: found {}°",
                at.to_degrees()
            );
            assert!(v > 1.0 - 1e-3, "peak at {k}.5°: {v}");
        }
    }

    #[test]
    fn the_scan_answers_north_for_a_flat_function() {
        // Ties go to the first direction scanned, north.
        assert_eq!(scan_directions(|_| 2.0), (2.0, 0.0));
    }

    /// The edge terms as they were computed before `Loads::build` took
    /// [`Edge::weight_moments_nm`] and [`Edge::ground_moment_nm`]: every
    /// moment by [`Edge::moment_nm`], the weight's normal part
    /// `Vec3::Z * w.z` and the rest `w − normal`.
    fn reference_terms(placement: &Placement<'_>, from_rad: f32) -> Vec<EdgeTerms, MAX_FEET> {
        let support = placement.rig().support();
        let mut terms: Vec<EdgeTerms, MAX_FEET> = Vec::new();
        for e in support.edges() {
            let mut t = EdgeTerms::default();
            for (i, foot) in support.feet().iter().enumerate() {
                if i == usize::from(e.from) || i == usize::from(e.to) || foot.tie_down_n <= 0.0 {
                    continue;
                }
                let at = Vec3::new(foot.position_m[0], foot.position_m[1], 0.0);
                let m = e.moment_nm(at, Vec3::new(0.0, 0.0, -foot.tie_down_n));
                if m < 0.0 {
                    t.tie_stab_nm -= m;
                }
            }
            terms.push(t).unwrap();
        }
        for p in placement.parts() {
            let normal = Vec3::Z * p.weight_n.z;
            for (e, t) in support.edges().iter().zip(terms.iter_mut()) {
                for f in [normal, p.weight_n - normal] {
                    split(
                        e.moment_nm(p.cg_m, f),
                        &mut t.gravity_over_nm,
                        &mut t.gravity_stab_nm,
                    );
                }
            }
        }
        for (_, cp, f) in placement.wind_loads(from_rad) {
            for (e, t) in support.edges().iter().zip(terms.iter_mut()) {
                split(
                    e.moment_nm(cp, f),
                    &mut t.wind_over_nm_per_pa,
                    &mut t.wind_stab_nm_per_pa,
                );
            }
        }
        terms
    }

    fn term_bits(t: &EdgeTerms) -> [u32; 5] {
        [
            t.gravity_over_nm.to_bits(),
            t.gravity_stab_nm.to_bits(),
            t.wind_over_nm_per_pa.to_bits(),
            t.wind_stab_nm_per_pa.to_bits(),
            t.tie_stab_nm.to_bits(),
        ]
    }

    /// Rigs for the equivalence test: an equatorial rig of every kind of
    /// part (legs, shaft, counterweights, a tube under a cover, a box, a
    /// ballast) on a tripod; an alt-azimuth one on five irregular feet with
    /// tie-downs; and the first with its ground masses replaced by a
    /// measured one (zero weights: zero moments).
    fn equivalence_rigs() -> [Rig; 3] {
        use crate::mount::MountGeometry;
        use crate::rig::{
            BallastSpec, BodySpec, CounterweightSpec, CoverSpec, LegsSpec, RigSpec, ShaftSpec,
        };
        use crate::support::{irregular_feet, Support};
        let eq = RigSpec::new(
            &Support::tripod(0.475, 0.3).unwrap(),
            MountGeometry::equatorial(math::deg_to_rad(47.3), [0.0, 0.0, 1.25]),
            0.45,
        )
        .with_legs(LegsSpec::new(1.3, 0.035, 1.0, 0.12))
        .with_shaft(ShaftSpec::new(1.1, 0.4, 0.025))
        .with_counterweight(CounterweightSpec::disc(5.0, 0.1, 0.12, 0.05))
        .unwrap()
        .with_body(
            BodySpec::optical_tube(8.0, 0.13, 0.95, [0.17, 0.05, 0.0]).with_under_cover(true),
        )
        .unwrap()
        .with_body(BodySpec::cuboid(
            Stage::Ground,
            14.0,
            [0.0, 0.0, 1.15],
            [0.25, 0.25, 0.3],
        ))
        .unwrap()
        .with_ballast(BallastSpec {
            mass_kg: 3.0,
            position_m: [0.1, -0.05, 0.3],
        })
        .unwrap()
        .with_cover(CoverSpec {
            mass_kg: 1.5,
            size_m: [0.3, 1.05, 0.3],
            centre_m: [0.17, 0.05, 0.0],
            drag_coefficient: None,
        });
        let eq = Rig::new(&eq).unwrap();
        let feet = irregular_feet([0.0, 150.0, 40.0, 0.0, 300.0]);
        let az = RigSpec::new(
            &Support::new(&feet).unwrap(),
            MountGeometry::alt_azimuth(math::deg_to_rad(-33.0), [0.05, -0.02, 0.9]),
            0.6,
        )
        .with_body(BodySpec::optical_tube(5.0, 0.2, 0.6, [0.1, -0.2, 0.05]))
        .unwrap()
        .with_body(BodySpec::cuboid(
            Stage::Primary,
            2.0,
            [0.0, 0.1, 0.2],
            [0.1, 0.2, 0.15],
        ))
        .unwrap();
        let az = Rig::new(&az).unwrap();
        let measured = eq
            .with_measured_centre(
                40.0,
                Vec3::new(0.02, -0.01, 0.9),
                Pose::Axes {
                    primary_rad: 0.0,
                    secondary_rad: 0.0,
                },
                false,
            )
            .unwrap();
        [eq, az, measured]
    }

    /// `Loads::build` gives every edge term the bits of the computation by
    /// [`Edge::moment_nm`] ([`reference_terms`]): the moments without their
    /// zero products are the same values, and a zero of either sign leaves
    /// the sums as they are. Poses over the sky, tilts from none (weights
    /// with ±0 ground components) to the largest, winds from every side,
    /// the cover on and off.
    #[test]
    fn edge_terms_have_the_bits_of_the_moments_about_the_edges() {
        let mut checked = 0;
        for rig in &equivalence_rigs() {
            for (i, primary) in [0.0_f32, 0.7, 2.0, -2.9, 4.4].into_iter().enumerate() {
                for secondary in [0.0_f32, 0.4, -1.2, 1.5707964, 3.0] {
                    let pose = Pose::Axes {
                        primary_rad: primary,
                        secondary_rad: secondary,
                    };
                    for (magnitude, azimuth) in [
                        (0.0, 0.0),
                        (0.0, 2.0),
                        (1e-6, 0.3),
                        (0.02, 1.0),
                        (0.08, 4.0),
                        (crate::frame::MAX_TILT_RAD, 5.5),
                    ] {
                        let tilt = Tilt::new(magnitude, azimuth).unwrap();
                        let placement = rig.place(pose, tilt, i % 2 == 0).unwrap();
                        for k in 0..24 {
                            let from = k as f32 * (TAU / 24.0) + 0.01 * i as f32;
                            let loads = Loads::new(&placement, from);
                            let want = reference_terms(&placement, from);
                            assert_eq!(loads.terms().len(), want.len());
                            for (got, want) in loads.terms().iter().zip(&want) {
                                assert_eq!(term_bits(got), term_bits(want), "{got:?} {want:?}");
                                checked += 1;
                            }
                        }
                    }
                }
            }
        }
        assert!(checked > 20_000, "{checked}");
    }

    /// The guard's extra tilt alone has the bits of the tilt margin's.
    #[test]
    fn the_extra_tilt_alone_is_the_margins() {
        for rig in &equivalence_rigs() {
            for secondary in [0.0_f32, 0.9, -1.4] {
                let pose = Pose::Axes {
                    primary_rad: 1.0,
                    secondary_rad: secondary,
                };
                for (magnitude, azimuth) in [(0.0, 0.0), (0.05, 1.0), (0.2, 3.5)] {
                    let tilt = Tilt::new(magnitude, azimuth).unwrap();
                    let placement = rig.place(pose, tilt, true).unwrap();
                    let cg = placement.centre_of_gravity_m();
                    let margin = rig.tilt_margin_in(&placement, cg).unwrap();
                    let extra = rig.extra_tilt_in(&placement, cg).unwrap();
                    assert_eq!(extra.to_bits(), margin.extra_rad.to_bits());
                }
            }
        }
    }

    #[test]
    fn a_weight_splits_by_the_sign_of_its_moment() {
        let (mut over, mut stab) = (1.0, 2.0);
        split(0.5, &mut over, &mut stab);
        split(-0.25, &mut over, &mut stab);
        assert_eq!((over, stab), (1.5, 2.25));
    }
}
