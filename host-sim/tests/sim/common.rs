//! Helpers shared by the test modules.

use std::path::{Path, PathBuf};

/// Writes `<stem>.toml` beside `<stem>.csv` in `dir`: a log profile for one
/// CSV file with columns `t` (epoch seconds), `ax`, `ay`, `az` (g), `speed`
/// (m/s) and `dir` (degrees), the layout of the invented test logs. Returns
/// the profile's path.
pub fn one_file_profile(dir: &Path, stem: &str) -> PathBuf {
    let profile = dir.join(format!("{stem}.toml"));
    let text = format!(
        r#"[log]
[[log.file]]
path = "{stem}.csv"
time = {{ column = "t", format = "epoch_s" }}
[log.file.columns]
accel_x = {{ column = "ax", unit = "g" }}
accel_y = {{ column = "ay", unit = "g" }}
accel_z = {{ column = "az", unit = "g" }}
wind_speed = {{ column = "speed", unit = "m/s" }}
wind_direction = {{ column = "dir", unit = "deg" }}
"#
    );
    std::fs::write(&profile, text).unwrap();
    profile
}
