//! Reference cases: every file in `tests/data/reference/` goes through the one
//! `check(case)` driver in `fluxledger_tests`, which solves the case with the same
//! typed strings a user would type and compares each expected output, in SI, with
//! the tolerance the case file gives. A case whose calculator is not registered
//! fails (cases written ahead of their calculator wait in `tests/data/pending/`).
//!
//! `FLUXLEDGER_CASE=<text>` runs only the cases whose file name contains `<text>`.

use fluxledger_tests::{check, load_cases, reference_dir};

#[test]
fn reference_cases_match_their_sources() {
    let (cases, load_errors) = load_cases(&reference_dir());
    let filter = std::env::var("FLUXLEDGER_CASE").unwrap_or_default();
    let selected: Vec<_> = cases.iter().filter(|c| c.name().contains(filter.as_str())).collect();
    assert!(
        !selected.is_empty(),
        "no reference case matched '{filter}' in {}",
        reference_dir().display()
    );

    let mut failures: Vec<String> = load_errors
        .iter()
        .map(|e| format!("case file does not load: {e}\n"))
        .collect();
    for case in &selected {
        if let Err(report) = check(case) {
            failures.push(report);
        }
    }
    if !failures.is_empty() {
        for report in &failures {
            eprintln!("{report}");
        }
        panic!(
            "{} of {} reference cases failed (reports above)",
            failures.len(),
            selected.len() + load_errors.len()
        );
    }
    println!("{} reference cases passed", selected.len());
}
