//! Properties of the rig image reader over many generated inputs: whatever
//! the bytes, `sf_guard_init` answers with a documented status and never
//! misbehaves, and no damage of one byte passes unnoticed. (Not under Miri:
//! too many cases for an interpreter; `tests/boundary.rs` covers each error
//! path once there.)
#![cfg(not(miri))]
#![allow(clippy::undocumented_unsafe_blocks, clippy::indexing_slicing)]

use proptest::prelude::*;
use std::ptr;

use standfast_ffi::*;

const IMAGE: &[u8] = include_bytes!("data/firmware-example-rig.sfri");

#[repr(C, align(16))]
struct Storage([u8; SF_GUARD_STORAGE_SIZE]);

fn init(bytes: &[u8]) -> SfStatus {
    let mut s = Box::new(Storage([0; SF_GUARD_STORAGE_SIZE]));
    let mut g: *mut SfGuard = ptr::null_mut();
    let mut e = SfError::NONE;
    let st = unsafe {
        sf_guard_init(
            s.0.as_mut_ptr(),
            SF_GUARD_STORAGE_SIZE,
            bytes.as_ptr(),
            bytes.len(),
            0,
            &mut g,
            &mut e,
        )
    };
    assert_eq!(st, e.code);
    assert_eq!(st == SF_OK, !g.is_null());
    if st == SF_OK {
        assert_eq!(unsafe { sf_guard_fini(g) }, SF_OK);
    }
    st
}

/// The statuses an image can produce: its own checks, then the core's.
fn documented(st: SfStatus) -> bool {
    matches!(
        st,
        SF_OK
            | SF_ERR_IMAGE_TRUNCATED
            | SF_ERR_IMAGE_MAGIC
            | SF_ERR_IMAGE_VERSION
            | SF_ERR_IMAGE_SIZE
            | SF_ERR_IMAGE_CHECKSUM
            | SF_ERR_IMAGE_PAYLOAD
            | SF_ERR_NOT_FINITE
            | SF_ERR_OUT_OF_RANGE
            | SF_ERR_DUPLICATE_FOOT
            | SF_ERR_COLLINEAR_FEET
            | SF_ERR_TOO_MANY
            | SF_ERR_TOO_FEW
            | SF_ERR_ZERO_DIRECTION
            | SF_ERR_UNREACHABLE
    )
}

/// The image with its CRC recomputed over the (changed) header and payload.
fn resealed(mut b: Vec<u8>) -> Vec<u8> {
    let mut covered = b[..12].to_vec();
    covered.extend_from_slice(&b[16..]);
    let crc = image::crc32(&covered);
    b[12..16].copy_from_slice(&crc.to_le_bytes());
    b
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(512))]

    /// Arbitrary bytes, with or without the magic in front.
    #[test]
    fn any_bytes_give_a_documented_status(mut b in proptest::collection::vec(any::<u8>(), 0..600), magic in any::<bool>()) {
        if magic && b.len() >= 4 {
            b[..4].copy_from_slice(b"SFRI");
        }
        prop_assert!(documented(init(&b)));
    }

    /// Any change of one byte anywhere is refused: the CRC-32 detects every
    /// error burst no longer than its 32-bit degree (W. W. Peterson and
    /// D. T. Brown, "Cyclic codes for error detection", Proc. IRE 49(1),
    /// 1961), and the magic, version and size checks come first.
    #[test]
    fn one_changed_byte_is_refused(at in 0..IMAGE.len(), x in 1u8..=255) {
        let mut b = IMAGE.to_vec();
        b[at] ^= x;
        prop_assert_ne!(init(&b), SF_OK);
    }

    /// Payload damage behind a valid seal reaches the decoder and the core:
    /// still only documented statuses.
    #[test]
    fn resealed_payload_damage_gives_a_documented_status(
        edits in proptest::collection::vec((16..IMAGE.len(), any::<u8>()), 1..6),
    ) {
        let mut b = IMAGE.to_vec();
        for (at, v) in edits {
            b[at] = v;
        }
        prop_assert!(documented(init(&resealed(b))));
    }
}
