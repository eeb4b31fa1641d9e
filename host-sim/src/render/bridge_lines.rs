//! The bridge's output lines as JSON-ready values: one verdict line per
//! sample ([`VerdictLine`]) or an error line ([`ErrorLine`]). Utilisations
//! are dimensionless (1.0 tips, slides or overloads); speeds m/s at rig
//! height; angles degrees (directions clockwise from north, the direction
//! the wind blows from).

use serde::Serialize;
use standfast::guard::{AlertCause, Event, Verdict};
use standfast::mount::{PierSide, Pose};

use crate::model::figures::Figures;

/// A pose in degrees, as written in a verdict line.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
#[serde(untagged)]
pub enum PoseOut {
    /// Hour angle (positive west), declination, pier side.
    Equatorial {
        /// Hour angle, degrees.
        ha_deg: f32,
        /// Declination, degrees.
        dec_deg: f32,
        /// Pier side.
        pier_side: PierSide,
    },
    /// Mechanical axis angles.
    Axes {
        /// Primary axis, degrees.
        primary_axis_deg: f32,
        /// Secondary axis, degrees.
        secondary_axis_deg: f32,
    },
    /// Horizontal coordinates of the tube.
    Horizontal {
        /// Azimuth, degrees clockwise from north.
        azimuth_deg: f32,
        /// Altitude, degrees.
        altitude_deg: f32,
        /// Pier side.
        pier_side: PierSide,
    },
}

impl From<Pose> for PoseOut {
    fn from(p: Pose) -> PoseOut {
        match p {
            Pose::Equatorial {
                hour_angle_rad,
                declination_rad,
                pier_side,
            } => PoseOut::Equatorial {
                ha_deg: hour_angle_rad.to_degrees(),
                dec_deg: declination_rad.to_degrees(),
                pier_side,
            },
            Pose::Axes {
                primary_rad,
                secondary_rad,
            } => PoseOut::Axes {
                primary_axis_deg: primary_rad.to_degrees(),
                secondary_axis_deg: secondary_rad.to_degrees(),
            },
            Pose::Horizontal {
                azimuth_rad,
                altitude_rad,
                pier_side,
            } => PoseOut::Horizontal {
                azimuth_deg: azimuth_rad.to_degrees(),
                altitude_deg: altitude_rad.to_degrees(),
                pier_side,
            },
        }
    }
}

/// An event of a step, as written in a verdict line.
#[derive(Clone, Debug, PartialEq, Serialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
pub enum EventOut {
    /// The level changed.
    LevelChanged {
        /// Previous level name.
        from: &'static str,
        /// New level name.
        to: &'static str,
        /// What drove it.
        cause: String,
    },
    /// A sensor fault was first seen.
    FaultRaised {
        /// The fault, in words.
        fault: String,
    },
    /// The highest overturning utilisation since start rose.
    NewHighUtilisation {
        /// Overturning utilisation, dimensionless.
        utilisation: f32,
    },
}

/// The snake-case name of a cause ([`AlertCause::name`]).
#[must_use]
pub fn cause_name(c: AlertCause) -> String {
    c.name().to_owned()
}

/// One verdict line. Utilisations are dimensionless (1.0 tips, slides or
/// overloads); speeds m/s at rig height; angles degrees (directions
/// clockwise from north, the direction the wind blows from).
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct VerdictLine {
    /// Input line number, from 1.
    pub line: u64,
    /// Time of the step, ms (the sample's, or since start with the wall clock).
    pub t_ms: u64,
    /// Level name: clear, watch, park_now, alarm, sensor_fault.
    pub level: &'static str,
    /// The park-request output.
    pub park_requested: bool,
    /// The alarm output.
    pub alarm: bool,
    /// The verdict's figures (fields of their own in the JSON line, in
    /// this order).
    #[serde(flatten)]
    pub figures: Figures,
    /// The pose the figures are for.
    pub pose: PoseOut,
    /// With a park request: the safest park pose.
    pub park_pose: Option<PoseOut>,
    /// Whether this line acknowledged the alarm.
    pub acknowledged: bool,
    /// Active sensor faults, in words.
    pub faults: Vec<String>,
    /// Events of this step.
    pub events: Vec<EventOut>,
    /// Events of this step that did not fit in the verdict (0 normally).
    pub events_lost: u16,
}

impl VerdictLine {
    /// The line for a verdict.
    #[must_use]
    pub fn new(line: u64, v: &Verdict, acknowledged: bool) -> VerdictLine {
        VerdictLine {
            line,
            t_ms: v.now.0,
            level: v.level.name(),
            park_requested: v.level.park_requested(),
            alarm: v.level.alarm(),
            figures: Figures::of(v),
            pose: v.pose.into(),
            park_pose: v.park_pose.map(PoseOut::from),
            acknowledged,
            faults: v.faults.iter().map(|f| f.to_string()).collect(),
            events: v
                .events
                .iter()
                .map(|e| match *e {
                    Event::LevelChanged { from, to, cause } => EventOut::LevelChanged {
                        from: from.name(),
                        to: to.name(),
                        cause: cause_name(cause),
                    },
                    Event::FaultRaised(f) => EventOut::FaultRaised {
                        fault: f.to_string(),
                    },
                    Event::NewHighUtilisation { utilisation } => {
                        EventOut::NewHighUtilisation { utilisation }
                    }
                })
                .collect(),
            events_lost: v.events_lost,
        }
    }
}

/// An error line.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct ErrorLine<'a> {
    /// Input line number, from 1.
    pub line: u64,
    /// What is wrong.
    pub error: &'a str,
}
