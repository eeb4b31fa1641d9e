//! `standfast rig-image`: a rig file as the versioned, checksummed binary
//! rig image that the C ABI (`core/ffi`, `sf_guard_init`, `sf_assess`)
//! reads: the rig description, the guard settings of its `[guard]` and
//! `[sensor]` sections, and the ISO 2533 air density at its elevation. The
//! layout is documented in `standfast_ffi::image`.

use std::io::Write;
use std::path::PathBuf;

use clap::Args;
use standfast_ffi::image::{self, RigImage, IMAGE_MAX_BYTES, IMAGE_VERSION};

use crate::error::Error;
use crate::input::located::InputError;
use crate::input::rigfile::{self, LoadedRig};

/// Arguments of `rig-image`.
#[derive(Debug, Args)]
pub struct RigImageArgs {
    /// The rig file (TOML).
    pub rig: PathBuf,
    /// The image file to write (replaced whole, through a temporary file in
    /// the same folder; never the rig file itself).
    #[arg(long, value_name = "FILE")]
    pub out: PathBuf,
}

fn input_error(file: &str, problem: String) -> Error {
    Error::Input(InputError {
        at: None,
        key: None,
        value: None,
        problem: format!("{file}: {problem}"),
    })
}

/// The image of a loaded rig, read back and compared before it is returned.
///
/// # Errors
/// [`Error::Input`] when the rig does not fit in an image or does not read
/// back the same.
pub fn image_bytes(r: &LoadedRig) -> Result<Vec<u8>, Error> {
    let img = RigImage {
        spec: r.spec.clone(),
        guard: r.guard.clone(),
        air_density_kg_per_m3: r.air.density_kg_per_m3(),
    };
    let mut buf = vec![0u8; IMAGE_MAX_BYTES];
    let n = image::encode(&img, &mut buf).map_err(|e| {
        input_error(
            &r.file,
            format!(
                "the rig does not fit in a rig image of at most {IMAGE_MAX_BYTES} bytes ({e:?})"
            ),
        )
    })?;
    buf.truncate(n);
    match image::decode(&buf) {
        Ok(back) if back == img => Ok(buf),
        Ok(_) => Err(input_error(
            &r.file,
            "the rig image does not read back the same".to_owned(),
        )),
        Err(e) => Err(input_error(
            &r.file,
            format!("the rig image does not read back ({e:?})"),
        )),
    }
}

/// Runs `rig-image`.
///
/// # Errors
/// The rig file's errors; [`Error::Usage`] (exit 2) when `--out` is the rig
/// file (by path or link);
/// [`Error::Io`] when the image cannot be written.
pub fn run(a: &RigImageArgs, out: &mut dyn Write) -> Result<(), Error> {
    // An output over the input (same path, a symbolic or hard link) is
    // refused before anything is read (exit 2), as for every output.
    crate::commands::output::check_paths(
        &[crate::commands::output::Role::new("the rig file", &a.rig)],
        &[crate::commands::output::Role::new("--out", &a.out)],
    )?;
    let r = rigfile::load(&a.rig)?;
    let bytes = image_bytes(&r)?;
    crate::commands::output::write_atomic(&a.out, &bytes)?;
    writeln!(
        out,
        "wrote {} ({} bytes, rig image format {IMAGE_VERSION}) from {}",
        a.out.display(),
        bytes.len(),
        r.file
    )
    .map_err(|e| Error::io("<standard output>", e))?;
    Ok(())
}
