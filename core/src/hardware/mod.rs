//! Counterweight hardware checks: ISO metric threads, thread stripping, the
//! most loaded screw of a bolt pattern, bending at the root of a threaded
//! shaft, and a small table of materials.
//!
//! **Units in this module.** Unlike the rest of the crate, which works in
//! metres, fastener work is done in the units of the thread standards and
//! handbooks it follows, and every name says which:
//!
//! - lengths and diameters in millimetres (`_mm`), areas in mm² (`_mm2`),
//!   section moduli in mm³ (`_mm3`);
//! - stresses and strengths in MPa (`_mpa`, which is N/mm²);
//! - forces in newtons (`_n`) and moments in newton-metres (`_nm`), as in the
//!   rest of the crate. Where a moment meets a length in mm the code converts
//!   with 1 N·m = 1000 N·mm;
//! - the only inputs in metres are counterweight lever arms taken from the rig
//!   geometry (`lever_arm_m` in [`bolt::ShaftLoad`]).
//!
//! **Caution.** Thread shear areas are geometric upper bounds: thread
//! bending, nut dilation and uneven load sharing make real stripping loads
//! lower (Alexander 1977; VDI 2230). The bolt-group rule assumes a rigid
//! flange. Material values are listed minimums or typical handbook values;
//! use the certificate of the part you have. These are estimates: secure the
//! rig anyway, stay inside the mount maker's limits and defer to local codes
//! and licensed engineers.

pub mod bolt;
pub mod material;
pub mod shaft;
pub mod strip;
pub mod thread;

pub use bolt::{BoltGroupResult, BoltPattern, JointLoad, PivotLine, ShaftLoad};
pub use material::{Material, StrengthBasis};
pub use shaft::{ShaftBendingResult, ShaftSection};
pub use strip::{FailureMode, ShearFactor, StrippingInput, StrippingResult, ThreadSide};
pub use thread::{IsoThread, LimitsSource, ThreadLimits};
