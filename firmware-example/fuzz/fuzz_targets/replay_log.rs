//! Fuzz target: the firmware example's log reading, as the QEMU replay binary
//! does it: bytes in chunks through `LineSplitter`, each line through
//! `Replay::feed_line` (parsing, checks and a station and guard step per
//! data row). Run: `cargo +nightly fuzz run -s none replay_log` in
//! firmware-example/fuzz.
//!
//! The first input byte chooses the chunk length (1 to 64 bytes) and whether
//! the log's header is fed first (so that most inputs reach the row parser);
//! the rest is the log. Checked, besides "never panics":
//! - the splitter gives the same lines as splitting the whole input at `\n`,
//!   a line longer than its buffer as `TooLong`, whatever the chunking;
//! - every error names the line just fed (lines counted from 1);
//! - accepted rows never go back in time;
//! - a number `parse_degrees` accepts is what the standard library's
//!   correctly rounded parser reads in the same text, to within the two
//!   single-precision roundings of its fixed-point method.
#![no_main]

use libfuzzer_sys::fuzz_target;
use standfast::Rig;
use standfast_firmware::guard_adapter::example_rig;
use standfast_firmware::replay::{
    parse_degrees, parse_row, LineSplitter, Replay, ReplayError, ReplaySetup, SplitLine, HEADER,
};
use std::sync::OnceLock;

/// The line buffer of the QEMU replay binary (`mps2_replay.rs`).
const LINE: usize = 160;

fn rig() -> &'static Rig {
    static RIG: OnceLock<Rig> = OnceLock::new();
    RIG.get_or_init(|| example_rig().expect("the example rig builds"))
}

fn error_line(e: &ReplayError) -> u32 {
    match *e {
        ReplayError::Header { line }
        | ReplayError::Columns { line }
        | ReplayError::Field { line, .. }
        | ReplayError::TimeBackwards { line }
        | ReplayError::TooLong { line }
        | ReplayError::NotAscii { line } => line,
    }
}

/// `parse_degrees` against `str::parse::<f64>` on one field.
fn check_degrees(field: &[u8]) {
    let Ok(Some(x)) = parse_degrees(field) else {
        return;
    };
    let text = std::str::from_utf8(field).expect("an accepted field is ASCII");
    let y: f64 = text
        .trim_ascii()
        .parse()
        .expect("an accepted field is a decimal number");
    let err = (f64::from(x) - y).abs();
    // Two roundings to single precision: at most 2^-23 of the value, plus
    // the rounding of values below one.
    assert!(
        err <= y.abs() * 2.5e-7 + 1e-9,
        "parse_degrees({text:?}) = {x}, the decimal is {y}"
    );
}

fuzz_target!(|data: &[u8]| {
    let Some((&mode, log)) = data.split_first() else {
        return;
    };
    let chunk = usize::from(mode & 0x3f) + 1;
    let with_header = mode & 0x40 != 0;

    // The lines as the splitter gives them, fed in chunks.
    let mut got: Vec<Option<Vec<u8>>> = Vec::new();
    let mut splitter = LineSplitter::<LINE>::new();
    let mut keep = |l: SplitLine<'_>| -> Result<(), ()> {
        got.push(match l {
            SplitLine::Text(t) => Some(t.to_vec()),
            SplitLine::TooLong => None,
        });
        Ok(())
    };
    for c in log.chunks(chunk) {
        splitter.feed(c, &mut keep).expect("keep never fails");
    }
    splitter.finish(&mut keep).expect("keep never fails");
    // The same lines from the whole input at once.
    let mut want: Vec<Option<Vec<u8>>> = log
        .split(|&b| b == b'\n')
        .map(|l| (l.len() <= LINE).then(|| l.to_vec()))
        .collect();
    if log.last().is_none_or(|&b| b == b'\n') {
        // No last line after a final line feed (or in an empty input).
        want.pop();
    }
    assert_eq!(got, want, "the splitter's lines differ from split('\\n')");

    let mut replay = Replay::new(&ReplaySetup::example(), rig()).expect("the example set-up");
    let mut fed: u32 = 0;
    if with_header {
        fed += 1;
        assert_eq!(replay.feed_line(HEADER), Ok(None));
    }
    let mut last_t: Option<u64> = None;
    for line in &got {
        fed += 1;
        let result = match line {
            Some(text) => {
                for field in text.split(|&b| b == b',') {
                    check_degrees(field);
                }
                replay.feed_line(text)
            }
            None => Err(replay.too_long()),
        };
        match result {
            Ok(Some(_)) => {
                let mut text = line.as_deref().unwrap_or_default();
                while let Some(rest) = text.strip_suffix(b"\r") {
                    text = rest;
                }
                let t = parse_row(text, fed).expect("a stepped row parses").t_ms;
                assert!(
                    last_t.is_none_or(|l| t >= l),
                    "time went back at line {fed}"
                );
                last_t = Some(t);
            }
            Ok(None) => {}
            Err(e) => assert_eq!(error_line(&e), fed, "{e:?} names another line"),
        }
    }
    assert!(replay.rows() <= fed);
});
