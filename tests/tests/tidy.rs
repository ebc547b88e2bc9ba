//! Tidy: project rules that `cargo test` enforces.
//!
//! - every reference case (and every pending one) loads, has a title and names a
//!   source that says where its value comes from (see DEVELOPERS.md, "Sources");
//! - every reference case targets a registered calculator or a known core function,
//!   types only fields that exist, expects only outputs that exist, and its expected
//!   values and tolerances parse as the output's quantity kind;
//! - there are at least 25 reference cases, and every registered calculator has at
//!   least one that checks its outputs against a source;
//! - every `core/src/**/*.rs` file starts with a `//!` module doc;
//! - registry lint over every calculator: unique calculator, field, option and
//!   output keys; `visible_when` names a choice field and real options of it; every
//!   quantity field has SI and US units of its kind and finite limits within the
//!   kind's physical ceiling; demo values parse, lie within limits and are among the
//!   options; option lists backed by a data table (pipe sizes, soils, test rules)
//!   list exactly its entries and their labels show its values; the demo page solves
//!   in both unit systems without defects or disagreeing checks;
//! - every field key is a glossary term (`core/src/glossary.rs`), no page uses a key
//!   it retired, a choice offers only its term's options, and every alias lands on a
//!   field of its page;
//! - the invariants DEVELOPERS.md states as absences: no `serde` in the core, no
//!   HTML-writing DOM calls in any page script, every wasm export named in
//!   DEVELOPERS.md, every intra-doc link of the core resolving, no core line wider
//!   than rustfmt's `max_width`, no calculator adding tables, diagrams or plots to
//!   a solution past the report (a headline solve must be able to skip them);
//! - the words on the pages: no user-facing text (titles, labels, help, options,
//!   cautions, the tables, diagrams, plots, warnings and checks of the demo and of
//!   every sourced case, the method notes) uses developer wording ("from memory",
//!   test folders, library calls), and every method note's first section holds the
//!   governing equation the calculation sheet prints.

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

/// The calls in `source` that add tables, diagrams or plots to a solution directly
/// (`….tables.push(`, also split over lines by rustfmt), one entry per call.
fn direct_part_writes(source: &str) -> Vec<String> {
    let compact: String = source.chars().filter(|c| !c.is_whitespace()).collect();
    let mut found = Vec::new();
    for part in ["tables", "diagrams", "plots"] {
        for verb in ["push", "extend", "insert", "append"] {
            let needle = format!(".{part}.{verb}(");
            found.extend(compact.matches(&needle).map(str::to_string));
        }
    }
    found
}

#[test]
fn calculators_add_tables_diagrams_and_plots_only_through_the_report() {
    // A headline solve (`Detail::Headline`) skips them by not calling the builders
    // given to `Report::table`, `diagram` and `plot`; a direct push would be built
    // (and paid for) on every keystroke.
    let mut files = Vec::new();
    rust_files(
        &workspace_root().join("core").join("src").join("calculators"),
        &mut files,
    );
    assert!(files.len() > 20, "too few calculator files found: {}", files.len());
    let problems: Vec<String> = files
        .iter()
        .flat_map(|path| {
            direct_part_writes(&read_text(path))
                .into_iter()
                .map(move |what| format!("{}: `{what}` (use Report::table, diagram or plot)", path.display()))
        })
        .collect();
    assert!(problems.is_empty(), "{}", problems.join("\n"));
    // The reader sees the forms rustfmt writes.
    assert_eq!(
        direct_part_writes("report\n    .solution\n    .tables\n    .push(t);").len(),
        1
    );
    assert_eq!(direct_part_writes("report.solution.plots.extend(p);").len(), 1);
    assert!(direct_part_writes("report.table(|r| t);").is_empty());
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

// ---------------------------------------------------------------------------------
// Invariants that DEVELOPERS.md states as absences.

fn read_text(path: &Path) -> String {
    std::fs::read_to_string(path).unwrap_or_else(|e| panic!("cannot read {}: {e}", path.display()))
}

/// The dependency names of a `Cargo.toml` table header (`[dependencies]`,
/// `[target.'cfg(...)'.dependencies]`, `[dependencies.name]`…).
fn dependency_names(manifest: &str) -> Vec<String> {
    let mut names = Vec::new();
    let mut in_dependencies = false;
    for line in manifest.lines().map(str::trim) {
        if let Some(header) = line.strip_prefix('[').and_then(|l| l.strip_suffix(']')) {
            let header = header.trim_matches(['[', ']']);
            in_dependencies = false;
            for table in ["dependencies", "dev-dependencies", "build-dependencies"] {
                if header == table || header.ends_with(&format!(".{table}")) {
                    in_dependencies = true;
                } else if let Some((_, name)) = header.split_once(&format!("{table}.")) {
                    names.push(name.trim_matches('"').to_string());
                }
            }
            continue;
        }
        if in_dependencies && !line.starts_with('#') {
            if let Some((name, _)) = line.split_once('=') {
                names.push(name.trim().trim_matches('"').to_string());
            }
        }
    }
    names
}

#[test]
fn the_core_has_no_serde_dependency() {
    let manifest = read_text(&workspace_root().join("core").join("Cargo.toml"));
    let names = dependency_names(&manifest);
    assert!(
        !names.is_empty(),
        "no dependencies read from core/Cargo.toml: is the reader broken?"
    );
    let serde: Vec<&String> = names.iter().filter(|n| n.contains("serde")).collect();
    assert!(
        serde.is_empty(),
        "the core must not depend on serde (DEVELOPERS.md): {serde:?}"
    );
    // The reader must see a serde dependency written in any of the usual forms.
    for written in [
        "[dependencies]\nserde = \"1\"\n",
        "[dependencies]\nserde_json = { version = \"1\" }\n",
        "[dependencies.serde]\nversion = \"1\"\n",
        "[target.'cfg(unix)'.dependencies]\nserde = \"1\"\n",
    ] {
        assert!(
            dependency_names(written).iter().any(|n| n.contains("serde")),
            "the dependency reader misses serde in {written:?}"
        );
    }
}

fn files_with_extension(dir: &Path, extension: &str, out: &mut Vec<PathBuf>) {
    let Ok(entries) = std::fs::read_dir(dir) else { return };
    for entry in entries.flatten() {
        let path = entry.path();
        if path.is_dir() {
            files_with_extension(&path, extension, out);
        } else if path.extension().and_then(|e| e.to_str()) == Some(extension) {
            out.push(path);
        }
    }
}

/// DOM calls that parse a string as HTML: the page script builds elements instead.
const HTML_WRITERS: &[&str] = &["innerHTML", "outerHTML", "insertAdjacentHTML", "document.write"];

fn html_writer_lines(text: &str) -> Vec<(usize, &'static str)> {
    let mut found = Vec::new();
    for (number, line) in text.lines().enumerate() {
        for writer in HTML_WRITERS {
            if line.contains(writer) {
                found.push((number + 1, *writer));
            }
        }
    }
    found
}

#[test]
fn no_page_script_writes_html() {
    let mut scripts = Vec::new();
    files_with_extension(&workspace_root().join("site").join("assets"), "js", &mut scripts);
    assert!(!scripts.is_empty(), "no page script found under site/assets");
    let mut problems = Vec::new();
    for script in &scripts {
        for (line, writer) in html_writer_lines(&read_text(script)) {
            problems.push(format!("{}:{line}: {writer}", script.display()));
        }
    }
    assert!(
        problems.is_empty(),
        "page scripts must build elements, never parse strings as HTML (DEVELOPERS.md):\n  {}",
        problems.join("\n  ")
    );
    assert_eq!(
        html_writer_lines("x.innerHTML = y;\nok();\nel.insertAdjacentHTML('x', y)").len(),
        2
    );
}

/// The names of the functions marked `#[wasm_bindgen]` in a Rust source.
fn wasm_exports(source: &str) -> Vec<String> {
    let mut exports = Vec::new();
    let mut marked = false;
    for line in source.lines().map(str::trim) {
        if line.starts_with("#[wasm_bindgen") {
            marked = true;
            continue;
        }
        if marked && !line.starts_with("#[") && !line.starts_with("///") {
            let name = line
                .split_once("fn ")
                .map(|(_, rest)| rest.split(['(', '<']).next().unwrap_or("").trim().to_string());
            if let Some(name) = name.filter(|n| !n.is_empty()) {
                exports.push(name);
            }
            marked = false;
        }
    }
    exports
}

#[test]
fn every_wasm_export_is_named_in_developers_md() {
    let mut sources = Vec::new();
    rust_files(&workspace_root().join("wasm").join("src"), &mut sources);
    let exports: Vec<String> = sources.iter().flat_map(|p| wasm_exports(&read_text(p))).collect();
    assert!(!exports.is_empty(), "no #[wasm_bindgen] export found in wasm/src");
    let developers = read_text(&workspace_root().join("DEVELOPERS.md"));
    let missing: Vec<&String> = exports
        .iter()
        .filter(|name| !developers.contains(&format!("`{name}()`")))
        .collect();
    assert!(
        missing.is_empty(),
        "these wasm exports are not named (as `name()`) in DEVELOPERS.md: {missing:?}"
    );
    assert_eq!(
        wasm_exports("/// Doc.\n#[wasm_bindgen]\npub fn solve(key: &str) {}\nfn helper() {}"),
        ["solve"]
    );
}

/// The `max_width` of the workspace's rustfmt.toml (rustfmt's default is 100).
fn max_width() -> usize {
    read_text(&workspace_root().join("rustfmt.toml"))
        .lines()
        .filter_map(|l| l.split_once('='))
        .find(|(key, _)| key.trim() == "max_width")
        .and_then(|(_, value)| value.trim().parse().ok())
        .unwrap_or(100)
}

#[test]
fn core_lines_are_within_the_configured_width() {
    let width = max_width();
    let core = workspace_root().join("core").join("src");
    let mut files = Vec::new();
    rust_files(&core, &mut files);
    let mut problems = Vec::new();
    for path in &files {
        let relative = path
            .strip_prefix(&core)
            .unwrap_or(path)
            .to_string_lossy()
            .replace('\\', "/");
        let text = read_text(path);
        let wide: Vec<usize> = text
            .lines()
            .enumerate()
            .filter(|(_, line)| line.chars().count() > width)
            .map(|(number, _)| number + 1)
            .collect();
        if !wide.is_empty() {
            problems.push(format!("core/src/{relative}: lines {wide:?}"));
        }
    }
    assert!(
        problems.is_empty(),
        "lines wider than rustfmt.toml's max_width = {width} (move long texts into named consts and run \
         cargo fmt):\n  {}",
        problems.join("\n  ")
    );
}

/// Every intra-doc link of the core resolves: rustdoc with broken links denied, in
/// its own target directory so it neither waits for nor invalidates the test build.
#[test]
fn every_core_intra_doc_link_resolves() {
    let root = workspace_root();
    let cargo = std::env::var("CARGO").unwrap_or_else(|_| "cargo".into());
    let output = std::process::Command::new(cargo)
        .current_dir(&root)
        .args(["doc", "-p", "fluxledger-core", "--no-deps", "--offline", "--quiet"])
        .env("RUSTDOCFLAGS", "-D rustdoc::broken_intra_doc_links")
        .env("CARGO_TARGET_DIR", root.join("target").join("tidy-doc"))
        .output()
        .expect("cargo runs");
    assert!(
        output.status.success(),
        "broken intra-doc links in the core:\n{}",
        String::from_utf8_lossy(&output.stderr)
    );
}

// ---------------------------------------------------------------------------------
// Registry lint: every calculator's description, checked against itself and against
// the data tables behind its option lists.

mod registry {
    use std::collections::BTreeSet;

    use fluxledger_core::calculators::{self, CALCULATORS};
    use fluxledger_core::catalog::{
        self, demo_request, is_visible, largest_meaningful, smallest_meaningful, CalculatorSpec, ChoiceOption,
        FieldKind, FieldSpec, MAX_TEXT_CHARS,
    };
    use fluxledger_core::restraint;
    use fluxledger_core::units::{self, QuantityKind};
    use fluxledger_core::{glossary, pipe_sizes};
    use fluxledger_core::{SolveError, UnitSystem};

    /// Keys that are stable in URLs: short, lowercase ASCII, digits and `_`/`-`.
    fn key_problem(what: &str, key: &str) -> Option<String> {
        let ok = !key.is_empty()
            && key.len() <= 24
            && key
                .chars()
                .all(|c| c.is_ascii_lowercase() || c.is_ascii_digit() || c == '_' || c == '-');
        (!ok).then(|| format!("{what} key '{key}' must be 1–24 characters of a–z, 0–9, '_' or '-'"))
    }

    fn duplicates<'a>(keys: impl IntoIterator<Item = &'a str>) -> Vec<&'a str> {
        let mut seen = BTreeSet::new();
        keys.into_iter().filter(|k| !seen.insert(*k)).collect()
    }

    fn quantity_problems(field: &FieldSpec, kind: QuantityKind) -> Vec<String> {
        let mut problems = Vec::new();
        let key = field.key;
        for (system, unit) in [("SI", field.si_unit), ("US", field.us_unit)] {
            match units::find_unit_of(unit, kind) {
                Some(_) => {}
                _ => problems.push(format!(
                    "field '{key}': {system} unit '{unit}' is not a unit of {kind:?}"
                )),
            }
        }
        let Some(limits) = field.limits else {
            problems.push(format!("field '{key}': a quantity field needs limits"));
            return problems;
        };
        let (smallest, largest) = (smallest_meaningful(kind), largest_meaningful(kind));
        if !(limits.min.is_finite() && limits.max.is_finite() && limits.min < limits.max) {
            problems.push(format!(
                "field '{key}': limits {} .. {} must be finite with min < max",
                limits.min, limits.max
            ));
        }
        if kind != QuantityKind::Temperature && (limits.min.abs() > largest || limits.max.abs() > largest) {
            problems.push(format!(
                "field '{key}': limits {} .. {} go beyond the physical ceiling ±{largest} of {kind:?} (catalog::largest_meaningful)",
                limits.min, limits.max
            ));
        }
        if kind != QuantityKind::Temperature && limits.max < smallest {
            problems.push(format!(
                "field '{key}': upper limit {} is below the smallest meaningful {kind:?} ({smallest})",
                limits.max
            ));
        }
        if !field.demo.is_empty() {
            match units::parse_quantity(field.demo, kind, field.si_unit) {
                Err(e) => problems.push(format!("field '{key}': demo '{}' does not parse: {e}", field.demo)),
                Ok(v) => {
                    if !limits.contains(v) {
                        problems.push(format!(
                            "field '{key}': demo '{}' ({v} SI) is outside its limits {:?}",
                            field.demo, limits
                        ));
                    }
                    if v != 0.0 && v.abs() < smallest && kind != QuantityKind::Temperature {
                        problems.push(format!(
                            "field '{key}': demo '{}' is below the smallest meaningful value",
                            field.demo
                        ));
                    }
                }
            }
        }
        problems
    }

    fn choice_problems(field: &FieldSpec, options: &[ChoiceOption]) -> Vec<String> {
        let mut problems = Vec::new();
        let key = field.key;
        if options.is_empty() {
            problems.push(format!("field '{key}': a choice needs options"));
        }
        for d in duplicates(options.iter().map(|o| o.key)) {
            problems.push(format!("field '{key}': option '{d}' is listed twice"));
        }
        for o in options {
            if o.key.is_empty()
                || o.key
                    .chars()
                    .any(|c| c.is_whitespace() || c == '&' || c == '=' || c == '#')
            {
                problems.push(format!("field '{key}': option key '{}' is not URL-safe", o.key));
            }
            if o.label.trim().is_empty() {
                problems.push(format!("field '{key}': option '{}' has no label", o.key));
            }
        }
        if !field.demo.is_empty() && !options.iter().any(|o| o.key == field.demo) {
            problems.push(format!(
                "field '{key}': demo '{}' is not one of its options",
                field.demo
            ));
        }
        problems.extend(data_table_problems(key, options));
        problems
    }

    /// Options backed by a data table must list exactly the table's entries (plus the
    /// "typed value" option), and a number in a label must be the table's value.
    fn data_table_problems(key: &str, options: &[ChoiceOption]) -> Vec<String> {
        let mut problems = Vec::new();
        let keys: BTreeSet<&str> = options.iter().map(|o| o.key).collect();
        let label_of = |k: &str| options.iter().find(|o| o.key == k).map(|o| o.label).unwrap_or("");
        let mut compare = |table: &str, expected: BTreeSet<&str>| {
            if keys != expected {
                problems.push(format!(
                    "field '{key}': options {:?} differ from the {table} entries {:?}",
                    keys.symmetric_difference(&expected).collect::<Vec<_>>(),
                    expected.len()
                ));
            }
        };
        if options == pipe_sizes::SIZE_OPTIONS {
            let expected = pipe_sizes::SIZES
                .iter()
                .map(|s| s.key)
                .chain([pipe_sizes::CUSTOM])
                .collect();
            compare("pipe_sizes::SIZES", expected);
            for size in pipe_sizes::SIZES {
                let label = label_of(size.key);
                for (what, metres) in [("OD", size.od), ("ID", size.id)] {
                    let shown = label
                        .split_once(&format!("{what} "))
                        .and_then(|(_, rest)| rest.split_once(" mm"))
                        .and_then(|(number, _)| number.trim().parse::<f64>().ok());
                    match shown {
                        Some(mm) if (mm / 1000.0 - metres).abs() <= 0.051e-3 => {}
                        _ => problems.push(format!(
                            "field '{key}': option '{}' label '{label}' does not show {what} {:.1} mm",
                            size.key,
                            metres * 1000.0
                        )),
                    }
                }
            }
        } else if options == restraint::soil::SOIL_OPTIONS {
            let expected = restraint::soil::SOILS.iter().map(|s| s.key).chain(["custom"]).collect();
            compare("restraint::soil::SOILS", expected);
            for soil in restraint::soil::SOILS {
                let label = label_of(soil.key);
                // "Sand: 2000 psf (...)": the value between ': ' and ' (' is the table's.
                let shown = label
                    .split_once(": ")
                    .and_then(|(_, rest)| rest.split_once(" ("))
                    .and_then(|(value, _)| units::parse_quantity(value, QuantityKind::Pressure, "kPa").ok());
                match shown {
                    Some(v) if (v - soil.bearing).abs() <= 1e-6 * soil.bearing.max(1.0) => {}
                    _ => problems.push(format!(
                        "field '{key}': option '{}' label '{label}' does not show the table's {} Pa",
                        soil.key, soil.bearing
                    )),
                }
            }
        } else if options == restraint::pressure::TEST_RULE_OPTIONS {
            let expected = restraint::pressure::TEST_RULES
                .iter()
                .map(|r| r.key)
                .chain(["custom"])
                .collect();
            compare("restraint::pressure::TEST_RULES", expected);
            for rule in restraint::pressure::TEST_RULES {
                // A field test is never below the working pressure it tests.
                for p in [0.0, 1e5, 1e6, 1e7] {
                    let test = (rule.apply)(p, 0.0);
                    if !(test.is_finite() && test >= p) {
                        problems.push(format!("test rule '{}' gives {test} Pa for {p} Pa", rule.key));
                    }
                }
            }
        }
        problems
    }

    fn spec_problems(spec: &CalculatorSpec) -> Vec<String> {
        let mut problems = Vec::new();
        problems.extend(key_problem("calculator", spec.key));
        for d in duplicates(spec.fields.iter().map(|f| f.key)) {
            problems.push(format!("field key '{d}' is used twice"));
        }
        for d in duplicates(spec.outputs.iter().map(|o| o.key)) {
            problems.push(format!("output key '{d}' is used twice"));
        }
        for o in &spec.outputs {
            problems.extend(key_problem("output", o.key));
        }
        let demo = demo_request(spec, &[]);
        for field in &spec.fields {
            problems.extend(key_problem("field", field.key));
            if let Some((target, allowed)) = field.visible_when {
                match spec.field(target).map(|t| &t.kind) {
                    None => problems.push(format!("field '{}': visible_when names no field '{target}'", field.key)),
                    Some(FieldKind::Choice(options)) => {
                        if target == field.key {
                            problems.push(format!("field '{}': visible_when names itself", field.key));
                        }
                        if allowed.is_empty() {
                            problems.push(format!("field '{}': visible_when lists no options", field.key));
                        }
                        for a in allowed.iter() {
                            if !options.iter().any(|o| o.key == *a) {
                                problems.push(format!(
                                    "field '{}': visible_when names '{a}', not an option of '{target}'",
                                    field.key
                                ));
                            }
                        }
                    }
                    Some(_) => problems.push(format!(
                        "field '{}': visible_when names '{target}', which is not a choice field",
                        field.key
                    )),
                }
            }
            match &field.kind {
                FieldKind::Quantity(kind) => problems.extend(quantity_problems(field, *kind)),
                FieldKind::Choice(options) => problems.extend(choice_problems(field, options)),
                FieldKind::Text => {
                    if field.demo.chars().count() > MAX_TEXT_CHARS {
                        problems.push(format!("field '{}': demo text is longer than fields accept", field.key));
                    }
                }
            }
            if field.demo.is_empty() && !field.optional && is_visible(field, &demo) {
                problems.push(format!(
                    "field '{}' is required and shown with the demo inputs but has no demo value",
                    field.key
                ));
            }
        }
        // The demo page solves cleanly in both unit systems.
        for system in [UnitSystem::Si, UnitSystem::UsCustomary] {
            let mut request = demo.clone();
            request.system = system;
            match calculators::solve(spec.key, &request).result {
                Ok(solution) => {
                    for d in &solution.defects {
                        problems.push(format!("demo ({system:?}): defect: {d}"));
                    }
                    for c in solution.checks.iter().filter(|c| !c.agrees()) {
                        problems.push(format!("demo ({system:?}): check '{}' disagrees: {c:?}", c.label));
                    }
                }
                Err(SolveError::Fields(errors)) => {
                    problems.push(format!("demo ({system:?}) is refused: {}", SolveError::Fields(errors)))
                }
                Err(other) => problems.push(format!("demo ({system:?}): {other}")),
            }
        }
        problems
    }

    #[test]
    fn every_calculator_description_is_consistent() {
        let specs = calculators::catalog();
        let mut problems: Vec<String> = duplicates(CALCULATORS.iter().map(|c| c.key))
            .into_iter()
            .map(|d| format!("calculator key '{d}' is registered twice"))
            .collect();
        for (calculator, spec) in CALCULATORS.iter().zip(&specs) {
            if calculator.key != spec.key {
                problems.push(format!(
                    "registered as '{}' but its spec says '{}'",
                    calculator.key, spec.key
                ));
            }
            if ![
                catalog::group::FITTINGS,
                catalog::group::JETS_AND_ROTORS,
                catalog::group::FLOW_AND_TANKS,
            ]
            .contains(&spec.group)
            {
                problems.push(format!("{}: unknown group '{}'", spec.key, spec.group));
            }
            problems.extend(spec_problems(spec).into_iter().map(|p| format!("{}: {p}", spec.key)));
        }
        assert!(
            problems.is_empty(),
            "calculator descriptions break the registry rules:\n  {}",
            problems.join("\n  ")
        );
    }

    /// A page's field keys against the glossary: each is a term, none is a key the
    /// page retired, and a choice offers only options of its term.
    fn glossary_problems(spec: &CalculatorSpec) -> Vec<String> {
        let mut problems = Vec::new();
        for field in &spec.fields {
            let key = field.key;
            if let Some(alias) = glossary::KEY_ALIASES
                .iter()
                .find(|a| a.page == spec.key && a.old == key)
            {
                problems.push(format!(
                    "field '{key}' is a retired key of this page (now '{}', glossary::KEY_ALIASES)",
                    alias.new
                ));
            }
            let Some(term) = glossary::term_of(key) else {
                problems.push(format!("field '{key}' is not a glossary term (glossary::TERMS)"));
                continue;
            };
            if let FieldKind::Choice(options) = &field.kind {
                // A choice backed by a data table (pipe sizes, soils) lists its
                // entries: the term has no option list of its own to compare with.
                if term.options.is_empty() {
                    continue;
                }
                for o in options.iter().filter(|o| !term.options.contains(&o.key)) {
                    problems.push(format!(
                        "field '{key}': option '{}' is not an option of the glossary term {:?}",
                        o.key, term.options
                    ));
                }
            } else if !term.options.is_empty() {
                problems.push(format!("field '{key}' is a choice in the glossary but not on the page"));
            }
        }
        problems
    }

    #[test]
    fn every_field_key_is_a_glossary_term() {
        let mut problems = Vec::new();
        for spec in calculators::catalog() {
            let found = glossary_problems(&spec);
            problems.extend(found.into_iter().map(|p| format!("{}: {p}", spec.key)));
        }
        assert!(
            problems.is_empty(),
            "field keys break the glossary (core/src/glossary.rs):\n  {}",
            problems.join("\n  ")
        );
    }

    /// Every retired key of a page's alias table lands on a field of that page (and
    /// a renamed option value on an option of it), so that an old bookmarked link
    /// still fills the page.
    #[test]
    fn every_alias_lands_on_a_field_of_its_page() {
        let mut problems = Vec::new();
        for alias in glossary::KEY_ALIASES {
            let Some(spec) = calculators::spec(alias.page) else {
                problems.push(format!("alias {} → {}: no page '{}'", alias.old, alias.new, alias.page));
                continue;
            };
            let Some(field) = spec.field(alias.new) else {
                problems.push(format!(
                    "{}: alias {} → {} names no field",
                    alias.page, alias.old, alias.new
                ));
                continue;
            };
            for (old, new) in alias.values {
                let offered = match &field.kind {
                    FieldKind::Choice(options) => options.iter().any(|o| o.key == *new),
                    _ => false,
                };
                if !offered {
                    problems.push(format!(
                        "{}: alias value {}={old} → {}={new} is not an option of the page",
                        alias.page, alias.old, alias.new
                    ));
                }
            }
        }
        assert!(
            problems.is_empty(),
            "aliases that fill no field:\n  {}",
            problems.join("\n  ")
        );
        // An old link to the reaction arm reads as today's keys, and says what it read.
        let old: Vec<(String, String)> = [("drive", "pressure"), ("p", "300 kPa"), ("n_held", "100 rpm")]
            .iter()
            .map(|(k, v)| (k.to_string(), v.to_string()))
            .collect();
        let upgraded = glossary::upgrade("reaction-arm", &old);
        let keys: Vec<(&str, &str)> = upgraded.pairs.iter().map(|(k, v)| (k.as_str(), v.as_str())).collect();
        assert_eq!(keys, [("flow_given", "p"), ("p", "300 kPa"), ("speed_held", "100 rpm")]);
        assert_eq!(upgraded.translations.len(), 2);
    }

    /// The glossary check must be able to fail: a retired key, an unknown key and a
    /// foreign option are each caught.
    #[test]
    fn the_glossary_check_catches_each_fault() {
        let good = calculators::spec("runner").expect("runner is registered");
        let faults: Vec<(&str, Box<dyn Fn(&mut CalculatorSpec)>)> = vec![
            (
                "retired key",
                Box::new(|s| {
                    if let Some(f) = s.fields.iter_mut().find(|f| f.key == "speed") {
                        f.key = "n";
                    }
                }),
            ),
            ("not a glossary term", Box::new(|s| s.fields[0].key = "no_such_concept")),
            (
                "not an option of the glossary term",
                Box::new(|s| {
                    if let Some(f) = s.fields.iter_mut().find(|f| f.key == "fluid") {
                        f.kind = FieldKind::Choice(&[ChoiceOption {
                            key: "lava",
                            label: "Lava",
                        }]);
                    }
                }),
            ),
        ];
        for (expected, fault) in faults {
            let mut spec = good.clone();
            fault(&mut spec);
            let found = glossary_problems(&spec);
            assert!(
                found.iter().any(|p| p.contains(expected)),
                "a fault expected to give '{expected}' gave {found:?}"
            );
        }
    }

    /// The lint must be able to fail: a description with each kind of fault is caught.
    #[test]
    fn the_registry_lint_catches_each_fault() {
        let good = calculators::spec("bend").expect("bend is registered");
        assert!(spec_problems(&good).is_empty(), "{:?}", spec_problems(&good));
        let faults: Vec<(&str, Box<dyn Fn(&mut CalculatorSpec)>)> = vec![
            ("used twice", Box::new(|s| s.fields.push(s.fields[0].clone()))),
            ("output key", Box::new(|s| s.outputs.push(s.outputs[0].clone()))),
            (
                "visible_when names no field",
                Box::new(|s| s.fields[1].visible_when = Some(("nothing", &["x"]))),
            ),
            (
                "not an option",
                Box::new(|s| s.fields[1].visible_when = Some(("fluid", &["lava"]))),
            ),
            ("outside its limits", Box::new(|s| s.fields[1].demo = "20 m")),
            (
                "not one of its options",
                Box::new(|s| {
                    if let Some(f) = s.fields.iter_mut().find(|f| f.key == "fluid") {
                        f.demo = "lava";
                    }
                }),
            ),
            (
                "physical ceiling",
                Box::new(|s| {
                    if let Some(l) = s.fields[1].limits.as_mut() {
                        l.max = 1e300;
                    }
                }),
            ),
            ("needs limits", Box::new(|s| s.fields[1].limits = None)),
        ];
        for (expected, fault) in faults {
            let mut spec = good.clone();
            fault(&mut spec);
            let found = spec_problems(&spec);
            assert!(
                found.iter().any(|p| p.contains(expected)),
                "a fault expected to give '{expected}' gave {found:?}"
            );
        }
    }
}

// ---------------------------------------------------------------------------------
// The words on the pages: what users read says what a source is, never how the
// developers remember it or where the tests keep it.

mod user_words {
    use fluxledger_core::calculators::{self, CALCULATORS};
    use fluxledger_core::catalog::{self, CalculatorSpec, FieldKind, Request, Shape, Solution};
    use fluxledger_core::units;
    use fluxledger_core::{solve, SolveError, UnitSystem};
    use fluxledger_tests::{load_cases, reference_dir, workspace_root, Target};

    /// Developer wording that belongs in the test data and code comments, not on a
    /// page, a sheet or a method note (matched in lower case).
    const DEVELOPER_WORDING: &[&str] = &[
        "from memory",
        "tests/",
        "src/",
        "test suite",
        "reference case",
        "pending/",
        "fluids==",
        "fluids.",
        "nearest_pipe",
        "scipy",
        "iapws==",
        "python",
        "pip install",
        "==",
        "cargo ",
    ];

    /// The developer wording in one text, if any.
    fn wording_in(text: &str) -> Option<&'static str> {
        let lower = text.to_lowercase();
        DEVELOPER_WORDING.iter().copied().find(|w| lower.contains(w))
    }

    /// Every user-facing text of a description: `(where, text)`.
    fn spec_texts(spec: &CalculatorSpec) -> Vec<(String, String)> {
        let mut out = vec![
            ("title".to_string(), spec.title.to_string()),
            ("summary".to_string(), spec.summary.to_string()),
        ];
        for f in &spec.fields {
            out.push((format!("label of {}", f.key), f.label.to_string()));
            out.push((format!("help of {}", f.key), f.help.to_string()));
            if let FieldKind::Choice(options) = &f.kind {
                for o in options.iter() {
                    out.push((format!("option {}={}", f.key, o.key), o.label.to_string()));
                }
            }
        }
        for o in &spec.outputs {
            out.push((format!("output {}", o.key), o.label.to_string()));
        }
        for (i, c) in spec.cautions.iter().enumerate() {
            out.push((format!("caution {i}"), c.to_string()));
        }
        out
    }

    /// Every user-facing text of a solution: tables, diagrams, plots, warnings,
    /// checks and carry-over links.
    fn solution_texts(solution: &Solution) -> Vec<(String, String)> {
        let mut out = Vec::new();
        for t in &solution.tables {
            out.push((format!("table {} title", t.key), t.title.clone()));
            for c in &t.columns {
                out.push((format!("table {} column", t.key), c.clone()));
            }
            for row in &t.rows {
                for cell in row {
                    out.push((format!("table {} cell", t.key), cell.clone()));
                }
            }
        }
        for d in &solution.diagrams {
            out.push(("diagram title".into(), d.title.clone()));
            out.push(("diagram caption".into(), d.caption.clone()));
            for s in &d.shapes {
                if let Shape::Arrow { label: text, .. } | Shape::Text { text, .. } = s {
                    out.push(("diagram label".into(), text.clone()));
                }
            }
        }
        for p in &solution.plots {
            out.push((format!("plot {}", p.key), p.title.clone()));
            out.push((format!("plot {} axis", p.key), p.x_label.clone()));
            out.push((format!("plot {} axis", p.key), p.y_label.clone()));
            for s in &p.series {
                out.push((format!("plot {} series", p.key), s.name.clone()));
            }
            for m in &p.markers {
                out.push((format!("plot {} marker", p.key), m.label.clone()));
            }
        }
        for w in &solution.warnings {
            out.push(("warning".into(), w.message.clone()));
        }
        for c in &solution.checks {
            out.push(("check".into(), format!("{}: {}", c.label, c.basis)));
        }
        for c in &solution.carry_over {
            out.push(("carry-over link".into(), c.label.clone()));
        }
        out
    }

    /// The texts of one solved request: the solution's, or the field errors'.
    fn solved_texts(key: &str, request: &Request) -> Vec<(String, String)> {
        match solve(key, request).result {
            Ok(solution) => solution_texts(&solution),
            Err(SolveError::Fields(errors)) => errors
                .iter()
                .map(|e| (format!("error on {}", e.field), e.kind.to_string()))
                .collect(),
            Err(other) => vec![("error".into(), other.to_string())],
        }
    }

    /// Every text users can read: each description, its demo solved in both unit
    /// systems, and every sourced case's inputs solved as the case does (they open
    /// modes the demo does not), plus the common cautions.
    fn every_user_text() -> Vec<(String, String)> {
        let mut out: Vec<(String, String)> = catalog::COMMON_CAUTIONS
            .iter()
            .map(|c| ("common caution".to_string(), c.text.to_string()))
            .collect();
        for spec in calculators::catalog() {
            let page = spec.key;
            out.extend(spec_texts(&spec).into_iter().map(|(w, t)| (format!("{page}: {w}"), t)));
            for system in [UnitSystem::Si, UnitSystem::UsCustomary] {
                let request = Request {
                    system,
                    ..catalog::demo_request(&spec, &[])
                };
                let texts = solved_texts(page, &request);
                out.extend(texts.into_iter().map(|(w, t)| (format!("{page} demo: {w}"), t)));
            }
        }
        let (cases, _) = load_cases(&reference_dir());
        for case in cases {
            let Target::Calculator(key) = &case.target else {
                continue;
            };
            if !CALCULATORS.iter().any(|c| c.key == key) {
                continue;
            }
            let request = Request {
                inputs: case.inputs.clone(),
                field_units: case.units.clone(),
                system: case.system,
            };
            let name = case.name();
            out.extend(
                solved_texts(key, &request)
                    .into_iter()
                    .map(|(w, t)| (format!("{key} ({name}): {w}"), t)),
            );
        }
        out
    }

    /// The method notes, paragraph by paragraph: `(where, text)`.
    fn note_texts() -> Vec<(String, String)> {
        let dir = workspace_root().join("site").join("notes");
        let mut paths: Vec<_> = std::fs::read_dir(&dir)
            .map(|entries| entries.filter_map(|e| e.ok().map(|e| e.path())).collect())
            .unwrap_or_default();
        paths.sort();
        assert!(!paths.is_empty(), "no method notes in {}", dir.display());
        let mut out = Vec::new();
        for path in paths {
            let text = std::fs::read_to_string(&path).unwrap_or_default();
            let name = path
                .file_name()
                .map(|n| n.to_string_lossy().into_owned())
                .unwrap_or_default();
            for (i, line) in text.lines().enumerate() {
                out.push((format!("{name}:{}", i + 1), line.to_string()));
            }
        }
        out
    }

    fn problems(texts: &[(String, String)]) -> Vec<String> {
        texts
            .iter()
            .filter_map(|(place, text)| wording_in(text).map(|w| format!("{place}: '{w}' in \"{text}\"")))
            .collect()
    }

    #[test]
    fn no_page_text_uses_developer_wording() {
        let found = problems(&every_user_text());
        assert!(
            found.is_empty(),
            "user-facing text names how the developers know a value (keep that in tests/data and \
             code comments; name the published source instead):\n  {}",
            found.join("\n  ")
        );
    }

    #[test]
    fn no_method_note_uses_developer_wording() {
        let found = problems(&note_texts());
        assert!(
            found.is_empty(),
            "a method note uses developer wording (name the published source instead):\n  {}",
            found.join("\n  ")
        );
    }

    /// A unit written as its ASCII code where people read a label (`degC` for °C,
    /// `m3/h` for m³/h, `kN/m3` for kN/m³): the codes are for links and selectors.
    fn unit_code_in(text: &str) -> Option<&'static str> {
        // What a user types is quoted ('bend 45deg di52_12'): typed syntax uses codes.
        let unquoted: String = text.split('\'').step_by(2).collect::<Vec<_>>().join(" ");
        unquoted
            .split(|c: char| c.is_whitespace() || "(),;:".contains(c))
            .map(|token| token.trim_end_matches(['.', '\'', '"']))
            .filter(|token| !token.is_empty())
            .find_map(|token| {
                // A number written against its unit ("20degC") is read the same way.
                let token = token.trim_start_matches(|c: char| c.is_ascii_digit() || "+-.".contains(c));
                units::UNITS
                    .iter()
                    .find(|u| u.id == token && u.label() != u.id)
                    .map(|u| u.id)
            })
    }

    /// Help, labels, options, cautions and summaries name units by their labels.
    #[test]
    fn descriptions_show_unit_labels_not_codes() {
        let mut found = Vec::new();
        for spec in calculators::catalog() {
            for (place, text) in spec_texts(&spec) {
                if let Some(code) = unit_code_in(&text) {
                    found.push(format!("{}: {place}: '{code}' in \"{text}\"", spec.key));
                }
            }
        }
        assert!(
            found.is_empty(),
            "user-facing descriptions write unit codes; write the label (°C, m³/h, kN/m³…):\n  {}",
            found.join("\n  ")
        );
        assert_eq!(unit_code_in("0 to 99.9 degC (32 to 211.8 degF)."), Some("degC"));
        assert_eq!(unit_code_in("from 1 to 20 m3/h"), Some("m3/h"));
        assert_eq!(unit_code_in("at 20degC"), Some("degC"));
        assert_eq!(unit_code_in("e.g. 'bend 45deg di52_12'. Kinds: bend"), None);
        assert_eq!(unit_code_in("0 to 99.9 °C (32 to 211.8 °F); 45° or 300 mm."), None);
    }

    /// Warnings, tables, diagrams and plots of every demo and sourced case name units
    /// by their labels too (a warning once read "… 0.12 m2 …").
    #[test]
    fn solutions_show_unit_labels_not_codes() {
        let found: Vec<String> = every_user_text()
            .into_iter()
            .filter(|(place, _)| place.contains(" demo: ") || place.contains("): "))
            .filter_map(|(place, text)| unit_code_in(&text).map(|code| format!("{place}: '{code}' in \"{text}\"")))
            .collect();
        assert!(
            found.is_empty(),
            "solved pages write unit codes; format for people with units::with_label or Report::fmt:\n  {}",
            found.join("\n  ")
        );
    }

    /// The first section of a note, up to its second `## ` heading: what the
    /// calculation sheet prints as the method in a few lines.
    fn first_section(note: &str) -> &str {
        let body = note.strip_prefix("## ").unwrap_or(note);
        match body.find("\n## ") {
            Some(end) => &body[..end],
            None => body,
        }
    }

    /// The sheet prints a note's first section up to its first displayed equation,
    /// so that section must hold the governing equation.
    #[test]
    fn every_method_note_opens_with_its_governing_equation() {
        let dir = workspace_root().join("site").join("notes");
        let mut missing = Vec::new();
        for spec in calculators::catalog() {
            let path = dir.join(format!("{}.md", spec.key));
            let note = std::fs::read_to_string(&path).unwrap_or_default();
            if !first_section(&note).contains("$$") {
                missing.push(spec.key);
            }
        }
        assert!(
            missing.is_empty(),
            "the first section of these method notes has no displayed equation ($$…$$), so the \
             calculation sheet prints the method without it: {missing:?}"
        );
        // It can fail: a note whose equation comes only in its second section.
        assert!(!first_section("## What\n\ntext\n\n## 1. Method\n\n$$x = y$$\n").contains("$$"));
        assert!(first_section("## Method\n\n$$x = y$$\n\n## Sources\n").contains("$$"));
    }

    /// The check must be able to fail: each kind of developer wording is caught
    /// wherever it sits, and plain source names pass.
    #[test]
    fn the_wording_check_catches_each_kind() {
        for bad in [
            "AWWA C150 table (from memory)",
            "see tests/data/reference/",
            "ASME B36.10M via fluids==1.0.26 nearest_pipe",
            "scipy.integrate.quad",
            "quadrature with SciPy 1.17.1",
        ] {
            let texts = vec![("cell".to_string(), bad.to_string())];
            assert_eq!(problems(&texts).len(), 1, "{bad} was not caught");
        }
        for good in [
            "ASME B36.10M, checked against an independent library",
            "AWWA C150/C151, special thickness class 52",
            "NFPA 24 annex table of horizontal bearing strengths",
        ] {
            assert_eq!(wording_in(good), None, "{good} was caught");
        }
    }
}
