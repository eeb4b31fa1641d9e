//! Text from a file or a person, bounded for messages: control characters
//! escaped, cut after a limit with the length in bytes added. The bottom of
//! the input layer: everything that quotes input in a message uses it.

/// Most characters of a value written by a person (or a program) that a
/// message repeats; longer values are cut and their length in bytes given.
pub const ECHO_CHARS: usize = 60;

/// Most characters of the problem part of a message (which may quote a
/// parser's message, itself quoting the input).
pub const MAX_PROBLEM_CHARS: usize = 600;

/// `text` for a message: control characters escaped (`\u{1b}`), cut after
/// [`ECHO_CHARS`] characters with its length in bytes added
/// (`"aaaa…" (20000000 bytes)`).
#[must_use]
pub fn bounded(text: &str) -> String {
    bounded_to(text, ECHO_CHARS)
}

/// As [`bounded`] with a limit of `max_chars`.
#[must_use]
pub fn bounded_to(text: &str, max_chars: usize) -> String {
    let mut out = String::with_capacity(text.len().min(max_chars + 32));
    let mut cut = false;
    // Counted in characters written, so escapes (6 for `\u{7f}`) count in
    // full and the limit holds whatever the text.
    let mut n = 0;
    for c in text.chars() {
        let width = if c.is_control() {
            c.escape_default().count()
        } else {
            1
        };
        if n + width > max_chars {
            cut = true;
            break;
        }
        n += width;
        if c.is_control() {
            out.extend(c.escape_default());
        } else {
            out.push(c);
        }
    }
    if cut {
        out.push_str(&format!("… ({} bytes)", text.len()));
    }
    out
}

/// As [`bounded`] for bytes that may not be UTF-8 (invalid sequences shown
/// as U+FFFD).
#[must_use]
pub fn bounded_bytes(bytes: &[u8]) -> String {
    let head = bytes
        .get(..bytes.len().min(ECHO_CHARS * 4))
        .unwrap_or(bytes);
    let text = String::from_utf8_lossy(head);
    let b = bounded(&text);
    if head.len() < bytes.len() && !b.ends_with(" bytes)") {
        format!("{b}… ({} bytes)", bytes.len())
    } else if head.len() < bytes.len() {
        // Cut by characters already; give the whole length.
        match b.rfind("… (") {
            Some(i) => format!("{}… ({} bytes)", b.get(..i).unwrap_or(""), bytes.len()),
            None => b,
        }
    } else {
        b
    }
}
