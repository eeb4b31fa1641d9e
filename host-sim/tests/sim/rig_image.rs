//! `standfast rig-image`: the rig image of the C ABI (`core/ffi`).

use standfast_ffi::image;
use standfast_sim::commands::rig_image::{image_bytes, run, RigImageArgs};
use standfast_sim::input::rigfile;
use std::path::PathBuf;

fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("..")
}

/// The committed image pins the format: the firmware example's rig file must
/// still give these exact bytes (see core/ffi/tests/data/README.md).
#[test]
fn firmware_rig_gives_the_committed_image() {
    let r = rigfile::load(&root().join("firmware-example/replay/rig.toml")).unwrap();
    let bytes = image_bytes(&r).unwrap();
    let committed =
        std::fs::read(root().join("core/ffi/tests/data/firmware-example-rig.sfri")).unwrap();
    assert!(
        bytes == committed,
        "the rig image of firmware-example/replay/rig.toml changed: raise the image format \
         version and regenerate core/ffi/tests/data/firmware-example-rig.sfri"
    );
    let back = image::decode(&bytes).unwrap();
    assert_eq!(back.spec, r.spec);
    assert_eq!(back.guard, r.guard);
    assert_eq!(back.air_density_kg_per_m3, r.air.density_kg_per_m3());
}

#[test]
fn command_writes_the_image_and_never_over_the_rig_file() {
    let dir = tempfile::tempdir().unwrap();
    let rig = dir.path().join("rig.toml");
    std::fs::copy(root().join("firmware-example/replay/rig.toml"), &rig).unwrap();
    let before = std::fs::read(&rig).unwrap();

    let mut out = Vec::new();
    let same = RigImageArgs {
        rig: rig.clone(),
        out: rig.clone(),
    };
    let e = run(&same, &mut out).unwrap_err();
    assert_eq!(e.exit_code(), 2, "{e}");
    assert!(e.to_string().contains("same file"), "{e}");
    assert_eq!(std::fs::read(&rig).unwrap(), before);
    // A hard link to the rig file is the same file too.
    let link = dir.path().join("link.sfri");
    std::fs::hard_link(&rig, &link).unwrap();
    let e = run(
        &RigImageArgs {
            rig: rig.clone(),
            out: link.clone(),
        },
        &mut out,
    )
    .unwrap_err();
    assert_eq!(e.exit_code(), 2, "{e}");
    assert_eq!(std::fs::read(&rig).unwrap(), before);
    std::fs::remove_file(&link).unwrap();

    let img = dir.path().join("rig.sfri");
    run(
        &RigImageArgs {
            rig: rig.clone(),
            out: img.clone(),
        },
        &mut out,
    )
    .unwrap();
    let bytes = std::fs::read(&img).unwrap();
    assert_eq!(&bytes[..4], b"SFRI");
    assert!(image::decode(&bytes).is_ok());
    // Only the rig file and the image: no temporary file left behind.
    assert_eq!(std::fs::read_dir(dir.path()).unwrap().count(), 2);
}
