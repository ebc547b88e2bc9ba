//! Tidy: project rules that `cargo test` enforces.
//!
//! - every reference case (and every pending one) loads, has a title and names a
//!   source that says where its value comes from (see `shared/REFERENCES.md`);
//! - every reference case targets a registered calculator or a known core function,
//!   types only fields that exist, expects only outputs that exist, and its expected
//!   values and tolerances parse as the output's quantity kind;
//! - there are at least 25 reference cases, and every registered calculator has at
//!   least one that checks its outputs against a source;
//! - every `core/src/**/*.rs` file starts with a `//!` module doc.

use std::path::{Path, PathBuf};

use fluxledger_core::units::QuantityKind;
use fluxledger_tests::{
    input_keys, load_cases, output_kinds, parse_difference, parse_typed, pending_dir, reference_dir, workspace_root,
    Case, Target, Tolerance,
};

/// The fewest reference cases the suite may have (issue 2).
const MIN_REFERENCE_CASES: usize = 25;

/// Words one of which a source must contain to say what kind of source it is:
/// a library with its version (`==`), a derivation, a publication (edition, example,
/// table, release, standard), or an honest "from memory" / "common practice".
const SOURCE_MARKERS: &[&str] = &[
    "==",
    "derived from the definition",
    "edition",
    "ed.",
    "example",
    "table",
    "release",
    "standard",
    "from memory",
    "common practice",
];

fn source_problem(case: &Case) -> Option<String> {
    let source = case.source.trim();
    if source.is_empty() {
        return Some("has no source".into());
    }
    let lower = source.to_lowercase();
    if source.chars().count() < 25 || !SOURCE_MARKERS.iter().any(|m| lower.contains(m)) {
        return Some(format!(
            "source '{source}' does not say where the value comes from (a citation with edition/example/table, \
             'library==version' and the call, 'derived from the definition: ...', 'from memory', or 'common practice')"
        ));
    }
    None
}

fn file_name_problem(case: &Case) -> Option<String> {
    let name = case.name();
    let stem = name.strip_suffix(".toml").unwrap_or(&name);
    let ok = !stem.is_empty()
        && stem
            .chars()
            .all(|c| c.is_ascii_lowercase() || c.is_ascii_digit() || c == '-')
        && !stem.starts_with('-')
        && !stem.ends_with('-');
    (!ok).then(|| "file name must be lowercase-kebab-case.toml".to_string())
}

/// Problems of a case against its target's description (registered targets only).
fn target_problems(case: &Case) -> Vec<String> {
    let mut problems = Vec::new();
    let kinds = match output_kinds(&case.target) {
        Ok(kinds) => kinds,
        Err(message) => return vec![message],
    };
    let fields = input_keys(&case.target).unwrap_or_default();
    for key in case.inputs.keys().chain(case.units.keys()) {
        if !fields.contains(key) {
            problems.push(format!(
                "{} has no field '{key}' (fields: {})",
                case.target.describe(),
                fields.join(", ")
            ));
        }
    }
    if let Some(expect) = &case.expect_error {
        if !fields.contains(&expect.field) {
            problems.push(format!(
                "expect_error names field '{}', which the target does not have",
                expect.field
            ));
        }
    }
    for expected in &case.expected {
        let Some(kind) = kinds.get(&expected.output).copied() else {
            let known: Vec<&String> = kinds.keys().collect();
            problems.push(format!(
                "{} has no output '{}' (outputs: {known:?})",
                case.target.describe(),
                expected.output
            ));
            continue;
        };
        match parse_typed(&expected.value, kind) {
            Err(e) => problems.push(format!("expected.{}: {e}", expected.output)),
            Ok(v) => {
                if let Tolerance::Relative(_) = expected.tolerance {
                    if v == 0.0 {
                        problems.push(format!(
                            "expected.{}: a zero value needs an abs tolerance",
                            expected.output
                        ));
                    }
                }
            }
        }
        if let Tolerance::Absolute(text) = &expected.tolerance {
            if let Err(e) = parse_difference(text, kind) {
                problems.push(format!("expected.{}: abs: {e}", expected.output));
            }
            if kind == QuantityKind::Temperature {
                problems.push(format!("expected.{}: use rel_tol for temperatures", expected.output));
            }
        }
    }
    problems
}

fn report(problems: &[(PathBuf, String)]) -> String {
    problems
        .iter()
        .map(|(path, p)| format!("  {}: {p}", path.display()))
        .collect::<Vec<_>>()
        .join("\n")
}

#[test]
fn every_reference_case_names_its_source_and_fits_its_target() {
    let (cases, load_errors) = load_cases(&reference_dir());
    let mut problems: Vec<(PathBuf, String)> = load_errors.into_iter().map(|e| (PathBuf::from("(load)"), e)).collect();
    for case in &cases {
        let mut found: Vec<String> = Vec::new();
        found.extend(source_problem(case));
        found.extend(file_name_problem(case));
        if case.title.trim().is_empty() {
            found.push("has an empty title".into());
        }
        found.extend(target_problems(case));
        problems.extend(found.into_iter().map(|p| (case.path.clone(), p)));
    }
    assert!(
        problems.is_empty(),
        "reference cases break the rules:\n{}",
        report(&problems)
    );
    assert!(
        cases.len() >= MIN_REFERENCE_CASES,
        "only {} reference cases in {}; at least {MIN_REFERENCE_CASES} are required",
        cases.len(),
        reference_dir().display()
    );
}

#[test]
fn every_pending_case_names_its_source() {
    let dir = pending_dir();
    if !dir.exists() {
        return;
    }
    let (cases, load_errors) = load_cases(&dir);
    let mut problems: Vec<(PathBuf, String)> = load_errors.into_iter().map(|e| (PathBuf::from("(load)"), e)).collect();
    for case in &cases {
        let mut found: Vec<String> = Vec::new();
        found.extend(source_problem(case));
        found.extend(file_name_problem(case));
        if let Target::Function(_) = case.target {
            found.push("function cases belong in tests/data/reference/ (functions always exist)".into());
        }
        problems.extend(found.into_iter().map(|p| (case.path.clone(), p)));
        if output_kinds(&case.target).is_ok() {
            // Not a failure: the calculator landed; the case moves to reference/ once it passes.
            println!(
                "note: {} targets {}, which is now registered",
                case.name(),
                case.target.describe()
            );
        }
    }
    assert!(
        problems.is_empty(),
        "pending cases break the rules:\n{}",
        report(&problems)
    );
}

#[test]
fn every_calculator_has_a_sourced_case() {
    let (cases, _) = load_cases(&reference_dir());
    let missing: Vec<&str> = fluxledger_core::calculators::CALCULATORS
        .iter()
        .map(|c| c.key)
        .filter(|key| {
            !cases
                .iter()
                .any(|case| case.target == Target::Calculator(key.to_string()) && !case.expected.is_empty())
        })
        .collect();
    assert!(
        missing.is_empty(),
        "these calculators have no reference case that checks their outputs: {}",
        missing.join(", ")
    );
}

fn rust_files(dir: &Path, out: &mut Vec<PathBuf>) {
    let Ok(entries) = std::fs::read_dir(dir) else { return };
    for entry in entries.flatten() {
        let path = entry.path();
        if path.is_dir() {
            rust_files(&path, out);
        } else if path.extension().and_then(|e| e.to_str()) == Some("rs") {
            out.push(path);
        }
    }
}

#[test]
fn every_core_module_starts_with_a_module_doc() {
    let mut files = Vec::new();
    rust_files(&workspace_root().join("core").join("src"), &mut files);
    assert!(!files.is_empty(), "no Rust files found under core/src");
    let missing: Vec<String> = files
        .iter()
        .filter(|path| {
            let text = std::fs::read_to_string(path).unwrap_or_default();
            !text.trim_start_matches('\u{feff}').starts_with("//!")
        })
        .map(|p| format!("  {}", p.display()))
        .collect();
    assert!(
        missing.is_empty(),
        "these core files do not start with a `//!` module doc:\n{}",
        missing.join("\n")
    );
}
