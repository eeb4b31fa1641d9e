//! The text of a weighing ([`WeighReport`]) and the `[measured]` section
//! `standfast weigh --write-rig` adds to a copy of the rig file. Masses kg,
//! lengths m, in the rig frame (x east, y north, z up).

use std::io::Write;

use standfast::math::STANDARD_GRAVITY_MPS2;
use standfast::weighing;

use crate::model::weigh::WeighReport;

/// `x` to four decimals, without the sign of a value that rounds to zero.
fn fmt4(x: f32) -> String {
    let s = format!("{x:.4}");
    if s.trim_start_matches('-')
        .chars()
        .all(|c| c == '0' || c == '.')
    {
        s.trim_start_matches('-').to_owned()
    } else {
        s
    }
}

fn est(e: weighing::Estimate, unit: &str, k: f32) -> String {
    format!("{} ± {:.4} {unit}", fmt4(e.value * k), e.uncertainty * k)
}

/// Writes the report as text.
///
/// # Errors
/// I/O errors of `out`.
pub fn write_text(r: &WeighReport, out: &mut dyn Write) -> std::io::Result<()> {
    let m = &r.result;
    writeln!(
        out,
        "Centre of gravity of {} from the weighing {}",
        r.rig_file, r.weighing_file
    )?;
    writeln!(
        out,
        "  (± one standard uncertainty; each reading ± {:.3} kg)",
        r.reading_uncertainty_n / STANDARD_GRAVITY_MPS2
    )?;
    writeln!(out, "  mass      {}", est(m.mass_kg, "kg", 1.0))?;
    writeln!(out, "  x (east)  {}", est(m.x_m, "m", 1.0))?;
    writeln!(out, "  y (north) {}", est(m.y_m, "m", 1.0))?;
    if let Some(h) = m.height_from_lift_m {
        writeln!(
            out,
            "  height from the lift ({:.1}°): {}",
            m.lift_angle_rad.unwrap_or(0.0).to_degrees(),
            est(h, "m", 1.0)
        )?;
    }
    if let Some(h) = m.height_from_tip_m {
        writeln!(out, "  height from the tip test: {}", est(h, "m", 1.0))?;
    }
    match m.height_m {
        Some(h) => writeln!(out, "  height    {}", est(h, "m", 1.0))?,
        None => writeln!(
            out,
            "  height    not measured (add a [lift] or [tip] section)"
        )?,
    }
    // Values that round to zero print without a sign.
    let z = |x: f32| if x.abs() < 5e-4 { 0.0 } else { x };
    let [mx, my, mz] = r.modelled_centre_m.map(z);
    writeln!(
        out,
        "\nThe rig file's bodies imply {:.2} kg at x {mx:.3} m, y {my:.3} m, z {mz:.3} m (home pose, level, cover off)",
        r.modelled_mass_kg
    )?;
    let d = |v: Option<f32>| v.map_or_else(|| "-".to_owned(), |x| format!("{:+.3} m", z(x)));
    writeln!(
        out,
        "  weighed minus modelled: mass {:+.2} kg, x {}, y {}, z {}",
        m.mass_kg.value - r.modelled_mass_kg,
        d(r.difference_m[0]),
        d(r.difference_m[1]),
        d(r.difference_m[2])
    )?;
    let c = &m.checks;
    writeln!(
        out,
        "\nConsistency checks (tolerance: three standard uncertainties):"
    )?;
    if let Some(x) = c.lift_total_difference_n {
        writeln!(
            out,
            "  lifted total minus level total {:+.3} kg (tolerance {:.3} kg): {}",
            x / STANDARD_GRAVITY_MPS2,
            c.lift_total_tolerance_n / STANDARD_GRAVITY_MPS2,
            ok(x.abs() <= c.lift_total_tolerance_n)
        )?;
    }
    if let Some(x) = c.lift_cross_shift_m {
        writeln!(
            out,
            "  centre moved across the lift direction {:+.4} m (tolerance {:.4} m): {}",
            x,
            c.lift_cross_tolerance_m,
            ok(x.abs() <= c.lift_cross_tolerance_m)
        )?;
    }
    if let Some(x) = c.height_disagreement_m {
        writeln!(
            out,
            "  lift height minus tip height {:+.3} m (tolerance {:.3} m): {}",
            x,
            c.height_disagreement_tolerance_m,
            ok(x.abs() <= c.height_disagreement_tolerance_m)
        )?;
    }
    if c.height_below_ground {
        writeln!(out, "  the height lies below the ground: FAILED")?;
    }
    if c.small_lift_angle {
        writeln!(
            out,
            "  the lift angle is under 5°: the height's uncertainty is large; lift further if you can"
        )?;
    }
    writeln!(
        out,
        "  overall: {}",
        if c.passed {
            "the readings agree"
        } else {
            "the readings DISAGREE: weigh again (scales level and zeroed, nothing touching the rig)"
        }
    )?;
    if let Some(w) = &r.written {
        writeln!(out, "\nRig file with the [measured] section written to {w}")?;
    }
    writeln!(out, "\nCautions:")?;
    for c in &r.cautions {
        writeln!(out, "  - {c}")?;
    }
    Ok(())
}

fn ok(b: bool) -> &'static str {
    if b {
        "ok"
    } else {
        "FAILED"
    }
}

/// The `[measured]` section for a weighed centre (home pose, cover off).
///
/// # Errors
/// A result without a height (the section needs the full centre).
pub fn measured_section(r: &WeighReport) -> Option<String> {
    let m = &r.result;
    let h = m.height_m?;
    Some(format!(
        "\n[measured]                      # written by `standfast weigh` from {}\n\
         mass = \"{:.3} kg\"\n\
         mass_uncertainty = \"{:.3} kg\"\n\
         cg = [\"{} m\", \"{} m\", \"{} m\"]\n\
         cg_uncertainty = [\"{:.4} m\", \"{:.4} m\", \"{:.4} m\"]\n\
         cover_fitted = false\n",
        r.weighing_file.replace(['"', '\n'], ""),
        m.mass_kg.value,
        m.mass_kg.uncertainty,
        fmt4(m.x_m.value),
        fmt4(m.y_m.value),
        fmt4(h.value),
        m.x_m.uncertainty,
        m.y_m.uncertainty,
        h.uncertainty
    ))
}
