//! Every calculator page in the browser, driven by the registry and the reference
//! cases rather than by a list of pages:
//!
//! - each registered calculator (`fluxledger_core::calculators::CALCULATORS`) is
//!   opened by URL with a sourced reference case (one per unit system where the
//!   folder has one) and must show the case's expected outputs; a calculator
//!   without a usable case fails and says what to add;
//! - the line schedule's list of fittings survives a reload;
//! - every page whose demo draws plots shows them with data, and they follow an
//!   input; a new page with plots fails until [`PLOT_EDITS`] names the input to
//!   change.
//!
//! Each test runs one browser for all its pages and fails on any console error and
//! on any request that leaves the site's origin.

use std::collections::BTreeMap;
use std::time::Duration;

use serde_json::{json, Value};

use fluxledger_core::calculators::{self, CALCULATORS};
use fluxledger_core::catalog::{demo_request, Solution};
use fluxledger_core::units::QuantityKind;
use fluxledger_core::Request;
use fluxledger_site::pages::escape_symbols;
use fluxledger_tests::{load_cases, parse_difference, parse_typed, reference_dir, Case, Target, Tolerance};

use crate::cdp::{self, Browser, Launch, Page};
use crate::harness::{fixture, one_at_a_time, page_errors, query_string, type_into};

/// Every `[data-output]` element's text, grouped by output key (an output shown in
/// two places must agree in both).
const OUTPUTS: &str =
    "JSON.stringify([...document.querySelectorAll('[data-output]')].map(e => [e.dataset.output, e.textContent]))";

/// Every ledger table: its key and the text of each cell, row by row.
const TABLES: &str = "JSON.stringify([...document.querySelectorAll('table.ledger')].map(t => [t.dataset.table, [...t.rows].map(r => [...r.cells].map(c => c.textContent))]))";

/// Every plot: its key, whether it has an SVG, and the `points` of each series line.
const PLOTS: &str = "JSON.stringify([...document.querySelectorAll('figure.plot')].map(f => ({ key: f.dataset.plot, svg: f.querySelector('svg.plot-svg') !== null, series: [...f.querySelectorAll('svg.plot-svg polyline.series')].map(p => p.getAttribute('points') || '') })))";

/// The page shows four significant figures, so a shown value can be off by half a
/// unit in the fourth figure: 5e-4 of the value at most. The allowed difference is
/// the larger of that and the case's own tolerance.
const DISPLAY_ROUNDING: f64 = 5e-4;

fn launch(width: u32) -> (Browser, Page) {
    let mut browser = Browser::launch(&Launch { width, height: 900 }).unwrap_or_else(|e| panic!("{e}"));
    let page = browser.new_page().unwrap_or_else(|e| panic!("{e}"));
    (browser, page)
}

/// Evaluates an expression that returns `JSON.stringify(...)` and parses it.
fn eval_json(page: &Page, browser: &mut Browser, expression: &str) -> Value {
    let text = page.eval(browser, expression).unwrap_or_else(|e| panic!("{e}"));
    let text = text
        .as_str()
        .unwrap_or_else(|| panic!("`{}` did not return a string: {text}", cdp::shorten(expression)));
    serde_json::from_str(text).unwrap_or_else(|e| panic!("`{}` returned bad JSON: {e}", cdp::shorten(expression)))
}

/// Console errors of the page and its workers, and requests that left the origin.
fn problems_of_page(browser: &Browser, page: &Page, base: &str) -> Vec<String> {
    let mut problems = page_errors(browser, page);
    for url in cdp::request_urls(page.events(browser)) {
        let local = url.starts_with(&format!("{base}/")) || url.starts_with("data:") || url.starts_with("blob:");
        if !local {
            problems.push(format!("request outside the origin: {}", cdp::shorten(&url)));
        }
    }
    problems
}

// ---------------------------------------------------------------------------------
// A sourced case per calculator, opened by URL.

/// The reference cases a page can be checked against: a calculator's cases with
/// expected outputs (no refusals) and no `[units]` table (a link carries each value
/// with its unit typed in), one per unit system: the one with the most expected
/// outputs, the first by file name on a tie.
/// Cases opened by URL besides the one chosen per unit system: the modes a page
/// gained (elevations, a surge computed per row, metric size presets, the run load,
/// a tee's branch profiles, weights and local gravity), each in SI and in US units.
const MODE_CASES: &[&str] = &[
    "thrust-block-elevation-dead-end-30m-below-test-point-si",
    "thrust-block-elevation-c600-high-point-us",
    "thrust-block-preset-en545-dn300-dead-end-si",
    "thrust-block-preset-en10220-323-welded-us",
    "line-schedule-elevation-rows-below-and-above-si",
    "line-schedule-elevation-c600-high-point-us",
    "line-schedule-computed-surge-steel-sch40-12in-si",
    "line-schedule-computed-surge-slow-closure-pvc-us",
    "surge-run-load-sharp-front-500mm-si",
    "surge-run-load-rigid-column-slow-closure-us",
    "tee-one-branch-reducing-elbow-beta-atmosphere-si",
    "tee-branch-profiles-weights-local-gravity-us",
    "tank-drain-pressurised-vessel-jet-reaction-si",
    "tank-drain-pipe-outlet-steady-level-si",
    "tank-drain-level-area-table-orifice-si",
    "tank-drain-sphere-full-to-empty-us",
    "tank-drain-pipe-outlet-drain-us",
    "tank-drain-pump-horizontal-cylinder-us",
];

fn cases_for_page<'a>(key: &str, cases: &'a [Case]) -> Vec<&'a Case> {
    let mut by_system: BTreeMap<&str, &Case> = BTreeMap::new();
    for case in cases {
        let usable = case.target == Target::Calculator(key.to_string())
            && case.expect_error.is_none()
            && !case.expected.is_empty()
            && case.units.is_empty();
        if !usable {
            continue;
        }
        let slot = by_system.entry(case.system.key()).or_insert(case);
        if case.expected.len() > slot.expected.len() {
            *slot = case;
        }
    }
    let mut chosen: Vec<&Case> = by_system.into_values().collect();
    for case in cases {
        let listed = MODE_CASES.contains(&case.name().trim_end_matches(".toml"));
        if listed
            && case.target == Target::Calculator(key.to_string())
            && !chosen.iter().any(|c| c.name() == case.name())
        {
            chosen.push(case);
        }
    }
    chosen
}

/// The link that opens a case: each typed input as a query parameter, exactly as
/// typed, and `system=<system>`. A field the case leaves out is sent blank (`key=`),
/// as the page itself writes a cleared field into the link it shares; a field
/// missing from a link would be filled with the page's example value instead.
fn case_query(case: &Case, fields: &[&str]) -> String {
    let mut params: Vec<(String, String)> = case.inputs.iter().map(|(k, v)| (k.clone(), v.clone())).collect();
    for field in fields {
        if !case.inputs.contains_key(*field) {
            params.push((field.to_string(), String::new()));
        }
    }
    params.push(("system".into(), case.system.key().into()));
    query_string(&params)
}

/// What the core itself gives for a case (shown beside a mismatch, so that a
/// report says whether the page or the core disagrees with the source).
fn core_solution(key: &str, case: &Case) -> Option<Solution> {
    let request = Request {
        inputs: case.inputs.clone(),
        field_units: case.units.clone(),
        system: case.system,
    };
    fluxledger_core::solve(key, &request).result.ok()
}

fn allowed_difference(tolerance: &Tolerance, wanted: f64, kind: QuantityKind) -> f64 {
    let own = match tolerance {
        Tolerance::Relative(rel) => rel * wanted.abs(),
        Tolerance::Absolute(text) => parse_difference(text, kind).unwrap_or_else(|e| panic!("tolerance {text}: {e}")),
    };
    own.max(DISPLAY_ROUNDING * wanted.abs())
}

#[test]
fn every_page_opened_by_url_with_a_sourced_case_shows_the_expected_outputs() {
    let _turn = one_at_a_time();
    let site = fixture();
    let (cases, errors) = load_cases(&reference_dir());
    assert!(errors.is_empty(), "reference files that do not load: {errors:#?}");
    assert!(!CALCULATORS.is_empty(), "no calculator is registered");
    let missing: Vec<&&str> = MODE_CASES
        .iter()
        .filter(|name| !cases.iter().any(|c| c.name().trim_end_matches(".toml") == **name))
        .collect();
    assert!(
        missing.is_empty(),
        "MODE_CASES names cases that do not exist: {missing:?}"
    );

    let (mut browser, page) = launch(1280);
    let mut failures = Vec::new();
    let mut checked = Vec::new();
    for calculator in CALCULATORS {
        let key = calculator.key;
        let spec = (calculator.spec)();
        let chosen = cases_for_page(key, &cases);
        if chosen.is_empty() {
            failures.push(format!(
                "{key}.html: no reference case to open it with. Add a sourced case to {} \
                 (calculator = \"{key}\", [inputs] typed with units, [expected.<output>] values, \
                 no [expect_error], no [units] table).",
                reference_dir().display()
            ));
            continue;
        }
        let fields: Vec<&str> = spec.fields.iter().map(|f| f.key).collect();
        let kinds: BTreeMap<&str, QuantityKind> = spec.outputs.iter().map(|o| (o.key, o.kind)).collect();
        for case in chosen {
            let url = format!("{}/{key}.html?{}", site.base, case_query(case, &fields));
            let place = format!("{key}.html with {} ({})", case.name(), case.system.key());
            if let Err(e) = page.goto(&mut browser, &url) {
                failures.push(format!("{place}: {e}"));
                continue;
            }
            let state = page
                .wait_rendered(&mut browser)
                .unwrap_or_else(|e| panic!("{place}: {e}"));
            let notices = page
                .eval(&mut browser, "document.getElementById('notices')?.textContent ?? ''")
                .unwrap_or_else(|e| panic!("{e}"));
            if state != "ready" || notices.as_str().is_some_and(|n| !n.trim().is_empty()) {
                failures.push(format!(
                    "{place}: page state {state:?}, notices {notices}\n  url: {url}"
                ));
                continue;
            }
            let shown = eval_json(&page, &mut browser, OUTPUTS);
            let shown: Vec<(String, String)> = shown
                .as_array()
                .map(|a| {
                    a.iter()
                        .filter_map(|pair| Some((pair[0].as_str()?.to_string(), pair[1].as_str()?.to_string())))
                        .collect()
                })
                .unwrap_or_default();
            let core = core_solution(key, case);
            for expected in &case.expected {
                let Some(&kind) = kinds.get(expected.output.as_str()) else {
                    failures.push(format!("{place}: the calculator has no output '{}'", expected.output));
                    continue;
                };
                let texts: Vec<&str> = shown
                    .iter()
                    .filter(|(k, _)| *k == expected.output)
                    .map(|(_, t)| t.as_str())
                    .collect();
                if texts.is_empty() {
                    failures.push(format!(
                        "{place}: output '{}' is not on the page\n  url: {url}",
                        expected.output
                    ));
                    continue;
                }
                let wanted = parse_typed(&expected.value, kind)
                    .unwrap_or_else(|e| panic!("{}: expected.{}: {e}", case.name(), expected.output));
                let allowed = allowed_difference(&expected.tolerance, wanted, kind);
                for text in texts {
                    // The core's own parser reads the page text (units as shown: m², kN·m, °).
                    let outcome = parse_typed(text, kind).map(|actual| (actual, (actual - wanted).abs() <= allowed));
                    if let Ok((_, true)) = outcome {
                        continue;
                    }
                    let core_value = core
                        .as_ref()
                        .and_then(|s| s.outputs.iter().find(|o| o.key == expected.output))
                        .map(|o| format!("{} (SI {:e})", o.text, o.si))
                        .unwrap_or_else(|| "no value".into());
                    let shown_si = match &outcome {
                        Ok((actual, _)) => format!("SI {actual:e}"),
                        Err(e) => format!("does not parse: {e}"),
                    };
                    failures.push(format!(
                        "{place}\n  title:    {}\n  source:   {}\n  output:   {}\n  expected: {} (SI {wanted:e} ± {allowed:e})\n  shown:    {text:?} ({shown_si})\n  core:     {core_value}\n  url:      {url}",
                        case.title, case.source, expected.output, expected.value
                    ));
                }
            }
            checked.push(format!("{key}: {}", case.name()));
        }
    }
    browser
        .pump(Duration::from_millis(300))
        .unwrap_or_else(|e| panic!("{e}"));
    failures.extend(problems_of_page(&browser, &page, &site.base));
    assert!(
        failures.is_empty(),
        "\n{rule}\n{}\n{rule}\n(checked: {})",
        failures.join("\n\n"),
        checked.join(", "),
        rule = "─".repeat(60)
    );
}

// ---------------------------------------------------------------------------------
// The line schedule: the typed list of fittings survives a reload.

/// An invented cooling-water header at Harrow Creek Works: five fittings of four
/// kinds, a comment line, own pressures on two rows and the page's defaults on the
/// rest; each row tagged so that the table can be matched to the list.
/// A typed schedule; its tags have a `_`, which the table must show as typed (not
/// as a symbol's subscript, as the core's own words are: `CW_1` is no C·W₁).
const SCHEDULE: &str = "# Harrow Creek Works cooling-water header (invented)\n\
bend 45deg d=300mm od=320mm p=10bar bs8004_stiff_clay h=0.6m tag=CW_1\n\
bend 45deg d=300mm od=320mm p=10bar turn=down tag=CW_2\n\
tee di52_12 di52_8 nfpa24_sand tag=CW_3\n\
reducer di52_12 di52_8 tag=CW_4\n\
dead_end di52_8 tag=CW_5 h=0.9m";

#[test]
fn line_schedule_list_survives_a_reload() {
    let _turn = one_at_a_time();
    let site = fixture();
    let key = calculators::line_schedule::KEY;
    let (mut browser, page) = launch(360);
    page.goto(&mut browser, &format!("{}/{key}.html", site.base))
        .unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(page.wait_rendered(&mut browser).unwrap(), "ready", "the demo schedule");
    let demo_tables = eval_json(&page, &mut browser, TABLES);

    type_into(&page, &mut browser, "rows", SCHEDULE).unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(
        page.wait_rendered(&mut browser).unwrap(),
        "ready",
        "the typed schedule did not compute: {}",
        page.eval(
            &mut browser,
            "document.querySelector('[data-error-for=rows]')?.textContent"
        )
        .unwrap()
    );
    assert_eq!(
        page.eval(&mut browser, "document.getElementById('field-rows').value")
            .unwrap(),
        SCHEDULE,
        "the text field does not hold what was typed"
    );
    page.wait_for(
        &mut browser,
        &format!(
            "new URLSearchParams(location.search).get('rows') === {}",
            serde_json::to_string(SCHEDULE).unwrap()
        ),
        Duration::from_secs(5),
    )
    .unwrap_or_else(|e| panic!("the link does not carry the typed list: {e}"));

    let tables = eval_json(&page, &mut browser, TABLES);
    let outputs = page.eval(&mut browser, OUTPUTS).unwrap();
    assert_ne!(tables, demo_tables, "the tables did not change from the demo's");
    let schedule = tables
        .as_array()
        .and_then(|t| t.iter().find(|t| t[0] == "schedule"))
        .unwrap_or_else(|| panic!("no schedule table: {tables}"));
    let schedule_text = schedule[1].to_string();
    for tag in ["CW_1", "CW_2", "CW_3", "CW_4", "CW_5"] {
        assert!(
            schedule_text.contains(tag),
            "row {tag} is not in the schedule table: {schedule_text}"
        );
    }
    let row_count = page
        .eval(
            &mut browser,
            "document.querySelector('[data-output=row_count]')?.textContent",
        )
        .unwrap();
    let row_count = row_count.as_str().map(|t| parse_typed(t, QuantityKind::Ratio));
    assert_eq!(row_count, Some(Ok(5.0)), "five fittings typed");

    let url = page.eval(&mut browser, "location.href").unwrap();
    // A marker on the old document: the wait below sees only the reloaded one.
    page.eval(&mut browser, "window.fluxledgerBeforeReload = true").unwrap();
    page.call(&mut browser, "Page.reload", json!({})).unwrap();
    page.wait_for(
        &mut browser,
        "window.fluxledgerBeforeReload !== true && document.readyState === 'complete' && document.body.dataset.state",
        Duration::from_secs(30),
    )
    .unwrap_or_else(|e| panic!("the reloaded page did not render: {e}"));
    assert_eq!(page.eval(&mut browser, "document.body.dataset.state").unwrap(), "ready");
    assert_eq!(page.eval(&mut browser, "location.href").unwrap(), url);
    assert_eq!(
        page.eval(&mut browser, "document.getElementById('field-rows').value")
            .unwrap(),
        SCHEDULE,
        "the list of fittings changed on reload"
    );
    assert_eq!(
        eval_json(&page, &mut browser, TABLES),
        tables,
        "the tables changed on reload"
    );
    assert_eq!(
        page.eval(&mut browser, OUTPUTS).unwrap(),
        outputs,
        "the results changed on reload"
    );
    assert_eq!(
        page.eval(&mut browser, "document.getElementById('notices').childElementCount")
            .unwrap(),
        0,
        "the reloaded page reported a problem with its link"
    );

    browser.pump(Duration::from_millis(200)).unwrap();
    let problems = problems_of_page(&browser, &page, &site.base);
    assert!(problems.is_empty(), "\n{}", problems.join("\n"));
}

/// A shared link to a 420-row schedule opens on a first visit (a fresh browser, no
/// service worker yet: the server answers it), with every row computed as the
/// core computes it. Its link is longer than the 16 KiB request heads the server
/// once refused.
#[test]
fn a_420_row_schedule_link_opens_on_a_first_visit() {
    const ROWS: usize = 420;
    let _turn = one_at_a_time();
    let site = fixture();
    let key = calculators::line_schedule::KEY;
    let kinds = [
        "bend 90deg di52_12 nfpa24_sandy_silt",
        "bend 45deg di52_12 nfpa24_sandy_silt turn=right",
        "tee di52_12 di52_8 nfpa24_sand",
        "reducer di52_12 di52_8",
        "bend 22.5deg di52_8 turn=down",
        "dead_end di52_8 h=0.9m",
    ];
    let rows: Vec<String> = (0..ROWS)
        .map(|i| format!("{} tag=F{:03}", kinds[i % kinds.len()], i + 1))
        .collect();
    let rows = rows.join("\n");
    let query = query_string(&[("rows".to_string(), rows.clone())]);
    assert!(query.len() > 16 * 1024, "the link is only {} bytes", query.len());

    let (mut browser, page) = launch(1280);
    page.goto(&mut browser, &format!("{}/{key}.html?{query}", site.base))
        .unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(
        page.wait_rendered(&mut browser).unwrap(),
        "ready",
        "the {}-byte link did not compute on a first visit",
        query.len()
    );
    assert_eq!(
        page.eval(&mut browser, "navigator.serviceWorker.controller === null")
            .unwrap(),
        true,
        "not a first visit: a service worker answered"
    );
    assert_eq!(
        page.eval(&mut browser, "document.getElementById('field-rows').value")
            .unwrap(),
        rows.as_str(),
        "the field does not hold the link's rows"
    );
    let request = demo_request(&calculators::spec(key).expect("registered"), &[("rows", &rows)]);
    let solution = fluxledger_core::solve(key, &request)
        .result
        .unwrap_or_else(|e| panic!("the rows do not solve natively: {e:?}"));
    let schedule = solution
        .tables
        .iter()
        .find(|t| t.key == "schedule")
        .expect("a schedule table");
    assert!(schedule.rows.len() >= ROWS, "the core lists every row (and its totals)");
    let shown = eval_json(&page, &mut browser, TABLES);
    let shown = shown
        .as_array()
        .and_then(|t| t.iter().find(|t| t[0] == "schedule"))
        .unwrap_or_else(|| panic!("no schedule table on the page"));
    let body: Vec<Vec<String>> = serde_json::from_value(shown[1].clone()).unwrap_or_default();
    assert_eq!(body.len(), schedule.rows.len() + 1, "the header and the core's rows");
    for (i, (cells, core)) in body[1..].iter().zip(&schedule.rows).enumerate() {
        assert_eq!(cells.first(), core.first(), "row {} is not the core's", i + 1);
        assert_eq!(cells.len(), core.len(), "row {} has other cells than the core's", i + 1);
    }
    // Every headline number is the core's, as text (units shown prettier).
    let outputs: Vec<(String, String)> =
        serde_json::from_value(eval_json(&page, &mut browser, OUTPUTS)).unwrap_or_default();
    let number = |t: &str| t.split(' ').next().unwrap_or_default().to_string();
    let shown: BTreeMap<String, String> = outputs.iter().map(|(k, t)| (k.clone(), number(t))).collect();
    let core: BTreeMap<String, String> = solution
        .outputs
        .iter()
        .map(|o| (o.key.to_string(), number(&o.text)))
        .collect();
    assert_eq!(shown, core, "the page's numbers are not the core's");
    let problems = problems_of_page(&browser, &page, &site.base);
    assert!(problems.is_empty(), "\n{}", problems.join("\n"));
}

/// The markup the page script gives the core's `text` (its `innerHTML`): the site
/// tool's [`escape_symbols`], a second reading of the same rule (`symbolNodes` in
/// the page script's `dom.js`), with quotes and no-break spaces as the browser
/// serialises element text (quotes as they are, U+00A0 as `&nbsp;`).
fn symbol_markup(text: &str) -> String {
    escape_symbols(text)
        .replace("&quot;", "\"")
        .replace("&#39;", "'")
        .replace('\u{a0}', "&nbsp;")
}

/// Every page's demo: each warning the core gives is shown in the headline, next to
/// the numbers it qualifies (its symbols' subscripts as subscripts); every table is
/// shown under its title, and its emphasised rows (a failed check among them) stand
/// out.
#[test]
fn warnings_sit_in_the_headline_and_tables_keep_titles_and_emphasis() {
    let _turn = one_at_a_time();
    let site = fixture();
    let (mut browser, page) = launch(360);
    let mut problems = Vec::new();
    let mut warnings_seen = 0;
    let mut subscripts_seen = 0;
    for calculator in CALCULATORS {
        let key = calculator.key;
        let solution = fluxledger_core::solve(key, &demo_request(&calculators::spec(key).expect("registered"), &[]))
            .result
            .unwrap_or_else(|e| panic!("{key}: the demo does not solve natively: {e:?}"));
        page.goto(&mut browser, &format!("{}/{key}.html", site.base))
            .unwrap_or_else(|e| panic!("{e}"));
        assert_eq!(page.wait_rendered(&mut browser).unwrap(), "ready", "{key}");
        let shown: Vec<String> = serde_json::from_value(eval_json(
            &page,
            &mut browser,
            "JSON.stringify([...document.querySelectorAll('.headline .headline-warnings li')].map(li => li.innerHTML))",
        ))
        .unwrap_or_default();
        let wanted: Vec<String> = solution.warnings.iter().map(|w| symbol_markup(&w.message)).collect();
        warnings_seen += wanted.len();
        subscripts_seen += wanted.iter().filter(|w| w.contains("<sub>")).count();
        if shown != wanted {
            problems.push(format!("{key}: headline warnings {shown:?}, the core gave {wanted:?}"));
        }
        let tables: Vec<(String, String, Vec<usize>)> = serde_json::from_value(eval_json(
            &page,
            &mut browser,
            "JSON.stringify([...document.querySelectorAll('.panel-table')].map(p => [p.querySelector('table').dataset.table, p.querySelector('.table-title')?.innerHTML ?? '', [...p.querySelectorAll('tbody tr')].flatMap((r, i) => r.classList.contains('emphasised') ? [i] : [])]))",
        ))
        .unwrap_or_default();
        let wanted: Vec<(String, String, Vec<usize>)> = solution
            .tables
            .iter()
            .map(|t| (t.key.to_string(), symbol_markup(&t.title), t.emphasised_rows.clone()))
            .collect();
        if tables != wanted {
            problems.push(format!("{key}: tables {tables:?}, the core gave {wanted:?}"));
        }
    }
    assert!(problems.is_empty(), "\n{}", problems.join("\n"));
    assert!(warnings_seen > 0, "no demo gives a warning: this test would see none");
    assert!(
        subscripts_seen > 0,
        "no demo warning has a symbol: this test would see no subscript"
    );
}

// ---------------------------------------------------------------------------------
// Plots: drawn with data, and redrawn when an input changes.

/// For each page that draws plots: the inputs it is opened with besides its demo
/// (as link parameters), and an input whose change moves the curves, with the text
/// typed into it.
struct PlotEdit {
    page: &'static str,
    start: &'static [(&'static str, &'static str)],
    field: &'static str,
    text: &'static str,
}

/// A page whose demo draws plots must be listed here (the test says so otherwise).
const PLOT_EDITS: &[PlotEdit] = &[
    // Power and efficiency against blade speed: the supply head sets the jet speed,
    // and so the range of blade speeds and the power.
    PlotEdit {
        page: "vane",
        start: &[],
        field: "head",
        text: "35 m",
    },
    // Torque and power against speed of an arm fed at a fixed supply pressure.
    PlotEdit {
        page: "reaction-arm",
        start: &[("flow_given", "p")],
        field: "p",
        text: "450 kPa",
    },
    // Level against time: a lower starting level drains sooner.
    PlotEdit {
        page: "tank-drain",
        start: &[],
        field: "h_start",
        text: "2.5 m",
    },
    // The measured profile: other traverse readings.
    PlotEdit {
        page: "profile",
        start: &[],
        field: "points",
        text: "0 3.1; 0.3 3.0; 0.6 2.7; 0.8 2.3; 0.95 1.6",
    },
    // Head against flow at another shaft speed.
    PlotEdit {
        page: "runner",
        start: &[],
        field: "speed",
        text: "1150 rpm",
    },
    // Thrust by row: another list of fittings.
    PlotEdit {
        page: "line-schedule",
        start: &[],
        field: "rows",
        text: "bend 90deg di52_12 nfpa24_sandy_silt tag=B1\nbend 22.5deg di52_12 nfpa24_sandy_silt tag=B2\ndead_end di52_8 tag=H1",
    },
];

/// Plots as drawn or described: each plot's key and the number of points of each
/// series line, in order.
type PlotShape = Vec<(String, Vec<usize>)>;

/// Counts the finite coordinate pairs of a polyline's `points` attribute (0 when
/// anything in it is not a number).
fn point_count(points: &str) -> usize {
    let numbers: Vec<f64> = points
        .split([' ', ','])
        .filter(|s| !s.is_empty())
        .map(|s| s.parse::<f64>().unwrap_or(f64::NAN))
        .collect();
    if numbers.len() % 2 == 1 || numbers.iter().any(|v| !v.is_finite()) {
        return 0;
    }
    numbers.len() / 2
}

/// What the core describes for the demo inputs with `overrides`: each plot and the
/// finite points of each series that has any (the page draws one line for each).
fn core_plot_shape(key: &str, overrides: &[(&str, &str)]) -> Result<PlotShape, String> {
    let spec = calculators::spec(key).ok_or_else(|| format!("calculator '{key}' is not registered"))?;
    match fluxledger_core::solve(key, &demo_request(&spec, overrides)).result {
        Ok(solution) => Ok(solution
            .plots
            .iter()
            .map(|plot| {
                let counts = plot
                    .series
                    .iter()
                    .map(|s| s.points.iter().filter(|p| p[0].is_finite() && p[1].is_finite()).count())
                    .filter(|&n| n > 0)
                    .collect();
                (plot.key.to_string(), counts)
            })
            .collect()),
        Err(e) => Err(format!("the core refuses {overrides:?}: {e:?}")),
    }
}

/// The plots on the page: each plot's key and the `points` of its series lines
/// (a plot without an SVG has none).
fn read_plots(page: &Page, browser: &mut Browser) -> Vec<(String, Vec<String>)> {
    let plots = eval_json(page, browser, PLOTS);
    plots
        .as_array()
        .cloned()
        .unwrap_or_default()
        .iter()
        .map(|plot| {
            let key = plot["key"].as_str().unwrap_or_default().to_string();
            let series: Vec<String> = if plot["svg"] == Value::Bool(true) {
                plot["series"]
                    .as_array()
                    .map(|s| s.iter().filter_map(|p| p.as_str().map(str::to_string)).collect())
                    .unwrap_or_default()
            } else {
                Vec::new()
            };
            (key, series)
        })
        .collect()
}

fn shape_of(plots: &[(String, Vec<String>)]) -> PlotShape {
    plots
        .iter()
        .map(|(key, series)| (key.clone(), series.iter().map(|p| point_count(p)).collect()))
        .collect()
}

/// Reads the plots and checks them against what the core describes for the same
/// inputs: the same plots, one line per series with every point.
fn checked_plots(
    page: &Page,
    browser: &mut Browser,
    key: &str,
    overrides: &[(&str, &str)],
    place: &str,
    problems: &mut Vec<String>,
) -> Vec<(String, Vec<String>)> {
    let plots = read_plots(page, browser);
    match core_plot_shape(key, overrides) {
        Ok(described) => {
            let drawn = shape_of(&plots);
            if drawn != described {
                problems.push(format!(
                    "{place}: the page draws plots (key, points per line) {drawn:?}; the core describes {described:?}"
                ));
            }
        }
        Err(e) => problems.push(format!("{place}: {e}")),
    }
    plots
}

#[test]
fn plots_render_with_data_and_follow_an_input() {
    let _turn = one_at_a_time();
    let site = fixture();
    let (mut browser, page) = launch(1280);
    let mut problems = Vec::new();
    let mut with_plots = Vec::new();
    for calculator in CALCULATORS {
        let key = calculator.key;
        page.goto(&mut browser, &format!("{}/{key}.html", site.base))
            .unwrap_or_else(|e| panic!("{e}"));
        let state = page.wait_rendered(&mut browser).unwrap_or_else(|e| panic!("{e}"));
        if state != "ready" {
            problems.push(format!("{key}.html: the demo did not compute (state {state:?})"));
            continue;
        }
        let demo = checked_plots(&page, &mut browser, key, &[], &format!("{key}.html"), &mut problems);
        if demo.is_empty() {
            continue;
        }
        with_plots.push(key);
        for (plot, series) in &demo {
            if !series.iter().any(|p| point_count(p) >= 2) {
                problems.push(format!(
                    "{key}.html: plot '{plot}' has no series line with points: {series:?}"
                ));
            }
        }
        let Some(edit) = PLOT_EDITS.iter().find(|e| e.page == key) else {
            problems.push(format!(
                "{key}.html draws plots but PLOT_EDITS in {} names no input that moves them; add one",
                file!()
            ));
            continue;
        };
        let start: Vec<(String, String)> = edit.start.iter().map(|(k, v)| (k.to_string(), v.to_string())).collect();
        let place = if start.is_empty() {
            format!("{key}.html")
        } else {
            format!("{key}.html?{}", query_string(&start))
        };
        let before = if edit.start.is_empty() {
            demo
        } else {
            page.goto(&mut browser, &format!("{}/{place}", site.base))
                .unwrap_or_else(|e| panic!("{e}"));
            let state = page.wait_rendered(&mut browser).unwrap_or_else(|e| panic!("{e}"));
            if state != "ready" {
                problems.push(format!("{place}: did not compute (state {state:?})"));
                continue;
            }
            checked_plots(&page, &mut browser, key, edit.start, &place, &mut problems)
        };
        if let Err(e) = type_into(&page, &mut browser, edit.field, edit.text) {
            problems.push(format!("{place}: cannot edit the input: {e}"));
            continue;
        }
        let state = page.wait_rendered(&mut browser).unwrap_or_else(|e| panic!("{e}"));
        let after_place = format!("{place} after typing {:?} into '{}'", edit.text, edit.field);
        if state != "ready" {
            problems.push(format!("{after_place}: the page state is {state:?}"));
            continue;
        }
        let mut overrides = edit.start.to_vec();
        overrides.push((edit.field, edit.text));
        let after = checked_plots(&page, &mut browser, key, &overrides, &after_place, &mut problems);
        for (plot, series) in &before {
            match after.iter().find(|(k, _)| k == plot) {
                Some((_, now)) if now == series => {
                    problems.push(format!("{after_place}: plot '{plot}' did not change"))
                }
                Some(_) => {}
                None => problems.push(format!("{after_place}: plot '{plot}' is gone")),
            }
        }
    }
    for edit in PLOT_EDITS {
        if !with_plots.contains(&edit.page) {
            problems.push(format!(
                "PLOT_EDITS lists {}.html, whose demo draws no plot (pages with plots: {with_plots:?})",
                edit.page
            ));
        }
    }
    browser
        .pump(Duration::from_millis(300))
        .unwrap_or_else(|e| panic!("{e}"));
    problems.extend(problems_of_page(&browser, &page, &site.base));
    assert!(problems.is_empty(), "\n{}", problems.join("\n"));
}
