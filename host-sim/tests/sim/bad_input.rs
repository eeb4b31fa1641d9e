//! The bad-input suite: crafted rig files, log profiles, logs, options,
//! bridge lines and output paths, each run through the `standfast` command
//! as a person would run it. For every case the table states the exit code
//! (host-sim/src/error.rs: 1 bad input, 2 bad command line, 3 I/O) and the
//! pieces the message must hold (file and line or key, the value as
//! written, the accepted range where there is one); the runner checks too
//! that every file in the folder is unchanged (length and FNV-1a hash
//! before and after), that no output (or temporary file) was left behind,
//! and that no message line is longer than a bounded echo allows.
//!
//! Ranges quoted here are the project's own documented limits (rig-file
//! module docs, the core's `Error::check` bounds, host-sim/README.md);
//! where a message quotes a limit of the core it is the core's constant.

use std::collections::BTreeMap;
use std::io::Write as _;
use std::path::Path;
use std::process::{Command, Stdio};

use standfast_sim::commands::output::fingerprint;

/// The demo rig (host-sim/demo/rig.toml), the base of the rig cases.
const RIG: &str = include_str!("../../demo/rig.toml");

/// A one-file log profile (epoch seconds).
const PROFILE: &str = r#"[log]
[[log.file]]
path = "l.csv"
time = { column = "t", format = "epoch_s" }
[log.file.columns]
accel_x = { column = "ax", unit = "g" }
accel_y = { column = "ay", unit = "g" }
accel_z = { column = "az", unit = "g" }
wind_speed = { column = "speed", unit = "m/s" }
wind_direction = { column = "dir", unit = "deg" }
"#;

/// A good log for [`PROFILE`]: the header is line 1, rows lines 2 to 5.
const LOG: &str = "t,ax,ay,az,speed,dir\n\
1763154000,0,0,1,3,270\n\
1763154001,0,0,1,3.5,271\n\
1763154002,0,0,1,4,270\n\
1763154003,0,0,1,4.5,269\n";

/// The same channels with ISO 8601 times.
const PROFILE_ISO: &str = r#"[log]
[[log.file]]
path = "i.csv"
time = { column = "time", format = "iso8601" }
[log.file.columns]
wind_speed = { column = "speed", unit = "m/s" }
wind_direction = { column = "dir", unit = "deg" }
"#;

const LOG_ISO: &str = "time,speed,dir\n\
2025-11-14T21:00:00Z,3,270\n\
2025-11-14T21:00:01Z,3.5,271\n\
2025-11-14T21:00:02Z,4,270\n";

/// Longest message line accepted: a location, a key and a value each
/// bounded to 60 characters, the problem to 600 (host-sim/src/located.rs).
const MAX_LINE: usize = 1200;

/// Options that ask a replay for every output.
const ALL_OUTPUTS: [&str; 6] = [
    "--verdicts",
    "v.csv",
    "--html",
    "r.html",
    "--events",
    "e.txt",
];

#[derive(Clone, Debug, Default)]
struct Case {
    name: String,
    /// Files written into the folder over the base files.
    files: Vec<(String, Vec<u8>)>,
    /// Hard links made before the run: (existing file, new name).
    links: Vec<(String, String)>,
    args: Vec<String>,
    stdin: Option<Vec<u8>>,
    exit: i32,
    /// Pieces the message (standard error, then standard output) must hold.
    expect: Vec<String>,
    /// Files the run must create (all others must not appear).
    creates: Vec<String>,
}

fn s(v: &[&str]) -> Vec<String> {
    v.iter().map(|x| (*x).to_owned()).collect()
}

fn case(name: &str, args: &[&str], exit: i32, expect: &[&str]) -> Case {
    Case {
        name: name.to_owned(),
        args: s(args),
        exit,
        expect: s(expect),
        ..Case::default()
    }
}

impl Case {
    fn file(mut self, name: &str, text: impl Into<Vec<u8>>) -> Case {
        self.files.push((name.to_owned(), text.into()));
        self
    }
    fn link(mut self, from: &str, to: &str) -> Case {
        self.links.push((from.to_owned(), to.to_owned()));
        self
    }
    fn stdin(mut self, text: impl Into<Vec<u8>>) -> Case {
        self.stdin = Some(text.into());
        self
    }
    fn creates(mut self, names: &[&str]) -> Case {
        self.creates = s(names);
        self
    }
}

/// Every file in `dir` (recursively), by relative name: (length, hash).
fn snapshot(dir: &Path) -> BTreeMap<String, (u64, u64)> {
    let mut out = BTreeMap::new();
    let mut stack = vec![dir.to_path_buf()];
    while let Some(d) = stack.pop() {
        for e in std::fs::read_dir(&d).unwrap() {
            let p = e.unwrap().path();
            if p.is_dir() {
                stack.push(p);
            } else {
                let name = p.strip_prefix(dir).unwrap().display().to_string();
                out.insert(name, fingerprint(&p).unwrap());
            }
        }
    }
    out
}

fn run(c: &Case) {
    let dir = tempfile::tempdir().unwrap();
    let base: [(&str, &[u8]); 5] = [
        ("rig.toml", RIG.as_bytes()),
        ("p.toml", PROFILE.as_bytes()),
        ("l.csv", LOG.as_bytes()),
        ("pi.toml", PROFILE_ISO.as_bytes()),
        ("i.csv", LOG_ISO.as_bytes()),
    ];
    for (n, t) in base {
        std::fs::write(dir.path().join(n), t).unwrap();
    }
    for (n, t) in &c.files {
        let p = dir.path().join(n);
        if let Some(parent) = p.parent() {
            std::fs::create_dir_all(parent).unwrap();
        }
        std::fs::write(p, t).unwrap();
    }
    for (from, to) in &c.links {
        std::fs::hard_link(dir.path().join(from), dir.path().join(to)).unwrap();
    }
    let before = snapshot(dir.path());
    let mut cmd = Command::new(env!("CARGO_BIN_EXE_standfast"));
    cmd.args(&c.args)
        .current_dir(dir.path())
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped());
    let mut child = cmd.spawn().unwrap();
    {
        let mut stdin = child.stdin.take().unwrap();
        if let Some(input) = &c.stdin {
            // The bridge may stop reading early only by a bug; ignore a
            // broken pipe here and let the checks below speak.
            let _ = stdin.write_all(input);
        }
    }
    let out = child.wait_with_output().unwrap();
    let stderr = String::from_utf8_lossy(&out.stderr);
    let stdout = String::from_utf8_lossy(&out.stdout);
    let all = format!("{stderr}\n{stdout}");
    let name = &c.name;
    assert_eq!(
        out.status.code(),
        Some(c.exit),
        "{name}: exit code\n--- stderr\n{}\n--- stdout\n{}",
        stderr.chars().take(2000).collect::<String>(),
        stdout.chars().take(2000).collect::<String>()
    );
    for piece in &c.expect {
        assert!(
            all.contains(piece.as_str()),
            "{name}: the message lacks {piece:?}\n--- stderr\n{}\n--- stdout\n{}",
            stderr.chars().take(2000).collect::<String>(),
            stdout.chars().take(2000).collect::<String>()
        );
    }
    for line in stderr.lines() {
        assert!(
            line.chars().count() <= MAX_LINE,
            "{name}: a message line of {} characters",
            line.chars().count()
        );
    }
    if c.stdin.is_some() {
        for line in stdout.lines().filter(|l| l.contains("\"error\"")) {
            assert!(
                line.chars().count() <= MAX_LINE,
                "{name}: an error line of {} characters",
                line.chars().count()
            );
        }
    }
    let after = snapshot(dir.path());
    for (file, fp) in &before {
        assert_eq!(
            after.get(file),
            Some(fp),
            "{name}: input {file} changed or vanished"
        );
    }
    for file in after.keys() {
        assert!(
            before.contains_key(file) || c.creates.contains(file),
            "{name}: {file} was left behind"
        );
    }
    for file in &c.creates {
        assert!(after.contains_key(file), "{name}: {file} was not written");
    }
}

fn run_all(cases: &[Case]) {
    let mut names = std::collections::HashSet::new();
    for c in cases {
        assert!(names.insert(c.name.clone()), "two cases named {}", c.name);
        run(c);
    }
}

/// The 1-based line of the first line of `text` holding `needle`.
fn line_of(text: &str, needle: &str) -> usize {
    text.lines()
        .position(|l| l.contains(needle))
        .unwrap_or_else(|| panic!("{needle:?} not in the text"))
        + 1
}

/// `assess` of the demo rig with `from` replaced by `to`; the message must
/// name `rig.toml:<line of to>` and hold `expect`.
fn rig(name: &str, from: &str, to: &str, expect: &[&str]) -> Case {
    assert!(
        RIG.contains(from),
        "{name}: {from:?} is not in the demo rig"
    );
    let text = RIG.replacen(from, to, 1);
    let last = to.lines().last().unwrap_or(to);
    let at = format!("rig.toml:{}:", line_of(&text, last));
    let mut pieces = vec![at.as_str()];
    pieces.extend_from_slice(expect);
    case(name, &["assess", "rig.toml"], 1, &pieces).file("rig.toml", text)
}

fn rig_cases() -> Vec<Case> {
    vec![
        rig(
            "latitude beyond the pole",
            "latitude = \"47.3 deg\"",
            "latitude = \"95 deg\"",
            &["site.latitude", "\"95 deg\"", "-90 to 90 deg"],
        ),
        rig(
            "latitude not a number",
            "latitude = \"47.3 deg\"",
            "latitude = \"north\"",
            &["site.latitude", "north", "does not start with a number"],
        ),
        rig(
            "latitude in kilograms",
            "latitude = \"47.3 deg\"",
            "latitude = \"47.3 kg\"",
            &["site.latitude", "\"kg\" is a unit of mass", "deg"],
        ),
        rig(
            "latitude nan",
            "latitude = \"47.3 deg\"",
            "latitude = nan",
            &["site.latitude", "not a finite number"],
        ),
        rig(
            "elevation too high",
            "elevation = \"420 m\"",
            "elevation = \"20000 m\"",
            &["site.elevation", "\"20000 m\"", "-500 to 11000 m"],
        ),
        rig(
            "elevation in seconds",
            "elevation = \"420 m\"",
            "elevation = \"420 s\"",
            &["site.elevation", "unit of time", "m, mm, cm"],
        ),
        rig(
            "friction too high",
            "friction = 0.45",
            "friction = 7",
            &["support.friction", "= 7", "0 to 2"],
        ),
        rig(
            "friction negative",
            "friction = 0.45",
            "friction = -1",
            &["support.friction", "-1", "0 to 2"],
        ),
        rig(
            "friction nan",
            "friction = 0.45",
            "friction = nan",
            &["support.friction", "0 to 2"],
        ),
        rig(
            "friction infinite",
            "friction = 0.45",
            "friction = inf",
            &["support.friction", "0 to 2"],
        ),
        rig(
            "friction as text",
            "friction = 0.45",
            "friction = \"slippery\"",
            &["support.friction", "slippery"],
        ),
        rig(
            "tripod radius negative",
            "foot_circle_radius = \"0.475 m\"",
            "foot_circle_radius = \"-1 m\"",
            &[
                "support.tripod.foot_circle_radius",
                "\"-1 m\"",
                "accepted range",
            ],
        ),
        rig(
            "tripod radius in kilograms",
            "foot_circle_radius = \"0.475 m\"",
            "foot_circle_radius = \"0.475 kg\"",
            &["support.tripod.foot_circle_radius", "unit of mass", "m, mm"],
        ),
        rig(
            "tripod radius and spread",
            "foot_circle_radius = \"0.475 m\"",
            "foot_circle_radius = \"0.475 m\", leg_spread = \"0.8 m\"",
            &[
                "support.tripod",
                "exactly one of foot_circle_radius and leg_spread",
            ],
        ),
        rig(
            "tripod key misspelt",
            "foot_circle_radius = \"0.475 m\"",
            "foot_circle_radios = \"0.475 m\"",
            &[
                "support.tripod.foot_circle_radios",
                "did you mean `foot_circle_radius`?",
            ],
        ),
        rig(
            "tie-down negative",
            "tie_down = \"0 N\"",
            "tie_down = \"-5 N\"",
            &["support.tie_down", "\"-5 N\"", "accepted range", "N"],
        ),
        rig(
            "tie-down in metres",
            "tie_down = \"0 N\"",
            "tie_down = \"5 m\"",
            &["support.tie_down", "unit of length", "N, kN"],
        ),
        rig(
            "feet on one line",
            "tripod = { foot_circle_radius = \"0.475 m\", first_leg_azimuth = 0 }",
            "feet = [ { x = 0, y = 0 }, { x = 1, y = 0 }, { x = 2, y = 0 } ]",
            &["support.feet", "one line"],
        ),
        rig(
            "two feet in one place",
            "tripod = { foot_circle_radius = \"0.475 m\", first_leg_azimuth = 0 }",
            "feet = [ { x = 0.5, y = 0 }, { x = 0.5, y = 0 }, { x = -0.5, y = 0.4 } ]",
            &["support.feet", "1 mm"],
        ),
        rig(
            "two feet only",
            "tripod = { foot_circle_radius = \"0.475 m\", first_leg_azimuth = 0 }",
            "feet = [ { x = 0.5, y = 0 }, { x = -0.5, y = 0.4 } ]",
            &["support.feet", "at least 3"],
        ),
        rig(
            "legs mass in metres",
            "mass = \"1.3 kg\"",
            "mass = \"1.3 m\"",
            &[
                "legs.mass",
                "\"1.3 m\"",
                "unit of length",
                "kg, g, t, lb, oz",
            ],
        ),
        rig(
            "legs diameter negative",
            "diameter = \"35 mm\"",
            "diameter = \"-35 mm\"",
            &["legs.diameter", "\"-35 mm\"", "accepted range"],
        ),
        rig(
            "mount kind misspelt",
            "kind = \"equatorial\"",
            "kind = \"equatorail\"",
            &["mount.kind", "equatorail", "equatorial, alt_azimuth"],
        ),
        rig(
            "mount height negative",
            "height = \"1.25 m\"",
            "height = \"-1 m\"",
            &["mount.height", "\"-1 m\"", "accepted range"],
        ),
        rig(
            "mount height 99 m",
            "height = \"1.25 m\"",
            "height = \"99 m\"",
            &["mount.height", "\"99 m\"", "accepted range"],
        ),
        rig(
            "head mass negative",
            "mass = \"14 kg\"",
            "mass = \"-14 kg\"",
            &["body[0].mass", "\"-14 kg\"", "accepted range", "kg"],
        ),
        rig(
            "tube mass huge",
            "mass = \"8 kg\"",
            "mass = \"1e9 kg\"",
            &["body[1].mass", "\"1e9 kg\"", "accepted range", "kg"],
        ),
        rig(
            "tube mass in metres",
            "mass = \"8 kg\"",
            "mass = \"8 m\"",
            &["body[1].mass", "unit of length"],
        ),
        rig(
            "body stage unknown",
            "stage = \"ground\"",
            "stage = \"sky\"",
            &["body[0].stage", "\"sky\"", "ground, primary, secondary"],
        ),
        rig(
            "mass model unknown",
            "mass_model = \"shell\"",
            "mass_model = \"hollow\"",
            &["body[1].mass_model", "point, solid, shell"],
        ),
        rig(
            "label too long",
            "label = \"mount head\"",
            "label = \"a mount head with a very long name\"",
            &["body[0].label", "longer than 24 bytes"],
        ),
        rig(
            "shape kind unknown",
            "shape = { kind = \"box\"",
            "shape = { kind = \"sphere\"",
            &["body[0].shape.kind", "\"sphere\"", "cylinder, box"],
        ),
        rig(
            "cylinder diameter negative",
            "diameter = \"0.13 m\"",
            "diameter = \"-0.13 m\"",
            &["body[1].shape.diameter", "accepted range"],
        ),
        rig(
            "cylinder axis zero",
            "axis = [0, 1, 0]",
            "axis = [0, 0, 0]",
            &["body[1].shape.axis", "zero length"],
        ),
        rig(
            "body cg with two numbers",
            "cg = [0, 0, \"1.15 m\"]",
            "cg = [0, 0]",
            &["body[0].cg"],
        ),
        rig(
            "body key misspelt",
            "mass_model = \"shell\"",
            "mass_modle = \"shell\"",
            &["body[1].mass_modle", "did you mean `mass_model`?"],
        ),
        rig(
            "counterweight mass negative",
            "mass = \"5 kg\"",
            "mass = \"-5 kg\"",
            &["counterweight[0].mass", "\"-5 kg\"", "accepted range"],
        ),
        rig(
            "counterweight far out",
            "distance = \"0.10 m\"",
            "distance = \"9 m\"",
            &["counterweight[0].distance", "\"9 m\"", "accepted range"],
        ),
        rig(
            "shaft thread unknown",
            "thread = \"M12\"",
            "thread = \"M99\"",
            &["shaft.thread", "\"M99\"", "accepted: M"],
        ),
        rig(
            "shaft material unknown",
            "material = \"S355\"",
            "material = \"unobtainium\"",
            &["shaft.material", "unobtainium", "6061-T6"],
        ),
        rig(
            "shaft yield strength negative",
            "material = \"S355\"",
            "yield_strength_mpa = -3",
            &["shaft.yield_strength_mpa", "-3", "accepted range 1 to"],
        ),
        rig(
            "cover size with two numbers",
            "size = [\"0.30 m\", \"1.05 m\", \"0.30 m\"]",
            "size = [\"0.30 m\", \"1.05 m\"]",
            &["cover.size"],
        ),
        rig(
            "drive torque in kilograms",
            "rated = \"12 N m\"",
            "rated = \"12 kg\"",
            &["drives.primary.rated", "unit of mass", "N m"],
        ),
        rig(
            "drive torque negative",
            "rated = \"12 N m\"",
            "rated = \"-12 N m\"",
            &["drives.primary", "accepted range", "N m"],
        ),
        rig(
            "slew acceleration negative",
            "slew_acceleration = 0.5",
            "slew_acceleration = -0.5",
            &["drives.slew_acceleration", "-0.5", "accepted range"],
        ),
        rig(
            "watch threshold above 1",
            "watch_utilisation = 0.5",
            "watch_utilisation = 1.5",
            &["guard.watch_utilisation", "1.5", "accepted range"],
        ),
        rig(
            "park threshold below watch",
            "park_utilisation = 0.65",
            "park_utilisation = 0.2",
            &["guard.park_utilisation", "0.2", "accepted range"],
        ),
        rig(
            "dwell negative",
            "dwell = \"30 s\"",
            "dwell = \"-30 s\"",
            &["guard.dwell", "\"-30 s\"", "accepted range", " s"],
        ),
        rig(
            "dwell in metres",
            "dwell = \"30 s\"",
            "dwell = \"30 m\"",
            &["guard.dwell", "unit of length", "s, ms, min, h"],
        ),
        rig(
            "time to park too long",
            "time_to_park = \"90 s\"",
            "time_to_park = \"9000 s\"",
            &["guard.time_to_park", "\"9000 s\"", "accepted range"],
        ),
        rig(
            "gust allowance below 1",
            "gust_allowance = 1.3",
            "gust_allowance = 0.1",
            &["guard.gust_allowance", "0.1", "accepted range"],
        ),
        rig(
            "accelerometer scale zero",
            "accel_scale = 0.000061",
            "accel_scale = 0",
            &["sensor.accel_scale", "accepted range"],
        ),
        rig(
            "sensor axes repeated",
            "accel_axes = [\"+y\", \"-x\", \"+z\"]",
            "accel_axes = [\"+y\", \"+y\", \"+z\"]",
            &["sensor.accel_axes", "right-handed"],
        ),
        rig(
            "sensor axis unknown",
            "accel_axes = [\"+y\", \"-x\", \"+z\"]",
            "accel_axes = [\"+q\", \"-x\", \"+z\"]",
            &["sensor.accel_axes[0]", "\"+q\"", "+x, -x, +y, -y, +z, -z"],
        ),
        rig(
            "tilt filter negative",
            "tilt_filter = \"1 s\"",
            "tilt_filter = \"-1 s\"",
            &["sensor.tilt_filter", "accepted range"],
        ),
        rig(
            "anemometer height in kilograms",
            "anemometer_height = \"3 m\"",
            "anemometer_height = \"3 kg\"",
            &["sensor.anemometer_height", "unit of mass"],
        ),
        rig(
            "anemometer height 900 m",
            "anemometer_height = \"3 m\"",
            "anemometer_height = \"900 m\"",
            &["sensor.anemometer_height", "\"900 m\"", "accepted range"],
        ),
        rig(
            "terrain category unknown",
            "terrain = \"II\"",
            "terrain = \"V\"",
            &["sensor.terrain", "\"V\"", "0, I, II, III, IV"],
        ),
        rig(
            "wind stale zero",
            "wind_stale = \"15 s\"",
            "wind_stale = \"0 s\"",
            &["sensor.wind_stale", "accepted range"],
        ),
        rig(
            "unknown key with a suggestion",
            "friction = 0.45",
            "friction = 0.45\nfrictoin = 0.5",
            &["support.frictoin", "did you mean `friction`?"],
        ),
        rig(
            "unknown section with a suggestion",
            "[guard]",
            "[gaurd]",
            &["gaurd", "did you mean `guard`?", "accepted here"],
        ),
        rig("syntax error", "friction = 0.45", "friction = = 0.45", &[]),
        rig(
            "a 100 000-character value",
            "latitude = \"47.3 deg\"",
            &format!("latitude = \"{}x\"", "4".repeat(100_000)),
            &["site.latitude", "(100001 bytes)"],
        ),
        rig(
            "a 100 000-character key",
            "friction = 0.45",
            &format!("friction = 0.45\n{} = 1", "k".repeat(100_000)),
            &["bytes)", "unknown key"],
        ),
        rig(
            "a control character in a value",
            "kind = \"equatorial\"",
            "kind = \"equa\\u001b[31mtorial\"",
            &[
                "mount.kind",
                "equa\\u001b[31mtorial",
                "equatorial, alt_azimuth",
            ],
        ),
        case(
            "rig file empty",
            &["assess", "rig.toml"],
            1,
            &["rig.toml:1:1", "site"],
        )
        .file("rig.toml", ""),
        case(
            "rig file not UTF-8",
            &["assess", "rig.toml"],
            1,
            &["rig.toml:2:", "not UTF-8"],
        )
        .file("rig.toml", b"[site]\nlatitude = \"47\xff deg\"\n".to_vec()),
        case(
            "rig file missing",
            &["assess", "none.toml"],
            3,
            &["none.toml"],
        ),
        case("rig file is a folder", &["assess", "sub"], 3, &["sub"]).file("sub/x", "x"),
    ]
}

/// `replay` of the good log with the profile's `from` replaced by `to`;
/// with exit code 1 and a `to` of one line or more the message must name
/// `p.toml:<line of the last line of to>`.
fn profile(name: &str, from: &str, to: &str, exit: i32, expect: &[&str]) -> Case {
    assert!(
        PROFILE.contains(from),
        "{name}: {from:?} not in the profile"
    );
    let text = PROFILE.replacen(from, to, 1);
    let mut args = s(&["replay", "--rig", "rig.toml", "--profile", "p.toml"]);
    args.extend(s(&ALL_OUTPUTS));
    let mut pieces = vec![];
    let at;
    if exit == 1 && !to.is_empty() && from != PROFILE {
        at = format!(
            "p.toml:{}:",
            line_of(&text, to.lines().last().unwrap_or(to))
        );
        pieces.push(at.as_str());
    }
    pieces.extend_from_slice(expect);
    Case {
        args,
        ..case(name, &[], exit, &pieces)
    }
    .file("p.toml", text)
}

fn profile_cases() -> Vec<Case> {
    vec![
        profile(
            "policy unknown",
            "[log]",
            "[log]\non_error = \"halt\"",
            1,
            &["log.on_error", "\"halt\"", "stop, skip"],
        ),
        profile(
            "gap negative",
            "[log]",
            "[log]\ngap = \"-1 s\"",
            1,
            &["log.gap", "\"-1 s\"", "0.001 to 86400 s"],
        ),
        profile(
            "gap in kilograms",
            "[log]",
            "[log]\ngap = \"1 kg\"",
            1,
            &["log.gap", "unit of mass", "s, ms, min"],
        ),
        profile(
            "zone unknown",
            "[log]",
            "[log]\nzone = \"CET\"",
            1,
            &["log.zone", "CET", "+hh:mm"],
        ),
        profile(
            "time format unknown",
            "format = \"epoch_s\"",
            "format = \"epoch_ns\"",
            1,
            &["epoch_ns", "iso8601, epoch_s, epoch_ms"],
        ),
        profile(
            "column unit of another dimension",
            "unit = \"m/s\"",
            "unit = \"kg\"",
            1,
            &["wind_speed", "\"kg\" is a unit of mass", "m/s, km/h"],
        ),
        profile(
            "column unit unknown",
            "unit = \"deg\"",
            "unit = \"furlong\"",
            1,
            &["wind_direction", "furlong", "deg"],
        ),
        profile(
            "channel misspelt",
            "wind_speed =",
            "wind_sped =",
            1,
            &["wind_sped", "did you mean `wind_speed`?"],
        ),
        profile(
            "delimiter two characters",
            "path = \"l.csv\"",
            "path = \"l.csv\"\ndelimiter = \";;\"",
            1,
            &["delimiter", "\";;\""],
        ),
        profile(
            "delimiter a quote",
            "path = \"l.csv\"",
            "path = \"l.csv\"\ndelimiter = '\"'",
            1,
            &["delimiter"],
        ),
        profile(
            "sensor axes repeated",
            "path = \"l.csv\"",
            "path = \"l.csv\"\naccel_axes = [\"x\", \"x\", \"z\"]",
            1,
            &["accel_axes"],
        ),
        profile(
            "scale not finite",
            "accel_z = { column = \"az\", unit = \"g\" }",
            "accel_z = { column = \"az\", unit = \"g\", scale = nan }",
            1,
            &["scale"],
        ),
        profile(
            "accelerometer incomplete",
            "accel_z = { column = \"az\", unit = \"g\" }",
            "",
            1,
            &["p.toml", "accel"],
        ),
        profile(
            "no log section",
            PROFILE,
            "[other]\nx = 1\n",
            1,
            &["p.toml:1:1", "no [log] section"],
        ),
        profile(
            "path missing",
            "path = \"l.csv\"\n",
            "",
            1,
            &["p.toml", "path"],
        ),
        profile(
            "log file missing",
            "path = \"l.csv\"",
            "path = \"nope.csv\"",
            3,
            &["nope.csv"],
        ),
        profile(
            "column not in the header",
            "column = \"speed\"",
            "column = \"sped\"",
            1,
            &["\"sped\"", "its columns: t, ax, ay, az, speed, dir"],
        ),
        case(
            "profile not UTF-8",
            &["replay", "--rig", "rig.toml", "--profile", "p.toml"],
            1,
            &["p.toml:1:", "not UTF-8"],
        )
        .file("p.toml", b"[log\xff]\n".to_vec()),
    ]
}

/// `replay --on-error stop` with row 4 of the good log replaced by `row`:
/// exit 1 naming `l.csv:4` and no output left.
fn row(name: &str, row: &str, expect: &[&str]) -> Case {
    let mut lines: Vec<&str> = LOG.lines().collect();
    lines[3] = row;
    let text = lines.join("\n") + "\n";
    let mut args = s(&[
        "replay",
        "--rig",
        "rig.toml",
        "--profile",
        "p.toml",
        "--on-error",
        "stop",
    ]);
    args.extend(s(&ALL_OUTPUTS));
    let mut pieces = vec!["l.csv:4:"];
    pieces.extend_from_slice(expect);
    Case {
        args,
        ..case(name, &[], 1, &pieces)
    }
    .file("l.csv", text)
}

/// As [`row`] with Windows line ends throughout.
fn row_crlf(name: &str, r: &str, expect: &[&str]) -> Case {
    let mut c = row(name, r, expect);
    let text = String::from_utf8(c.files[0].1.clone()).unwrap();
    c.files[0].1 = text.replace('\n', "\r\n").into_bytes();
    c
}

/// `replay` of the ISO 8601 log with row 3 replaced by `row`.
fn iso_row(name: &str, row: &str, expect: &[&str]) -> Case {
    let mut lines: Vec<&str> = LOG_ISO.lines().collect();
    lines[2] = row;
    let text = lines.join("\n") + "\n";
    let mut args = s(&[
        "replay",
        "--rig",
        "rig.toml",
        "--profile",
        "pi.toml",
        "--on-error",
        "stop",
    ]);
    args.extend(s(&ALL_OUTPUTS));
    let mut pieces = vec!["i.csv:3:"];
    pieces.extend_from_slice(expect);
    Case {
        args,
        ..case(name, &[], 1, &pieces)
    }
    .file("i.csv", text)
}

const OUT_OF_RANGE: &str =
    "outside the accepted range 1970-01-01T00:00:00Z to 2199-12-31T23:59:59Z";

fn log_cases() -> Vec<Case> {
    let long = "9".repeat(100_000);
    vec![
        row(
            "speed not a number",
            "1763154002,0,0,1,x,270",
            &["speed = \"x\"", "not a number"],
        ),
        row(
            "speed nan",
            "1763154002,0,0,1,nan,270",
            &["speed = \"nan\"", "not a finite number"],
        ),
        row(
            "speed infinite",
            "1763154002,0,0,1,inf,270",
            &["\"inf\"", "not a finite number"],
        ),
        row(
            "too few fields",
            "1763154002,0,0,1,3",
            &["5 fields", "the header has 6"],
        ),
        row(
            "too many fields",
            "1763154002,0,0,1,3,270,9",
            &["7 fields", "the header has 6"],
        ),
        row("empty time", ",0,0,1,3,270", &["empty time"]),
        row(
            "time 1e300",
            "1e300,0,0,1,3,270",
            &["\"1e300\"", OUT_OF_RANGE],
        ),
        row("time negative", "-5,0,0,1,3,270", &["\"-5\"", OUT_OF_RANGE]),
        row(
            "time after 2199",
            "7258118400,0,0,1,3,270",
            &["\"7258118400\"", OUT_OF_RANGE],
        ),
        row(
            "time of 20 digits",
            "99999999999999999999,0,0,1,3,270",
            &[OUT_OF_RANGE],
        ),
        row(
            "time not a number",
            "noon,0,0,1,3,270",
            &["\"noon\"", "not a decimal number"],
        ),
        row(
            "time repeated",
            "1763154001,0,0,1,3,270",
            &["same as on line 3"],
        ),
        row(
            "time going back",
            "1763153000,0,0,1,3,270",
            &["earlier than", "line 3"],
        ),
        row(
            "accelerometer incomplete",
            "1763154002,0,0,,3,270",
            &["2 of its 3 axes"],
        ),
        row(
            "direction a word",
            "1763154002,0,0,1,3,west",
            &["dir = \"west\"", "not a number"],
        ),
        row(
            "a 100 000-digit cell",
            &format!("1763154002,0,0,1,{long}x,270"),
            &["speed = \"", "(100001 bytes)"],
        ),
        row(
            "a control character in a cell",
            "1763154002,0,0,1,\u{1b}[31m,270",
            &["\\u{1b}", "not a number"],
        ),
        row("an unterminated quote", "1763154002,0,0,1,\"3,270", &[]),
        row_crlf(
            "CR LF: speed not a number",
            "1763154002,0,0,1,x,270",
            &["speed = \"x\""],
        ),
        row_crlf("CR LF: time 1e300", "1e300,0,0,1,3,270", &[OUT_OF_RANGE]),
        row_crlf(
            "CR LF: time repeated",
            "1763154001,0,0,1,3,270",
            &["same as on line 3"],
        ),
        {
            let mut c = row(
                "cell not UTF-8",
                "1763154002,0,0,1,X,270",
                &["not a number"],
            );
            let t = c.files[0].1.clone();
            let at = t.windows(3).position(|w| w == b",X,").unwrap();
            c.files[0].1 = [&t[..at + 1], b"\xff\xfe".as_slice(), &t[at + 2..]].concat();
            c
        },
        iso_row("ISO month 13", "2025-13-14T21:00:02Z,4,270", &["month"]),
        iso_row(
            "ISO 30 February",
            "2025-02-30T21:00:02Z,4,270",
            &["no such date"],
        ),
        iso_row(
            "ISO hour 25",
            "2025-11-14T25:00:02Z,4,270",
            &["time of day out of range"],
        ),
        iso_row(
            "ISO year 9999",
            "9999-11-14T21:00:02Z,4,270",
            &[OUT_OF_RANGE],
        ),
        iso_row(
            "ISO year 1969",
            "1969-12-31T23:59:59Z,4,270",
            &[OUT_OF_RANGE],
        ),
        iso_row(
            "ISO zone +25:00",
            "2025-11-14T21:00:02+25:00,4,270",
            &["zone offset"],
        ),
        iso_row(
            "ISO text after the time",
            "2025-11-14T21:00:02Z junk,4,270",
            &["unexpected text after the time"],
        ),
        case(
            "log empty",
            &[
                "replay",
                "--rig",
                "rig.toml",
                "--profile",
                "p.toml",
                "--verdicts",
                "v.csv",
            ],
            1,
            &["l.csv:1:1", "the log is empty"],
        )
        .file("l.csv", ""),
        case(
            "header lacks a column",
            &[
                "replay",
                "--rig",
                "rig.toml",
                "--profile",
                "p.toml",
                "--verdicts",
                "v.csv",
            ],
            1,
            &["\"dir\"", "its columns: t, ax, ay, az, speed"],
        )
        .file("l.csv", "t,ax,ay,az,speed\n1763154000,0,0,1,3\n"),
        // Skipped rows: the replay goes on, reports the row, writes its outputs.
        Case {
            args: {
                let mut a = s(&["replay", "--rig", "rig.toml", "--profile", "p.toml"]);
                a.extend(s(&ALL_OUTPUTS));
                a
            },
            ..case(
                "skip: a bad row is reported and the outputs written",
                &[],
                0,
                &["l.csv:4: malformed row", "speed = \"x\""],
            )
        }
        .file(
            "l.csv",
            LOG.replace("1763154002,0,0,1,4,270", "1763154002,0,0,1,x,270"),
        )
        .creates(&["v.csv", "r.html", "e.txt"]),
        Case {
            args: {
                let mut a = s(&["replay", "--rig", "rig.toml", "--profile", "p.toml"]);
                a.extend(s(&ALL_OUTPUTS));
                a
            },
            ..case(
                "skip: CR LF line numbers",
                &[],
                0,
                &["l.csv:4: malformed row"],
            )
        }
        .file(
            "l.csv",
            LOG.replace("1763154002,0,0,1,4,270", "1e300,0,0,1,4,270")
                .replace('\n', "\r\n"),
        )
        .creates(&["v.csv", "r.html", "e.txt"]),
    ]
}

fn option_cases() -> Vec<Case> {
    let assess = |name: &str, opt: &str, v: &str, expect: &[&str]| {
        case(name, &["assess", "rig.toml", opt, v], 2, expect)
    };
    let gust = "more than 0 m/s, up to 100 m/s";
    let storm = "0 to 360 deg";
    let replay_what_if = |name: &str, w: &str, expect: &[&str]| {
        case(
            name,
            &[
                "replay",
                "--rig",
                "rig.toml",
                "--profile",
                "p.toml",
                "--html",
                "r.html",
                "--what-if",
                w,
            ],
            2,
            expect,
        )
    };
    vec![
        assess(
            "design gust nan",
            "--design-gust",
            "nan",
            &["--design-gust", "\"nan\"", gust],
        ),
        assess(
            "design gust inf",
            "--design-gust",
            "inf",
            &["--design-gust", "\"inf\"", gust],
        ),
        assess(
            "design gust negative",
            "--design-gust",
            "-5",
            &["\"-5\"", gust],
        ),
        assess("design gust zero", "--design-gust", "0", &["\"0\"", gust]),
        assess(
            "design gust 101",
            "--design-gust",
            "101",
            &["\"101\"", gust, "this value is 101 m/s"],
        ),
        assess(
            "design gust 300 mph",
            "--design-gust",
            "300 mph",
            &["\"300 mph\"", gust],
        ),
        assess(
            "design gust in kilograms",
            "--design-gust",
            "45 kg",
            &["unit of mass", "m/s, km/h"],
        ),
        assess(
            "design gust empty",
            "--design-gust",
            "",
            &["--design-gust", "empty value"],
        ),
        assess(
            "storm from 400",
            "--storm-from",
            "400",
            &["--storm-from", "\"400\"", storm],
        ),
        assess(
            "storm from 1e999",
            "--storm-from",
            "1e999",
            &["\"1e999\"", "not a finite number", storm],
        ),
        assess(
            "storm from negative",
            "--storm-from",
            "-10",
            &["\"-10\"", storm],
        ),
        assess(
            "storm from 7 rad",
            "--storm-from",
            "7 rad",
            &["\"7 rad\"", storm],
        ),
        assess(
            "storm from furlongs",
            "--storm-from",
            "270 furlongs",
            &["furlongs", "deg"],
        ),
        assess(
            "storm from a long value",
            "--storm-from",
            &"7".repeat(5000),
            &["--storm-from", "(5000 bytes)", storm],
        ),
        case(
            "design gust with a unit is accepted",
            &[
                "assess",
                "rig.toml",
                "--design-gust",
                "90 mph",
                "--storm-from",
                "4.7 rad",
            ],
            0,
            &["For a 40 m/s design gust", "storm from 269°"],
        ),
        case(
            "demo hours zero",
            &["demo", "--hours", "0", "--out", "d"],
            2,
            &["--hours", "\"0\"", "more than 0 h, up to 9 h"],
        ),
        case(
            "demo hours 10",
            &["demo", "--hours", "10", "--out", "d"],
            2,
            &["\"10\"", "more than 0 h, up to 9 h"],
        ),
        case(
            "demo hours negative",
            &["demo", "--hours", "-2", "--out", "d"],
            2,
            &["\"-2\"", "more than 0 h, up to 9 h"],
        ),
        case(
            "demo hours nan",
            &["demo", "--hours", "nan", "--out", "d"],
            2,
            &["\"nan\"", "not a finite number"],
        ),
        case(
            "demo 600 min",
            &["demo", "--hours", "600 min", "--out", "d"],
            2,
            &["\"600 min\"", "this value is 10 h"],
        ),
        case(
            "demo hours in kilograms",
            &["demo", "--hours", "2 kg", "--out", "d"],
            2,
            &["unit of mass", "s, ms, min, h"],
        ),
        case(
            "bench hours zero",
            &["gen-demo", "--bench", "--hours", "0", "--out", "d"],
            2,
            &["\"0\"", "more than 0 h, up to 240 h"],
        ),
        case(
            "bench hours 241",
            &["gen-demo", "--bench", "--hours", "241", "--out", "d"],
            2,
            &["\"241\"", "more than 0 h, up to 240 h"],
        ),
        case(
            "bench hours negative",
            &["gen-demo", "--bench", "--hours", "-1", "--out", "d"],
            2,
            &["\"-1\"", "more than 0 h, up to 240 h"],
        ),
        case(
            "seed not a number",
            &["gen-demo", "--seed", "x", "--out", "d"],
            2,
            &["--seed"],
        ),
        case(
            "every zero",
            &[
                "replay",
                "--rig",
                "rig.toml",
                "--profile",
                "p.toml",
                "--verdicts",
                "v.csv",
                "--every",
                "0",
            ],
            2,
            &["--every", "0"],
        ),
        case(
            "on-error unknown",
            &[
                "replay",
                "--rig",
                "rig.toml",
                "--profile",
                "p.toml",
                "--on-error",
                "halt",
            ],
            2,
            &["halt", "stop", "skip"],
        ),
        case(
            "more logs than the profile lists",
            &[
                "replay",
                "--rig",
                "rig.toml",
                "--profile",
                "p.toml",
                "l.csv",
                "l.csv",
                "--html",
                "r.html",
            ],
            2,
            &["2 log files", "p.toml", "lists 1"],
        ),
        replay_what_if(
            "what-if friction 3",
            "friction=3",
            &["--what-if friction", "\"3\"", "0 to 2"],
        ),
        replay_what_if(
            "what-if friction nan",
            "friction=nan",
            &["friction", "\"nan\"", "0 to 2"],
        ),
        replay_what_if(
            "what-if friction a word",
            "friction=high",
            &["friction", "\"high\"", "0 to 2"],
        ),
        replay_what_if(
            "what-if ballast without position",
            "ballast=12 kg",
            &["ballast", "<mass>@<x>,<y>,<z>"],
        ),
        replay_what_if(
            "what-if ballast negative",
            "ballast=-12 kg@0,0,0.3 m",
            &["ballast", "\"-12 kg@0,0,0.3 m\"", "accepted range above 0"],
        ),
        replay_what_if(
            "what-if ballast far out",
            "ballast=12 kg@9,0,0.3 m",
            &["ballast", "-5 to 5 m"],
        ),
        replay_what_if(
            "what-if time to park negative",
            "time_to_park=-1 s",
            &["time_to_park", "\"-1 s\"", "0 to 3600 s"],
        ),
        replay_what_if(
            "what-if time to park 2 h",
            "time_to_park=2 h",
            &["time_to_park", "\"2 h\"", "0 to 3600 s"],
        ),
        replay_what_if(
            "what-if tie-down 1e9 N",
            "tie_down=1e9 N",
            &["tie_down", "0 to 100000 N"],
        ),
        replay_what_if(
            "what-if tie-down in metres",
            "tie_down=5 m",
            &["tie_down", "unit of length"],
        ),
        replay_what_if(
            "what-if watch threshold 2",
            "watch_utilisation=2",
            &["watch_utilisation", "\"2\"", "0.05 to 1"],
        ),
        replay_what_if(
            "what-if park below watch",
            "park_utilisation=0.3",
            &["park_utilisation", "0.5 to 1"],
        ),
        replay_what_if(
            "what-if unknown key",
            "nosuch=1",
            &["nosuch", "no such what-if", "friction"],
        ),
        replay_what_if("what-if without =", "friction", &["KEY=VALUE"]),
        replay_what_if(
            "what-if cover maybe",
            "cover=maybe",
            &["cover", "on, off, as-logged"],
        ),
        replay_what_if(
            "what-if a long value",
            &format!("friction={}", "1".repeat(5000)),
            &["friction", "(5000 bytes)", "0 to 2"],
        ),
    ]
}

fn output_cases() -> Vec<Case> {
    let replay = |name: &str, extra: &[&str], expect: &[&str]| {
        let mut a = s(&["replay", "--rig", "rig.toml", "--profile", "p.toml"]);
        a.extend(s(extra));
        Case {
            args: a,
            ..case(name, &[], 2, expect)
        }
    };
    let both = "is the same file as";
    vec![
        replay(
            "html over the rig file",
            &["--html", "rig.toml"],
            &[
                "--html rig.toml",
                both,
                "the rig file rig.toml",
                "never replaces an input",
            ],
        ),
        replay(
            "events over the profile",
            &["--events", "p.toml"],
            &["--events p.toml", both, "the log profile p.toml"],
        ),
        replay(
            "verdicts over the log",
            &["--verdicts", "l.csv"],
            &["--verdicts l.csv", both, "the log l.csv"],
        ),
        replay(
            "verdicts over the log by another path",
            &["--verdicts", "./sub/../l.csv"],
            &["--verdicts ./sub/../l.csv", both, "l.csv"],
        )
        .file("sub/keep", "x"),
        replay(
            "verdicts over a hard link to the log",
            &["--verdicts", "hard.csv"],
            &["--verdicts hard.csv", both, "the log l.csv"],
        )
        .link("l.csv", "hard.csv"),
        replay(
            "html and verdicts in one file",
            &["--verdicts", "v.csv", "--html", "v.csv"],
            &["--html v.csv", both, "--verdicts v.csv", "two outputs"],
        ),
        replay(
            "events and verdicts in one file",
            &["--verdicts", "v.csv", "--events", "./v.csv"],
            &["--events ./v.csv", both, "--verdicts v.csv"],
        ),
        replay(
            "html over a second rig",
            &["--rig", "r2.toml", "--html", "r2.toml"],
            &["--html r2.toml", both, "the rig file r2.toml"],
        )
        .file("r2.toml", RIG),
        replay(
            "verdicts over a log given on the command line",
            &["l2.csv", "--verdicts", "l2.csv"],
            &["--verdicts l2.csv", both, "the log l2.csv"],
        )
        .file("l2.csv", LOG),
        case(
            "html over the rig file (assess)",
            &["assess", "rig.toml", "--html", "rig.toml"],
            2,
            &["--html rig.toml", both, "the rig file rig.toml"],
        ),
        case(
            "html over the profile in the rig file",
            &["replay", "--rig", "rp.toml", "--html", "rp.toml"],
            2,
            &["--html rp.toml", both, "the rig file rp.toml"],
        )
        .file("rp.toml", format!("{RIG}\n{PROFILE}")),
        case(
            "demo over your own rig file",
            &["demo", "--hours", "0.05", "--out", "."],
            2,
            &[
                "rig.toml exists and was not written by standfast",
                "--replace",
            ],
        ),
        case(
            "gen-demo over your own log",
            &["gen-demo", "--out", "."],
            2,
            &[
                "night-wind.csv exists and was not written by standfast",
                "--replace",
            ],
        )
        .file("night-wind.csv", "t,speed\n1,2\n"),
        case(
            "gen-demo over your own profile",
            &["gen-demo", "--out", "."],
            2,
            &["night-log-profile.toml exists", "--replace"],
        )
        .file("night-log-profile.toml", "[log]\n"),
        case(
            "bench over your own profile",
            &["gen-demo", "--bench", "--hours", "0.001", "--out", "."],
            2,
            &["bench-log-profile.toml exists", "--replace"],
        )
        .file("bench-log-profile.toml", "[log]\n"),
        case(
            "demo over a changed demo log",
            &["demo", "--hours", "0.05", "--out", "d"],
            2,
            &["night-mount.csv exists", "or was changed since"],
        )
        .file("d/night-mount.csv", "changed by hand\n"),
        case(
            "html in a folder that cannot be made",
            &[
                "replay",
                "--rig",
                "rig.toml",
                "--profile",
                "p.toml",
                "--html",
                "rig.toml/r.html",
            ],
            3,
            &["rig.toml"],
        ),
    ]
}

/// The bridge on the demo rig with `lines` on standard input: exit 0, and
/// the answer to line `n` is an error holding `expect`.
fn bridge(name: &str, csv: bool, lines: &[&str], n: usize, expect: &[&str]) -> Case {
    let line_tag = format!("{{\"line\":{n},\"error\":\"");
    let mut pieces = vec![line_tag.as_str()];
    pieces.extend_from_slice(expect);
    let mut args = vec!["bridge", "--rig", "rig.toml"];
    if csv {
        args.extend(["--format", "csv"]);
    }
    case(name, &args, 0, &pieces).stdin(lines.join("\n") + "\n")
}

fn bridge_cases() -> Vec<Case> {
    let long = "x".repeat(100_000);
    let huge_value = format!("{{\"t_ms\": 0, \"pier_side\": \"{long}\"}}");
    let huge_key = format!("{{\"t_ms\": 0, \"{long}\": 1}}");
    let long_cell = format!("0,{long}");
    vec![
        bridge(
            "wind negative",
            false,
            &[r#"{"t_ms": 0, "wind_mps": -1, "wind_from_deg": 270}"#],
            1,
            &["wind_mps = -1 is outside the accepted range 0 to 100 m/s"],
        ),
        bridge(
            "wind 1e300",
            false,
            &[r#"{"t_ms": 0, "wind_mps": 1e300, "wind_from_deg": 270}"#],
            1,
            &["wind_mps = 1e300", "0 to 100 m/s"],
        ),
        bridge(
            "direction 400",
            false,
            &[r#"{"t_ms": 0, "wind_mps": 3, "wind_from_deg": 400}"#],
            1,
            &["wind_from_deg = 400", "0 to 360"],
        ),
        bridge(
            "accelerometer 20 g",
            false,
            &[r#"{"t_ms": 0, "accel_g": [0, 0, 20]}"#],
            1,
            &["20", "-16 to 16"],
        ),
        bridge(
            "hour angle 500",
            false,
            &[r#"{"t_ms": 0, "ha_deg": 500, "dec_deg": 0}"#],
            1,
            &["ha_deg = 500", "-180 to 180"],
        ),
        bridge(
            "declination 100",
            false,
            &[r#"{"t_ms": 0, "ha_deg": 0, "dec_deg": 100}"#],
            1,
            &["dec_deg = 100", "-90 to 90"],
        ),
        bridge(
            "temperature 100",
            false,
            &[r#"{"t_ms": 0, "temp_c": 100, "pressure_hpa": 1000}"#],
            1,
            &["temp_c = 100", "-90 to 60"],
        ),
        bridge(
            "pressure 2000",
            false,
            &[r#"{"t_ms": 0, "temp_c": 10, "pressure_hpa": 2000}"#],
            1,
            &["pressure_hpa = 2000", "300 to 1100"],
        ),
        bridge(
            "unknown field",
            false,
            &[r#"{"t_ms": 0, "wind_mph": 3}"#],
            1,
            &["unknown field", "wind_mph"],
        ),
        bridge(
            "malformed JSON",
            false,
            &[r#"{"t_ms": "#],
            1,
            &["not a valid sample"],
        ),
        bridge(
            "time negative",
            false,
            &[r#"{"t_ms": -5}"#],
            1,
            &["not a valid sample"],
        ),
        bridge(
            "seconds negative",
            false,
            &[r#"{"t_s": -1}"#],
            1,
            &["t_s = -1", "accepted range 0"],
        ),
        bridge(
            "both times",
            false,
            &[r#"{"t_ms": 0, "t_s": 0}"#],
            1,
            &["t_ms or t_s, not both"],
        ),
        bridge(
            "no time",
            false,
            &[r#"{"wind_mps": 3, "wind_from_deg": 270}"#],
            1,
            &["needs t_ms or t_s"],
        ),
        bridge(
            "time going back",
            false,
            &[
                r#"{"t_ms": 5000, "wind_mps": 3, "wind_from_deg": 270}"#,
                r#"{"t_ms": 4000, "wind_mps": 3, "wind_from_deg": 270}"#,
            ],
            2,
            &["time went backwards", "accepted: 5000 to 3605000 ms"],
        ),
        bridge(
            "a far-future time is refused and later lines served",
            false,
            &[
                r#"{"t_ms": 0, "wind_mps": 3, "wind_from_deg": 270}"#,
                r#"{"t_ms": 99999999999999, "wind_mps": 3, "wind_from_deg": 270}"#,
                r#"{"t_ms": 1000, "wind_mps": 3, "wind_from_deg": 270}"#,
            ],
            2,
            &[
                "time jumps",
                "at most 3600 s ahead",
                "{\"line\":3,\"t_ms\":1000,\"level\"",
            ],
        ),
        bridge(
            "pier side unknown",
            false,
            &[r#"{"t_ms": 0, "pier_side": "north"}"#],
            1,
            &["north", "tube_east", "tube_west"],
        ),
        bridge(
            "a 100 000-character value",
            false,
            &[huge_value.as_str()],
            1,
            &["not a valid sample"],
        ),
        bridge(
            "a 100 000-character key",
            false,
            &[huge_key.as_str()],
            1,
            &["unknown field", "bytes)"],
        ),
        bridge(
            "CSV unknown column",
            true,
            &["t_ms,wind_mph", "0,3"],
            1,
            &[
                "header",
                "unknown column \\\"wind_mph\\\"",
                "accepted: t_ms",
            ],
        ),
        bridge(
            "CSV speed a word",
            true,
            &["t_ms,wind_mps,wind_from_deg", "0,fast,270"],
            2,
            &["wind_mps: \\\"fast\\\" is not a number"],
        ),
        bridge(
            "CSV cell count",
            true,
            &["t_ms,wind_mps,wind_from_deg", "0,3"],
            2,
            &["2 cells where the header has 3 columns"],
        ),
        bridge(
            "CSV flag unknown",
            true,
            &["t_ms,cover", "0,maybe"],
            2,
            &["cover: \\\"maybe\\\" is not true, false, 1 or 0"],
        ),
        bridge(
            "CSV a 100 000-character cell",
            true,
            &["t_ms,pier_side", long_cell.as_str()],
            2,
            &["pier_side", "(100000 bytes)"],
        ),
        case(
            "line not UTF-8",
            &["bridge", "--rig", "rig.toml"],
            0,
            &["{\"line\":1,\"error\":\"cannot read the line"],
        )
        .stdin(b"{\"t_ms\": 0, \"pier_side\": \"\xff\"}\n".to_vec()),
        case(
            "bridge rig file bad",
            &["bridge", "--rig", "rig.toml"],
            1,
            &["rig.toml:15:", "support.friction", "0 to 2"],
        )
        .file(
            "rig.toml",
            RIG.replacen("friction = 0.45", "friction = 9", 1),
        )
        .stdin("{\"t_ms\": 0}\n"),
    ]
}

#[test]
fn rig_files() {
    run_all(&rig_cases());
}

#[test]
fn log_profiles() {
    run_all(&profile_cases());
}

#[test]
fn logs() {
    run_all(&log_cases());
}

#[test]
fn options() {
    run_all(&option_cases());
}

#[test]
fn output_paths() {
    run_all(&output_cases());
}

#[test]
fn bridge_lines() {
    run_all(&bridge_cases());
}

/// The issue asked for at least 100 crafted inputs.
#[test]
fn at_least_100_cases() {
    let n = rig_cases().len()
        + profile_cases().len()
        + log_cases().len()
        + option_cases().len()
        + output_cases().len()
        + bridge_cases().len();
    println!("{n} bad-input cases");
    assert!(n >= 100, "{n} cases");
}
