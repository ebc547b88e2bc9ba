//! The live verification page (`verify.html`): every sourced reference case runs in
//! the browser through the wasm and agrees; a case's link opens it on its page with
//! the expected output shown; and after one visit the page runs offline.

use std::time::Duration;

use fluxledger_tests::{load_cases, output_kinds, parse_difference, parse_typed, reference_dir, Case, Tolerance};

use crate::cdp::{Browser, Launch, Page};
use crate::harness::{self, fixture, launched, one_at_a_time, page_errors, wait_for_whole_note};

/// The page shows four significant figures: allow half a unit in the fourth
/// figure on top of the case's own tolerance.
const DISPLAY_ROUNDING: f64 = 5e-4;

/// Case files in the reference folder, counted without the loader.
fn case_file_count() -> usize {
    std::fs::read_dir(reference_dir())
        .unwrap_or_else(|e| panic!("cannot read {}: {e}", reference_dir().display()))
        .filter_map(Result::ok)
        .filter(|e| e.path().extension().and_then(|x| x.to_str()) == Some("toml"))
        .count()
}

/// Opens verify.html, waits until every case has run and returns the summary text.
fn run_page(browser: &mut Browser, page: &Page, base: &str) -> String {
    page.goto(browser, &format!("{base}/verify.html"))
        .unwrap_or_else(|e| panic!("verify.html: {e}"));
    page.wait_for(
        browser,
        "['ready', 'disagree', 'error'].includes(document.body.dataset.state)",
        Duration::from_secs(180),
    )
    .unwrap_or_else(|e| panic!("the verification page did not finish: {e}"));
    let summary = page
        .eval(browser, "document.getElementById('verify-summary').textContent")
        .unwrap_or_else(|e| panic!("{e}"));
    let failing = page
        .eval(
            browser,
            "[...document.querySelectorAll('li.verify-case[data-result=fail]')].map(li => li.id + ': ' + \
             li.querySelector('.case-result').textContent + ' ' + \
             [...li.querySelectorAll('td.computed')].map(c => c.textContent).join(' | ')).join('\\n')",
        )
        .unwrap_or_default();
    let summary = summary.as_str().unwrap_or_default().to_string();
    let total = case_file_count();
    assert_eq!(
        summary,
        format!("{total} of {total} agree in this browser."),
        "\ncases that do not agree in the browser:\n{}",
        failing.as_str().unwrap_or_default()
    );
    summary
}

/// The first calculator case with expected values and no selector units.
fn linked_case(cases: &[Case]) -> &Case {
    cases
        .iter()
        .find(|c| {
            matches!(c.target, fluxledger_tests::Target::Calculator(_)) && !c.expected.is_empty() && c.units.is_empty()
        })
        .unwrap_or_else(|| {
            panic!(
                "no calculator case with expected values in {}",
                reference_dir().display()
            )
        })
}

/// Follows the case's link on the verification page and checks the page shows the
/// case's first expected output within its tolerance.
fn follow_link(browser: &mut Browser, page: &Page, case: &Case) {
    let id = format!("case-{}", case.name().trim_end_matches(".toml"));
    let href = page
        .eval(
            browser,
            &format!("document.getElementById('{id}')?.querySelector('a.case-link')?.href ?? null"),
        )
        .unwrap_or_else(|e| panic!("{e}"));
    let href = href
        .as_str()
        .unwrap_or_else(|| panic!("no input link in the entry #{id}"))
        .to_string();
    page.goto(browser, &href).unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(
        page.wait_rendered(browser).unwrap_or_else(|e| panic!("{e}")),
        "ready",
        "{href}"
    );
    let expected = &case.expected[0];
    let kinds = output_kinds(&case.target).unwrap_or_else(|e| panic!("{e}"));
    let kind = kinds[&expected.output];
    let shown = page
        .eval(
            browser,
            &format!(
                "document.querySelector('[data-output=\"{}\"]')?.textContent ?? null",
                expected.output
            ),
        )
        .unwrap_or_else(|e| panic!("{e}"));
    let shown = shown
        .as_str()
        .unwrap_or_else(|| panic!("output '{}' not shown at {href}", expected.output));
    let actual = parse_typed(shown, kind).unwrap_or_else(|e| panic!("page text {shown:?}: {e}"));
    let wanted = parse_typed(&expected.value, kind).unwrap_or_else(|e| panic!("{e}"));
    let allowed = match &expected.tolerance {
        Tolerance::Relative(rel) => rel * wanted.abs(),
        Tolerance::Absolute(text) => parse_difference(text, kind).unwrap_or_else(|e| panic!("{e}")),
    } + DISPLAY_ROUNDING * wanted.abs();
    assert!(
        (actual - wanted).abs() <= allowed,
        "{}: {} shown {shown}, expected {} (source: {})\n{href}",
        case.name(),
        expected.output,
        expected.value,
        case.source
    );
}

#[test]
fn every_case_agrees_in_the_browser_links_open_their_page_and_it_works_offline() {
    let _turn = one_at_a_time();
    let site = fixture();
    let (cases, errors) = load_cases(&reference_dir());
    assert!(errors.is_empty(), "reference files that do not load: {errors:#?}");
    assert_eq!(cases.len(), case_file_count());
    let case = linked_case(&cases);

    // A server of its own, so that stopping it leaves the shared one running.
    let server = harness::serve(&site.dir).unwrap_or_else(|e| panic!("{e}"));
    let base = server.base();
    let (mut browser, page) = launched(Launch {
        width: 1280,
        height: 900,
    });

    run_page(&mut browser, &page, &base);
    page.wait_for(
        &mut browser,
        "navigator.serviceWorker.ready.then(r => r.active && r.active.state === 'activated')",
        Duration::from_secs(60),
    )
    .unwrap_or_else(|e| panic!("the service worker did not activate after a visit to verify.html: {e}"));
    follow_link(&mut browser, &page, case);
    // Offline after one visit means: this page is controlled by the worker and the
    // worker holds the verification page (a worker updated by the visit to the
    // calculator page may still be installing: wait for it to take over).
    page.wait_for(
        &mut browser,
        "navigator.serviceWorker.ready.then(r => !!navigator.serviceWorker.controller && !r.installing && !r.waiting \
         && caches.keys().then(keys => Promise.all(keys.map(k => caches.open(k).then(c => c.match('verify.html', { ignoreSearch: true })))))\
         .then(found => found.some(Boolean)))",
        Duration::from_secs(60),
    )
    .unwrap_or_else(|e| panic!("the service worker does not hold verify.html after a visit: {e}"));
    // The calculator page fetches its note's later sections in idle time (up to 3 s
    // after its first result, later on a loaded machine): online, that request is
    // the page's own and must end before the server stops, or its refusal would be
    // the error this test reports.
    wait_for_whole_note(&page, &mut browser).unwrap_or_else(|e| panic!("online: {e}"));

    server.stop();
    let probe = page
        .eval(
            &mut browser,
            "fetch('never-stored-' + Date.now() + '.txt').then(() => 'loaded', () => 'failed')",
        )
        .unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(probe, "failed", "the server still answers after stop()");
    run_page(&mut browser, &page, &base);
    follow_link(&mut browser, &page, case);

    let errors: Vec<String> = page_errors(&browser, &page)
        .into_iter()
        .filter(|e| !e.contains("never-stored-"))
        .collect();
    assert!(errors.is_empty(), "console errors:\n{}", errors.join("\n"));
}
