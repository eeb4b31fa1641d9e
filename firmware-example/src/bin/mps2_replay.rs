//! The station on an emulated Cortex-M4 board (QEMU `mps2-an386`), replaying
//! a log read from the host through semihosting and printing its events.
//!
//! ```text
//! qemu-system-arm -M mps2-an386 -cpu cortex-m4 -nographic \
//!   -semihosting-config enable=on,target=native,arg=mps2-replay,arg=<log.csv> \
//!   -kernel target/thumbv7em-none-eabihf/firmware/mps2-replay
//! ```
//!
//! The second word of the semihosting command line is the log's path; a
//! third word `--selftest-hardfault` executes an undefined instruction to
//! prove that a HardFault ends the run with a failure code, and a third word
//! `--rate-100hz` runs the station at 100 Hz ([`ReplaySetup::example_100hz`])
//! instead of 10 Hz, for the guard step's instruction count (`ci.sh`). The
//! words are compared as bytes and the path is passed on as it is. (The
//! square-root self-test is the binary `mps2-selftest-sqrt`.)
//!
//! Exit codes (semihosting extended exit): 0 replay done, 2 usage or file
//! error, 3 malformed log, 4 HardFault, 5 internal error, 101 panic.
#![no_std]
#![no_main]
// Semihosting calls are `unsafe` (a trap into the debugger with raw pointers).
#![allow(unsafe_code)]

use core::mem::MaybeUninit;
use cortex_m_rt::entry;
use cortex_m_semihosting::{nr, syscall};
use host::{exit, stderr, stdout, EXIT_OK};
use standfast::guard::Guard;
use standfast::rig::Rig;
use standfast::Error;
use standfast_firmware::event::TextSink;
use standfast_firmware::guard_adapter::{example_guard, example_rig_in};
use standfast_firmware::replay::{LineSplitter, Replay, ReplayError, ReplaySetup, SplitLine};

const EXIT_USAGE: u32 = 2;
const EXIT_LOG: u32 = 3;
const EXIT_INTERNAL: u32 = 5;

// The semihosting exit and output, the HardFault and panic handlers.
#[path = "mps2_host.rs"]
mod host;

const USAGE: &str = "usage: mps2-replay <log.csv> [--rate-100hz | --selftest-hardfault]";

#[entry]
fn main() -> ! {
    exit(run())
}

fn run() -> u32 {
    let (fd, setup) = match command() {
        Ok(c) => c,
        Err(code) => return code,
    };
    // The rig, the station and the buffers live in statics: nothing grows at
    // run time, and the set-up's temporaries are gone before the replay runs.
    let Some(replay) = build_replay(&setup) else {
        return EXIT_INTERNAL;
    };
    let Some(splitter) = cortex_m::singleton!(: LineSplitter<160> = LineSplitter::new()) else {
        return EXIT_INTERNAL;
    };
    let Some(chunk) = cortex_m::singleton!(: [u8; 256] = [0; 256]) else {
        return EXIT_INTERNAL;
    };

    let mut out = stdout();
    let mut events: u32 = 0;
    let mut each = |l: SplitLine<'_>| -> Result<(), ReplayError> {
        let report = match l {
            SplitLine::Text(t) => replay.feed_line(t)?,
            SplitLine::TooLong => return Err(replay.too_long()),
        };
        if let Some(report) = report {
            for e in &report.events {
                e.write_text(&mut out);
                out.text("\n");
                events = events.saturating_add(1);
            }
            for e in replay.guard_events() {
                out.text("guard ");
                e.write_text(&mut out);
                out.text("\n");
            }
        }
        Ok(())
    };
    let outcome = loop {
        let n = read(fd, chunk);
        if n == 0 {
            break splitter.finish(&mut each);
        }
        if let Err(e) = splitter.feed(chunk.get(..n).unwrap_or(&[]), &mut each) {
            break Err(e);
        }
    };
    close(fd);
    // On stderr, so stdout holds only what the host replay prints too.
    let mut err = stderr();
    err.text("memory stack_peak_bytes=");
    err.decimal(stack_peak_bytes() as u64);
    err.text("\n");
    match outcome {
        Ok(()) => {
            out.text("summary rows=");
            out.decimal(u64::from(replay.rows()));
            out.text(" events=");
            out.decimal(u64::from(events));
            out.text("\n");
            EXIT_OK
        }
        Err(e) => {
            e.write_text(&mut out);
            out.text("\n");
            EXIT_LOG
        }
    }
}

/// Reads and acts on the semihosting command line: opens the log and picks
/// the set-up, or runs the HardFault self-test. `Err` holds the exit code
/// (a usage or file error, already printed). The command line is read as
/// bytes (words split at ASCII white space, as `split_ascii_whitespace`
/// does; no UTF-8 check, the path goes to the host as it is). Out of line,
/// so its buffers (the command line, 256 bytes, and the log's name for the
/// open call, 200) are off the stack before the replay is built and run:
/// the replay loop and the start-up are the stack's two deepest paths.
#[inline(never)]
fn command() -> Result<(usize, ReplaySetup), u32> {
    let mut cmdline = [0u8; 256];
    let block: [usize; 2] = [cmdline.as_mut_ptr() as usize, cmdline.len()];
    // SAFETY: GET_CMDLINE writes at most `len` bytes into the buffer.
    if unsafe { syscall(nr::GET_CMDLINE, &block) } != 0 {
        stdout().line(&["error reason=no_command_line"]);
        return Err(EXIT_USAGE);
    }
    let len = cmdline
        .iter()
        .position(|&b| b == 0)
        .unwrap_or(cmdline.len());
    let mut words = cmdline
        .get(..len)
        .unwrap_or(&[])
        .split(u8::is_ascii_whitespace)
        .filter(|w| !w.is_empty());
    // The first word is the program's name.
    let (Some(_), Some(path)) = (words.next(), words.next()) else {
        stdout().line(&[USAGE]);
        return Err(EXIT_USAGE);
    };
    let setup = match words.next() {
        None => ReplaySetup::example(),
        Some(w) if same(w, b"--rate-100hz") => ReplaySetup::example_100hz(),
        Some(w) if same(w, b"--selftest-hardfault") => {
            stdout().line(&["selftest: executing an undefined instruction"]);
            cortex_m::asm::udf();
        }
        Some(_) => {
            stdout().line(&[USAGE]);
            return Err(EXIT_USAGE);
        }
    };
    let Some(fd) = open_read(path) else {
        let mut out = stdout();
        out.text("error reason=cannot_open path=");
        out.bytes(path);
        out.text("\n");
        return Err(EXIT_USAGE);
    };
    Ok((fd, setup))
}

/// Whether `word` is `name`, byte for byte. Out of line and a plain loop:
/// a comparison with a literal is otherwise unrolled, two instructions a
/// byte.
#[inline(never)]
fn same(word: &[u8], name: &[u8]) -> bool {
    word.len() == name.len() && word.iter().zip(name).all(|(a, b)| a == b)
}

/// Builds the example rig, the guard and the replay in place in their
/// statics: each static is reserved uninitialised by `cortex_m::singleton!`
/// and filled by [`fill`], whose constructor writes its result straight into
/// the static. The guard has a static of its own and the replay borrows it,
/// so the 4 KiB guard is never moved through the adapter's, the station's
/// and the replay's constructors.
/// Kept out of line so its frame is released before the replay runs.
#[inline(never)]
fn build_replay(setup: &ReplaySetup) -> Option<&'static mut GuardReplay> {
    let rig_slot = cortex_m::singleton!(: Option<Rig> = None)?;
    let rig: &'static Rig = build_rig(rig_slot)?;
    let guard_slot =
        cortex_m::singleton!(: MaybeUninit<Result<Guard<'static>, Error>> = MaybeUninit::uninit())?;
    let guard: &'static mut Guard<'static> =
        fill(guard_slot, || example_guard(rig, 0)).as_mut().ok()?;
    let replay_slot = cortex_m::singleton!(
        : MaybeUninit<GuardReplay> = MaybeUninit::uninit()
    )?;
    Some(fill(replay_slot, || Replay::with_guard(setup, guard)))
}

/// Builds the example rig in place in `slot` ([`example_rig_in`]). Out of
/// line, so the rig description's frame is released before the guard is
/// built; the error is dropped here (the binary exits with
/// `EXIT_INTERNAL`), which lets the optimiser drop the code that would
/// describe it (about 1.2 KiB of flash).
#[inline(never)]
fn build_rig(slot: &'static mut Option<Rig>) -> Option<&'static Rig> {
    example_rig_in(slot).ok()?;
    slot.as_ref()
}

/// The replay as the binary holds it: the guard borrowed from its own static.
type GuardReplay = Replay<'static, &'static mut Guard<'static>>;

/// Writes `make()` into `slot` and returns it. Out of line, with `slot` a
/// unique reference, so the optimiser can hand the static's address to the
/// constructor as its return slot instead of building the value on the stack.
#[inline(never)]
fn fill<T>(slot: &'static mut MaybeUninit<T>, make: impl FnOnce() -> T) -> &'static mut T {
    slot.write(make())
}

/// Opens a host file for reading; `None` on failure.
fn open_read(bytes: &[u8]) -> Option<usize> {
    let mut name = [0u8; 200];
    // Leave room for the terminating NUL the call needs.
    if bytes.len() >= name.len() {
        return None;
    }
    name.get_mut(..bytes.len())?.copy_from_slice(bytes);
    let block: [usize; 3] = [name.as_ptr() as usize, nr::open::R_BINARY, bytes.len()];
    // SAFETY: OPEN reads the NUL-terminated name of the given length.
    let fd = unsafe { syscall(nr::OPEN, &block) };
    (fd as isize >= 0).then_some(fd)
}

/// Reads up to `buf.len()` bytes; returns how many (0 at end of file or on error).
fn read(fd: usize, buf: &mut [u8]) -> usize {
    let block: [usize; 3] = [fd, buf.as_mut_ptr() as usize, buf.len()];
    // SAFETY: READ writes at most `len` bytes into the buffer and returns the
    // number of bytes *not* read.
    let not_read = unsafe { syscall(nr::READ, &block) };
    buf.len().saturating_sub(not_read)
}

fn close(fd: usize) {
    let block: [usize; 1] = [fd];
    // SAFETY: CLOSE takes the handle OPEN returned.
    unsafe {
        syscall(nr::CLOSE, &block);
    }
}

/// Peak stack use so far: cortex-m-rt's `paint-stack` fills the stack with
/// `STACK_PAINT_VALUE` at reset; the lowest word no longer holding it marks
/// the deepest the stack has reached.
fn stack_peak_bytes() -> usize {
    unsafe extern "C" {
        static _stack_end: u32;
        static _stack_start: u32;
    }
    let bottom = (&raw const _stack_end) as usize;
    let top = (&raw const _stack_start) as usize;
    let mut p = bottom;
    while p < top {
        // SAFETY: an aligned word inside the RAM region the linker script
        // reserved for the stack.
        let w = unsafe { core::ptr::read_volatile(p as *const u32) };
        if w != cortex_m_rt::STACK_PAINT_VALUE {
            break;
        }
        p += 4;
    }
    top - p
}

// The interrupt part of the vector table (cortex-m-rt's `device` feature).
#[path = "mps2_vectors.rs"]
mod vectors;
