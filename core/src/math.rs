//! Scalar functions and a small 3-vector, with the math back end chosen by feature.
//!
//! Every transcendental function the crate uses goes through this module, so the
//! `libm` (default) and `micromath` features switch all of them at once. With both
//! features on, `micromath` wins. Angles are radians everywhere.

#[cfg(not(any(feature = "libm", feature = "micromath")))]
compile_error!("standfast needs a math back end: enable feature `libm` (default) or `micromath`");

#[cfg(feature = "micromath")]
#[allow(unused_imports)]
use micromath::F32Ext as _;

/// π as `f32`.
pub const PI: f32 = core::f32::consts::PI;
/// 2π as `f32`.
pub const TAU: f32 = core::f32::consts::TAU;
/// Standard acceleration of gravity g₀ in m/s² (ISO 80000-3, ISO 2533).
pub const STANDARD_GRAVITY_MPS2: f32 = 9.806_65;

/// Square root; NaN for negative input.
#[inline]
#[must_use]
pub fn sqrt(x: f32) -> f32 {
    #[cfg(feature = "micromath")]
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
    #[cfg(all(feature = "libm", not(feature = "micromath")))]
    {
        libm::sqrtf(x)
    }
}

/// Sine of an angle in radians.
#[inline]
#[must_use]
pub fn sin(x: f32) -> f32 {
    #[cfg(feature = "micromath")]
    {
        x.sin()
    }
    #[cfg(all(feature = "libm", not(feature = "micromath")))]
    {
        libm::sinf(x)
    }
}

/// Cosine of an angle in radians.
#[inline]
#[must_use]
pub fn cos(x: f32) -> f32 {
    #[cfg(feature = "micromath")]
    {
        x.cos()
    }
    #[cfg(all(feature = "libm", not(feature = "micromath")))]
    {
        libm::cosf(x)
    }
}

/// Four-quadrant arc tangent of `y / x`, in radians in (−π, π].
#[inline]
#[must_use]
pub fn atan2(y: f32, x: f32) -> f32 {
    #[cfg(feature = "micromath")]
    {
        y.atan2(x)
    }
    #[cfg(all(feature = "libm", not(feature = "micromath")))]
    {
        libm::atan2f(y, x)
    }
}

/// Arc cosine in radians; the argument is clamped to [−1, 1] first so rounding
/// noise on a unit-vector dot product never yields NaN.
#[inline]
#[must_use]
pub fn acos(x: f32) -> f32 {
    let x = clamp(x, -1.0, 1.0);
    #[cfg(feature = "micromath")]
    {
        x.acos()
    }
    #[cfg(all(feature = "libm", not(feature = "micromath")))]
    {
        libm::acosf(x)
    }
}

/// Arc sine in radians; the argument is clamped to [−1, 1] first.
#[inline]
#[must_use]
pub fn asin(x: f32) -> f32 {
    let x = clamp(x, -1.0, 1.0);
    #[cfg(feature = "micromath")]
    {
        x.asin()
    }
    #[cfg(all(feature = "libm", not(feature = "micromath")))]
    {
        libm::asinf(x)
    }
}

/// Natural exponential eˣ.
#[inline]
#[must_use]
pub fn exp(x: f32) -> f32 {
    #[cfg(feature = "micromath")]
    {
        x.exp()
    }
    #[cfg(all(feature = "libm", not(feature = "micromath")))]
    {
        libm::expf(x)
    }
}

/// Natural logarithm.
#[inline]
#[must_use]
pub fn ln(x: f32) -> f32 {
    #[cfg(feature = "micromath")]
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
    #[cfg(all(feature = "libm", not(feature = "micromath")))]
    {
        libm::logf(x)
    }
}

/// `x` raised to the real power `y`.
#[inline]
#[must_use]
pub fn powf(x: f32, y: f32) -> f32 {
    #[cfg(feature = "micromath")]
    {
        if x > 0.0 {
            exp(y * ln(x))
        } else {
            x.powf(y)
        }
    }
    #[cfg(all(feature = "libm", not(feature = "micromath")))]
    {
        libm::powf(x, y)
    }
}

/// `sqrt(x² + y²)` without undue overflow.
#[inline]
#[must_use]
pub fn hypot(x: f32, y: f32) -> f32 {
    #[cfg(feature = "micromath")]
    {
        sqrt(x * x + y * y)
    }
    #[cfg(all(feature = "libm", not(feature = "micromath")))]
    {
        libm::hypotf(x, y)
    }
}

/// Largest integer value not greater than `x`.
#[inline]
#[must_use]
pub fn floor(x: f32) -> f32 {
    #[cfg(feature = "micromath")]
    {
        x.floor()
    }
    #[cfg(all(feature = "libm", not(feature = "micromath")))]
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
