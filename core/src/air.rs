//! Air density and dynamic pressure.
//!
//! Density comes either from the site elevation through the ISO 2533 standard
//! atmosphere (troposphere, geopotential altitude) or from a measured air
//! temperature and pressure through the ideal-gas law. Dynamic pressure is
//! q = ½ ρ V².

use crate::error::{Error, Field};
use crate::math;

/// ISO 2533 sea-level temperature T₀ = 288.15 K.
pub const ISA_T0_K: f32 = 288.15;
/// ISO 2533 sea-level pressure p₀ = 101 325 Pa.
pub const ISA_P0_PA: f32 = 101_325.0;
/// ISO 2533 sea-level density ρ₀ = 1.225 kg/m³.
pub const ISA_RHO0_KG_PER_M3: f32 = 1.225;
/// ISO 2533 tropospheric temperature lapse rate, 0.0065 K/m.
pub const ISA_LAPSE_K_PER_M: f32 = 0.0065;
/// Specific gas constant of dry air R = R*/M₀ = 287.052 87 J/(kg·K) (ISO 2533).
pub const R_DRY_AIR_J_PER_KG_K: f32 = 287.052_87;
/// Exponent g₀M₀/(R*L) of the tropospheric pressure law, 5.255 876 (ISO 2533).
pub const ISA_PRESSURE_EXPONENT: f32 = 5.255_876;

/// Lowest site elevation accepted, m (the Dead Sea shore is about −430 m).
pub const MIN_ELEVATION_M: f32 = -500.0;
/// Highest site elevation accepted, m: the top of the ISO 2533 troposphere.
pub const MAX_ELEVATION_M: f32 = 11_000.0;

/// Air at the rig: its density in kg/m³.
/// # Examples
/// ```
/// use standfast::Air;
///
/// // 5 °C (278.15 K) at 95 kPa: ρ = p / (R·T), about 1.19 kg/m³.
/// let measured = Air::from_temperature_pressure(278.15, 95_000.0)?;
/// let standard = Air::isa_at_elevation(0.0)?;
/// assert!(measured.density_kg_per_m3() < standard.density_kg_per_m3());
/// assert!(Air::from_density(5.0).is_err(), "denser than any air on Earth");
/// # Ok::<(), standfast::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct Air {
    density_kg_per_m3: f32,
}

impl Default for Air {
    /// ISO 2533 sea-level air, 1.225 kg/m³.
    fn default() -> Self {
        Air {
            density_kg_per_m3: ISA_RHO0_KG_PER_M3,
        }
    }
}

/// Lowest air density the model accepts, kg/m³ (about 11 km up in the
/// standard atmosphere: no telescope site is higher).
pub const MIN_DENSITY_KG_PER_M3: f32 = 0.3;
/// Highest air density the model accepts, kg/m³: above the 1.92 kg/m³ of the
/// densest air [`Air::from_temperature_pressure`] accepts (110 kPa at
/// 200 K), so every accepted sample can be evaluated.
pub const MAX_DENSITY_KG_PER_M3: f32 = 2.0;

impl Air {
    /// Air of a given density.
    ///
    /// # Errors
    /// Non-finite, or outside [`MIN_DENSITY_KG_PER_M3`] to [`MAX_DENSITY_KG_PER_M3`].
    pub fn from_density(density_kg_per_m3: f32) -> Result<Air, Error> {
        Error::check(
            Field::AirDensityKgPerM3,
            density_kg_per_m3,
            MIN_DENSITY_KG_PER_M3,
            MAX_DENSITY_KG_PER_M3,
        )?;
        Ok(Air { density_kg_per_m3 })
    }

    /// ISO 2533 standard-atmosphere air at a geopotential elevation above mean
    /// sea level, metres: T = T₀ − L·h, p = p₀·(T/T₀)^5.255 876, ρ = p/(R·T).
    ///
    /// # Errors
    /// Elevation outside [`MIN_ELEVATION_M`] to [`MAX_ELEVATION_M`].
    pub fn isa_at_elevation(elevation_m: f32) -> Result<Air, Error> {
        Error::check(
            Field::SiteElevationM,
            elevation_m,
            MIN_ELEVATION_M,
            MAX_ELEVATION_M,
        )?;
        let t = ISA_T0_K - ISA_LAPSE_K_PER_M * elevation_m;
        let p = ISA_P0_PA * math::powf(t / ISA_T0_K, ISA_PRESSURE_EXPONENT);
        Ok(Air {
            density_kg_per_m3: p / (R_DRY_AIR_J_PER_KG_K * t),
        })
    }

    /// Dry air from a measured temperature (kelvin) and pressure (pascal) by the
    /// ideal-gas law ρ = p/(R·T). Humidity lowers density by at most about 1 %
    /// at night-time temperatures and is neglected.
    ///
    /// # Errors
    /// Temperature outside 200 to 330 K, pressure outside 40 to 110 kPa.
    pub fn from_temperature_pressure(temperature_k: f32, pressure_pa: f32) -> Result<Air, Error> {
        Error::check(Field::AirTemperatureK, temperature_k, 200.0, 330.0)?;
        Error::check(Field::AirPressurePa, pressure_pa, 40_000.0, 110_000.0)?;
        Ok(Air {
            density_kg_per_m3: pressure_pa / (R_DRY_AIR_J_PER_KG_K * temperature_k),
        })
    }

    /// Density in kg/m³.
    #[must_use]
    pub fn density_kg_per_m3(self) -> f32 {
        self.density_kg_per_m3
    }

    /// Dynamic pressure q = ½ρV² in pascal for a wind speed in m/s.
    #[must_use]
    pub fn dynamic_pressure_pa(self, speed_mps: f32) -> f32 {
        0.5 * self.density_kg_per_m3 * speed_mps * speed_mps
    }

    /// The wind speed in m/s whose dynamic pressure is `q_pa` (0 for q ≤ 0).
    #[must_use]
    pub fn speed_for_pressure_mps(self, q_pa: f32) -> f32 {
        if q_pa <= 0.0 {
            0.0
        } else {
            math::sqrt(2.0 * q_pa / self.density_kg_per_m3)
        }
    }
}

/// 0 °C in kelvin, exact in `f64` (273.15 K by the definition of the
/// Celsius scale): the one definition of the constant, for hosts that
/// convert units in `f64` (a compile-time value: the crate computes with
/// [`ZERO_CELSIUS_K`] only).
pub const ZERO_CELSIUS_K_F64: f64 = 273.15;
/// 0 °C in kelvin, 273.15 K rounded to `f32`.
#[allow(clippy::cast_possible_truncation)] // rounded to f32 at compile time
pub const ZERO_CELSIUS_K: f32 = ZERO_CELSIUS_K_F64 as f32;

/// A temperature in degrees Celsius (`celsius`) in kelvin, for the
/// boundary where a reading in °C comes in (inside, temperatures are kelvin).
#[must_use]
pub fn celsius_to_kelvin(celsius: f32) -> f32 {
    celsius + ZERO_CELSIUS_K
}

#[cfg(test)]
mod tests {

    /// Every air sample the ideal-gas constructor accepts (the corners of its
    /// temperature and pressure ranges bound the density) gives a density
    /// the model evaluates: a guard never faults on valid air.
    #[test]
    fn every_accepted_sample_is_inside_the_model() {
        for t in [200.0, 330.0] {
            for p in [40_000.0, 110_000.0] {
                let a = Air::from_temperature_pressure(t, p).unwrap();
                assert!(
                    Air::from_density(a.density_kg_per_m3()).is_ok(),
                    "{t} K {p} Pa"
                );
            }
        }
    }

    use super::*;

    #[test]
    fn sea_level_isa() {
        let a = Air::isa_at_elevation(0.0).unwrap();
        assert!((a.density_kg_per_m3() - 1.225).abs() < 2e-4);
    }

    #[test]
    fn speed_pressure_round_trip() {
        let a = Air::default();
        let q = a.dynamic_pressure_pa(17.0);
        assert!((a.speed_for_pressure_mps(q) - 17.0).abs() < 1e-4);
    }

    #[test]
    fn rejects_out_of_range() {
        assert!(Air::isa_at_elevation(20_000.0).is_err());
        assert!(Air::from_temperature_pressure(f32::NAN, 100_000.0).is_err());
    }
}
