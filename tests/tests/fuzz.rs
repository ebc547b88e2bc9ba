//! Fuzz-style property over every registered calculator.
//!
//! Requests are generated from each calculator's own description
//! (`fluxledger_tests::generate`): values inside, at and just beyond every field's
//! limits, in either unit system's units, every option, and valid free text (a
//! generated line schedule or traverse) as well as junk; in a quarter of them two
//! quantities of one kind are typed nearly alike (equal or 1e-12 to 1e-4 apart: a
//! reducer's ends, blades as fast as the jet), where a balance's terms cancel and
//! a check scaled by its result alone reads rounding as a disagreement. For every
//! request the core accepts, nothing shown may be broken:
//!
//! - no output, diagram coordinate or plot point is NaN or ±∞;
//! - no output text, table cell or warning shows "—", "NaN" or "inf";
//! - `Solution::defects` is empty and every `Solution::checks` entry agrees;
//! - a headline solve (`Detail::Headline`, what a page asks for while typing) gives
//!   the full solve's outcome without its tables, diagrams and plots: the same
//!   values, warnings, checks, links, echoes and errors.
//!
//! Refused requests must name fields the calculator has. At least
//! [`MIN_SOLVED_SHARE`] of the requests drawn inside the limits must solve, so the
//! property cannot pass by refusing everything.
//!
//! Bounded in time: each calculator gets [`BUDGET`] (dev profile) and at least
//! [`MIN_REQUESTS`] requests. `FLUXLEDGER_FUZZ_SECONDS=60` runs longer;
//! `FLUXLEDGER_FUZZ_SEED` replays a run (the seed is printed on failure).

use std::time::{Duration, Instant};

use fluxledger_core::catalog::{CalculatorSpec, Detail, Solution};
use fluxledger_core::{calculators, Request, SolveError, UnitSystem};
use fluxledger_tests::generate::{self, Reach, Rng};

/// Time per calculator.
const BUDGET: Duration = Duration::from_millis(1500);
/// Requests per calculator at the least, whatever the time.
const MIN_REQUESTS: usize = 150;
/// The smallest share of requests drawn inside the limits that must solve.
const MIN_SOLVED_SHARE: f64 = 0.3;

fn budget() -> Duration {
    std::env::var("FLUXLEDGER_FUZZ_SECONDS")
        .ok()
        .and_then(|s| s.parse::<f64>().ok())
        .filter(|s| s.is_finite() && *s > 0.0)
        .map(Duration::from_secs_f64)
        .unwrap_or(BUDGET)
}

fn seed() -> u64 {
    std::env::var("FLUXLEDGER_FUZZ_SEED")
        .ok()
        .and_then(|s| s.parse().ok())
        .unwrap_or(0x5EED_F1E1_D5)
}

/// Text that shows a number that is not one: NaN or an infinity anywhere, or the
/// placeholder dash of a failed format as the whole text or in front of a unit
/// (`"—"`, `"— kN"`). A dash inside a sentence is punctuation.
fn broken_text(text: &str) -> bool {
    let trimmed = text.trim();
    let placeholder = trimmed == "—" || (trimmed.starts_with("— ") && !trimmed[4..].contains(' '));
    placeholder
        || trimmed
            .split(|c: char| c.is_whitespace() || matches!(c, '(' | ')' | ',' | ';' | ':' | '[' | ']' | '='))
            .any(|token| {
                let lower = token
                    .trim_matches(|c: char| c == '.' || c == '\'' || c == '"')
                    .to_ascii_lowercase();
                ["nan", "inf", "-inf", "+inf", "infinity", "-infinity"].contains(&lower.as_str())
            })
}

/// What is wrong with an accepted solution, if anything.
fn solution_problems(solution: &Solution) -> Vec<String> {
    let mut problems = Vec::new();
    for d in &solution.defects {
        problems.push(format!("defect: {d}"));
    }
    for c in &solution.checks {
        if !c.agrees() {
            problems.push(format!(
                "check '{}' disagrees: {} against {} ({})",
                c.label, c.value, c.reference, c.basis
            ));
        }
    }
    for o in &solution.outputs {
        if !o.si.is_finite() || broken_text(&o.text) {
            problems.push(format!("output {} = {} shown as '{}'", o.key, o.si, o.text));
        }
    }
    for t in &solution.tables {
        for (r, row) in t.rows.iter().enumerate() {
            for cell in row {
                if broken_text(cell) {
                    problems.push(format!("table '{}' row {r}: cell '{cell}' in {row:?}", t.key));
                }
            }
        }
        for c in &t.columns {
            if broken_text(c) {
                problems.push(format!("table '{}': column '{c}'", t.key));
            }
        }
    }
    for w in &solution.warnings {
        if broken_text(&w.message) {
            problems.push(format!("warning shows a broken number: {}", w.message));
        }
    }
    for d in &solution.diagrams {
        if !d.bounds.iter().all(|x| x.is_finite()) {
            problems.push(format!("diagram '{}' bounds {:?}", d.title, d.bounds));
        }
        for shape in &d.shapes {
            if !shape.is_finite() {
                problems.push(format!("diagram '{}': non-finite shape {shape:?}", d.title));
            }
        }
    }
    for p in &solution.plots {
        let series_ok = p.series.iter().flat_map(|s| &s.points).flatten().all(|x| x.is_finite());
        let markers_ok = p.markers.iter().flat_map(|m| m.at).all(|x| x.is_finite());
        if !(series_ok && markers_ok) {
            problems.push(format!("plot '{}' has a non-finite point", p.title));
        }
    }
    problems
}

/// The outcome of fuzzing one calculator.
#[derive(Default)]
struct Tally {
    requests: usize,
    valid_requests: usize,
    valid_solved: usize,
    failures: Vec<String>,
}

fn fuzz(spec: &CalculatorSpec, seed: u64, budget: Duration) -> Tally {
    let mut rng = Rng::new(seed);
    let mut tally = Tally::default();
    let start = Instant::now();
    while tally.requests < MIN_REQUESTS || start.elapsed() < budget {
        tally.requests += 1;
        let reach = if rng.chance(0.6) { Reach::Valid } else { Reach::Edges };
        let system = if rng.chance(0.5) {
            UnitSystem::Si
        } else {
            UnitSystem::UsCustomary
        };
        let request: Request = generate::request(spec, system, reach, &mut rng);
        let outcome = calculators::solve(spec.key, &request);
        if reach == Reach::Valid {
            tally.valid_requests += 1;
        }
        let mut problems = match &outcome.result {
            Ok(solution) => {
                if reach == Reach::Valid {
                    tally.valid_solved += 1;
                }
                solution_problems(solution)
            }
            Err(SolveError::Fields(errors)) => errors
                .iter()
                .filter(|e| spec.field(&e.field).is_none() || e.kind.to_string().trim().is_empty())
                .map(|e| format!("error on unknown field or without a message: {e}"))
                .collect(),
            Err(other) => vec![format!("{other}")],
        };
        problems.extend(headline_difference(spec.key, &request, &outcome));
        if !problems.is_empty() && tally.failures.len() < 3 {
            tally.failures.push(format!(
                "{}: {}\n    system: {:?}\n    inputs: {:?}",
                spec.key,
                problems.join("; "),
                request.system,
                request.inputs
            ));
        }
    }
    tally
}

/// How a headline solve of `request` differs from `full` (its full solve) beyond
/// leaving out the tables, diagrams and plots: nothing, or what differs.
fn headline_difference(key: &str, request: &Request, full: &calculators::Outcome) -> Option<String> {
    let headline = calculators::solve_in_with(calculators::CALCULATORS, key, request, Detail::Headline);
    let mut expected = full.clone();
    if let Ok(solution) = &mut expected.result {
        solution.tables.clear();
        solution.diagrams.clear();
        solution.plots.clear();
    }
    if headline == expected {
        return None;
    }
    Some(match (&headline.result, &expected.result) {
        (Ok(h), Ok(f)) if h.outputs != f.outputs => {
            format!("headline outputs differ: {:?} against {:?}", h.outputs, f.outputs)
        }
        (Ok(h), Ok(f)) if h.warnings != f.warnings => {
            format!("headline warnings differ: {:?} against {:?}", h.warnings, f.warnings)
        }
        (Ok(h), Ok(f)) if !h.tables.is_empty() || !h.diagrams.is_empty() || !h.plots.is_empty() => {
            format!(
                "a headline solve built {} tables, {} diagrams, {} plots",
                h.tables.len(),
                h.diagrams.len(),
                h.plots.len()
            )
        }
        _ => format!("headline solve differs from the full solve: {headline:?} against {expected:?}"),
    })
}

/// Fuzzes the calculators with these keys and fails with every broken request found.
fn fuzz_calculators(keys: &[&str]) {
    let (seed, budget) = (seed(), budget());
    let mut failures = Vec::new();
    for (n, key) in keys.iter().enumerate() {
        let Some(spec) = calculators::spec(key) else {
            failures.push(format!("{key}: not registered"));
            continue;
        };
        let tally = fuzz(&spec, seed.wrapping_add(n as u64), budget);
        let share = tally.valid_solved as f64 / tally.valid_requests.max(1) as f64;
        println!(
            "{key}: {} requests, {} of {} inside the limits solved ({:.0} %)",
            tally.requests,
            tally.valid_solved,
            tally.valid_requests,
            share * 100.0
        );
        if share < MIN_SOLVED_SHARE {
            failures.push(format!(
                "{key}: only {:.0} % of the requests inside the limits solved (at least {:.0} % required): the generator or the calculator refuses too much",
                share * 100.0,
                MIN_SOLVED_SHARE * 100.0
            ));
        }
        failures.extend(tally.failures);
    }
    assert!(
        failures.is_empty(),
        "fuzzing found broken results (seed {seed}; replay with FLUXLEDGER_FUZZ_SEED={seed}):\n{}",
        failures.join("\n")
    );
}

/// One test per calculator, so that each runs in its own thread and a failure names
/// the calculator. A calculator added to `CALCULATORS` without a line here fails
/// [`every_calculator_is_fuzzed`].
macro_rules! fuzz_tests {
    ($($(#[$attr:meta])* $name:ident => $key:literal,)*) => {
        $(
            #[test]
            $(#[$attr])*
            fn $name() {
                fuzz_calculators(&[$key]);
            }
        )*
        const FUZZED: &[&str] = &[$($key),*];
    };
}

fuzz_tests! {
    bend_is_robust => "bend",
    reducer_is_robust => "reducer",
    dead_end_is_robust => "dead-end",
    tee_is_robust => "tee",
    pipe_anchor_is_robust => "pipe-anchor",
    nozzle_is_robust => "nozzle",
    thrust_block_is_robust => "thrust-block",
    line_schedule_is_robust => "line-schedule",
    jet_plate_is_robust => "jet-plate",
    vane_is_robust => "vane",
    reaction_arm_is_robust => "reaction-arm",
    runner_is_robust => "runner",
    tank_drain_is_robust => "tank-drain",
    profile_is_robust => "profile",
    surge_is_robust => "surge",
    restrained_length_is_robust => "restrained-length",
}

/// Every request fuzzing once found broken (`tests/data/fuzz-found.json`) is solved
/// with nothing broken: each stays fixed whichever requests a run's time budget
/// reaches. (Most were checks that disagreed by rounding alone, found by
/// release-profile runs: their tolerances were relative to the result rather than
/// to the terms that cancel to it.)
#[test]
fn requests_fuzzing_found_broken_stay_fixed() {
    let path = concat!(env!("CARGO_MANIFEST_DIR"), "/data/fuzz-found.json");
    let text = std::fs::read_to_string(path).expect("tests/data/fuzz-found.json");
    let data: serde_json::Value = serde_json::from_str(&text).expect("fuzz-found.json is JSON");
    let cases = data["cases"].as_array().expect("a list of cases");
    assert!(!cases.is_empty());
    let mut failures = Vec::new();
    for case in cases {
        let key = case["calculator"].as_str().expect("calculator");
        let mut request = Request {
            system: match case["system"].as_str() {
                Some("us") => UnitSystem::UsCustomary,
                _ => UnitSystem::Si,
            },
            ..Request::default()
        };
        for (field, value) in case["inputs"].as_object().expect("inputs") {
            request
                .inputs
                .insert(field.clone(), value.as_str().expect("text").to_string());
        }
        let outcome = calculators::solve(key, &request);
        let problems = match &outcome.result {
            Ok(solution) => solution_problems(solution),
            Err(error) => vec![format!("refused: {error}")],
        };
        if !problems.is_empty() {
            failures.push(format!("{key} (once: {}): {}", case["found"], problems.join("; ")));
        }
    }
    assert!(failures.is_empty(), "{}", failures.join("\n"));
}

#[test]
fn every_calculator_is_fuzzed() {
    let missing: Vec<&str> = calculators::CALCULATORS
        .iter()
        .map(|c| c.key)
        .filter(|key| !FUZZED.contains(key))
        .collect();
    assert!(
        missing.is_empty(),
        "add these calculators to fuzz_tests! in tests/tests/fuzz.rs: {}",
        missing.join(", ")
    );
}

#[test]
fn broken_text_is_recognised() {
    for text in [
        "—",
        "— kN",
        " — ",
        "NaN kN",
        "inf",
        "-inf m",
        "1.0 (NaN)",
        "Infinity",
        "x = NaN",
    ] {
        assert!(broken_text(text), "{text}");
    }
    for text in [
        "12.4 kN",
        "information",
        "inflow 3 m/s",
        "in",
        "1e-300",
        "AWWA M23 PVC Pipe — Design and Installation",
    ] {
        assert!(!broken_text(text), "{text}");
    }
}
