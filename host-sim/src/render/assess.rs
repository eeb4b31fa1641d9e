//! The text, JSON and HTML of a static assessment ([`AssessReport`]).
//!
//! The text keeps every figure; the HTML page ([`html`]) gives each finding
//! its own table or chart: the findings at a glance, tip wind by direction
//! (with the design gust and the storm direction drawn), ballast and
//! tie-downs, the best tripod orientation, the assessed condition, the axis
//! torques with their maps on a continuous colour scale, balance, the
//! payload envelope with its axes defined, and the hardware checks.

use std::io::Write;

use standfast::sky::EnvelopeRow;
use standfast::torque::Balance;

use crate::error::Error;
use crate::model::assess::{pose_words, AssessReport, ConditionReport, SHAFT_SAFETY_FACTOR};
use crate::model::charts::{AssessCharts, POLAR_STEP_DEG, TORQUE_MAP_STEP_DEG};
use crate::render::html::Page;
use crate::render::palette;
use crate::render::svg::{
    HeatMap, PolarBearing, PolarChart, PolarMarker, PolarRing, PolarTrace, Stroke,
};

/// What the payload envelope's offsets are, in words (the text and the HTML
/// say it before the table).
pub const ENVELOPE_AXES: &str = "s and p place the payload's centre of gravity from the mount's axis origin (where the two axes cross), in metres: s along the secondary (declination or altitude) axis, positive on the payload side, away from the counterweights; p along the tube, positive toward the sky end.";

fn speed(v: Option<f32>) -> String {
    v.map_or_else(
        || "no wind tips it".to_owned(),
        |s| format!("{s:.1} m/s ({:.0} km/h)", s * 3.6),
    )
}

/// Writes the report as text.
///
/// # Errors
/// I/O errors of `out`.
pub fn write_text(rep: &AssessReport, out: &mut dyn Write) -> std::io::Result<()> {
    writeln!(out, "Static assessment of {}", rep.file)?;
    let [x, y, z] = rep.centre_of_gravity_m;
    writeln!(
        out,
        "  mass {:.1} kg, centre of gravity x {x:.3} m (east), y {y:.3} m (north), z {z:.3} m (up), home pose, cover off",
        rep.mass_kg
    )?;
    if let Some(m) = &rep.measured {
        let [dx, dy, dz] = m.difference_m;
        writeln!(
            out,
            "  weighed ([measured]): the bodies alone imply {:.1} kg at z {:.3} m; weighed minus modelled x {dx:+.3} m, y {dy:+.3} m, z {dz:+.3} m{}",
            m.modelled_mass_kg,
            m.modelled_centre_m[2],
            m.centre_uncertainty_m
                .map_or_else(String::new, |u| format!(" (weighed height ± {:.3} m)", u[2]))
        )?;
    }
    writeln!(
        out,
        "  air density {:.3} kg/m³ (ISA at the site elevation)",
        rep.air_density_kg_per_m3
    )?;
    writeln!(out, "\nTip wind speed by direction, home pose, cover off:")?;
    for row in &rep.home_by_direction {
        writeln!(
            out,
            "  from {:>5.0}°  {}",
            row.from_deg,
            speed(row.tip_wind_mps)
        )?;
    }
    writeln!(
        out,
        "\nLowest tip wind, home pose: {} from {:.0}°",
        speed(rep.home_worst.tip_wind_mps),
        rep.home_worst.from_deg
    )?;
    if let Some(c) = &rep.home_worst_covered {
        writeln!(
            out,
            "Lowest tip wind, home pose, cover fitted: {} from {:.0}°",
            speed(c.tip_wind_mps),
            c.from_deg
        )?;
    }
    writeln!(
        out,
        "Lowest tip wind over the whole sky ({} poses): {} from {:.0}°",
        rep.sky.poses_checked,
        speed(rep.sky.tip.tip_wind_mps),
        rep.sky.tip.from_rad.to_degrees()
    )?;
    writeln!(
        out,
        "\nAxis torques, worst case over the sky in {:.0} m/s wind:",
        rep.sky_torque_wind_mps
    )?;
    for (name, a) in [
        ("primary", &rep.sky.primary),
        ("secondary", &rep.sky.secondary),
    ] {
        write!(
            out,
            "  {name}: {:.2} N m steady (gravity {:.2}, wind {:.2})",
            a.steady_nm, a.gravity_nm, a.wind_nm
        )?;
        match a.rated_utilisation {
            Some(u) => writeln!(out, ", {:.0} % of the rated torque", u * 100.0)?,
            None => writeln!(out, ", no drive rating given")?,
        }
    }
    write_condition(&rep.condition, out)?;
    write_needs(rep, out)?;
    if let Some(b) = &rep.balance {
        write_balance(b, out)?;
    }
    if let Some(rows) = &rep.payload_envelope {
        write_envelope(rows, out)?;
    }
    write_hardware(rep, out)?;
    writeln!(out, "\nCautions:")?;
    for c in &rep.cautions {
        writeln!(out, "  - {c}")?;
    }
    Ok(())
}

/// Ballast and tie-downs for the design gust, and the best tripod
/// orientation.
fn write_needs(rep: &AssessReport, out: &mut dyn Write) -> std::io::Result<()> {
    writeln!(
        out,
        "\nFor a {:.0} m/s design gust at utilisation {:.2}, home pose:",
        rep.design_gust_mps, rep.target_utilisation
    )?;
    match &rep.ballast_needed {
        Some(n) if n.amount > 0.0 => writeln!(
            out,
            "  ballast below the rig centre: {:.1} kg (governing wind from {:.0}°)",
            n.amount, n.worst_from_deg
        )?,
        Some(_) => writeln!(out, "  ballast: none needed")?,
        None => writeln!(out, "  ballast: cannot be computed for this rig")?,
    }
    match &rep.tie_down_needed {
        Some(n) if n.amount > 0.0 => writeln!(
            out,
            "  or a tie-down on every foot holding {:.0} N (governing wind from {:.0}°)",
            n.amount, n.worst_from_deg
        )?,
        Some(_) => writeln!(out, "  tie-downs: none needed")?,
        None => writeln!(out, "  tie-downs: cannot be computed for this rig")?,
    }
    if let Some(t) = &rep.orientation {
        writeln!(
            out,
            "\nTripod orientation for a storm from {:.0}°: first leg at {:.0}° gives {}; at {:.0}° (as given) {}{}",
            t.storm_from_deg,
            t.best_first_leg_deg,
            speed(t.best_tip_wind_mps),
            t.current_first_leg_deg,
            speed(t.current_tip_wind_mps),
            t.gain_mps.map_or(String::new(), |g| format!("; gain {g:.1} m/s"))
        )?;
    }
    Ok(())
}

/// The counterweight shaft's check and the attachment hardware, weakest
/// first.
fn write_hardware(rep: &AssessReport, out: &mut dyn Write) -> std::io::Result<()> {
    if let Some(c) = &rep.shaft_check {
        writeln!(
            out,
            "\nCounterweight shaft at its root, shaft horizontal: {:.1} N m on {} ({:.2} mm root diameter), {}",
            c.moment_nm,
            c.thread.as_deref().unwrap_or("the plain shaft"),
            c.root_diameter_mm,
            c.material
        )?;
        writeln!(
            out,
            "  bending stress {:.0} MPa against {:.0} MPa allowed (yield / {:.1}): {:.0} %{}; the root carries {:.1} N m at most",
            c.stress_mpa,
            c.allowable_mpa,
            SHAFT_SAFETY_FACTOR,
            c.utilisation * 100.0,
            if c.utilisation > 1.0 { ", OVER the allowable stress" } else { "" },
            c.allowable_moment_nm
        )?;
    }
    if !rep.hardware.is_empty() {
        writeln!(
            out,
            "\nAttachment hardware, weakest first (allowable = yield / {SHAFT_SAFETY_FACTOR:.1}):"
        )?;
        for h in &rep.hardware {
            writeln!(
                out,
                "  {:>4.0} %{}  {}: {}",
                h.utilisation * 100.0,
                if h.utilisation > 1.0 {
                    " OVER"
                } else {
                    "     "
                },
                h.part,
                h.check
            )?;
            writeln!(
                out,
                "           {:.0} {} against {:.0} {} allowed ({} governs); worst case: {}",
                h.load, h.unit, h.allowable, h.unit, h.governs, h.case
            )?;
        }
    }
    Ok(())
}

fn pct(u: f32) -> String {
    if u >= standfast::stability::UTILISATION_CAP {
        "nothing holds it".to_owned()
    } else {
        format!("{:.0} %", u * 100.0)
    }
}

fn write_condition(c: &ConditionReport, out: &mut dyn Write) -> std::io::Result<()> {
    let ground = if c.tilt_deg > 0.0 {
        format!(
            "ground tilt {:.1}° (downhill toward {:.0}°)",
            c.tilt_deg, c.downhill_deg
        )
    } else {
        "level ground".to_owned()
    };
    writeln!(
        out,
        "\nAt {}, {ground}, cover {}, design gust {:.1} m/s ({:.0} km/h):",
        c.pose,
        if c.cover_fitted { "fitted" } else { "off" },
        c.design_gust_mps,
        c.design_gust_mps * 3.6
    )?;
    let tips = c.overturning_utilisation >= 1.0;
    let slides = c.sliding_utilisation >= 1.0;
    writeln!(
        out,
        "  wind from {:.0}°{}: overturning {}{}, sliding {}{}",
        c.wind_from_deg,
        if c.worst_direction {
            " (the worst direction)"
        } else {
            ""
        },
        pct(c.overturning_utilisation),
        if tips { ", TIPS" } else { "" },
        pct(c.sliding_utilisation),
        if slides { ", SLIDES" } else { "" }
    )?;
    writeln!(
        out,
        "  from there it tips at {} and slides at {}; it would fall toward {:.0}°",
        speed(c.tip_wind_mps),
        speed(c.slide_wind_mps),
        c.critical_edge_outward_deg
    )?;
    writeln!(
        out,
        "  highest sliding over directions: {} from {:.0}°; lowest tip wind: {} from {:.0}°",
        pct(c.worst_sliding.0),
        c.worst_sliding.1,
        speed(c.lowest_tip_wind.tip_wind_mps),
        c.lowest_tip_wind.from_deg
    )?;
    writeln!(
        out,
        "  extra ground tilt that tips it with no wind: {:.1}° (downhill toward {:.0}°)",
        c.tilt_margin_deg.0, c.tilt_margin_deg.1
    )?;
    writeln!(out, "  from   overturning  sliding   tip wind")?;
    for r in &c.by_direction {
        writeln!(
            out,
            "  {:>4.0}°  {:>11}  {:>7}   {}",
            r.from_deg,
            pct(r.overturning_utilisation),
            pct(r.sliding_utilisation),
            speed(r.tip_wind_mps)
        )?;
    }
    Ok(())
}

fn unbalance(nm: f32) -> String {
    if nm.abs() < 0.005 {
        "balanced".to_owned()
    } else if nm > 0.0 {
        format!("{nm:.2} N m, payload side heavy")
    } else {
        format!("{:.2} N m, counterweight side heavy", -nm)
    }
}

fn write_balance(b: &Balance, out: &mut dyn Write) -> std::io::Result<()> {
    writeln!(
        out,
        "\nBalance (payload {:.1} kg, counterweights as given):",
        b.payload_mass_kg
    )?;
    writeln!(out, "  primary axis: {}", unbalance(b.primary_unbalance_nm))?;
    match (b.counterweight_shift_m, b.counterweight_centre_m) {
        (Some(d), Some(c)) => {
            let dir = if d >= 0.0 { "outward" } else { "inward" };
            writeln!(
                out,
                "  move the counterweights together {:.0} mm {dir}: their common centre at {:.0} mm from the axis balances it{}",
                d.abs() * 1000.0,
                c * 1000.0,
                match b.fits_on_shaft {
                    Some(true) => "",
                    Some(false) => " (beyond the shaft: add mass or a longer shaft)",
                    None => "",
                }
            )?;
        }
        _ => writeln!(out, "  no counterweights")?,
    }
    if let Some(r) = b.residual_at_shaft_end_nm {
        writeln!(
            out,
            "  with the outermost counterweight at the shaft end: {}",
            unbalance(r)
        )?;
    }
    writeln!(
        out,
        "  secondary axis: {:.2} N m at most; slide the payload {:.0} mm toward the {} end, leaving {:.2} N m (offset across the tube)",
        b.secondary_unbalance_nm,
        b.payload_slide_m.abs() * 1000.0,
        if b.payload_slide_m >= 0.0 { "sky" } else { "rear" },
        b.secondary_residual_nm
    )
}

fn mass_range(m: Option<&standfast::sky::MassRange>) -> String {
    match m {
        None => "none fits".to_owned(),
        Some(r) => format!(
            "{:.1} to {:.1} kg{}",
            r.lightest_kg,
            r.heaviest_kg,
            if r.capped { " (no drive limit)" } else { "" }
        ),
    }
}

fn write_envelope(rows: &[EnvelopeRow], out: &mut dyn Write) -> std::io::Result<()> {
    writeln!(
        out,
        "\nPayload envelope (drives within their ratings over the sky, calm, level, cover off):"
    )?;
    writeln!(out, "  {ENVELOPE_AXES}")?;
    writeln!(
        out,
        "  offset s (m)      p (m)   with counterweights          without counterweights"
    )?;
    for r in rows {
        writeln!(
            out,
            "  {:>12.2} {:>10.2}   {:<28} {}",
            r.offset.along_secondary_axis_m,
            r.offset.along_tube_m,
            mass_range(r.with_counterweights.as_ref()),
            mass_range(r.without_counterweights.as_ref())
        )?;
    }
    writeln!(
        out,
        "  wind is not included: keep a margin below the heaviest payload"
    )
}

fn pct_f(u: f32) -> String {
    format!("{:.0} %", u * 100.0)
}

fn deg(d: f32) -> String {
    format!("{d:.0}°")
}

/// A wind speed for a table cell.
fn speed_cell(v: Option<f32>) -> String {
    v.map_or_else(|| "no wind tips it".to_owned(), |s| format!("{s:.1} m/s"))
}

/// The assessment as a self-contained HTML page: a table or chart for each
/// finding (the text output, [`write_text`], keeps every figure), with the
/// cautions first and last. `charts` are its chart data
/// ([`crate::model::charts::assess_charts`]).
///
/// # Errors
/// None in practice (kept for the page writers' common signature).
pub fn html(rep: &AssessReport, charts: &AssessCharts) -> Result<String, Error> {
    let mut page = Page::new(&format!("Standfast assessment of {}", rep.file));
    page.cautions(&rep.cautions);
    glance(&mut page, rep);
    rig_table(&mut page, rep);
    tip_wind_section(&mut page, rep, charts);
    needs_section(&mut page, rep);
    condition_section(&mut page, rep);
    torque_section(&mut page, rep, charts);
    if let Some(b) = &rep.balance {
        balance_section(&mut page, b);
    }
    if let Some(rows) = &rep.payload_envelope {
        envelope_section(&mut page, rows);
    }
    hardware_section(&mut page, rep);
    page.cautions(&rep.cautions);
    Ok(page.finish())
}

/// The findings at a glance.
fn glance(page: &mut Page, rep: &AssessReport) {
    page.h2("Findings at a glance");
    let mut rows = vec![vec![
        "lowest tip wind, home pose, cover off".to_owned(),
        speed_cell(rep.home_worst.tip_wind_mps),
        format!("wind from {}", deg(rep.home_worst.from_deg)),
    ]];
    if let Some(c) = &rep.home_worst_covered {
        rows.push(vec![
            "lowest tip wind, home pose, cover fitted".to_owned(),
            speed_cell(c.tip_wind_mps),
            format!("wind from {}", deg(c.from_deg)),
        ]);
    }
    rows.push(vec![
        "lowest tip wind over the sky".to_owned(),
        speed_cell(rep.sky.tip.tip_wind_mps),
        format!(
            "wind from {}, {} ({} poses checked)",
            deg(rep.sky.tip.from_rad.to_degrees()),
            pose_words(&rep.sky.tip.pose),
            rep.sky.poses_checked
        ),
    ]);
    let gust = format!("for a {:.0} m/s design gust", rep.design_gust_mps);
    rows.push(vec![
        "ballast needed".to_owned(),
        match &rep.ballast_needed {
            Some(n) if n.amount > 0.0 => format!("{:.1} kg", n.amount),
            Some(_) => "none".to_owned(),
            None => "cannot be computed".to_owned(),
        },
        gust.clone(),
    ]);
    rows.push(vec![
        "or a tie-down on every foot".to_owned(),
        match &rep.tie_down_needed {
            Some(n) if n.amount > 0.0 => format!("{:.0} N", n.amount),
            Some(_) => "none".to_owned(),
            None => "cannot be computed".to_owned(),
        },
        gust,
    ]);
    if let Some(t) = &rep.orientation {
        rows.push(vec![
            "best tripod orientation".to_owned(),
            format!("first leg at {}", deg(t.best_first_leg_deg)),
            format!(
                "storm from {}: {}{}",
                deg(t.storm_from_deg),
                speed_cell(t.best_tip_wind_mps),
                t.gain_mps.map_or(String::new(), |g| format!(
                    ", {g:.1} m/s more than as given"
                ))
            ),
        ]);
    }
    if let Some(c) = &rep.shaft_check {
        rows.push(vec![
            "counterweight shaft".to_owned(),
            pct_f(c.utilisation),
            "of its allowable bending stress".to_owned(),
        ]);
    }
    if let Some(h) = rep.hardware.first() {
        rows.push(vec![
            "weakest attachment".to_owned(),
            pct_f(h.utilisation),
            format!("{}: {}", h.part, h.check),
        ]);
    }
    page.table(&["finding", "figure", "where or when"], &rows);
}

/// Mass, centre of gravity and air.
fn rig_table(page: &mut Page, rep: &AssessReport) {
    page.h2("The rig");
    let [x, y, z] = rep.centre_of_gravity_m;
    let mut rows = vec![
        vec!["mass".to_owned(), format!("{:.1} kg", rep.mass_kg)],
        vec![
            "centre of gravity (home pose, cover off)".to_owned(),
            format!("x {x:.3} m east, y {y:.3} m north, z {z:.3} m up"),
        ],
        vec![
            "air density (ISA at the site elevation)".to_owned(),
            format!("{:.3} kg/m³", rep.air_density_kg_per_m3),
        ],
    ];
    if let Some(m) = &rep.measured {
        let [dx, dy, dz] = m.difference_m;
        rows.push(vec![
            "weighed minus modelled centre ([measured])".to_owned(),
            format!(
                "x {dx:+.3} m, y {dy:+.3} m, z {dz:+.3} m (the bodies alone imply {:.1} kg)",
                m.modelled_mass_kg
            ),
        ]);
    }
    page.table(&["quantity", "value"], &rows);
}

/// The polar chart with the design gust and the storm direction.
fn tip_wind_section(page: &mut Page, rep: &AssessReport, charts: &AssessCharts) {
    page.h2("Tip wind speed by direction");
    let k = &rep.condition;
    let trace =
        |name: &str, colour: &str, points: &crate::model::charts::PolarPoints, stroke| PolarTrace {
            name: name.to_owned(),
            colour: colour.to_owned(),
            points: points.clone(),
            stroke,
        };
    let chart = PolarChart {
        title: "Tip wind speed by direction".to_owned(),
        r_label: "tip wind (m/s)".to_owned(),
        traces: vec![
            trace("home pose", palette::BLUE, &charts.home, Stroke::Solid),
            trace(
                "worst pose of the sky",
                palette::PINK,
                &charts.worst,
                Stroke::Dashed,
            ),
            trace(
                "assessed condition",
                palette::AMBER,
                &charts.condition,
                Stroke::DashDot,
            ),
        ],
        marker: rep.sky.tip.tip_wind_mps.map(|v| PolarMarker {
            deg: f64::from(rep.sky.tip.from_rad.to_degrees()),
            value: f64::from(v),
            label: format!("lowest {v:.1} m/s"),
        }),
        rings: vec![PolarRing {
            value: f64::from(rep.design_gust_mps),
            label: format!("design gust {:.0} m/s", rep.design_gust_mps),
        }],
        bearings: rep
            .orientation
            .iter()
            .map(|o| PolarBearing {
                deg: f64::from(o.storm_from_deg),
                label: format!("storm from {}", deg(o.storm_from_deg)),
            })
            .collect(),
        size: 440.0,
    };
    page.figure(
        &chart.to_svg(),
        &format!(
            "Lowest wind speed that tips the rig, for a wind from each direction (every {POLAR_STEP_DEG}°; 0° north, clockwise; the direction the wind blows from), level ground, cover off: in the home pose ({}) and in the worst pose of the sky scan ({}); and in the assessed condition ({}, {}, cover {}). The dashed circle is the design gust: where a trace lies inside it, that gust tips the rig from there. The arrow is the storm direction the orientation below is for. The dot is the lowest tip wind over the sky. Open circles on the outer ring: no wind tips it from that direction.",
            pose_words(&charts.home_pose),
            pose_words(&rep.sky.tip.pose),
            k.pose,
            if k.tilt_deg > 0.0 {
                format!("ground tilt {:.1}° downhill toward {:.0}°", k.tilt_deg, k.downhill_deg)
            } else {
                "level ground".to_owned()
            },
            if k.cover_fitted { "fitted" } else { "off" }
        ),
    );
}

/// Ballast, tie-downs and the tripod orientation.
fn needs_section(page: &mut Page, rep: &AssessReport) {
    page.h2("Ballast and tie-downs for the design gust");
    let need = |n: Option<&crate::model::assess::Need>, unit: &str, digits: usize| match n {
        Some(n) if n.amount > 0.0 => vec![
            format!("{:.digits$} {unit}", n.amount),
            deg(n.worst_from_deg),
        ],
        Some(_) => vec!["none needed".to_owned(), "-".to_owned()],
        None => vec!["cannot be computed for this rig".to_owned(), "-".to_owned()],
    };
    let mut b = vec!["ballast below the rig centre".to_owned()];
    b.extend(need(rep.ballast_needed.as_ref(), "kg", 1));
    let mut t = vec!["or a tie-down on every foot".to_owned()];
    t.extend(need(rep.tie_down_needed.as_ref(), "N", 0));
    page.table(&["measure", "amount", "governing wind from"], &[b, t]);
    page.note(&format!(
        "For a {:.0} m/s design gust ({:.0} km/h) at utilisation {:.2} (the target), home pose: either measure alone brings the worst direction to the target.",
        rep.design_gust_mps,
        rep.design_gust_mps * 3.6,
        rep.target_utilisation
    ));
    if let Some(o) = &rep.orientation {
        page.h2("Tripod orientation");
        page.table(
            &["first leg at", "tip wind from the storm direction", "note"],
            &[
                vec![
                    deg(o.current_first_leg_deg),
                    speed_cell(o.current_tip_wind_mps),
                    "as the rig file gives it".to_owned(),
                ],
                vec![
                    deg(o.best_first_leg_deg),
                    speed_cell(o.best_tip_wind_mps),
                    o.gain_mps
                        .map_or_else(|| "best".to_owned(), |g| format!("best: {g:.1} m/s more")),
                ],
            ],
        );
        page.note(&format!(
            "For a storm from {} (the direction the wind blows from, clockwise from north); the leg's azimuth is clockwise from north too.",
            deg(o.storm_from_deg)
        ));
    }
}

fn pct_or_nothing(u: f32) -> String {
    pct(u)
}

/// The assessed condition: its figures and its table by direction.
fn condition_section(page: &mut Page, rep: &AssessReport) {
    let c = &rep.condition;
    page.h2("The assessed condition");
    let ground = if c.tilt_deg > 0.0 {
        format!(
            "ground tilt {:.1}° (downhill toward {})",
            c.tilt_deg,
            deg(c.downhill_deg)
        )
    } else {
        "level ground".to_owned()
    };
    page.p(&format!(
        "{}, {ground}, cover {}, design gust {:.1} m/s ({:.0} km/h), wind from {}{}.",
        c.pose,
        if c.cover_fitted { "fitted" } else { "off" },
        c.design_gust_mps,
        c.design_gust_mps * 3.6,
        deg(c.wind_from_deg),
        if c.worst_direction {
            " (the worst direction)"
        } else {
            ""
        }
    ));
    page.table(
        &["figure", "value"],
        &[
            vec![
                "overturning utilisation".to_owned(),
                format!(
                    "{}{}",
                    pct_or_nothing(c.overturning_utilisation),
                    if c.overturning_utilisation >= 1.0 {
                        ": TIPS"
                    } else {
                        ""
                    }
                ),
            ],
            vec![
                "sliding utilisation".to_owned(),
                format!(
                    "{}{}",
                    pct_or_nothing(c.sliding_utilisation),
                    if c.sliding_utilisation >= 1.0 {
                        ": SLIDES"
                    } else {
                        ""
                    }
                ),
            ],
            vec!["tip wind from there".to_owned(), speed_cell(c.tip_wind_mps)],
            vec![
                "slide wind from there".to_owned(),
                speed_cell(c.slide_wind_mps),
            ],
            vec![
                "it would fall toward".to_owned(),
                deg(c.critical_edge_outward_deg),
            ],
            vec![
                "highest sliding over directions".to_owned(),
                format!(
                    "{} from {}",
                    pct_or_nothing(c.worst_sliding.0),
                    deg(c.worst_sliding.1)
                ),
            ],
            vec![
                "lowest tip wind over directions".to_owned(),
                format!(
                    "{} from {}",
                    speed_cell(c.lowest_tip_wind.tip_wind_mps),
                    deg(c.lowest_tip_wind.from_deg)
                ),
            ],
            vec![
                "extra ground tilt that tips it with no wind".to_owned(),
                format!(
                    "{:.1}° (downhill toward {})",
                    c.tilt_margin_deg.0,
                    deg(c.tilt_margin_deg.1)
                ),
            ],
        ],
    );
    let rows: Vec<Vec<String>> = c
        .by_direction
        .iter()
        .map(|r| {
            vec![
                deg(r.from_deg),
                pct_or_nothing(r.overturning_utilisation),
                pct_or_nothing(r.sliding_utilisation),
                speed_cell(r.tip_wind_mps),
            ]
        })
        .collect();
    page.h3("By wind direction, at the design gust");
    page.table(&["wind from", "overturning", "sliding", "tip wind"], &rows);
}

/// The worst axis torques and the torque maps.
fn torque_section(page: &mut Page, rep: &AssessReport, charts: &AssessCharts) {
    page.h2("Axis torques");
    let rows: Vec<Vec<String>> = [
        ("primary", &rep.sky.primary),
        ("secondary", &rep.sky.secondary),
    ]
    .iter()
    .map(|(name, a)| {
        vec![
            (*name).to_owned(),
            format!("{:.2} N m", a.steady_nm),
            format!("{:.2} N m", a.gravity_nm),
            format!("{:.2} N m", a.wind_nm),
            a.rated_utilisation
                .map_or_else(|| "no rating given".to_owned(), pct_f),
        ]
    })
    .collect();
    page.table(
        &[
            "axis",
            "steady torque",
            "gravity",
            "wind",
            "of the rated torque",
        ],
        &rows,
    );
    page.note(&format!(
        "The worst case over the sky in a {:.0} m/s wind.",
        rep.sky_torque_wind_mps
    ));
    let (maps, rated) = (charts.torque.clone(), charts.rated);
    let step = TORQUE_MAP_STEP_DEG;
    let x_labels: Vec<String> = (-180 / step..=180 / step)
        .map(|k| format!("{:+}", k * step / 15))
        .collect();
    let y_labels: Vec<String> = (0..=180 / step)
        .map(|k| format!("{:+}°", 90 - k * step))
        .collect();
    for (axis, m) in ["primary", "secondary"].iter().zip(maps) {
        if m.iter().flatten().all(Option::is_none) {
            page.note(&format!(
                "No {axis}-axis map: the mount does not take hour angle and declination poses."
            ));
            continue;
        }
        let hm = HeatMap {
            title: format!(
                "{axis} axis: |gravity torque| ÷ {}",
                if rated {
                    "rated torque"
                } else {
                    "largest on the map"
                }
            ),
            id: format!("torque-scale-{axis}"),
            x_label: "hour angle (h)".to_owned(),
            y_label: "declination".to_owned(),
            x_labels: x_labels.clone(),
            y_labels: y_labels.clone(),
            values: m,
            value_label: if rated {
                "of rated torque".to_owned()
            } else {
                "of the largest".to_owned()
            },
        };
        page.figure(
            &hm.to_svg(),
            &format!(
                "Gravity torque on the {axis} axis every {step}° of hour angle and declination, calm, level, cover off, on the usual pier side (tube east at hour angles ≥ 0, tube west below), {}. Each cell gives its value; the colour follows the continuous scale at the right.",
                if rated {
                    "in % of the drive's rated torque (over 100 %: beyond the rating)"
                } else {
                    "in % of the largest on the map (the rig file gives no drive ratings)"
                }
            ),
        );
    }
}

/// The balance of both axes.
fn balance_section(page: &mut Page, b: &Balance) {
    page.h2("Balance");
    let mut rows = vec![vec![
        "primary axis".to_owned(),
        unbalance(b.primary_unbalance_nm),
        match (b.counterweight_shift_m, b.counterweight_centre_m) {
            (Some(d), Some(c)) => format!(
                "move the counterweights together {:.0} mm {}: their common centre at {:.0} mm from the axis{}",
                d.abs() * 1000.0,
                if d >= 0.0 { "outward" } else { "inward" },
                c * 1000.0,
                if b.fits_on_shaft == Some(false) { " (beyond the shaft: add mass or a longer shaft)" } else { "" }
            ),
            _ => "no counterweights".to_owned(),
        },
    ]];
    if let Some(r) = b.residual_at_shaft_end_nm {
        rows.push(vec![
            "primary, outermost counterweight at the shaft end".to_owned(),
            unbalance(r),
            "-".to_owned(),
        ]);
    }
    rows.push(vec![
        "secondary axis".to_owned(),
        format!("{:.2} N m at most", b.secondary_unbalance_nm),
        format!(
            "slide the payload {:.0} mm toward the {} end, leaving {:.2} N m (offset across the tube)",
            b.payload_slide_m.abs() * 1000.0,
            if b.payload_slide_m >= 0.0 { "sky" } else { "rear" },
            b.secondary_residual_nm
        ),
    ]);
    page.table(&["axis", "unbalance", "to balance it"], &rows);
    page.note(&format!(
        "Payload {:.1} kg, counterweights as the rig file places them.",
        b.payload_mass_kg
    ));
}

/// The payload envelope with its axes defined.
fn envelope_section(page: &mut Page, rows: &[EnvelopeRow]) {
    page.h2("Payload envelope");
    page.p(ENVELOPE_AXES);
    let rows: Vec<Vec<String>> = rows
        .iter()
        .map(|r| {
            vec![
                format!("{:.2}", r.offset.along_secondary_axis_m),
                format!("{:.2}", r.offset.along_tube_m),
                mass_range(r.with_counterweights.as_ref()),
                mass_range(r.without_counterweights.as_ref()),
            ]
        })
        .collect();
    page.table(
        &[
            "offset s (m)",
            "offset p (m)",
            "payload with counterweights",
            "without counterweights",
        ],
        &rows,
    );
    page.note("The payloads that keep both drives within their ratings over the sky, calm, level, cover off. Wind is not included: keep a margin below the heaviest payload.");
}

/// The shaft and attachment checks, weakest first.
fn hardware_section(page: &mut Page, rep: &AssessReport) {
    if rep.shaft_check.is_none() && rep.hardware.is_empty() {
        return;
    }
    page.h2("Hardware checks");
    let mut rows = Vec::new();
    if let Some(c) = &rep.shaft_check {
        rows.push(vec![
            pct_f(c.utilisation),
            if c.utilisation > 1.0 {
                "OVER".to_owned()
            } else {
                "within".to_owned()
            },
            "counterweight shaft".to_owned(),
            format!(
                "bending at the root, shaft horizontal: {} ({:.2} mm root diameter), {}",
                c.thread.as_deref().unwrap_or("the plain shaft"),
                c.root_diameter_mm,
                c.material
            ),
            format!("{:.0} MPa", c.stress_mpa),
            format!("{:.0} MPa", c.allowable_mpa),
            format!(
                "moment at the root {:.1} N m; it carries {:.1} N m at most",
                c.moment_nm, c.allowable_moment_nm
            ),
        ]);
    }
    for h in &rep.hardware {
        rows.push(vec![
            pct_f(h.utilisation),
            if h.utilisation > 1.0 {
                "OVER".to_owned()
            } else {
                "within".to_owned()
            },
            h.part.clone(),
            h.check.clone(),
            format!("{:.0} {}", h.load, h.unit),
            format!("{:.0} {}", h.allowable, h.unit),
            format!("{} governs; worst case: {}", h.governs, h.case),
        ]);
    }
    page.table(
        &[
            "utilisation",
            "",
            "part",
            "check",
            "load",
            "allowed",
            "notes",
        ],
        &rows,
    );
    page.note(&format!(
        "Allowed: yield ÷ {SHAFT_SAFETY_FACTOR:.1}. Attachments weakest first."
    ));
}

/// Writes the report as pretty JSON.
///
/// # Errors
/// I/O or serialisation errors.
pub fn write_json(rep: &AssessReport, out: &mut dyn Write) -> std::io::Result<()> {
    serde_json::to_writer_pretty(&mut *out, rep).map_err(std::io::Error::other)?;
    writeln!(out)
}
