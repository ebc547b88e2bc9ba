//! The only crate that knows about JavaScript: a thin wasm-bindgen adapter over
//! `fluxledger-core`.
//!
//! A key design decision: this crate holds no physics, no defaults and no unit
//! tables. Every export is `from_value` → core call → JSON text; the wire shapes are
//! the serialisable mirrors in [`view`], built by pure functions that are tested
//! natively. Every export that answers with a value (every one in the list below)
//! answers with its JSON text,
//! written by [`json`] and read by the page with `JSON.parse` (one string crosses
//! from wasm instead of every value one by one, and the module carries one
//! serialiser: `serde-wasm-bindgen` only reads the arguments). The page script
//! calls these functions:
//!
//! - [`catalog`]`()` — the description of every calculator (fields, unit lists,
//!   outputs, cautions); used by the contents page only.
//! - [`calculator`]`(key)` — the description of one calculator (its fields with
//!   their units `{id, label}`, default unit per system and the chain of conditions
//!   under which each is shown; outputs; cautions), with the version and the unit
//!   systems: what a calculator page asks for.
//! - [`upgrade_link`]`(page, pairs)` — a link's `[key, value]` pairs read in today's
//!   vocabulary through the core's glossary, `{pairs, translations}`; the page runs
//!   every link through it before reading fields and reports the translations.
//! - [`convert`]`(key, field, text, from_unit, system)` — what is typed in a
//!   quantity field, converted to that field's default unit in `system` (used when
//!   the page's unit system is switched) and rounded by the core to one figure more
//!   than was typed, at least four (`7 bar` → `101.5` psi): `{ok: true, number,
//!   unit}` or `{ok: false, message}`; it never throws for what a user typed.
//! - [`solve`]`(key, inputs, field_units, system)` — the JSON text of the result
//!   (the page reads it with `JSON.parse`: one string crosses from wasm instead of
//!   every value one by one, see [`json`]); `inputs` and `field_units` (the
//!   unit each selector shows) are plain objects of strings keyed by field key,
//!   `system` is `"si"` or `"us"`. Outputs travel as `{number, unit, text, shown}`,
//!   table cells as `{text, number, unit, shown}` with per-column `{title, unit,
//!   kind}`, so the page takes no text apart. It never throws for
//!   anything a user typed: invalid input comes back as `{ok: false, errors: [...]}`.
//!   It throws only when the script calls it wrongly (values that are not strings,
//!   an unknown unit system), through the one helper [`adapter_error`].
//! - [`table_csv`]`(headers, rows)` — the CSV text of a result table, every cell a
//!   spreadsheet would run as a formula neutralised (see [`csv`]).
//!
//! Values go out as JSON text through [`json`] (the same shapes `serde_json` would
//! write: `None` is `null`, maps are plain objects). What dropping
//! `serde-wasm-bindgen`'s serialiser saved is measured in DEVELOPERS.md ("Module
//! size").

pub mod compare;
pub mod csv;
pub mod json;
pub mod qr;
pub mod verify;
pub mod view;

use std::collections::BTreeMap;
use std::fmt::Display;

use serde::Serialize;
use wasm_bindgen::prelude::*;

use fluxledger_core::calculators;
use fluxledger_core::{Request, UnitSystem};

/// Turns any adapter error into the exception thrown in JavaScript.
pub fn adapter_error(context: &str, error: impl Display) -> JsError {
    JsError::new(&format!("fluxledger: {context}: {error}"))
}

/// The JSON text of an export's result (the page reads it with `JSON.parse`).
///
/// Why text: one string crosses from wasm instead of every value one by one, and
/// the module carries no second serialiser next to [`json`] (see its docs).
fn to_json<T: Serialize + ?Sized>(value: &T) -> Result<String, JsError> {
    json::to_string(value).map_err(|e| adapter_error("could not convert the result", e))
}

/// Reads a plain object of strings; `undefined` and `null` read as empty.
fn string_map(value: JsValue, name: &str) -> Result<BTreeMap<String, String>, JsError> {
    if value.is_undefined() || value.is_null() {
        return Ok(BTreeMap::new());
    }
    serde_wasm_bindgen::from_value(value)
        .map_err(|e| adapter_error(&format!("`{name}` must be an object of strings keyed by field"), e))
}

/// The description of every calculator ([`view::CatalogView`]).
#[wasm_bindgen]
pub fn catalog() -> Result<String, JsError> {
    to_json(&view::catalog_view())
}

/// The description of calculator `key` ([`view::PageView`]).
///
/// # Errors
/// Throws for a key that is not a registered calculator.
#[wasm_bindgen]
pub fn calculator(key: &str) -> Result<String, JsError> {
    let page = view::page_view(key).ok_or_else(|| adapter_error("unknown calculator", format!("'{key}'")))?;
    to_json(&page)
}

/// A link's pairs (`[[key, value], ...]`) for page `page`, read in today's
/// vocabulary ([`view::upgrade_view`]): `{pairs, translations}`.
///
/// # Errors
/// Throws only when `pairs` is not an array of two-string arrays.
#[wasm_bindgen]
pub fn upgrade_link(page: &str, pairs: JsValue) -> Result<String, JsError> {
    let pairs: Vec<(String, String)> = serde_wasm_bindgen::from_value(pairs)
        .map_err(|e| adapter_error("`pairs` must be an array of [key, value] strings", e))?;
    to_json(&view::upgrade_view(page, &pairs))
}

/// Solves calculator `key` for what the user typed: the JSON text of the result
/// ([`view::SolveView`], written by [`json::to_string`]).
///
/// # Errors
/// Throws only for a wrong call: `inputs` or `field_units` not an object of strings,
/// or a `system` other than `"si"` or `"us"`. User errors are returned as `ok: false`.
#[wasm_bindgen]
pub fn solve(key: &str, inputs: JsValue, field_units: JsValue, system: &str) -> Result<String, JsError> {
    let system = UnitSystem::from_key(system)
        .ok_or_else(|| adapter_error("unknown unit system", format!("'{system}' (expected \"si\" or \"us\")")))?;
    let request = Request {
        inputs: string_map(inputs, "inputs")?,
        field_units: string_map(field_units, "field_units")?,
        system,
    };
    let outcome = fluxledger_core::solve(key, &request);
    let spec = calculators::spec(key);
    to_json(&view::solve_view(&outcome, spec.as_ref()))
}

/// Converts the text typed in quantity field `field` of calculator `key` (a bare
/// number is in `from_unit`) to the field's default unit in `system`.
///
/// # Errors
/// Throws only for a `system` other than `"si"` or `"us"`; text that cannot be
/// converted comes back as `{ok: false, message}`.
#[wasm_bindgen]
pub fn convert(key: &str, field: &str, text: &str, from_unit: &str, system: &str) -> Result<String, JsError> {
    let system = UnitSystem::from_key(system)
        .ok_or_else(|| adapter_error("unknown unit system", format!("'{system}' (expected \"si\" or \"us\")")))?;
    to_json(&view::convert_view(key, field, text, from_unit, system))
}

/// The CSV text of a table (`columns`: the headers, an array of strings, `rows`: an array of
/// arrays of strings): RFC 4180, CRLF line ends, every cell a spreadsheet would run
/// as a formula neutralised by [`csv::neutralise`].
///
/// # Errors
/// Throws only when `columns` or `rows` are not arrays of strings.
#[wasm_bindgen]
pub fn table_csv(columns: JsValue, rows: JsValue) -> Result<String, JsError> {
    let columns: Vec<String> = serde_wasm_bindgen::from_value(columns)
        .map_err(|e| adapter_error("`columns` must be an array of strings", e))?;
    let rows: Vec<Vec<String>> = serde_wasm_bindgen::from_value(rows)
        .map_err(|e| adapter_error("`rows` must be an array of arrays of strings", e))?;
    Ok(csv::table(&columns, &rows))
}

/// The CSV text of a table after a header block (`header`: an array of arrays of
/// strings, one line each), every cell neutralised ([`csv::traced`]).
///
/// # Errors
/// Throws only when the arguments are not arrays of strings.
#[wasm_bindgen]
pub fn table_csv_traced(header: JsValue, columns: JsValue, rows: JsValue) -> Result<String, JsError> {
    let header: Vec<Vec<String>> = serde_wasm_bindgen::from_value(header)
        .map_err(|e| adapter_error("`header` must be an array of arrays of strings", e))?;
    let columns: Vec<String> = serde_wasm_bindgen::from_value(columns)
        .map_err(|e| adapter_error("`columns` must be an array of strings", e))?;
    let rows: Vec<Vec<String>> = serde_wasm_bindgen::from_value(rows)
        .map_err(|e| adapter_error("`rows` must be an array of arrays of strings", e))?;
    Ok(csv::traced(&header, &columns, &rows))
}

/// The QR symbol of `text` ([`qr::QrView`]): `{ok, size, path, message}`.
///
/// # Errors
/// Throws only when the result cannot be converted.
#[wasm_bindgen]
pub fn qr_code(text: &str) -> Result<String, JsError> {
    to_json(&qr::qr_view(text))
}

#[derive(Serialize)]
struct SheetFieldsView {
    fields: Vec<(&'static str, &'static str)>,
    max_pins: usize,
}

/// The page-level keys of the calculation sheet and the pin limit, from the glossary.
///
/// # Errors
/// Throws only when the result cannot be converted.
#[wasm_bindgen]
pub fn sheet_fields() -> Result<String, JsError> {
    to_json(&SheetFieldsView {
        fields: fluxledger_core::glossary::SHEET_KEYS.to_vec(),
        max_pins: fluxledger_core::glossary::MAX_PINS,
    })
}

/// A headline result of the current case against a pinned case
/// ([`compare::difference_view`]): `{difference, ratio}`.
///
/// # Errors
/// Throws only when the result cannot be converted.
#[wasm_bindgen]
pub fn case_difference(pinned_si: f64, current_si: f64, unit: &str) -> Result<String, JsError> {
    to_json(&compare::difference_view(pinned_si, current_si, unit))
}
