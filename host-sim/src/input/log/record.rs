//! Channels of a log and the merged, timestamped sample record.

use core::fmt;

use super::time::Timestamp;
use crate::input::units::Dim;

/// Number of [`Channel`]s.
pub const N_CHANNELS: usize = 13;

/// A measured quantity a log column can carry.
///
/// Frames and conventions (values are SI after reading):
/// * accelerometer: specific force in the rig frame (x east, y north, z up
///   along the ground normal; see `standfast::frame`), m/s²; a level sensor
///   at rest reads +9.81 m/s² on z. The profile's `accel_axes` maps the
///   sensor's axes onto the rig frame.
/// * wind direction: where the wind blows **from**, clockwise from north,
///   rad (the meteorological convention).
/// * hour angle: positive west of the meridian, rad; declination, rad.
/// * axis 1 / axis 2: the mount's first (polar or azimuth) and second
///   (declination or altitude) axis angles, rad, in the mount's own zero
///   and sign (described in the rig file).
/// * pier side: which side of the pier the optical tube is on.
/// * cover fitted: whether the rig's cover is on.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub enum Channel {
    /// Accelerometer, rig x (east), m/s².
    AccelX,
    /// Accelerometer, rig y (north), m/s².
    AccelY,
    /// Accelerometer, rig z (up), m/s².
    AccelZ,
    /// Horizontal wind speed, m/s.
    WindSpeed,
    /// Wind direction (from), rad clockwise from north.
    WindDirection,
    /// Mount hour angle, rad, positive west.
    HourAngle,
    /// Mount declination, rad.
    Declination,
    /// Pier side of the tube.
    PierSide,
    /// Mount axis 1 angle, rad.
    Axis1Angle,
    /// Mount axis 2 angle, rad.
    Axis2Angle,
    /// Cover fitted (true) or off (false).
    CoverFitted,
    /// Air temperature, K.
    AirTemperature,
    /// Air (station) pressure, Pa.
    Pressure,
}

/// How a channel's cells are read.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum ChannelKind {
    /// A number with a unit of this dimension.
    Quantity(Dim),
    /// `east`/`e` or `west`/`w` (any case).
    PierSide,
    /// `1`/`0`, `true`/`false`, `yes`/`no`, `on`/`off` (any case).
    Flag,
}

impl Channel {
    /// All channels, in index order.
    pub const ALL: [Channel; N_CHANNELS] = [
        Channel::AccelX,
        Channel::AccelY,
        Channel::AccelZ,
        Channel::WindSpeed,
        Channel::WindDirection,
        Channel::HourAngle,
        Channel::Declination,
        Channel::PierSide,
        Channel::Axis1Angle,
        Channel::Axis2Angle,
        Channel::CoverFitted,
        Channel::AirTemperature,
        Channel::Pressure,
    ];

    /// Index in `0..N_CHANNELS`.
    #[must_use]
    pub fn index(self) -> usize {
        self as usize
    }

    /// The name used in log profiles (`wind_speed`, ...).
    #[must_use]
    pub fn name(self) -> &'static str {
        match self {
            Channel::AccelX => "accel_x",
            Channel::AccelY => "accel_y",
            Channel::AccelZ => "accel_z",
            Channel::WindSpeed => "wind_speed",
            Channel::WindDirection => "wind_direction",
            Channel::HourAngle => "hour_angle",
            Channel::Declination => "declination",
            Channel::PierSide => "pier_side",
            Channel::Axis1Angle => "axis1_angle",
            Channel::Axis2Angle => "axis2_angle",
            Channel::CoverFitted => "cover_fitted",
            Channel::AirTemperature => "air_temperature",
            Channel::Pressure => "pressure",
        }
    }

    /// How the channel's cells are read.
    #[must_use]
    pub fn kind(self) -> ChannelKind {
        match self {
            Channel::AccelX | Channel::AccelY | Channel::AccelZ => {
                ChannelKind::Quantity(Dim::Acceleration)
            }
            Channel::WindSpeed => ChannelKind::Quantity(Dim::Speed),
            Channel::WindDirection
            | Channel::HourAngle
            | Channel::Declination
            | Channel::Axis1Angle
            | Channel::Axis2Angle => ChannelKind::Quantity(Dim::Angle),
            Channel::PierSide => ChannelKind::PierSide,
            Channel::CoverFitted => ChannelKind::Flag,
            Channel::AirTemperature => ChannelKind::Quantity(Dim::Temperature),
            Channel::Pressure => ChannelKind::Quantity(Dim::Pressure),
        }
    }

    /// Whether this is one of the three accelerometer channels.
    #[must_use]
    pub fn is_accel(self) -> bool {
        matches!(self, Channel::AccelX | Channel::AccelY | Channel::AccelZ)
    }

    /// Reads a non-numeric cell ([`ChannelKind::PierSide`] or
    /// [`ChannelKind::Flag`]) into its numeric code (pier side: east 0,
    /// west 1; flag: 1 true, 0 false).
    #[must_use]
    pub fn parse_word(self, cell: &str) -> Option<f64> {
        let c = cell.trim();
        match self.kind() {
            ChannelKind::PierSide => {
                if c.eq_ignore_ascii_case("east") || c.eq_ignore_ascii_case("e") {
                    Some(PierSide::East.code())
                } else if c.eq_ignore_ascii_case("west") || c.eq_ignore_ascii_case("w") {
                    Some(PierSide::West.code())
                } else {
                    None
                }
            }
            ChannelKind::Flag => {
                const YES: [&str; 4] = ["1", "true", "yes", "on"];
                const NO: [&str; 4] = ["0", "false", "no", "off"];
                if YES.iter().any(|w| c.eq_ignore_ascii_case(w)) {
                    Some(1.0)
                } else if NO.iter().any(|w| c.eq_ignore_ascii_case(w)) {
                    Some(0.0)
                } else {
                    None
                }
            }
            ChannelKind::Quantity(_) => None,
        }
    }

    /// The channel named `name` in a profile.
    #[must_use]
    pub fn from_name(name: &str) -> Option<Channel> {
        Channel::ALL.into_iter().find(|c| c.name() == name)
    }
}

impl fmt::Display for Channel {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.name())
    }
}

/// Which side of the pier (or tripod head) the optical tube is on, seen from
/// above.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub enum PierSide {
    /// The tube is east of the pier.
    East,
    /// The tube is west of the pier.
    West,
}

impl PierSide {
    /// Numeric code used inside the merge: east 0, west 1.
    #[must_use]
    pub fn code(self) -> f64 {
        match self {
            PierSide::East => 0.0,
            PierSide::West => 1.0,
        }
    }

    /// From the numeric code (values ≥ 0.5 are west).
    #[must_use]
    pub fn from_code(c: f64) -> PierSide {
        if c >= 0.5 {
            PierSide::West
        } else {
            PierSide::East
        }
    }
}

/// A set of channels (bit `i` is channel index `i`).
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, Hash)]
pub struct ChannelSet(u16);

impl ChannelSet {
    /// The empty set.
    pub const EMPTY: ChannelSet = ChannelSet(0);

    /// The set of `channels`.
    #[must_use]
    pub const fn of(channels: &[Channel]) -> ChannelSet {
        let mut bits = 0;
        let mut i = 0;
        while i < channels.len() {
            bits |= 1 << channels[i] as u16;
            i += 1;
        }
        ChannelSet(bits)
    }

    /// Whether a channel of the set is in `o`.
    #[must_use]
    pub const fn intersects(self, o: ChannelSet) -> bool {
        self.0 & o.0 != 0
    }

    /// Whether every channel of the set is in `o`.
    #[must_use]
    pub const fn is_subset(self, o: ChannelSet) -> bool {
        self.0 & !o.0 == 0
    }

    /// Whether `ch` is in the set.
    #[must_use]
    pub fn contains(self, ch: Channel) -> bool {
        self.0 & (1 << ch.index()) != 0
    }

    /// Adds `ch`.
    pub fn insert(&mut self, ch: Channel) {
        self.0 |= 1 << ch.index();
    }

    /// The union of two sets.
    #[must_use]
    pub fn union(self, o: ChannelSet) -> ChannelSet {
        ChannelSet(self.0 | o.0)
    }

    /// Whether the set is empty.
    #[must_use]
    pub fn is_empty(self) -> bool {
        self.0 == 0
    }

    /// The channels in the set, in index order.
    pub fn iter(self) -> impl Iterator<Item = Channel> {
        // The set bits, lowest first: as many steps as channels in the set.
        let mut bits = self.0;
        core::iter::from_fn(move || {
            while bits != 0 {
                let i = bits.trailing_zeros() as usize;
                bits &= bits - 1;
                if let Some(c) = Channel::ALL.get(i) {
                    return Some(*c);
                }
            }
            None
        })
    }
}

/// One merged sample: every channel's latest value at `time`.
///
/// A field is `None` until its channel has had a first value. Values hold
/// until the next value of the same channel; [`SampleRecord::age_s`] says how
/// old each is, so a consumer can treat a stale channel as a fault.
/// `Copy`: the merge hands out a copy of its state for each record (one
/// block copy, cheaper than a field-by-field clone).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct SampleRecord {
    /// Time of this record (the time stamp of the rows merged into it).
    pub time: Timestamp,
    /// Accelerometer specific force in the rig frame (x east, y north, z
    /// up), m/s²; present once all three axes have a value.
    pub accel_mps2: Option<[f64; 3]>,
    /// Horizontal wind speed, m/s.
    pub wind_speed_mps: Option<f64>,
    /// Direction the wind blows from, rad clockwise from north.
    pub wind_from_rad: Option<f64>,
    /// Mount hour angle, rad, positive west of the meridian.
    pub hour_angle_rad: Option<f64>,
    /// Mount declination, rad.
    pub declination_rad: Option<f64>,
    /// Side of the pier the tube is on.
    pub pier_side: Option<PierSide>,
    /// Mount axis 1 angle, rad (mount's own zero and sign).
    pub axis1_rad: Option<f64>,
    /// Mount axis 2 angle, rad (mount's own zero and sign).
    pub axis2_rad: Option<f64>,
    /// Whether the cover is fitted.
    pub cover_fitted: Option<bool>,
    /// Air temperature, K.
    pub air_temperature_k: Option<f64>,
    /// Air pressure, Pa.
    pub pressure_pa: Option<f64>,
    /// Channels that received a new value at exactly this time.
    pub updated: ChannelSet,
    /// Time of each channel's latest value (index [`Channel::index`]).
    pub last_update: [Option<Timestamp>; N_CHANNELS],
}

impl SampleRecord {
    /// A record from the merge state: `values[i]` is channel `i`'s latest
    /// value (NaN when none yet).
    #[must_use]
    pub fn from_state(
        time: Timestamp,
        values: &[f64; N_CHANNELS],
        last_update: [Option<Timestamp>; N_CHANNELS],
        updated: ChannelSet,
    ) -> SampleRecord {
        let get = |c: Channel| {
            let v = values.get(c.index()).copied().unwrap_or(f64::NAN);
            (!v.is_nan()).then_some(v)
        };
        let accel = match (
            get(Channel::AccelX),
            get(Channel::AccelY),
            get(Channel::AccelZ),
        ) {
            (Some(x), Some(y), Some(z)) => Some([x, y, z]),
            _ => None,
        };
        SampleRecord {
            time,
            accel_mps2: accel,
            wind_speed_mps: get(Channel::WindSpeed),
            wind_from_rad: get(Channel::WindDirection),
            hour_angle_rad: get(Channel::HourAngle),
            declination_rad: get(Channel::Declination),
            pier_side: get(Channel::PierSide).map(PierSide::from_code),
            axis1_rad: get(Channel::Axis1Angle),
            axis2_rad: get(Channel::Axis2Angle),
            cover_fitted: get(Channel::CoverFitted).map(|v| v >= 0.5),
            air_temperature_k: get(Channel::AirTemperature),
            pressure_pa: get(Channel::Pressure),
            updated,
            last_update,
        }
    }

    /// Updates the field of channel `ch` from the merge state `values`
    /// (as [`SampleRecord::from_state`] reads it; an accelerometer channel
    /// updates the three-axis field). With each channel whose value
    /// changed updated this way, the record equals the one
    /// [`SampleRecord::from_state`] builds from the whole state.
    pub(super) fn update(&mut self, ch: Channel, values: &[f64; N_CHANNELS]) {
        let v = values.get(ch.index()).copied().unwrap_or(f64::NAN);
        let v = (!v.is_nan()).then_some(v);
        match ch {
            Channel::AccelX | Channel::AccelY | Channel::AccelZ => {
                self.accel_mps2 = match values {
                    [x, y, z, ..] if !(x.is_nan() || y.is_nan() || z.is_nan()) => {
                        Some([*x, *y, *z])
                    }
                    _ => None,
                };
            }
            Channel::WindSpeed => self.wind_speed_mps = v,
            Channel::WindDirection => self.wind_from_rad = v,
            Channel::HourAngle => self.hour_angle_rad = v,
            Channel::Declination => self.declination_rad = v,
            Channel::PierSide => self.pier_side = v.map(PierSide::from_code),
            Channel::Axis1Angle => self.axis1_rad = v,
            Channel::Axis2Angle => self.axis2_rad = v,
            Channel::CoverFitted => self.cover_fitted = v.map(|v| v >= 0.5),
            Channel::AirTemperature => self.air_temperature_k = v,
            Channel::Pressure => self.pressure_pa = v,
        }
    }

    /// Takes the new values `new` of the channels in `set` (a row's, at
    /// `time`) into the merge state `values` and into this record: each
    /// such channel's value, latest update time and field.
    #[inline]
    pub(super) fn take(
        &mut self,
        values: &mut [f64; N_CHANNELS],
        new: &[f64; N_CHANNELS],
        set: ChannelSet,
        time: Timestamp,
    ) {
        const ACCEL: u16 = 0b111;
        let mut bits = set.0;
        if bits & ACCEL == ACCEL {
            // The three accelerometer axes together (the usual row).
            if let (Some(v), Some(n), Some(t)) = (
                values.get_mut(..3),
                new.get(..3),
                self.last_update.get_mut(..3),
            ) {
                v.copy_from_slice(n);
                t.fill(Some(time));
            }
            bits &= !ACCEL;
        }
        while bits != 0 {
            let i = bits.trailing_zeros() as usize;
            bits &= bits - 1;
            if let (Some(v), Some(n), Some(t)) =
                (values.get_mut(i), new.get(i), self.last_update.get_mut(i))
            {
                *v = *n;
                *t = Some(time);
            }
        }
        self.update_set(set, values);
    }

    /// Updates the fields of the channels in `set` from the merge state
    /// `values`, as [`SampleRecord::update`] for each (the three-axis
    /// accelerometer field once).
    #[inline]
    pub(super) fn update_set(&mut self, set: ChannelSet, values: &[f64; N_CHANNELS]) {
        const ACCEL: u16 = 0b111;
        if set.0 & ACCEL != 0 {
            self.update(Channel::AccelX, values);
        }
        let rest = ChannelSet(set.0 & !ACCEL);
        // Tested first: the usual row of a fast accelerometer log has no
        // other channel, and then the walk's set-up is skipped too.
        if !rest.is_empty() {
            for ch in rest.iter() {
                self.update(ch, values);
            }
        }
    }

    /// The channel's value as a number (pier side: east 0, west 1; cover:
    /// 1 fitted, 0 off), `None` before its first value.
    #[must_use]
    pub fn value(&self, ch: Channel) -> Option<f64> {
        let accel = |i: usize| self.accel_mps2.and_then(|a| a.get(i).copied());
        match ch {
            Channel::AccelX => accel(0),
            Channel::AccelY => accel(1),
            Channel::AccelZ => accel(2),
            Channel::WindSpeed => self.wind_speed_mps,
            Channel::WindDirection => self.wind_from_rad,
            Channel::HourAngle => self.hour_angle_rad,
            Channel::Declination => self.declination_rad,
            Channel::PierSide => self.pier_side.map(PierSide::code),
            Channel::Axis1Angle => self.axis1_rad,
            Channel::Axis2Angle => self.axis2_rad,
            Channel::CoverFitted => self.cover_fitted.map(|c| if c { 1.0 } else { 0.0 }),
            Channel::AirTemperature => self.air_temperature_k,
            Channel::Pressure => self.pressure_pa,
        }
    }

    /// Seconds since the channel's latest value, `None` before its first.
    #[must_use]
    pub fn age_s(&self, ch: Channel) -> Option<f64> {
        self.last_update
            .get(ch.index())
            .copied()
            .flatten()
            .map(|t| self.time.seconds_since(t))
    }
}

#[cfg(test)]
mod tests {
    use super::{Channel, ChannelSet, SampleRecord, N_CHANNELS};
    use crate::input::log::time::Timestamp;

    proptest::proptest! {
        /// Taking rows' values set by set (the merge's way) gives the
        /// record `from_state` builds from the merge state and the update
        /// times kept by hand (the reference).
        #[test]
        fn take_is_from_state(
            rows in proptest::collection::vec(
                (0u16..1 << N_CHANNELS, proptest::collection::vec(
                    proptest::sample::select(vec![f64::NAN, 0.0, -0.0, 0.5, 1.0, -3.25, 9.81]),
                    N_CHANNELS,
                )),
                0..40,
            ),
        ) {
            let mut values = [f64::NAN; N_CHANNELS];
            let mut want_values = [f64::NAN; N_CHANNELS];
            let mut last = [None; N_CHANNELS];
            let t0 = Timestamp::from_unix_ns(0);
            let mut rec = SampleRecord::from_state(t0, &values, last, ChannelSet::EMPTY);
            for (k, (bits, new)) in rows.into_iter().enumerate() {
                let time = Timestamp::from_unix_ns(i64::try_from(k).unwrap() * 20);
                let new: [f64; N_CHANNELS] = new.try_into().unwrap();
                rec.take(&mut values, &new, ChannelSet(bits), time);
                for i in 0..N_CHANNELS {
                    if bits & (1 << i) != 0 {
                        want_values[i] = new[i];
                        last[i] = Some(time);
                    }
                }
                let want = SampleRecord::from_state(t0, &want_values, last, ChannelSet::EMPTY);
                proptest::prop_assert_eq!(format!("{rec:?}"), format!("{want:?}"));
                proptest::prop_assert_eq!(format!("{values:?}"), format!("{want_values:?}"));
            }
        }

        /// Updating a record channel by channel as values come in (the
        /// merge's way) gives the record `from_state` builds from the whole
        /// state (the reference), whatever the order, the NaNs and the
        /// partial accelerometers.
        #[test]
        fn update_is_from_state(
            steps in proptest::collection::vec(
                (0usize..N_CHANNELS, proptest::sample::select(vec![
                    f64::NAN, 0.0, -0.0, 0.49, 0.5, 1.0, -3.25, 9.81, 1e300,
                ])),
                0..60,
            ),
        ) {
            let t = Timestamp::from_unix_ns(5);
            let mut values = [f64::NAN; N_CHANNELS];
            let last = [None; N_CHANNELS];
            let mut rec = SampleRecord::from_state(t, &values, last, ChannelSet::EMPTY);
            let mut by_set = rec;
            for (i, v) in steps {
                values[i] = v;
                rec.update(Channel::ALL[i], &values);
                let mut set = ChannelSet::EMPTY;
                set.insert(Channel::ALL[i]);
                by_set.update_set(set, &values);
                proptest::prop_assert_eq!(format!("{by_set:?}"), format!("{rec:?}"));
                let want = SampleRecord::from_state(t, &values, last, ChannelSet::EMPTY);
                proptest::prop_assert_eq!(format!("{rec:?}"), format!("{want:?}"));
            }
        }
    }

    /// `of`, `intersects` and `is_subset` agree with the sets' members
    /// (the reference: `contains` channel by channel), for every set
    /// against the accelerometer's three channels and against the wind's
    /// two.
    #[test]
    fn set_relations_follow_the_members() {
        let accel = ChannelSet::of(&[Channel::AccelX, Channel::AccelY, Channel::AccelZ]);
        let wind = ChannelSet::of(&[Channel::WindSpeed, Channel::WindDirection]);
        for o in [accel, wind] {
            let members: Vec<Channel> = o.iter().collect();
            assert_eq!(members.len(), if o == accel { 3 } else { 2 });
            for bits in 0..1u16 << super::N_CHANNELS {
                let set = ChannelSet(bits);
                let any = set.iter().any(|c| o.contains(c));
                let all = set.iter().all(|c| o.contains(c));
                assert_eq!(set.intersects(o), any, "{bits:#x}");
                assert_eq!(set.is_subset(o), all, "{bits:#x}");
            }
        }
    }

    /// The bit walk of `ChannelSet::iter` gives exactly the channels of
    /// the set in index order, for every one of the 2^13 sets (the
    /// reference: `Channel::ALL` filtered by `contains`).
    #[test]
    fn iter_gives_the_members_in_index_order() {
        for bits in 0..1u16 << super::N_CHANNELS {
            let set = ChannelSet(bits);
            let want: Vec<Channel> = Channel::ALL
                .into_iter()
                .filter(|c| set.contains(*c))
                .collect();
            assert_eq!(set.iter().collect::<Vec<_>>(), want, "{bits:#x}");
        }
    }
}
