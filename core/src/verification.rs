//! Running a sourced reference case and judging its result: the one place where a
//! computed value is compared with a published one.
//!
//! A reference case (the files under `tests/data/reference/`, read by the tests
//! crate) holds what a user would type into one calculator, or into one of a few
//! core functions ([`FUNCTIONS`]), and either the outputs a published source gives
//! for it or the field on which the input must be refused. Both the native test
//! driver (`fluxledger_tests::check`) and the handbook's live verification page
//! (through the wasm export `verify_case`) call [`verify`], so a case agrees in the
//! browser exactly when it agrees in the test suite.
//!
//! The agreement rule, for an expected value `E` and a computed value `C` (both SI):
//! - relative tolerance `r`: `|C − E| ≤ r·|E|`;
//! - absolute tolerance `a` (typed with a unit, read as a *difference*, so the
//!   offsets of °C and °F do not apply): `|C − E| ≤ a`;
//!
//! and `C` must be finite. Expected values are parsed by the core's own quantity
//! parser with the output's quantity kind, so a case may state its value in any
//! unit of that kind; a bare number is allowed only for plain ratios.
//!
//! A case also fails when the target reports a defect (an undescribed or
//! non-finite output), when one of its independent checks
//! ([`crate::catalog::Check`]) disagrees, or when the case types an input the
//! target does not read. An expected refusal agrees when the target refuses the
//! named field (with a message containing the given text, if any).
//!
//! This module knows no file format: the tests crate parses the TOML files and the
//! site embeds them; both hand over a [`CaseData`].

use std::collections::BTreeMap;

use crate::calculators;
use crate::fluid::Fluid;
use crate::friction::{self, FrictionError};
use crate::units::{self, QuantityKind, UnitSystem};
use crate::velocity_profile::{self, ProfileFactors};
use crate::{Request, SolveError};

/// What a case exercises.
#[derive(Clone, Debug, PartialEq)]
pub enum Target {
    /// A registered calculator, solved through [`crate::solve`].
    Calculator(String),
    /// One of the core functions in [`FUNCTIONS`].
    Function(String),
}

impl Target {
    pub fn describe(&self) -> String {
        match self {
            Target::Calculator(key) => format!("calculator '{key}'"),
            Target::Function(name) => format!("function '{name}'"),
        }
    }
}

/// How close a computed value must be to the expected one.
#[derive(Clone, Debug, PartialEq)]
pub enum Tolerance {
    /// |computed − expected| ≤ rel · |expected|.
    Relative(f64),
    /// |computed − expected| ≤ the typed amount (same quantity kind as the output).
    Absolute(String),
}

impl Tolerance {
    /// How the tolerance reads in a report (`rel_tol 0.001`, `abs 0.1 kN`).
    pub fn describe(&self) -> String {
        match self {
            Tolerance::Relative(rel) => format!("rel_tol {rel}"),
            Tolerance::Absolute(text) => format!("abs {text}"),
        }
    }
}

/// One expected output.
#[derive(Clone, Debug, PartialEq)]
pub struct Expected {
    pub output: String,
    /// Typed with its unit, e.g. `"123.4 kN"`.
    pub value: String,
    pub tolerance: Tolerance,
    pub note: Option<String>,
}

/// A case that must be refused with an error on one field.
#[derive(Clone, Debug, PartialEq)]
pub struct ExpectError {
    pub field: String,
    /// Text the error message must contain, if given.
    pub contains: Option<String>,
}

/// What a case asks: its target, what is typed, and what must come out.
#[derive(Clone, Debug, PartialEq)]
pub struct CaseData {
    pub target: Target,
    pub system: UnitSystem,
    /// Field key → text as a user types it.
    pub inputs: BTreeMap<String, String>,
    /// Field key → selector unit applied to a bare number.
    pub units: BTreeMap<String, String>,
    pub expected: Vec<Expected>,
    pub expect_error: Option<ExpectError>,
}

// ---------------------------------------------------------------------------------
// Core functions that cases may call directly.

/// Inputs of a function, SI values keyed by input name.
pub type FunctionInputs = BTreeMap<&'static str, f64>;

/// A field error from a function: the input it is about and the message.
#[derive(Clone, Debug, PartialEq)]
pub struct FunctionError {
    pub field: &'static str,
    pub message: String,
}

/// What a function gives: (output key, SI value) pairs, or the field that is wrong.
pub type FunctionResult = Result<Vec<(&'static str, f64)>, FunctionError>;

/// A core function a case can call without a calculator: its typed inputs and outputs.
pub struct FunctionSpec {
    pub name: &'static str,
    /// What the function is, in words (shown on the verification page).
    pub title: &'static str,
    pub inputs: &'static [(&'static str, QuantityKind)],
    pub outputs: &'static [(&'static str, QuantityKind)],
    pub eval: fn(&FunctionInputs) -> FunctionResult,
}

const PROFILE_OUTPUTS: &[(&str, QuantityKind)] = &[
    ("momentum_flux_factor", QuantityKind::Ratio),
    ("kinetic_energy_factor", QuantityKind::Ratio),
    ("mean_over_peak", QuantityKind::Ratio),
];

fn profile_outputs(f: ProfileFactors) -> Vec<(&'static str, f64)> {
    vec![
        ("momentum_flux_factor", f.momentum_flux),
        ("kinetic_energy_factor", f.kinetic_energy),
        ("mean_over_peak", f.mean_over_peak),
    ]
}

fn input(inputs: &FunctionInputs, key: &'static str) -> Result<f64, FunctionError> {
    inputs.get(key).copied().ok_or(FunctionError {
        field: key,
        message: "a value is required".into(),
    })
}

/// The core functions reference cases may call, each with the fields it reads.
pub const FUNCTIONS: &[FunctionSpec] = &[
    // Liquid water at 101.325 kPa: `fluid::Fluid::water_kelvin`.
    FunctionSpec {
        name: "water",
        title: "Water properties at atmospheric pressure",
        inputs: &[("temperature", QuantityKind::Temperature)],
        outputs: &[
            ("density", QuantityKind::Density),
            ("viscosity", QuantityKind::DynamicViscosity),
            ("kinematic_viscosity", QuantityKind::KinematicViscosity),
            ("vapour_pressure", QuantityKind::Pressure),
        ],
        eval: |inputs| {
            let t = input(inputs, "temperature")?;
            let water = Fluid::water_kelvin(t).map_err(|e| FunctionError {
                field: "temperature",
                message: e.to_string(),
            })?;
            let mut out = vec![
                ("density", water.density),
                ("viscosity", water.viscosity),
                ("kinematic_viscosity", water.kinematic_viscosity()),
            ];
            if let Some(pv) = water.vapour_pressure {
                out.push(("vapour_pressure", pv));
            }
            Ok(out)
        },
    },
    // Darcy friction factor: `friction::darcy_friction_factor` (laminar 64/Re, else Colebrook).
    FunctionSpec {
        name: "friction_factor",
        title: "Darcy friction factor (64/Re laminar, Colebrook otherwise)",
        inputs: &[
            ("reynolds", QuantityKind::Ratio),
            ("relative_roughness", QuantityKind::Ratio),
        ],
        outputs: &[("friction_factor", QuantityKind::Ratio)],
        eval: |inputs| {
            let re = input(inputs, "reynolds")?;
            let rr = input(inputs, "relative_roughness")?;
            match friction::darcy_friction_factor(re, rr) {
                Ok(f) => Ok(vec![("friction_factor", f)]),
                Err(FrictionError::Reynolds) => Err(FunctionError {
                    field: "reynolds",
                    message: "must be finite and greater than 0".into(),
                }),
                Err(FrictionError::Roughness) => Err(FunctionError {
                    field: "relative_roughness",
                    message: "must be at least 0 and at most 0.05".into(),
                }),
            }
        },
    },
    // Fully developed laminar profile: `velocity_profile::laminar`.
    FunctionSpec {
        name: "laminar_factors",
        title: "Velocity-profile factors, laminar pipe flow",
        inputs: &[],
        outputs: PROFILE_OUTPUTS,
        eval: |_| Ok(profile_outputs(velocity_profile::laminar())),
    },
    // Power-law profile u = U(1 − r/R)^(1/n): `velocity_profile::power_law`.
    FunctionSpec {
        name: "power_law_factors",
        title: "Velocity-profile factors, power-law turbulent profile",
        inputs: &[("n", QuantityKind::Ratio)],
        outputs: PROFILE_OUTPUTS,
        eval: |inputs| {
            let n = input(inputs, "n")?;
            velocity_profile::power_law(n)
                .map(profile_outputs)
                .ok_or(FunctionError {
                    field: "n",
                    message: "must be finite and greater than 0".into(),
                })
        },
    },
];

/// Looks up a function by name.
pub fn function(name: &str) -> Option<&'static FunctionSpec> {
    FUNCTIONS.iter().find(|f| f.name == name)
}

// ---------------------------------------------------------------------------------
// Typed values in case files.

/// The unit applied to a bare number in a case: only plain numbers may be bare;
/// every dimensional value in a case names its unit.
pub fn bare_unit(kind: QuantityKind) -> &'static str {
    if kind == QuantityKind::Ratio {
        "-"
    } else {
        ""
    }
}

/// Parses a typed quantity from a case into SI.
pub fn parse_typed(text: &str, kind: QuantityKind) -> Result<f64, String> {
    units::parse_quantity(text, kind, bare_unit(kind)).map_err(|e| format!("'{text}' ({}): {e}", kind.name()))
}

/// The number part of typed text ends where the unit starts.
fn number_end(text: &str) -> usize {
    text.find(|c: char| !(c.is_ascii_digit() || ".,+-eE".contains(c)))
        .unwrap_or(text.len())
}

/// Parses an absolute tolerance: like [`parse_typed`], but a difference, so unit
/// offsets (°C, °F) do not apply.
pub fn parse_difference(text: &str, kind: QuantityKind) -> Result<f64, String> {
    let value = parse_typed(text, kind)?;
    let trimmed = text.trim();
    let zero = parse_typed(&format!("0{}", &trimmed[number_end(trimmed)..]), kind)?;
    Ok((value - zero).abs())
}

/// The unit text of a typed value (`"123.4 kN"` → `"kN"`; bare number → `"-"`).
pub fn typed_unit(text: &str) -> &str {
    let t = text.trim();
    let unit = t[number_end(t)..].trim();
    if unit.is_empty() {
        "-"
    } else {
        unit
    }
}

// ---------------------------------------------------------------------------------
// Evaluation.

/// What running a case's inputs through its target produced.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Evaluation {
    /// Output key → (SI value, kind).
    pub outputs: BTreeMap<String, (f64, QuantityKind)>,
    /// Field errors: (field, message).
    pub errors: Vec<(String, String)>,
    /// Warnings the calculator gave (shown when a case fails).
    pub warnings: Vec<String>,
    /// Faults of the calculator (undescribed or non-finite outputs) and independent
    /// checks that disagree: any of them fails the case.
    pub faults: Vec<String>,
}

/// The quantity kind of each output the target can give, or why the target cannot
/// be used (unknown or unregistered).
pub fn output_kinds(target: &Target) -> Result<BTreeMap<String, QuantityKind>, String> {
    match target {
        Target::Calculator(key) => calculators::spec(key)
            .map(|spec| spec.outputs.iter().map(|o| (o.key.to_string(), o.kind)).collect())
            .ok_or_else(|| {
                format!("calculator '{key}' is not registered in fluxledger_core::calculators::CALCULATORS")
            }),
        Target::Function(name) => function(name)
            .map(|f| f.outputs.iter().map(|(k, kind)| (k.to_string(), *kind)).collect())
            .ok_or_else(|| {
                let known: Vec<&str> = FUNCTIONS.iter().map(|f| f.name).collect();
                format!("function '{name}' is not one of: {}", known.join(", "))
            }),
    }
}

/// The input field keys the target reads.
pub fn input_keys(target: &Target) -> Result<Vec<String>, String> {
    match target {
        Target::Calculator(key) => calculators::spec(key)
            .map(|spec| spec.fields.iter().map(|f| f.key.to_string()).collect())
            .ok_or_else(|| format!("calculator '{key}' is not registered")),
        Target::Function(name) => function(name)
            .map(|f| f.inputs.iter().map(|(k, _)| k.to_string()).collect())
            .ok_or_else(|| format!("function '{name}' is not known")),
    }
}

/// Runs a case's inputs through its target; `Err` when the target is unknown or
/// a function is given an input it does not have.
pub fn evaluate(case: &CaseData) -> Result<Evaluation, String> {
    match &case.target {
        Target::Calculator(key) => {
            if calculators::spec(key).is_none() {
                return Err(format!(
                    "calculator '{key}' is not registered in fluxledger_core::calculators::CALCULATORS; \
                     keep cases for calculators still being written in tests/data/pending/"
                ));
            }
            let request = Request {
                inputs: case.inputs.clone(),
                field_units: case.units.clone(),
                system: case.system,
            };
            let outcome = crate::solve(key, &request);
            let mut evaluation = Evaluation::default();
            match outcome.result {
                Ok(solution) => {
                    for o in &solution.outputs {
                        evaluation.outputs.insert(o.key.to_string(), (o.si, o.kind));
                    }
                    evaluation.warnings = solution.warnings.iter().map(|w| w.message.clone()).collect();
                    evaluation.faults = solution.defects.clone();
                    for c in solution.checks.iter().filter(|c| !c.agrees()) {
                        evaluation.faults.push(format!(
                            "check '{}' against {}: {} vs {}",
                            c.label, c.basis, c.value, c.reference
                        ));
                    }
                }
                Err(SolveError::UnknownCalculator { key }) => return Err(format!("unknown calculator '{key}'")),
                Err(SolveError::Fields(errors)) => {
                    evaluation.errors = errors.iter().map(|e| (e.field.clone(), e.kind.to_string())).collect();
                }
            }
            Ok(evaluation)
        }
        Target::Function(name) => {
            let spec = function(name).ok_or_else(|| format!("unknown function '{name}'"))?;
            if let Some(unknown) = case.inputs.keys().find(|k| !spec.inputs.iter().any(|(i, _)| i == k)) {
                return Err(format!("function '{name}' has no input '{unknown}'"));
            }
            let mut evaluation = Evaluation::default();
            let mut values = FunctionInputs::new();
            for (key, kind) in spec.inputs {
                match case.inputs.get(*key) {
                    None => evaluation.errors.push((key.to_string(), "a value is required".into())),
                    Some(text) => match units::parse_quantity(text, *kind, bare_unit(*kind)) {
                        Ok(v) => {
                            values.insert(key, v);
                        }
                        Err(e) => evaluation.errors.push((key.to_string(), e.to_string())),
                    },
                }
            }
            if evaluation.errors.is_empty() {
                match (spec.eval)(&values) {
                    Ok(outputs) => {
                        for (key, si) in outputs {
                            let kind = spec.outputs.iter().find(|(k, _)| *k == key).map(|(_, kind)| *kind);
                            let kind =
                                kind.ok_or_else(|| format!("function '{name}' gave undeclared output '{key}'"))?;
                            evaluation.outputs.insert(key.to_string(), (si, kind));
                        }
                    }
                    Err(e) => evaluation.errors.push((e.field.to_string(), e.message)),
                }
            }
            Ok(evaluation)
        }
    }
}

// ---------------------------------------------------------------------------------
// Judging.

/// One expected output against what was computed.
#[derive(Clone, Debug, PartialEq)]
pub struct OutputVerdict {
    pub output: String,
    /// As typed in the case (`"54.98 kN"`).
    pub expected: String,
    /// As the case gives it (`rel_tol 1e-6`, `abs 0.1 kN`).
    pub tolerance: String,
    /// The computed value in the unit of the expected value, 7 significant figures;
    /// `None` when nothing was computed for this output.
    pub computed: Option<String>,
    /// |computed − expected| / |expected|, when both are known and expected ≠ 0.
    pub relative_error: Option<f64>,
    pub agrees: bool,
    /// Why the comparison could not be made (unknown output, unparsable value).
    pub problem: Option<String>,
}

/// An expected refusal against what the target did.
#[derive(Clone, Debug, PartialEq)]
pub struct RefusalVerdict {
    pub field: String,
    pub contains: Option<String>,
    pub agrees: bool,
}

/// The judgement of one case.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Verdict {
    /// Why the case could not be run at all (unknown target, inputs the target does
    /// not read); the case fails.
    pub problem: Option<String>,
    /// Defects and disagreeing independent checks; any fails the case.
    pub faults: Vec<String>,
    /// Field errors the target gave: (field, message).
    pub errors: Vec<(String, String)>,
    /// Warnings the target gave.
    pub warnings: Vec<String>,
    /// One per expected output, in the case's order.
    pub outputs: Vec<OutputVerdict>,
    /// The expected refusal, when the case expects one.
    pub refusal: Option<RefusalVerdict>,
    /// Every output computed: key → (SI value, kind) (for failure reports).
    pub computed: BTreeMap<String, (f64, QuantityKind)>,
}

impl Verdict {
    /// Whether the case agrees: it ran, had no faults, gave no unexpected error,
    /// every expected output agrees and an expected refusal happened.
    pub fn agrees(&self) -> bool {
        self.problem.is_none()
            && self.faults.is_empty()
            && match &self.refusal {
                Some(refusal) => refusal.agrees,
                None => self.errors.is_empty() && !self.outputs.is_empty() && self.outputs.iter().all(|o| o.agrees),
            }
    }
}

/// Compares one expected output with the computed SI value (`None`: nothing was
/// computed) of quantity `kind`. This is the tolerance rule of the module docs.
pub fn compare(expected: &Expected, kind: QuantityKind, computed: Option<f64>) -> OutputVerdict {
    let mut verdict = OutputVerdict {
        output: expected.output.clone(),
        expected: expected.value.clone(),
        tolerance: expected.tolerance.describe(),
        computed: None,
        relative_error: None,
        agrees: false,
        problem: None,
    };
    let want = match parse_typed(&expected.value, kind) {
        Ok(want) => want,
        Err(e) => {
            verdict.problem = Some(format!("expected value does not parse: {e}"));
            return verdict;
        }
    };
    let allowed = match &expected.tolerance {
        Tolerance::Relative(rel) if rel.is_finite() && *rel > 0.0 => rel * want.abs(),
        Tolerance::Relative(rel) => {
            verdict.problem = Some(format!("rel_tol {rel} must be finite and greater than 0"));
            return verdict;
        }
        Tolerance::Absolute(text) => match parse_difference(text, kind) {
            Ok(abs) => abs,
            Err(e) => {
                verdict.problem = Some(format!("abs tolerance does not parse: {e}"));
                return verdict;
            }
        },
    };
    let Some(got) = computed else {
        return verdict;
    };
    let unit = typed_unit(&expected.value);
    verdict.computed = Some(match units::convert_to(got, kind, unit) {
        Some(v) if unit != "-" => format!("{} {unit}", units::format_significant(v, 7)),
        Some(v) => units::format_significant(v, 7),
        None => units::format_significant(got, 7),
    });
    if want != 0.0 {
        verdict.relative_error = Some((got - want).abs() / want.abs());
    }
    verdict.agrees = got.is_finite() && (got - want).abs() <= allowed;
    verdict
}

/// Whether the field errors include one on `expect.field` (containing the expected
/// text, if any).
pub fn refusal_agrees(expect: &ExpectError, errors: &[(String, String)]) -> bool {
    errors.iter().any(|(field, message)| {
        *field == expect.field
            && match &expect.contains {
                Some(text) => message.contains(text.as_str()),
                None => true,
            }
    })
}

/// Runs a case and judges it (see the module docs for the rules).
pub fn verify(case: &CaseData) -> Verdict {
    let mut verdict = Verdict::default();
    let evaluation = match evaluate(case) {
        Ok(evaluation) => evaluation,
        Err(problem) => {
            verdict.problem = Some(problem);
            return verdict;
        }
    };
    match input_keys(&case.target) {
        Ok(keys) => {
            let unknown: Vec<&String> = case.inputs.keys().filter(|k| !keys.contains(k)).collect();
            if !unknown.is_empty() {
                verdict.problem = Some(format!(
                    "inputs not read by the target: {unknown:?} (fields: {})",
                    keys.join(", ")
                ));
            }
        }
        Err(problem) => verdict.problem = Some(problem),
    }
    verdict.faults = evaluation.faults;
    verdict.warnings = evaluation.warnings;
    verdict.errors = evaluation.errors;
    if let Some(expect) = &case.expect_error {
        verdict.refusal = Some(RefusalVerdict {
            field: expect.field.clone(),
            contains: expect.contains.clone(),
            agrees: refusal_agrees(expect, &verdict.errors),
        });
    } else if verdict.errors.is_empty() {
        match output_kinds(&case.target) {
            Ok(kinds) => {
                for expected in &case.expected {
                    let outcome = match kinds.get(&expected.output) {
                        Some(kind) => compare(
                            expected,
                            *kind,
                            evaluation.outputs.get(&expected.output).map(|(si, _)| *si),
                        ),
                        None => {
                            let known: Vec<&String> = kinds.keys().collect();
                            OutputVerdict {
                                output: expected.output.clone(),
                                expected: expected.value.clone(),
                                tolerance: expected.tolerance.describe(),
                                computed: None,
                                relative_error: None,
                                agrees: false,
                                problem: Some(format!(
                                    "output '{}' is not described by the target (outputs: {known:?})",
                                    expected.output
                                )),
                            }
                        }
                    };
                    verdict.outputs.push(outcome);
                }
            }
            Err(problem) => verdict.problem = Some(problem),
        }
    }
    verdict.computed = evaluation.outputs;
    verdict
}

#[cfg(test)]
mod tests {
    use super::*;

    fn expected(value: &str, tolerance: Tolerance) -> Expected {
        Expected {
            output: "thrust".into(),
            value: value.into(),
            tolerance,
            note: None,
        }
    }

    #[test]
    fn relative_tolerance_is_inclusive_and_two_sided() {
        let e = expected("100 kN", Tolerance::Relative(0.01));
        assert!(compare(&e, QuantityKind::Force, Some(101_000.0)).agrees);
        assert!(compare(&e, QuantityKind::Force, Some(99_000.0)).agrees);
        assert!(!compare(&e, QuantityKind::Force, Some(101_100.0)).agrees);
        assert!(!compare(&e, QuantityKind::Force, Some(98_900.0)).agrees);
        assert!(!compare(&e, QuantityKind::Force, Some(f64::NAN)).agrees);
        assert!(!compare(&e, QuantityKind::Force, None).agrees);
    }

    #[test]
    fn absolute_tolerance_is_a_difference_without_the_unit_offset() {
        // 0.5 °C as a difference is 0.5 K, not 273.65 K.
        let e = expected("20 degC", Tolerance::Absolute("0.5 degC".into()));
        assert!(compare(&e, QuantityKind::Temperature, Some(293.15 + 0.49)).agrees);
        assert!(!compare(&e, QuantityKind::Temperature, Some(293.15 + 0.6)).agrees);
    }

    #[test]
    fn computed_value_is_shown_in_the_unit_of_the_expected_value() {
        let e = expected("2 kN", Tolerance::Relative(1e-6));
        let v = compare(&e, QuantityKind::Force, Some(2000.0));
        assert_eq!(v.computed.as_deref(), Some("2.000000 kN"), "{v:?}");
        assert_eq!(v.relative_error, Some(0.0));
    }

    #[test]
    fn a_wrong_kind_or_bad_tolerance_is_a_problem_not_a_pass() {
        let e = expected("2 m", Tolerance::Relative(0.1));
        let v = compare(&e, QuantityKind::Force, Some(2.0));
        assert!(!v.agrees && v.problem.is_some(), "{v:?}");
        let e = expected("2 kN", Tolerance::Relative(f64::NAN));
        assert!(compare(&e, QuantityKind::Force, Some(2000.0)).problem.is_some());
    }

    #[test]
    fn refusal_matches_field_and_text() {
        let errors = vec![("d_in".to_string(), "must be greater than 0 mm".to_string())];
        let on = |field: &str, contains: Option<&str>| ExpectError {
            field: field.into(),
            contains: contains.map(String::from),
        };
        assert!(refusal_agrees(&on("d_in", None), &errors));
        assert!(refusal_agrees(&on("d_in", Some("greater than")), &errors));
        assert!(!refusal_agrees(&on("d_in", Some("less than")), &errors));
        assert!(!refusal_agrees(&on("p", None), &errors));
    }

    #[test]
    fn a_function_case_runs_and_an_unknown_target_is_a_problem() {
        let case = CaseData {
            target: Target::Function("laminar_factors".into()),
            system: UnitSystem::Si,
            inputs: BTreeMap::new(),
            units: BTreeMap::new(),
            // Fully developed laminar flow: momentum-flux factor 4/3 (closed form
            // of the integral of (1 − r²/R²)² over the section, White, Fluid
            // Mechanics, from memory).
            expected: vec![Expected {
                output: "momentum_flux_factor".into(),
                value: "1.3333333".into(),
                tolerance: Tolerance::Relative(1e-6),
                note: None,
            }],
            expect_error: None,
        };
        let verdict = verify(&case);
        assert!(verdict.agrees(), "{verdict:?}");
        let unknown = CaseData {
            target: Target::Calculator("no-such-page".into()),
            ..case
        };
        let verdict = verify(&unknown);
        assert!(!verdict.agrees() && verdict.problem.is_some());
    }
}
