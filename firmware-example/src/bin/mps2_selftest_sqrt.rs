//! A self-test of the core's square root on an emulated Cortex-M4F (QEMU
//! `mps2-an386`), run by CI (`ci.sh`): `standfast::math::sqrt`, which is
//! the FPU's `vsqrt.f32` on this target, against libm's correctly rounded
//! `sqrtf`, bit for bit.
//!
//! ```text
//! qemu-system-arm -M mps2-an386 -cpu cortex-m4 -nographic \
//!   -semihosting-config enable=on,target=native,arg=mps2-selftest-sqrt \
//!   -kernel target/thumbv7em-none-eabihf/firmware/mps2-selftest-sqrt
//! ```
//!
//! A binary of its own, not a word of `mps2-replay`'s command line, so that
//! the check and its reference (libm's `sqrtf` and its table) are not part
//! of the replay image whose flash is measured against the aim.
//!
//! Exit codes (semihosting extended exit): 0 every value agrees, 4
//! HardFault, 6 a value differs, 101 panic.
#![no_std]
#![no_main]
// Semihosting calls are `unsafe` (a trap into the debugger with raw pointers).
#![allow(unsafe_code)]

use cortex_m_rt::entry;
use host::{exit, stdout, EXIT_OK};
use standfast_firmware::event::TextSink;

/// Exit code: a value differs.
const EXIT_SQRT_MISMATCH: u32 = 6;

// The semihosting exit and output, the HardFault and panic handlers.
#[path = "mps2_host.rs"]
mod host;

// The interrupt part of the vector table (cortex-m-rt's `device` feature).
#[path = "mps2_vectors.rs"]
mod vectors;

#[entry]
fn main() -> ! {
    exit(selftest_sqrt())
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
            out.decimal(u64::from(b));
            out.text("\n");
            EXIT_SQRT_MISMATCH
        }
    }
}
