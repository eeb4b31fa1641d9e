//! `standfast starter-rig`: writes a commented starting rig file for a
//! common set-up (a tripod or a pier; an equatorial or an alt-azimuth
//! mount), for a newcomer to edit rather than copying the demo.
//!
//! Every value in a template is an invented placeholder, marked as such; the
//! comments say what each key is, its unit and where to measure it, and
//! point to `host-sim/RIG-FILE.md` for every key, default and range. The
//! file is written atomically (temporary file beside it, then rename) and
//! never over an existing file, so nothing the user wrote is lost.

use std::io::Write;
use std::path::PathBuf;

use clap::{Args, ValueEnum};

use crate::Error;

/// What the rig stands on.
#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
pub enum SupportKind {
    /// A three-legged tripod standing free on the ground.
    Tripod,
    /// A pier (a column on a base plate) bolted to a footing.
    Pier,
}

/// The mount's axes.
#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
pub enum MountChoice {
    /// Equatorial (German type): polar axis, declination axis,
    /// counterweights.
    Equatorial,
    /// Alt-azimuth: azimuth axis, altitude axis, no counterweights.
    AltAz,
}

/// Arguments of `starter-rig`.
#[derive(Debug, Args)]
pub struct StarterRigArgs {
    /// What the rig stands on.
    #[arg(long, value_enum, default_value = "tripod")]
    pub support: SupportKind,
    /// The mount's axes.
    #[arg(long, value_enum, default_value = "equatorial")]
    pub mount: MountChoice,
    /// The rig file to write (refused when it exists: choose a new name).
    #[arg(long, value_name = "FILE")]
    pub out: PathBuf,
}

/// Every set-up a template exists for.
pub const SETUPS: [(SupportKind, MountChoice); 4] = [
    (SupportKind::Tripod, MountChoice::Equatorial),
    (SupportKind::Tripod, MountChoice::AltAz),
    (SupportKind::Pier, MountChoice::Equatorial),
    (SupportKind::Pier, MountChoice::AltAz),
];

const HEAD: &str = "\
# A STARTING rig file written by `standfast starter-rig`. Every number below
# is an invented placeholder for a typical rig of this kind, not yours:
# replace each with your rig's own (weigh the parts, measure the heights).
# All keys, units, defaults and accepted ranges: host-sim/RIG-FILE.md.
#
# Units: any quantity may be a plain number in SI (m, kg, N, N m, s) or a
# string with a unit (\"18 lb\", \"45 in\", \"30 mph\", \"12 N m\"). A plain
# angle is in degrees. Rig frame: x east, y north, z up, origin on the
# ground below the centre of the support.
#
";

/// The rig file after the cautions.
const SITE: &str = "
[site]
latitude = \"45 deg\"                  # your site's latitude, north positive
elevation = \"300 m\"                  # above sea level, for the air density
";

const TRIPOD: &str = "
[support]
friction = 0.4                        # foot-ground static friction: low for wet grass or
                                      # smooth paving (common practice, no source)
# Feet on a circle: its radius from the tripod centre to each foot's contact,
# and the azimuth of the first leg (clockwise from north).
tripod = { foot_circle_radius = \"0.45 m\", first_leg_azimuth = 0 }
tie_down = \"0 N\"                      # pull each foot's stake or strap holds; 0 if none

[legs]                                # the three legs together, for mass and wind
mass = \"1.5 kg\"
diameter = \"32 mm\"
top_height = \"1.0 m\"                  # height of the leg tops above the ground
top_radius = \"0.11 m\"                 # leg tops' distance from the centre
";

const PIER: &str = "
[support]
friction = 0.6                        # base plate on concrete (common practice, no source)
# The base plate's anchor points (x east, y north, from the pier's centre)
# and the pull each anchor holds. 0 N means not anchored: set your anchors'
# rated pull only when they are really set in a footing.
feet = [
  { x = \"0.15 m\", y = \"0.15 m\", tie_down = \"0 N\" },
  { x = \"-0.15 m\", y = \"0.15 m\", tie_down = \"0 N\" },
  { x = \"-0.15 m\", y = \"-0.15 m\", tie_down = \"0 N\" },
  { x = \"0.15 m\", y = \"-0.15 m\", tie_down = \"0 N\" },
]

[[body]]
label = \"pier column\"
stage = \"ground\"                      # does not move with the mount
mass = \"30 kg\"
cg = [0, 0, \"0.5 m\"]
shape = { kind = \"cylinder\", diameter = \"0.2 m\", length = \"1.0 m\", axis = [0, 0, 1] }
";

const EQUATORIAL: &str = "
[mount]
kind = \"equatorial\"
height = \"1.2 m\"                      # where the axes meet, above the support's centre

[[body]]
label = \"mount head\"
stage = \"ground\"
mass = \"12 kg\"
cg = [0, 0, \"1.1 m\"]                  # rig frame
shape = { kind = \"box\", size = [\"0.25 m\", \"0.25 m\", \"0.3 m\"] }

[[body]]
label = \"telescope\"
stage = \"secondary\"                   # turns with the declination axis
mass = \"7 kg\"
cg = [\"0.16 m\", 0, 0]                 # along the declination axis, along the tube
shape = { kind = \"cylinder\", diameter = \"0.12 m\", length = \"0.8 m\", axis = [0, 1, 0] }
mass_model = \"shell\"
under_cover = true                    # inside the cover when it is fitted

[[counterweight]]
mass = \"5 kg\"
distance = \"0.12 m\"                   # from the axes' meeting point along the shaft
diameter = \"0.12 m\"
thickness = \"0.05 m\"

[shaft]
mass = \"1 kg\"
length = \"0.35 m\"
diameter = \"20 mm\"
";

const ALT_AZ: &str = "
[mount]
kind = \"alt_azimuth\"
height = \"1.2 m\"                      # where the axes meet, above the support's centre

[[body]]
label = \"mount head\"
stage = \"ground\"
mass = \"8 kg\"
cg = [0, 0, \"1.1 m\"]                  # rig frame
shape = { kind = \"box\", size = [\"0.2 m\", \"0.2 m\", \"0.3 m\"] }

[[body]]
label = \"telescope\"
stage = \"secondary\"                   # turns with the altitude axis
mass = \"6 kg\"
cg = [\"0.15 m\", 0, 0]                 # beside the arm, along the altitude axis
shape = { kind = \"cylinder\", diameter = \"0.12 m\", length = \"0.7 m\", axis = [0, 1, 0] }
mass_model = \"shell\"
under_cover = true                    # inside the cover when it is fitted
";

const TAIL: &str = "
# [cover]                             # a weather cover: it adds mass and catches wind
# mass = \"1.5 kg\"
# size = [\"0.3 m\", \"1.0 m\", \"0.3 m\"]
# centre = [\"0.16 m\", 0, 0]

# [drives]                            # the drive ratings, for the torque checks
# primary = { rated = \"10 N m\", repeated_peak = \"18 N m\", momentary_peak = \"30 N m\" }
# secondary = { rated = \"8 N m\", repeated_peak = \"15 N m\", momentary_peak = \"25 N m\" }

# [guard]                             # when to watch, park and alarm (fractions of the limit)
# watch_utilisation = 0.5
# park_utilisation = 0.65
# alarm_utilisation = 0.85

[sensor]
anemometer_height = \"3 m\"             # the anemometer above the ground
rig_height = \"1.2 m\"                  # the centre of the rig's wind load
terrain = \"II\"                        # EN 1991-1-4 terrain category: 0, I, II, III or IV
";

/// The starter rig file for a set-up.
#[must_use]
pub fn template(support: SupportKind, mount: MountChoice) -> String {
    let mut s = String::from(HEAD);
    for line in crate::cautions::caution_lines(74) {
        s.push_str("# ");
        s.push_str(&line);
        s.push('\n');
    }
    s.push_str(SITE);
    s.push_str(match support {
        SupportKind::Tripod => TRIPOD,
        SupportKind::Pier => PIER,
    });
    s.push_str(match mount {
        MountChoice::Equatorial => EQUATORIAL,
        MountChoice::AltAz => ALT_AZ,
    });
    s.push_str(TAIL);
    s
}

/// Runs `standfast starter-rig`.
///
/// # Errors
/// [`Error::Usage`] (exit 2) when `--out` exists; [`Error::Io`] when it
/// cannot be written.
pub fn run(a: &StarterRigArgs, out: &mut dyn Write) -> Result<(), Error> {
    if a.out.exists() || a.out.symlink_metadata().is_ok() {
        return Err(Error::Usage(format!(
            "--out {}: the file exists; starter-rig never writes over a file (choose a new name)",
            a.out.display()
        )));
    }
    crate::commands::output::write_atomic(&a.out, template(a.support, a.mount).as_bytes())?;
    writeln!(
        out,
        "wrote a starting rig file ({}, {}) to {}\nEvery value in it is a placeholder: replace each with your rig's, then run\n  standfast assess {}\nAll keys, units, defaults and ranges: host-sim/RIG-FILE.md.\n\n{}",
        match a.support {
            SupportKind::Tripod => "tripod",
            SupportKind::Pier => "pier",
        },
        match a.mount {
            MountChoice::Equatorial => "equatorial mount",
            MountChoice::AltAz => "alt-azimuth mount",
        },
        a.out.display(),
        a.out.display(),
        crate::cautions::CAUTION
    )
    .map_err(|e| Error::io("<standard output>", e))
}
