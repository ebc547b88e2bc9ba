//! The only crate that knows about JavaScript: a thin wasm-bindgen adapter over
//! `fluxledger-core`.
//!
//! A key design decision: this crate holds no physics, no defaults and no unit
//! tables. Every export is `from_value` (or, for a form, [`fields_text`]) → core
//! call → JSON text; the wire shapes are
//! the serialisable mirrors in [`view`], built by pure functions that are tested
//! natively. Every export that answers with a value (every one in the list below)
//! answers with its JSON text,
//! written by [`json`] and read by the page with `JSON.parse` (one string crosses
//! from wasm instead of every value one by one, and the module carries one
//! serialiser; `serde-wasm-bindgen` reads only the verification page's case). The page script
//! calls these functions:
//!
//! - [`calculator`]`(key)` — the description of one calculator (its fields with
//!   their units `{id, label}`, default unit per system and the chain of conditions
//!   under which each is shown; outputs; cautions), with the version and the unit
//!   systems: what a calculator page asks for.
//! - [`upgrade_link`]`(page, pairs)` — a link's `[key, value]` pairs (the JSON text
//!   of the array, see [`fields_text`]) read in today's vocabulary through the
//!   core's glossary, `{pairs, translations}`; the page runs every link through it
//!   before reading fields and reports the translations.
//! - `solve_headline(key, inputs, field_units, system)` — as `solve`, without
//!   the tables, diagrams and plots (`{ok: true, headline_only: true, echoes,
//!   outputs, warnings, carry_over}`, [`view::Detail::Headline`]): what the page
//!   asks for on a keystroke while they are all off screen.
//! - [`convert`]`(key, field, text, from_unit, system)` — what is typed in a
//!   quantity field, converted to that field's default unit in `system` (used when
//!   the page's unit system is switched) and rounded by the core to one figure more
//!   than was typed, at least four (`7 bar` → `101.5` psi): `{ok: true, number,
//!   unit}` or `{ok: false, message}`; it never throws for what a user typed.
//! - [`solve`]`(key, inputs, field_units, system)` — the JSON text of the result
//!   (the page reads it with `JSON.parse`: one string crosses from wasm instead of
//!   every value one by one, see [`json`]); `inputs` and `field_units` (the
//!   unit each selector shows) are the JSON text of plain objects of strings keyed
//!   by field key (`JSON.stringify`: two strings cross into wasm, not every key
//!   and value one by one, see [`fields_text`]), `system` is `"si"` or `"us"`. Outputs travel as `{number, unit, text, shown}`,
//!   table cells as `{text, number, unit, shown}` with per-column `{title, unit,
//!   kind}`, so the page takes no text apart. It never throws for
//!   anything a user typed: invalid input comes back as `{ok: false, errors: [...]}`.
//!   It throws only when the script calls it wrongly (values that are not strings,
//!   an unknown unit system), through the one helper [`adapter_error`].
//! - [`table_csv_traced`]`(header, columns, rows)` — the CSV text of a result table
//!   after a header block that traces it, every cell a spreadsheet would run as a
//!   formula neutralised (see [`csv`]); the three are JSON text of arrays of
//!   strings, read by [`fields_text`].
//! - [`qr_code`]`(text)`, [`sheet_fields`]`()`, [`case_difference`]`(pinned_si,
//!   current_si, unit)` — the printed sheet's QR symbol, its page-level keys, and
//!   a headline of the current case against a pinned one.
//!
//! Only the verification page's `verify_case` takes a JavaScript value (a case
//! object, read with `serde-wasm-bindgen`); every page module's argument is a
//! string or a number, so its module carries no reader of JavaScript values.
//!
//! # One module per page
//! Every calculator page loads a module of its own that links only its calculator:
//! on a phone's first visit with a link, the module is the longest download (issue
//! 9: the module of every page was about 290 kB Brotli, the bend page's own is about
//! 114 kB). The exports are therefore not written in this library but by each
//! module's crate, through [`calculator_exports`] over the calculators it serves
//! (a page's: [`page_module`], its one entry found at compile time by
//! [`page`]; the verification page's: every calculator, with [`verify_exports`]).
//! The functions here take those calculators as `served`. The modules are the
//! example targets `module-<page key>`, `module-verify` and `module-offline`
//! (`wasm/modules/`),
//! because Cargo builds examples as cdylibs, all in one
//! `cargo build --examples`; this library itself is an rlib only. Every calculator
//! page's module has the same exports, so one glue serves them all.
//!
//! The offline copy stores one module, not every page's: `module-offline` serves
//! every calculator through the same exports as a page's module, and the service
//! worker answers a page's module request with it when the network is gone. It
//! may stand in for a page's own module because every export looks its calculator
//! up by key and nothing else depends on what else is served; the test
//! `the_offline_module_answers_every_page_as_its_own_module_does` holds that.
//!
//! Values go out as JSON text through [`json`] (the same shapes `serde_json` would
//! write: `None` is `null`, maps are plain objects). What dropping
//! `serde-wasm-bindgen`'s serialiser saved is measured in DEVELOPERS.md ("Module
//! size").
//!
//! # Allocator
//! Every module allocates with Talc (`talc`'s allocator for single-threaded
//! WebAssembly, which grows the module's memory as needed) instead of the standard
//! library's dlmalloc: its code is smaller (the bend page's module 2 kB Brotli
//! less, measured in DEVELOPERS.md, "Module size"). Native builds (the tests, the
//! site tool) keep the system's allocator.

pub mod compare;
pub mod csv;
pub mod fields_text;
pub mod json;
pub mod qr;
pub mod verify;
pub mod view;

use std::collections::BTreeMap;
use std::fmt::Display;

use serde::Serialize;
use wasm_bindgen::prelude::*;

pub use wasm_bindgen;

#[cfg(all(target_family = "wasm", not(target_feature = "atomics")))]
#[global_allocator]
static ALLOCATOR: talc::wasm::WasmDynamicTalc = talc::wasm::new_wasm_dynamic_allocator();

use fluxledger_core::calculators;
/// What a module serves, and how a page's module finds its calculator.
pub use fluxledger_core::calculators::{page, Calculator, CALCULATORS};
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

/// Reads the JSON text of a flat object of strings ([`fields_text`]).
fn string_map(text: &str, name: &str) -> Result<BTreeMap<String, String>, JsError> {
    fields_text::read_string_map(text).map_err(|e| {
        adapter_error(
            &format!("`{name}` must be the JSON text of an object of strings keyed by field"),
            e,
        )
    })
}

/// The description of calculator `key` ([`view::PageView`]).
///
/// # Errors
/// Throws for a key that is not a registered calculator.
pub fn calculator(served: &[Calculator], key: &str) -> Result<String, JsError> {
    let page = view::page_view(served, key).ok_or_else(|| adapter_error("unknown calculator", format!("'{key}'")))?;
    to_json(&page)
}

/// A link's pairs (the JSON text of `[[key, value], ...]`, see [`fields_text`])
/// for page `page`, read in today's vocabulary ([`view::upgrade_view`]):
/// `{pairs, translations}`.
///
/// # Errors
/// Throws only when `pairs` is not the JSON text of an array of two-string arrays.
pub fn upgrade_link(served: &[Calculator], page: &str, pairs: &str) -> Result<String, JsError> {
    const SHAPE: &str = "`pairs` must be the JSON text of an array of [key, value] strings";
    let lists = fields_text::read_string_lists(pairs).map_err(|e| adapter_error(SHAPE, e))?;
    let mut read = Vec::with_capacity(lists.len());
    for (at, list) in lists.into_iter().enumerate() {
        let Ok([key, value]) = <[String; 2]>::try_from(list) else {
            return Err(adapter_error(SHAPE, format!("item {at} is not two strings")));
        };
        read.push((key, value));
    }
    to_json(&view::upgrade_view(served, page, &read))
}

/// Solves calculator `key` (one of those `served`) for what the user typed: the JSON
/// text of the result ([`view::SolveView`], written by [`json::to_string`]) with
/// `detail` (the export `solve` asks for [`view::Detail::Full`], `solve_headline`
/// for [`view::Detail::Headline`]).
///
/// # Errors
/// Throws only for a wrong call: `inputs` or `field_units` not the JSON text of an
/// object of strings, or a `system` other than `"si"` or `"us"`. User errors are
/// returned as `ok: false`.
pub fn solve(
    served: &[Calculator],
    key: &str,
    inputs: &str,
    field_units: &str,
    system: &str,
    detail: view::Detail,
) -> Result<String, JsError> {
    let system = UnitSystem::from_key(system)
        .ok_or_else(|| adapter_error("unknown unit system", format!("'{system}' (expected \"si\" or \"us\")")))?;
    let request = Request {
        inputs: string_map(inputs, "inputs")?,
        field_units: string_map(field_units, "field_units")?,
        system,
    };
    let outcome = calculators::solve_in_with(served, key, &request, detail);
    let spec = calculators::spec_in(served, key);
    to_json(&view::solve_view_with(&outcome, spec.as_ref(), detail))
}

/// Converts the text typed in quantity field `field` of calculator `key` (a bare
/// number is in `from_unit`) to the field's default unit in `system`.
///
/// # Errors
/// Throws only for a `system` other than `"si"` or `"us"`; text that cannot be
/// converted comes back as `{ok: false, message}`.
pub fn convert(
    served: &[Calculator],
    key: &str,
    field: &str,
    text: &str,
    from_unit: &str,
    system: &str,
) -> Result<String, JsError> {
    let system = UnitSystem::from_key(system)
        .ok_or_else(|| adapter_error("unknown unit system", format!("'{system}' (expected \"si\" or \"us\")")))?;
    to_json(&view::convert_view(served, key, field, text, from_unit, system))
}

/// The CSV text of a table after a header block, every cell neutralised
/// ([`csv::traced`]). Each argument is JSON text (see [`fields_text`]): `header`
/// an array of arrays of strings (one line each), `columns` an array of strings
/// (the headers), `rows` an array of arrays of strings.
///
/// # Errors
/// Throws only when an argument is not JSON text of that shape.
pub fn table_csv_traced(header: &str, columns: &str, rows: &str) -> Result<String, JsError> {
    let lists = |text: &str, name: &str| {
        fields_text::read_string_lists(text).map_err(|e| {
            adapter_error(
                &format!("`{name}` must be the JSON text of an array of arrays of strings"),
                e,
            )
        })
    };
    let header = lists(header, "header")?;
    let columns = fields_text::read_string_list(columns)
        .map_err(|e| adapter_error("`columns` must be the JSON text of an array of strings", e))?;
    let rows = lists(rows, "rows")?;
    Ok(csv::traced(&header, &columns, &rows))
}

/// The QR symbol of `text` ([`qr::QrView`]): `{ok, size, path, message}`.
///
/// # Errors
/// Throws only when the result cannot be converted.
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
pub fn case_difference(pinned_si: f64, current_si: f64, unit: &str) -> Result<String, JsError> {
    to_json(&compare::difference_view(pinned_si, current_si, unit))
}

/// The exports of a calculator page's module, over the calculators it serves
/// (`$served`, a `&'static [Calculator]`): `calculator`, `upgrade_link`,
/// `solve`, `solve_headline`, `convert`, `table_csv_traced`, `qr_code`, `sheet_fields`
/// and `case_difference`, each the function of this crate of the same name
/// (`solve_headline`: [`solve`] with [`view::Detail::Headline`]).
///
/// The exports are written by the module's own crate (`wasm/modules/`), not here:
/// a module then links only the calculators it names. Every module has the same
/// exports, so wasm-bindgen writes the same glue for all of them (the site build
/// checks that). The invoking crate needs `wasm-bindgen` among its dependencies.
#[macro_export]
macro_rules! calculator_exports {
    ($served:expr) => {
        #[wasm_bindgen::prelude::wasm_bindgen]
        pub fn calculator(key: &str) -> Result<String, wasm_bindgen::JsError> {
            $crate::calculator($served, key)
        }

        #[wasm_bindgen::prelude::wasm_bindgen]
        pub fn upgrade_link(page: &str, pairs: &str) -> Result<String, wasm_bindgen::JsError> {
            $crate::upgrade_link($served, page, pairs)
        }

        #[wasm_bindgen::prelude::wasm_bindgen]
        pub fn solve(
            key: &str,
            inputs: &str,
            field_units: &str,
            system: &str,
        ) -> Result<String, wasm_bindgen::JsError> {
            $crate::solve(
                $served,
                key,
                inputs,
                field_units,
                system,
                $crate::view::Detail::Full,
            )
        }

        #[wasm_bindgen::prelude::wasm_bindgen]
        pub fn solve_headline(
            key: &str,
            inputs: &str,
            field_units: &str,
            system: &str,
        ) -> Result<String, wasm_bindgen::JsError> {
            $crate::solve(
                $served,
                key,
                inputs,
                field_units,
                system,
                $crate::view::Detail::Headline,
            )
        }

        #[wasm_bindgen::prelude::wasm_bindgen]
        pub fn convert(
            key: &str,
            field: &str,
            text: &str,
            from_unit: &str,
            system: &str,
        ) -> Result<String, wasm_bindgen::JsError> {
            $crate::convert($served, key, field, text, from_unit, system)
        }

        #[wasm_bindgen::prelude::wasm_bindgen]
        pub fn table_csv_traced(header: &str, columns: &str, rows: &str) -> Result<String, wasm_bindgen::JsError> {
            $crate::table_csv_traced(header, columns, rows)
        }

        #[wasm_bindgen::prelude::wasm_bindgen]
        pub fn qr_code(text: &str) -> Result<String, wasm_bindgen::JsError> {
            $crate::qr_code(text)
        }

        #[wasm_bindgen::prelude::wasm_bindgen]
        pub fn sheet_fields() -> Result<String, wasm_bindgen::JsError> {
            $crate::sheet_fields()
        }

        #[wasm_bindgen::prelude::wasm_bindgen]
        pub fn case_difference(pinned_si: f64, current_si: f64, unit: &str) -> Result<String, wasm_bindgen::JsError> {
            $crate::case_difference(pinned_si, current_si, unit)
        }
    };
}

/// The module of one calculator page: [`calculator_exports`] over that page's
/// calculator alone, found by its key at compile time ([`calculators::page`]); a
/// key that is not registered is a compile error.
#[macro_export]
macro_rules! page_module {
    ($key:literal) => {
        // Evaluated at compile time: a key that is not registered stops the build.
        static SERVED: [$crate::Calculator; 1] = [match $crate::page($key) {
            Some(calculator) => calculator,
            None => panic!(concat!("no calculator is registered under the key ", $key)),
        }];
        $crate::calculator_exports!(&SERVED);
    };
}

/// The export `verify_case` ([`verify::verify_case`]) of the verification page's
/// module, which serves every calculator.
#[macro_export]
macro_rules! verify_exports {
    () => {
        #[wasm_bindgen::prelude::wasm_bindgen]
        pub fn verify_case(case: wasm_bindgen::JsValue) -> Result<String, wasm_bindgen::JsError> {
            $crate::verify::verify_case(case)
        }
    };
}

#[cfg(test)]
mod tests {
    use super::CALCULATORS;

    /// Every calculator page has its module target, and every module target serves
    /// a registered page (or is the verification page's): the site build asks cargo
    /// for `module-<key>` of each page.
    #[test]
    fn every_page_has_its_own_module_target() {
        let manifest = include_str!("../Cargo.toml");
        let targets: Vec<&str> = manifest
            .lines()
            .filter_map(|line| line.strip_prefix("name = \"module-")?.strip_suffix('"'))
            .collect();
        let mut expected: Vec<&str> = CALCULATORS.iter().map(|c| c.key).collect();
        expected.extend(["verify", "offline"]);
        let (mut found, mut wanted) = (targets.clone(), expected.clone());
        found.sort_unstable();
        wanted.sort_unstable();
        assert_eq!(found, wanted, "module targets in wasm/Cargo.toml");
        for key in CALCULATORS.iter().map(|c| c.key) {
            let path = format!("{}/modules/{key}.rs", env!("CARGO_MANIFEST_DIR"));
            let source = std::fs::read_to_string(&path).unwrap_or_else(|e| panic!("{path}: {e}"));
            assert!(
                source.contains(&format!("fluxledger_wasm::page_module!(\"{key}\");")),
                "{path} does not build the module of page '{key}'"
            );
            assert!(manifest.contains(&format!("path = \"modules/{key}.rs\"")), "{key}");
        }
        let offline = include_str!("../modules/offline.rs");
        assert!(offline.contains("fluxledger_wasm::calculator_exports!(fluxledger_wasm::CALCULATORS);"));
        assert!(
            !offline.contains("verify_exports"),
            "the offline module has a page's exports only"
        );
    }

    /// A headline solve's view (what `solve_headline` returns) carries exactly what
    /// a full solve's view carries, tables, diagrams and plots aside: for each
    /// calculator's demo in both unit systems, and for a request it refuses (then
    /// the two are the same text). The fuzz test compares the two solves' outcomes
    /// over generated requests.
    #[test]
    fn the_headline_view_is_the_full_view_without_its_tables_diagrams_and_plots() {
        use super::{json, view, Request};
        use fluxledger_core::catalog::demo_request;
        use fluxledger_core::{calculators, UnitSystem};
        use view::{Detail, SolveView};

        fn text<T: serde::Serialize>(value: &T) -> String {
            json::to_string(value).expect("a view writes as JSON")
        }

        for page in CALCULATORS {
            let key = page.key;
            let spec = calculators::spec(key).expect("registered");
            for system in [UnitSystem::Si, UnitSystem::UsCustomary] {
                let request = Request {
                    system,
                    ..demo_request(&spec, &[])
                };
                let full = view::solve_view_with(&calculators::solve(key, &request), Some(&spec), Detail::Full);
                let headline = view::solve_view_with(
                    &calculators::solve_in_with(CALCULATORS, key, &request, Detail::Headline),
                    Some(&spec),
                    Detail::Headline,
                );
                let (SolveView::Solved(full), SolveView::Headline(headline)) = (&full, &headline) else {
                    panic!(
                        "{key}, {system:?}: the demo solves in both views: {:.200}",
                        text(&headline)
                    );
                };
                assert!(headline.ok && headline.headline_only, "{key}");
                assert_eq!(text(&headline.echoes), text(&full.echoes), "{key}, {system:?}: echoes");
                assert_eq!(
                    text(&headline.outputs),
                    text(&full.outputs),
                    "{key}, {system:?}: outputs"
                );
                assert_eq!(
                    text(&headline.warnings),
                    text(&full.warnings),
                    "{key}, {system:?}: warnings"
                );
                assert_eq!(
                    text(&headline.carry_over),
                    text(&full.carry_over),
                    "{key}, {system:?}: links to a next calculator"
                );
                let written = text(&view::SolveView::Headline(headline.clone()));
                for left_out in ["\"tables\"", "\"diagrams\"", "\"plots\""] {
                    assert!(
                        !written.contains(left_out),
                        "{key}: the headline view writes {left_out}"
                    );
                }
            }
            // A value no quantity field accepts: the same refusal in both views (in
            // the first field whose refusal stops the solve; some are shown only
            // under a condition).
            let refused = spec
                .fields
                .iter()
                .filter(|f| !f.si_unit.is_empty() && !f.demo.is_empty())
                .map(|f| demo_request(&spec, &[(f.key, "not a number")]))
                .find(|request| calculators::solve(key, request).result.is_err());
            let Some(request) = refused else {
                panic!("{key}: no quantity field refuses \"not a number\"");
            };
            let headline = calculators::solve_in_with(CALCULATORS, key, &request, Detail::Headline);
            assert_eq!(
                text(&view::solve_view_with(&headline, Some(&spec), Detail::Headline)),
                text(&view::solve_view_with(
                    &calculators::solve(key, &request),
                    Some(&spec),
                    Detail::Full
                )),
                "{key}: a refused request"
            );
        }
    }

    /// The offline module stands in for every page's own module: for each page, what
    /// it describes and computes is the same text whether its module serves that
    /// page alone or every calculator (the page's demo in both unit systems, a
    /// field's conversion, and its demo link read through the glossary).
    #[test]
    fn the_offline_module_answers_every_page_as_its_own_module_does() {
        use super::{json, view, Calculator, Request};
        use fluxledger_core::catalog::demo_request;
        use fluxledger_core::{calculators, UnitSystem};

        fn text<T: serde::Serialize>(value: &T) -> String {
            json::to_string(value).expect("a view writes as JSON")
        }

        for page in CALCULATORS {
            let own = std::slice::from_ref(page);
            let key = page.key;
            assert_eq!(
                text(&view::page_view(own, key)),
                text(&view::page_view(CALCULATORS, key)),
                "{key}: page description"
            );
            let spec = calculators::spec(key).expect("registered");
            for system in [UnitSystem::Si, UnitSystem::UsCustomary] {
                let request = Request {
                    system,
                    ..demo_request(&spec, &[])
                };
                let solved = |served: &[Calculator]| {
                    let outcome = calculators::solve_in(served, key, &request);
                    text(&view::solve_view(&outcome, calculators::spec_in(served, key).as_ref()))
                };
                let alone = solved(own);
                assert!(
                    alone.starts_with("{\"ok\":true"),
                    "{key}: the demo solves: {alone:.200}"
                );
                assert_eq!(alone, solved(CALCULATORS), "{key}: demo result, {system:?}");
            }
            let pairs: Vec<(String, String)> = spec
                .fields
                .iter()
                .filter(|f| !f.demo.is_empty())
                .map(|f| (f.key.to_string(), f.demo.to_string()))
                .chain([("units".to_string(), "us".to_string())])
                .collect();
            assert_eq!(
                text(&view::upgrade_view(own, key, &pairs)),
                text(&view::upgrade_view(CALCULATORS, key, &pairs)),
                "{key}: link reading"
            );
            if let Some(field) = spec.fields.iter().find(|f| !f.si_unit.is_empty()) {
                let converted = |served: &[Calculator]| {
                    text(&view::convert_view(
                        served,
                        key,
                        field.key,
                        "12",
                        "",
                        UnitSystem::UsCustomary,
                    ))
                };
                assert_eq!(
                    converted(own),
                    converted(CALCULATORS),
                    "{key}: conversion of {}",
                    field.key
                );
            }
        }
    }
}
