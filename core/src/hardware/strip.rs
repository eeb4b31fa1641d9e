//! Thread stripping: shear areas of the external and internal thread for a
//! length of engagement, the engagement for equal strength, and the
//! allowable axial load of a threaded joint with the side that governs.
//!
//! Formulas of FED-STD-H28/2B as given in Machinery's Handbook ("Strength of
//! screw threads"), written in metric form with n = 1/P threads per mm:
//!
//! - external thread (fails on the internal thread's minor diameter):
//!   `ASs = π·n·Le·D1max·[1/(2n) + 0.57735·(d2min − D1max)]`
//! - internal thread (fails on the external thread's major diameter):
//!   `ASn = π·n·Le·dmin·[1/(2n) + 0.57735·(dmin − D2max)]`
//! - engagement for materials of equal strength (H28/2B appendix A, MH
//!   formula 1): `Le = 2·At / (π·D1max·[½ + 0.57735·n·(d2min − D1max)])`,
//!   i.e. the external shear area twice the tensile stress area.
//!
//! Lengths mm, areas mm², stresses MPa, forces N. The areas are geometric
//! upper bounds (see the caution in the [module](super)).

use super::material::{Material, StrengthBasis};
use super::thread::ThreadLimits;
use crate::error::{Error, Field};
use crate::math::PI;

/// tan 30° = 1/√3, the flank term of the 60° thread in the H28 formulas.
const TAN_30: f32 = 0.577_35;

/// Longest engagement accepted, mm.
pub const MAX_ENGAGEMENT_MM: f32 = 1000.0;

/// Ratio of shear strength to tensile strength used for the thread shear
/// planes.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub enum ShearFactor {
    /// 0.6, the value of common practice for thread stripping and pins
    /// (AISC 360 Eq. G2-1 uses 0.6·Fy for shear yield; engagement
    /// calculators use 0.58 to 0.6 of the ultimate).
    CommonPractice,
    /// 1/√3 = 0.57735, distortion-energy (von Mises) shear yield.
    VonMises,
    /// 0.5, maximum-shear-stress (Tresca) criterion; the most conservative.
    Tresca,
    /// A factor of the caller's choice, accepted from 0.3 to 1.0.
    Custom(f32),
}

impl ShearFactor {
    /// The factor as a number.
    ///
    /// # Errors
    /// `strip.shear_factor` not finite or outside 0.3 to 1.0 for
    /// [`ShearFactor::Custom`].
    pub fn value(self) -> Result<f32, Error> {
        match self {
            ShearFactor::CommonPractice => Ok(0.6),
            ShearFactor::VonMises => Ok(TAN_30),
            ShearFactor::Tresca => Ok(0.5),
            ShearFactor::Custom(k) => Error::check(Field::StripShearFactor, k, 0.3, 1.0),
        }
    }
}

/// Which thread of a joint.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub enum ThreadSide {
    /// The external thread (screw or threaded shaft).
    External,
    /// The internal thread (nut, tapped hole).
    Internal,
}

impl ThreadSide {
    /// A stable snake-case name for logs and machine-readable output.
    #[must_use]
    pub const fn name(self) -> &'static str {
        match self {
            ThreadSide::External => "external",
            ThreadSide::Internal => "internal",
        }
    }
}

/// What limits a threaded joint in axial tension.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub enum FailureMode {
    /// The screw's tensile stress area yields or breaks: the preferred mode,
    /// because it shows before the thread is lost.
    ScrewTension,
    /// The external thread strips (shears on the internal minor diameter).
    ExternalThreadStrip,
    /// The internal thread strips (shears on the external major diameter);
    /// the usual weak point of a steel screw in an aluminium part.
    InternalThreadStrip,
}

impl FailureMode {
    /// A stable snake-case name for logs and machine-readable output.
    #[must_use]
    pub const fn name(self) -> &'static str {
        match self {
            FailureMode::ScrewTension => "screw_tension",
            FailureMode::ExternalThreadStrip => "external_thread_strip",
            FailureMode::InternalThreadStrip => "internal_thread_strip",
        }
    }
}

fn engagement(le_mm: f32) -> Result<f32, Error> {
    Error::check(Field::StripEngagementMm, le_mm, 0.0, MAX_ENGAGEMENT_MM)
}

/// External-thread shear area per mm of engagement, mm²/mm.
fn external_area_per_mm(l: &ThreadLimits) -> f32 {
    let p = l.pitch_mm;
    PI / p * l.int_minor_max_mm * (0.5 * p + TAN_30 * (l.ext_pitch_min_mm - l.int_minor_max_mm))
}

/// Internal-thread shear area per mm of engagement, mm²/mm.
fn internal_area_per_mm(l: &ThreadLimits) -> f32 {
    let p = l.pitch_mm;
    PI / p * l.ext_major_min_mm * (0.5 * p + TAN_30 * (l.ext_major_min_mm - l.int_pitch_max_mm))
}

/// Shear (stripping) area of the **external** thread over an engagement of
/// `engagement_mm`, mm² (FED-STD-H28/2B, ASs).
///
/// # Errors
/// Invalid `limits` (see [`ThreadLimits::validate`]); `strip.engagement_mm`
/// not finite or outside 0 to [`MAX_ENGAGEMENT_MM`].
pub fn external_shear_area_mm2(limits: &ThreadLimits, engagement_mm: f32) -> Result<f32, Error> {
    limits.validate()?;
    Ok(external_area_per_mm(limits) * engagement(engagement_mm)?)
}

/// Shear (stripping) area of the **internal** thread over an engagement of
/// `engagement_mm`, mm² (FED-STD-H28/2B, ASn).
///
/// # Errors
/// As [`external_shear_area_mm2`].
pub fn internal_shear_area_mm2(limits: &ThreadLimits, engagement_mm: f32) -> Result<f32, Error> {
    limits.validate()?;
    Ok(internal_area_per_mm(limits) * engagement(engagement_mm)?)
}

/// Length of engagement, mm, for an external thread as strong in stripping
/// as the screw is in tension when both are of the same material
/// (FED-STD-H28/2B appendix A, Machinery's Handbook formula 1):
/// `Le = 2·At / (ASs per mm)`. The factor 2 makes the shear area twice the
/// tensile stress area `tensile_area_mm2`, a small margin over the
/// shear-to-tension ratio of about 0.6.
///
/// # Errors
/// Invalid `limits`; `strip.tensile_area_mm2` not finite or outside 0.1 to
/// 100 000 mm².
pub fn equal_strength_engagement_mm(
    limits: &ThreadLimits,
    tensile_area_mm2: f32,
) -> Result<f32, Error> {
    limits.validate()?;
    let at = Error::check(Field::StripTensileAreaMm2, tensile_area_mm2, 0.1, 1e5)?;
    Ok(2.0 * at / external_area_per_mm(limits))
}

/// Length of engagement, mm, at which the thread on `side` carries `load_n`
/// when its material shears at `shear_strength_mpa`:
/// `Le = F / (τ · shear area per mm)`. This is the form of handbook worked
/// examples that size a tapped hole for the full load of the screw.
///
/// # Errors
/// Invalid `limits`; `strip.load_n` outside 0 to 10⁷ N;
/// `strip.shear_strength_mpa` outside 1 to 3000 MPa.
pub fn engagement_for_load_mm(
    limits: &ThreadLimits,
    side: ThreadSide,
    load_n: f32,
    shear_strength_mpa: f32,
) -> Result<f32, Error> {
    limits.validate()?;
    let f = Error::check(Field::StripLoadN, load_n, 0.0, 1e7)?;
    let tau = Error::check(
        Field::StripShearStrengthMpa,
        shear_strength_mpa,
        1.0,
        3000.0,
    )?;
    let per_mm = match side {
        ThreadSide::External => external_area_per_mm(limits),
        ThreadSide::Internal => internal_area_per_mm(limits),
    };
    Ok(f / (tau * per_mm))
}

/// Everything a stripping check needs.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct StrippingInput {
    /// Limit diameters of the thread pair.
    pub limits: ThreadLimits,
    /// Tensile stress area of the screw As, mm² (for example
    /// [`super::IsoThread::tensile_stress_area_mm2`]).
    pub tensile_area_mm2: f32,
    /// Length of engagement Le, mm: the length over which both threads are
    /// full, not counting chamfers and the first thread of a tapped hole.
    pub engagement_mm: f32,
    /// Material of the external thread (screw, threaded shaft).
    pub screw: Material,
    /// Material of the internal thread (nut, tapped part).
    pub internal: Material,
    /// Shear-to-tensile strength ratio for the shear planes.
    pub shear_factor: ShearFactor,
    /// Yield for an allowable working load, ultimate for a failure estimate.
    pub basis: StrengthBasis,
    /// Safety factor dividing every capacity, 1 to 100.
    pub safety_factor: f32,
}

/// Result of [`check_stripping`]. Areas mm², forces N, lengths mm. Every
/// force is already divided by the safety factor.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct StrippingResult {
    /// External-thread shear area ASs over the engagement, mm².
    pub external_shear_area_mm2: f32,
    /// Internal-thread shear area ASn over the engagement, mm².
    pub internal_shear_area_mm2: f32,
    /// Screw tension capacity As·S_screw / SF, N.
    pub screw_tension_n: f32,
    /// External-thread stripping capacity ASs·k·S_screw / SF, N.
    pub external_strip_n: f32,
    /// Internal-thread stripping capacity ASn·k·S_internal / SF, N.
    pub internal_strip_n: f32,
    /// The smallest of the three capacities, N.
    pub allowable_n: f32,
    /// Which of the three gives [`Self::allowable_n`]. On a tie the order of
    /// preference is screw tension, external, internal.
    pub governs: FailureMode,
    /// Engagement for equal strength, same materials (H28 formula 1), mm.
    pub equal_strength_engagement_mm: f32,
    /// Engagement at which the weaker thread strips at the screw's tension
    /// capacity, for these materials, mm. Longer engagement than this makes
    /// the screw govern.
    pub engagement_to_match_screw_mm: f32,
    /// Strength ratio J = (ASs·S_screw)/(ASn·S_internal) of H28/2B for a
    /// weaker internal material; above 1 the engagement for equal strength
    /// should grow to J·Le. The exact expression is from memory.
    pub strength_ratio_j: f32,
}

impl StrippingResult {
    /// Utilisation of the joint by an axial load `load_n` ≥ 0: load over
    /// [`Self::allowable_n`]; above 1 the joint is over its allowable load.
    ///
    /// # Errors
    /// `strip.load_n` not finite or outside 0 to 10⁷ N.
    pub fn utilisation(&self, load_n: f32) -> Result<f32, Error> {
        let f = Error::check(Field::StripLoadN, load_n, 0.0, 1e7)?;
        Ok(f / self.allowable_n)
    }
}

/// Allowable axial load of a threaded joint and the side that governs:
/// screw tension, external-thread stripping or internal-thread stripping.
///
/// Shear strength of each thread = `shear_factor` × its material's strength
/// on `basis`; each capacity is divided by `safety_factor`.
///
/// # Errors
/// Invalid limits; `strip.tensile_area_mm2` outside 0.1 to 100 000 mm²;
/// `strip.engagement_mm` outside 0.01 to [`MAX_ENGAGEMENT_MM`];
/// `strip.shear_factor` (custom) outside 0.3 to 1; `strip.safety_factor`
/// outside 1 to 100. Every error names the field.
pub fn check_stripping(input: &StrippingInput) -> Result<StrippingResult, Error> {
    let l = &input.limits;
    l.validate()?;
    let at = Error::check(Field::StripTensileAreaMm2, input.tensile_area_mm2, 0.1, 1e5)?;
    let le = Error::check(
        Field::StripEngagementMm,
        input.engagement_mm,
        0.01,
        MAX_ENGAGEMENT_MM,
    )?;
    let k = input.shear_factor.value()?;
    let sf = Error::check(Field::StripSafetyFactor, input.safety_factor, 1.0, 100.0)?;
    let s_screw = input.screw.strength_mpa(input.basis);
    let s_int = input.internal.strength_mpa(input.basis);

    let ass1 = external_area_per_mm(l);
    let asn1 = internal_area_per_mm(l);
    let ass = ass1 * le;
    let asn = asn1 * le;
    let screw_tension_n = at * s_screw / sf;
    let external_strip_n = ass * k * s_screw / sf;
    let internal_strip_n = asn * k * s_int / sf;

    let mut allowable_n = screw_tension_n;
    let mut governs = FailureMode::ScrewTension;
    if external_strip_n < allowable_n {
        allowable_n = external_strip_n;
        governs = FailureMode::ExternalThreadStrip;
    }
    if internal_strip_n < allowable_n {
        allowable_n = internal_strip_n;
        governs = FailureMode::InternalThreadStrip;
    }

    let strip_per_mm = (ass1 * s_screw).min(asn1 * s_int) * k / sf;
    Ok(StrippingResult {
        external_shear_area_mm2: ass,
        internal_shear_area_mm2: asn,
        screw_tension_n,
        external_strip_n,
        internal_strip_n,
        allowable_n,
        governs,
        equal_strength_engagement_mm: 2.0 * at / ass1,
        engagement_to_match_screw_mm: screw_tension_n / strip_per_mm,
        strength_ratio_j: (ass1 * s_screw) / (asn1 * s_int),
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::hardware::material;
    use crate::hardware::thread::IsoThread;

    fn input(le: f32) -> StrippingInput {
        let t = IsoThread::by_name("M8").unwrap();
        StrippingInput {
            limits: t.limits(),
            tensile_area_mm2: t.tensile_stress_area_mm2(),
            engagement_mm: le,
            screw: material::BOLT_8_8_UP_TO_M16,
            internal: material::AL_6061_T6_PLATE_MIN,
            shear_factor: ShearFactor::CommonPractice,
            basis: StrengthBasis::Yield,
            safety_factor: 2.0,
        }
    }

    #[test]
    fn basic_profile_shortcut() {
        // With basic sizes ASs = 0.75·π·D1·Le and ASn = 0.875·π·d·Le
        // (derived here from the FED-STD-H28/2B shear-area formulas with the
        // basic ISO 68-1 profile, d2 − D1 = 0.4330·P and d − D2 = 0.6495·P).
        let t = IsoThread::by_name("M12").unwrap();
        let l = t.basic_limits();
        let ass = external_shear_area_mm2(&l, 10.0).unwrap();
        let asn = internal_shear_area_mm2(&l, 10.0).unwrap();
        let d1 = t.internal_minor_diameter_mm();
        assert!((ass / (0.75 * PI * d1 * 10.0) - 1.0).abs() < 1e-4);
        assert!((asn / (0.875 * PI * 12.0 * 10.0) - 1.0).abs() < 1e-4);
    }

    #[test]
    fn short_engagement_in_aluminium_strips_the_hole_long_breaks_the_screw() {
        let short = check_stripping(&input(4.0)).unwrap();
        assert_eq!(short.governs, FailureMode::InternalThreadStrip);
        let long = check_stripping(&input(short.engagement_to_match_screw_mm * 1.01)).unwrap();
        assert_eq!(long.governs, FailureMode::ScrewTension);
        let at = check_stripping(&input(short.engagement_to_match_screw_mm)).unwrap();
        assert!((at.internal_strip_n / at.screw_tension_n - 1.0).abs() < 1e-4);
        assert!(short.strength_ratio_j > 1.0);
    }

    #[test]
    fn bad_inputs_name_their_field() {
        let mut i = input(8.0);
        i.safety_factor = 0.5;
        assert_eq!(
            check_stripping(&i).unwrap_err().field,
            Field::StripSafetyFactor
        );
        let mut i = input(f32::NAN);
        assert_eq!(
            check_stripping(&i).unwrap_err().field,
            Field::StripEngagementMm
        );
        i.engagement_mm = 8.0;
        i.shear_factor = ShearFactor::Custom(2.0);
        assert_eq!(
            check_stripping(&i).unwrap_err().field,
            Field::StripShearFactor
        );
        assert!(external_shear_area_mm2(&i.limits, -1.0).is_err());
    }
}
