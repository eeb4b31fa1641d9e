//! `standfast weigh`: its arguments, reading the rig and weighing files,
//! the optional rig file copy with a `[measured]` section (written
//! atomically, never over an input), and the report on standard output.

use std::io::Write;
use std::path::{Path, PathBuf};

use crate::error::Error;
use crate::input::located::{InputError, SourceText};
use crate::model::weigh::measure;
use crate::render::weigh::{measured_section, write_text};

/// Writes `text` to `path` atomically (see [`crate::commands::output::AtomicFile`]).
fn write_atomic(path: &Path, text: &str) -> Result<(), Error> {
    crate::commands::output::write_atomic(path, text.as_bytes()).map(|_| ())
}

fn same_file(a: &Path, b: &Path) -> bool {
    match (a.canonicalize(), b.canonicalize()) {
        (Ok(x), Ok(y)) => x == y,
        _ => false,
    }
}

/// Arguments of `weigh`.
#[derive(Debug, clap::Args)]
pub struct WeighArgs {
    /// The rig file (its feet, in order, are where the scales stood).
    #[arg(value_name = "RIG.toml")]
    pub rig: PathBuf,
    /// The weighing file (see the README's weighing section).
    #[arg(value_name = "WEIGHING.toml")]
    pub weighing: PathBuf,
    /// Print the report as JSON instead of text.
    #[arg(long)]
    pub json: bool,
    /// Write a copy of the rig file with a `[measured]` section to this file
    /// (never over the rig file itself; refused when a check fails or no
    /// height was measured).
    #[arg(long, value_name = "OUT.toml")]
    pub write_rig: Option<PathBuf>,
}

/// Runs `standfast weigh`.
///
/// # Errors
/// Unreadable or invalid files; a failed check or a missing height when
/// asked to write; output that cannot be written.
pub fn run(a: &WeighArgs, out: &mut dyn Write) -> Result<(), Error> {
    // An output over an input (same path, a symbolic or hard link) is
    // refused before anything is read (exit 2).
    if let Some(path) = &a.write_rig {
        crate::commands::output::check_paths(
            &[
                crate::commands::output::Role::new("the rig file", &a.rig),
                crate::commands::output::Role::new("the weighing file", &a.weighing),
            ],
            &[crate::commands::output::Role::new("--write-rig", path)],
        )?;
    }
    let rig_src = SourceText::read(&a.rig)?;
    let rig = crate::input::rigfile::load_source(&rig_src)?;
    let src = SourceText::read(&a.weighing)?;
    let mut rep = measure(&rig, &src)?;
    if let Some(path) = &a.write_rig {
        let refuse = |problem: String| {
            Error::Input(InputError {
                at: None,
                key: Some("--write-rig".into()),
                value: Some(path.display().to_string()),
                problem,
            })
        };
        if same_file(path, &a.rig) || same_file(path, &a.weighing) {
            return Err(refuse(
                "the output would replace an input file; name another file".into(),
            ));
        }
        if rig.measured.is_some() {
            return Err(refuse(format!(
                "{} already has a [measured] section; remove it and weigh against the bodies",
                rig.file
            )));
        }
        if !rep.result.checks.passed {
            return Err(refuse(
                "the readings failed a consistency check (run without --write-rig to see \
                 which); nothing written"
                    .into(),
            ));
        }
        let Some(section) = measured_section(&rep) else {
            return Err(refuse(
                "no height was measured (add a [lift] or [tip] section); nothing written".into(),
            ));
        };
        let mut text = rig_src.text().to_owned();
        if !text.ends_with('\n') {
            text.push('\n');
        }
        text.push_str(&section);
        // The written file must load: the same checks as any rig file.
        crate::input::rigfile::load_source(&SourceText::new(
            path.display().to_string(),
            text.clone(),
        ))?;
        write_atomic(path, &text)?;
        rep.written = Some(path.display().to_string());
    }
    let res = if a.json {
        serde_json::to_writer_pretty(&mut *out, &rep)
            .map_err(std::io::Error::other)
            .and_then(|()| writeln!(out))
    } else {
        write_text(&rep, out)
    };
    res.map_err(|e| Error::io("<standard output>", e))
}
