//! A small JSON writer for the [`crate::view`] mirrors: the wire of [`crate::solve`].
//!
//! Why it exists: the page solves on every keystroke, and building the result as
//! JavaScript objects field by field (`serde-wasm-bindgen`) crosses from wasm to
//! JavaScript once per string, number and object: for the bend page's result (about
//! 19 kB of text: four tables, a diagram) that took three times as long as the
//! solve itself. One JSON text crosses once, and the browser's `JSON.parse` builds
//! the same objects natively. `serde_json` would do the same but adds its own float
//! formatting to the module; this writer uses the standard library's, which the
//! module carries anyway.
//!
//! The output reads as the same JSON value that `serde_json::to_string` writes
//! (the tests compare the two, on edge cases and on every calculator's demo
//! result). Numbers are written in the shortest form that reads back to the same
//! `f64` (`Display`, or `LowerExp` outside 1e-6 ..= 1e16 so that no number spells
//! out hundreds of zeros; `1.0` is written `1`); `JSON.parse` reads either exactly.
//! A NaN or infinity, which the views never hold (they write it as `None`), would
//! be written as `null`, as `JSON.stringify` does.

use std::fmt::{self, Display, Write as _};

use serde::ser::{self, Serialize};

/// The JSON text of `value`.
///
/// # Errors
/// Only for a value JSON cannot hold: a map key that is not a string, a number
/// or a bool (the views have none).
pub fn to_string<T: Serialize + ?Sized>(value: &T) -> Result<String, Error> {
    let mut writer = Writer {
        out: String::with_capacity(4096),
    };
    value.serialize(&mut writer)?;
    Ok(writer.out)
}

/// Why a value could not be written.
#[derive(Debug)]
pub struct Error(String);

impl Display for Error {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(&self.0)
    }
}

impl std::error::Error for Error {}

impl ser::Error for Error {
    fn custom<T: Display>(message: T) -> Self {
        Error(message.to_string())
    }
}

struct Writer {
    out: String,
}

/// Whether a byte of UTF-8 text is written escaped in a JSON string: the quote, the
/// backslash and the control characters (a byte of a multi-byte character is never
/// below 0x80).
fn needs_escape(byte: u8) -> bool {
    byte < 0x20 || byte == b'"' || byte == b'\\'
}

impl Writer {
    fn string(&mut self, text: &str) {
        self.out.reserve(text.len() + 2);
        self.out.push('"');
        // Most text needs no escape at all: one scan to find the first byte that
        // does, then the runs between escapes copied whole.
        let bytes = text.as_bytes();
        let mut start = 0;
        while let Some(offset) = bytes[start..].iter().position(|&b| needs_escape(b)) {
            let index = start + offset;
            self.out.push_str(&text[start..index]);
            match bytes[index] {
                b'"' => self.out.push_str("\\\""),
                b'\\' => self.out.push_str("\\\\"),
                b'\n' => self.out.push_str("\\n"),
                b'\r' => self.out.push_str("\\r"),
                b'\t' => self.out.push_str("\\t"),
                byte => {
                    let _ = write!(self.out, "\\u{byte:04x}");
                }
            }
            start = index + 1;
        }
        self.out.push_str(&text[start..]);
        self.out.push('"');
    }

    fn float(&mut self, value: f64) {
        if !value.is_finite() {
            self.out.push_str("null");
        } else if value == 0.0 || (1e-6..1e16).contains(&value.abs()) {
            let _ = write!(self.out, "{value}");
        } else {
            let _ = write!(self.out, "{value:e}");
        }
    }

    fn display(&mut self, value: impl Display) {
        let _ = write!(self.out, "{value}");
    }
}

/// A sequence, map or struct being written: whether a comma goes before the next item.
struct Compound<'a> {
    writer: &'a mut Writer,
    first: bool,
    /// The closing text (`]`, `}` or `}}` for a variant wrapped in an object).
    close: &'static str,
}

impl Compound<'_> {
    fn comma(&mut self) {
        if self.first {
            self.first = false;
        } else {
            self.writer.out.push(',');
        }
    }

    fn key(&mut self, key: &str) {
        self.comma();
        self.writer.string(key);
        self.writer.out.push(':');
    }

    fn finish(self) {
        self.writer.out.push_str(self.close);
    }
}

impl<'a> ser::Serializer for &'a mut Writer {
    type Ok = ();
    type Error = Error;
    type SerializeSeq = Compound<'a>;
    type SerializeTuple = Compound<'a>;
    type SerializeTupleStruct = Compound<'a>;
    type SerializeTupleVariant = Compound<'a>;
    type SerializeMap = Compound<'a>;
    type SerializeStruct = Compound<'a>;
    type SerializeStructVariant = Compound<'a>;

    fn serialize_bool(self, v: bool) -> Result<(), Error> {
        self.out.push_str(if v { "true" } else { "false" });
        Ok(())
    }
    fn serialize_i8(self, v: i8) -> Result<(), Error> {
        self.display(v);
        Ok(())
    }
    fn serialize_i16(self, v: i16) -> Result<(), Error> {
        self.display(v);
        Ok(())
    }
    fn serialize_i32(self, v: i32) -> Result<(), Error> {
        self.display(v);
        Ok(())
    }
    fn serialize_i64(self, v: i64) -> Result<(), Error> {
        self.display(v);
        Ok(())
    }
    fn serialize_u8(self, v: u8) -> Result<(), Error> {
        self.display(v);
        Ok(())
    }
    fn serialize_u16(self, v: u16) -> Result<(), Error> {
        self.display(v);
        Ok(())
    }
    fn serialize_u32(self, v: u32) -> Result<(), Error> {
        self.display(v);
        Ok(())
    }
    fn serialize_u64(self, v: u64) -> Result<(), Error> {
        self.display(v);
        Ok(())
    }
    fn serialize_f32(self, v: f32) -> Result<(), Error> {
        self.float(f64::from(v));
        Ok(())
    }
    fn serialize_f64(self, v: f64) -> Result<(), Error> {
        self.float(v);
        Ok(())
    }
    fn serialize_char(self, v: char) -> Result<(), Error> {
        self.string(v.encode_utf8(&mut [0; 4]));
        Ok(())
    }
    fn serialize_str(self, v: &str) -> Result<(), Error> {
        self.string(v);
        Ok(())
    }
    fn serialize_bytes(self, v: &[u8]) -> Result<(), Error> {
        use ser::SerializeSeq;
        let mut seq = self.serialize_seq(Some(v.len()))?;
        for byte in v {
            seq.serialize_element(byte)?;
        }
        seq.end()
    }
    fn serialize_none(self) -> Result<(), Error> {
        self.serialize_unit()
    }
    fn serialize_some<T: Serialize + ?Sized>(self, value: &T) -> Result<(), Error> {
        value.serialize(self)
    }
    fn serialize_unit(self) -> Result<(), Error> {
        self.out.push_str("null");
        Ok(())
    }
    fn serialize_unit_struct(self, _name: &'static str) -> Result<(), Error> {
        self.serialize_unit()
    }
    fn serialize_unit_variant(self, _name: &'static str, _index: u32, variant: &'static str) -> Result<(), Error> {
        self.string(variant);
        Ok(())
    }
    fn serialize_newtype_struct<T: Serialize + ?Sized>(self, _name: &'static str, value: &T) -> Result<(), Error> {
        value.serialize(self)
    }
    fn serialize_newtype_variant<T: Serialize + ?Sized>(
        self,
        _name: &'static str,
        _index: u32,
        variant: &'static str,
        value: &T,
    ) -> Result<(), Error> {
        self.out.push('{');
        self.string(variant);
        self.out.push(':');
        value.serialize(&mut *self)?;
        self.out.push('}');
        Ok(())
    }
    fn serialize_seq(self, _len: Option<usize>) -> Result<Compound<'a>, Error> {
        self.out.push('[');
        Ok(Compound {
            writer: self,
            first: true,
            close: "]",
        })
    }
    fn serialize_tuple(self, len: usize) -> Result<Compound<'a>, Error> {
        self.serialize_seq(Some(len))
    }
    fn serialize_tuple_struct(self, _name: &'static str, len: usize) -> Result<Compound<'a>, Error> {
        self.serialize_seq(Some(len))
    }
    fn serialize_tuple_variant(
        self,
        _name: &'static str,
        _index: u32,
        variant: &'static str,
        _len: usize,
    ) -> Result<Compound<'a>, Error> {
        self.out.push('{');
        self.string(variant);
        self.out.push_str(":[");
        Ok(Compound {
            writer: self,
            first: true,
            close: "]}",
        })
    }
    fn serialize_map(self, _len: Option<usize>) -> Result<Compound<'a>, Error> {
        self.out.push('{');
        Ok(Compound {
            writer: self,
            first: true,
            close: "}",
        })
    }
    fn serialize_struct(self, _name: &'static str, _len: usize) -> Result<Compound<'a>, Error> {
        self.serialize_map(None)
    }
    fn serialize_struct_variant(
        self,
        _name: &'static str,
        _index: u32,
        variant: &'static str,
        _len: usize,
    ) -> Result<Compound<'a>, Error> {
        self.out.push('{');
        self.string(variant);
        self.out.push_str(":{");
        Ok(Compound {
            writer: self,
            first: true,
            close: "}}",
        })
    }
}

impl ser::SerializeSeq for Compound<'_> {
    type Ok = ();
    type Error = Error;
    fn serialize_element<T: Serialize + ?Sized>(&mut self, value: &T) -> Result<(), Error> {
        self.comma();
        value.serialize(&mut *self.writer)
    }
    fn end(self) -> Result<(), Error> {
        self.finish();
        Ok(())
    }
}

impl ser::SerializeTuple for Compound<'_> {
    type Ok = ();
    type Error = Error;
    fn serialize_element<T: Serialize + ?Sized>(&mut self, value: &T) -> Result<(), Error> {
        ser::SerializeSeq::serialize_element(self, value)
    }
    fn end(self) -> Result<(), Error> {
        ser::SerializeSeq::end(self)
    }
}

impl ser::SerializeTupleStruct for Compound<'_> {
    type Ok = ();
    type Error = Error;
    fn serialize_field<T: Serialize + ?Sized>(&mut self, value: &T) -> Result<(), Error> {
        ser::SerializeSeq::serialize_element(self, value)
    }
    fn end(self) -> Result<(), Error> {
        ser::SerializeSeq::end(self)
    }
}

impl ser::SerializeTupleVariant for Compound<'_> {
    type Ok = ();
    type Error = Error;
    fn serialize_field<T: Serialize + ?Sized>(&mut self, value: &T) -> Result<(), Error> {
        ser::SerializeSeq::serialize_element(self, value)
    }
    fn end(self) -> Result<(), Error> {
        ser::SerializeSeq::end(self)
    }
}

impl ser::SerializeMap for Compound<'_> {
    type Ok = ();
    type Error = Error;
    fn serialize_key<T: Serialize + ?Sized>(&mut self, key: &T) -> Result<(), Error> {
        self.comma();
        key.serialize(KeyWriter {
            writer: &mut *self.writer,
        })?;
        self.writer.out.push(':');
        Ok(())
    }
    fn serialize_value<T: Serialize + ?Sized>(&mut self, value: &T) -> Result<(), Error> {
        value.serialize(&mut *self.writer)
    }
    fn end(self) -> Result<(), Error> {
        self.finish();
        Ok(())
    }
}

impl ser::SerializeStruct for Compound<'_> {
    type Ok = ();
    type Error = Error;
    fn serialize_field<T: Serialize + ?Sized>(&mut self, key: &'static str, value: &T) -> Result<(), Error> {
        self.key(key);
        value.serialize(&mut *self.writer)
    }
    fn end(self) -> Result<(), Error> {
        self.finish();
        Ok(())
    }
}

impl ser::SerializeStructVariant for Compound<'_> {
    type Ok = ();
    type Error = Error;
    fn serialize_field<T: Serialize + ?Sized>(&mut self, key: &'static str, value: &T) -> Result<(), Error> {
        ser::SerializeStruct::serialize_field(self, key, value)
    }
    fn end(self) -> Result<(), Error> {
        self.finish();
        Ok(())
    }
}

/// Writes a map key: JSON keys are strings, so numbers and bools are quoted.
struct KeyWriter<'a> {
    writer: &'a mut Writer,
}

fn key_error() -> Error {
    Error("a map key must be a string, a number or a bool".to_owned())
}

impl KeyWriter<'_> {
    fn quoted(self, value: impl Display) -> Result<(), Error> {
        let text = value.to_string();
        self.writer.string(&text);
        Ok(())
    }
}

impl ser::Serializer for KeyWriter<'_> {
    type Ok = ();
    type Error = Error;
    type SerializeSeq = ser::Impossible<(), Error>;
    type SerializeTuple = ser::Impossible<(), Error>;
    type SerializeTupleStruct = ser::Impossible<(), Error>;
    type SerializeTupleVariant = ser::Impossible<(), Error>;
    type SerializeMap = ser::Impossible<(), Error>;
    type SerializeStruct = ser::Impossible<(), Error>;
    type SerializeStructVariant = ser::Impossible<(), Error>;

    fn serialize_bool(self, v: bool) -> Result<(), Error> {
        self.quoted(v)
    }
    fn serialize_i8(self, v: i8) -> Result<(), Error> {
        self.quoted(v)
    }
    fn serialize_i16(self, v: i16) -> Result<(), Error> {
        self.quoted(v)
    }
    fn serialize_i32(self, v: i32) -> Result<(), Error> {
        self.quoted(v)
    }
    fn serialize_i64(self, v: i64) -> Result<(), Error> {
        self.quoted(v)
    }
    fn serialize_u8(self, v: u8) -> Result<(), Error> {
        self.quoted(v)
    }
    fn serialize_u16(self, v: u16) -> Result<(), Error> {
        self.quoted(v)
    }
    fn serialize_u32(self, v: u32) -> Result<(), Error> {
        self.quoted(v)
    }
    fn serialize_u64(self, v: u64) -> Result<(), Error> {
        self.quoted(v)
    }
    fn serialize_f32(self, _v: f32) -> Result<(), Error> {
        Err(key_error())
    }
    fn serialize_f64(self, _v: f64) -> Result<(), Error> {
        Err(key_error())
    }
    fn serialize_char(self, v: char) -> Result<(), Error> {
        self.quoted(v)
    }
    fn serialize_str(self, v: &str) -> Result<(), Error> {
        self.writer.string(v);
        Ok(())
    }
    fn serialize_bytes(self, _v: &[u8]) -> Result<(), Error> {
        Err(key_error())
    }
    fn serialize_none(self) -> Result<(), Error> {
        Err(key_error())
    }
    fn serialize_some<T: Serialize + ?Sized>(self, _value: &T) -> Result<(), Error> {
        Err(key_error())
    }
    fn serialize_unit(self) -> Result<(), Error> {
        Err(key_error())
    }
    fn serialize_unit_struct(self, _name: &'static str) -> Result<(), Error> {
        Err(key_error())
    }
    fn serialize_unit_variant(self, _name: &'static str, _index: u32, variant: &'static str) -> Result<(), Error> {
        self.writer.string(variant);
        Ok(())
    }
    fn serialize_newtype_struct<T: Serialize + ?Sized>(self, _name: &'static str, value: &T) -> Result<(), Error> {
        value.serialize(self)
    }
    fn serialize_newtype_variant<T: Serialize + ?Sized>(
        self,
        _name: &'static str,
        _index: u32,
        _variant: &'static str,
        _value: &T,
    ) -> Result<(), Error> {
        Err(key_error())
    }
    fn serialize_seq(self, _len: Option<usize>) -> Result<Self::SerializeSeq, Error> {
        Err(key_error())
    }
    fn serialize_tuple(self, _len: usize) -> Result<Self::SerializeTuple, Error> {
        Err(key_error())
    }
    fn serialize_tuple_struct(self, _name: &'static str, _len: usize) -> Result<Self::SerializeTupleStruct, Error> {
        Err(key_error())
    }
    fn serialize_tuple_variant(
        self,
        _name: &'static str,
        _index: u32,
        _variant: &'static str,
        _len: usize,
    ) -> Result<Self::SerializeTupleVariant, Error> {
        Err(key_error())
    }
    fn serialize_map(self, _len: Option<usize>) -> Result<Self::SerializeMap, Error> {
        Err(key_error())
    }
    fn serialize_struct(self, _name: &'static str, _len: usize) -> Result<Self::SerializeStruct, Error> {
        Err(key_error())
    }
    fn serialize_struct_variant(
        self,
        _name: &'static str,
        _index: u32,
        _variant: &'static str,
        _len: usize,
    ) -> Result<Self::SerializeStructVariant, Error> {
        Err(key_error())
    }
}

#[cfg(test)]
mod tests {
    //! Checked against `serde_json` (a dev-dependency): the same value must read
    //! back as the same JSON, for hand-made edge cases and every calculator's
    //! demo result.

    use super::to_string;
    use crate::view;
    use fluxledger_core::calculators::{self, CALCULATORS};
    use fluxledger_core::{Request, UnitSystem};
    use serde::Serialize;
    use serde_json::Value;

    fn same_as_serde_json<T: Serialize>(value: &T) {
        let ours = to_string(value).expect("writes");
        let read: Value = serde_json::from_str(&ours).unwrap_or_else(|e| panic!("not JSON ({e}): {ours}"));
        let theirs = serde_json::to_value(value).expect("serde_json writes");
        assert!(same(&read, &theirs), "differs:\nours:   {read}\ntheirs: {theirs}");
    }

    /// The same JSON value. JSON has one kind of number (`1` and `1.0` are the
    /// same); numbers agree to 1e-15 relative, because `serde_json`'s reader
    /// (without its `float_roundtrip` feature) may miss the last bit, and
    /// `numbers_read_back_exactly` checks the written numbers exactly with the
    /// standard library's reader.
    fn same(a: &Value, b: &Value) -> bool {
        match (a, b) {
            (Value::Number(x), Value::Number(y)) => {
                let (x, y) = (x.as_f64().expect("a number"), y.as_f64().expect("a number"));
                (x - y).abs() <= 1e-15 * x.abs().max(y.abs())
            }
            (Value::Array(x), Value::Array(y)) => x.len() == y.len() && x.iter().zip(y).all(|(x, y)| same(x, y)),
            (Value::Object(x), Value::Object(y)) => {
                x.len() == y.len() && x.iter().all(|(key, x)| y.get(key).is_some_and(|y| same(x, y)))
            }
            _ => a == b,
        }
    }

    #[derive(Serialize)]
    #[serde(tag = "type", rename_all = "snake_case")]
    enum Tagged {
        Circle { radius: f64 },
        Label { text: String },
    }

    #[derive(Serialize)]
    #[serde(untagged)]
    enum Untagged {
        Number(f64),
        Words(Vec<String>),
    }

    #[derive(Serialize)]
    enum External {
        Unit,
        New(u8),
        Tuple(u8, bool),
        Fields { a: i32 },
    }

    #[test]
    fn strings_are_escaped() {
        for text in [
            "",
            "plain",
            "quote \" and \\ back",
            "line\nbreak\ttab\r",
            "\u{0}\u{1f}",
            "m³/h · ° — π",
            "\u{2028}",
        ] {
            same_as_serde_json(&text);
        }
    }

    #[test]
    fn numbers_read_back_exactly() {
        for number in [
            0.0,
            -0.0,
            1.0,
            -2.5,
            0.1,
            1e-7,
            123456.789,
            1e16,
            9.999e15,
            1e300,
            -5e-324,
            f64::MAX,
            1.0 / 3.0,
        ] {
            let text = to_string(&number).expect("writes");
            let back: f64 = text.parse().expect("a number");
            assert_eq!(back.to_bits(), number.to_bits(), "{number} written as {text}");
            assert!(text.len() < 30, "{number} written as {text}");
        }
        for (number, text) in [(f64::NAN, "null"), (f64::INFINITY, "null"), (f64::NEG_INFINITY, "null")] {
            assert_eq!(to_string(&number).expect("writes"), text);
        }
        same_as_serde_json(&(u64::MAX, i64::MIN, 7_u8, -3_i32));
    }

    #[test]
    fn shapes_follow_serde_json() {
        same_as_serde_json(&vec![
            Tagged::Circle { radius: 2.0 },
            Tagged::Label { text: "x".into() },
        ]);
        same_as_serde_json(&vec![
            Untagged::Number(1.5),
            Untagged::Words(vec!["a".into(), "b".into()]),
        ]);
        same_as_serde_json(&vec![
            External::Unit,
            External::New(3),
            External::Tuple(1, true),
            External::Fields { a: -1 },
        ]);
        same_as_serde_json(&(Option::<u8>::None, Some("x"), (), [1, 2, 3], Vec::<u8>::new()));
        let map: std::collections::BTreeMap<&str, Vec<f64>> = [("a", vec![1.0]), ("b", vec![])].into_iter().collect();
        same_as_serde_json(&map);
        let numbered: std::collections::BTreeMap<u32, bool> = [(1, true), (20, false)].into_iter().collect();
        same_as_serde_json(&numbered);
    }

    #[test]
    fn every_demo_result_matches_serde_json() {
        for calculator in CALCULATORS {
            let spec = calculators::spec(calculator.key).expect("registered");
            for system in [UnitSystem::Si, UnitSystem::UsCustomary] {
                let request = Request {
                    inputs: spec
                        .fields
                        .iter()
                        .map(|f| (f.key.to_owned(), f.demo.to_owned()))
                        .collect(),
                    field_units: Default::default(),
                    system,
                };
                let outcome = fluxledger_core::solve(calculator.key, &request);
                same_as_serde_json(&view::solve_view(&outcome, Some(&spec)));
            }
        }
    }
}
