//! The payload encoding of a rig image: the serde data model written as
//! fixed-width little-endian values, without field names (not
//! self-describing; both ends use the same Rust types).
//!
//! | serde type | bytes |
//! |---|---|
//! | `bool` | one byte, 0 or 1 (anything else is an error) |
//! | `u8`…`u64`, `i8`…`i64` | 1, 2, 4 or 8 bytes, little-endian, two's complement |
//! | `usize`, `isize` (none today) | as `u64`, `i64`, so the image does not depend on the pointer width |
//! | `f32`, `f64` | IEEE 754 binary32 / binary64 bits, little-endian |
//! | `char` | its scalar value as `u32` |
//! | string, bytes | length as `u16`, then the bytes (strings UTF-8) |
//! | `Option` | one byte 0 (`None`) or 1 (`Some`) followed by the value |
//! | unit, unit struct | nothing |
//! | newtype struct | the inner value |
//! | sequence (`heapless::Vec`), map | count as `u16`, then the elements (keys and values alternating) |
//! | tuple, array, struct | the elements or fields in declaration order, no count, no names |
//! | enum | variant index (declaration order, from 0) as one byte, then its content as a tuple or struct |
//!
//! Nothing here allocates or panics: every read checks what is left.

use core::fmt;
use serde::de::{self, DeserializeSeed, IntoDeserializer, Visitor};
use serde::ser::{self, Serialize};

/// What went wrong while encoding or decoding a payload.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum WireError {
    /// The output buffer is full.
    Full,
    /// The input ended inside a value.
    Truncated,
    /// Bytes are left over after the value.
    Trailing,
    /// A value is not valid for its type (a bool other than 0 or 1, an
    /// option tag other than 0 or 1, bad UTF-8, an unknown enum variant, a
    /// count beyond the capacity of the type).
    Invalid,
    /// A length or count does not fit in 16 bits, or a variant index in 8.
    TooLong,
    /// The type asks for something this encoding does not carry (a
    /// self-describing read).
    Unsupported,
}

impl fmt::Display for WireError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(match self {
            WireError::Full => "the output buffer is full",
            WireError::Truncated => "the payload ends inside a value",
            WireError::Trailing => "bytes are left over after the payload",
            WireError::Invalid => "a value is not valid for its type",
            WireError::TooLong => "a length, count or variant index is too large",
            WireError::Unsupported => "the type needs a self-describing encoding",
        })
    }
}

impl core::error::Error for WireError {}

impl ser::Error for WireError {
    fn custom<T: fmt::Display>(_msg: T) -> Self {
        WireError::Invalid
    }
}

impl de::Error for WireError {
    fn custom<T: fmt::Display>(_msg: T) -> Self {
        WireError::Invalid
    }
}

/// Encodes `value` into `out`; returns the number of bytes written.
///
/// # Errors
/// [`WireError::Full`] when `out` is too small; [`WireError::TooLong`] for a
/// string or sequence longer than 65 535 or an enum with more than 256
/// variants.
pub fn encode<T: Serialize + ?Sized>(value: &T, out: &mut [u8]) -> Result<usize, WireError> {
    let mut w = Writer { out, pos: 0 };
    value.serialize(&mut w)?;
    Ok(w.pos)
}

/// Decodes a `T` from exactly `bytes`.
///
/// # Errors
/// Any [`WireError`] but [`WireError::Full`].
pub fn decode<'de, T: de::Deserialize<'de>>(bytes: &'de [u8]) -> Result<T, WireError> {
    let mut r = Reader { rest: bytes };
    let v = T::deserialize(&mut r)?;
    if r.rest.is_empty() {
        Ok(v)
    } else {
        Err(WireError::Trailing)
    }
}

struct Writer<'a> {
    out: &'a mut [u8],
    pos: usize,
}

impl Writer<'_> {
    fn put(&mut self, bytes: &[u8]) -> Result<(), WireError> {
        let end = self.pos.checked_add(bytes.len()).ok_or(WireError::Full)?;
        let dst = self.out.get_mut(self.pos..end).ok_or(WireError::Full)?;
        for (d, s) in dst.iter_mut().zip(bytes) {
            *d = *s;
        }
        self.pos = end;
        Ok(())
    }

    fn len16(&mut self, n: usize) -> Result<(), WireError> {
        let n = u16::try_from(n).map_err(|_| WireError::TooLong)?;
        self.put(&n.to_le_bytes())
    }

    fn variant(&mut self, index: u32) -> Result<(), WireError> {
        let i = u8::try_from(index).map_err(|_| WireError::TooLong)?;
        self.put(&[i])
    }
}

impl<'a> ser::Serializer for &mut Writer<'a> {
    type Ok = ();
    type Error = WireError;
    type SerializeSeq = Self;
    type SerializeTuple = Self;
    type SerializeTupleStruct = Self;
    type SerializeTupleVariant = Self;
    type SerializeMap = Self;
    type SerializeStruct = Self;
    type SerializeStructVariant = Self;

    fn serialize_bool(self, v: bool) -> Result<(), WireError> {
        self.put(&[u8::from(v)])
    }
    fn serialize_i8(self, v: i8) -> Result<(), WireError> {
        self.put(&v.to_le_bytes())
    }
    fn serialize_i16(self, v: i16) -> Result<(), WireError> {
        self.put(&v.to_le_bytes())
    }
    fn serialize_i32(self, v: i32) -> Result<(), WireError> {
        self.put(&v.to_le_bytes())
    }
    fn serialize_i64(self, v: i64) -> Result<(), WireError> {
        self.put(&v.to_le_bytes())
    }
    fn serialize_u8(self, v: u8) -> Result<(), WireError> {
        self.put(&[v])
    }
    fn serialize_u16(self, v: u16) -> Result<(), WireError> {
        self.put(&v.to_le_bytes())
    }
    fn serialize_u32(self, v: u32) -> Result<(), WireError> {
        self.put(&v.to_le_bytes())
    }
    fn serialize_u64(self, v: u64) -> Result<(), WireError> {
        self.put(&v.to_le_bytes())
    }
    fn serialize_f32(self, v: f32) -> Result<(), WireError> {
        self.put(&v.to_bits().to_le_bytes())
    }
    fn serialize_f64(self, v: f64) -> Result<(), WireError> {
        self.put(&v.to_bits().to_le_bytes())
    }
    fn serialize_char(self, v: char) -> Result<(), WireError> {
        self.put(&u32::from(v).to_le_bytes())
    }
    fn serialize_str(self, v: &str) -> Result<(), WireError> {
        self.len16(v.len())?;
        self.put(v.as_bytes())
    }
    fn serialize_bytes(self, v: &[u8]) -> Result<(), WireError> {
        self.len16(v.len())?;
        self.put(v)
    }
    fn serialize_none(self) -> Result<(), WireError> {
        self.put(&[0])
    }
    fn serialize_some<T: Serialize + ?Sized>(self, value: &T) -> Result<(), WireError> {
        self.put(&[1])?;
        value.serialize(self)
    }
    fn serialize_unit(self) -> Result<(), WireError> {
        Ok(())
    }
    fn serialize_unit_struct(self, _name: &'static str) -> Result<(), WireError> {
        Ok(())
    }
    fn serialize_unit_variant(
        self,
        _name: &'static str,
        index: u32,
        _variant: &'static str,
    ) -> Result<(), WireError> {
        self.variant(index)
    }
    fn serialize_newtype_struct<T: Serialize + ?Sized>(
        self,
        _name: &'static str,
        value: &T,
    ) -> Result<(), WireError> {
        value.serialize(self)
    }
    fn serialize_newtype_variant<T: Serialize + ?Sized>(
        self,
        _name: &'static str,
        index: u32,
        _variant: &'static str,
        value: &T,
    ) -> Result<(), WireError> {
        self.variant(index)?;
        value.serialize(self)
    }
    fn serialize_seq(self, len: Option<usize>) -> Result<Self, WireError> {
        // Every sequence of the rig types knows its length.
        self.len16(len.ok_or(WireError::Unsupported)?)?;
        Ok(self)
    }
    fn serialize_tuple(self, _len: usize) -> Result<Self, WireError> {
        Ok(self)
    }
    fn serialize_tuple_struct(self, _name: &'static str, _len: usize) -> Result<Self, WireError> {
        Ok(self)
    }
    fn serialize_tuple_variant(
        self,
        _name: &'static str,
        index: u32,
        _variant: &'static str,
        _len: usize,
    ) -> Result<Self, WireError> {
        self.variant(index)?;
        Ok(self)
    }
    fn serialize_map(self, len: Option<usize>) -> Result<Self, WireError> {
        self.len16(len.ok_or(WireError::Unsupported)?)?;
        Ok(self)
    }
    fn serialize_struct(self, _name: &'static str, _len: usize) -> Result<Self, WireError> {
        Ok(self)
    }
    fn serialize_struct_variant(
        self,
        _name: &'static str,
        index: u32,
        _variant: &'static str,
        _len: usize,
    ) -> Result<Self, WireError> {
        self.variant(index)?;
        Ok(self)
    }
    fn collect_str<T: fmt::Display + ?Sized>(self, _value: &T) -> Result<(), WireError> {
        // No type of the rig image serialises through `Display`.
        Err(WireError::Unsupported)
    }
    fn is_human_readable(&self) -> bool {
        false
    }
}

macro_rules! compound {
    ($trait:ident, $method:ident) => {
        impl ser::$trait for &mut Writer<'_> {
            type Ok = ();
            type Error = WireError;
            fn $method<T: Serialize + ?Sized>(&mut self, value: &T) -> Result<(), WireError> {
                value.serialize(&mut **self)
            }
            fn end(self) -> Result<(), WireError> {
                Ok(())
            }
        }
    };
}
compound!(SerializeSeq, serialize_element);
compound!(SerializeTuple, serialize_element);
compound!(SerializeTupleStruct, serialize_field);
compound!(SerializeTupleVariant, serialize_field);

impl ser::SerializeMap for &mut Writer<'_> {
    type Ok = ();
    type Error = WireError;
    fn serialize_key<T: Serialize + ?Sized>(&mut self, key: &T) -> Result<(), WireError> {
        key.serialize(&mut **self)
    }
    fn serialize_value<T: Serialize + ?Sized>(&mut self, value: &T) -> Result<(), WireError> {
        value.serialize(&mut **self)
    }
    fn end(self) -> Result<(), WireError> {
        Ok(())
    }
}

impl ser::SerializeStruct for &mut Writer<'_> {
    type Ok = ();
    type Error = WireError;
    fn serialize_field<T: Serialize + ?Sized>(
        &mut self,
        _key: &'static str,
        value: &T,
    ) -> Result<(), WireError> {
        value.serialize(&mut **self)
    }
    fn end(self) -> Result<(), WireError> {
        Ok(())
    }
}

impl ser::SerializeStructVariant for &mut Writer<'_> {
    type Ok = ();
    type Error = WireError;
    fn serialize_field<T: Serialize + ?Sized>(
        &mut self,
        _key: &'static str,
        value: &T,
    ) -> Result<(), WireError> {
        value.serialize(&mut **self)
    }
    fn end(self) -> Result<(), WireError> {
        Ok(())
    }
}

struct Reader<'de> {
    rest: &'de [u8],
}

impl<'de> Reader<'de> {
    fn take(&mut self, n: usize) -> Result<&'de [u8], WireError> {
        let (head, tail) = self.rest.split_at_checked(n).ok_or(WireError::Truncated)?;
        self.rest = tail;
        Ok(head)
    }

    fn array<const N: usize>(&mut self) -> Result<[u8; N], WireError> {
        let (head, tail) = self
            .rest
            .split_first_chunk::<N>()
            .ok_or(WireError::Truncated)?;
        self.rest = tail;
        Ok(*head)
    }

    fn u8(&mut self) -> Result<u8, WireError> {
        Ok(u8::from_le_bytes(self.array::<1>()?))
    }

    fn len16(&mut self) -> Result<usize, WireError> {
        Ok(usize::from(u16::from_le_bytes(self.array::<2>()?)))
    }

    fn flag(&mut self) -> Result<bool, WireError> {
        match self.u8()? {
            0 => Ok(false),
            1 => Ok(true),
            _ => Err(WireError::Invalid),
        }
    }

    fn str(&mut self) -> Result<&'de str, WireError> {
        let n = self.len16()?;
        core::str::from_utf8(self.take(n)?).map_err(|_| WireError::Invalid)
    }
}

impl<'de> de::Deserializer<'de> for &mut Reader<'de> {
    type Error = WireError;

    fn deserialize_any<V: Visitor<'de>>(self, _v: V) -> Result<V::Value, WireError> {
        Err(WireError::Unsupported)
    }
    fn deserialize_bool<V: Visitor<'de>>(self, v: V) -> Result<V::Value, WireError> {
        v.visit_bool(self.flag()?)
    }
    fn deserialize_i8<V: Visitor<'de>>(self, v: V) -> Result<V::Value, WireError> {
        v.visit_i8(i8::from_le_bytes(self.array()?))
    }
    fn deserialize_i16<V: Visitor<'de>>(self, v: V) -> Result<V::Value, WireError> {
        v.visit_i16(i16::from_le_bytes(self.array()?))
    }
    fn deserialize_i32<V: Visitor<'de>>(self, v: V) -> Result<V::Value, WireError> {
        v.visit_i32(i32::from_le_bytes(self.array()?))
    }
    fn deserialize_i64<V: Visitor<'de>>(self, v: V) -> Result<V::Value, WireError> {
        v.visit_i64(i64::from_le_bytes(self.array()?))
    }
    fn deserialize_u8<V: Visitor<'de>>(self, v: V) -> Result<V::Value, WireError> {
        v.visit_u8(self.u8()?)
    }
    fn deserialize_u16<V: Visitor<'de>>(self, v: V) -> Result<V::Value, WireError> {
        v.visit_u16(u16::from_le_bytes(self.array()?))
    }
    fn deserialize_u32<V: Visitor<'de>>(self, v: V) -> Result<V::Value, WireError> {
        v.visit_u32(u32::from_le_bytes(self.array()?))
    }
    fn deserialize_u64<V: Visitor<'de>>(self, v: V) -> Result<V::Value, WireError> {
        v.visit_u64(u64::from_le_bytes(self.array()?))
    }
    fn deserialize_f32<V: Visitor<'de>>(self, v: V) -> Result<V::Value, WireError> {
        v.visit_f32(f32::from_bits(u32::from_le_bytes(self.array()?)))
    }
    fn deserialize_f64<V: Visitor<'de>>(self, v: V) -> Result<V::Value, WireError> {
        v.visit_f64(f64::from_bits(u64::from_le_bytes(self.array()?)))
    }
    fn deserialize_char<V: Visitor<'de>>(self, v: V) -> Result<V::Value, WireError> {
        let c = char::from_u32(u32::from_le_bytes(self.array()?)).ok_or(WireError::Invalid)?;
        v.visit_char(c)
    }
    fn deserialize_str<V: Visitor<'de>>(self, v: V) -> Result<V::Value, WireError> {
        v.visit_borrowed_str(self.str()?)
    }
    fn deserialize_string<V: Visitor<'de>>(self, v: V) -> Result<V::Value, WireError> {
        v.visit_borrowed_str(self.str()?)
    }
    fn deserialize_bytes<V: Visitor<'de>>(self, v: V) -> Result<V::Value, WireError> {
        let n = self.len16()?;
        v.visit_borrowed_bytes(self.take(n)?)
    }
    fn deserialize_byte_buf<V: Visitor<'de>>(self, v: V) -> Result<V::Value, WireError> {
        self.deserialize_bytes(v)
    }
    fn deserialize_option<V: Visitor<'de>>(self, v: V) -> Result<V::Value, WireError> {
        if self.flag()? {
            v.visit_some(self)
        } else {
            v.visit_none()
        }
    }
    fn deserialize_unit<V: Visitor<'de>>(self, v: V) -> Result<V::Value, WireError> {
        v.visit_unit()
    }
    fn deserialize_unit_struct<V: Visitor<'de>>(
        self,
        _name: &'static str,
        v: V,
    ) -> Result<V::Value, WireError> {
        v.visit_unit()
    }
    fn deserialize_newtype_struct<V: Visitor<'de>>(
        self,
        _name: &'static str,
        v: V,
    ) -> Result<V::Value, WireError> {
        v.visit_newtype_struct(self)
    }
    fn deserialize_seq<V: Visitor<'de>>(self, v: V) -> Result<V::Value, WireError> {
        let n = self.len16()?;
        v.visit_seq(Elements { r: self, left: n })
    }
    fn deserialize_tuple<V: Visitor<'de>>(self, len: usize, v: V) -> Result<V::Value, WireError> {
        v.visit_seq(Elements { r: self, left: len })
    }
    fn deserialize_tuple_struct<V: Visitor<'de>>(
        self,
        _name: &'static str,
        len: usize,
        v: V,
    ) -> Result<V::Value, WireError> {
        v.visit_seq(Elements { r: self, left: len })
    }
    fn deserialize_map<V: Visitor<'de>>(self, v: V) -> Result<V::Value, WireError> {
        let n = self.len16()?;
        v.visit_map(Elements { r: self, left: n })
    }
    fn deserialize_struct<V: Visitor<'de>>(
        self,
        _name: &'static str,
        fields: &'static [&'static str],
        v: V,
    ) -> Result<V::Value, WireError> {
        v.visit_seq(Elements {
            r: self,
            left: fields.len(),
        })
    }
    fn deserialize_enum<V: Visitor<'de>>(
        self,
        _name: &'static str,
        _variants: &'static [&'static str],
        v: V,
    ) -> Result<V::Value, WireError> {
        v.visit_enum(self)
    }
    fn deserialize_identifier<V: Visitor<'de>>(self, _v: V) -> Result<V::Value, WireError> {
        Err(WireError::Unsupported)
    }
    fn deserialize_ignored_any<V: Visitor<'de>>(self, _v: V) -> Result<V::Value, WireError> {
        Err(WireError::Unsupported)
    }
    fn is_human_readable(&self) -> bool {
        false
    }
}

/// The elements of a sequence, tuple, struct or map still to read.
struct Elements<'a, 'de> {
    r: &'a mut Reader<'de>,
    left: usize,
}

impl<'de> de::SeqAccess<'de> for Elements<'_, 'de> {
    type Error = WireError;
    fn next_element_seed<T: DeserializeSeed<'de>>(
        &mut self,
        seed: T,
    ) -> Result<Option<T::Value>, WireError> {
        if self.left == 0 {
            return Ok(None);
        }
        self.left -= 1;
        seed.deserialize(&mut *self.r).map(Some)
    }
    fn size_hint(&self) -> Option<usize> {
        Some(self.left)
    }
}

impl<'de> de::MapAccess<'de> for Elements<'_, 'de> {
    type Error = WireError;
    fn next_key_seed<K: DeserializeSeed<'de>>(
        &mut self,
        seed: K,
    ) -> Result<Option<K::Value>, WireError> {
        if self.left == 0 {
            return Ok(None);
        }
        self.left -= 1;
        seed.deserialize(&mut *self.r).map(Some)
    }
    fn next_value_seed<V: DeserializeSeed<'de>>(&mut self, seed: V) -> Result<V::Value, WireError> {
        seed.deserialize(&mut *self.r)
    }
}

impl<'de> de::EnumAccess<'de> for &mut Reader<'de> {
    type Error = WireError;
    type Variant = Self;
    fn variant_seed<V: DeserializeSeed<'de>>(self, seed: V) -> Result<(V::Value, Self), WireError> {
        let index = u32::from(self.u8()?);
        let d: de::value::U32Deserializer<WireError> = index.into_deserializer();
        let v = seed.deserialize(d)?;
        Ok((v, self))
    }
}

impl<'de> de::VariantAccess<'de> for &mut Reader<'de> {
    type Error = WireError;
    fn unit_variant(self) -> Result<(), WireError> {
        Ok(())
    }
    fn newtype_variant_seed<T: DeserializeSeed<'de>>(self, seed: T) -> Result<T::Value, WireError> {
        seed.deserialize(self)
    }
    fn tuple_variant<V: Visitor<'de>>(self, len: usize, v: V) -> Result<V::Value, WireError> {
        v.visit_seq(Elements { r: self, left: len })
    }
    fn struct_variant<V: Visitor<'de>>(
        self,
        fields: &'static [&'static str],
        v: V,
    ) -> Result<V::Value, WireError> {
        v.visit_seq(Elements {
            r: self,
            left: fields.len(),
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn scalars_round_trip_little_endian() {
        let mut buf = [0u8; 64];
        let v: (u16, f32, Option<u8>, bool) = (0x0102, 1.5, Some(7), true);
        let n = encode(&v, &mut buf).unwrap();
        // 1.5f32 = 0x3FC00000 (IEEE 754 binary32).
        assert_eq!(&buf[..n], &[0x02, 0x01, 0, 0, 0xC0, 0x3F, 1, 7, 1]);
        let back: (u16, f32, Option<u8>, bool) = decode(&buf[..n]).unwrap();
        assert_eq!(back, v);
    }

    #[test]
    fn bad_bool_and_trailing_bytes_are_errors() {
        assert_eq!(decode::<bool>(&[2]), Err(WireError::Invalid));
        assert_eq!(decode::<u8>(&[1, 2]), Err(WireError::Trailing));
        assert_eq!(decode::<u32>(&[1, 2]), Err(WireError::Truncated));
        let mut small = [0u8; 3];
        assert_eq!(encode(&7u32, &mut small), Err(WireError::Full));
    }
}
