//! The station as a board would flash it, without the replay harness: built
//! for the size report (`ci.sh`; README, "Memory and flash") and run once in
//! QEMU `mps2-an386` to show that it runs.
//!
//! It builds the example rig, the guard and the station in place in
//! `static`s, as `mps2-replay` does, and steps the station with the example
//! set-up ([`ReplaySetup::example`], 10 Hz) for [`STEPS`] periods, feeding a
//! watchdog, with the sensor values read through `read_volatile` so that the
//! optimiser cannot fold them away. Left out, compared with `mps2-replay`:
//! the log reading and CSV parsing, the event and summary text, the
//! square-root self-test, the stack measurement and the usage messages.
//! The hardware is the replay's stand-in (the emulated LIS3DH register file
//! behind the I2C trait, pins that hold a level, a vane that returns a set
//! direction); a board's HAL drivers take their place.
//!
//! Exit codes (semihosting extended exit): 0 after the steps, 5 internal
//! error (the rig or the guard could not be built), 101 panic.
#![no_std]
#![no_main]
// Semihosting calls, the vector table and volatile reads are `unsafe`.
#![allow(unsafe_code)]

use core::hint::black_box;
use core::mem::MaybeUninit;
use core::panic::PanicInfo;
use cortex_m_rt::entry;
use cortex_m_semihosting::syscall;
use standfast::guard::Guard;
use standfast::math;
use standfast::rig::Rig;
use standfast::Error;
use standfast_firmware::guard_adapter::{example_guard, example_rig_in, GuardRule};
use standfast_firmware::lines::FailSafeLines;
use standfast_firmware::lis3dh::{self, Lis3dh, RawSample};
use standfast_firmware::replay::{EmulatedLis3dh, MemoryPin, ReplaySetup, ScriptedVane};
use standfast_firmware::rule::LimitRule;
use standfast_firmware::station::{Station, StepInputs, Watchdog};
use standfast_firmware::wind::{Anemometer, PulseLatch};

// The interrupt part of the vector table (cortex-m-rt's `device` feature).
#[path = "mps2_vectors.rs"]
mod vectors;

/// Steps taken before the exit: two minutes at 10 Hz.
const STEPS: u32 = 1200;

const EXIT_OK: u32 = 0;
const EXIT_INTERNAL: u32 = 5;
const EXIT_PANIC: u32 = 101;

/// The sensor values of every step, read through `read_volatile` (a board
/// reads them from its peripherals): accelerometer output words of a level
/// rig (about 1 g up), anemometer pulses per step, vane direction in
/// degrees. Invented.
static ACCEL_WORDS: [i16; 3] = [144, 0, 16_000];
static PULSES_PER_STEP: u32 = 1;
static VANE_FROM_DEG: f32 = 250.0;

/// The station as built here: the guard borrowed from its own static.
type BoardStation = Station<
    EmulatedLis3dh,
    ScriptedVane,
    MemoryPin,
    MemoryPin,
    GuardRule<'static, &'static mut Guard<'static>>,
>;

/// A watchdog stand-in that counts its feeds (a board feeds its independent
/// watchdog here).
struct CountingWatchdog(u32);

impl Watchdog for CountingWatchdog {
    fn feed(&mut self) {
        self.0 = self.0.wrapping_add(1);
    }
}

/// SYS_EXIT_EXTENDED and ADP_Stopped_ApplicationExit (Arm semihosting
/// specification v2; from memory), as in `mps2-replay`.
fn exit(code: u32) -> ! {
    let block: [usize; 2] = [0x20026, code as usize];
    // SAFETY: a valid semihosting operation with a two-word parameter block.
    unsafe {
        syscall(0x20, &block);
    }
    loop {
        cortex_m::asm::bkpt();
    }
}

#[entry]
fn main() -> ! {
    exit(run())
}

fn run() -> u32 {
    let Some(station) = build_station() else {
        return EXIT_INTERNAL;
    };
    let setup = ReplaySetup::example();
    let period_ms = u64::from(setup.station.period_ms);
    let mut watchdog = CountingWatchdog(0);
    let mut pulses: u32 = 0;
    for step in 0..STEPS {
        let now_ms = u64::from(step) * period_ms;
        // SAFETY: aligned reads of initialised statics.
        let (words, per_step, vane_deg) = unsafe {
            (
                core::ptr::read_volatile(&raw const ACCEL_WORDS),
                core::ptr::read_volatile(&raw const PULSES_PER_STEP),
                core::ptr::read_volatile(&raw const VANE_FROM_DEG),
            )
        };
        pulses = pulses.wrapping_add(per_step);
        let (bus, vane) = station.hardware();
        bus.set_output(Some(RawSample { words }));
        vane.from_rad = Some(math::deg_to_rad(vane_deg));
        let inputs = StepInputs {
            pulses: Some(PulseLatch {
                total: pulses,
                at_ms: now_ms,
            }),
            pose: None,
        };
        let report = station.step_and_feed(now_ms, inputs, &mut watchdog);
        // A board logs the events or sends them upstream.
        black_box(&report);
    }
    black_box(watchdog.0);
    EXIT_OK
}

/// The rig, the guard and the station, each built in place in its static
/// (as `mps2-replay`'s `build_replay`).
#[inline(never)]
fn build_station() -> Option<&'static mut BoardStation> {
    let setup = ReplaySetup::example();
    let rig_slot = cortex_m::singleton!(: Option<Rig> = None)?;
    let rig: &'static Rig = build_rig(rig_slot)?;
    let guard_slot =
        cortex_m::singleton!(: MaybeUninit<Result<Guard<'static>, Error>> = MaybeUninit::uninit())?;
    let guard: &'static mut Guard<'static> =
        fill(guard_slot, || example_guard(rig, 0)).as_mut().ok()?;
    let station_slot = cortex_m::singleton!(: MaybeUninit<BoardStation> = MaybeUninit::uninit())?;
    Some(fill(station_slot, || {
        Station::new(
            setup.station,
            Lis3dh::new(
                EmulatedLis3dh::new(lis3dh::ADDRESS_SA0_LOW),
                lis3dh::ADDRESS_SA0_LOW,
                setup.accel,
            ),
            Anemometer::new(setup.anemometer, setup.gate_ms),
            ScriptedVane::default(),
            FailSafeLines::new(MemoryPin::default(), MemoryPin::default()),
            GuardRule::with_guard(guard, Some(LimitRule::new(setup.limits))),
        )
    }))
}

/// Builds the example rig in place in `slot` ([`example_rig_in`]), out of
/// line and with the error dropped (as in `mps2-replay`).
#[inline(never)]
fn build_rig(slot: &'static mut Option<Rig>) -> Option<&'static Rig> {
    example_rig_in(slot).ok()?;
    slot.as_ref()
}

/// Writes `make()` into `slot` and returns it (as in `mps2-replay`).
#[inline(never)]
fn fill<T>(slot: &'static mut MaybeUninit<T>, make: impl FnOnce() -> T) -> &'static mut T {
    slot.write(make())
}

#[panic_handler]
fn panic(_info: &PanicInfo) -> ! {
    exit(EXIT_PANIC)
}
