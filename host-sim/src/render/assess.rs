//! The text and JSON of a static assessment ([`AssessReport`]).

use std::io::Write;

use standfast::sky::EnvelopeRow;
use standfast::torque::Balance;

use crate::model::assess::{AssessReport, ConditionReport, SHAFT_SAFETY_FACTOR};

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
        rep.air_density_kg_m3
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

/// Writes the report as pretty JSON.
///
/// # Errors
/// I/O or serialisation errors.
pub fn write_json(rep: &AssessReport, out: &mut dyn Write) -> std::io::Result<()> {
    serde_json::to_writer_pretty(&mut *out, rep).map_err(std::io::Error::other)?;
    writeln!(out)
}
