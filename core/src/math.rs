//! The 3-vector [`Vec3`], angle conversions ([`deg_to_rad`], [`rad_to_deg`],
//! [`wrap_pi`], [`wrap_tau`]), [`clamp`], the square root the crate computes
//! with ([`sqrt`]) and the constants its interfaces use. These are the public
//! part of the module; the transcendental functions behind them are the
//! crate's own.
//!
//! **The math back end is chosen by the final binary.** Every transcendental
//! function the crate uses goes through this module. By default they are
//! `libm`'s (always a dependency) and this module's own exact routines. The
//! fast approximations of `micromath` replace all of them at once only when
//! both hold:
//! - the `micromath` feature of this crate is on (it makes them available;
//!   any crate in the dependency graph may turn it on), and
//! - the final binary sets `--cfg standfast_fast_math` in its compiler flags,
//!   for example in its `.cargo/config.toml`:
//!   `[build] rustflags = ["--cfg", "standfast_fast_math"]` (or
//!   `RUSTFLAGS="--cfg standfast_fast_math"`).
//!
//! So a library that depends on this crate cannot move the numbers of the
//! binary that links it: with the feature on and the flag unset the results
//! are bit for bit the default ones (`tests/tests/checks/backends.rs`). The
//! flag without the feature is a compile error. [`FAST_MATH`] tells which
//! back end a build has. Angles are radians everywhere.
//!
//! **Single precision only.** On a Cortex-M4F the FPU does `f32` only, and any
//! `f64` operation is a software routine of hundreds of instructions. Under
//! `libm`, three functions are therefore this module's own `f32` code rather
//! than libm's (whose `sinf`, `cosf` and `hypotf` compute in `f64`): `sin`,
//! `cos` and `hypot`; every other function is libm's `f32` routine, which
//! uses no `f64`. [`sqrt`] is the FPU's `vsqrt.f32` on targets with a
//! hardware-float ABI (`target_abi = "eabihf"`) and libm's `sqrtf` elsewhere:
//! both are IEEE 754 square roots, correctly rounded, so the results are the
//! same bits and a host replay still matches the firmware's exactly. The same
//! `f32` code runs on every target, so `sin`, `cos` and `hypot` give the
//! same bits on the host and on the board too. `firmware-example/ci.sh` checks
//! the firmware's disassembly for software double-precision routines.

#[cfg(all(standfast_fast_math, not(feature = "micromath")))]
compile_error!(
    "`--cfg standfast_fast_math` selects micromath's approximations: enable standfast's \
     `micromath` feature too"
);

#[cfg(all(feature = "micromath", standfast_fast_math))]
#[allow(unused_imports)]
use micromath::F32Ext as _;

/// True when this build computes with `micromath`'s fast approximations
/// (feature `micromath` on and `--cfg standfast_fast_math` set by the final
/// binary; see the module docs); false for the default, exact back end.
pub const FAST_MATH: bool = cfg!(all(feature = "micromath", standfast_fast_math));

/// π as `f32`.
pub const PI: f32 = core::f32::consts::PI;
/// 2π as `f32`.
pub const TAU: f32 = core::f32::consts::TAU;
/// Standard acceleration of gravity g₀ in m/s² (ISO 80000-3, ISO 2533).
#[allow(clippy::cast_possible_truncation)] // 9.806 65 rounded to f32, at compile time
pub const STANDARD_GRAVITY_MPS2: f32 = STANDARD_GRAVITY_MPS2_F64 as f32;
/// Standard acceleration of gravity g₀ in m/s² (ISO 80000-3, ISO 2533),
/// exact in `f64`: the one definition of the constant, for hosts that
/// convert units in `f64` (a compile-time value: the crate computes with
/// [`STANDARD_GRAVITY_MPS2`] only).
pub const STANDARD_GRAVITY_MPS2_F64: f64 = 9.806_65;

/// Square root; NaN for negative input.
#[inline]
#[must_use]
pub fn sqrt(x: f32) -> f32 {
    #[cfg(all(feature = "micromath", standfast_fast_math))]
    {
        if x < 0.0 {
            return f32::NAN;
        }
        if x == 0.0 || !x.is_finite() {
            return x;
        }
        // micromath's estimate is off by up to about 6 %; two Newton steps
        // bring it to full f32 precision.
        let mut y = x.sqrt();
        y = 0.5 * (y + x / y);
        0.5 * (y + x / y)
    }
    #[cfg(all(
        not(all(feature = "micromath", standfast_fast_math)),
        target_arch = "arm",
        target_abi = "eabihf"
    ))]
    {
        vsqrt_f32(x)
    }
    #[cfg(all(
        not(all(feature = "micromath", standfast_fast_math)),
        not(all(target_arch = "arm", target_abi = "eabihf"))
    ))]
    {
        libm::sqrtf(x)
    }
}

/// The square root by the FPU's `vsqrt.f32` (Arm VFP, present on every
/// hard-float ABI target: Cortex-M4F/M7/M33 and A-profile): the IEEE 754
/// square root, correctly rounded in the FPU's default round-to-nearest mode,
/// so the same bits as libm's correctly rounded `sqrtf` (compared on the
/// target in QEMU by `firmware-example/ci.sh`, `--selftest-sqrt`).
///
/// The instruction sits in a two-instruction leaf function of its own
/// (`global_asm!`), because `asm!` with single-precision registers needs the
/// `vfp2` target feature, which stable Rust does not let a crate name; under
/// the hard-float ABI (AAPCS-VFP) the argument and the result are both in
/// `s0`. A call and a return more than the bare instruction, against about
/// a hundred instructions of libm's integer square root.
#[cfg(all(
    not(all(feature = "micromath", standfast_fast_math)),
    target_arch = "arm",
    target_abi = "eabihf"
))]
#[inline]
#[must_use]
#[allow(unsafe_code)]
fn vsqrt_f32(x: f32) -> f32 {
    // SAFETY: `standfast_vsqrt_f32` (below) takes an `f32` in s0 and returns
    // its square root in s0, as the hard-float ABI passes them; it touches no
    // memory, no stack and no other register (it may set FPSCR's cumulative
    // exception bits, which nothing reads).
    unsafe { fpu::standfast_vsqrt_f32(x) }
}

/// The `vsqrt.f32` leaf function and its declaration (the only `unsafe` of
/// the crate: `global_asm!` and the foreign declaration).
#[cfg(all(
    not(all(feature = "micromath", standfast_fast_math)),
    target_arch = "arm",
    target_abi = "eabihf"
))]
#[allow(unsafe_code)]
mod fpu {
    core::arch::global_asm!(
        ".section .text.standfast_vsqrt_f32,\"ax\",%progbits",
        ".global standfast_vsqrt_f32",
        ".hidden standfast_vsqrt_f32",
        ".type standfast_vsqrt_f32,%function",
        ".syntax unified",
        ".fpu vfpv2",
        ".thumb",
        ".thumb_func",
        ".p2align 1",
        "standfast_vsqrt_f32:",
        "vsqrt.f32 s0, s0",
        "bx lr",
        ".size standfast_vsqrt_f32, . - standfast_vsqrt_f32",
        ".text",
    );

    unsafe extern "C" {
        /// `vsqrt.f32 s0, s0; bx lr` (the `global_asm!` above).
        pub(super) fn standfast_vsqrt_f32(x: f32) -> f32;
    }
}

/// Sine of an angle in radians.
///
/// Under `libm`: this module's own single-precision routine (no `f64`; see the
/// module docs): the argument is reduced by π/2 in three parts (exact for
/// |x| ≤ 8192, beyond that the reduction loses accuracy gradually; no angle
/// of the model comes near), then a degree-7 odd or degree-8 even polynomial
/// on [−π/4, π/4]. Within 2 units in the last place of libm's `sinf` for
/// |x| ≤ 8192 and within 1.2e−7 absolute (unit tests); NaN for a NaN or
/// infinite argument and for |x| ≥ 2²⁴ (where neighbouring `f32` values are
/// radians apart: no angle); otherwise the result never leaves [−1, 1].
#[inline]
#[must_use]
pub(crate) fn sin(x: f32) -> f32 {
    #[cfg(all(feature = "micromath", standfast_fast_math))]
    {
        x.sin()
    }
    #[cfg(not(all(feature = "micromath", standfast_fast_math)))]
    {
        sin_cos_f32(x).0
    }
}

/// Cosine of an angle in radians. Under `libm`: this module's own
/// single-precision routine, as [`sin`].
#[inline]
#[must_use]
pub(crate) fn cos(x: f32) -> f32 {
    #[cfg(all(feature = "micromath", standfast_fast_math))]
    {
        x.cos()
    }
    #[cfg(not(all(feature = "micromath", standfast_fast_math)))]
    {
        sin_cos_f32(x).1
    }
}

/// Sine and cosine of an angle in radians, in single precision only (see
/// [`sin`]). Quadrant `j` = round(x · 2/π); r = x − j·π/2 with π/2 split in
/// three `f32` parts whose leading two have trailing zero bits (8 and 11
/// significant bits), so `j·P1` and `j·P2` are exact for |j| < 2¹³
/// (|x| ≤ 8192 gives |j| ≤ 5216); then sin r and cos r
/// by their Taylor-like minimax polynomials on [−π/4, π/4] (coefficients
/// close to the Taylor ones, adjusted for single precision; from memory of
/// the usual single-precision set, checked by the unit tests against libm).
#[cfg(not(all(feature = "micromath", standfast_fast_math)))]
#[inline]
fn sin_cos_f32(x: f32) -> (f32, f32) {
    // π/2 = P1 + P2 + P3 to about 2^-50: 1.5703125 (8 significant bits),
    // 4.837513e-4 (11 bits), then the rest rounded to single precision.
    const P1: f32 = 1.570_312_5;
    const P2: f32 = 4.837513e-4;
    const P3: f32 = 7.54979e-8;
    // From 2^24 on, neighbouring f32 values are 2 rad or more apart: such an
    // argument is no angle, and NaN says so (the callers treat NaN as a
    // figure they cannot trust).
    if x.is_nan() || x.abs() >= 16_777_216.0 {
        return (f32::NAN, f32::NAN);
    }
    // Below 2^-12, x³/6 is under half a unit in the last place of x and
    // x²/2 under half a unit of 1 (and sin keeps the sign of −0).
    if x.abs() < 1.0 / 4096.0 {
        return (x, 1.0);
    }
    let jf = floor_below_2_24(x * core::f32::consts::FRAC_2_PI + 0.5);
    let r = ((x - jf * P1) - jf * P2) - jf * P3;
    let z = r * r;
    let s = r + r * z * (-1.6666655e-1 + z * (8.332161e-3 + z * -1.9515296e-4));
    let c = 1.0 - 0.5 * z + z * z * (4.1666646e-2 + z * (-1.3887316e-3 + z * 2.4433157e-5));
    // The quadrant modulo 4 (|jf| < 2^24 here, so the conversion is exact;
    // `as` would saturate, never panic, in any case).
    let q = (jf as i64) & 3;
    let (sin, cos) = match q {
        0 => (s, c),
        1 => (c, -s),
        2 => (-s, -c),
        _ => (-c, s),
    };
    (clamp(sin, -1.0, 1.0), clamp(cos, -1.0, 1.0))
}

/// [`floor`] of a `v` with |v| < 2²⁴ that is not −0 (the quadrant of
/// [`sin_cos_f32`], whose |x| < 2²⁴ keeps |x · 2/π + 0.5| below 10⁷, and a sum
/// with +0.5 is never −0): the same value as libm's `floorf` there, by
/// truncation to an integer, which is exact (from 2²³ on every `f32` is an
/// integer already, and the truncation gives it back), minus 1 when the
/// truncation went up (a negative non-integer). Inline code with no call, so
/// that the sine and the cosine of one angle, computed side by side, are
/// computed once (the compiler merges the two inlined copies; a call to
/// `floorf` kept them apart). Tested against `floorf` over the whole range.
#[cfg(not(all(feature = "micromath", standfast_fast_math)))]
#[inline]
#[allow(clippy::cast_possible_truncation, clippy::cast_precision_loss)]
fn floor_below_2_24(v: f32) -> f32 {
    // |v| < 2²⁴ fits an i32, and every integer of that size is an f32.
    let t = (v as i32) as f32;
    if t > v {
        t - 1.0
    } else {
        t
    }
}

/// Four-quadrant arc tangent of `y / x`, in radians in (−π, π].
#[inline]
#[must_use]
pub(crate) fn atan2(y: f32, x: f32) -> f32 {
    #[cfg(all(feature = "micromath", standfast_fast_math))]
    {
        y.atan2(x)
    }
    #[cfg(not(all(feature = "micromath", standfast_fast_math)))]
    {
        libm::atan2f(y, x)
    }
}

/// Arc cosine in radians; the argument is clamped to [−1, 1] first so rounding
/// noise on a unit-vector dot product never yields NaN.
#[inline]
#[must_use]
pub(crate) fn acos(x: f32) -> f32 {
    let x = clamp(x, -1.0, 1.0);
    #[cfg(all(feature = "micromath", standfast_fast_math))]
    {
        x.acos()
    }
    #[cfg(not(all(feature = "micromath", standfast_fast_math)))]
    {
        acos_f32(x)
    }
}

/// libm's `acosf` (libm 0.2.16, `src/math/acosf.rs`) with its square root
/// taken by [`sqrt`]: the FPU's instruction on targets that have one
/// instead of libm's integer routine, which this function alone would bring
/// into a firmware image. Both square roots are correctly rounded, so the
/// bits are libm's (tested over a dense sweep).
///
/// Origin: FreeBSD `/usr/src/lib/msun/src/e_acosf.c`, converted to float by
/// Ian Lance Taylor, Cygnus Support, ian@cygnus.com; its notice, as its
/// licence asks:
///
/// Copyright (C) 1993 by Sun Microsystems, Inc. All rights reserved.
/// Developed at SunPro, a Sun Microsystems, Inc. business. Permission to
/// use, copy, modify, and distribute this software is freely granted,
/// provided that this notice is preserved.
#[cfg(not(all(feature = "micromath", standfast_fast_math)))]
fn acos_f32(x: f32) -> f32 {
    const PIO2_HI: f32 = 1.570_796_2; // 0x3fc90fda
    const PIO2_LO: f32 = 7.549_789_4e-8; // 0x33a22168
    const P_S0: f32 = 1.666_658_7e-1;
    const P_S1: f32 = -4.274_342_2e-2;
    const P_S2: f32 = -8.656_363e-3;
    const Q_S1: f32 = -7.066_296_3e-1;
    let r = |z: f32| {
        let p = z * (P_S0 + z * (P_S1 + z * P_S2));
        let q = 1.0 + z * Q_S1;
        p / q
    };
    let x1p_120 = f32::from_bits(0x0380_0000); // 2⁻¹²⁰
    let hx = x.to_bits();
    let ix = hx & 0x7fff_ffff;
    // |x| ≥ 1 or NaN.
    if ix >= 0x3f80_0000 {
        if ix == 0x3f80_0000 {
            if (hx >> 31) != 0 {
                return 2.0 * PIO2_HI + x1p_120;
            }
            return 0.0;
        }
        // libm's 0/(x − x): NaN (its sign aside; `acos` clamps first).
        return f32::NAN;
    }
    // |x| < 0.5.
    if ix < 0x3f00_0000 {
        if ix <= 0x3280_0000 {
            // |x| < 2⁻²⁶.
            return PIO2_HI + x1p_120;
        }
        return PIO2_HI - (x - (PIO2_LO - x * r(x * x)));
    }
    // x < −0.5.
    if (hx >> 31) != 0 {
        let z = (1.0 + x) * 0.5;
        let s = sqrt(z);
        let w = r(z) * s - PIO2_LO;
        return 2.0 * (PIO2_HI - (s + w));
    }
    // x > 0.5.
    let z = (1.0 - x) * 0.5;
    let s = sqrt(z);
    let df = f32::from_bits(s.to_bits() & 0xffff_f000);
    let c = (z - df * df) / (s + df);
    let w = r(z) * s + c;
    2.0 * (df + w)
}

/// Arc sine in radians; the argument is clamped to [−1, 1] first.
#[inline]
#[must_use]
pub(crate) fn asin(x: f32) -> f32 {
    let x = clamp(x, -1.0, 1.0);
    #[cfg(all(feature = "micromath", standfast_fast_math))]
    {
        x.asin()
    }
    #[cfg(not(all(feature = "micromath", standfast_fast_math)))]
    {
        libm::asinf(x)
    }
}

/// Natural exponential eˣ.
#[inline]
#[must_use]
pub(crate) fn exp(x: f32) -> f32 {
    #[cfg(all(feature = "micromath", standfast_fast_math))]
    {
        x.exp()
    }
    #[cfg(not(all(feature = "micromath", standfast_fast_math)))]
    {
        libm::expf(x)
    }
}

/// Natural logarithm.
#[inline]
#[must_use]
pub(crate) fn ln(x: f32) -> f32 {
    #[cfg(all(feature = "micromath", standfast_fast_math))]
    {
        if x <= 0.0 || !x.is_finite() {
            return x.ln();
        }
        // Two Newton steps on exp(l) = x refine micromath's coarse logarithm
        // with its far more accurate exponential.
        let mut l = x.ln();
        l += x * (-l).exp() - 1.0;
        l + x * (-l).exp() - 1.0
    }
    #[cfg(not(all(feature = "micromath", standfast_fast_math)))]
    {
        libm::logf(x)
    }
}

/// `x` raised to the real power `y`.
#[inline]
#[must_use]
pub(crate) fn powf(x: f32, y: f32) -> f32 {
    #[cfg(all(feature = "micromath", standfast_fast_math))]
    {
        if x > 0.0 {
            exp(y * ln(x))
        } else {
            x.powf(y)
        }
    }
    #[cfg(not(all(feature = "micromath", standfast_fast_math)))]
    {
        libm::powf(x, y)
    }
}

/// `sqrt(x² + y²)` without undue overflow or underflow.
///
/// Under `libm`: this module's own single-precision routine (libm's `hypotf`
/// computes in `f64`): both arguments are scaled by a power of two (exact)
/// into a range where their squares neither overflow nor underflow, then
/// [`sqrt`] of the sum of squares, scaled back. Within 1 unit in the last
/// place of libm's `hypotf` (unit tests). Infinite if either argument is
/// infinite, else NaN if either is NaN (as C's `hypot`).
#[inline]
#[must_use]
pub(crate) fn hypot(x: f32, y: f32) -> f32 {
    #[cfg(all(feature = "micromath", standfast_fast_math))]
    {
        sqrt(x * x + y * y)
    }
    #[cfg(not(all(feature = "micromath", standfast_fast_math)))]
    {
        hypot_f32(x, y)
    }
}

/// See [`hypot`].
#[cfg(not(all(feature = "micromath", standfast_fast_math)))]
#[inline]
fn hypot_f32(x: f32, y: f32) -> f32 {
    /// 2^64 and 2^-64: squares of values up to 2^63 stay below f32::MAX
    /// (about 2^128), and of values down to 2^-63 above the normal range.
    const TWO_64: f32 = 18_446_744_073_709_551_616.0;
    const TWO_M64: f32 = 1.0 / TWO_64;
    let (a, b) = (x.abs(), y.abs());
    if a == f32::INFINITY || b == f32::INFINITY {
        return f32::INFINITY;
    }
    if a.is_nan() || b.is_nan() {
        return f32::NAN;
    }
    let (big, small) = if a >= b { (a, b) } else { (b, a) };
    if big == 0.0 {
        return 0.0;
    }
    if big > TWO_64 {
        let (p, q) = (big * TWO_M64, small * TWO_M64);
        sqrt(p * p + q * q) * TWO_64
    } else if big < TWO_M64 {
        let (p, q) = (big * TWO_64, small * TWO_64);
        sqrt(p * p + q * q) * TWO_M64
    } else {
        sqrt(big * big + small * small)
    }
}

/// Largest integer value not greater than `x`.
#[inline]
#[must_use]
pub(crate) fn floor(x: f32) -> f32 {
    #[cfg(all(feature = "micromath", standfast_fast_math))]
    {
        x.floor()
    }
    #[cfg(not(all(feature = "micromath", standfast_fast_math)))]
    {
        libm::floorf(x)
    }
}

/// `x` limited to `[lo, hi]`; NaN stays NaN.
#[inline]
#[must_use]
pub fn clamp(x: f32, lo: f32, hi: f32) -> f32 {
    if x < lo {
        lo
    } else if x > hi {
        hi
    } else {
        x
    }
}

/// Degrees to radians.
#[inline]
#[must_use]
pub fn deg_to_rad(deg: f32) -> f32 {
    deg * (PI / 180.0)
}

/// Radians to degrees.
#[inline]
#[must_use]
pub fn rad_to_deg(rad: f32) -> f32 {
    rad * (180.0 / PI)
}

/// An angle in radians wrapped to [0, 2π).
#[inline]
#[must_use]
pub fn wrap_tau(rad: f32) -> f32 {
    let w = rad - TAU * floor(rad / TAU);
    if !(0.0..TAU).contains(&w) {
        0.0
    } else {
        w
    }
}

/// An angle in radians wrapped to [−π, π).
#[inline]
#[must_use]
pub fn wrap_pi(rad: f32) -> f32 {
    wrap_tau(rad + PI) - PI
}

/// A 3-vector of `f32` components. The frame and unit are those of the quantity
/// it holds; see the item that returns it.
#[derive(Clone, Copy, Debug, Default, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct Vec3 {
    /// First component.
    pub x: f32,
    /// Second component.
    pub y: f32,
    /// Third component.
    pub z: f32,
}

impl Vec3 {
    /// The zero vector.
    pub const ZERO: Vec3 = Vec3::new(0.0, 0.0, 0.0);
    /// Unit vector along +x.
    pub const X: Vec3 = Vec3::new(1.0, 0.0, 0.0);
    /// Unit vector along +y.
    pub const Y: Vec3 = Vec3::new(0.0, 1.0, 0.0);
    /// Unit vector along +z.
    pub const Z: Vec3 = Vec3::new(0.0, 0.0, 1.0);

    /// A vector from its components.
    #[must_use]
    pub const fn new(x: f32, y: f32, z: f32) -> Self {
        Vec3 { x, y, z }
    }

    /// A vector from an array `[x, y, z]`.
    #[must_use]
    pub const fn from_array(a: [f32; 3]) -> Self {
        Vec3::new(a[0], a[1], a[2])
    }

    /// The components as an array `[x, y, z]`.
    #[must_use]
    pub const fn to_array(self) -> [f32; 3] {
        [self.x, self.y, self.z]
    }

    /// Scalar product.
    #[must_use]
    pub fn dot(self, o: Vec3) -> f32 {
        self.x * o.x + self.y * o.y + self.z * o.z
    }

    /// Vector product `self × o` (right-handed).
    #[must_use]
    pub fn cross(self, o: Vec3) -> Vec3 {
        Vec3::new(
            self.y * o.z - self.z * o.y,
            self.z * o.x - self.x * o.z,
            self.x * o.y - self.y * o.x,
        )
    }

    /// Euclidean length.
    #[must_use]
    pub fn norm(self) -> f32 {
        sqrt(self.dot(self))
    }

    /// The unit vector along `self`, or `None` for a zero or non-finite vector.
    #[must_use]
    pub fn normalized(self) -> Option<Vec3> {
        let n = self.norm();
        if n > 1e-12 && n.is_finite() {
            Some(self * (1.0 / n))
        } else {
            None
        }
    }

    /// True when every component is finite.
    #[must_use]
    pub fn is_finite(self) -> bool {
        self.x.is_finite() && self.y.is_finite() && self.z.is_finite()
    }

    /// The part of `self` perpendicular to the unit vector `n`.
    #[must_use]
    pub fn reject(self, n: Vec3) -> Vec3 {
        self - n * self.dot(n)
    }
}

impl core::ops::Add for Vec3 {
    type Output = Vec3;
    fn add(self, o: Vec3) -> Vec3 {
        Vec3::new(self.x + o.x, self.y + o.y, self.z + o.z)
    }
}

impl core::ops::AddAssign for Vec3 {
    fn add_assign(&mut self, o: Vec3) {
        *self = *self + o;
    }
}

impl core::ops::Sub for Vec3 {
    type Output = Vec3;
    fn sub(self, o: Vec3) -> Vec3 {
        Vec3::new(self.x - o.x, self.y - o.y, self.z - o.z)
    }
}

impl core::ops::Neg for Vec3 {
    type Output = Vec3;
    fn neg(self) -> Vec3 {
        Vec3::new(-self.x, -self.y, -self.z)
    }
}

impl core::ops::Mul<f32> for Vec3 {
    type Output = Vec3;
    fn mul(self, k: f32) -> Vec3 {
        Vec3::new(self.x * k, self.y * k, self.z * k)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn cross_is_right_handed() {
        assert_eq!(Vec3::X.cross(Vec3::Y), Vec3::Z);
        assert_eq!(Vec3::Y.cross(Vec3::Z), Vec3::X);
    }

    #[test]
    fn wraps() {
        assert!((wrap_tau(-0.5) - (TAU - 0.5)).abs() < 1e-6);
        assert!((wrap_pi(3.0 * PI / 2.0) + PI / 2.0).abs() < 1e-5);
        assert!(wrap_tau(TAU) < 1e-6);
    }

    #[test]
    fn clamped_inverse_trig_never_nan() {
        assert!(!acos(1.000_001).is_nan());
        assert!(!asin(-1.000_001).is_nan());
    }
}

/// The single-precision routines against the `libm` crate (a port of musl's
/// libm: the reference library the module used before; its `sinf`, `cosf` and
/// `hypotf` compute in `f64`, correctly rounded or within about one unit in
/// the last place).
#[cfg(all(test, not(all(feature = "micromath", standfast_fast_math))))]
mod against_libm {
    use super::*;

    /// Distance in units in the last place between two finite `f32` (the
    /// number of representable values between them).
    fn ulps(a: f32, b: f32) -> i64 {
        let key = |v: f32| {
            let i = i64::from(v.to_bits() as i32);
            if i < 0 {
                i64::from(i32::MIN) - i
            } else {
                i
            }
        };
        (key(a) - key(b)).abs()
    }

    #[test]
    fn sin_and_cos_within_two_ulps_of_libm_up_to_8192_rad() {
        let n = 400_000;
        for lim in [1.0_f32, 8.0, 8192.0] {
            for i in 0..=n {
                let x = -lim + 2.0 * lim * (i as f32) / (n as f32);
                for (ours, theirs) in [(sin(x), libm::sinf(x)), (cos(x), libm::cosf(x))] {
                    // Near a zero of the function the absolute error counts:
                    // at most one unit of the last place of 1 (2^-23).
                    assert!(
                        (ours - theirs).abs() <= 1.2e-7,
                        "x = {x}: {ours} vs {theirs}"
                    );
                    if theirs.abs() > 1e-3 {
                        assert!(ulps(ours, theirs) <= 2, "x = {x}: {ours} vs {theirs}");
                    }
                }
            }
        }
    }

    /// The quadrant's floor is libm's `floorf` to the bit wherever it is
    /// used: |v| < 2²⁴ (−0 aside, which the quadrant never sees). Every
    /// 127th `f32` of the range, both signs, and every value within 8 units
    /// in the last place of each integer up to ±4096 and of the powers of 2.
    #[cfg(not(all(feature = "micromath", standfast_fast_math)))]
    #[test]
    fn the_quadrants_floor_is_floorf() {
        let check = |v: f32| {
            if v.abs() < 16_777_216.0 && v.to_bits() != 0x8000_0000 {
                let (ours, libms) = (floor_below_2_24(v), libm::floorf(v));
                assert_eq!(ours.to_bits(), libms.to_bits(), "{v}: {ours} vs {libms}");
            }
        };
        let top = 16_777_216.0_f32.to_bits();
        let mut b = 0_u32;
        while b < top {
            check(f32::from_bits(b));
            check(-f32::from_bits(b));
            b += 127;
        }
        let near = |x: f32| {
            for d in 0..=8 {
                for y in [x, -x] {
                    check(f32::from_bits(y.to_bits().wrapping_add(d)));
                    check(f32::from_bits(y.to_bits().wrapping_sub(d)));
                }
            }
        };
        for n in 0..=4096 {
            near(n as f32);
            near(n as f32 + 0.5);
        }
        for e in 0..25 {
            near((1_u32 << e) as f32);
        }
    }

    #[test]
    fn sin_and_cos_exact_points_and_bounds() {
        assert_eq!(sin(0.0), 0.0);
        assert_eq!(cos(0.0), 1.0);
        assert!(sin(-0.0).is_sign_negative());
        assert!((sin(PI / 6.0) - 0.5).abs() <= 6e-8);
        assert!((cos(PI / 3.0) - 0.5).abs() <= 6e-8);
        assert!(sin(f32::NAN).is_nan() && cos(f32::INFINITY).is_nan());
        assert!(sin(f32::NEG_INFINITY).is_nan());
        // Beyond the exact range the result is still a sine's value, up to
        // 2^24, from where it is NaN.
        for x in [1e5_f32, -3.3e6, 16_777_215.0] {
            assert!((-1.0..=1.0).contains(&sin(x)) && (-1.0..=1.0).contains(&cos(x)));
        }
        for x in [16_777_216.0_f32, -3.3e9, 1e30, f32::MAX, -f32::MAX] {
            assert!(sin(x).is_nan() && cos(x).is_nan());
        }
    }

    #[test]
    fn hypot_within_one_ulp_of_libm() {
        let mut checked = 0;
        for i in 0..200_000_u32 {
            // Magnitudes from about 1e-38 to 1e38, both signs, both orders.
            let a = f32::from_bits(0x0080_0000_u32.wrapping_add(i.wrapping_mul(10_601)));
            let b =
                f32::from_bits(0x0080_0000_u32.wrapping_add(i.wrapping_mul(21_157)) ^ 0x8000_0000);
            if !a.is_finite() || !b.is_finite() {
                continue;
            }
            let (ours, theirs) = (hypot(a, b), libm::hypotf(a, b));
            assert!(
                ulps(ours, theirs) <= 1,
                "hypot({a:e}, {b:e}) = {ours:e}, libm {theirs:e}"
            );
            checked += 1;
        }
        assert!(checked > 100_000);
    }

    #[test]
    fn hypot_special_values() {
        assert_eq!(hypot(3.0, 4.0), 5.0);
        assert_eq!(hypot(-5.0, 12.0), 13.0);
        assert_eq!(hypot(0.0, -0.0), 0.0);
        assert_eq!(hypot(3e30, 4e30), libm::hypotf(3e30, 4e30));
        assert_eq!(hypot(3e-30, 4e-30), libm::hypotf(3e-30, 4e-30));
        assert_eq!(hypot(f32::INFINITY, f32::NAN), f32::INFINITY);
        assert_eq!(hypot(f32::NAN, f32::NEG_INFINITY), f32::INFINITY);
        assert!(hypot(f32::NAN, 1.0).is_nan());
        assert!(hypot(f32::MAX, f32::MAX).is_infinite());
    }

    // The arc cosine is libm's `acosf`, bit for bit (its square root only
    // is taken another way): every 64th f32 from −1 to 1, the edges of its
    // branches, and outside [−1, 1] (clamped by `acos`; NaN for the port).
    #[cfg(not(all(feature = "micromath", standfast_fast_math)))]
    #[test]
    fn acos_is_libms_acosf() {
        let mut checked = 0_u32;
        for bits in (0..=0x3f80_0000_u32).step_by(64) {
            for x in [f32::from_bits(bits), -f32::from_bits(bits)] {
                assert_eq!(acos_f32(x).to_bits(), libm::acosf(x).to_bits(), "{x:e}");
                checked += 1;
            }
        }
        for x in [
            0.5_f32,
            -0.5,
            0.5_f32.next_down(),
            -0.5_f32.next_up(),
            1.0,
            -1.0,
        ] {
            assert_eq!(acos_f32(x).to_bits(), libm::acosf(x).to_bits(), "{x:e}");
        }
        for x in [1.5_f32, -3.0, 1.0_f32.next_up()] {
            assert_eq!(acos(x).to_bits(), libm::acosf(x.clamp(-1.0, 1.0)).to_bits());
            assert!(acos_f32(x).is_nan() && libm::acosf(x).is_nan());
        }
        assert!(acos_f32(f32::NAN).is_nan());
        assert!(checked > 400_000);
    }
}
