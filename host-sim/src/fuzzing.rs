//! Entry points for the fuzz targets in `host-sim/fuzz/` (cargo-fuzz) and
//! for the tests that replay their seed corpora on stable Rust.
//!
//! Each function feeds arbitrary bytes to one of the command's parsers and
//! **panics** when a promise is broken, which is how a fuzzer learns of it:
//! besides not panicking, hanging or overflowing by itself, every error
//! must name where it is (file and line, or the input line for the
//! bridge) and its message must stay bounded whatever the input's size
//! (values are echoed by [`crate::input::located::bounded`]).
//!
//! They are not used by the command itself.

use std::io::Read;
use std::path::Path;
use std::sync::OnceLock;

use crate::commands::bridge::{Answer, Bridge, InputFormat};
use crate::input::located::{FileError, InputError, SourceText, MAX_PROBLEM_CHARS};
use crate::input::log::{ErrorPolicy, LogError, LogProfile, Merger};
use crate::input::rigfile::LoadedRig;

/// Longest message an error may print, in characters: location, key and
/// value (each bounded), and the problem (at most [`MAX_PROBLEM_CHARS`]).
pub const MAX_MESSAGE_CHARS: usize = MAX_PROBLEM_CHARS + 400;

fn assert_bounded(message: &str) {
    let n = message.chars().count();
    assert!(
        n <= MAX_MESSAGE_CHARS,
        "a message of {n} characters (limit {MAX_MESSAGE_CHARS}): {}",
        message.chars().take(300).collect::<String>()
    );
}

fn assert_located(e: &InputError, file: &str) {
    let at =
        e.at.as_ref()
            .unwrap_or_else(|| panic!("an error without a location: {e}"));
    assert_eq!(at.file, file, "{e}");
    assert!(at.line >= 1 && at.column >= 1, "{e}");
    assert_bounded(&e.to_string());
}

/// The rig-file loader on arbitrary text: a rig, or an error naming the
/// file, line and column, bounded.
///
/// # Panics
/// When a promise is broken (see the module docs).
pub fn rig_file(data: &[u8]) {
    let text = String::from_utf8_lossy(data);
    let src = SourceText::new("fuzz-rig.toml", text.as_ref());
    if let Err(e) = crate::input::rigfile::load_source(&src) {
        assert_located(&e, "fuzz-rig.toml");
    }
}

/// The log-profile loader on arbitrary text: a profile whose paths lie
/// under the given folder, or a located, bounded error.
///
/// # Panics
/// When a promise is broken (see the module docs).
pub fn log_profile(data: &[u8]) {
    let text = String::from_utf8_lossy(data);
    let src = SourceText::new("fuzz-profile.toml", text.as_ref());
    match LogProfile::from_source(&src, Path::new("/fuzz")) {
        Ok(p) => {
            for f in &p.files {
                assert!(f.path.starts_with("/fuzz") || f.path.is_absolute());
            }
        }
        Err(e) => assert_located(&e, "fuzz-profile.toml"),
    }
}

/// The log profiles of [`csv_merge`]: two files each, one with epoch
/// seconds and one with ISO 8601 times (the second profile: epoch
/// milliseconds, `;` delimiter, and the `stop` policy chosen by the input).
const MERGE_PROFILES: [&str; 2] = [
    r#"[log]
gap = "5 s"
[[log.file]]
name = "a"
path = "a.csv"
time = { column = "t", format = "epoch_s" }
accel_axes = ["-y", "x", "z"]
[log.file.columns]
accel_x = { column = "ax", unit = "g", scale = 0.001 }
accel_y = { column = "ay", unit = "g", scale = 0.001 }
accel_z = { column = "az", unit = "g", scale = 0.001 }
wind_speed = { column = "v", unit = "km/h" }
[[log.file]]
name = "b"
path = "b.csv"
time = { column = "time", format = "iso8601", zone = "+01:00" }
[log.file.columns]
wind_direction = { column = "d", unit = "deg" }
pier_side = { column = "p" }
cover_fitted = { column = "c" }
hour_angle = { column = "ha", unit = "hourangle" }
declination = { column = "dec", unit = "deg" }
"#,
    r#"[log]
gap = "1 s"
[[log.file]]
name = "a"
path = "a.csv"
delimiter = ";"
time = { column = "t", format = "epoch_ms" }
[log.file.columns]
wind_speed = { column = "v", unit = "m/s" }
air_temperature = { column = "temp", unit = "degC" }
pressure = { column = "p", unit = "hPa" }
[[log.file]]
name = "b"
path = "b.csv"
time = { column = "time", format = "iso8601" }
[log.file.columns]
axis1_angle = { column = "a1", unit = "deg" }
axis2_angle = { column = "a2", unit = "rad" }
"#,
];

fn merge_profile(i: usize) -> &'static LogProfile {
    static PROFILES: OnceLock<[LogProfile; 2]> = OnceLock::new();
    let all = PROFILES.get_or_init(|| {
        MERGE_PROFILES.map(|t| {
            let src = SourceText::new("fuzz-merge.toml", t);
            match LogProfile::from_source(&src, Path::new("/fuzz")) {
                Ok(p) => p,
                Err(e) => panic!("the fuzz merge profile is bad: {e}"),
            }
        })
    });
    &all[i % 2]
}

/// The CSV reader and merger on arbitrary bytes: the first byte chooses
/// the profile (bit 1) and the policy (bit 0, `stop` when set); the rest is
/// split at the first NUL byte into the two files. Every issue and error
/// names its file and a line from 1, bounded; records come in time order;
/// the merge ends.
///
/// # Panics
/// When a promise is broken (see the module docs).
pub fn csv_merge(data: &[u8]) {
    let Some((&first, rest)) = data.split_first() else {
        return;
    };
    let policy = if first & 1 == 1 {
        ErrorPolicy::Stop
    } else {
        ErrorPolicy::Skip
    };
    let profile = merge_profile(usize::from((first >> 1) & 1));
    let (a, b) = match rest.iter().position(|&c| c == 0) {
        Some(i) => (&rest[..i], &rest[i + 1..]),
        None => (rest, &[][..]),
    };
    let readers: Vec<Box<dyn Read>> = vec![
        Box::new(std::io::Cursor::new(a.to_vec())),
        Box::new(std::io::Cursor::new(b.to_vec())),
    ];
    let check_error = |e: &LogError| match e {
        LogError::Row(issue) => {
            assert!(issue.line >= 1, "{issue}");
            assert!(issue.file == "a" || issue.file == "b", "{issue}");
            assert_bounded(&issue.to_string());
        }
        LogError::File(FileError::Input(ie)) => {
            let at = ie
                .at
                .as_ref()
                .unwrap_or_else(|| panic!("an error without a location: {ie}"));
            assert!(at.line >= 1, "{ie}");
            assert_bounded(&ie.to_string());
        }
        other => panic!("an unexpected error reading memory: {other}"),
    };
    let mut merger = match Merger::from_readers(profile, readers, policy) {
        Ok(m) => m,
        Err(e) => {
            check_error(&e);
            return;
        }
    };
    let mut last = None;
    // A record per distinct time: never more than the rows, so this ends.
    loop {
        match merger.next_record() {
            Ok(Some(r)) => {
                if let Some(t) = last {
                    assert!(r.time > t, "records out of order");
                }
                last = Some(r.time);
            }
            Ok(None) => break,
            Err(e) => {
                check_error(&e);
                break;
            }
        }
    }
    for issue in merger.issues().kept() {
        assert!(issue.line >= 1, "{issue}");
        assert_bounded(&issue.to_string());
    }
}

/// The unit parser on arbitrary text, for every dimension: a finite SI
/// value, or a bounded message.
///
/// # Panics
/// When a promise is broken (see the module docs).
pub fn units(data: &[u8]) {
    let text = String::from_utf8_lossy(data);
    fn one<D: crate::input::units::Dimension>(text: &str) {
        match crate::input::units::Quantity::<D>::parse(text) {
            Ok(q) => assert!(q.si().is_finite(), "{text:?} read as {}", q.si()),
            Err(e) => {
                let m = e.to_string();
                assert!(!m.is_empty());
                assert_bounded(&m);
            }
        }
    }
    one::<crate::input::units::LengthDim>(&text);
    one::<crate::input::units::MassDim>(&text);
    one::<crate::input::units::SpeedDim>(&text);
    one::<crate::input::units::TorqueDim>(&text);
    one::<crate::input::units::ForceDim>(&text);
    one::<crate::input::units::AngleDim>(&text);
    one::<crate::input::units::PressureDim>(&text);
    one::<crate::input::units::TemperatureDim>(&text);
    one::<crate::input::units::TimeDim>(&text);
    one::<crate::input::units::AccelerationDim>(&text);
    one::<crate::input::units::AreaDim>(&text);
}

/// The demo rig, loaded once for [`bridge_lines`].
fn demo_rig() -> &'static LoadedRig {
    static RIG: OnceLock<LoadedRig> = OnceLock::new();
    RIG.get_or_init(|| {
        let src = SourceText::new("demo-rig.toml", crate::commands::replay::DEMO_RIG_TOML);
        match crate::input::rigfile::load_source(&src) {
            Ok(r) => r,
            Err(e) => panic!("the demo rig does not load: {e}"),
        }
    })
}

/// The bridge's line parser and checks on arbitrary lines, through the
/// demo rig's guard: the first byte chooses JSON (even) or CSV (odd), the
/// rest is split into lines. Every line gets nothing, a verdict for that
/// line, or a bounded error; accepted times never go backwards.
///
/// # Panics
/// When a promise is broken (see the module docs).
pub fn bridge_lines(data: &[u8]) {
    let Some((&first, rest)) = data.split_first() else {
        return;
    };
    let format = if first & 1 == 1 {
        InputFormat::Csv
    } else {
        InputFormat::Json
    };
    let mut bridge = Bridge::new(demo_rig(), format);
    let mut last_t = None;
    for (i, line) in rest.split(|&c| c == b'\n').enumerate() {
        let n = i as u64 + 1;
        let text = String::from_utf8_lossy(line);
        match bridge.line(n, &text, None) {
            Ok(Answer::Nothing) => {}
            Ok(Answer::Verdict(v)) => {
                assert_eq!(v.line, n);
                if let Some(t) = last_t {
                    assert!(v.t_ms >= t, "time went back: {} after {t}", v.t_ms);
                }
                last_t = Some(v.t_ms);
            }
            Ok(Answer::Error(m)) => {
                assert!(!m.is_empty());
                assert_bounded(&m);
            }
            Err(e) => panic!("the bridge stopped on line {n}: {e}"),
        }
    }
}

/// The rigs of [`weighing_file`], loaded once: the demo rig (a tripod,
/// three feet) and the starter rig for a pier (an equatorial mount on a
/// base plate with four bolts).
fn weighing_rigs() -> &'static [LoadedRig; 2] {
    static RIGS: OnceLock<[LoadedRig; 2]> = OnceLock::new();
    RIGS.get_or_init(|| {
        let pier = crate::commands::starter::template(
            crate::commands::starter::SupportKind::Pier,
            crate::commands::starter::MountChoice::Equatorial,
        );
        let load = |name: &str, text: &str| match crate::input::rigfile::load_source(
            &SourceText::new(name, text),
        ) {
            Ok(r) => r,
            Err(e) => panic!("the rig {name} does not load: {e}"),
        };
        [demo_rig().clone(), load("starter-pier.toml", &pier)]
    })
}

/// The weighing file's reader and the weighing's computation, as
/// `standfast weigh` runs them, on arbitrary text for a rig of three or
/// four feet (the first byte's lowest bit chooses, the rest is the file): a
/// centre of gravity whose figures are finite with non-negative
/// uncertainties, or an error naming the file, line and column, bounded.
///
/// # Panics
/// When a promise is broken (see the module docs).
pub fn weighing_file(data: &[u8]) {
    let Some((&first, rest)) = data.split_first() else {
        return;
    };
    let rig = &weighing_rigs()[usize::from(first & 1)];
    let text = String::from_utf8_lossy(rest);
    let src = SourceText::new("fuzz-weighing.toml", text.as_ref());
    match crate::model::weigh::measure(rig, &src) {
        Ok(r) => {
            let c = &r.result;
            let estimates = [Some(c.mass_kg), Some(c.x_m), Some(c.y_m)]
                .into_iter()
                .chain([c.height_from_lift_m, c.height_from_tip_m, c.height_m]);
            for e in estimates.flatten() {
                assert!(
                    e.value.is_finite() && e.uncertainty.is_finite() && e.uncertainty >= 0.0,
                    "{e:?} in {c:?}"
                );
            }
            assert!(c.mass_kg.value > 0.0, "{c:?}");
            assert!(r.reading_uncertainty_n.is_finite() && r.reading_uncertainty_n > 0.0);
        }
        Err(e) => assert_located(&e, "fuzz-weighing.toml"),
    }
}
