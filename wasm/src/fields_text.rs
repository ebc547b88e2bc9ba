//! Reads what the page sends as JSON text: a flat object of strings
//! (`JSON.stringify({p: "150 psi", d: "12 in"})`), the wire of [`crate::solve`]'s
//! `inputs` and `field_units`, and arrays of strings or of arrays of strings
//! ([`read_string_list`], [`read_string_lists`]), the wire of
//! [`crate::upgrade_link`]'s pairs and [`crate::table_csv_traced`]'s table.
//!
//! Why text: read as a JavaScript object, every key and every value crosses from
//! JavaScript into wasm on its own (a call out of wasm, a UTF-8 encoding and an
//! allocation each): for the bend page's 54 fields and their units, about 130
//! crossings on every keystroke. `JSON.stringify` is native and fast, and the one
//! string crosses once.
//!
//! Why not `serde-wasm-bindgen` for the arrays: its reader of JavaScript values
//! and the `js-sys` calls behind it were in every page's module, and their imports
//! in the glue. Reading the arrays here instead (and dropping the unused
//! `table_csv`) took the bend page's module from 108.3 to 105.6 kB Brotli and the
//! glue from 4.1 to 2.7 kB.
//!
//! Each reader accepts exactly one shape (the JSON grammar of RFC 8259 for it,
//! whitespace included): an object whose values are strings, an array of
//! strings, an array of arrays of strings. It reads it as the browser's
//! `JSON.parse` would: escapes decoded, a key given twice keeps its last
//! value. A lone surrogate escape (`"\ud800"`, which `JSON.stringify` writes for a
//! string holding one) is read as U+FFFD: a Rust string cannot hold it, and the
//! field's value is then refused by the core as any unreadable text is. The tests
//! compare the reader with `serde_json`'s on the same texts.

use std::collections::BTreeMap;
use std::fmt;

/// Why a text is not a flat JSON object of strings: what was expected, and the
/// byte offset where it was not found.
#[derive(Debug, PartialEq)]
pub struct ReadError {
    pub expected: &'static str,
    pub offset: usize,
}

impl fmt::Display for ReadError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "expected {} at byte {}", self.expected, self.offset)
    }
}

impl std::error::Error for ReadError {}

/// The strings of the JSON object `text`, keyed by their keys.
///
/// # Errors
/// When `text` is not a JSON object whose values are all strings.
pub fn read_string_map(text: &str) -> Result<BTreeMap<String, String>, ReadError> {
    let mut reader = Reader::new(text);
    let mut map = BTreeMap::new();
    reader.skip_whitespace();
    reader.items(Container::Object, |reader| {
        let key = reader.string()?;
        reader.skip_whitespace();
        reader.require(b':', "':'")?;
        reader.skip_whitespace();
        let value = reader.string()?;
        map.insert(key, value);
        Ok(())
    })?;
    reader.end()?;
    Ok(map)
}

/// The strings of the JSON array `text`, in order.
///
/// # Errors
/// When `text` is not a JSON array whose items are all strings.
pub fn read_string_list(text: &str) -> Result<Vec<String>, ReadError> {
    let mut reader = Reader::new(text);
    reader.skip_whitespace();
    let list = reader.string_list()?;
    reader.end()?;
    Ok(list)
}

/// The arrays of strings of the JSON array `text` (`[["p", "150 psi"], ...]`), in
/// order.
///
/// # Errors
/// When `text` is not a JSON array whose items are all arrays of strings.
pub fn read_string_lists(text: &str) -> Result<Vec<Vec<String>>, ReadError> {
    let mut reader = Reader::new(text);
    let mut lists = Vec::new();
    reader.skip_whitespace();
    reader.items(Container::Array, |reader| {
        lists.push(reader.string_list()?);
        Ok(())
    })?;
    reader.end()?;
    Ok(lists)
}

/// The two kinds of JSON container the readers take apart.
#[derive(Clone, Copy)]
enum Container {
    Object,
    Array,
}

struct Reader<'a> {
    text: &'a str,
    bytes: &'a [u8],
    at: usize,
}

impl<'a> Reader<'a> {
    fn new(text: &'a str) -> Self {
        Reader {
            text,
            bytes: text.as_bytes(),
            at: 0,
        }
    }

    /// Whitespace, then the end of the text.
    fn end(&mut self) -> Result<(), ReadError> {
        self.skip_whitespace();
        if self.at == self.bytes.len() {
            Ok(())
        } else {
            Err(self.error("the end of the text"))
        }
    }

    /// A JSON array of strings, its `[` next.
    fn string_list(&mut self) -> Result<Vec<String>, ReadError> {
        let mut list = Vec::new();
        self.items(Container::Array, |reader| {
            list.push(reader.string()?);
            Ok(())
        })?;
        Ok(list)
    }

    /// A container, its opening bracket next: `item` reads each item (whitespace
    /// around it is skipped here), and the items are separated by commas.
    fn items(
        &mut self,
        container: Container,
        mut item: impl FnMut(&mut Self) -> Result<(), ReadError>,
    ) -> Result<(), ReadError> {
        let (open, close, opening, separator) = match container {
            Container::Object => (b'{', b'}', "'{'", "',' or '}'"),
            Container::Array => (b'[', b']', "'['", "',' or ']'"),
        };
        self.require(open, opening)?;
        self.skip_whitespace();
        if self.eat(close) {
            return Ok(());
        }
        loop {
            self.skip_whitespace();
            item(self)?;
            self.skip_whitespace();
            if self.eat(close) {
                return Ok(());
            }
            self.require(b',', separator)?;
        }
    }

    fn error(&self, expected: &'static str) -> ReadError {
        ReadError {
            expected,
            offset: self.at,
        }
    }

    fn skip_whitespace(&mut self) {
        while matches!(self.bytes.get(self.at), Some(b' ' | b'\t' | b'\n' | b'\r')) {
            self.at += 1;
        }
    }

    fn eat(&mut self, byte: u8) -> bool {
        let found = self.bytes.get(self.at) == Some(&byte);
        if found {
            self.at += 1;
        }
        found
    }

    fn require(&mut self, byte: u8, expected: &'static str) -> Result<(), ReadError> {
        if self.eat(byte) {
            Ok(())
        } else {
            Err(self.error(expected))
        }
    }

    /// A JSON string. The text is `&str`, so the bytes between escapes are whole
    /// UTF-8 characters and are copied as they are.
    fn string(&mut self) -> Result<String, ReadError> {
        self.require(b'"', "a string")?;
        let mut out = String::new();
        loop {
            let start = self.at;
            while let Some(&byte) = self.bytes.get(self.at) {
                if byte == b'"' || byte == b'\\' || byte < 0x20 {
                    break;
                }
                self.at += 1;
            }
            // A run ends at an ASCII byte (or the end): it is whole characters.
            let run = &self.text[start..self.at];
            match self.bytes.get(self.at) {
                Some(b'"') => {
                    self.at += 1;
                    // The usual string has no escape: one copy of its run.
                    if out.is_empty() {
                        return Ok(run.to_string());
                    }
                    out.push_str(run);
                    return Ok(out);
                }
                Some(b'\\') => {
                    self.at += 1;
                    out.push_str(run);
                    out.push(self.escape()?);
                }
                Some(_) => return Err(self.error("an escaped control character")),
                None => return Err(self.error("the closing '\"' of a string")),
            }
        }
    }

    /// The character of an escape, the backslash already read.
    fn escape(&mut self) -> Result<char, ReadError> {
        let Some(&letter) = self.bytes.get(self.at) else {
            return Err(self.error("an escape"));
        };
        self.at += 1;
        Ok(match letter {
            b'"' => '"',
            b'\\' => '\\',
            b'/' => '/',
            b'b' => '\u{8}',
            b'f' => '\u{c}',
            b'n' => '\n',
            b'r' => '\r',
            b't' => '\t',
            b'u' => {
                let unit = self.hex4()?;
                if (0xD800..0xDC00).contains(&unit) {
                    // A high surrogate: a pair when a low one follows.
                    let rest = &self.bytes[self.at..];
                    if rest.starts_with(b"\\u") {
                        let back = self.at;
                        self.at += 2;
                        let low = self.hex4()?;
                        if (0xDC00..0xE000).contains(&low) {
                            let code = 0x10000 + ((unit - 0xD800) << 10) + (low - 0xDC00);
                            return Ok(char::from_u32(code).unwrap_or(char::REPLACEMENT_CHARACTER));
                        }
                        // Not a low surrogate: this one stands alone, and the
                        // next escape is read on its own.
                        self.at = back;
                    }
                    char::REPLACEMENT_CHARACTER
                } else {
                    char::from_u32(unit).unwrap_or(char::REPLACEMENT_CHARACTER)
                }
            }
            _ => {
                self.at -= 1;
                return Err(self.error("an escape: one of \\\" \\\\ \\/ \\b \\f \\n \\r \\t \\uXXXX"));
            }
        })
    }

    fn hex4(&mut self) -> Result<u32, ReadError> {
        let digits = self
            .bytes
            .get(self.at..self.at + 4)
            .ok_or_else(|| self.error("four hex digits"))?;
        let mut value = 0;
        for &digit in digits {
            let nibble = (digit as char)
                .to_digit(16)
                .ok_or_else(|| self.error("four hex digits"))?;
            value = value * 16 + nibble;
        }
        self.at += 4;
        Ok(value)
    }
}

#[cfg(test)]
mod tests {
    //! Checked against `serde_json` (a dev-dependency), an independent reader of
    //! the same grammar: every text either reads to the same map in both, or is
    //! refused by both.

    use super::{read_string_list, read_string_lists, read_string_map};
    use std::collections::BTreeMap;

    /// Texts both readers must accept, with what they hold.
    const ACCEPTED: &[&str] = &[
        "{}",
        " { } ",
        r#"{"p":"150 psi"}"#,
        "{\n  \"p\" : \"150 psi\" ,\r\n\t\"d\":\"12 in\"\n}",
        r#"{"p":""}"#,
        r#"{"":"empty key"}"#,
        r#"{"q":"a \"quoted\" value \\ with \/ slashes"}"#,
        r#"{"c":"\b\f\n\r\t"}"#,
        r#"{"u":"\u00b0C, \u00B5m, \u2212 40"}"#,
        r#"{"pair":"\ud83d\ude00 pipe"}"#,
        r#"{"raw":"°C µm − 40 😀"}"#,
        r#"{"p":"1","p":"2"}"#,
        r#"{"rows":"bend 90deg di52_12\nbend 45deg di52_12 turn=right\ntee di52_12 di52_8"}"#,
    ];

    /// Texts both readers must refuse.
    const REFUSED: &[&str] = &[
        "",
        "[]",
        r#"["p","150 psi"]"#,
        r#"{"p":150}"#,
        r#"{"p":null}"#,
        r#"{"p":["150 psi"]}"#,
        r#"{p:"150 psi"}"#,
        r#"{"p":"150 psi",}"#,
        r#"{"p" "150 psi"}"#,
        r#"{"p":"150 psi""#,
        r#"{"p":"150 psi} "#,
        r#"{"p":"150 psi"} x"#,
        r#"{"p":"150 psi"}{}"#,
        "{\"p\":\"line\nbreak\"}",
        r#"{"p":"\x"}"#,
        r#"{"p":"\u12"}"#,
        r#"{"p":"\u12g4"}"#,
        r#"{"p":"ends in \"#,
    ];

    #[test]
    fn reads_what_serde_json_reads() {
        for text in ACCEPTED {
            let ours = read_string_map(text).unwrap_or_else(|e| panic!("refused {text:?}: {e}"));
            let theirs: BTreeMap<String, String> =
                serde_json::from_str(text).unwrap_or_else(|e| panic!("serde_json refused {text:?}: {e}"));
            assert_eq!(ours, theirs, "{text:?}");
        }
    }

    #[test]
    fn refuses_what_serde_json_refuses() {
        for text in REFUSED {
            assert!(
                serde_json::from_str::<BTreeMap<String, String>>(text).is_err(),
                "serde_json reads {text:?}: not a case to refuse"
            );
            assert!(read_string_map(text).is_err(), "read {text:?}");
        }
    }

    /// Arrays both readers must accept as arrays of strings (`list`) or arrays of
    /// arrays of strings (`lists`), with what they hold.
    const ACCEPTED_LISTS: &[&str] = &[
        "[]",
        " [ ] ",
        r#"[["p","150 psi"]]"#,
        "[\n [ \"p\" , \"150 psi\" ] ,\r\n\t[\"d\",\"12 in\"],[]\n]",
        r#"[["units","us"],["p","1"],["p","2"]]"#,
        r#"[["q","a \"quoted\" value \\ \u00b0C \ud83d\ude00"]]"#,
        r#"[["Version","0.1.0"],["Link","https://example.org/bend.html?p=1&d=2"],["",""]]"#,
    ];
    const ACCEPTED_LIST: &[&str] = &[
        "[]",
        r#"["Station","Thrust (kN)"]"#,
        " [ \"a\" ,\n\"\" ] ",
        r#"["=1+1","\u2212 40 \u00b0C"]"#,
    ];

    /// Texts both readers must refuse as arrays of arrays of strings.
    const REFUSED_LISTS: &[&str] = &[
        "",
        "{}",
        r#"["p","150 psi"]"#,
        r#"[["p",150]]"#,
        r#"[["p",null]]"#,
        r#"[["p",["150 psi"]]]"#,
        r#"[["p","150 psi"],]"#,
        r#"[["p","150 psi",]]"#,
        r#"[["p" "150 psi"]]"#,
        r#"[["p","150 psi"]"#,
        r#"[["p","150 psi"]] x"#,
        r#"[["p","150 psi"]][]"#,
        "[[\"line\nbreak\"]]",
        r#"[["\x"]]"#,
    ];

    #[test]
    fn reads_the_arrays_serde_json_reads() {
        for text in ACCEPTED_LISTS {
            let ours = read_string_lists(text).unwrap_or_else(|e| panic!("refused {text:?}: {e}"));
            let theirs: Vec<Vec<String>> =
                serde_json::from_str(text).unwrap_or_else(|e| panic!("serde_json refused {text:?}: {e}"));
            assert_eq!(ours, theirs, "{text:?}");
        }
        for text in ACCEPTED_LIST {
            let ours = read_string_list(text).unwrap_or_else(|e| panic!("refused {text:?}: {e}"));
            let theirs: Vec<String> =
                serde_json::from_str(text).unwrap_or_else(|e| panic!("serde_json refused {text:?}: {e}"));
            assert_eq!(ours, theirs, "{text:?}");
        }
    }

    #[test]
    fn refuses_the_arrays_serde_json_refuses() {
        for text in REFUSED_LISTS {
            assert!(
                serde_json::from_str::<Vec<Vec<String>>>(text).is_err(),
                "serde_json reads {text:?}: not a case to refuse"
            );
            assert!(read_string_lists(text).is_err(), "read {text:?}");
        }
        for text in ["", "[[\"a\"]]", r#"["a",1]"#, r#"["a"]]"#, r#"{"a":"b"}"#] {
            assert!(
                serde_json::from_str::<Vec<String>>(text).is_err(),
                "serde_json reads {text:?}: not a case to refuse"
            );
            assert!(read_string_list(text).is_err(), "read {text:?}");
        }
    }

    #[test]
    fn a_lone_surrogate_reads_as_the_replacement_character() {
        // `JSON.stringify("\ud800")` writes `"\ud800"`; serde_json refuses it, the
        // browser reads it: here it is kept as U+FFFD, never a refusal of the call.
        for (text, expected) in [
            (r#"{"p":"\ud800"}"#, "\u{fffd}"),
            (r#"{"p":"a\udc00b"}"#, "a\u{fffd}b"),
            (r#"{"p":"\ud800\u0041"}"#, "\u{fffd}A"),
            (r#"{"p":"\ud800\ud800\udc00"}"#, "\u{fffd}\u{10000}"),
        ] {
            let map = read_string_map(text).unwrap_or_else(|e| panic!("refused {text:?}: {e}"));
            assert_eq!(map.get("p").map(String::as_str), Some(expected), "{text:?}");
        }
    }

    #[test]
    fn an_error_names_what_was_expected_and_where() {
        let error = read_string_map(r#"{"p":150}"#).expect_err("a number is refused");
        assert_eq!((error.expected, error.offset), ("a string", 5));
        assert_eq!(error.to_string(), "expected a string at byte 5");
    }
}
