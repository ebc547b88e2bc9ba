//! Shared helpers of the cross-crate tests: the reference-case format, its loader,
//! and the one [`check`] driver that every reference case goes through.
//!
//! A reference case is one TOML file under `tests/data/reference/` holding what a
//! user would type into one calculator (or into one of a few core functions, see
//! [`FUNCTIONS`]), the outputs a published source gives for it, a tolerance that
//! reflects that source's precision, and the source itself:
//!
//! ```toml
//! title = "90° bend, static thrust 2pA sin(θ/2)"
//! source = "derived from the definition: ..."
//! calculator = "bend"            # or: function = "water"
//! system = "si"                  # or "us"; optional, default "si"
//! [inputs]                        # field key -> typed text, exactly as a user types it
//! angle = "90 deg"
//! [units]                         # optional: selector unit per field (applies to bare numbers)
//! [expected.thrust]               # output key -> expected value typed with its unit
//! value = "123.4 kN"
//! rel_tol = 0.005                 # or abs = "0.1 kN"
//! note = "how the expected value was obtained"
//! [expect_error]                  # instead of [expected]: the case must be refused
//! field = "d"
//! contains = "greater than"       # optional: text the error message must contain
//! ```
//!
//! A key design decision: expected values are parsed by the core's own quantity
//! parser using the output's quantity kind from the calculator description, and all
//! comparisons are between SI values; so a case may state its expectation in
//! whatever unit its source uses, and a wrong-kind unit in a case file is itself an
//! error. Cases whose calculator is not registered are failures, never skips: cases
//! written ahead of their calculator wait in `tests/data/pending/`, which the driver
//! does not read (the tidy test still checks that they name a source).

pub mod generate;

use std::collections::BTreeMap;
use std::fmt::Write as _;
use std::path::{Path, PathBuf};

use fluxledger_core::calculators;
use fluxledger_core::fluid::Fluid;
use fluxledger_core::friction::{self, FrictionError};
use fluxledger_core::profile::{self, ProfileFactors};
use fluxledger_core::units::{self, QuantityKind};
use fluxledger_core::{Request, SolveError, UnitSystem};

/// The folder of reference cases the driver runs.
pub fn reference_dir() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("data").join("reference")
}

/// The folder of cases written ahead of their calculator (not run).
pub fn pending_dir() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("data").join("pending")
}

/// The workspace root (parent of `tests/`).
pub fn workspace_root() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .parent()
        .map(Path::to_path_buf)
        .unwrap_or_default()
}

/// What a case exercises.
#[derive(Clone, Debug, PartialEq)]
pub enum Target {
    /// A registered calculator, solved through `fluxledger_core::solve`.
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

/// How close an actual value must be to the expected one.
#[derive(Clone, Debug, PartialEq)]
pub enum Tolerance {
    /// |actual − expected| ≤ rel · |expected|.
    Relative(f64),
    /// |actual − expected| ≤ the typed amount (same quantity kind as the output).
    Absolute(String),
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

/// One reference case, as read from its file.
#[derive(Clone, Debug, PartialEq)]
pub struct Case {
    pub path: PathBuf,
    pub title: String,
    pub source: String,
    pub target: Target,
    pub system: UnitSystem,
    pub inputs: BTreeMap<String, String>,
    pub units: BTreeMap<String, String>,
    pub expected: Vec<Expected>,
    pub expect_error: Option<ExpectError>,
}

impl Case {
    /// The file name, for messages.
    pub fn name(&self) -> String {
        self.path
            .file_name()
            .map(|n| n.to_string_lossy().into_owned())
            .unwrap_or_default()
    }
}

/// Reads every `*.toml` case in `dir`, sorted by file name. Files that do not parse
/// are returned as errors (`path: message`).
pub fn load_cases(dir: &Path) -> (Vec<Case>, Vec<String>) {
    let mut cases = Vec::new();
    let mut errors = Vec::new();
    let Ok(entries) = std::fs::read_dir(dir) else {
        return (cases, vec![format!("{}: cannot read the folder", dir.display())]);
    };
    let mut paths: Vec<PathBuf> = entries.filter_map(|e| e.ok().map(|e| e.path())).collect();
    paths.sort();
    for path in paths {
        if path.extension().and_then(|e| e.to_str()) != Some("toml") {
            if path.file_name().and_then(|n| n.to_str()) != Some("README.md") {
                errors.push(format!("{}: not a .toml case file", path.display()));
            }
            continue;
        }
        match load_case(&path) {
            Ok(case) => cases.push(case),
            Err(e) => errors.push(format!("{}: {e}", path.display())),
        }
    }
    (cases, errors)
}

/// Reads one case file strictly: unknown keys, wrong types and missing parts are
/// errors (a typo such as `rel_tl` must not silently drop a tolerance).
pub fn load_case(path: &Path) -> Result<Case, String> {
    let text = std::fs::read_to_string(path).map_err(|e| format!("cannot read: {e}"))?;
    parse_case(path, &text)
}

/// Parses the text of one case file (see [`load_case`]).
pub fn parse_case(path: &Path, text: &str) -> Result<Case, String> {
    let table: toml::Table = text
        .parse()
        .map_err(|e: toml::de::Error| format!("not valid TOML: {e}"))?;
    const TOP: &[&str] = &[
        "title",
        "source",
        "calculator",
        "function",
        "system",
        "inputs",
        "units",
        "expected",
        "expect_error",
    ];
    refuse_unknown_keys(&table, TOP, "top level")?;

    let title = string_at(&table, "title")?.ok_or("missing 'title'")?;
    let source = string_at(&table, "source")?.unwrap_or_default();
    let target = match (string_at(&table, "calculator")?, string_at(&table, "function")?) {
        (Some(key), None) => Target::Calculator(key),
        (None, Some(name)) => Target::Function(name),
        (Some(_), Some(_)) => return Err("give either 'calculator' or 'function', not both".into()),
        (None, None) => return Err("missing 'calculator' (or 'function')".into()),
    };
    let system = match string_at(&table, "system")? {
        None => UnitSystem::Si,
        Some(key) => UnitSystem::from_key(&key).ok_or(format!("system '{key}' is not 'si' or 'us'"))?,
    };
    let inputs = string_map(&table, "inputs")?;
    let units = string_map(&table, "units")?;

    let mut expected = Vec::new();
    if let Some(value) = table.get("expected") {
        let outputs = value.as_table().ok_or("'expected' must be a table of outputs")?;
        for (output, spec) in outputs {
            let spec = spec.as_table().ok_or(format!("expected.{output} must be a table"))?;
            refuse_unknown_keys(
                spec,
                &["value", "rel_tol", "abs", "note"],
                &format!("expected.{output}"),
            )?;
            let value = string_at(spec, "value")?.ok_or(format!("expected.{output}: missing 'value'"))?;
            let tolerance = match (spec.get("rel_tol"), string_at(spec, "abs")?) {
                (Some(rel), None) => {
                    let rel = rel
                        .as_float()
                        .or_else(|| rel.as_integer().map(|i| i as f64))
                        .ok_or(format!("expected.{output}: rel_tol must be a number"))?;
                    if !(rel.is_finite() && rel > 0.0 && rel < 0.5) {
                        return Err(format!("expected.{output}: rel_tol {rel} must be in (0, 0.5)"));
                    }
                    Tolerance::Relative(rel)
                }
                (None, Some(abs)) => Tolerance::Absolute(abs),
                (Some(_), Some(_)) => return Err(format!("expected.{output}: give rel_tol or abs, not both")),
                (None, None) => return Err(format!("expected.{output}: missing a tolerance (rel_tol or abs)")),
            };
            let note = string_at(spec, "note")?;
            expected.push(Expected {
                output: output.clone(),
                value,
                tolerance,
                note,
            });
        }
    }
    let expect_error = match table.get("expect_error") {
        None => None,
        Some(value) => {
            let spec = value.as_table().ok_or("'expect_error' must be a table")?;
            refuse_unknown_keys(spec, &["field", "contains"], "expect_error")?;
            let field = string_at(spec, "field")?.ok_or("expect_error: missing 'field'")?;
            Some(ExpectError {
                field,
                contains: string_at(spec, "contains")?,
            })
        }
    };
    match (expected.is_empty(), &expect_error) {
        (true, None) => return Err("a case needs [expected.<output>] tables or an [expect_error] table".into()),
        (false, Some(_)) => return Err("a case expects either outputs or an error, not both".into()),
        _ => {}
    }
    Ok(Case {
        path: path.to_path_buf(),
        title,
        source,
        target,
        system,
        inputs,
        units,
        expected,
        expect_error,
    })
}

fn refuse_unknown_keys(table: &toml::Table, allowed: &[&str], place: &str) -> Result<(), String> {
    match table.keys().find(|k| !allowed.contains(&k.as_str())) {
        Some(key) => Err(format!(
            "unknown key '{key}' at {place} (allowed: {})",
            allowed.join(", ")
        )),
        None => Ok(()),
    }
}

fn string_at(table: &toml::Table, key: &str) -> Result<Option<String>, String> {
    match table.get(key) {
        None => Ok(None),
        Some(toml::Value::String(s)) => Ok(Some(s.clone())),
        Some(_) => Err(format!("'{key}' must be a string")),
    }
}

fn string_map(table: &toml::Table, key: &str) -> Result<BTreeMap<String, String>, String> {
    let mut map = BTreeMap::new();
    if let Some(value) = table.get(key) {
        let inner = value.as_table().ok_or(format!("'{key}' must be a table"))?;
        for (k, v) in inner {
            let text = v
                .as_str()
                .ok_or(format!("{key}.{k} must be a string, typed as a user types it"))?;
            map.insert(k.clone(), text.to_string());
        }
    }
    Ok(map)
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
    // Fully developed laminar profile: `profile::laminar`.
    FunctionSpec {
        name: "laminar_factors",
        inputs: &[],
        outputs: PROFILE_OUTPUTS,
        eval: |_| Ok(profile_outputs(profile::laminar())),
    },
    // Power-law profile u = U(1 − r/R)^(1/n): `profile::power_law`.
    FunctionSpec {
        name: "power_law_factors",
        inputs: &[("n", QuantityKind::Ratio)],
        outputs: PROFILE_OUTPUTS,
        eval: |inputs| {
            let n = input(inputs, "n")?;
            profile::power_law(n).map(profile_outputs).ok_or(FunctionError {
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

/// The unit applied to a bare number in a case file: only plain numbers may be
/// bare; every dimensional value in a case names its unit.
fn bare_unit(kind: QuantityKind) -> &'static str {
    if kind == QuantityKind::Ratio {
        "-"
    } else {
        ""
    }
}

/// Parses a typed quantity from a case file into SI.
pub fn parse_typed(text: &str, kind: QuantityKind) -> Result<f64, String> {
    units::parse_quantity(text, kind, bare_unit(kind)).map_err(|e| format!("'{text}' ({}): {e}", kind.name()))
}

/// Parses an absolute tolerance: like [`parse_typed`], but a difference, so unit
/// offsets (°C, °F) do not apply.
pub fn parse_difference(text: &str, kind: QuantityKind) -> Result<f64, String> {
    let value = parse_typed(text, kind)?;
    let zero_text: String = {
        let number_end = text
            .trim()
            .find(|c: char| !(c.is_ascii_digit() || ".,+-eE".contains(c)))
            .unwrap_or(text.len());
        format!("0{}", &text.trim()[number_end..])
    };
    let zero = parse_typed(&zero_text, kind)?;
    Ok((value - zero).abs())
}

// ---------------------------------------------------------------------------------
// Evaluation and the driver.

/// What evaluating a case produced.
#[derive(Clone, Debug, Default)]
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

/// The quantity kind of each output the case's target can give, or why the target
/// cannot be used (unknown or unregistered).
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

/// The input field keys the case's target reads.
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

/// Runs a case's inputs through its target.
pub fn evaluate(case: &Case) -> Result<Evaluation, String> {
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
            let outcome = fluxledger_core::solve(key, &request);
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
            if let Some(unknown) = case.inputs.keys().find(|k| !spec.inputs.iter().any(|(i, _)| i == k)) {
                return Err(format!("function '{name}' has no input '{unknown}'"));
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

const RULER: &str = "────────────────────────────────────────────────────────────────────────";

fn header(case: &Case) -> String {
    let mut s = String::new();
    let _ = writeln!(s, "{RULER}");
    let _ = writeln!(s, "case:   {}", case.path.display());
    let _ = writeln!(s, "title:  {}", case.title);
    let _ = writeln!(s, "target: {}", case.target.describe());
    let _ = writeln!(s, "source: {}", case.source);
    s
}

/// Checks one case: evaluates it and compares every expected output (or the
/// expected error). Returns a report between rulers when anything is off.
///
/// # Errors
/// A human-readable report: the case file, its source, and expected against actual
/// for every mismatch.
pub fn check(case: &Case) -> Result<(), String> {
    let mut report = header(case);
    let evaluation = match evaluate(case) {
        Ok(e) => e,
        Err(message) => {
            let _ = writeln!(report, "error:  {message}\n{RULER}");
            return Err(report);
        }
    };
    if let Ok(keys) = input_keys(&case.target) {
        let unknown: Vec<&String> = case.inputs.keys().filter(|k| !keys.contains(k)).collect();
        if !unknown.is_empty() {
            let _ = writeln!(
                report,
                "error:  inputs not read by the target: {unknown:?} (fields: {})",
                keys.join(", ")
            );
            let _ = writeln!(report, "{RULER}");
            return Err(report);
        }
    }
    let mut failed = false;
    for fault in &evaluation.faults {
        failed = true;
        let _ = writeln!(report, "fault:    {fault}");
    }
    if let Some(expect) = &case.expect_error {
        let on_field: Vec<&(String, String)> = evaluation.errors.iter().filter(|(f, _)| *f == expect.field).collect();
        let contains_ok = match &expect.contains {
            None => true,
            Some(text) => on_field.iter().any(|(_, m)| m.contains(text.as_str())),
        };
        if on_field.is_empty() || !contains_ok {
            failed = true;
            let _ = writeln!(
                report,
                "expected: an error on field '{}'{}",
                expect.field,
                expect
                    .contains
                    .as_ref()
                    .map(|t| format!(" containing '{t}'"))
                    .unwrap_or_default()
            );
            if evaluation.errors.is_empty() {
                let _ = writeln!(report, "actual:   no error; outputs {:?}", evaluation.outputs);
            }
            for (field, message) in &evaluation.errors {
                let _ = writeln!(report, "actual:   {field}: {message}");
            }
        }
    } else if !evaluation.errors.is_empty() {
        failed = true;
        let _ = writeln!(report, "expected: a result");
        for (field, message) in &evaluation.errors {
            let _ = writeln!(report, "actual:   error on {field}: {message}");
        }
    } else {
        let kinds = match output_kinds(&case.target) {
            Ok(kinds) => kinds,
            Err(message) => {
                let _ = writeln!(report, "error:  {message}\n{RULER}");
                return Err(report);
            }
        };
        for expected in &case.expected {
            if let Err(message) = compare(expected, &kinds, &evaluation) {
                failed = true;
                let _ = writeln!(report, "── {} {}", expected.output, "─".repeat(40));
                report.push_str(&message);
                if let Some(note) = &expected.note {
                    let _ = writeln!(report, "note:     {note}");
                }
            }
        }
        if failed && !evaluation.warnings.is_empty() {
            let _ = writeln!(report, "warnings: {}", evaluation.warnings.join(" | "));
        }
    }
    let _ = writeln!(report, "{RULER}");
    if failed {
        Err(report)
    } else {
        Ok(())
    }
}

/// Compares one expected output with the evaluation; a message on mismatch.
fn compare(expected: &Expected, kinds: &BTreeMap<String, QuantityKind>, evaluation: &Evaluation) -> Result<(), String> {
    let Some(kind) = kinds.get(&expected.output).copied() else {
        let known: Vec<&String> = kinds.keys().collect();
        return Err(format!(
            "expected: output '{}', which the target does not describe (outputs: {known:?})\n",
            expected.output
        ));
    };
    let want = parse_typed(&expected.value, kind).map_err(|e| format!("expected value does not parse: {e}\n"))?;
    let Some((got, _)) = evaluation.outputs.get(&expected.output).copied() else {
        return Err(format!(
            "expected: {}\nactual:   no value for this output\n",
            expected.value
        ));
    };
    let unit_of_expected = typed_unit(&expected.value);
    let in_expected_unit = |si: f64| match units::convert_to(si, kind, unit_of_expected) {
        Some(v) => format!("{} {unit_of_expected}", units::format_significant(v, 7)),
        None => units::format_significant(si, 7),
    };
    let (ok, tolerance_text) = match &expected.tolerance {
        Tolerance::Relative(rel) => ((got - want).abs() <= rel * want.abs(), format!("rel_tol {rel}")),
        Tolerance::Absolute(text) => {
            let abs = parse_difference(text, kind).map_err(|e| format!("abs tolerance does not parse: {e}\n"))?;
            ((got - want).abs() <= abs, format!("abs {text}"))
        }
    };
    if ok && got.is_finite() {
        return Ok(());
    }
    let rel_err = if want != 0.0 {
        (got - want).abs() / want.abs()
    } else {
        f64::INFINITY
    };
    Err(format!(
        "expected: {}  ({tolerance_text})\nactual:   {}  (SI {got:e} vs {want:e}; relative error {rel_err:.3e})\n",
        expected.value,
        in_expected_unit(got),
    ))
}

/// The unit text of a typed value (`"123.4 kN"` → `"kN"`; bare number → `"-"`).
fn typed_unit(text: &str) -> &str {
    let t = text.trim();
    let end = t
        .find(|c: char| !(c.is_ascii_digit() || ".,+-eE".contains(c)))
        .unwrap_or(t.len());
    let unit = t[end..].trim();
    if unit.is_empty() {
        "-"
    } else {
        unit
    }
}
