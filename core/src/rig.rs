//! The rig: its description ([`RigSpec`], plain data a host can load from a
//! file), the validated model ([`Rig`]) and the placement of every part in a
//! pose ([`Placement`]).
//!
//! Parts are rigid bodies fixed to one of three **stages**: the ground stage
//! (tripod, pier, ballast: rig frame), the mount's primary stage or its
//! secondary stage (see [`crate::mount`] for their frames). Each part has a mass,
//! a centre of gravity and optionally a wind-exposed shape.

use crate::air::Air;
use crate::drive::Drives;
use crate::error::{Error, ErrorKind, Field};
use crate::frame::{self, Tilt};
use crate::math::{Vec3, STANDARD_GRAVITY_MPS2};
use crate::mount::{MountGeometry, Pose, StageFrames};
use crate::shape::{Exposure, Shape};
use crate::support::{Foot, Support, MAX_FEET};
use heapless::Vec;

/// Most free bodies in a rig description.
pub const MAX_BODIES: usize = 12;
/// Most counterweights on the shaft.
pub const MAX_COUNTERWEIGHTS: usize = 4;
/// Most ballast items.
pub const MAX_BALLAST: usize = 4;
/// Most parts of a validated rig: bodies, legs, counterweights, shaft, cover,
/// the measured ground mass and ballast.
pub const MAX_PARTS: usize = MAX_BODIES + MAX_FEET + MAX_COUNTERWEIGHTS + 3 + MAX_BALLAST;
/// Largest mass accepted for one part, kg.
pub const MAX_PART_MASS_KG: f32 = 2_000.0;
/// Largest distance of any centre of gravity from its stage origin, metres:
/// the sane envelope of a telescope rig.
pub const MAX_OFFSET_M: f32 = 5.0;

/// A short text label for a part (for reports), at most 24 bytes.
pub type Label = heapless::String<24>;

/// The stage a body is fixed to.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(rename_all = "snake_case"))]
pub enum Stage {
    /// Fixed to the ground: offsets in the rig frame from its origin.
    #[default]
    Ground,
    /// Turns about the primary axis: offsets in the primary-stage frame
    /// `[s, q, k]` from the axis origin.
    Primary,
    /// Turns about both axes: offsets in the secondary-stage frame `[s, p, n]`
    /// from the axis origin.
    Secondary,
}

impl Stage {
    /// A stable snake-case name for logs and machine-readable output.
    #[must_use]
    pub const fn name(self) -> &'static str {
        match self {
            Stage::Ground => "ground",
            Stage::Primary => "primary",
            Stage::Secondary => "secondary",
        }
    }
}

/// How a body's mass is spread, for its moment of inertia.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(rename_all = "snake_case"))]
pub enum MassModel {
    /// All mass at the centre of gravity.
    Point,
    /// Mass spread uniformly through the exposed shape (solid cylinder or box);
    /// a point mass when the body has no shape.
    #[default]
    Solid,
    /// Mass in the wall of the exposed shape (thin-walled tube; a box's
    /// faces), as for an optical tube; a point mass without a shape.
    Shell,
}

impl MassModel {
    /// A stable snake-case name for logs and machine-readable output.
    #[must_use]
    pub const fn name(self) -> &'static str {
        match self {
            MassModel::Point => "point",
            MassModel::Solid => "solid",
            MassModel::Shell => "shell",
        }
    }
}

/// A free rigid body of the rig.
#[derive(Clone, Debug, PartialEq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct BodySpec {
    /// Name for reports.
    #[cfg_attr(feature = "serde", serde(default))]
    pub label: Label,
    /// The stage it is fixed to.
    #[cfg_attr(feature = "serde", serde(default))]
    pub stage: Stage,
    /// Mass, kg.
    pub mass_kg: f32,
    /// Centre of gravity in the stage frame, metres.
    pub cg_m: [f32; 3],
    /// Wind-exposed shape, if it catches wind.
    #[cfg_attr(feature = "serde", serde(default))]
    pub exposure: Option<Exposure>,
    /// How the mass is spread, for inertia.
    #[cfg_attr(feature = "serde", serde(default))]
    pub mass_model: MassModel,
    /// True when the cover, fitted, shields this body from the wind (the
    /// payload); its mass still counts.
    #[cfg_attr(feature = "serde", serde(default))]
    pub under_cover: bool,
}

/// Tripod legs, generated as slender cylinders from the head to each foot.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct LegsSpec {
    /// Mass of one leg, kg.
    pub mass_kg: f32,
    /// Leg diameter (or width), metres.
    pub diameter_m: f32,
    /// Height of the leg tops above the ground, metres.
    pub top_height_m: f32,
    /// Distance of each leg top from the vertical axis, metres.
    pub top_radius_m: f32,
}

/// A counterweight on the shaft, a solid disc centred on the secondary axis
/// on the side opposite the payload.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct CounterweightSpec {
    /// Mass, kg.
    pub mass_kg: f32,
    /// Distance of its centre from the axis origin along the shaft, metres.
    pub distance_m: f32,
    /// Outside diameter, metres.
    pub diameter_m: f32,
    /// Thickness along the shaft, metres.
    pub thickness_m: f32,
    /// Drag coefficient of the disc's face (the end-on area π·d²/4 of the
    /// short cylinder it is modelled as, met by wind along the shaft); `None`
    /// takes the published default ([`crate::shape::cylinder_axial_cd`]).
    /// The rim keeps the cross-flow default.
    #[cfg_attr(feature = "serde", serde(default))]
    pub drag_coefficient: Option<f32>,
}

/// The counterweight shaft: a solid rod from the axis origin along −s.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct ShaftSpec {
    /// Mass, kg.
    pub mass_kg: f32,
    /// Length from the axis origin to its end, metres.
    pub length_m: f32,
    /// Diameter, metres.
    pub diameter_m: f32,
}

/// A cover: a box on the secondary stage that, when fitted, replaces the
/// exposure of every body marked `under_cover`.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct CoverSpec {
    /// Mass, kg (counted only while fitted).
    pub mass_kg: f32,
    /// Edge lengths along `[s, p, n]`, metres.
    pub size_m: [f32; 3],
    /// Centre in the secondary-stage frame, metres.
    pub centre_m: [f32; 3],
    /// Drag coefficient; `None` for the default of a box.
    #[cfg_attr(feature = "serde", serde(default))]
    pub drag_coefficient: Option<f32>,
}

/// Ballast: a mass at a fixed point (a bag of stones under the tripod head).
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct BallastSpec {
    /// Mass, kg.
    pub mass_kg: f32,
    /// Position in the rig frame, metres.
    pub position_m: [f32; 3],
}

/// A rig description: plain data, checked by [`Rig::new`].
#[derive(Clone, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct RigSpec {
    /// The feet (3 to 8), in the ground plane of the rig frame.
    pub feet: Vec<Foot, MAX_FEET>,
    /// Tripod legs, if they should be modelled (mass and wind).
    #[cfg_attr(feature = "serde", serde(default))]
    pub legs: Option<LegsSpec>,
    /// Static friction coefficient between feet and ground. Use a lower bound:
    /// friction on grass and soil varies widely.
    pub friction_coefficient: f32,
    /// The mount.
    pub mount: MountGeometry,
    /// Free bodies: head, mount housings, payload, accessories.
    #[cfg_attr(feature = "serde", serde(default))]
    pub bodies: Vec<BodySpec, MAX_BODIES>,
    /// Counterweights on the shaft.
    #[cfg_attr(feature = "serde", serde(default))]
    pub counterweights: Vec<CounterweightSpec, MAX_COUNTERWEIGHTS>,
    /// The counterweight shaft.
    #[cfg_attr(feature = "serde", serde(default))]
    pub shaft: Option<ShaftSpec>,
    /// The cover, if the rig has one.
    #[cfg_attr(feature = "serde", serde(default))]
    pub cover: Option<CoverSpec>,
    /// Ballast items.
    #[cfg_attr(feature = "serde", serde(default))]
    pub ballast: Vec<BallastSpec, MAX_BALLAST>,
    /// Drive ratings of the two axes, if known.
    #[cfg_attr(feature = "serde", serde(default))]
    pub drives: Option<Drives>,
}

impl BodySpec {
    /// A body whose mass sits at one point, `cg_m` in the frame of `stage`,
    /// catching no wind (a camera, a battery inside a housing). Without a
    /// shape the mass model is moot: any model counts it as a point mass; the
    /// field keeps its default, as in a rig file that leaves it out.
    #[must_use]
    pub fn point(stage: Stage, mass_kg: f32, cg_m: [f32; 3]) -> BodySpec {
        BodySpec {
            stage,
            mass_kg,
            cg_m,
            ..BodySpec::default()
        }
    }

    /// A solid cylinder on `stage`: `diameter_m` across, `length_m` long
    /// along `axis` (a direction in the stage frame, any length), centred at
    /// `centre_m` (stage frame, metres), which is also its centre of
    /// gravity and of wind pressure; published drag defaults.
    #[must_use]
    pub fn cylinder(
        stage: Stage,
        mass_kg: f32,
        centre_m: [f32; 3],
        diameter_m: f32,
        length_m: f32,
        axis: [f32; 3],
    ) -> BodySpec {
        BodySpec {
            stage,
            mass_kg,
            cg_m: centre_m,
            exposure: Some(Exposure {
                shape: Shape::Cylinder {
                    diameter_m,
                    length_m,
                    axis,
                },
                centre_m,
                drag_coefficient: None,
                end_drag_coefficient: None,
            }),
            mass_model: MassModel::Solid,
            ..BodySpec::default()
        }
    }

    /// A solid box on `stage` with edge lengths `size_m` along the stage
    /// frame's axes, centred at `centre_m` (stage frame, metres), which is
    /// also its centre of gravity and of wind pressure (a mount head, an
    /// electronics case); the published drag default of a box.
    #[must_use]
    pub fn cuboid(stage: Stage, mass_kg: f32, centre_m: [f32; 3], size_m: [f32; 3]) -> BodySpec {
        BodySpec {
            stage,
            mass_kg,
            cg_m: centre_m,
            exposure: Some(Exposure {
                shape: Shape::Box {
                    size_m,
                    edges: None,
                },
                centre_m,
                drag_coefficient: None,
                end_drag_coefficient: None,
            }),
            mass_model: MassModel::Solid,
            ..BodySpec::default()
        }
    }

    /// An optical tube: a thin-walled cylinder on the secondary stage, its
    /// axis along the stage's pointing direction p, centred at `centre_m`
    /// (secondary-stage frame `[s, p, n]`, metres), shielded by the cover
    /// when one is fitted. Move its centre of gravity with
    /// [`BodySpec::with_cg_m`] when it is not at the middle of the tube.
    ///
    /// # Examples
    /// ```
    /// use standfast::BodySpec;
    /// // 9 kg, 240 mm across, 950 mm long, 21 cm out along s from the axes.
    /// let tube = BodySpec::optical_tube(9.0, 0.24, 0.95, [0.21, 0.08, 0.0])
    ///     .labelled("tube")
    ///     .with_cg_m([0.21, 0.04, 0.0]);
    /// assert!(tube.under_cover);
    /// assert_eq!(tube.label.as_str(), "tube");
    /// ```
    #[must_use]
    pub fn optical_tube(
        mass_kg: f32,
        diameter_m: f32,
        length_m: f32,
        centre_m: [f32; 3],
    ) -> BodySpec {
        let mut b = BodySpec::cylinder(
            Stage::Secondary,
            mass_kg,
            centre_m,
            diameter_m,
            length_m,
            [0.0, 1.0, 0.0],
        );
        b.mass_model = MassModel::Shell;
        b.under_cover = true;
        b
    }

    /// The same body with the label `label`, cut to the label capacity (24
    /// bytes) at a character boundary.
    #[must_use]
    pub fn labelled(mut self, label: &str) -> BodySpec {
        self.label = label_of(label);
        self
    }

    /// The same body with its centre of gravity at `cg_m` (stage frame,
    /// metres); the wind still acts where its shape is.
    #[must_use]
    pub fn with_cg_m(mut self, cg_m: [f32; 3]) -> BodySpec {
        self.cg_m = cg_m;
        self
    }

    /// The same body with its mass spread as `mass_model`.
    #[must_use]
    pub fn with_mass_model(mut self, mass_model: MassModel) -> BodySpec {
        self.mass_model = mass_model;
        self
    }

    /// The same body, shielded (`true`) or not by a fitted cover.
    #[must_use]
    pub fn with_under_cover(mut self, under_cover: bool) -> BodySpec {
        self.under_cover = under_cover;
        self
    }

    /// The same body with a drag coefficient of its own for broadside flow
    /// (see [`Exposure::drag_coefficient`]); no effect on a body without a
    /// shape.
    #[must_use]
    pub fn with_drag_coefficient(mut self, drag_coefficient: f32) -> BodySpec {
        if let Some(e) = self.exposure.as_mut() {
            e.drag_coefficient = Some(drag_coefficient);
        }
        self
    }
}

/// `text` as a [`Label`], cut at the last character boundary that fits.
fn label_of(text: &str) -> Label {
    let mut label = Label::new();
    for c in text.chars() {
        if label.push(c).is_err() {
            break;
        }
    }
    label
}

impl LegsSpec {
    /// Three (or as many as there are feet) legs of `mass_kg` each and
    /// `diameter_m` across, from the feet up to a head whose leg tops are
    /// `top_radius_m` from the vertical axis at `top_height_m`.
    #[must_use]
    pub fn new(mass_kg: f32, diameter_m: f32, top_height_m: f32, top_radius_m: f32) -> LegsSpec {
        LegsSpec {
            mass_kg,
            diameter_m,
            top_height_m,
            top_radius_m,
        }
    }
}

impl CounterweightSpec {
    /// A disc counterweight of `mass_kg`, `diameter_m` across and
    /// `thickness_m` thick, its centre `distance_m` along the shaft from the
    /// axis origin; the published drag default.
    ///
    /// # Examples
    /// ```
    /// use standfast::rig::CounterweightSpec;
    /// let cw = CounterweightSpec::disc(4.5, 0.27, 0.12, 0.045);
    /// assert_eq!(cw.drag_coefficient, None);
    /// ```
    #[must_use]
    pub fn disc(mass_kg: f32, distance_m: f32, diameter_m: f32, thickness_m: f32) -> Self {
        CounterweightSpec {
            mass_kg,
            distance_m,
            diameter_m,
            thickness_m,
            drag_coefficient: None,
        }
    }
}

impl ShaftSpec {
    /// A solid counterweight shaft of `mass_kg`, `length_m` from the axis
    /// origin to its end and `diameter_m` across.
    #[must_use]
    pub fn new(mass_kg: f32, length_m: f32, diameter_m: f32) -> ShaftSpec {
        ShaftSpec {
            mass_kg,
            length_m,
            diameter_m,
        }
    }
}

impl RigSpec {
    /// A rig standing on `support`, with `mount` and the lower bound
    /// `friction_coefficient` of static friction between feet and ground; no
    /// bodies, legs, counterweights, shaft, cover, ballast or drives yet (add
    /// them with the `with_` methods). Checked only by [`Rig::new`].
    ///
    /// # Examples
    /// ```
    /// use standfast::{BodySpec, MountGeometry, Rig, RigSpec, Support};
    /// use standfast::math::deg_to_rad;
    /// use standfast::rig::{LegsSpec, Stage};
    ///
    /// let spec = RigSpec::new(
    ///     &Support::tripod(0.45, 0.0)?,
    ///     MountGeometry::alt_azimuth(deg_to_rad(47.0), [0.0, 0.0, 1.25]),
    ///     0.3,
    /// )
    /// .with_legs(LegsSpec::new(0.8, 0.03, 1.05, 0.06))
    /// .with_body(BodySpec::optical_tube(5.0, 0.12, 0.7, [0.15, 0.1, 0.0]))?
    /// .with_body(BodySpec::point(Stage::Ground, 4.0, [0.0, 0.0, 1.1]))?;
    /// let rig = Rig::new(&spec)?;
    /// assert_eq!(rig.support().feet().len(), 3);
    /// # Ok::<(), standfast::Error>(())
    /// ```
    #[must_use]
    pub fn new(support: &Support, mount: MountGeometry, friction_coefficient: f32) -> RigSpec {
        RigSpec {
            feet: support.feet_list(),
            legs: None,
            friction_coefficient,
            mount,
            bodies: Vec::new(),
            counterweights: Vec::new(),
            shaft: None,
            cover: None,
            ballast: Vec::new(),
            drives: None,
        }
    }

    /// The same description with `body` added.
    ///
    /// # Errors
    /// [`ErrorKind::TooMany`] on `bodies` past [`MAX_BODIES`].
    pub fn with_body(mut self, body: BodySpec) -> Result<RigSpec, Error> {
        let n = self.bodies.len();
        self.bodies
            .push(body)
            .map_err(|_| list_full(Field::Bodies, n, MAX_BODIES))?;
        Ok(self)
    }

    /// The same description with the counterweight `cw` added.
    ///
    /// # Errors
    /// [`ErrorKind::TooMany`] on `counterweights` past
    /// [`MAX_COUNTERWEIGHTS`].
    pub fn with_counterweight(mut self, cw: CounterweightSpec) -> Result<RigSpec, Error> {
        let n = self.counterweights.len();
        self.counterweights
            .push(cw)
            .map_err(|_| list_full(Field::Counterweights, n, MAX_COUNTERWEIGHTS))?;
        Ok(self)
    }

    /// The same description with the ballast item `ballast` added.
    ///
    /// # Errors
    /// [`ErrorKind::TooMany`] on `ballast` past [`MAX_BALLAST`].
    pub fn with_ballast(mut self, ballast: BallastSpec) -> Result<RigSpec, Error> {
        let n = self.ballast.len();
        self.ballast
            .push(ballast)
            .map_err(|_| list_full(Field::Ballast, n, MAX_BALLAST))?;
        Ok(self)
    }

    /// The same description with tripod legs.
    #[must_use]
    pub fn with_legs(mut self, legs: LegsSpec) -> RigSpec {
        self.legs = Some(legs);
        self
    }

    /// The same description with a counterweight shaft.
    #[must_use]
    pub fn with_shaft(mut self, shaft: ShaftSpec) -> RigSpec {
        self.shaft = Some(shaft);
        self
    }

    /// The same description with a cover.
    #[must_use]
    pub fn with_cover(mut self, cover: CoverSpec) -> RigSpec {
        self.cover = Some(cover);
        self
    }

    /// The same description with drive ratings.
    #[must_use]
    pub fn with_drives(mut self, drives: Drives) -> RigSpec {
        self.drives = Some(drives);
        self
    }
}

/// A list that is full: `field` holds `len` items, at most `max`.
fn list_full(field: Field, len: usize, max: usize) -> Error {
    let mut e = Error::new(ErrorKind::TooMany, field);
    e.value = (len + 1) as f32;
    e.max = max as f32;
    e
}

/// What a part is, for reports and for the cover and balance logic.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum PartRole {
    /// A free body, index into [`RigSpec::bodies`].
    Body(u8),
    /// A tripod leg, index of its foot.
    Leg(u8),
    /// A counterweight, index into [`RigSpec::counterweights`].
    Counterweight(u8),
    /// The counterweight shaft.
    Shaft,
    /// The cover (present only while fitted).
    Cover,
    /// A ballast item, index into [`RigSpec::ballast`].
    Ballast(u8),
    /// The ground-stage mass found by weighing (see
    /// [`Rig::with_measured_centre`]): it replaces the masses of every other
    /// ground-stage part.
    Measured,
}

/// One part of a validated rig.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Part {
    /// What it is.
    pub role: PartRole,
    /// The stage it is fixed to.
    pub stage: Stage,
    /// Mass, kg.
    pub mass_kg: f32,
    /// Centre of gravity in the stage frame, metres.
    pub cg_m: Vec3,
    /// Wind-exposed shape, if any.
    pub exposure: Option<Exposure>,
    /// How the mass is spread.
    pub mass_model: MassModel,
    /// Shielded by the fitted cover.
    pub under_cover: bool,
}

/// A validated rig.
#[derive(Clone, Debug, PartialEq)]
pub struct Rig {
    support: Support,
    mount: MountGeometry,
    friction_coefficient: f32,
    parts: Vec<Part, MAX_PARTS>,
    drives: Option<Drives>,
}

/// The conditions the rig stands in: pose, ground tilt, wind and air.
/// # Examples
/// A 12 m/s gust from the south-west on ground sloping 2° down to the east,
/// in air 800 m up:
/// ```
/// use standfast::math::deg_to_rad;
/// use standfast::{Air, Conditions, Pose, Tilt};
///
/// let pose = Pose::Axes { primary_rad: 0.0, secondary_rad: deg_to_rad(90.0) };
/// let c = Conditions {
///     tilt: Tilt::new(deg_to_rad(2.0), deg_to_rad(90.0))?,
///     wind_speed_mps: 12.0,
///     wind_from_rad: deg_to_rad(225.0),
///     air: Air::isa_at_elevation(800.0)?,
///     ..Conditions::calm(pose)
/// };
/// c.validate()?;
/// # Ok::<(), standfast::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct Conditions {
    /// Mount pose.
    pub pose: Pose,
    /// Ground tilt.
    pub tilt: Tilt,
    /// Wind speed, m/s (a gust, for a stability check).
    pub wind_speed_mps: f32,
    /// Direction the wind blows from, radians from north clockwise
    /// (meteorological convention).
    pub wind_from_rad: f32,
    /// Air density.
    pub air: Air,
    /// True while the cover is fitted.
    pub cover_fitted: bool,
}

/// Highest wind speed the model accepts as an input, m/s (100 m/s, beyond
/// the strongest gusts on record; no rig described here stands in it).
/// [`Conditions::validate`] refuses more as an implausible input.
pub const MAX_WIND_SPEED_MPS: f32 = 100.0;

impl Conditions {
    /// Calm, level ground, sea-level air, no cover, in `pose`.
    #[must_use]
    pub fn calm(pose: Pose) -> Conditions {
        Conditions {
            pose,
            tilt: Tilt::LEVEL,
            wind_speed_mps: 0.0,
            wind_from_rad: 0.0,
            air: Air::default(),
            cover_fitted: false,
        }
    }

    /// Checks the wind values (the pose is checked by the mount, the tilt and
    /// air by their constructors).
    ///
    /// # Errors
    /// Wind speed outside 0 to [`MAX_WIND_SPEED_MPS`] or a non-finite
    /// direction.
    pub fn validate(&self) -> Result<(), Error> {
        self.validate_wind()?;
        self.validate_ground_and_air()
    }

    /// The wind part of [`Conditions::validate`]: its speed and direction.
    pub(crate) fn validate_wind(&self) -> Result<(), Error> {
        Error::check(
            Field::ConditionsWindSpeedMps,
            self.wind_speed_mps,
            0.0,
            MAX_WIND_SPEED_MPS,
        )?;
        Error::check(Field::ConditionsWindFromRad, self.wind_from_rad, -1e4, 1e4)?;
        Ok(())
    }

    /// The rest of [`Conditions::validate`]: the tilt and the air (what
    /// conditions differing only in their wind share).
    pub(crate) fn validate_ground_and_air(&self) -> Result<(), Error> {
        Error::check(
            Field::ConditionsTiltMagnitudeRad,
            self.tilt.magnitude_rad,
            0.0,
            frame::MAX_TILT_RAD,
        )?;
        Error::check(
            Field::ConditionsTiltDownhillAzimuthRad,
            self.tilt.downhill_azimuth_rad,
            -1e4,
            1e4,
        )?;
        Error::check(
            Field::ConditionsAirDensityKgPerM3,
            self.air.density_kg_per_m3(),
            crate::air::MIN_DENSITY_KG_PER_M3,
            crate::air::MAX_DENSITY_KG_PER_M3,
        )?;
        Ok(())
    }
}

fn check_mass(field: Field, m: f32, i: usize) -> Result<f32, Error> {
    Error::check(field, m, 1e-3, MAX_PART_MASS_KG).map_err(|e| e.at(i))
}

fn check_offset(field: Field, v: [f32; 3], i: usize) -> Result<Vec3, Error> {
    Error::check_vec(field, Vec3::from_array(v), -MAX_OFFSET_M, MAX_OFFSET_M).map_err(|e| e.at(i))
}

fn too_many(field: Field) -> Error {
    let mut e = Error::new(ErrorKind::TooMany, field);
    e.max = MAX_PARTS as f32;
    e
}

impl Rig {
    /// Checks a description and builds the rig.
    ///
    /// # Errors
    /// The first invalid field, named by its path in [`RigSpec`], with its
    /// value and accepted range.
    pub fn new(spec: &RigSpec) -> Result<Rig, Error> {
        let support = Self::check_head(spec)?;
        let mut parts: Vec<Part, MAX_PARTS> = Vec::new();
        Self::check_parts(spec, &mut parts)?;
        Ok(Rig {
            support,
            mount: spec.mount,
            friction_coefficient: spec.friction_coefficient,
            parts,
            drives: spec.drives,
        })
    }

    /// Checks a description and builds the rig in place in `slot`: the same
    /// checks, errors and rig as [`Rig::new`], without the rig passing
    /// through the stack as a return value. For a small target that keeps its
    /// rig in a `static`: `Rig::new`'s result is a `Result<Rig, Error>`
    /// (3.3 KiB on a 32-bit target, most of it the part list) that is built
    /// in the caller's frame and then copied; here the parts are written
    /// straight into `slot`. `slot` holds the rig on success and `None` on
    /// error (a rig that failed a check never exists); whatever it held
    /// before is replaced either way.
    ///
    /// # Errors
    /// As [`Rig::new`].
    ///
    /// # Examples
    /// ```
    /// use standfast::{MountGeometry, Rig, RigSpec};
    /// use standfast::rig::{BodySpec, Stage};
    /// use standfast::support::Support;
    ///
    /// let spec = RigSpec::new(
    ///     &Support::tripod(0.45, 0.0)?,
    ///     MountGeometry::equatorial(0.8, [0.0, 0.0, 1.25]),
    ///     0.3,
    /// )
    /// .with_body(BodySpec::point(Stage::Ground, 4.0, [0.0, 0.0, 1.1]))?;
    /// let mut slot = None;
    /// Rig::build_in(&mut slot, &spec)?;
    /// assert_eq!(slot, Some(Rig::new(&spec)?));
    /// # Ok::<(), standfast::Error>(())
    /// ```
    pub fn build_in(slot: &mut Option<Rig>, spec: &RigSpec) -> Result<(), Error> {
        *slot = None;
        let support = Self::check_head(spec)?;
        let rig = slot.insert(Rig {
            support,
            mount: spec.mount,
            friction_coefficient: spec.friction_coefficient,
            parts: Vec::new(),
            drives: spec.drives,
        });
        let checked = Self::check_parts(spec, &mut rig.parts);
        if checked.is_err() {
            *slot = None;
        }
        checked
    }

    /// The support, the mount and the friction coefficient of `spec`, checked.
    fn check_head(spec: &RigSpec) -> Result<Support, Error> {
        let support = Support::new(&spec.feet)?;
        spec.mount.validate()?;
        Error::check(
            Field::FrictionCoefficient,
            spec.friction_coefficient,
            0.0,
            2.0,
        )?;
        Ok(support)
    }

    /// Checks the parts of `spec` (bodies, legs, counterweights, shaft,
    /// cover, ballast, drives) and appends them to `parts`, which starts empty.
    fn check_parts(spec: &RigSpec, parts: &mut Vec<Part, MAX_PARTS>) -> Result<(), Error> {
        let mut push = |p: Part, field: Field| parts.push(p).map_err(|_| too_many(field));

        for (i, b) in spec.bodies.iter().enumerate() {
            // A body with a shape may be massless: a drag-only surface (a
            // sign, a dew shield, a cable tray) whose mass is counted
            // elsewhere or negligible.
            if !(b.mass_kg == 0.0 && b.exposure.is_some()) {
                check_mass(Field::BodiesMassKg, b.mass_kg, i)?;
            }
            let cg = check_offset(Field::BodiesCgM, b.cg_m, i)?;
            if let Some(x) = &b.exposure {
                x.validate().map_err(|e| e.at(i))?;
            }
            push(
                Part {
                    role: PartRole::Body(i as u8),
                    stage: b.stage,
                    mass_kg: b.mass_kg,
                    cg_m: cg,
                    exposure: b.exposure,
                    mass_model: b.mass_model,
                    under_cover: b.under_cover,
                },
                Field::Bodies,
            )?;
        }
        if let Some(l) = spec.legs {
            Error::check(Field::LegsMassKg, l.mass_kg, 1e-3, 100.0)?;
            Error::check(Field::LegsDiameterM, l.diameter_m, 0.003, 0.3)?;
            Error::check(Field::LegsTopHeightM, l.top_height_m, 0.1, 5.0)?;
            Error::check(Field::LegsTopRadiusM, l.top_radius_m, 0.0, 1.0)?;
            for (i, f) in spec.feet.iter().enumerate() {
                let foot = Vec3::new(f.position_m[0], f.position_m[1], 0.0);
                let radial = foot.normalized().unwrap_or(Vec3::X);
                let top = radial * l.top_radius_m + Vec3::Z * l.top_height_m;
                let axis = foot - top;
                let centre = (foot + top) * 0.5;
                push(
                    Part {
                        role: PartRole::Leg(i as u8),
                        stage: Stage::Ground,
                        mass_kg: l.mass_kg,
                        cg_m: centre,
                        exposure: Some(Exposure {
                            shape: Shape::Cylinder {
                                diameter_m: l.diameter_m,
                                length_m: axis.norm(),
                                axis: axis.to_array(),
                            },
                            centre_m: centre.to_array(),
                            drag_coefficient: None,
                            end_drag_coefficient: None,
                        }),
                        mass_model: MassModel::Solid,
                        under_cover: false,
                    },
                    Field::Legs,
                )?;
            }
        }
        for (i, c) in spec.counterweights.iter().enumerate() {
            check_mass(Field::CounterweightsMassKg, c.mass_kg, i)?;
            Error::check(
                Field::CounterweightsDistanceM,
                c.distance_m,
                0.0,
                MAX_OFFSET_M,
            )
            .map_err(|e| e.at(i))?;
            Error::check(Field::CounterweightsDiameterM, c.diameter_m, 0.01, 1.0)
                .map_err(|e| e.at(i))?;
            Error::check(Field::CounterweightsThicknessM, c.thickness_m, 0.002, 1.0)
                .map_err(|e| e.at(i))?;
            if let Some(cd) = c.drag_coefficient {
                Error::check(Field::CounterweightsDragCoefficient, cd, 0.1, 3.0)
                    .map_err(|e| e.at(i))?;
            }
            push(
                Part {
                    role: PartRole::Counterweight(i as u8),
                    stage: Stage::Primary,
                    mass_kg: c.mass_kg,
                    cg_m: Vec3::new(-c.distance_m, 0.0, 0.0),
                    exposure: Some(Exposure {
                        shape: Shape::Cylinder {
                            diameter_m: c.diameter_m,
                            length_m: c.thickness_m,
                            axis: [1.0, 0.0, 0.0],
                        },
                        centre_m: [-c.distance_m, 0.0, 0.0],
                        drag_coefficient: None,
                        end_drag_coefficient: c.drag_coefficient,
                    }),
                    mass_model: MassModel::Solid,
                    under_cover: false,
                },
                Field::Counterweights,
            )?;
        }
        if let Some(s) = spec.shaft {
            Error::check(Field::ShaftMassKg, s.mass_kg, 1e-3, 100.0)?;
            Error::check(Field::ShaftLengthM, s.length_m, 0.01, MAX_OFFSET_M)?;
            Error::check(Field::ShaftDiameterM, s.diameter_m, 0.003, 0.2)?;
            let c = [-0.5 * s.length_m, 0.0, 0.0];
            push(
                Part {
                    role: PartRole::Shaft,
                    stage: Stage::Primary,
                    mass_kg: s.mass_kg,
                    cg_m: Vec3::from_array(c),
                    exposure: Some(Exposure {
                        shape: Shape::Cylinder {
                            diameter_m: s.diameter_m,
                            length_m: s.length_m,
                            axis: [1.0, 0.0, 0.0],
                        },
                        centre_m: c,
                        drag_coefficient: None,
                        end_drag_coefficient: None,
                    }),
                    mass_model: MassModel::Solid,
                    under_cover: false,
                },
                Field::Shaft,
            )?;
        }
        if let Some(c) = spec.cover {
            Error::check(Field::CoverMassKg, c.mass_kg, 0.0, MAX_PART_MASS_KG)?;
            let centre = check_offset(Field::CoverCentreM, c.centre_m, 0)?;
            let exposure = Exposure {
                shape: Shape::Box {
                    size_m: c.size_m,
                    edges: None,
                },
                centre_m: c.centre_m,
                drag_coefficient: c.drag_coefficient,
                end_drag_coefficient: None,
            };
            exposure.validate()?;
            push(
                Part {
                    role: PartRole::Cover,
                    stage: Stage::Secondary,
                    mass_kg: c.mass_kg,
                    cg_m: centre,
                    exposure: Some(exposure),
                    mass_model: MassModel::Shell,
                    under_cover: false,
                },
                Field::Cover,
            )?;
        }
        for (i, b) in spec.ballast.iter().enumerate() {
            check_mass(Field::BallastMassKg, b.mass_kg, i)?;
            let p = check_offset(Field::BallastPositionM, b.position_m, i)?;
            Error::check(Field::BallastPositionM, p.z, 0.0, MAX_OFFSET_M).map_err(|e| e.at(i))?;
            push(
                Part {
                    role: PartRole::Ballast(i as u8),
                    stage: Stage::Ground,
                    mass_kg: b.mass_kg,
                    cg_m: p,
                    exposure: None,
                    mass_model: MassModel::Point,
                    under_cover: false,
                },
                Field::Ballast,
            )?;
        }
        if let Some(d) = &spec.drives {
            d.validate()?;
        }
        if parts.is_empty() {
            let mut e = Error::new(ErrorKind::TooFew, Field::Bodies);
            e.min = 1.0;
            return Err(e);
        }
        Ok(())
    }

    /// The support polygon.
    #[must_use]
    pub fn support(&self) -> &Support {
        &self.support
    }

    /// The mount geometry.
    #[must_use]
    pub fn mount(&self) -> &MountGeometry {
        &self.mount
    }

    /// Static friction coefficient between feet and ground.
    #[must_use]
    pub fn friction_coefficient(&self) -> f32 {
        self.friction_coefficient
    }

    /// Drive ratings, if the description gave them.
    #[must_use]
    pub fn drives(&self) -> Option<&Drives> {
        self.drives.as_ref()
    }

    /// All parts, the cover among them.
    #[must_use]
    pub fn parts(&self) -> &[Part] {
        &self.parts
    }

    /// True when the rig has a cover.
    #[must_use]
    pub fn has_cover(&self) -> bool {
        self.parts.iter().any(|p| p.role == PartRole::Cover)
    }

    /// The same rig with an extra ballast mass at a rig-frame point.
    ///
    /// # Errors
    /// An invalid mass or position, or no room for another part.
    pub fn with_ballast(&self, mass_kg: f32, position_m: Vec3) -> Result<Rig, Error> {
        check_mass(Field::BallastMassKg, mass_kg, 0)?;
        let p = check_offset(Field::BallastPositionM, position_m.to_array(), 0)?;
        let mut rig = self.clone();
        let n = rig
            .parts
            .iter()
            .filter(|p| matches!(p.role, PartRole::Ballast(_)))
            .count();
        rig.parts
            .push(Part {
                role: PartRole::Ballast(n as u8),
                stage: Stage::Ground,
                mass_kg,
                cg_m: p,
                exposure: None,
                mass_model: MassModel::Point,
                under_cover: false,
            })
            .map_err(|_| too_many(Field::Ballast))?;
        Ok(rig)
    }

    /// The same rig with its ground-stage mass replaced by a measurement:
    /// the whole rig weighed `mass_kg` with its centre of gravity at
    /// `centre_m` (rig frame, metres) in pose `pose` on level ground, cover
    /// fitted or not as `cover_fitted` says (see [`crate::weighing`]).
    ///
    /// The parts that move with the mount (counterweights, shaft, bodies on
    /// the primary and secondary stages, the cover) keep their described
    /// masses: they are usually weighed one by one. Every ground-stage part
    /// (legs, ground bodies, ballast) keeps its wind shape but loses its mass
    /// to one point mass, [`PartRole::Measured`], that makes the total and
    /// its centre match the measurement:
    /// `m_g = M − Σm_moving`, `c_g = (M·c − Σ m·c_moving) / m_g`.
    ///
    /// # Errors
    /// A mass or centre out of range; a pose the mount refuses; a measured
    /// mass not above the moving parts' ([`ErrorKind::Inconsistent`] on
    /// `measured.mass_kg`); a ground-stage centre outside the rig's envelope
    /// or below the ground ([`ErrorKind::Inconsistent`] on
    /// `measured.centre_m`); no room for another part.
    pub fn with_measured_centre(
        &self,
        mass_kg: f32,
        centre_m: Vec3,
        pose: Pose,
        cover_fitted: bool,
    ) -> Result<Rig, Error> {
        Error::check(Field::MeasuredMassKg, mass_kg, 1e-3, MAX_PART_MASS_KG)?;
        Error::check_vec(
            Field::MeasuredCentreM,
            centre_m,
            -MAX_OFFSET_M,
            MAX_OFFSET_M,
        )?;
        let placement = self.place(pose, Tilt::LEVEL, cover_fitted)?;
        let (mut m_moving, mut s_moving) = (0.0_f32, Vec3::ZERO);
        for p in placement.parts() {
            if p.part.stage != Stage::Ground {
                m_moving += p.part.mass_kg;
                s_moving += p.cg_m * p.part.mass_kg;
            }
        }
        let m_ground = mass_kg - m_moving;
        if m_ground.is_nan() || m_ground < 1e-3 {
            let mut e = Error::new(ErrorKind::Inconsistent, Field::MeasuredMassKg);
            e.value = mass_kg;
            e.min = m_moving + 1e-3;
            e.max = MAX_PART_MASS_KG;
            return Err(e);
        }
        let c_ground = (centre_m * mass_kg - s_moving) * (1.0 / m_ground);
        let outside = !c_ground.is_finite()
            || c_ground.x.abs() > MAX_OFFSET_M
            || c_ground.y.abs() > MAX_OFFSET_M
            || c_ground.z < 0.0
            || c_ground.z > MAX_OFFSET_M;
        if outside {
            let mut e = Error::new(ErrorKind::Inconsistent, Field::MeasuredCentreM);
            e.value = c_ground.z;
            e.min = 0.0;
            e.max = MAX_OFFSET_M;
            return Err(e);
        }
        let mut rig = self.clone();
        rig.parts.retain(|p| p.role != PartRole::Measured);
        for p in &mut rig.parts {
            if p.stage == Stage::Ground {
                p.mass_kg = 0.0;
            }
        }
        rig.parts
            .push(Part {
                role: PartRole::Measured,
                stage: Stage::Ground,
                mass_kg: m_ground,
                cg_m: c_ground,
                exposure: None,
                mass_model: MassModel::Point,
                under_cover: false,
            })
            .map_err(|_| too_many(Field::Measured))?;
        Ok(rig)
    }

    /// The same rig with the tie-down rating of every foot set to `pull_n`.
    ///
    /// # Errors
    /// A pull outside 0 to 100 kN.
    pub fn with_tie_downs(&self, pull_n: f32) -> Result<Rig, Error> {
        let mut feet: Vec<Foot, MAX_FEET> = Vec::new();
        for f in self.support.feet() {
            let _ = feet.push(Foot {
                position_m: f.position_m,
                tie_down_n: pull_n,
            });
        }
        let mut rig = self.clone();
        rig.support = Support::new(&feet)?;
        Ok(rig)
    }

    /// Places every part for a pose, ground tilt and cover state.
    ///
    /// # Errors
    /// An invalid pose or tilt.
    pub fn place(
        &self,
        pose: Pose,
        tilt: Tilt,
        cover_fitted: bool,
    ) -> Result<Placement<'_>, Error> {
        let frames = self.mount.frames(pose)?;
        self.place_in(frames, tilt, cover_fitted)
    }

    /// [`Rig::place`] with the stage frames of the pose already computed
    /// (`frames`, from [`MountGeometry::frames`] of a checked pose): the same
    /// placement, without the pose's trigonometry.
    ///
    /// # Errors
    /// An invalid tilt.
    pub(crate) fn place_in(
        &self,
        frames: StageFrames,
        tilt: Tilt,
        cover_fitted: bool,
    ) -> Result<Placement<'_>, Error> {
        let tilt = Tilt::new(tilt.magnitude_rad, tilt.downhill_azimuth_rad)?;
        Ok(Placement {
            rig: self,
            frames,
            gravity: tilt.gravity_unit(),
            cover_fitted: cover_fitted && self.has_cover(),
        })
    }
}

/// A rig placed in a pose, on ground of a given tilt, with the cover on or off.
#[derive(Clone, Copy, Debug)]
pub struct Placement<'a> {
    rig: &'a Rig,
    frames: StageFrames,
    gravity: Vec3,
    cover_fitted: bool,
}

/// A part as placed: its weight and where it acts.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct PlacedPart {
    /// The part.
    pub part: Part,
    /// Centre of gravity, rig frame, metres.
    pub cg_m: Vec3,
    /// Weight force, rig frame, newtons.
    pub weight_n: Vec3,
}

impl<'a> Placement<'a> {
    /// The rig.
    #[must_use]
    pub fn rig(&self) -> &'a Rig {
        self.rig
    }

    /// The stage frames of the pose.
    #[must_use]
    pub fn frames(&self) -> &StageFrames {
        &self.frames
    }

    /// Unit vector of gravity in the rig frame.
    #[must_use]
    pub fn gravity_unit(&self) -> Vec3 {
        self.gravity
    }

    /// True while the cover is fitted (and the rig has one).
    #[must_use]
    pub fn cover_fitted(&self) -> bool {
        self.cover_fitted
    }

    /// The frame axes of a stage, rig coordinates.
    #[must_use]
    pub fn axes(&self, stage: Stage) -> [Vec3; 3] {
        match stage {
            Stage::Ground => [Vec3::X, Vec3::Y, Vec3::Z],
            Stage::Primary => self.frames.primary,
            Stage::Secondary => self.frames.secondary,
        }
    }

    /// A stage-frame point in rig coordinates.
    #[must_use]
    pub fn to_rig(&self, stage: Stage, local_m: Vec3) -> Vec3 {
        let [e1, e2, e3] = self.axes(stage);
        let origin = match stage {
            Stage::Ground => Vec3::ZERO,
            _ => self.frames.origin_m,
        };
        origin + e1 * local_m.x + e2 * local_m.y + e3 * local_m.z
    }

    fn present(&self, p: &Part) -> bool {
        p.role != PartRole::Cover || self.cover_fitted
    }

    /// The parts present (the cover only while fitted), placed.
    pub fn parts(&self) -> impl Iterator<Item = PlacedPart> + '_ {
        let g = self.gravity * STANDARD_GRAVITY_MPS2;
        self.rig
            .parts
            .iter()
            .filter(move |p| self.present(p))
            .map(move |p| PlacedPart {
                part: *p,
                cg_m: self.to_rig(p.stage, p.cg_m),
                weight_n: g * p.mass_kg,
            })
    }

    /// Total mass present, kg.
    #[must_use]
    pub fn mass_kg(&self) -> f32 {
        self.parts().map(|p| p.part.mass_kg).sum()
    }

    /// Centre of gravity of everything present, rig frame, metres.
    #[must_use]
    pub fn centre_of_gravity_m(&self) -> Vec3 {
        let mut m = 0.0;
        let mut s = Vec3::ZERO;
        for p in self.parts() {
            m += p.part.mass_kg;
            s += p.cg_m * p.part.mass_kg;
        }
        if m > 0.0 {
            s * (1.0 / m)
        } else {
            Vec3::ZERO
        }
    }

    /// Wind forces per unit dynamic pressure: for each exposed part present,
    /// its centre of pressure (rig frame, m) and the force per pascal (rig
    /// frame, N/Pa = m²), for a wind from azimuth `from_rad` (meteorological
    /// convention). The cover, when fitted, hides the bodies marked
    /// `under_cover`.
    pub fn wind_loads(&self, from_rad: f32) -> impl Iterator<Item = (Part, Vec3, Vec3)> + '_ {
        let w = frame::wind_unit(from_rad, self.gravity);
        self.rig
            .parts
            .iter()
            .filter(move |p| self.present(p) && !(self.cover_fitted && p.under_cover))
            .filter_map(move |p| {
                let x = p.exposure?;
                let axes = self.axes(p.stage);
                let cp = self.to_rig(p.stage, Vec3::from_array(x.centre_m));
                Some((*p, cp, w * x.drag_area_m2(&axes, w)))
            })
    }
}

/// Force and moment that the parts above a horizontal joint plane put on the
/// joint (see [`Placement::load_above`]). Rig frame.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct JointResultant {
    /// Total force on the parts above (weights and wind), newtons, rig
    /// frame; its z component is negative when they press down on the joint.
    pub force_n: Vec3,
    /// Moment of those forces about the joint centre, N·m, rig frame, by the
    /// right-hand rule (a wind toward +x above the joint gives a moment
    /// about +y, lifting the −x side).
    pub moment_nm: Vec3,
    /// Mass carried through the joint, kg.
    pub mass_kg: f32,
}

impl Placement<'_> {
    /// True when `part`, as placed, is carried through a joint plane at
    /// `plane_z_m` above the ground: every part that moves with the mount,
    /// and every ground-stage body (not legs, ballast or a measured lump)
    /// whose centre of gravity lies above the plane.
    fn carried(&self, p: &Part, plane_z_m: f32) -> bool {
        match p.stage {
            Stage::Primary | Stage::Secondary => true,
            Stage::Ground => {
                matches!(p.role, PartRole::Body(_)) && self.to_rig(p.stage, p.cg_m).z > plane_z_m
            }
        }
    }

    /// The resultant of the weights and the wind (from `from_rad`, at dynamic
    /// pressure `q_pa`) on the parts carried through a horizontal joint
    /// plane at height `plane_z_m` (rig frame), about the joint centre
    /// `centre_m` (rig frame; usually above the vertical axis at the plane's
    /// height). The cover counts while fitted and hides the bodies under it,
    /// as in [`Placement::wind_loads`].
    ///
    /// # Errors
    /// A non-finite or out-of-range height, centre or pressure.
    pub fn load_above(
        &self,
        plane_z_m: f32,
        centre_m: Vec3,
        from_rad: f32,
        q_pa: f32,
    ) -> Result<JointResultant, Error> {
        Error::check(Field::JointHeightM, plane_z_m, 0.0, MAX_OFFSET_M)?;
        Error::check_vec(Field::JointCentreM, centre_m, -MAX_OFFSET_M, MAX_OFFSET_M)?;
        Error::check(Field::JointDynamicPressurePa, q_pa, 0.0, 1.0e5)?;
        Error::check(Field::JointWindFromRad, from_rad, -1e4, 1e4)?;
        let (mut f, mut m, mut mass) = (Vec3::ZERO, Vec3::ZERO, 0.0_f32);
        for p in self.parts() {
            if self.carried(&p.part, plane_z_m) {
                f += p.weight_n;
                m += (p.cg_m - centre_m).cross(p.weight_n);
                mass += p.part.mass_kg;
            }
        }
        for (part, cp, per_pa) in self.wind_loads(from_rad) {
            if self.carried(&part, plane_z_m) {
                let w = per_pa * q_pa;
                f += w;
                m += (cp - centre_m).cross(w);
            }
        }
        Ok(JointResultant {
            force_n: f,
            moment_nm: m,
            mass_kg: mass,
        })
    }
}

/// Standard gravity times a mass: weight in newtons of `mass_kg`.
#[must_use]
pub fn weight_n(mass_kg: f32) -> f32 {
    mass_kg * STANDARD_GRAVITY_MPS2
}

#[cfg(test)]
mod builder_tests {
    use super::*;
    use crate::math::deg_to_rad;

    /// The builders give the same description as the literal they stand for.
    #[test]
    fn builders_match_the_literal() {
        let support = Support::tripod(0.55, 0.0).unwrap();
        let mount = MountGeometry::equatorial(deg_to_rad(47.0), [0.0, 0.0, 1.3]);
        let tube = BodySpec::optical_tube(9.0, 0.24, 0.95, [0.21, 0.08, 0.0])
            .labelled("tube")
            .with_cg_m([0.21, 0.04, 0.0]);
        let literal = BodySpec {
            label: Label::try_from("tube").unwrap(),
            stage: Stage::Secondary,
            mass_kg: 9.0,
            cg_m: [0.21, 0.04, 0.0],
            exposure: Some(Exposure {
                shape: Shape::Cylinder {
                    diameter_m: 0.24,
                    length_m: 0.95,
                    axis: [0.0, 1.0, 0.0],
                },
                centre_m: [0.21, 0.08, 0.0],
                drag_coefficient: None,
                end_drag_coefficient: None,
            }),
            mass_model: MassModel::Shell,
            under_cover: true,
        };
        assert_eq!(tube, literal);
        let spec = RigSpec::new(&support, mount, 0.3)
            .with_body(tube)
            .unwrap()
            .with_counterweight(CounterweightSpec::disc(4.5, 0.27, 0.12, 0.045))
            .unwrap()
            .with_shaft(ShaftSpec::new(1.0, 0.4, 0.03));
        assert_eq!(spec.feet, support.feet_list());
        assert_eq!(spec.bodies.len(), 1);
        assert_eq!(spec.counterweights.len(), 1);
        assert!(Rig::new(&spec).is_ok());
    }

    /// A full list is a typed error naming the list and its capacity.
    #[test]
    fn a_full_list_is_an_error() {
        let support = Support::tripod(0.5, 0.0).unwrap();
        let mount = MountGeometry::alt_azimuth(0.8, [0.0, 0.0, 1.0]);
        let mut spec = RigSpec::new(&support, mount, 0.3);
        for _ in 0..MAX_BODIES {
            spec = spec
                .with_body(BodySpec::point(Stage::Ground, 1.0, [0.0; 3]))
                .unwrap();
        }
        let e = spec
            .with_body(BodySpec::point(Stage::Ground, 1.0, [0.0; 3]))
            .unwrap_err();
        assert_eq!(e.kind, ErrorKind::TooMany);
        assert_eq!(e.max, MAX_BODIES as f32);
    }

    /// A long label is cut at a character boundary, never in the middle of
    /// one (a two-byte character straddling byte 24).
    #[test]
    fn long_labels_are_cut_at_a_character() {
        let b = BodySpec::point(Stage::Ground, 1.0, [0.0; 3]).labelled("aaaaaaaaaaaaaaaaaaaaaaaé");
        assert_eq!(b.label.as_str(), "aaaaaaaaaaaaaaaaaaaaaaa");
    }
}

#[cfg(test)]
mod conditions_tests {
    use super::*;

    /// Each wind value outside its range is refused by
    /// [`Conditions::validate`] under its own field (the wind's part, which
    /// the guard's evaluation also checks alone), and values at the ends of
    /// the ranges are taken.
    #[test]
    fn wind_out_of_range_is_refused_under_its_field() {
        let calm = Conditions::calm(Pose::Axes {
            primary_rad: 0.0,
            secondary_rad: 0.0,
        });
        for (speed, from) in [(0.0, 0.0), (MAX_WIND_SPEED_MPS, -1e4), (12.0, 1e4)] {
            let c = Conditions {
                wind_speed_mps: speed,
                wind_from_rad: from,
                ..calm
            };
            assert_eq!(c.validate(), Ok(()), "{speed} m/s from {from} rad");
        }
        let speed = Field::ConditionsWindSpeedMps;
        let from = Field::ConditionsWindFromRad;
        for (s, f, field) in [
            (-0.01, 0.0, speed),
            (MAX_WIND_SPEED_MPS * 1.001, 0.0, speed),
            (f32::NAN, 0.0, speed),
            (f32::INFINITY, 0.0, speed),
            (5.0, 1.001e4, from),
            (5.0, -1.001e4, from),
            (5.0, f32::NAN, from),
        ] {
            let c = Conditions {
                wind_speed_mps: s,
                wind_from_rad: f,
                ..calm
            };
            let got = c.validate().map_err(|e| e.field);
            assert_eq!(got, Err(field), "{s} m/s from {f} rad");
        }
    }
}
