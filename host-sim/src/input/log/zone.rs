//! The local zone offset the logs carry, for the report's wall-clock axes
//! (display only: the replay itself works in UTC throughout). Reads the
//! header and the first data row of each ISO 8601 log.

use std::io::{BufRead, BufReader};

use super::{FileProfile, LogProfile, TimeFormat};

/// The local offset the logs carry, seconds east of UTC: the first
/// ISO 8601 file (in profile order) whose profile sets a zone other than
/// UTC, or whose first data row writes an offset other than `Z`. `None`
/// when no file says (the report then shows UTC and says so). Only the
/// header and the first data row of each file are read; a file that cannot
/// be read here gives no offset (the replay reports its errors).
#[must_use]
pub fn written_offset_s(p: &LogProfile) -> Option<i32> {
    for f in &p.files {
        if f.time_format != TimeFormat::Iso8601 {
            continue;
        }
        if f.zone_offset_s != 0 {
            return Some(f.zone_offset_s);
        }
        if let Some(o) = first_row_offset(f) {
            if o != 0 {
                return Some(o);
            }
        }
    }
    None
}

/// The zone offset written in the first data row's time field, if any.
fn first_row_offset(f: &FileProfile) -> Option<i32> {
    let file = std::fs::File::open(&f.path).ok()?;
    let mut lines = BufReader::new(file).lines();
    let header = lines.next()?.ok()?;
    let delim = char::from(f.delimiter);
    let col = header
        .split(delim)
        .position(|h| h.trim().trim_matches('"') == f.time_column.value.as_str())?;
    let row = lines.next()?.ok()?;
    let field = row.split(delim).nth(col)?.trim().trim_matches('"');
    offset_in(field)
}

/// The zone offset at the end of an ISO 8601 time (`+01:00`, `-0530`,
/// `Z`), in seconds east of UTC; `None` when the time writes none.
#[must_use]
pub fn offset_in(field: &str) -> Option<i32> {
    if field.ends_with('Z') || field.ends_with('z') {
        return Some(0);
    }
    let t = field.find(['T', 't', ' '])?;
    let time = field.get(t + 1..)?;
    let at = time.rfind(['+', '-'])?;
    super::time::parse_offset(time.get(at..)?).ok()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn offsets_are_read_from_iso_times() {
        // ISO 8601-1:2019, 4.3.13: the offset follows the time of day.
        assert_eq!(offset_in("2025-11-14T22:00:00+01:00"), Some(3600));
        assert_eq!(offset_in("2025-11-14T22:00:00.5-05:30"), Some(-19_800));
        assert_eq!(offset_in("2025-11-14T22:00:00Z"), Some(0));
        assert_eq!(offset_in("2025-11-14T22:00:00"), None);
        assert_eq!(offset_in("2025-11-14"), None);
    }
}
