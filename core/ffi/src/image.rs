//! The rig image: a rig description, its guard settings and the site's air
//! in a versioned, checksummed byte string, small enough for a
//! microcontroller's flash. `standfast rig-image RIG.toml --out FILE` writes
//! one from a rig file; [`decode`] reads it back.
//!
//! **Layout** (all integers little-endian):
//!
//! | offset | size | field |
//! |---|---|---|
//! | 0 | 4 | magic, the ASCII bytes `SFRI` |
//! | 4 | 2 | format version, [`IMAGE_VERSION`] |
//! | 6 | 2 | header size in bytes, 16 |
//! | 8 | 4 | payload size `n` in bytes |
//! | 12 | 4 | CRC-32 of bytes 0..12 followed by the payload |
//! | 16 | n | payload |
//!
//! The CRC is the CRC-32 of IEEE 802.3 (polynomial 0x04C11DB7, reflected,
//! initial value and final XOR 0xFFFFFFFF; check value 0xCBF43926 for the
//! ASCII string `123456789`).
//!
//! The **payload** is the triple ([`RigSpec`], [`GuardConfig`], site air
//! density in kg/m³ as `f32`) in the encoding of [`crate::wire`], fields in
//! the declaration order of the core's types. It therefore changes whenever
//! those types change: the version is raised then, and a reader refuses
//! every version but its own (a test pins the bytes of the firmware
//! example's image, so a change of the core's types cannot pass unnoticed).
//!
//! Checks on reading, in this order: size at least 16 ([`ImageError::Truncated`]),
//! magic ([`ImageError::Magic`]), version ([`ImageError::Version`]), header
//! size and payload size against the bytes given ([`ImageError::Truncated`]
//! or [`ImageError::Size`]), checksum ([`ImageError::Checksum`]), then the
//! payload ([`ImageError::Payload`]). The values are validated afterwards by
//! the core itself (`Rig::new`, `Guard::new`, `Air::from_density`), as for
//! any other rig.

use crate::wire::{self, WireError};
use standfast::guard::GuardConfig;
use standfast::rig::RigSpec;

/// The four magic bytes at the start of every rig image.
pub const IMAGE_MAGIC: [u8; 4] = *b"SFRI";
/// The image format this build writes and reads.
pub const IMAGE_VERSION: u16 = 2;
/// Size of the image header, bytes.
pub const IMAGE_HEADER_BYTES: usize = 16;
/// Largest image accepted, bytes (header included). A rig at every
/// capacity of the core takes well under this.
pub const IMAGE_MAX_BYTES: usize = 16 * 1024;

/// The contents of a rig image.
#[derive(Clone, Debug, PartialEq)]
pub struct RigImage {
    /// The rig description (validated by `Rig::new` on use).
    pub spec: RigSpec,
    /// The guard's settings (validated by `Guard::new` on use).
    pub guard: GuardConfig,
    /// Air density at the site until measured air arrives, kg/m³ (the ISO
    /// 2533 standard atmosphere at the rig file's elevation).
    pub air_density_kg_per_m3: f32,
}

/// Why an image cannot be read or written.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum ImageError {
    /// Fewer bytes than the header, or than header and payload say.
    Truncated,
    /// The first four bytes are not `SFRI`.
    Magic,
    /// A format version other than [`IMAGE_VERSION`] (the value found).
    Version(u16),
    /// The header size field is not 16, the payload size exceeds
    /// [`IMAGE_MAX_BYTES`], or bytes follow the payload.
    Size,
    /// The CRC-32 does not match: the image is damaged.
    Checksum,
    /// The payload does not decode into the rig types.
    Payload(WireError),
    /// The output buffer is too small (writing).
    Full,
}

/// CRC-32 (IEEE 802.3, reflected, polynomial 0xEDB88320 in reflected form)
/// continued over `bytes` from the running value `crc` (start with
/// `0xFFFF_FFFF`, finish by inverting).
#[must_use]
pub fn crc32_update(mut crc: u32, bytes: &[u8]) -> u32 {
    for &b in bytes {
        crc ^= u32::from(b);
        for _ in 0..8 {
            let mask = (crc & 1).wrapping_neg();
            crc = (crc >> 1) ^ (0xEDB8_8320 & mask);
        }
    }
    crc
}

/// The CRC-32 of `bytes` (IEEE 802.3).
#[must_use]
pub fn crc32(bytes: &[u8]) -> u32 {
    !crc32_update(0xFFFF_FFFF, bytes)
}

fn image_crc(head12: &[u8], payload: &[u8]) -> u32 {
    !crc32_update(crc32_update(0xFFFF_FFFF, head12), payload)
}

/// Writes `image` into `out`; returns the image's size in bytes.
///
/// # Errors
/// [`ImageError::Full`] when `out` is too small, [`ImageError::Size`] when
/// the image would exceed [`IMAGE_MAX_BYTES`], [`ImageError::Payload`] when
/// a value cannot be encoded.
pub fn encode(image: &RigImage, out: &mut [u8]) -> Result<usize, ImageError> {
    let payload_out = out.get_mut(IMAGE_HEADER_BYTES..).ok_or(ImageError::Full)?;
    let triple = (&image.spec, &image.guard, image.air_density_kg_per_m3);
    let n = wire::encode(&triple, payload_out).map_err(|e| match e {
        WireError::Full => ImageError::Full,
        other => ImageError::Payload(other),
    })?;
    let total = IMAGE_HEADER_BYTES.checked_add(n).ok_or(ImageError::Size)?;
    if total > IMAGE_MAX_BYTES {
        return Err(ImageError::Size);
    }
    let n32 = u32::try_from(n).map_err(|_| ImageError::Size)?;
    let mut head = [0u8; 12];
    for (d, s) in head.iter_mut().zip(
        IMAGE_MAGIC
            .iter()
            .chain(IMAGE_VERSION.to_le_bytes().iter())
            .chain(16u16.to_le_bytes().iter())
            .chain(n32.to_le_bytes().iter()),
    ) {
        *d = *s;
    }
    let payload = out.get(IMAGE_HEADER_BYTES..total).ok_or(ImageError::Full)?;
    let crc = image_crc(&head, payload);
    let header = out.get_mut(..IMAGE_HEADER_BYTES).ok_or(ImageError::Full)?;
    for (d, s) in header
        .iter_mut()
        .zip(head.iter().chain(crc.to_le_bytes().iter()))
    {
        *d = *s;
    }
    Ok(total)
}

/// Reads an image (see the module docs for the order of the checks).
///
/// # Errors
/// The first check that fails, as an [`ImageError`].
pub fn decode(bytes: &[u8]) -> Result<RigImage, ImageError> {
    let (head, rest) = bytes
        .split_first_chunk::<IMAGE_HEADER_BYTES>()
        .ok_or(ImageError::Truncated)?;
    let [m0, m1, m2, m3, v0, v1, h0, h1, n0, n1, n2, n3, c0, c1, c2, c3] = *head;
    if [m0, m1, m2, m3] != IMAGE_MAGIC {
        return Err(ImageError::Magic);
    }
    let version = u16::from_le_bytes([v0, v1]);
    if version != IMAGE_VERSION {
        return Err(ImageError::Version(version));
    }
    if usize::from(u16::from_le_bytes([h0, h1])) != IMAGE_HEADER_BYTES {
        return Err(ImageError::Size);
    }
    let n = usize::try_from(u32::from_le_bytes([n0, n1, n2, n3])).map_err(|_| ImageError::Size)?;
    if n > IMAGE_MAX_BYTES - IMAGE_HEADER_BYTES {
        return Err(ImageError::Size);
    }
    let payload = rest.get(..n).ok_or(ImageError::Truncated)?;
    if rest.len() != n {
        return Err(ImageError::Size);
    }
    let crc = u32::from_le_bytes([c0, c1, c2, c3]);
    let head12 = [m0, m1, m2, m3, v0, v1, h0, h1, n0, n1, n2, n3];
    if image_crc(&head12, payload) != crc {
        return Err(ImageError::Checksum);
    }
    let (spec, guard, air_density_kg_per_m3): (RigSpec, GuardConfig, f32) =
        wire::decode(payload).map_err(ImageError::Payload)?;
    Ok(RigImage {
        spec,
        guard,
        air_density_kg_per_m3,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn crc32_check_value() {
        // The check value of CRC-32/ISO-HDLC (the IEEE 802.3 CRC) for the
        // nine ASCII digits "123456789" is 0xCBF43926 (Greg Cook's
        // "Catalogue of parametrised CRC algorithms", CRC-32/ISO-HDLC entry;
        // also ITU-T V.42 / ISO 3309 usage).
        assert_eq!(crc32(b"123456789"), 0xCBF4_3926);
        assert_eq!(crc32(b""), 0);
    }
}
