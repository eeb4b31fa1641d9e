//! Strengths of common materials for counterweight hardware, and free entry
//! of any other. Stresses in MPa (N/mm²).
//!
//! Each listed value says whether it is a specification **minimum** (what the
//! standard guarantees for that product form and size) or a **typical**
//! handbook average (what a part usually has, not guaranteed), and where it
//! comes from. Values marked *from memory* were not confirmed against the
//! primary document; use them as a first estimate only. Minimums depend on
//! product form and thickness: read the material certificate of the part.

use crate::error::{Error, Field};

/// Which strength of a material a check uses.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub enum StrengthBasis {
    /// Yield (0.2 % proof) strength: the load at which the part starts to
    /// deform permanently. The basis of an allowable (working) load.
    Yield,
    /// Ultimate (tensile) strength: the load at which the part breaks or the
    /// thread strips. The basis of a failure estimate.
    Ultimate,
}

impl StrengthBasis {
    /// A stable snake-case name for logs and machine-readable output.
    #[must_use]
    pub const fn name(self) -> &'static str {
        match self {
            StrengthBasis::Yield => "yield",
            StrengthBasis::Ultimate => "ultimate",
        }
    }
}

/// Yield and ultimate strength of a material, MPa. Built only through
/// [`Material::new`] or the listed constants, so it is always valid:
/// 0 < yield ≤ ultimate ≤ [`MAX_STRENGTH_MPA`].
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Material {
    yield_mpa: f32,
    ultimate_mpa: f32,
}

/// Largest strength accepted, MPa (above the strongest bolt steels).
pub const MAX_STRENGTH_MPA: f32 = 3000.0;

impl Material {
    /// A material of the caller's choice.
    ///
    /// # Errors
    /// `material.yield_mpa` not finite or outside 1 to [`MAX_STRENGTH_MPA`];
    /// `material.ultimate_mpa` not finite or outside `yield_mpa` to
    /// [`MAX_STRENGTH_MPA`].
    pub fn new(yield_mpa: f32, ultimate_mpa: f32) -> Result<Material, Error> {
        let y = Error::check(Field::MaterialYieldMpa, yield_mpa, 1.0, MAX_STRENGTH_MPA)?;
        let u = Error::check(
            Field::MaterialUltimateMpa,
            ultimate_mpa,
            y,
            MAX_STRENGTH_MPA,
        )?;
        Ok(Material {
            yield_mpa: y,
            ultimate_mpa: u,
        })
    }

    /// Yield (0.2 % proof) strength, MPa.
    #[must_use]
    pub const fn yield_mpa(&self) -> f32 {
        self.yield_mpa
    }

    /// Ultimate tensile strength, MPa.
    #[must_use]
    pub const fn ultimate_mpa(&self) -> f32 {
        self.ultimate_mpa
    }

    /// The strength on `basis`, MPa.
    #[must_use]
    pub const fn strength_mpa(&self, basis: StrengthBasis) -> f32 {
        match basis {
            StrengthBasis::Yield => self.yield_mpa,
            StrengthBasis::Ultimate => self.ultimate_mpa,
        }
    }

    /// Property class 8.8 bolt steel for a screw of nominal diameter
    /// `nominal_mm`: [`BOLT_8_8_UP_TO_M16`] up to 16 mm, [`BOLT_8_8_OVER_M16`]
    /// above.
    #[must_use]
    pub fn bolt_class_8_8(nominal_mm: f32) -> Material {
        if nominal_mm > 16.0 {
            BOLT_8_8_OVER_M16
        } else {
            BOLT_8_8_UP_TO_M16
        }
    }
}

/// 6061-T6 extrusion, ASTM B221: yield ≥ 241 MPa (35 ksi), ultimate ≥ 262 MPa
/// (38 ksi). Minimum; confirmed (ASTM B221 property table reproduction).
pub const AL_6061_T6_EXTRUSION_MIN: Material = Material {
    yield_mpa: 241.0,
    ultimate_mpa: 262.0,
};

/// 6061-T6 sheet and plate, ASTM B209: yield ≥ 241 MPa (35 ksi), ultimate
/// ≥ 290 MPa (42 ksi). Minimum; confirmed (ASTM B209 property table
/// reproduction).
pub const AL_6061_T6_PLATE_MIN: Material = Material {
    yield_mpa: 241.0,
    ultimate_mpa: 290.0,
};

/// 6061-T6: yield 276 MPa, ultimate 310 MPa. Typical (Aluminum Association /
/// ASM handbook averages), from memory. Not guaranteed; prefer a minimum.
pub const AL_6061_T6_TYPICAL: Material = Material {
    yield_mpa: 276.0,
    ultimate_mpa: 310.0,
};

/// 6063-T6 extrusion, ASTM B221: yield ≥ 172 MPa (25 ksi), ultimate ≥ 207 MPa
/// (30 ksi). Minimum; confirmed (ASTM B221 property table reproduction).
pub const AL_6063_T6_EXTRUSION_MIN: Material = Material {
    yield_mpa: 172.0,
    ultimate_mpa: 207.0,
};

/// 6082-T6 bar, EN 755-2, diameter ≤ 20 mm: yield ≥ 250 MPa, ultimate
/// ≥ 295 MPa. Minimum; confirmed (EN 755-2:2008 reproduction).
pub const AL_6082_T6_BAR_MIN: Material = Material {
    yield_mpa: 250.0,
    ultimate_mpa: 295.0,
};

/// 6082-T6 bar over 20 up to 150 mm, and profiles with wall over 5 up to
/// 25 mm, EN 755-2: yield ≥ 260 MPa, ultimate ≥ 310 MPa. Minimum; confirmed
/// (EN 755-2:2008 reproduction; EN AW-6082 data sheet).
pub const AL_6082_T6_THICK_MIN: Material = Material {
    yield_mpa: 260.0,
    ultimate_mpa: 310.0,
};

/// 7075-T6: yield 503 MPa, ultimate 572 MPa. Typical (Aluminum Association /
/// ASM averages), from memory. Not guaranteed; prefer a minimum.
pub const AL_7075_T6_TYPICAL: Material = Material {
    yield_mpa: 503.0,
    ultimate_mpa: 572.0,
};

/// 7075-T6 bar, EN 755-2, diameter ≤ 25 mm: yield ≥ 480 MPa, ultimate
/// ≥ 540 MPa. Minimum, from memory.
pub const AL_7075_T6_BAR_MIN: Material = Material {
    yield_mpa: 480.0,
    ultimate_mpa: 540.0,
};

/// Structural steel S235JR, thickness ≤ 16 mm, EN 10025-2 Table 7: yield
/// ≥ 235 MPa, ultimate 360 to 510 MPa (the lower bound is used). Minimum;
/// confirmed (EN 10025-2 table reproduction). Over 16 up to 40 mm yield is
/// ≥ 225 MPa.
pub const STEEL_S235_MIN: Material = Material {
    yield_mpa: 235.0,
    ultimate_mpa: 360.0,
};

/// Structural steel S355JR/J2, thickness ≤ 16 mm, EN 10025-2 Table 7: yield
/// ≥ 355 MPa, ultimate 470 to 630 MPa (the lower bound is used). Minimum;
/// confirmed (EN 10025-2 table reproduction). Over 16 up to 40 mm yield is
/// ≥ 345 MPa.
pub const STEEL_S355_MIN: Material = Material {
    yield_mpa: 355.0,
    ultimate_mpa: 470.0,
};

/// Stainless steel 304 bar, annealed, ASTM A276: yield ≥ 205 MPa, ultimate
/// ≥ 515 MPa. Minimum; confirmed (ASTM A276 table reproduction).
/// Cold-finished bar ≤ 12.7 mm reaches ≥ 310 / ≥ 620 MPa.
pub const STAINLESS_304_ANNEALED_MIN: Material = Material {
    yield_mpa: 205.0,
    ultimate_mpa: 515.0,
};

/// Bolt property class 8.8, d ≤ 16 mm, ISO 898-1: Rp0.2 ≥ 640 MPa,
/// Rm ≥ 800 MPa. Minimum, from memory; consistent with the ISO 898-1 proof
/// and ultimate load tables (confirmed) through the tensile stress area.
pub const BOLT_8_8_UP_TO_M16: Material = Material {
    yield_mpa: 640.0,
    ultimate_mpa: 800.0,
};

/// Bolt property class 8.8, d > 16 mm, ISO 898-1: Rp0.2 ≥ 660 MPa,
/// Rm ≥ 830 MPa. Minimum, from memory; consistent with the ISO 898-1 load
/// tables (confirmed).
pub const BOLT_8_8_OVER_M16: Material = Material {
    yield_mpa: 660.0,
    ultimate_mpa: 830.0,
};

/// Every listed material with a short label, for a host to offer as a menu.
pub const LISTED: [(&str, Material); 13] = [
    (
        "6061-T6 extrusion (min, ASTM B221)",
        AL_6061_T6_EXTRUSION_MIN,
    ),
    ("6061-T6 plate (min, ASTM B209)", AL_6061_T6_PLATE_MIN),
    ("6061-T6 (typical)", AL_6061_T6_TYPICAL),
    (
        "6063-T6 extrusion (min, ASTM B221)",
        AL_6063_T6_EXTRUSION_MIN,
    ),
    ("6082-T6 bar <= 20 mm (min, EN 755-2)", AL_6082_T6_BAR_MIN),
    (
        "6082-T6 bar 20-150 mm (min, EN 755-2)",
        AL_6082_T6_THICK_MIN,
    ),
    ("7075-T6 (typical)", AL_7075_T6_TYPICAL),
    ("7075-T6 bar <= 25 mm (min, EN 755-2)", AL_7075_T6_BAR_MIN),
    ("S235JR <= 16 mm (min, EN 10025-2)", STEEL_S235_MIN),
    ("S355JR <= 16 mm (min, EN 10025-2)", STEEL_S355_MIN),
    (
        "304 annealed bar (min, ASTM A276)",
        STAINLESS_304_ANNEALED_MIN,
    ),
    ("bolt 8.8 <= M16 (min, ISO 898-1)", BOLT_8_8_UP_TO_M16),
    ("bolt 8.8 > M16 (min, ISO 898-1)", BOLT_8_8_OVER_M16),
];

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn listed_materials_pass_their_own_validation() {
        for (_, m) in LISTED {
            assert_eq!(Material::new(m.yield_mpa(), m.ultimate_mpa()).unwrap(), m);
        }
    }

    #[test]
    fn free_entry_is_validated() {
        assert_eq!(
            Material::new(300.0, 200.0).unwrap_err().field,
            Field::MaterialUltimateMpa
        );
        assert_eq!(
            Material::new(-1.0, 200.0).unwrap_err().field,
            Field::MaterialYieldMpa
        );
        assert!(Material::new(f32::INFINITY, 200.0).is_err());
        assert_eq!(Material::bolt_class_8_8(20.0), BOLT_8_8_OVER_M16);
        assert_eq!(Material::bolt_class_8_8(16.0), BOLT_8_8_UP_TO_M16);
    }
}
