//! Quantities with units at the host boundary.
//!
//! A person writes `"18 lb"`, `"45 in"`, `"30 mph"`, `"12 N·m"` or `"10 °C"`;
//! inside, every value is SI (`f64`): metres, kilograms, metres per second,
//! newton metres, radians, pascals, kelvin, newtons, seconds, metres per second
//! squared, square metres.
//!
//! Each dimension has its own type ([`Length`], [`Mass`], [`Speed`], ...), so
//! `"18 lb"` is refused where a length is expected, with an error that names
//! the accepted units.
//!
//! **Plain numbers** (no unit) are taken in the dimension's SI unit, listed by
//! [`Dim::si_symbol`]: m, kg, m/s, N m, rad, Pa, K, N, s, m/s², m². Note that a
//! bare temperature is in kelvin and a bare angle in radians; write the unit
//! (`"10 °C"`, `"35 deg"`) to avoid surprises. A caller may choose another
//! unit for bare numbers with [`Quantity::parse_or`].
//!
//! **Conversion factors** are exact by definition where a definition exists:
//! the international yard and pound (1959: 1 yd = 0.9144 m, 1 lb =
//! 0.45359237 kg), the international nautical mile (1852 m), standard gravity
//! (3rd CGPM 1901: 9.806 65 m/s²), the bar, the degree (π/180 rad) and the
//! temperature scales (ITS: 0 °C = 273.15 K; °F = 5/9 K). The
//! conventional inch and millimetre of mercury are the values of NIST SP 811
//! (2008) Appendix B.8. Units that are products (lbf·ft, lbf/in²) are formed
//! from the exact factors above.
//!
//! **Unit spelling.** Separators between unit factors may be a space, `·`,
//! `⋅`, `*`, `.`, `-` or nothing (`N m`, `N·m`, `N.m`, `Nm` are the same);
//! `²`, `^2` and `2` are the same. Matching is case-sensitive first, then
//! case-insensitive when that is unambiguous (`MPH`, `Kg`).

use core::fmt;
use core::marker::PhantomData;

use serde::de::{self, Deserializer, Visitor};
use serde::{Deserialize, Serialize, Serializer};
use standfast::air::ZERO_CELSIUS_K_F64;
use standfast::math::STANDARD_GRAVITY_MPS2_F64;

/// One unit of a dimension: how to turn a value in it into SI.
///
/// `si = value * factor + offset` (the offset is non-zero only for
/// temperature scales).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Unit {
    /// Spellings, the first being the preferred symbol.
    pub symbols: &'static [&'static str],
    /// Multiplier to the SI unit.
    pub factor: f64,
    /// Added after the multiplication (temperature scales only), SI unit.
    pub offset: f64,
}

impl Unit {
    /// The value in SI for `value` in this unit.
    #[must_use]
    pub fn to_si(&self, value: f64) -> f64 {
        value * self.factor + self.offset
    }

    /// The value in this unit for `si` in the SI unit.
    #[must_use]
    pub fn from_si(&self, si: f64) -> f64 {
        (si - self.offset) / self.factor
    }

    /// The preferred symbol.
    #[must_use]
    pub fn symbol(&self) -> &'static str {
        self.symbols.first().copied().unwrap_or("")
    }
}

const fn u(symbols: &'static [&'static str], factor: f64) -> Unit {
    Unit {
        symbols,
        factor,
        offset: 0.0,
    }
}

/// International foot, m (international yard and pound agreement, 1959).
pub const FOOT_M: f64 = 0.3048;
/// International inch, m (1959 agreement).
pub const INCH_M: f64 = 0.0254;
/// International avoirdupois pound, kg (1959 agreement).
pub const POUND_KG: f64 = 0.453_592_37;
/// Pound-force, N: one pound under standard gravity (exact by the two
/// definitions: the pound above and standard gravity, the core's
/// `standfast::math::STANDARD_GRAVITY_MPS2_F64`).
pub const POUND_FORCE_N: f64 = POUND_KG * STANDARD_GRAVITY_MPS2_F64;

/// An SI value read at the host boundary (f64) as the core takes it (f32),
/// rounded to nearest. Values out of f32's range become ±infinity, which
/// the core's checks refuse; every caller passes values already checked
/// against their accepted range (rig, log, bridge and what-if values all
/// fit f32).
#[must_use]
#[allow(clippy::cast_possible_truncation)] // rounding to f32 is the point
pub fn f32_of(x: f64) -> f32 {
    x as f32
}

const LENGTH_UNITS: &[Unit] = &[
    u(&["m", "metre", "meter", "metres", "meters"], 1.0),
    u(
        &[
            "mm",
            "millimetre",
            "millimeter",
            "millimetres",
            "millimeters",
        ],
        1e-3,
    ),
    u(
        &[
            "cm",
            "centimetre",
            "centimeter",
            "centimetres",
            "centimeters",
        ],
        1e-2,
    ),
    u(
        &["km", "kilometre", "kilometer", "kilometres", "kilometers"],
        1e3,
    ),
    u(&["in", "inch", "inches"], INCH_M),
    u(&["ft", "foot", "feet"], FOOT_M),
    u(&["yd", "yard", "yards"], 0.9144),
];

const MASS_UNITS: &[Unit] = &[
    u(&["kg", "kilogram", "kilograms"], 1.0),
    u(&["g", "gram", "grams"], 1e-3),
    u(&["t", "tonne", "tonnes"], 1e3),
    u(&["lb", "lbs", "pound", "pounds"], POUND_KG),
    // 1 oz = 1/16 lb (avoirdupois).
    u(&["oz", "ounce", "ounces"], POUND_KG / 16.0),
];

const SPEED_UNITS: &[Unit] = &[
    u(&["m/s", "mps", "ms-1", "ms^-1"], 1.0),
    u(&["km/h", "kmh", "kph", "kmph"], 1.0 / 3.6),
    // 1 mile = 1760 yd = 1609.344 m; per hour: 0.44704 m/s.
    u(&["mph", "mi/h"], 0.447_04),
    // 1 international nautical mile = 1852 m.
    u(&["kn", "kt", "kts", "knot", "knots"], 1852.0 / 3600.0),
    u(&["ft/s", "fps"], FOOT_M),
];

const TORQUE_UNITS: &[Unit] = &[
    u(&["N m", "Nm", "newton metre", "newton meter"], 1.0),
    u(&["kN m", "kNm"], 1e3),
    u(&["N cm", "Ncm"], 1e-2),
    u(&["N mm", "Nmm"], 1e-3),
    u(
        &["lbf ft", "lb ft", "ft lbf", "ft lb"],
        POUND_FORCE_N * FOOT_M,
    ),
    u(
        &["lbf in", "lb in", "in lbf", "in lb"],
        POUND_FORCE_N * INCH_M,
    ),
    u(&["ozf in", "oz in", "in oz"], POUND_FORCE_N / 16.0 * INCH_M),
    u(&["kgf m", "kgm"], STANDARD_GRAVITY_MPS2_F64),
    u(&["kgf cm", "kgcm"], STANDARD_GRAVITY_MPS2_F64 * 1e-2),
];

const FORCE_UNITS: &[Unit] = &[
    u(&["N", "newton", "newtons"], 1.0),
    u(&["kN"], 1e3),
    u(&["lbf"], POUND_FORCE_N),
    u(&["kgf", "kp"], STANDARD_GRAVITY_MPS2_F64),
];

const ANGLE_UNITS: &[Unit] = &[
    u(&["rad", "radian", "radians"], 1.0),
    u(&["mrad"], 1e-3),
    u(
        &["deg", "°", "degree", "degrees"],
        core::f64::consts::PI / 180.0,
    ),
    u(&["arcmin", "'"], core::f64::consts::PI / 10_800.0),
    u(&["arcsec", "\""], core::f64::consts::PI / 648_000.0),
    // One hour of hour angle or right ascension is 15°.
    u(&["hourangle", "hour angle"], core::f64::consts::PI / 12.0),
];

const PRESSURE_UNITS: &[Unit] = &[
    u(&["Pa", "N/m2"], 1.0),
    u(&["hPa"], 1e2),
    u(&["kPa"], 1e3),
    u(&["mbar", "mb"], 1e2),
    u(&["bar"], 1e5),
    // lbf/in².
    u(&["psi", "lbf/in2"], POUND_FORCE_N / (INCH_M * INCH_M)),
    u(&["psf", "lbf/ft2"], POUND_FORCE_N / (FOOT_M * FOOT_M)),
    // NIST SP 811 (2008) App. B.8: inch of mercury (conventional) 3.386 389 E+03 Pa.
    u(&["inHg"], 3_386.389),
    // NIST SP 811 (2008) App. B.8: millimetre of mercury (conventional) 1.333 224 E+02 Pa.
    u(&["mmHg"], 133.322_4),
];

const TEMPERATURE_UNITS: &[Unit] = &[
    Unit {
        symbols: &["K", "kelvin"],
        factor: 1.0,
        offset: 0.0,
    },
    Unit {
        symbols: &["°C", "degC", "C", "℃", "celsius"],
        factor: 1.0,
        offset: ZERO_CELSIUS_K_F64,
    },
    // T/K = (t/°F + 459.67) × 5/9.
    Unit {
        symbols: &["°F", "degF", "F", "℉", "fahrenheit"],
        factor: 5.0 / 9.0,
        offset: 459.67 * 5.0 / 9.0,
    },
];

const TIME_UNITS: &[Unit] = &[
    u(&["s", "sec", "second", "seconds"], 1.0),
    u(&["ms", "millisecond", "milliseconds"], 1e-3),
    u(&["min", "minute", "minutes"], 60.0),
    u(&["h", "hr", "hour", "hours"], 3600.0),
    u(&["d", "day", "days"], 86_400.0),
];

const ACCELERATION_UNITS: &[Unit] = &[
    u(&["m/s2", "ms-2", "mps2"], 1.0),
    u(&["g", "gn", "g0"], STANDARD_GRAVITY_MPS2_F64),
    u(&["mg", "mgn"], STANDARD_GRAVITY_MPS2_F64 * 1e-3),
    u(&["ft/s2"], FOOT_M),
];

const AREA_UNITS: &[Unit] = &[
    u(&["m2", "sq m"], 1.0),
    u(&["cm2", "sq cm"], 1e-4),
    u(&["mm2", "sq mm"], 1e-6),
    u(&["in2", "sq in"], INCH_M * INCH_M),
    u(&["ft2", "sq ft"], FOOT_M * FOOT_M),
];

/// A physical dimension known at the host boundary.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub enum Dim {
    /// Length, SI unit m.
    Length,
    /// Mass, SI unit kg.
    Mass,
    /// Speed, SI unit m/s.
    Speed,
    /// Torque (moment), SI unit N·m.
    Torque,
    /// Force, SI unit N.
    Force,
    /// Plane angle, SI unit rad.
    Angle,
    /// Pressure, SI unit Pa.
    Pressure,
    /// Thermodynamic temperature, SI unit K.
    Temperature,
    /// Time (duration), SI unit s.
    Time,
    /// Acceleration (and accelerometer specific force), SI unit m/s².
    Acceleration,
    /// Area, SI unit m².
    Area,
}

impl Dim {
    /// Every dimension, for looking up which one a unit belongs to.
    pub const ALL: [Dim; 11] = [
        Dim::Length,
        Dim::Mass,
        Dim::Speed,
        Dim::Torque,
        Dim::Force,
        Dim::Angle,
        Dim::Pressure,
        Dim::Temperature,
        Dim::Time,
        Dim::Acceleration,
        Dim::Area,
    ];

    /// Lower-case name for messages ("length", "mass", ...).
    #[must_use]
    pub fn name(self) -> &'static str {
        match self {
            Dim::Length => "length",
            Dim::Mass => "mass",
            Dim::Speed => "speed",
            Dim::Torque => "torque",
            Dim::Force => "force",
            Dim::Angle => "angle",
            Dim::Pressure => "pressure",
            Dim::Temperature => "temperature",
            Dim::Time => "time",
            Dim::Acceleration => "acceleration",
            Dim::Area => "area",
        }
    }

    /// The known units, SI first.
    #[must_use]
    pub fn units(self) -> &'static [Unit] {
        match self {
            Dim::Length => LENGTH_UNITS,
            Dim::Mass => MASS_UNITS,
            Dim::Speed => SPEED_UNITS,
            Dim::Torque => TORQUE_UNITS,
            Dim::Force => FORCE_UNITS,
            Dim::Angle => ANGLE_UNITS,
            Dim::Pressure => PRESSURE_UNITS,
            Dim::Temperature => TEMPERATURE_UNITS,
            Dim::Time => TIME_UNITS,
            Dim::Acceleration => ACCELERATION_UNITS,
            Dim::Area => AREA_UNITS,
        }
    }

    /// The SI unit (the unit of a plain number).
    #[must_use]
    pub fn si_unit(self) -> Unit {
        self.units().first().copied().unwrap_or(u(&[""], 1.0))
    }

    /// Symbol of the SI unit.
    #[must_use]
    pub fn si_symbol(self) -> &'static str {
        self.si_unit().symbol()
    }

    /// The preferred symbols of all units, comma-separated, for messages.
    #[must_use]
    pub fn accepted(self) -> String {
        let list: Vec<&str> = self.units().iter().map(Unit::symbol).collect();
        list.join(", ")
    }

    /// Finds a unit of this dimension by spelling (see the module docs for
    /// the spelling rules).
    ///
    /// # Errors
    /// [`UnitError::WrongDimension`] when the spelling is a unit of another
    /// dimension, [`UnitError::UnknownUnit`] otherwise.
    pub fn unit(self, spelling: &str) -> Result<Unit, UnitError> {
        if let Some(unit) = find_in(self.units(), spelling) {
            return Ok(unit);
        }
        for other in Dim::ALL {
            if other != self && find_in(other.units(), spelling).is_some() {
                return Err(UnitError::WrongDimension {
                    unit: crate::input::bounded::bounded(spelling),
                    unit_dim: other,
                    expected: self,
                });
            }
        }
        Err(UnitError::UnknownUnit {
            unit: crate::input::bounded::bounded(spelling.trim()),
            expected: self,
        })
    }
}

impl fmt::Display for Dim {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.name())
    }
}

/// The characters of the canonical form of a unit spelling: separators
/// dropped, powers as digits, micro signs as `u` (no allocation).
fn canonical_chars(s: &str) -> impl Iterator<Item = char> + '_ {
    s.trim().chars().filter_map(|c| match c {
        ' ' | '\t' | '·' | '⋅' | '*' | '.' | '-' | '_' | '^' | '⁻' => None,
        '²' => Some('2'),
        '³' => Some('3'),
        'µ' | 'μ' => Some('u'),
        _ => Some(c),
    })
}

/// Whether two spellings have the same canonical form (optionally ignoring
/// case).
fn same_spelling(a: &str, b: &str, ignore_case: bool) -> bool {
    if ignore_case {
        canonical_chars(a)
            .flat_map(char::to_lowercase)
            .eq(canonical_chars(b).flat_map(char::to_lowercase))
    } else {
        canonical_chars(a).eq(canonical_chars(b))
    }
}

fn find_in(units: &'static [Unit], spelling: &str) -> Option<Unit> {
    // Nothing to look up when only separators were written.
    canonical_chars(spelling).next()?;
    // Case-sensitive first.
    for unit in units {
        if unit
            .symbols
            .iter()
            .any(|s| same_spelling(s, spelling, false))
        {
            return Some(*unit);
        }
    }
    // Then case-insensitive, only when exactly one unit matches.
    let mut found = None;
    for unit in units {
        if unit
            .symbols
            .iter()
            .any(|s| same_spelling(s, spelling, true))
        {
            if found.is_some() {
                return None;
            }
            found = Some(*unit);
        }
    }
    found
}

/// Why a quantity could not be read.
#[derive(Clone, Debug, PartialEq, thiserror::Error)]
pub enum UnitError {
    /// Nothing was given.
    #[error("empty value; expected a {0} such as \"1.5 {si}\" (units: {units})", si = .0.si_symbol(), units = .0.accepted())]
    Empty(Dim),
    /// The text does not start with a number.
    #[error("\"{text}\" does not start with a number; expected a {expected} such as \"1.5 {si}\" (units: {units})", si = .expected.si_symbol(), units = .expected.accepted())]
    NoNumber {
        /// What was given.
        text: String,
        /// The dimension expected.
        expected: Dim,
    },
    /// The number is NaN or infinite.
    #[error("\"{text}\" is not a finite number")]
    NotFinite {
        /// What was given.
        text: String,
    },
    /// The number is finite but too large once converted to the SI unit.
    #[error("\"{text}\" is too large (not finite in the SI unit)")]
    TooLarge {
        /// What was given.
        text: String,
    },
    /// The unit is known, but for another dimension.
    #[error("\"{unit}\" is a unit of {unit_dim}, but a {expected} is expected here (units: {units})", units = .expected.accepted())]
    WrongDimension {
        /// The unit given.
        unit: String,
        /// Its dimension.
        unit_dim: Dim,
        /// The dimension expected.
        expected: Dim,
    },
    /// The unit is not known at all.
    #[error("unknown unit \"{unit}\" for a {expected} (units: {units})", units = .expected.accepted())]
    UnknownUnit {
        /// The unit given.
        unit: String,
        /// The dimension expected.
        expected: Dim,
    },
}

/// Splits `"18.5 lb"` into `(18.5, "lb")`; the unit part may be empty.
///
/// # Errors
/// [`UnitError::NoNumber`] or [`UnitError::NotFinite`]; `dim` is only used
/// for the message.
pub fn split_number(text: &str, dim: Dim) -> Result<(f64, &str), UnitError> {
    let t = text.trim();
    if t.is_empty() {
        return Err(UnitError::Empty(dim));
    }
    // The longest prefix that is a decimal number, found in one pass
    // (sign, digits, a point and digits, an exponent with digits), then
    // parsed once: linear in the length of the text, whatever it holds.
    let cut = number_prefix(t.as_bytes());
    if cut > 0 {
        if let Some(Ok(v)) = t.get(..cut).map(str::parse::<f64>) {
            if !v.is_finite() {
                return Err(UnitError::NotFinite {
                    text: crate::input::bounded::bounded(t),
                });
            }
            let rest = t.get(cut..).unwrap_or("").trim();
            return Ok((v, rest));
        }
    }
    let lower = t.get(..4).unwrap_or(t).to_ascii_lowercase();
    if lower.starts_with("nan") || lower.starts_with("inf") || lower.starts_with("-inf") {
        return Err(UnitError::NotFinite {
            text: crate::input::bounded::bounded(t),
        });
    }
    Err(UnitError::NoNumber {
        text: crate::input::bounded::bounded(t),
        expected: dim,
    })
}

/// Length of the longest prefix of `b` of the form `[+-]? digits [. digits]
/// [(e|E) [+-]? digits]` with at least one digit before the exponent; 0 when
/// there is none.
fn number_prefix(b: &[u8]) -> usize {
    let digits = |from: usize| {
        b.get(from..)
            .map_or(0, |r| r.iter().take_while(|c| c.is_ascii_digit()).count())
    };
    let mut i = usize::from(matches!(b.first(), Some(b'+' | b'-')));
    let int = digits(i);
    i += int;
    let mut frac = 0;
    if b.get(i) == Some(&b'.') {
        frac = digits(i + 1);
        if int + frac > 0 {
            i += 1 + frac;
        }
    }
    if int + frac == 0 {
        return 0;
    }
    if matches!(b.get(i), Some(b'e' | b'E')) {
        let sign = usize::from(matches!(b.get(i + 1), Some(b'+' | b'-')));
        let exp = digits(i + 1 + sign);
        if exp > 0 {
            i += 1 + sign + exp;
        }
    }
    i
}

/// Marker types naming a dimension at the type level.
pub trait Dimension: Copy + fmt::Debug + PartialEq + PartialOrd + 'static {
    /// The dimension.
    const DIM: Dim;
}

macro_rules! dimension {
    ($marker:ident, $alias:ident, $dim:ident, $doc:literal) => {
        #[doc = concat!("Type-level marker for ", $doc, ".")]
        #[derive(Clone, Copy, Debug, PartialEq, PartialOrd)]
        pub struct $marker;
        impl Dimension for $marker {
            const DIM: Dim = Dim::$dim;
        }
        #[doc = concat!("A ", $doc, " held in SI.")]
        pub type $alias = Quantity<$marker>;
    };
}

dimension!(LengthDim, Length, Length, "length (m)");
dimension!(MassDim, Mass, Mass, "mass (kg)");
dimension!(SpeedDim, Speed, Speed, "speed (m/s)");
dimension!(TorqueDim, Torque, Torque, "torque (N·m)");
dimension!(ForceDim, Force, Force, "force (N)");
dimension!(AngleDim, Angle, Angle, "plane angle (rad)");
dimension!(PressureDim, Pressure, Pressure, "pressure (Pa)");
dimension!(TemperatureDim, Temperature, Temperature, "temperature (K)");
dimension!(TimeDim, Duration, Time, "duration (s)");
dimension!(
    AccelerationDim,
    Acceleration,
    Acceleration,
    "acceleration (m/s²)"
);
dimension!(AreaDim, Area, Area, "area (m²)");

/// A value of dimension `D`, held in the SI unit of `D`.
#[derive(Clone, Copy, Debug, PartialEq, PartialOrd)]
pub struct Quantity<D: Dimension> {
    si: f64,
    dim: PhantomData<D>,
}

impl<D: Dimension> Quantity<D> {
    /// From a value already in the SI unit.
    #[must_use]
    pub const fn from_si(si: f64) -> Self {
        Quantity {
            si,
            dim: PhantomData,
        }
    }

    /// The value in the SI unit.
    #[must_use]
    pub const fn si(self) -> f64 {
        self.si
    }

    /// The value expressed in `unit` (a spelling of a unit of `D`).
    ///
    /// # Errors
    /// As [`Dim::unit`].
    pub fn in_unit(self, unit: &str) -> Result<f64, UnitError> {
        Ok(D::DIM.unit(unit)?.from_si(self.si))
    }

    /// From a value in `unit`.
    ///
    /// # Errors
    /// As [`Dim::unit`].
    pub fn from_unit(value: f64, unit: &str) -> Result<Self, UnitError> {
        let si = D::DIM.unit(unit)?.to_si(value);
        if si.is_finite() {
            Ok(Self::from_si(si))
        } else {
            Err(UnitError::TooLarge {
                text: crate::input::bounded::bounded(&format!("{value} {unit}")),
            })
        }
    }

    /// Parses `"18 lb"`-style text; a plain number is in the SI unit.
    ///
    /// # Errors
    /// A [`UnitError`] naming the accepted units.
    pub fn parse(text: &str) -> Result<Self, UnitError> {
        Self::parse_or(text, D::DIM.si_symbol())
    }

    /// Parses text; a plain number is taken in `bare_unit`.
    ///
    /// # Errors
    /// A [`UnitError`] naming the accepted units.
    pub fn parse_or(text: &str, bare_unit: &str) -> Result<Self, UnitError> {
        let (v, unit) = split_number(text, D::DIM)?;
        let unit = if unit.is_empty() { bare_unit } else { unit };
        let si = D::DIM.unit(unit)?.to_si(v);
        if si.is_finite() {
            Ok(Self::from_si(si))
        } else {
            Err(UnitError::TooLarge {
                text: crate::input::bounded::bounded(text.trim()),
            })
        }
    }
}

impl<D: Dimension> fmt::Display for Quantity<D> {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{} {}", self.si, D::DIM.si_symbol())
    }
}

impl<D: Dimension> core::str::FromStr for Quantity<D> {
    type Err = UnitError;
    fn from_str(s: &str) -> Result<Self, UnitError> {
        Self::parse(s)
    }
}

impl<D: Dimension> Serialize for Quantity<D> {
    /// Serialises as a plain number in the SI unit.
    fn serialize<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        s.serialize_f64(self.si)
    }
}

struct QuantityVisitor<D>(PhantomData<D>);

impl<D: Dimension> Visitor<'_> for QuantityVisitor<D> {
    type Value = Quantity<D>;

    fn expecting(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(
            f,
            "a {} as a number in {} or a string with a unit (units: {})",
            D::DIM,
            D::DIM.si_symbol(),
            D::DIM.accepted()
        )
    }

    fn visit_f64<E: de::Error>(self, v: f64) -> Result<Self::Value, E> {
        if v.is_finite() {
            Ok(Quantity::from_si(v))
        } else {
            Err(E::custom(UnitError::NotFinite {
                text: v.to_string(),
            }))
        }
    }

    #[allow(clippy::cast_precision_loss)] // integers in a config file are small
    fn visit_i64<E: de::Error>(self, v: i64) -> Result<Self::Value, E> {
        Ok(Quantity::from_si(v as f64))
    }

    #[allow(clippy::cast_precision_loss)]
    fn visit_u64<E: de::Error>(self, v: u64) -> Result<Self::Value, E> {
        Ok(Quantity::from_si(v as f64))
    }

    fn visit_str<E: de::Error>(self, v: &str) -> Result<Self::Value, E> {
        Quantity::parse(v).map_err(E::custom)
    }
}

impl<'de, D: Dimension> Deserialize<'de> for Quantity<D> {
    /// Accepts a number (SI unit) or a string with a unit.
    fn deserialize<De: Deserializer<'de>>(d: De) -> Result<Self, De::Error> {
        d.deserialize_any(QuantityVisitor(PhantomData))
    }
}

macro_rules! accessor {
    ($alias:ident, $get:ident, $from:ident, $unit:literal) => {
        impl $alias {
            #[doc = concat!("The value in ", $unit, ".")]
            #[must_use]
            pub const fn $get(self) -> f64 {
                self.si
            }
            #[doc = concat!("From a value in ", $unit, ".")]
            #[must_use]
            pub const fn $from(v: f64) -> Self {
                Self::from_si(v)
            }
        }
    };
}

accessor!(Length, m, from_m, "metres");
accessor!(Mass, kg, from_kg, "kilograms");
accessor!(Speed, mps, from_mps, "metres per second");
accessor!(Torque, nm, from_nm, "newton metres");
accessor!(Force, n, from_n, "newtons");
accessor!(Angle, rad, from_rad, "radians");
accessor!(Pressure, pa, from_pa, "pascals");
accessor!(Temperature, kelvin, from_kelvin, "kelvin");
accessor!(Duration, s, from_s, "seconds");
accessor!(Acceleration, mps2, from_mps2, "metres per second squared");
accessor!(Area, m2, from_m2, "square metres");

impl Angle {
    /// The value in degrees.
    #[must_use]
    pub fn deg(self) -> f64 {
        self.si.to_degrees()
    }
    /// From a value in degrees.
    #[must_use]
    pub fn from_deg(v: f64) -> Self {
        Self::from_si(v.to_radians())
    }
}

impl Temperature {
    /// The value in degrees Celsius.
    #[must_use]
    pub fn celsius(self) -> f64 {
        self.si - ZERO_CELSIUS_K_F64
    }
    /// From a value in degrees Celsius.
    #[must_use]
    pub fn from_celsius(v: f64) -> Self {
        Self::from_si(v + ZERO_CELSIUS_K_F64)
    }
}
