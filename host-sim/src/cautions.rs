//! The cautions every result a person reads carries (README.md, "Cautions"):
//! the model is an estimate, secure the rig anyway, stay inside the mount
//! maker's limits, defer to local codes and licensed engineers. Written once
//! here; the text summary, the JSON, the HTML pages, the bridge's standard
//! error and the command's help all take them from this module.

/// The cautions that end every report a person reads, one sentence each.
pub const CAUTIONS: &[&str] = &[
    "The figures are estimates from a simplified static model, not a guarantee.",
    "Secure the rig anyway: ballast and tie-downs; a cover keeps weather out but catches wind, so count it in.",
    "Stay inside the mount maker's load and torque limits whatever these figures say.",
    "Defer to local codes and to licensed engineers for anything that can hurt people or property.",
];

/// The cautions in one paragraph, as a string literal (for `concat!`).
macro_rules! caution_paragraph {
    () => {
        "Caution: Standfast's figures are estimates from a simplified static model. \
Secure the rig anyway, stay inside the mount maker's limits, and defer to local codes and licensed engineers."
    };
}
pub(crate) use caution_paragraph;

/// The cautions in one paragraph (the command's help ends with it).
pub const CAUTION: &str = caution_paragraph!();
