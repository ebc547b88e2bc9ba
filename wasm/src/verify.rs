//! The live verification page's one export: [`verify_case`] runs one sourced
//! reference case through the core's case runner
//! (`fluxledger_core::verification::verify`, the same one the native test driver
//! uses) and returns its verdict. No physics and no tolerance rule here: this file
//! only turns the case as the site embedded it into the core's `CaseData` and the
//! core's `Verdict` into a plain object.
//!
//! Case shape (as `site/src/verify.rs` writes it): `{calculator | function, system,
//! inputs: {key: text}, units: {key: unit}, expected: [{output, value, rel_tol |
//! abs}], expect_error: {field, contains} | null}`.
//!
//! Verdict shape: `{agrees, problem, faults: [..], errors: [{field, message}],
//! outputs: [{output, expected, tolerance, computed, relative_error, agrees,
//! problem}], refusal: {field, contains, agrees} | null}`.

use std::collections::BTreeMap;

use serde::{Deserialize, Serialize};
use wasm_bindgen::prelude::*;

use fluxledger_core::verification::{self, CaseData, ExpectError, Expected, Target, Tolerance, Verdict};
use fluxledger_core::UnitSystem;

use crate::{adapter_error, to_json};

/// One expected output as embedded in the page.
#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ExpectedWire {
    pub output: String,
    pub value: String,
    #[serde(default)]
    pub rel_tol: Option<f64>,
    #[serde(default)]
    pub abs: Option<String>,
}

/// An expected refusal as embedded in the page.
#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ExpectErrorWire {
    pub field: String,
    #[serde(default)]
    pub contains: Option<String>,
}

/// A case as embedded in the page.
#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
pub struct CaseWire {
    #[serde(default)]
    pub calculator: Option<String>,
    #[serde(default)]
    pub function: Option<String>,
    pub system: String,
    #[serde(default)]
    pub inputs: BTreeMap<String, String>,
    #[serde(default)]
    pub units: BTreeMap<String, String>,
    #[serde(default)]
    pub expected: Vec<ExpectedWire>,
    #[serde(default)]
    pub expect_error: Option<ExpectErrorWire>,
}

impl CaseWire {
    /// The core's case, or what is wrong with the embedded one.
    pub fn into_case(self) -> Result<CaseData, String> {
        let target = match (self.calculator, self.function) {
            (Some(key), None) => Target::Calculator(key),
            (None, Some(name)) => Target::Function(name),
            _ => return Err("a case names either `calculator` or `function`".into()),
        };
        let system = UnitSystem::from_key(&self.system)
            .ok_or_else(|| format!("unknown unit system '{}' (expected \"si\" or \"us\")", self.system))?;
        let mut expected = Vec::with_capacity(self.expected.len());
        for e in self.expected {
            let tolerance = match (e.rel_tol, e.abs) {
                (Some(rel), None) => Tolerance::Relative(rel),
                (None, Some(abs)) => Tolerance::Absolute(abs),
                _ => return Err(format!("expected '{}': give `rel_tol` or `abs`", e.output)),
            };
            expected.push(Expected {
                output: e.output,
                value: e.value,
                tolerance,
                note: None,
            });
        }
        Ok(CaseData {
            target,
            system,
            inputs: self.inputs,
            units: self.units,
            expected,
            expect_error: self.expect_error.map(|e| ExpectError {
                field: e.field,
                contains: e.contains,
            }),
        })
    }
}

#[derive(Serialize, Debug, PartialEq)]
pub struct FieldErrorView {
    pub field: String,
    pub message: String,
}

#[derive(Serialize, Debug, PartialEq)]
pub struct OutputView {
    pub output: String,
    pub expected: String,
    pub tolerance: String,
    pub computed: Option<String>,
    pub relative_error: Option<f64>,
    pub agrees: bool,
    pub problem: Option<String>,
}

#[derive(Serialize, Debug, PartialEq)]
pub struct RefusalView {
    pub field: String,
    pub contains: Option<String>,
    pub agrees: bool,
}

/// The verdict as the page receives it.
#[derive(Serialize, Debug, PartialEq)]
pub struct VerdictView {
    pub agrees: bool,
    pub problem: Option<String>,
    pub faults: Vec<String>,
    pub errors: Vec<FieldErrorView>,
    pub outputs: Vec<OutputView>,
    pub refusal: Option<RefusalView>,
}

/// The wire shape of a verdict (pure; tested natively).
pub fn verdict_view(verdict: &Verdict) -> VerdictView {
    VerdictView {
        agrees: verdict.agrees(),
        problem: verdict.problem.clone(),
        faults: verdict.faults.clone(),
        errors: verdict
            .errors
            .iter()
            .map(|(field, message)| FieldErrorView {
                field: field.clone(),
                message: message.clone(),
            })
            .collect(),
        outputs: verdict
            .outputs
            .iter()
            .map(|o| OutputView {
                output: o.output.clone(),
                expected: o.expected.clone(),
                tolerance: o.tolerance.clone(),
                computed: o.computed.clone(),
                relative_error: o.relative_error.filter(|r| r.is_finite()),
                agrees: o.agrees,
                problem: o.problem.clone(),
            })
            .collect(),
        refusal: verdict.refusal.as_ref().map(|r| RefusalView {
            field: r.field.clone(),
            contains: r.contains.clone(),
            agrees: r.agrees,
        }),
    }
}

/// Runs one embedded reference case and returns its verdict (the export
/// `verify_case` of the verification page's module, see [`crate::verify_exports`]).
///
/// # Errors
/// Throws only when `case` does not have the embedded shape (a build fault, never
/// user input).
pub fn verify_case(case: JsValue) -> Result<String, JsError> {
    let wire: CaseWire = serde_wasm_bindgen::from_value(case)
        .map_err(|e| adapter_error("the case does not have the embedded shape", e))?;
    let case = wire
        .into_case()
        .map_err(|e| adapter_error("the case does not have the embedded shape", e))?;
    to_json(&verdict_view(&verification::verify(&case)))
}

#[cfg(test)]
mod tests {
    use super::*;

    fn wire(json: &str) -> CaseWire {
        serde_json::from_str(json).expect("case shape")
    }

    #[test]
    fn an_embedded_function_case_runs_and_agrees() {
        // Laminar momentum-flux factor 4/3: closed form of the integral of
        // (1 − r²/R²)² over the section (from memory).
        let case = wire(
            r#"{"function":"laminar_factors","system":"si","inputs":{},"units":{},
                "expected":[{"output":"momentum_flux_factor","value":"1.3333333","rel_tol":1e-6}],
                "expect_error":null}"#,
        )
        .into_case()
        .expect("valid case");
        let view = verdict_view(&verification::verify(&case));
        assert!(view.agrees, "{view:?}");
        assert_eq!(view.outputs.len(), 1);
    }

    #[test]
    fn a_wrong_expectation_disagrees() {
        let case = wire(
            r#"{"function":"laminar_factors","system":"si",
                "expected":[{"output":"momentum_flux_factor","value":"1.25","rel_tol":1e-3}]}"#,
        )
        .into_case()
        .expect("valid case");
        let view = verdict_view(&verification::verify(&case));
        assert!(!view.agrees, "{view:?}");
    }

    #[test]
    fn malformed_cases_are_refused_with_the_reason() {
        let both = wire(r#"{"calculator":"bend","function":"water","system":"si"}"#).into_case();
        assert!(both.is_err());
        let no_tolerance =
            wire(r#"{"calculator":"bend","system":"si","expected":[{"output":"thrust","value":"1 kN"}]}"#).into_case();
        assert!(no_tolerance.is_err());
        let system = wire(r#"{"calculator":"bend","system":"metric"}"#).into_case();
        assert!(system.is_err());
    }
}
