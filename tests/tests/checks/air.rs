//! Air density and dynamic pressure against published values.

use approx::assert_relative_eq;
use standfast::air::Air;

/// ISO 2533 standard atmosphere (identical to the US Standard Atmosphere 1976
/// below 32 km): density at geopotential altitudes 0 to 4000 m. Values from
/// the ISA table (ISO 2533:1975 / ICAO Doc 7488); the sea-level 1.225 kg/m³ is
/// the defining value.
#[test]
fn iso_2533_density_table() {
    for (h, rho) in [
        (0.0, 1.2250),
        (1000.0, 1.1116),
        (2000.0, 1.0065),
        (3000.0, 0.9091),
        (4000.0, 0.8191),
    ] {
        let a = Air::isa_at_elevation(h).unwrap();
        assert_relative_eq!(a.density_kg_per_m3(), rho, max_relative = 2e-4);
    }
}

/// Ideal-gas law ρ = p/(R·T) with R = 287.053 J/(kg·K) (ISO 2533): at
/// 101 325 Pa, −20 °C gives 1.394 and +30 °C gives 1.164 kg/m³.
#[test]
fn ideal_gas_cold_and_warm_nights() {
    let cold = Air::from_temperature_pressure(253.15, 101_325.0).unwrap();
    let warm = Air::from_temperature_pressure(303.15, 101_325.0).unwrap();
    assert_relative_eq!(cold.density_kg_per_m3(), 1.394, max_relative = 5e-4);
    assert_relative_eq!(warm.density_kg_per_m3(), 1.164, max_relative = 5e-4);
}

/// The conventional q = 0.613·V² Pa (ISO 4302 for cranes; ASCE 7 SI form
/// q = 0.613·K·V²; EN 1991-1-4 eq. 4.10 with ρ ≈ 1.226): sea-level ISA air
/// (ρ = 1.225) must agree within 0.1 %.
#[test]
fn dynamic_pressure_matches_0_613_v_squared() {
    let a = Air::isa_at_elevation(0.0).unwrap();
    for v in [5.0_f32, 10.0, 12.5, 20.0, 44.704] {
        assert_relative_eq!(a.dynamic_pressure_pa(v), 0.613 * v * v, max_relative = 1e-3);
    }
    // ASCE 7 US form: 0.00256·V² psf at 100 mph = 25.6 psf = 1225.7 Pa; its
    // implied density is 1.2257 kg/m³, 0.06 % above ISA sea level.
    assert_relative_eq!(a.dynamic_pressure_pa(44.704), 1225.7, max_relative = 2e-3);
}
