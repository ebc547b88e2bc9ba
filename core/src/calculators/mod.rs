//! The calculators: one module per handbook page, each a small function that turns
//! validated inputs into a control volume, asks the engine for the balances and
//! reports what people need.
//!
//! A calculator is registered once in [`CALCULATORS`]; the catalog, the pages, the
//! wasm adapter and the reference tests all read that one list.
//!
//! A build may serve fewer: the functions ending in `_in` take the calculators
//! to serve (a slice of that list, or one page's entry from [`page`]), so that a
//! page's own wasm module links that page's code and no other. Titles stay
//! available for every page ([`title`]: text only, no code), for the links from one
//! result to the next page.

use crate::catalog::{self, CalculatorSpec, Detail, FieldEcho, Report, Request, Solution, Values};
use crate::error::{FieldError, SolveError};

pub mod anchor;
pub mod bend;
pub mod common;
pub mod dead_end;
pub mod jet_plate;
pub mod line_schedule;
pub mod nozzle;
pub mod profile;
pub mod reaction_arm;
pub mod reducer;
pub mod restrained_length;
pub mod runner;
pub mod surge;
pub mod tank_drain;
pub mod tee;
pub mod thrust_block;
pub mod vane;

/// One registered calculator.
#[derive(Clone, Copy)]
pub struct Calculator {
    pub key: &'static str,
    /// The page title (the spec's title, also kept here for [`title`]).
    pub title: &'static str,
    /// Builds the description (fields, outputs, cautions).
    pub spec: fn() -> CalculatorSpec,
    /// Computes from validated values, writing outputs, tables, diagrams, plots and
    /// warnings into the report. Errors name the field that makes the case impossible.
    pub compute: fn(&Values, &mut Report<'_>) -> Result<(), Vec<FieldError>>,
}

/// The body of every page's `compute`: read the values once into typed inputs,
/// solve the pure model, and write the report from the result.
fn read_solve_write<I, S, E, F>(
    values: &Values,
    report: &mut Report<'_>,
    read: impl FnOnce(&Values) -> Result<I, E>,
    solve: impl FnOnce(&I) -> Result<S, F>,
    write: impl FnOnce(&I, &S, &mut Report<'_>),
) -> Result<(), Vec<FieldError>>
where
    E: Into<Vec<FieldError>>,
    F: Into<Vec<FieldError>>,
{
    read_solve_write_refusing(values, report, read, solve, |refusal, _| refusal.into(), write)
}

/// [`read_solve_write`] for a model that refuses a case in its own terms: `refuse`
/// turns the refusal into field errors worded in the report's units.
fn read_solve_write_refusing<I, S, E, R>(
    values: &Values,
    report: &mut Report<'_>,
    read: impl FnOnce(&Values) -> Result<I, E>,
    solve: impl FnOnce(&I) -> Result<S, R>,
    refuse: impl FnOnce(R, &Report<'_>) -> Vec<FieldError>,
    write: impl FnOnce(&I, &S, &mut Report<'_>),
) -> Result<(), Vec<FieldError>>
where
    E: Into<Vec<FieldError>>,
{
    let inputs = read(values).map_err(Into::into)?;
    let solved = solve(&inputs).map_err(|refusal| refuse(refusal, report))?;
    write(&inputs, &solved, report);
    Ok(())
}

/// The entry of the calculator module `$page` (its `KEY`, `TITLE`, `spec` and
/// `compute`).
macro_rules! registered {
    ($page:ident) => {
        Calculator {
            key: $page::KEY,
            title: $page::TITLE,
            spec: $page::spec,
            compute: $page::compute,
        }
    };
}

/// Every calculator, in contents order.
pub const CALCULATORS: &[Calculator] = &[
    registered!(bend),
    registered!(reducer),
    registered!(dead_end),
    registered!(tee),
    registered!(anchor),
    registered!(nozzle),
    registered!(thrust_block),
    registered!(restrained_length),
    registered!(surge),
    registered!(line_schedule),
    registered!(jet_plate),
    registered!(vane),
    registered!(reaction_arm),
    registered!(runner),
    registered!(tank_drain),
    registered!(profile),
];

/// Every calculator's key and title, in contents order: text only, so a build
/// serving one page can still name the others (evaluated at compile time, it holds
/// no reference to their code).
pub const TITLES: [(&str, &str); CALCULATORS.len()] = {
    let mut titles = [("", ""); CALCULATORS.len()];
    let mut index = 0;
    while index < CALCULATORS.len() {
        titles[index] = (CALCULATORS[index].key, CALCULATORS[index].title);
        index += 1;
    }
    titles
};

/// The title of calculator `key`, registered or not in the build's own list.
pub fn title(key: &str) -> Option<&'static str> {
    TITLES.iter().find(|(k, _)| *k == key).map(|(_, title)| *title)
}

/// The registered calculator `key`, looked up at compile time: a page's own module
/// writes `static PAGE: [Calculator; 1] = [...]` from it (`fluxledger_wasm::page_module!`,
/// where a key that is not registered stops the build) and links that page's code
/// only. `None` for a key that is not registered.
pub const fn page(key: &str) -> Option<Calculator> {
    let mut index = 0;
    while index < CALCULATORS.len() {
        if same_text(CALCULATORS[index].key, key) {
            return Some(CALCULATORS[index]);
        }
        index += 1;
    }
    None
}

const fn same_text(a: &str, b: &str) -> bool {
    let (a, b) = (a.as_bytes(), b.as_bytes());
    if a.len() != b.len() {
        return false;
    }
    let mut index = 0;
    while index < a.len() {
        if a[index] != b[index] {
            return false;
        }
        index += 1;
    }
    true
}

/// The descriptions of all calculators.
pub fn catalog() -> Vec<CalculatorSpec> {
    catalog_in(CALCULATORS)
}

/// The descriptions of the calculators `served`.
pub fn catalog_in(served: &[Calculator]) -> Vec<CalculatorSpec> {
    served.iter().map(|c| (c.spec)()).collect()
}

/// The description of one calculator.
pub fn spec(key: &str) -> Option<CalculatorSpec> {
    spec_in(CALCULATORS, key)
}

/// The description of calculator `key` among those `served`.
pub fn spec_in(served: &[Calculator], key: &str) -> Option<CalculatorSpec> {
    served.iter().find(|c| c.key == key).map(|c| (c.spec)())
}

/// What solving returns: how each field was read (even when some are invalid), and
/// the solution or the errors.
#[derive(Clone, Debug, PartialEq)]
pub struct Outcome {
    pub echoes: Vec<FieldEcho>,
    pub result: Result<Solution, SolveError>,
}

/// Solves calculator `key` for a request of typed strings.
///
/// # Errors
/// [`SolveError::UnknownCalculator`] for an unknown key; [`SolveError::Fields`] with
/// every invalid field, each naming the field, what is wrong and the valid range.
pub fn solve(key: &str, request: &Request) -> Outcome {
    solve_in(CALCULATORS, key, request)
}

/// [`solve`] among the calculators `served`: a key not among them is
/// [`SolveError::UnknownCalculator`].
pub fn solve_in(served: &[Calculator], key: &str, request: &Request) -> Outcome {
    solve_in_with(served, key, request, Detail::Full)
}

/// [`solve_in`] building only what `detail` asks for: a [`Detail::Headline`]
/// solution has no tables, diagrams or plots, and everything else equal to the
/// full solution's.
pub fn solve_in_with(served: &[Calculator], key: &str, request: &Request, detail: Detail) -> Outcome {
    let Some(calculator) = served.iter().find(|c| c.key == key) else {
        return Outcome {
            echoes: Vec::new(),
            result: Err(SolveError::UnknownCalculator { key: key.to_string() }),
        };
    };
    let spec = (calculator.spec)();
    let (echoes, values) = catalog::validate(&spec, request);
    let result = match values {
        Err(errors) => Err(SolveError::Fields(errors)),
        Ok(values) => {
            let mut report = Report::with_detail(&spec, request.system, detail);
            match (calculator.compute)(&values, &mut report) {
                Ok(()) => Ok(report.finish()),
                Err(errors) => Err(SolveError::Fields(errors)),
            }
        }
    };
    Outcome { echoes, result }
}

/// Helpers for the calculators' own tests: solve a page's demo inputs with some
/// fields replaced, and read the solution or the first field error.
#[cfg(test)]
pub(crate) mod testing {
    use crate::catalog::{self, Solution};
    use crate::SolveError;

    /// The helpers of one page's tests, bound to its key: `request`, `outcome`,
    /// `solved`, `first_error` and `error_field` as below, taking only the pairs.
    macro_rules! page_helpers {
        ($key:expr) => {
            #[allow(dead_code)]
            fn request(pairs: &[(&str, &str)]) -> $crate::catalog::Request {
                $crate::calculators::testing::request($key, pairs)
            }
            #[allow(dead_code)]
            fn outcome(pairs: &[(&str, &str)]) -> $crate::Outcome {
                $crate::calculators::testing::outcome($key, pairs)
            }
            #[allow(dead_code)]
            fn solved(pairs: &[(&str, &str)]) -> $crate::catalog::Solution {
                $crate::calculators::testing::solved($key, pairs)
            }
            #[allow(dead_code)]
            fn first_error(pairs: &[(&str, &str)]) -> (String, String) {
                $crate::calculators::testing::first_error($key, pairs)
            }
            #[allow(dead_code)]
            fn error_field(pairs: &[(&str, &str)]) -> String {
                $crate::calculators::testing::error_field($key, pairs)
            }
        };
    }
    pub(crate) use page_helpers;

    /// The demo request of calculator `key` with `pairs` replaced.
    pub fn request(key: &str, pairs: &[(&str, &str)]) -> catalog::Request {
        let spec = super::spec(key).unwrap_or_else(|| panic!("no calculator '{key}'"));
        catalog::demo_request(&spec, pairs)
    }

    /// Solves calculator `key` from its demo inputs with `pairs` replaced.
    pub fn outcome(key: &str, pairs: &[(&str, &str)]) -> super::Outcome {
        super::solve(key, &request(key, pairs))
    }

    /// The solution, failing the test with the errors when there is none.
    pub fn solved(key: &str, pairs: &[(&str, &str)]) -> Solution {
        match outcome(key, pairs).result {
            Ok(solution) => solution,
            Err(e) => panic!("expected a solution, got {e}"),
        }
    }

    /// The page a solution carries its result to, solved from that page's demo
    /// inputs with the carried ones replaced; with the carried inputs for asserts.
    pub fn carried(solution: &Solution) -> (Solution, Vec<(&'static str, String)>) {
        let carry = &solution.carry_over[0];
        let pairs: Vec<(&str, &str)> = carry.inputs.iter().map(|(k, v)| (*k, v.as_str())).collect();
        (solved(carry.calculator, &pairs), carry.inputs.clone())
    }

    /// The first field error's field key and message, failing the test on a solution.
    pub fn first_error(key: &str, pairs: &[(&str, &str)]) -> (String, String) {
        match outcome(key, pairs).result {
            Err(SolveError::Fields(errors)) => (errors[0].field.clone(), errors[0].kind.to_string()),
            other => panic!("expected a field error, got {other:?}"),
        }
    }

    /// The first field error's field key.
    pub fn error_field(key: &str, pairs: &[(&str, &str)]) -> String {
        first_error(key, pairs).0
    }

    /// Fails unless every field key of page `key` is a glossary term that is not a
    /// retired key of the page, every choice offers only the term's options, and
    /// every retired key of the page lands on one of its fields (its renamed values
    /// on that field's options): old links then read as today's.
    pub fn assert_glossary_keys(key: &str) {
        use crate::catalog::FieldKind;
        use crate::glossary::{term_of, KEY_ALIASES};
        let spec = super::spec(key).unwrap_or_else(|| panic!("no calculator '{key}'"));
        let options = |field: &str| match spec.field(field).map(|f| &f.kind) {
            Some(FieldKind::Choice(options)) => options.iter().map(|o| o.key).collect(),
            _ => Vec::new(),
        };
        for field in &spec.fields {
            let term = term_of(field.key).unwrap_or_else(|| panic!("{key}: '{}' is not in the glossary", field.key));
            let retired = KEY_ALIASES.iter().any(|a| a.page == key && a.old == field.key);
            assert!(!retired, "{key}: '{}' is a retired key", field.key);
            if !term.options.is_empty() {
                for option in options(field.key) {
                    assert!(
                        term.options.contains(&option),
                        "{key}: option {option} of '{}' is not in the glossary",
                        field.key
                    );
                }
            }
        }
        for alias in KEY_ALIASES.iter().filter(|a| a.page == key) {
            assert!(
                spec.field(alias.new).is_some(),
                "{key}: old key {} lands on no field ({})",
                alias.old,
                alias.new
            );
            for (old, new) in alias.values {
                assert!(
                    options(alias.new).contains(new),
                    "{key}: {}={old} lands on no option of '{}'",
                    alias.old,
                    alias.new
                );
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The page sends only the fields that hold text (and the units of those): a
    /// field not sent must read exactly as a field sent empty, in every
    /// calculator, both unit systems, with a field blanked or given.
    #[test]
    fn a_field_not_sent_reads_as_a_field_sent_empty() {
        use crate::catalog::{default_unit, demo_request, FieldKind};
        use crate::UnitSystem;
        for calculator in CALCULATORS {
            let spec = (calculator.spec)();
            let blanked = spec.fields.iter().find(|f| !f.demo.is_empty()).map(|f| f.key);
            let blanked = blanked.unwrap_or_else(|| panic!("{}: no demo value to blank", spec.key));
            let variants: [&[(&str, &str)]; 2] = [&[], &[(blanked, "")]];
            for system in [UnitSystem::Si, UnitSystem::UsCustomary] {
                for overrides in variants {
                    let mut sent = demo_request(&spec, overrides);
                    sent.system = system;
                    // As the page sends it: every field, empty ones as "", and the
                    // unit its selector shows for every quantity.
                    let mut every = sent.clone();
                    for field in &spec.fields {
                        every.inputs.entry(field.key.to_string()).or_default();
                        if let FieldKind::Quantity(_) = field.kind {
                            every
                                .field_units
                                .insert(field.key.to_string(), default_unit(field, system).to_string());
                        }
                    }
                    // As it sends it now: the fields with text, and their units.
                    sent.inputs.retain(|_, value| !value.is_empty());
                    sent.field_units = every
                        .field_units
                        .iter()
                        .filter(|(key, _)| sent.inputs.contains_key(*key))
                        .map(|(key, unit)| (key.clone(), unit.clone()))
                        .collect();
                    if !overrides.is_empty() {
                        assert!(
                            sent.inputs.len() < every.inputs.len(),
                            "{}: no field left out",
                            spec.key
                        );
                    }
                    assert_eq!(
                        solve(spec.key, &sent),
                        solve(spec.key, &every),
                        "{} ({system:?}, {overrides:?})",
                        spec.key
                    );
                }
            }
        }
    }

    #[test]
    fn every_page_is_found_by_its_key_with_its_spec_title() {
        for calculator in CALCULATORS {
            let found = page(calculator.key).expect("registered");
            assert_eq!(found.key, calculator.key);
            assert_eq!((found.spec)().key, calculator.key);
            assert_eq!((found.spec)().title, calculator.title, "{}", calculator.key);
            assert_eq!(title(calculator.key), Some(calculator.title));
        }
        assert_eq!(title("no-such-page"), None);
        assert!(page("no-such-page").is_none());
        assert_eq!(TITLES.len(), CALCULATORS.len());
    }

    #[test]
    fn a_page_served_alone_solves_its_own_key_and_refuses_the_others() {
        static BEND_ONLY: [Calculator; 1] = [page("bend").expect("registered")];
        let request = catalog::demo_request(&bend::spec(), &[]);
        let alone = solve_in(&BEND_ONLY, "bend", &request);
        assert_eq!(alone, solve("bend", &request));
        assert!(alone.result.is_ok());
        let tee = catalog::demo_request(&tee::spec(), &[]);
        assert!(matches!(
            solve_in(&BEND_ONLY, tee::KEY, &tee).result,
            Err(SolveError::UnknownCalculator { ref key }) if key == tee::KEY
        ));
        assert!(solve(tee::KEY, &tee).result.is_ok());
        assert!(spec_in(&BEND_ONLY, tee::KEY).is_none());
        assert_eq!(catalog_in(&BEND_ONLY).len(), 1);
    }
}
