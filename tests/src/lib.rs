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

use fluxledger_core::UnitSystem;

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

// The case's parts and the comparison rule live in the core, where the live
// verification page (through the wasm export `verify_case`) uses them too.
use fluxledger_core::verification;
pub use fluxledger_core::verification::{
    bare_unit, function, input_keys, output_kinds, parse_difference, parse_typed, typed_unit, CaseData, Evaluation,
    ExpectError, Expected, FunctionError, FunctionInputs, FunctionResult, FunctionSpec, OutputVerdict, Target,
    Tolerance, Verdict, FUNCTIONS,
};

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

    /// What the core needs to run and judge the case.
    pub fn data(&self) -> CaseData {
        CaseData {
            target: self.target.clone(),
            system: self.system,
            inputs: self.inputs.clone(),
            units: self.units.clone(),
            expected: self.expected.clone(),
            expect_error: self.expect_error.clone(),
        }
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
// Evaluation and the driver.

/// Runs a case's inputs through its target (see
/// [`fluxledger_core::verification::evaluate`]).
pub fn evaluate(case: &Case) -> Result<Evaluation, String> {
    verification::evaluate(&case.data())
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

/// Checks one case: runs it and judges every expected output (or the expected
/// error) by [`fluxledger_core::verification::verify`]. Returns a report between
/// rulers when anything is off.
///
/// # Errors
/// A human-readable report: the case file, its source, and expected against actual
/// for every mismatch.
pub fn check(case: &Case) -> Result<(), String> {
    let verdict = verification::verify(&case.data());
    if verdict.agrees() {
        return Ok(());
    }
    let mut report = header(case);
    if let Some(problem) = &verdict.problem {
        let _ = writeln!(report, "error:  {problem}");
    }
    for fault in &verdict.faults {
        let _ = writeln!(report, "fault:    {fault}");
    }
    match &verdict.refusal {
        Some(refusal) if !refusal.agrees => {
            let _ = writeln!(
                report,
                "expected: an error on field '{}'{}",
                refusal.field,
                refusal
                    .contains
                    .as_ref()
                    .map(|t| format!(" containing '{t}'"))
                    .unwrap_or_default()
            );
            if verdict.errors.is_empty() {
                let _ = writeln!(report, "actual:   no error; outputs {:?}", verdict.computed);
            }
            for (field, message) in &verdict.errors {
                let _ = writeln!(report, "actual:   {field}: {message}");
            }
        }
        Some(_) => {}
        None if !verdict.errors.is_empty() => {
            let _ = writeln!(report, "expected: a result");
            for (field, message) in &verdict.errors {
                let _ = writeln!(report, "actual:   error on {field}: {message}");
            }
        }
        None => {
            for (expected, outcome) in case.expected.iter().zip(&verdict.outputs) {
                if let Err(message) = compare(outcome) {
                    let _ = writeln!(report, "── {} {}", expected.output, "─".repeat(40));
                    report.push_str(&message);
                    if let Some(note) = &expected.note {
                        let _ = writeln!(report, "note:     {note}");
                    }
                }
            }
            if !verdict.warnings.is_empty() {
                let _ = writeln!(report, "warnings: {}", verdict.warnings.join(" | "));
            }
        }
    }
    let _ = writeln!(report, "{RULER}");
    Err(report)
}

/// One expected output, judged by the core's tolerance rule
/// ([`fluxledger_core::verification::compare`]); a message on mismatch.
fn compare(outcome: &OutputVerdict) -> Result<(), String> {
    if outcome.agrees {
        return Ok(());
    }
    if let Some(problem) = &outcome.problem {
        return Err(format!("expected: {}\nerror:    {problem}\n", outcome.expected));
    }
    let Some(computed) = &outcome.computed else {
        return Err(format!(
            "expected: {}\nactual:   no value for this output\n",
            outcome.expected
        ));
    };
    let rel_err = outcome.relative_error.unwrap_or(f64::INFINITY);
    Err(format!(
        "expected: {}  ({})\nactual:   {computed}  (relative error {rel_err:.3e})\n",
        outcome.expected, outcome.tolerance
    ))
}
