//! Values that remember where they were written, and validation errors that
//! name file, line, column, key, value and the accepted range.
//!
//! A configuration file is read into a [`SourceText`]; its structs use
//! [`toml::Spanned`] for the values that are validated afterwards; a
//! [`Checker`] turns a span into a [`Location`] and builds [`InputError`]s:
//!
//! ```text
//! rig.toml:12:10: payload.mass = "18 lbs x": unknown unit "lbs x" for a mass (units: kg, g, t, lb, oz)
//! ```

use core::ops::Range;
use std::path::Path;

use serde::de::DeserializeOwned;
use toml::Spanned;

pub use crate::input::bounded::{
    bounded, bounded_bytes, bounded_to, ECHO_CHARS, MAX_PROBLEM_CHARS,
};
pub use crate::input::error::{FileError, InputError, Location};
use crate::input::units::{Dim, Dimension, Quantity, Unit};

/// A value with the place it was written.
#[derive(Clone, Debug, PartialEq)]
pub struct Located<T> {
    /// The value.
    pub value: T,
    /// Where it was written.
    pub at: Location,
}

/// The text of a configuration file with its name and line index.
#[derive(Clone, Debug)]
pub struct SourceText {
    name: String,
    text: String,
    line_starts: Vec<usize>,
}

impl SourceText {
    /// Wraps `text` read from a file called `name`.
    #[must_use]
    pub fn new(name: impl Into<String>, text: impl Into<String>) -> SourceText {
        let text = text.into();
        let mut line_starts = vec![0];
        line_starts.extend(text.match_indices('\n').map(|(i, _)| i + 1));
        SourceText {
            name: name.into(),
            text,
            line_starts,
        }
    }

    /// Reads a file.
    ///
    /// # Errors
    /// [`FileError::Io`] when the file cannot be read; [`FileError::Input`]
    /// naming the line and column when it is not UTF-8 text.
    pub fn read(path: &Path) -> Result<SourceText, FileError> {
        let bytes = std::fs::read(path).map_err(|e| FileError::io(path, e))?;
        let name = path.display().to_string();
        match String::from_utf8(bytes) {
            Ok(text) => Ok(SourceText::new(name, text)),
            Err(e) => {
                let good = e.utf8_error().valid_up_to();
                let head = String::from_utf8_lossy(e.as_bytes().get(..good).unwrap_or_default())
                    .into_owned();
                let at = SourceText::new(name, head).location(good);
                Err(FileError::Input(InputError {
                    at: Some(at),
                    key: None,
                    value: None,
                    problem: "the file is not UTF-8 text (accepted: UTF-8, which includes ASCII)"
                        .to_owned(),
                }))
            }
        }
    }

    /// The file name.
    #[must_use]
    pub fn name(&self) -> &str {
        &self.name
    }

    /// The whole text.
    #[must_use]
    pub fn text(&self) -> &str {
        &self.text
    }

    /// The text of a byte span (empty when the span is not in the text).
    #[must_use]
    pub fn slice(&self, span: Range<usize>) -> &str {
        self.text.get(span).unwrap_or("")
    }

    /// Line and column of a byte offset.
    #[must_use]
    pub fn location(&self, offset: usize) -> Location {
        let offset = offset.min(self.text.len());
        let line_idx = match self.line_starts.binary_search(&offset) {
            Ok(i) => i,
            Err(i) => i.saturating_sub(1),
        };
        let start = self.line_starts.get(line_idx).copied().unwrap_or(0);
        let column = self
            .text
            .get(start..offset)
            .map_or(0, |s| s.chars().count())
            + 1;
        Location {
            file: self.name.clone(),
            line: line_idx + 1,
            column,
        }
    }

    /// The text of line `line` (1-based), without its line break.
    #[must_use]
    pub fn line(&self, line: usize) -> &str {
        let Some(start) = line
            .checked_sub(1)
            .and_then(|i| self.line_starts.get(i))
            .copied()
        else {
            return "";
        };
        let end = self
            .line_starts
            .get(line)
            .copied()
            .unwrap_or(self.text.len());
        self.text
            .get(start..end)
            .unwrap_or("")
            .trim_end_matches(['\n', '\r'])
    }

    /// The key written before the value at `offset` on the same line
    /// (`wind_speed` in `wind_speed = "3 km/h"`, `unit` in
    /// `{ column = "a", unit = "x" }`), when there is one.
    #[must_use]
    pub fn key_before(&self, offset: usize) -> Option<String> {
        let at = self.location(offset);
        let line = self.line(at.line);
        let head: String = line.chars().take(at.column.saturating_sub(1)).collect();
        let before_eq = head.trim_end().strip_suffix('=')?.trim_end();
        let key: String = before_eq
            .chars()
            .rev()
            .take_while(|c| c.is_alphanumeric() || matches!(c, '_' | '-' | '.' | '"'))
            .collect::<Vec<_>>()
            .into_iter()
            .rev()
            .collect();
        let key = key.trim_matches('"').to_owned();
        (!key.is_empty()).then_some(key)
    }

    /// The table a line belongs to, as a dotted path with the index of
    /// each array of tables (`body[1]`, `log.file[0].columns`), from the
    /// headers above it; empty at the top level.
    #[must_use]
    pub fn table_path(&self, line: usize) -> String {
        let mut counts: std::collections::HashMap<String, usize> = std::collections::HashMap::new();
        let mut current = String::new();
        for l in 1..line {
            let t = self.line(l).trim();
            let (is_array, inner) = if let Some(r) = t.strip_prefix("[[") {
                (true, r.split("]]").next().unwrap_or(""))
            } else if let Some(r) = t.strip_prefix('[') {
                (false, r.split(']').next().unwrap_or(""))
            } else {
                continue;
            };
            let parts: Vec<String> = inner
                .split('.')
                .map(|p| p.trim().trim_matches('"').to_owned())
                .collect();
            let name = parts.join(".");
            if is_array {
                *counts.entry(name.clone()).or_insert(0) += 1;
                // A new element resets the counts of arrays inside it.
                let prefix = format!("{name}.");
                counts.retain(|k, _| !k.starts_with(&prefix));
            }
            let mut path = String::new();
            let mut so_far = String::new();
            for (i, p) in parts.iter().enumerate() {
                if i > 0 {
                    so_far.push('.');
                    path.push('.');
                }
                so_far.push_str(p);
                path.push_str(p);
                if let Some(n) = counts.get(&so_far) {
                    path.push_str(&format!("[{}]", n.saturating_sub(1)));
                }
            }
            current = path;
        }
        current
    }

    /// The inline tables open at `offset` on its line (`tripod` in
    /// `tripod = { leg_spread = "x" }`), outermost first.
    fn inline_tables(&self, offset: usize) -> Vec<String> {
        let at = self.location(offset);
        let line = self.line(at.line);
        let head: String = line.chars().take(at.column.saturating_sub(1)).collect();
        let mut stack: Vec<String> = Vec::new();
        let mut in_string = false;
        let mut last_key = String::new();
        let mut word = String::new();
        for c in head.chars() {
            if c == '"' {
                in_string = !in_string;
                continue;
            }
            if in_string {
                continue;
            }
            match c {
                '=' => last_key = word.trim().trim_matches('"').to_owned(),
                '{' => stack.push(std::mem::take(&mut last_key)),
                '}' => {
                    stack.pop();
                }
                _ => {}
            }
            if c.is_alphanumeric() || matches!(c, '_' | '-' | '.') {
                word.push(c);
            } else if !c.is_whitespace() {
                word.clear();
            } else if !word.is_empty() && c.is_whitespace() {
                // A space ends a word only before something else starts.
            }
            if matches!(c, ',' | '{' | '[') {
                word.clear();
            }
        }
        stack.retain(|k| !k.is_empty());
        stack
    }

    /// The full dotted key of the value at `offset` (section, inline
    /// tables, key: `body[1].mass`, `support.tripod.leg_spread`), when a key
    /// is written before it on its line.
    #[must_use]
    pub fn full_key_before(&self, offset: usize) -> Option<String> {
        let leaf = self.key_before(offset)?;
        Some(self.full_key(offset, &leaf))
    }

    /// `leaf` prefixed by the table and inline tables open at `offset`.
    fn full_key(&self, offset: usize, leaf: &str) -> String {
        let at = self.location(offset);
        // On a table header, the header names the table itself.
        let here = self.line(at.line).trim();
        if here.starts_with('[') {
            let inner = here.trim_start_matches('[');
            let inner = inner.split(']').next().unwrap_or(inner).trim();
            if inner.ends_with(leaf) {
                return inner.to_owned();
            }
        }
        let mut parts: Vec<String> = Vec::new();
        let table = self.table_path(at.line);
        if !table.is_empty() {
            parts.push(table);
        }
        parts.extend(self.inline_tables(offset));
        parts.push(leaf.to_owned());
        parts.join(".")
    }

    /// Deserialises the whole text as TOML into `T`; a syntax or type error
    /// is located and names the full key where it can; an unknown key is
    /// named with the nearest accepted one.
    ///
    /// # Errors
    /// [`InputError`] with the file, line, column, key and the parser's
    /// message.
    pub fn parse_toml<T: DeserializeOwned>(&self) -> Result<T, InputError> {
        toml::from_str(&self.text).map_err(|e| {
            let span = e.span();
            let message = e.message().trim().to_owned();
            if let (Some(s), Some((unknown, accepted))) = (&span, unknown_field(&message)) {
                let key = self.full_key(s.start, &unknown);
                let hint = match nearest(&unknown, &accepted) {
                    Some(n) => format!("; did you mean `{n}`?"),
                    None => String::new(),
                };
                return InputError {
                    at: Some(self.location(s.start)),
                    key: Some(key),
                    value: None,
                    problem: format!("unknown key{hint} (accepted here: {})", accepted.join(", ")),
                };
            }
            let (at, key, value) = match span {
                Some(s) => {
                    let value = self.slice(s.clone()).trim().to_owned();
                    let key = self.full_key_before(s.start);
                    let value = (key.is_some() && !value.is_empty() && !value.contains('\n'))
                        .then_some(value);
                    (Some(self.location(s.start)), key, value)
                }
                None => (None, None, None),
            };
            InputError {
                at: at.or_else(|| {
                    Some(Location {
                        file: self.name.clone(),
                        line: 1,
                        column: 1,
                    })
                }),
                key,
                value,
                problem: message,
            }
        })
    }

    /// A [`Checker`] over this text.
    #[must_use]
    pub fn checker(&self) -> Checker<'_> {
        Checker { src: self }
    }
}

/// Validation helpers that build located errors.
#[derive(Clone, Copy, Debug)]
pub struct Checker<'a> {
    src: &'a SourceText,
}

impl Checker<'_> {
    /// The source being checked.
    #[must_use]
    pub fn source(&self) -> &SourceText {
        self.src
    }

    /// Where a spanned value was written.
    #[must_use]
    pub fn locate<T: Clone>(&self, v: &Spanned<T>) -> Located<T> {
        Located {
            value: v.get_ref().clone(),
            at: self.src.location(v.span().start),
        }
    }

    /// An error about the value at `span`, shown as written in the file.
    #[must_use]
    pub fn error(&self, key: &str, span: Range<usize>, problem: impl Into<String>) -> InputError {
        let value = self.src.slice(span.clone()).trim().to_owned();
        InputError {
            at: Some(self.src.location(span.start)),
            key: Some(key.to_owned()),
            value: (!value.is_empty()).then_some(value),
            problem: problem.into(),
        }
    }

    /// Checks that a quantity lies within `[min, max]`; the message states
    /// the range in `show_unit` (a unit of `D`).
    ///
    /// # Errors
    /// [`InputError`] naming the key, value and accepted range.
    pub fn range<D: Dimension>(
        &self,
        key: &str,
        v: &Spanned<Quantity<D>>,
        min: Quantity<D>,
        max: Quantity<D>,
        show_unit: &str,
    ) -> Result<Quantity<D>, InputError> {
        let q = *v.get_ref();
        if q.si().is_finite() && q >= min && q <= max {
            return Ok(q);
        }
        let unit = D::DIM.unit(show_unit).unwrap_or_else(|_| D::DIM.si_unit());
        Err(self.error(
            key,
            v.span(),
            format!(
                "outside the accepted range {} to {} {} (this value is {} {})",
                fmt_g(unit.from_si(min.si())),
                fmt_g(unit.from_si(max.si())),
                unit.symbol(),
                fmt_g(unit.from_si(q.si())),
                unit.symbol()
            ),
        ))
    }

    /// Checks that a plain number lies within `[min, max]`.
    ///
    /// # Errors
    /// [`InputError`] naming the key, value and accepted range.
    pub fn range_f64(
        &self,
        key: &str,
        v: &Spanned<f64>,
        min: f64,
        max: f64,
    ) -> Result<f64, InputError> {
        let x = *v.get_ref();
        if x.is_finite() && x >= min && x <= max {
            Ok(x)
        } else {
            Err(self.error(
                key,
                v.span(),
                format!(
                    "outside the accepted range {} to {}",
                    fmt_g(min),
                    fmt_g(max)
                ),
            ))
        }
    }

    /// Looks up a unit spelling for dimension `dim`.
    ///
    /// # Errors
    /// [`InputError`] naming the accepted units.
    pub fn unit(&self, key: &str, v: &Spanned<String>, dim: Dim) -> Result<Unit, InputError> {
        dim.unit(v.get_ref())
            .map_err(|e| self.error(key, v.span(), e.to_string()))
    }

    /// Checks that a string is one of `allowed`.
    ///
    /// # Errors
    /// [`InputError`] listing the allowed words.
    pub fn one_of<'w>(
        &self,
        key: &str,
        v: &Spanned<String>,
        allowed: &[&'w str],
    ) -> Result<&'w str, InputError> {
        allowed
            .iter()
            .find(|a| a.eq_ignore_ascii_case(v.get_ref()))
            .copied()
            .ok_or_else(|| {
                self.error(
                    key,
                    v.span(),
                    format!("not one of the accepted values: {}", allowed.join(", ")),
                )
            })
    }
}

/// The unknown name and the accepted ones of serde's "unknown field `x`,
/// expected one of `a`, `b`" (or "expected `a` or `b`", "expected `a`").
fn unknown_field(message: &str) -> Option<(String, Vec<String>)> {
    let rest = message.strip_prefix("unknown field `")?;
    let (name, rest) = rest.split_once('`')?;
    let accepted = rest
        .split('`')
        .skip(1)
        .step_by(2)
        .map(str::to_owned)
        .collect();
    Some((name.to_owned(), accepted))
}

/// Edit distance (Levenshtein) between two short words, in characters.
#[must_use]
pub fn edit_distance(a: &str, b: &str) -> usize {
    let b: Vec<char> = b.chars().collect();
    let mut prev: Vec<usize> = (0..=b.len()).collect();
    let mut cur = vec![0; b.len() + 1];
    for (i, ca) in a.chars().enumerate() {
        if let Some(c0) = cur.first_mut() {
            *c0 = i + 1;
        }
        for (j, cb) in b.iter().enumerate() {
            let sub = prev.get(j).copied().unwrap_or(0) + usize::from(ca != *cb);
            let del = prev.get(j + 1).copied().unwrap_or(0) + 1;
            let ins = cur.get(j).copied().unwrap_or(0) + 1;
            if let Some(c) = cur.get_mut(j + 1) {
                *c = sub.min(del).min(ins);
            }
        }
        std::mem::swap(&mut prev, &mut cur);
    }
    prev.last().copied().unwrap_or(0)
}

/// The accepted word nearest to `word` (case-insensitive edit distance at
/// most a third of its length, at least 2), if any.
#[must_use]
pub fn nearest<'a>(word: &str, accepted: &'a [String]) -> Option<&'a str> {
    if word.chars().count() > 64 {
        return None;
    }
    let w = word.to_lowercase();
    let limit = (w.chars().count() / 3).max(2);
    accepted
        .iter()
        .map(|a| (edit_distance(&w, &a.to_lowercase()), a))
        .filter(|(d, _)| *d <= limit)
        .min_by_key(|(d, _)| *d)
        .map(|(_, a)| a.as_str())
}

/// Formats a number briefly for messages (up to 6 decimals, no trailing
/// zeros; exponent form from 10¹² up, so a huge value stays short).
#[must_use]
pub fn fmt_g(x: f64) -> String {
    if x == 0.0 || !x.is_finite() {
        return format!("{x}");
    }
    if x.abs() >= 1e12 {
        return format!("{x:e}");
    }
    let s = format!("{x:.6}");
    let s = s.trim_end_matches('0').trim_end_matches('.');
    if s == "0" || s == "-0" || s.is_empty() {
        format!("{x:e}")
    } else {
        s.to_owned()
    }
}
