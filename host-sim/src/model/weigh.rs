//! `standfast weigh`: the centre of gravity of a whole rig from scale
//! readings under its feet (level, lifted on one side, tilted until a foot
//! unloads), computed by the core (`standfast::weighing`), compared with the
//! centre the rig file's bodies imply, and optionally written into a copy of
//! the rig file as a `[measured]` section that the other commands use.
//!
//! The weighing file is read and checked by [`crate::input::weighing`]
//! (its format is there).

use serde::Serialize;
use standfast::weighing::{self, MeasuredCentre, Weighing};

use crate::input::located::{InputError, SourceText};
use crate::input::rigfile::LoadedRig;
use crate::input::weighing::{core_error, read};

pub use crate::input::weighing::{DEFAULT_ANGLE_UNCERTAINTY_DEG, DEFAULT_HEIGHT_UNCERTAINTY_M};

/// What `weigh` reports.
#[derive(Clone, Debug, Serialize)]
pub struct WeighReport {
    /// The rig file.
    pub rig_file: String,
    /// The weighing file.
    pub weighing_file: String,
    /// Standard uncertainty of one reading used, N.
    pub reading_uncertainty_n: f32,
    /// The core's result (masses kg, lengths m, angles rad).
    pub result: MeasuredCentre,
    /// Centre of gravity the rig file's bodies imply, home pose, level, cover
    /// off, rig frame, m.
    pub modelled_centre_m: [f32; 3],
    /// Mass the bodies imply, kg.
    pub modelled_mass_kg: f32,
    /// Weighed minus modelled centre (height only when measured), m.
    pub difference_m: [Option<f32>; 3],
    /// Rig file written with the `[measured]` section, if asked.
    pub written: Option<String>,
    /// The cautions.
    pub cautions: Vec<&'static str>,
}

/// Reads a weighing file and computes the centre of gravity.
///
/// # Errors
/// [`InputError`] naming the file, key and accepted range.
pub fn measure(rig: &LoadedRig, src: &SourceText) -> Result<WeighReport, InputError> {
    let support = rig.rig.support();
    let input = read(src, support.feet().len())?;
    let w = Weighing {
        level_n: &input.level_n,
        reading_uncertainty_n: input.reading_uncertainty_n,
        lift: input
            .lift
            .as_ref()
            .map(|(geometry, loads_n)| weighing::Lift {
                geometry: *geometry,
                loads_n,
            }),
        tip: input.tip,
    };
    let spans = &input.spans;
    let result =
        weighing::centre_from_weighing(support, &w).map_err(|e| core_error(src, &e, spans))?;
    let placement = rig
        .rig
        .place(rig.rig.mount().home_pose(), standfast::Tilt::LEVEL, false)
        .map_err(|e| core_error(src, &e, spans))?;
    let modelled = placement.centre_of_gravity_m();
    let measured_h = result.height_m.map(|h| h.value);
    Ok(WeighReport {
        rig_file: rig.file.clone(),
        weighing_file: src.name().to_owned(),
        reading_uncertainty_n: input.reading_uncertainty_n,
        result,
        modelled_centre_m: modelled.to_array(),
        modelled_mass_kg: placement.mass_kg(),
        difference_m: [
            Some(result.x_m.value - modelled.x),
            Some(result.y_m.value - modelled.y),
            measured_h.map(|h| h - modelled.z),
        ],
        written: None,
        cautions: crate::cautions::CAUTIONS.to_vec(),
    })
}
