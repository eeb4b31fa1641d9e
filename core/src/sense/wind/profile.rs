//! The height profile of the mean wind (EN 1991-1-4, §4.3.2): terrain
//! categories, the logarithmic correction from the anemometer's height to
//! the rig's, and the gust of a mean speed.

use crate::error::{Error, Field};
use crate::math;

/// Terrain category of EN 1991-1-4 Table 4.1, which fixes the roughness
/// length z0 and the minimum height z_min of the logarithmic wind profile.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub enum TerrainCategory {
    /// Category 0: sea or coastal area exposed to the open sea.
    /// z0 = 0.003 m, z_min = 1 m.
    Cat0Sea,
    /// Category I: lakes or flat, horizontal land with negligible vegetation.
    /// z0 = 0.01 m, z_min = 1 m.
    CatIFlat,
    /// Category II: low vegetation (grass) and isolated obstacles at least
    /// 20 obstacle heights apart. z0 = 0.05 m, z_min = 2 m. Default: the
    /// usual open observing field.
    #[default]
    CatIIOpen,
    /// Category III: regular cover of vegetation or buildings, isolated
    /// obstacles at most 20 heights apart (villages, suburbs, forest).
    /// z0 = 0.3 m, z_min = 5 m.
    CatIIISuburban,
    /// Category IV: at least 15 % of the surface covered by buildings of
    /// average height above 15 m. z0 = 1.0 m, z_min = 10 m.
    CatIVUrban,
}

impl TerrainCategory {
    /// A stable snake-case name for logs and machine-readable output.
    #[must_use]
    pub const fn name(self) -> &'static str {
        match self {
            TerrainCategory::Cat0Sea => "cat_0_sea",
            TerrainCategory::CatIFlat => "cat_i_flat",
            TerrainCategory::CatIIOpen => "cat_ii_open",
            TerrainCategory::CatIIISuburban => "cat_iii_suburban",
            TerrainCategory::CatIVUrban => "cat_iv_urban",
        }
    }
}

impl TerrainCategory {
    /// Roughness length z0, metres (EN 1991-1-4 Table 4.1).
    #[must_use]
    pub const fn roughness_length_m(self) -> f32 {
        match self {
            TerrainCategory::Cat0Sea => 0.003,
            TerrainCategory::CatIFlat => 0.01,
            TerrainCategory::CatIIOpen => 0.05,
            TerrainCategory::CatIIISuburban => 0.3,
            TerrainCategory::CatIVUrban => 1.0,
        }
    }

    /// Minimum height z_min, metres (EN 1991-1-4 Table 4.1): below it the
    /// profile is held at its z_min value.
    #[must_use]
    pub const fn min_height_m(self) -> f32 {
        match self {
            TerrainCategory::Cat0Sea | TerrainCategory::CatIFlat => 1.0,
            TerrainCategory::CatIIOpen => 2.0,
            TerrainCategory::CatIIISuburban => 5.0,
            TerrainCategory::CatIVUrban => 10.0,
        }
    }

    /// Ratio of 3-s gust to 10-min mean to use when only means are known.
    /// Open terrain (0, I, II): 1.45 (Durst 1960 curve gives 1.43, ESDU
    /// 1.45). Category III: 1.7 (WMO/TD-No. 1555 in-land 1.66; EN 1991-1-4
    /// √(1 + 7·I_v) = 1.73 at 10 m). Category IV: 2.0 (EN 1991-1-4
    /// √(1 + 7·I_v)). Rougher ground gusts harder relative to its mean.
    #[must_use]
    pub const fn default_gust_factor(self) -> f32 {
        match self {
            TerrainCategory::Cat0Sea | TerrainCategory::CatIFlat | TerrainCategory::CatIIOpen => {
                1.45
            }
            TerrainCategory::CatIIISuburban => 1.7,
            TerrainCategory::CatIVUrban => 2.0,
        }
    }
}

/// Factor v(z_to)/v(z_from) of the logarithmic mean-wind profile of
/// EN 1991-1-4 (eq. 4.4, c_r(z) = k_r·ln(z/z0)): ln(z_to/z0) / ln(z_from/z0),
/// with each height raised to the category's z_min first. Heights in metres
/// above ground.
///
/// # Errors
/// A height that is non-finite or outside 0.01 to 200 m (the code's z_max).
pub fn log_profile_factor(
    z_from_m: f32,
    z_to_m: f32,
    terrain: TerrainCategory,
) -> Result<f32, Error> {
    Error::check(Field::WindZFromM, z_from_m, 0.01, 200.0)?;
    Error::check(Field::WindZToM, z_to_m, 0.01, 200.0)?;
    let z0 = terrain.roughness_length_m();
    let zmin = terrain.min_height_m();
    let from = math::ln(z_from_m.max(zmin) / z0);
    let to = math::ln(z_to_m.max(zmin) / z0);
    Ok(to / from)
}

/// The gust estimated from a mean speed: `mean_mps · gust_factor` (both at
/// the same height; m/s).
#[must_use]
pub fn gust_from_mean(mean_mps: f32, gust_factor: f32) -> f32 {
    mean_mps * gust_factor
}
