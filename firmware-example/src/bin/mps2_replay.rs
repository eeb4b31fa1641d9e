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
//! instead of 10 Hz, for the guard step's instruction count (`ci.sh`). A
//! second word `--selftest-sqrt` (no log) compares the core's square root
//! (the FPU's `vsqrt.f32` here) with libm's `sqrtf`, bit for bit (exit 0
//! when every value agrees, 6 otherwise).
//!
//! Exit codes (semihosting extended exit): 0 replay done, 2 usage or file
//! error, 3 malformed log, 4 HardFault, 5 internal error, 6 square-root
//! self-test failed, 101 panic.
#![no_std]
#![no_main]
// Semihosting calls are `unsafe` (a trap into the debugger with raw pointers).
#![allow(unsafe_code)]

use core::mem::MaybeUninit;
use core::panic::PanicInfo;
use cortex_m_rt::{entry, exception, ExceptionFrame};
use cortex_m_semihosting::hio::{self, HostStream};
use cortex_m_semihosting::{nr, syscall};
use standfast::guard::Guard;
use standfast::rig::Rig;
use standfast::Error;
use standfast_firmware::event::TextSink;
use standfast_firmware::guard_adapter::{example_guard, example_rig_in};
use standfast_firmware::replay::{LineSplitter, Replay, ReplayError, ReplaySetup, SplitLine};

const EXIT_OK: u32 = 0;
const EXIT_USAGE: u32 = 2;
const EXIT_LOG: u32 = 3;
const EXIT_HARDFAULT: u32 = 4;
const EXIT_INTERNAL: u32 = 5;
const EXIT_SQRT_MISMATCH: u32 = 6;
const EXIT_PANIC: u32 = 101;

/// SYS_EXIT_EXTENDED: like SYS_EXIT, but its parameter block carries an exit
/// code, so codes other than 0 and 1 reach the host (Arm semihosting
/// specification v2; from memory).
const SYS_EXIT_EXTENDED: usize = 0x20;
/// ADP_Stopped_ApplicationExit, the reason code for a normal exit.
const ADP_STOPPED_APPLICATION_EXIT: usize = 0x20026;

fn exit(code: u32) -> ! {
    let block: [usize; 2] = [ADP_STOPPED_APPLICATION_EXIT, code as usize];
    // SAFETY: a valid semihosting operation with a two-word parameter block.
    unsafe {
        syscall(SYS_EXIT_EXTENDED, &block);
    }
    // Not reached under QEMU; on a debugger that resumes, stay here.
    loop {
        cortex_m::asm::bkpt();
    }
}

const USAGE: &str = "usage: mps2-replay <log.csv> [--rate-100hz | --selftest-hardfault]";

/// A semihosting stream of the host (stdout or stderr) as a [`TextSink`]:
/// every line is written piece by piece, without `core::fmt` (whose
/// formatting machinery and 64-bit division would take about 3 KiB of
/// flash), and byte for byte as the host replay's `Display` prints it (both
/// go through the same `write_text`). A stream that cannot be opened or
/// written drops the text: the output is the emulated board's log, not
/// part of its safety function.
struct Host(Option<HostStream>);

impl TextSink for Host {
    fn text(&mut self, s: &str) {
        if let Some(h) = self.0.as_mut() {
            // A failed write means the host is gone; nothing to tell it.
            let _ = h.write_all(s.as_bytes());
        }
    }
}

impl Host {
    /// Writes `parts` and a line ending.
    fn line(&mut self, parts: &[&str]) {
        for p in parts {
            self.text(p);
        }
        self.text("\n");
    }

    /// Writes `v` as `0x` and eight lower-case hexadecimal digits (as
    /// `{:#010x}` formats a `u32`).
    fn hex32(&mut self, v: u32) {
        let mut digits = *b"0x00000000";
        for (i, d) in digits.iter_mut().skip(2).enumerate() {
            let nibble = (v >> (28 - 4 * i)) & 0xF;
            *d = b"0123456789abcdef"
                .get(nibble as usize)
                .copied()
                .unwrap_or(b'?');
        }
        self.text(core::str::from_utf8(&digits).unwrap_or("0x????????"));
    }
}

/// The host's standard output.
fn stdout() -> Host {
    Host(hio::hstdout().ok())
}

/// The host's standard error.
fn stderr() -> Host {
    Host(hio::hstderr().ok())
}

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
            SplitLine::Bad => return Err(replay.too_long()),
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

/// Reads and acts on the semihosting command line: runs a self-test, or
/// opens the log and picks the set-up. `Err` holds the exit code (a
/// self-test's result, or a usage or file error, already printed). Out of
/// line, so its buffers (the command line, 256 bytes, and the log's name
/// for the open call, 200) are off the stack before the replay is built and
/// run: the replay loop and the start-up are the stack's two deepest paths.
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
    let Ok(cmd) = core::str::from_utf8(cmdline.get(..len).unwrap_or(&[])) else {
        stdout().line(&["error reason=command_line_not_utf8"]);
        return Err(EXIT_USAGE);
    };
    let mut words = cmd.split_ascii_whitespace().skip(1);
    let Some(path) = words.next() else {
        stdout().line(&[USAGE]);
        return Err(EXIT_USAGE);
    };
    if path == "--selftest-sqrt" {
        return Err(selftest_sqrt());
    }
    let setup = match words.next() {
        None => ReplaySetup::example(),
        Some("--rate-100hz") => ReplaySetup::example_100hz(),
        Some("--selftest-hardfault") => {
            stdout().line(&["selftest: executing an undefined instruction"]);
            cortex_m::asm::udf();
        }
        Some(_) => {
            stdout().line(&[USAGE]);
            return Err(EXIT_USAGE);
        }
    };
    let Some(fd) = open_read(path) else {
        stdout().line(&["error reason=cannot_open path=", path]);
        return Err(EXIT_USAGE);
    };
    Ok((fd, setup))
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

/// Compares `standfast::math::sqrt` (on this target the FPU's `vsqrt.f32`)
/// with libm's correctly rounded `sqrtf`, bit for bit (every NaN counts as
/// equal to every NaN). Every `f32` in [1, 4) is tried: a square root's
/// significand depends only on the argument's significand and the parity
/// of its exponent, so that range covers every rounding case of normal
/// numbers; then every 4099th bit pattern across the whole range (both
/// signs, subnormals, infinities, NaNs) for the scaling and the special
/// cases.
fn selftest_sqrt() -> u32 {
    let same = |x: f32| {
        let (ours, reference) = (standfast::math::sqrt(x), libm::sqrtf(x));
        ours.to_bits() == reference.to_bits() || (ours.is_nan() && reference.is_nan())
    };
    let mut tried: u32 = 0;
    let mut differ: u32 = 0;
    let mut first_bad: Option<u32> = None;
    let mut check = |bits: u32| {
        tried = tried.wrapping_add(1);
        if !same(f32::from_bits(bits)) {
            differ = differ.saturating_add(1);
            first_bad.get_or_insert(bits);
        }
    };
    // [1, 4): 1.0 is 0x3f80_0000, 4.0 is 0x4080_0000.
    for bits in 0x3f80_0000_u32..0x4080_0000 {
        check(bits);
    }
    let mut bits: u32 = 0;
    loop {
        check(bits);
        let Some(next) = bits.checked_add(4099) else {
            break;
        };
        bits = next;
    }
    for bits in [
        0x0000_0000,
        0x8000_0000,
        0x7f80_0000,
        0xff80_0000,
        0x0000_0001,
        0x7f7f_ffff,
    ] {
        check(bits);
    }
    let mut out = stdout();
    out.text("selftest sqrt: tried=");
    out.decimal(u64::from(tried));
    out.text(" differ=");
    out.decimal(u64::from(differ));
    out.text("\n");
    match first_bad {
        None => EXIT_OK,
        Some(b) => {
            out.text("selftest sqrt: first difference at bits=");
            out.hex32(b);
            out.text("\n");
            EXIT_SQRT_MISMATCH
        }
    }
}

/// Opens a host file for reading; `None` on failure.
fn open_read(path: &str) -> Option<usize> {
    let mut name = [0u8; 200];
    let bytes = path.as_bytes();
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

#[exception]
unsafe fn HardFault(ef: &ExceptionFrame) -> ! {
    let mut out = stdout();
    out.text("hardfault pc=");
    out.hex32(ef.pc());
    out.text("\n");
    exit(EXIT_HARDFAULT)
}

/// The crate and the core are written not to panic (clippy denies the usual
/// sources); should one happen anyway, say so and exit with 101. The message
/// is not formatted: that would keep every panic message and `core::fmt` in
/// flash.
#[panic_handler]
fn panic(_info: &PanicInfo) -> ! {
    stderr().line(&["panic"]);
    exit(EXIT_PANIC)
}
