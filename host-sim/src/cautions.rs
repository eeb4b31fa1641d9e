//! The cautions every result a person reads carries (README.md, "Cautions"):
//! the model is an estimate, secure the rig anyway, stay inside the mount
//! maker's limits, defer to local codes and licensed engineers. Written once
//! here; the text summary, the JSON, the HTML pages, the bridge's standard
//! error, the command's help and the starter rig files all take them from
//! this module.

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

/// [`CAUTION`] broken into lines of at most `width` characters at spaces
/// (a word longer than `width` gets a line of its own), for comments in
/// files the command writes.
#[must_use]
pub fn caution_lines(width: usize) -> Vec<String> {
    let mut lines: Vec<String> = Vec::new();
    for word in CAUTION.split(' ') {
        match lines.last_mut() {
            Some(l) if l.chars().count() + 1 + word.chars().count() <= width => {
                l.push(' ');
                l.push_str(word);
            }
            _ => lines.push(word.to_owned()),
        }
    }
    lines
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn caution_lines_keep_every_word_within_the_width() {
        let lines = caution_lines(74);
        assert_eq!(lines.join(" "), CAUTION);
        assert!(lines.iter().all(|l| l.chars().count() <= 74), "{lines:?}");
        assert_eq!(
            lines[0],
            "Caution: Standfast's figures are estimates from a simplified static model."
        );
        // A word longer than the width stands alone.
        assert!(caution_lines(5).contains(&"Standfast's".to_owned()));
    }
}
