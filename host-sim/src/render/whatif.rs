//! The what-if comparison as text: the side-by-side table of a replay's
//! rigs ([`Comparison`]), which the summary puts before its cautions.

use crate::model::whatif::Comparison;

fn pct(v: Option<f32>) -> String {
    v.map_or_else(|| "-".to_owned(), |x| format!("{:.1} %", x * 100.0))
}

fn at_s(v: Option<f64>) -> String {
    v.map_or_else(|| "-".to_owned(), |x| format!("+{x:.0} s"))
}

/// The side-by-side table as text (it starts with an empty line).
#[must_use]
pub fn comparison_text(cmp: &Comparison) -> String {
    let mut s = String::from("\nSide by side (the same logs through each rig):\n");
    for r in &cmp.rigs {
        s.push_str(&format!("  {} = {}\n", r.column, r.rig));
    }
    let rows = comparison_rows(cmp);
    let label_w = rows.iter().map(|r| r.0.len()).max().unwrap_or(0) + 2;
    let col_w = rows
        .iter()
        .flat_map(|r| r.1.iter().map(|c| c.chars().count()))
        .max()
        .unwrap_or(1)
        .max(6)
        + 2;
    s.push_str(&format!("  {:label_w$}", ""));
    for r in &cmp.rigs {
        s.push_str(&format!("{:>col_w$}", r.column));
    }
    s.push('\n');
    for (label, cells) in rows {
        s.push_str(&format!("  {label:label_w$}"));
        for c in cells {
            s.push_str(&format!("{c:>col_w$}"));
        }
        s.push('\n');
    }
    s
}

/// The comparison's rows: a label and one cell per rig.
fn comparison_rows(cmp: &Comparison) -> Vec<(&'static str, Vec<String>)> {
    vec![
        (
            "highest overturning",
            cmp.rigs
                .iter()
                .map(|r| pct(r.overturning_utilisation))
                .collect(),
        ),
        (
            "  at",
            cmp.rigs.iter().map(|r| at_s(r.overturning_t_s)).collect(),
        ),
        (
            "  tip wind there",
            cmp.rigs
                .iter()
                .map(|r| {
                    r.tip_wind_mps
                        .map_or_else(|| "-".to_owned(), |v| format!("{v:.1} m/s"))
                })
                .collect(),
        ),
        (
            "highest sliding",
            cmp.rigs
                .iter()
                .map(|r| pct(r.sliding_utilisation))
                .collect(),
        ),
        (
            "highest drive axis 1",
            cmp.rigs
                .iter()
                .map(|r| pct(r.drive_utilisation[0]))
                .collect(),
        ),
        (
            "highest drive axis 2",
            cmp.rigs
                .iter()
                .map(|r| pct(r.drive_utilisation[1]))
                .collect(),
        ),
        (
            "highest stage",
            cmp.rigs
                .iter()
                .map(|r| r.highest_stage.name().to_owned())
                .collect(),
        ),
        (
            "first park request",
            cmp.rigs.iter().map(|r| at_s(r.first_park_t_s)).collect(),
        ),
        (
            "first alarm",
            cmp.rigs.iter().map(|r| at_s(r.first_alarm_t_s)).collect(),
        ),
        (
            "time in watch",
            cmp.rigs
                .iter()
                .map(|r| format!("{:.0} s", r.watch_s))
                .collect(),
        ),
        (
            "time in park_now",
            cmp.rigs
                .iter()
                .map(|r| format!("{:.0} s", r.park_now_s))
                .collect(),
        ),
        (
            "time in alarm",
            cmp.rigs
                .iter()
                .map(|r| format!("{:.0} s", r.alarm_s))
                .collect(),
        ),
        (
            "time in sensor_fault",
            cmp.rigs
                .iter()
                .map(|r| format!("{:.0} s", r.sensor_fault_s))
                .collect(),
        ),
        (
            "stage changes",
            cmp.rigs
                .iter()
                .map(|r| r.stage_changes.to_string())
                .collect(),
        ),
    ]
}
