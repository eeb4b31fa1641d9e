//! Bending stress at the root of a counterweight shaft (solid, hollow, or
//! threaded with the section taken at the thread's minor diameter) and its
//! utilisation against yield.
//!
//! σ = M/S with the elastic section modulus S = π·d³/32 for a solid round
//! section and S = π·(D⁴ − d⁴)/(32·D) for a tube (Shigley, *Mechanical
//! Engineering Design*, ch. 3; Roark, *Formulas for Stress and Strain*).
//! Diameters mm, section modulus mm³, stress MPa, moment N·m.
//!
//! A threaded root also concentrates stress (fatigue notch factor about 2.2
//! to 3 for rolled and cut threads, from memory); under a static
//! counterweight load the nominal stress against yield is the usual check,
//! but do not read the utilisation as a fatigue margin.

use super::material::{Material, StrengthBasis};
use super::thread::IsoThread;
use crate::error::{Error, Field};
use crate::math::PI;

/// Largest shaft diameter accepted, mm.
const MAX_DIAMETER_MM: f32 = 1000.0;

/// Cross-section of a round shaft where it bends.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub enum ShaftSection {
    /// Solid round section.
    Solid {
        /// Diameter, mm (for a thread: its minor diameter d3).
        diameter_mm: f32,
    },
    /// Round tube.
    Hollow {
        /// Outer diameter, mm (for a thread: its minor diameter d3).
        outer_mm: f32,
        /// Bore, mm, smaller than the outer diameter.
        bore_mm: f32,
    },
}

impl ShaftSection {
    /// A solid section of `diameter_mm`.
    ///
    /// # Errors
    /// `shaft.diameter_mm` not finite or outside 0.5 to 1000 mm.
    pub fn solid(diameter_mm: f32) -> Result<ShaftSection, Error> {
        let d = Error::check(Field::ShaftDiameterMm, diameter_mm, 0.5, MAX_DIAMETER_MM)?;
        Ok(ShaftSection::Solid { diameter_mm: d })
    }

    /// A tube of outer diameter `outer_mm` with a bore of `bore_mm`.
    ///
    /// # Errors
    /// `shaft.outer_mm` outside 0.5 to 1000 mm; `shaft.bore_mm` outside 0 to
    /// 0.98 × the outer diameter (thinner walls are not a shaft).
    pub fn hollow(outer_mm: f32, bore_mm: f32) -> Result<ShaftSection, Error> {
        let o = Error::check(Field::ShaftOuterMm, outer_mm, 0.5, MAX_DIAMETER_MM)?;
        let b = Error::check(Field::ShaftBoreMm, bore_mm, 0.0, 0.98 * o)?;
        Ok(ShaftSection::Hollow {
            outer_mm: o,
            bore_mm: b,
        })
    }

    /// The section at the root of an external thread: solid, diameter d3.
    #[must_use]
    pub fn threaded_root(thread: &IsoThread) -> ShaftSection {
        ShaftSection::Solid {
            diameter_mm: thread.external_minor_diameter_mm(),
        }
    }

    /// The section at the root of a hollow threaded shaft: outer diameter d3,
    /// bore `bore_mm`.
    ///
    /// # Errors
    /// As [`ShaftSection::hollow`] with the outer diameter d3.
    pub fn threaded_root_hollow(thread: &IsoThread, bore_mm: f32) -> Result<ShaftSection, Error> {
        ShaftSection::hollow(thread.external_minor_diameter_mm(), bore_mm)
    }

    /// Checks a section built field by field.
    ///
    /// # Errors
    /// As [`ShaftSection::solid`] / [`ShaftSection::hollow`].
    pub fn validate(&self) -> Result<(), Error> {
        match *self {
            ShaftSection::Solid { diameter_mm } => ShaftSection::solid(diameter_mm).map(|_| ()),
            ShaftSection::Hollow { outer_mm, bore_mm } => {
                ShaftSection::hollow(outer_mm, bore_mm).map(|_| ())
            }
        }
    }

    /// Elastic section modulus in bending, mm³: π·d³/32 (solid) or
    /// π·(D⁴ − d⁴)/(32·D) (tube).
    #[must_use]
    pub fn section_modulus_mm3(&self) -> f32 {
        match *self {
            ShaftSection::Solid { diameter_mm: d } => PI * d * d * d / 32.0,
            ShaftSection::Hollow {
                outer_mm: o,
                bore_mm: b,
            } => PI * (o * o * o * o - b * b * b * b) / (32.0 * o),
        }
    }
}

/// Nominal bending stress, MPa, of `section` under `moment_nm`:
/// σ = 1000·M / S (the 1000 turns N·m into N·mm).
///
/// # Errors
/// Invalid section; `shaft.moment_nm` not finite or outside ±10⁶ N·m.
pub fn bending_stress_mpa(moment_nm: f32, section: &ShaftSection) -> Result<f32, Error> {
    section.validate()?;
    let m = Error::check(Field::ShaftMomentNm, moment_nm, -1e6, 1e6)?;
    Ok(m.abs() * 1000.0 / section.section_modulus_mm3())
}

/// Result of [`check_shaft_bending`].
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct ShaftBendingResult {
    /// Nominal bending stress at the outer fibre, MPa (≥ 0).
    pub stress_mpa: f32,
    /// Section modulus used, mm³.
    pub section_modulus_mm3: f32,
    /// Allowable stress: the material strength on the chosen basis divided by
    /// the safety factor, MPa.
    pub allowable_mpa: f32,
    /// stress / allowable; above 1 the shaft is over its allowable stress.
    pub utilisation: f32,
    /// Largest moment the section carries at the allowable stress, N·m.
    pub allowable_moment_nm: f32,
}

/// Bending check of a shaft section under `moment_nm` against `material` on
/// `basis` (normally [`StrengthBasis::Yield`]) divided by `safety_factor`.
///
/// # Errors
/// Invalid section or moment (see [`bending_stress_mpa`]);
/// `shaft.safety_factor` outside 1 to 100.
pub fn check_shaft_bending(
    moment_nm: f32,
    section: &ShaftSection,
    material: &Material,
    basis: StrengthBasis,
    safety_factor: f32,
) -> Result<ShaftBendingResult, Error> {
    let stress_mpa = bending_stress_mpa(moment_nm, section)?;
    let sf = Error::check(Field::ShaftSafetyFactor, safety_factor, 1.0, 100.0)?;
    let s = section.section_modulus_mm3();
    let allowable_mpa = material.strength_mpa(basis) / sf;
    Ok(ShaftBendingResult {
        stress_mpa,
        section_modulus_mm3: s,
        allowable_mpa,
        utilisation: stress_mpa / allowable_mpa,
        allowable_moment_nm: allowable_mpa * s / 1000.0,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::hardware::material;

    #[test]
    fn hollow_with_no_bore_is_solid() {
        let a = ShaftSection::hollow(12.0, 0.0)
            .unwrap()
            .section_modulus_mm3();
        let b = ShaftSection::solid(12.0).unwrap().section_modulus_mm3();
        assert!((a / b - 1.0).abs() < 1e-6);
    }

    #[test]
    fn utilisation_one_at_the_allowable_moment() {
        let sec = ShaftSection::threaded_root(&IsoThread::by_name("M12").unwrap());
        let m = &material::STEEL_S235_MIN;
        let r = check_shaft_bending(10.0, &sec, m, StrengthBasis::Yield, 2.0).unwrap();
        let r2 =
            check_shaft_bending(r.allowable_moment_nm, &sec, m, StrengthBasis::Yield, 2.0).unwrap();
        assert!((r2.utilisation - 1.0).abs() < 1e-5);
        assert!((r.allowable_mpa - 117.5).abs() < 1e-4);
    }

    #[test]
    fn bad_inputs() {
        assert_eq!(
            ShaftSection::hollow(10.0, 10.0).unwrap_err().field,
            Field::ShaftBoreMm
        );
        let sec = ShaftSection::Solid { diameter_mm: -3.0 };
        assert_eq!(
            bending_stress_mpa(1.0, &sec).unwrap_err().field,
            Field::ShaftDiameterMm
        );
        let sec = ShaftSection::solid(10.0).unwrap();
        assert!(bending_stress_mpa(f32::NAN, &sec).is_err());
    }
}
