//! ISO metric coarse threads: the table of sizes, the basic profile of
//! ISO 68-1, the tensile stress area, and limit diameters for stripping
//! calculations.
//!
//! Lengths in millimetres, areas in mm² (see the [module units](super)).
//!
//! Profile relations (ISO 68-1, basic profile, P = pitch):
//! H = 0.866025·P, d2 = D2 = d − 0.649519·P, D1 = d1 = d − 1.082532·P,
//! d3 = d − 1.226869·P (minor diameter of the external thread at the rounded
//! root), tensile stress area As = π/4·((d2 + d3)/2)² = π/4·(d − 0.938194·P)²
//! (ISO 898-1).

use crate::error::{Error, ErrorKind, Field};
use crate::math::PI;

/// Where a set of [`ThreadLimits`] comes from.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub enum LimitsSource {
    /// Tolerance class 6g (external) / 6H (internal) limit diameters from the
    /// ISO 965 tables, tabulated here for the sizes that have them.
    Class6g6H,
    /// The basic profile of ISO 68-1 with no tolerance allowance: the external
    /// thread at its basic major and pitch diameters, the internal thread at
    /// its basic minor and pitch diameters. This overstates both shear areas a
    /// little against real 6g/6H parts (for M10 by about 13 % on the internal
    /// thread); pass measured or tabulated limits through [`ThreadLimits::new`]
    /// when the difference matters.
    BasicProfile,
    /// Diameters given by the caller.
    Caller,
}

impl LimitsSource {
    /// A stable snake-case name for logs and machine-readable output.
    #[must_use]
    pub const fn name(self) -> &'static str {
        match self {
            LimitsSource::Class6g6H => "class_6g_6h",
            LimitsSource::BasicProfile => "basic_profile",
            LimitsSource::Caller => "caller",
        }
    }
}

/// The four limit diameters that the FED-STD-H28/2B stripping formulas use,
/// with the pitch. Millimetres.
///
/// The worst case for stripping is the smallest external thread in the
/// largest internal thread, hence minimum external and maximum internal
/// diameters.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct ThreadLimits {
    /// Pitch P, mm.
    pub pitch_mm: f32,
    /// Minimum major diameter of the external thread (screw), d_min, mm.
    pub ext_major_min_mm: f32,
    /// Minimum pitch diameter of the external thread, d2_min (Es,min), mm.
    pub ext_pitch_min_mm: f32,
    /// Maximum minor diameter of the internal thread (tapped hole or nut),
    /// D1_max (Kn,max), mm.
    pub int_minor_max_mm: f32,
    /// Maximum pitch diameter of the internal thread, D2_max (En,max), mm.
    pub int_pitch_max_mm: f32,
    /// Where the diameters come from.
    pub source: LimitsSource,
}

impl ThreadLimits {
    /// Limit diameters given by the caller (for example from a gauge report
    /// or a tolerance table), validated.
    ///
    /// # Errors
    /// Non-finite values; a pitch outside 0.1 to 10 mm; a major diameter
    /// outside 0.5 to 500 mm; an internal minor diameter outside
    /// (major − 2·P) to the external pitch diameter; an external pitch
    /// diameter or internal pitch diameter outside the internal minor to the
    /// external major diameter. Each error names the field and the range.
    pub fn new(
        pitch_mm: f32,
        ext_major_min_mm: f32,
        ext_pitch_min_mm: f32,
        int_minor_max_mm: f32,
        int_pitch_max_mm: f32,
    ) -> Result<ThreadLimits, Error> {
        let l = ThreadLimits {
            pitch_mm,
            ext_major_min_mm,
            ext_pitch_min_mm,
            int_minor_max_mm,
            int_pitch_max_mm,
            source: LimitsSource::Caller,
        };
        l.validate()?;
        Ok(l)
    }

    /// Checks the diameters of a value built field by field.
    ///
    /// # Errors
    /// As [`ThreadLimits::new`].
    pub fn validate(&self) -> Result<(), Error> {
        let p = Error::check(Field::ThreadLimitsPitchMm, self.pitch_mm, 0.1, 10.0)?;
        let d = Error::check(
            Field::ThreadLimitsExtMajorMinMm,
            self.ext_major_min_mm,
            0.5,
            500.0,
        )?;
        // The pitch diameter must lie between the minor and major diameters;
        // check the pitch diameter against the major first so the minor
        // diameter's own range is well defined.
        let d2 = Error::check(
            Field::ThreadLimitsExtPitchMinMm,
            self.ext_pitch_min_mm,
            d - 2.0 * p,
            d,
        )?;
        let d1 = Error::check(
            Field::ThreadLimitsIntMinorMaxMm,
            self.int_minor_max_mm,
            d - 2.0 * p,
            d2,
        )?;
        Error::check(
            Field::ThreadLimitsIntPitchMaxMm,
            self.int_pitch_max_mm,
            d1,
            d,
        )?;
        Ok(())
    }
}

/// One ISO metric coarse thread size: nominal diameter and pitch (ISO 261 /
/// ISO 262 coarse series), with optional tabulated 6g/6H limits.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct IsoThread {
    /// Designation, e.g. `"M10"`.
    pub name: &'static str,
    /// Nominal (basic major) diameter d = D, mm.
    pub nominal_mm: f32,
    /// Coarse pitch P, mm.
    pub pitch_mm: f32,
    /// 6g/6H limits `[d_min, d2_min, D1_max, D2_max]` in mm where tabulated.
    class_6g6h_mm: Option<[f32; 4]>,
}

const fn size(name: &'static str, nominal_mm: f32, pitch_mm: f32) -> IsoThread {
    IsoThread {
        name,
        nominal_mm,
        pitch_mm,
        class_6g6h_mm: None,
    }
}

/// The tabulated coarse sizes, smallest first.
///
/// Pitches: ISO 261 coarse series (M3 0.5, M4 0.7, M5 0.8, M6 1, M8 1.25,
/// M10 1.5, M12 1.75, M16 2, M20 2.5, checked against Yamawa's published
/// tap tables and the ISO 898-1 reproductions by Optimas and usefastener;
/// M14 2, M18 2.5, M24 3 from memory).
///
/// 6g/6H limits:
/// - M6: d_min 5.794 (confirmed, ISO 965 table reproduction); D2_max 5.500,
///   d2_min 5.212 and D1_max 5.153 from memory (ISO 965-2), consistent with
///   the ISO 965-1 tolerance grades.
/// - M10: d_min 9.732, d2_min 8.862, D1_max 8.676, D2_max 9.206 (checked:
///   the icad.pl ISO thread calculator and the CRC handbook worked example,
///   DOI 10.1201/9781482273786-99).
pub const TABLE: [IsoThread; 12] = [
    size("M3", 3.0, 0.5),
    size("M4", 4.0, 0.7),
    size("M5", 5.0, 0.8),
    IsoThread {
        name: "M6",
        nominal_mm: 6.0,
        pitch_mm: 1.0,
        class_6g6h_mm: Some([5.794, 5.212, 5.153, 5.500]),
    },
    size("M8", 8.0, 1.25),
    IsoThread {
        name: "M10",
        nominal_mm: 10.0,
        pitch_mm: 1.5,
        class_6g6h_mm: Some([9.732, 8.862, 8.676, 9.206]),
    },
    size("M12", 12.0, 1.75),
    size("M14", 14.0, 2.0),
    size("M16", 16.0, 2.0),
    size("M18", 18.0, 2.5),
    size("M20", 20.0, 2.5),
    size("M24", 24.0, 3.0),
];

/// Smallest tabulated nominal diameter, mm.
pub const MIN_NOMINAL_MM: f32 = 3.0;
/// Largest tabulated nominal diameter, mm.
pub const MAX_NOMINAL_MM: f32 = 24.0;

impl IsoThread {
    /// The coarse size with nominal diameter `nominal_mm` (within 0.01 mm).
    ///
    /// # Errors
    /// [`ErrorKind::NotFinite`]; [`ErrorKind::OutOfRange`] outside
    /// [`MIN_NOMINAL_MM`] to [`MAX_NOMINAL_MM`]; [`ErrorKind::Unreachable`] on
    /// field `thread.nominal_mm` for a diameter inside that range that is not
    /// in [`TABLE`] (for example 7 mm): build [`ThreadLimits`] yourself then.
    pub fn by_nominal_mm(nominal_mm: f32) -> Result<IsoThread, Error> {
        let d = Error::check(
            Field::ThreadNominalMm,
            nominal_mm,
            MIN_NOMINAL_MM,
            MAX_NOMINAL_MM,
        )?;
        TABLE
            .iter()
            .find(|t| (t.nominal_mm - d).abs() < 0.01)
            .copied()
            .ok_or(Error {
                kind: ErrorKind::Unreachable,
                field: Field::ThreadNominalMm,
                index: None,
                value: d,
                min: MIN_NOMINAL_MM,
                max: MAX_NOMINAL_MM,
            })
    }

    /// The coarse size named `name`: `"M10"`, `"m10"`, or with the coarse
    /// pitch spelled out, `"M10x1.5"` (also `X` or `×`). Surrounding spaces
    /// are ignored.
    ///
    /// # Errors
    /// [`ErrorKind::NotFinite`] on field `thread.name` when the name is not
    /// `M` followed by a number; as [`IsoThread::by_nominal_mm`] for an
    /// unknown size; [`ErrorKind::OutOfRange`] on `thread.name.pitch_mm` when
    /// a pitch is given that is not the coarse pitch (fine threads are not
    /// tabulated; build [`ThreadLimits`] for them).
    pub fn by_name(name: &str) -> Result<IsoThread, Error> {
        let not_a_name = Error::new(ErrorKind::NotFinite, Field::ThreadName);
        let s = name.trim();
        let s = s
            .strip_prefix('M')
            .or_else(|| s.strip_prefix('m'))
            .ok_or(not_a_name)?;
        let (dia, pitch) = match s.find(['x', 'X', '×']) {
            Some(i) => {
                let (a, b) = s.split_at(i);
                let b = b.trim_start_matches(['x', 'X', '×']);
                (a, Some(b))
            }
            None => (s, None),
        };
        let d: f32 = dia.trim().parse().map_err(|_| not_a_name)?;
        let t = IsoThread::by_nominal_mm(d)?;
        if let Some(b) = pitch {
            let p: f32 = b.trim().parse().map_err(|_| not_a_name)?;
            if (p - t.pitch_mm).abs() > 1e-3 {
                return Err(Error {
                    kind: ErrorKind::OutOfRange,
                    field: Field::ThreadNamePitchMm,
                    index: None,
                    value: p,
                    min: t.pitch_mm,
                    max: t.pitch_mm,
                });
            }
        }
        Ok(t)
    }

    /// Height of the fundamental triangle H = 0.866025·P, mm (ISO 68-1).
    #[must_use]
    pub fn fundamental_height_mm(&self) -> f32 {
        0.866_025 * self.pitch_mm
    }

    /// Basic pitch diameter d2 = D2 = d − 0.649519·P, mm (ISO 68-1).
    #[must_use]
    pub fn pitch_diameter_mm(&self) -> f32 {
        self.nominal_mm - 0.649_519 * self.pitch_mm
    }

    /// Basic minor diameter of the internal thread D1 = d1 = d − 1.082532·P,
    /// mm (ISO 68-1).
    #[must_use]
    pub fn internal_minor_diameter_mm(&self) -> f32 {
        self.nominal_mm - 1.082_532 * self.pitch_mm
    }

    /// Minor diameter of the external thread at the root, d3 = d − 1.226869·P,
    /// mm (ISO 898-1 / ISO 724 with root radius H/6). The section a threaded
    /// shaft bends on.
    #[must_use]
    pub fn external_minor_diameter_mm(&self) -> f32 {
        self.nominal_mm - 1.226_869 * self.pitch_mm
    }

    /// Nominal tensile stress area As = π/4·(d − 0.938194·P)², mm² (ISO 898-1).
    #[must_use]
    pub fn tensile_stress_area_mm2(&self) -> f32 {
        let d0 = self.nominal_mm - 0.938_194 * self.pitch_mm;
        PI / 4.0 * d0 * d0
    }

    /// Limits of the basic profile (no tolerance allowance): d_min = d,
    /// d2_min = D2_max = d2, D1_max = D1. See [`LimitsSource::BasicProfile`].
    #[must_use]
    pub fn basic_limits(&self) -> ThreadLimits {
        ThreadLimits {
            pitch_mm: self.pitch_mm,
            ext_major_min_mm: self.nominal_mm,
            ext_pitch_min_mm: self.pitch_diameter_mm(),
            int_minor_max_mm: self.internal_minor_diameter_mm(),
            int_pitch_max_mm: self.pitch_diameter_mm(),
            source: LimitsSource::BasicProfile,
        }
    }

    /// Tolerance class 6g/6H limits where [`TABLE`] has them (M6, M10),
    /// otherwise `None`.
    #[must_use]
    pub fn class_6g6h_limits(&self) -> Option<ThreadLimits> {
        self.class_6g6h_mm.map(|[d, d2, d1, dd2]| ThreadLimits {
            pitch_mm: self.pitch_mm,
            ext_major_min_mm: d,
            ext_pitch_min_mm: d2,
            int_minor_max_mm: d1,
            int_pitch_max_mm: dd2,
            source: LimitsSource::Class6g6H,
        })
    }

    /// The best limits the table has: 6g/6H where tabulated, otherwise the
    /// basic profile. Check [`ThreadLimits::source`] to see which.
    #[must_use]
    pub fn limits(&self) -> ThreadLimits {
        self.class_6g6h_limits()
            .unwrap_or_else(|| self.basic_limits())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_table_entry_has_valid_limits() {
        for t in TABLE {
            t.basic_limits().validate().unwrap();
            t.limits().validate().unwrap();
        }
    }

    #[test]
    fn table_is_sorted_and_names_match_diameters() {
        for w in TABLE.windows(2) {
            assert!(w[0].nominal_mm < w[1].nominal_mm);
        }
        for t in TABLE {
            assert_eq!(IsoThread::by_name(t.name).unwrap(), t);
        }
    }

    #[test]
    fn name_forms() {
        assert!((IsoThread::by_name(" m8 ").unwrap().pitch_mm - 1.25).abs() < 1e-6);
        assert_eq!(IsoThread::by_name("M10x1.5").unwrap().name, "M10");
        assert_eq!(IsoThread::by_name("M10×1.5").unwrap().name, "M10");
        let e = IsoThread::by_name("M10x1.25").unwrap_err();
        assert_eq!(e.field, Field::ThreadNamePitchMm);
        assert_eq!(
            IsoThread::by_name("10").unwrap_err().field,
            Field::ThreadName
        );
        assert_eq!(
            IsoThread::by_name("Mx").unwrap_err().field,
            Field::ThreadName
        );
        assert_eq!(
            IsoThread::by_name("M7").unwrap_err().kind,
            ErrorKind::Unreachable
        );
        assert_eq!(
            IsoThread::by_name("M30").unwrap_err().kind,
            ErrorKind::OutOfRange
        );
    }

    #[test]
    fn limits_reject_inverted_diameters() {
        // Internal minor diameter larger than the external pitch diameter.
        let e = ThreadLimits::new(1.5, 9.732, 8.862, 9.0, 9.206).unwrap_err();
        assert_eq!(e.field, Field::ThreadLimitsIntMinorMaxMm);
        let e = ThreadLimits::new(f32::NAN, 9.732, 8.862, 8.676, 9.206).unwrap_err();
        assert_eq!(e.kind, ErrorKind::NotFinite);
    }
}
