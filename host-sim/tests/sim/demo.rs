//! Demo data: reproducibility and wind statistics.

use standfast_sim::demo_data::{turbulence_intensity, wind_series, TerrainCategory, WindSite};

/// Per 10-minute window: mean, standard deviation, and the highest 3-s
/// running mean (3 samples at 1 Hz), computed here independently of the
/// library (WMO-No. 8 §5.8.2: gust = maximum 3-s running mean; mean over
/// 10 min, §5.1.1).
fn windows(speeds: &[f64]) -> Vec<(f64, f64, f64)> {
    speeds
        .chunks_exact(600)
        .map(|w| {
            let n = w.len() as f64;
            let mean = w.iter().sum::<f64>() / n;
            let var = w.iter().map(|x| (x - mean).powi(2)).sum::<f64>() / (n - 1.0);
            let gust = w
                .windows(3)
                .map(|g| g.iter().sum::<f64>() / 3.0)
                .fold(f64::MIN, f64::max);
            (mean, var.sqrt(), gust)
        })
        .collect()
}

#[test]
fn print_stats() {
    let site = WindSite {
        terrain: TerrainCategory::II,
        height_m: 3.0,
    };
    let w = wind_series(&site, |_| (8.0, 270.0), 1.0, 6 * 3600, 11);
    let s: Vec<f64> = w.iter().map(|x| x.speed_mps).collect();
    let ws = windows(&s);
    let iv = turbulence_intensity(TerrainCategory::II, 3.0);
    let g: f64 = ws.iter().map(|w| w.2 / w.0).sum::<f64>() / ws.len() as f64;
    let i: f64 = ws.iter().map(|w| w.1 / w.0).sum::<f64>() / ws.len() as f64;
    let m: f64 = ws.iter().map(|w| w.0).sum::<f64>() / ws.len() as f64;
    println!("iv {iv} L {} mean {m} I {i} G {g}", site.length_scale_m());
    for w in &ws {
        println!("{:.2} {:.3} {:.3}", w.0, w.1 / w.0, w.2 / w.0);
    }
}
