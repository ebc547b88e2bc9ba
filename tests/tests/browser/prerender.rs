//! Browser tests of the first response (issue 9): every calculator page carries its
//! demo result, computed by the core at build time; the page script's own render
//! of the same demo shows the same values and moves nothing; a link with a query
//! never shows the demo as its result; files travel compressed, and every module
//! of the page script is requested from the head.

use serde_json::{json, Value};

use fluxledger_core::calculators;

use crate::cdp::{Browser, Launch, Page};
use crate::harness::{fixture, launched, one_at_a_time, page_errors, type_into};

fn eval(page: &Page, browser: &mut Browser, expression: &str) -> Value {
    page.eval(browser, expression).unwrap_or_else(|e| panic!("{e}"))
}

/// What the served HTML shows before any script ran, read by parsing the page's
/// own source (fetched again, from the same server) without running it: outputs
/// by key, field values by id, figure sizes, number of tables.
const SERVED_VIEW: &str = r#"
fetch(location.href, { cache: "no-store" }).then((r) => r.text()).then((html) => {
  const doc = new DOMParser().parseFromString(html, "text/html");
  return view(doc);
})"#;

/// The same facts from the live page.
const LIVE_VIEW: &str = "Promise.resolve(view(document))";

/// Defines `view(doc)` in the page.
const VIEW_FN: &str = r##"
window.view = (doc) => ({
  // Labels, warnings and tables as markup: a symbol's subscript is a <sub> on both sides.
  outputs: Array.from(doc.querySelectorAll("#calculator [data-output]")).map((d) => [d.dataset.output, d.previousElementSibling?.innerHTML, d.textContent]),
  warnings: Array.from(doc.querySelectorAll("#calculator .headline-warnings li")).map((li) => li.innerHTML),
  // The fields shown, in order, and their values: the served page leaves out the
  // fields its demo hides; the script writes them hidden.
  fields: Array.from(doc.querySelectorAll("#calculator .field:not([hidden]) :is(input.quantity, textarea, select)")).map((c) => [c.id || c.getAttribute("aria-label"), c.value]),
  shown: Array.from(doc.querySelectorAll("#calculator .field:not([hidden])")).map((f) => f.dataset.field),
  // The view box to 12 significant digits: the core's geometry differs in the last
  // bit between the native and the wasm build (their libm round differently, e.g.
  // 4.295018125237495 against 4.295018125237496 on the line schedule); the size on
  // screen (width, height) is compared exactly.
  figures: Array.from(doc.querySelectorAll("#calculator figure svg.diagram, #calculator figure svg.plot-svg")).map((s) => [
    s.getAttribute("width"),
    s.getAttribute("height"),
    (s.getAttribute("viewBox") || "").split(" ").map((n) => Number(Number(n).toPrecision(12))).join(" "),
  ]),
  // The figures' titles, captions and legends, as markup (subscripts included).
  figureTexts: Array.from(doc.querySelectorAll("#calculator figure :is(h2, figcaption, .legend span, .plot-markers li)")).map((e) => e.innerHTML),
  // A check's discrepancy at round-off (5.3e-14 % natively, 7.1e-14 % in the wasm:
  // the two builds' libm round differently) is the same "nothing" on both sides.
  tables: Array.from(doc.querySelectorAll("#calculator table.ledger")).map((t) => [
    t.dataset.table,
    t.rows.length,
    t.innerHTML.replace(/(?<![0-9.])(?:0|[0-9.]+e-1[0-9]) %/g, "≈0 %"),
  ]),
  carry: Array.from(doc.querySelectorAll("#calculator a.carry-link")).map((a) => a.getAttribute("href")),
})"##;

/// Sum of the layout shifts the page recorded (none from user input here).
const LAYOUT_SHIFT: &str = r#"
new Promise((resolve) => {
  let total = 0;
  new PerformanceObserver((list) => {
    for (const entry of list.getEntries()) if (!entry.hadRecentInput) total += entry.value;
  }).observe({ type: "layout-shift", buffered: true });
  setTimeout(() => resolve(total), 300);
})"#;

/// Both texts from shortly before their first difference on (at most 160
/// characters each).
fn around_first_difference(a: &str, b: &str) -> (String, String) {
    let a: Vec<char> = a.chars().collect();
    let b: Vec<char> = b.chars().collect();
    let at = a.iter().zip(&b).take_while(|(x, y)| x == y).count();
    let from = at.saturating_sub(60);
    let cut = |t: &[char]| {
        t[from.min(t.len())..(from + 160).min(t.len())]
            .iter()
            .collect::<String>()
    };
    (format!("…{}", cut(&a)), format!("…{}", cut(&b)))
}

#[test]
fn every_page_serves_its_demo_result_and_the_script_renders_the_same_without_shifting() {
    let _turn = one_at_a_time();
    let site = fixture();
    let (mut browser, page) = launched(Launch {
        width: 360,
        height: 740,
    });
    let mut problems = Vec::new();
    for calculator in calculators::CALCULATORS {
        let url = format!("{}/{}.html", site.base, calculator.key);
        page.goto(&mut browser, &url).unwrap_or_else(|e| panic!("{e}"));
        let state = page.wait_rendered(&mut browser).unwrap_or_else(|e| panic!("{e}"));
        assert_eq!(state, "ready", "{url}");
        eval(&page, &mut browser, VIEW_FN);
        let served = eval(&page, &mut browser, SERVED_VIEW);
        let live = eval(&page, &mut browser, LIVE_VIEW);
        let outputs = served["outputs"].as_array().map(Vec::len).unwrap_or(0);
        if outputs == 0 {
            problems.push(format!("{}: the served page has no result", calculator.key));
        }
        for part in ["outputs", "warnings", "fields", "shown", "figures", "tables", "carry"] {
            if served[part] != live[part] {
                let (served, live) = (served[part].to_string(), live[part].to_string());
                let (a, b) = around_first_difference(&served, &live);
                problems.push(format!(
                    "{}: {part} differ\n  served: {a}\n  script: {b}",
                    calculator.key
                ));
            }
        }
        // The prerendered parts are gone once the script has rendered.
        let demo_left = eval(&page, &mut browser, "document.querySelectorAll('[data-demo]').length");
        if demo_left != json!(0) {
            problems.push(format!(
                "{}: {demo_left} demo parts left after the script rendered",
                calculator.key
            ));
        }
        let shift = eval(&page, &mut browser, LAYOUT_SHIFT).as_f64().unwrap_or(f64::NAN);
        if shift != 0.0 {
            problems.push(format!("{}: layout shift {shift} at 360 × 740", calculator.key));
        }
    }
    assert!(problems.is_empty(), "\n{}", problems.join("\n"));
    let errors = page_errors(&browser, &page);
    assert!(errors.is_empty(), "console errors:\n{}", errors.join("\n"));
}

/// Every element of the calculator's form in tree order, as text: its tag, its
/// attributes (sorted by name), a control's and option's value, a selector's
/// selected index, whether it is hidden, and its text.
const FORM_TREE: &str = r##"
(() => {
  const walk = (node) => {
    if (node.nodeType === Node.TEXT_NODE) return node.data;
    if (node.nodeType !== Node.ELEMENT_NODE) return null;
    const attributes = Array.from(node.attributes, (a) => [a.name, a.value]).sort((a, b) => (a[0] < b[0] ? -1 : 1));
    const state = {};
    if (node instanceof HTMLInputElement || node instanceof HTMLSelectElement || node instanceof HTMLTextAreaElement || node instanceof HTMLOptionElement) state.value = node.value;
    if (node instanceof HTMLSelectElement) state.selected = node.selectedIndex;
    if (node instanceof HTMLTextAreaElement) state.rows = node.rows;
    return [node.tagName, attributes, state, node.hidden, Array.from(node.childNodes, walk)];
  };
  return JSON.stringify(walk(document.querySelector("#calculator form.inputs")));
})()"##;

/// Run in the page before its scripts (`Page.addScriptToEvaluateOnNewDocument`):
/// removes the form the site tool served once the document is parsed, before the
/// page script runs, which then builds the whole form itself.
const WITHOUT_SERVED_FORM: &str = r##"
document.addEventListener("readystatechange", () => {
  if (document.readyState === "interactive") {
    for (const form of document.querySelectorAll("#calculator form.inputs")) {
      form.remove();
      window.servedFormsRemoved = (window.servedFormsRemoved || 0) + 1;
    }
  }
});"##;

/// Issue 9: the page script takes over the form the site tool served (finding a
/// field costs far less than building it) and builds the fields the demo hides
/// later. The form it ends with must be the one it builds when nothing was served:
/// every element, attribute, value, option and hidden flag, for every page's demo
/// and for a link that shows fields the demo hides.
#[test]
fn the_form_the_page_takes_over_is_the_form_its_script_builds() {
    let _turn = one_at_a_time();
    let site = fixture();
    let (mut browser, page) = launched(Launch {
        width: 360,
        height: 740,
    });
    let fields_of = |key: &str| calculators::spec(key).map(|s| s.fields.len()).unwrap_or(0);
    let mut addresses: Vec<(String, usize)> = calculators::CALCULATORS
        .iter()
        .map(|c| (format!("{}/{}.html", site.base, c.key), fields_of(c.key)))
        .collect();
    addresses.push((
        format!(
            "{}/bend.html?p_known=outlet&p2=130psi&flow_given=v&v=8ft/s&d=12in&system=si",
            site.base
        ),
        fields_of("bend"),
    ));
    let forms = |page: &Page, browser: &mut Browser, removed: usize| -> Vec<String> {
        addresses
            .iter()
            .map(|(url, fields)| {
                page.goto(browser, url).unwrap_or_else(|e| panic!("{e}"));
                let state = page.wait_rendered(browser).unwrap_or_else(|e| panic!("{e}"));
                assert_eq!(state, "ready", "{url}");
                // A ready page's form is complete: every field, those the page's
                // values hide included.
                let built = eval(
                    page,
                    browser,
                    "document.querySelectorAll('#calculator form.inputs > .field').length",
                );
                assert_eq!(built, json!(fields), "{url}: fields in the form when ready");
                // The second round's pages must not have had a form to take over.
                let gone = eval(page, browser, "window.servedFormsRemoved || 0");
                assert_eq!(
                    gone,
                    json!(removed),
                    "{url}: served forms removed before the script ran"
                );
                eval(page, browser, FORM_TREE).as_str().unwrap_or_default().to_string()
            })
            .collect()
    };
    let taken_over = forms(&page, &mut browser, 0);
    page.call(
        &mut browser,
        "Page.addScriptToEvaluateOnNewDocument",
        json!({ "source": WITHOUT_SERVED_FORM }),
    )
    .unwrap_or_else(|e| panic!("{e}"));
    let built = forms(&page, &mut browser, 1);
    let mut problems = Vec::new();
    for (((url, _), taken), built) in addresses.iter().zip(&taken_over).zip(&built) {
        if taken.is_empty() || taken != built {
            let (a, b) = around_first_difference(taken, built);
            problems.push(format!("{url}: the forms differ\n  taken over: {a}\n  built:      {b}"));
        }
    }
    assert!(problems.is_empty(), "\n{}", problems.join("\n"));
    let errors = page_errors(&browser, &page);
    assert!(errors.is_empty(), "console errors:\n{}", errors.join("\n"));
}

/// Run in the page before its scripts (`Page.addScriptToEvaluateOnNewDocument`): at
/// the link's first result (its performance mark, made while the page's first task
/// still runs), the inside diameter's unit selector is focused and the flow's pressed, and
/// how many options each offered before and after is recorded.
const OPENED_AT_FIRST_RESULT: &str = r##"
window.openedAtFirstResult = null;
const markAsBefore = performance.mark.bind(performance);
performance.mark = (name, ...rest) => {
  const entry = markAsBefore(name, ...rest);
  if (name === "fluxledger:first-result" && !window.openedAtFirstResult) {
    const diameter = document.querySelector("#calculator select[data-unit-for=d]");
    const flow = document.querySelector("#calculator select[data-unit-for=q]");
    const record = { before: [diameter.options.length, flow.options.length] };
    diameter.dispatchEvent(new FocusEvent("focusin", { bubbles: true }));
    flow.dispatchEvent(new PointerEvent("pointerdown", { bubbles: true }));
    record.after = [diameter.options.length, flow.options.length];
    record.values = [diameter.value, flow.value];
    window.openedAtFirstResult = record;
  }
  return entry;
};"##;

/// Issue 9: a link's first result does not wait for the options of the selectors
/// that already show their value; one focused or pressed before they are added gets
/// them first, keeping its value, and they are the options it ends with.
#[test]
fn a_unit_selector_opened_before_a_links_form_is_complete_gets_its_options_first() {
    let _turn = one_at_a_time();
    let site = fixture();
    let (mut browser, page) = launched(Launch {
        width: 360,
        height: 740,
    });
    page.call(
        &mut browser,
        "Page.addScriptToEvaluateOnNewDocument",
        json!({ "source": OPENED_AT_FIRST_RESULT }),
    )
    .unwrap_or_else(|e| panic!("{e}"));
    let url = format!("{}/bend.html?angle=30deg", site.base);
    page.goto(&mut browser, &url).unwrap_or_else(|e| panic!("{e}"));
    let state = page.wait_rendered(&mut browser).unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(state, "ready", "{url}");
    let opened = eval(&page, &mut browser, "window.openedAtFirstResult");
    let complete = eval(
        &page,
        &mut browser,
        "['d', 'q'].map((k) => document.querySelector(`#calculator select[data-unit-for=${k}]`).options.length)",
    );
    let counts: Vec<u64> = complete
        .as_array()
        .map(|a| a.iter().filter_map(Value::as_u64).collect())
        .unwrap_or_default();
    assert!(
        counts.len() == 2 && counts.iter().all(|&n| n > 1),
        "complete lists: {complete}"
    );
    // At the first result both selectors showed their one served option...
    assert_eq!(opened["before"], json!([1, 1]), "{opened}");
    // ...and focused or pressed, each had its whole list, still on its unit.
    assert_eq!(opened["after"], complete, "{opened}");
    assert_eq!(opened["values"], json!(["mm", "m3/h"]), "{opened}");
    let errors = page_errors(&browser, &page);
    assert!(errors.is_empty(), "console errors:\n{}", errors.join("\n"));
}

#[test]
fn a_link_with_a_query_shows_computing_not_the_demo_then_its_own_result() {
    let _turn = one_at_a_time();
    let site = fixture();
    let (mut browser, page) = launched(Launch {
        width: 360,
        height: 740,
    });
    let link = format!(
        "{}/bend.html?angle=30deg&d=12in&p=150psi&plane=horizontal&system=us",
        site.base
    );

    // Without the module the script never takes over: what the served page shows
    // for a link is what a slow network shows until the module arrives.
    page.call(&mut browser, "Network.setBlockedURLs", json!({ "urls": ["*.wasm"] }))
        .unwrap_or_else(|e| panic!("{e}"));
    page.goto(&mut browser, &link).unwrap_or_else(|e| panic!("{e}"));
    let marked = eval(
        &page,
        &mut browser,
        "document.documentElement.classList.contains('has-query')",
    );
    assert_eq!(marked, json!(true), "query.js marks a page opened with a query");
    let shown = eval(
        &page,
        &mut browser,
        "Array.from(document.querySelectorAll('[data-demo]')).map((e) => getComputedStyle(e).visibility)",
    );
    let shown: Vec<&str> = shown
        .as_array()
        .into_iter()
        .flatten()
        .filter_map(Value::as_str)
        .collect();
    assert!(!shown.is_empty(), "the served page has demo parts");
    assert!(
        shown.iter().all(|v| *v == "hidden"),
        "demo parts visible under a query: {shown:?}"
    );
    let note = eval(
        &page,
        &mut browser,
        "getComputedStyle(document.querySelector('[data-demo] .headline'), '::before').content",
    );
    assert!(
        note.as_str().is_some_and(|n| n.contains("computing")),
        "the headline says the link's values are being computed: {note}"
    );

    // With the module (a tab of its own, where nothing is blocked): the link's
    // own result, no demo part left.
    let fresh = browser.new_page().unwrap_or_else(|e| panic!("{e}"));
    fresh.goto(&mut browser, &link).unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(
        fresh.wait_rendered(&mut browser).unwrap_or_else(|e| panic!("{e}")),
        "ready"
    );
    let left = eval(&fresh, &mut browser, "document.querySelectorAll('[data-demo]').length");
    assert_eq!(left, json!(0));
    let thrust = eval(
        &fresh,
        &mut browser,
        "document.querySelector('[data-output=thrust]')?.textContent ?? ''",
    );
    assert!(
        thrust.as_str().is_some_and(|t| t.ends_with("lbf")),
        "the link's US result is shown: {thrust}"
    );
    // The link's first result is its headline (the tables and figures are built
    // once it is painted); ready, the page shows every table and the diagram the
    // core gives for the link, none left stale.
    let spec = fluxledger_core::calculators::spec("bend").expect("bend is registered");
    let request = fluxledger_core::Request {
        system: fluxledger_core::UnitSystem::UsCustomary,
        ..fluxledger_core::catalog::demo_request(
            &spec,
            &[
                ("angle", "30deg"),
                ("d", "12in"),
                ("p", "150psi"),
                ("plane", "horizontal"),
            ],
        )
    };
    let solution = fluxledger_core::solve("bend", &request)
        .result
        .unwrap_or_else(|e| panic!("the link does not solve natively: {e:?}"));
    let shown = eval(
        &fresh,
        &mut browser,
        r##"[document.querySelectorAll("#calculator table.ledger").length,
            document.querySelectorAll("#calculator svg.diagram").length,
            document.querySelectorAll("#calculator [data-stale]").length,
            performance.getEntriesByName("fluxledger:first-result").length]"##,
    );
    assert_eq!(
        shown,
        json!([solution.tables.len(), solution.diagrams.len(), 0, 1]),
        "tables, diagrams, stale parts and first-result marks of the link's page"
    );
    let errors = page_errors(&browser, &fresh);
    assert!(errors.is_empty(), "console errors:\n{}", errors.join("\n"));
}

#[test]
fn the_page_and_its_module_travel_compressed_and_are_requested_from_the_head() {
    let _turn = one_at_a_time();
    let site = fixture();
    let (mut browser, page) = launched(Launch::default());
    page.goto(&mut browser, &format!("{}/bend.html", site.base))
        .unwrap_or_else(|e| panic!("{e}"));
    page.wait_rendered(&mut browser).unwrap_or_else(|e| panic!("{e}"));
    let sizes = eval(
        &page,
        &mut browser,
        r#"performance.getEntries()
            .filter((e) => e.entryType === "navigation" || /\.(wasm|js|css)$/.test(e.name))
            .map((e) => [e.name.split("/").pop(), e.encodedBodySize, e.decodedBodySize])"#,
    );
    let rows = sizes.as_array().cloned().unwrap_or_default();
    assert!(
        rows.iter().any(|r| r[0].as_str().is_some_and(|n| n.ends_with(".wasm"))),
        "{sizes}"
    );
    for row in &rows {
        let (encoded, decoded) = (row[1].as_f64().unwrap_or(0.0), row[2].as_f64().unwrap_or(0.0));
        assert!(
            encoded > 0.0 && encoded < decoded,
            "{} was not sent compressed ({encoded} of {decoded} bytes)",
            row[0]
        );
    }
    // The module is requested by the preload in the head, and used from there
    // (Chromium warns in the console when a preload goes unused).
    let preloaded = eval(
        &page,
        &mut browser,
        "Array.from(document.head.querySelectorAll('link[rel=preload][as=fetch], link[rel=modulepreload]')).map((l) => l.getAttribute('href'))",
    );
    let preloaded: Vec<&str> = preloaded
        .as_array()
        .into_iter()
        .flatten()
        .filter_map(Value::as_str)
        .collect();
    assert!(preloaded.iter().any(|h| h.ends_with(".wasm")), "{preloaded:?}");
    assert!(
        preloaded
            .iter()
            .any(|h| h.starts_with("fluxledger_wasm.") && h.ends_with(".js")),
        "{preloaded:?}"
    );
    // The page script is one file (its modules joined at build time), requested by
    // the head script itself, and the glue is preloaded: no chain of imports costs
    // a round trip per level, and no request queues behind a module's.
    let entry = eval(
        &page,
        &mut browser,
        "document.head.querySelector('script[type=module]').getAttribute('src')",
    );
    let entry = entry.as_str().unwrap_or_default().to_string();
    let modules = eval(
        &page,
        &mut browser,
        r#"performance.getEntriesByType("resource")
            .map((e) => e.name.split("?")[0].split("/").pop())
            .filter((n) => n.endsWith(".js") && !n.startsWith("query.") && n !== "sw.js")"#,
    );
    let modules: Vec<&str> = modules
        .as_array()
        .into_iter()
        .flatten()
        .filter_map(Value::as_str)
        .collect();
    assert_eq!(
        modules.len(),
        2,
        "the page script and the glue, nothing else: {modules:?}"
    );
    assert!(
        modules.contains(&entry.as_str()),
        "{modules:?} holds the page script {entry}"
    );
    let not_preloaded: Vec<&&str> = modules
        .iter()
        .filter(|m| !preloaded.contains(m) && **m != entry)
        .collect();
    assert!(
        not_preloaded.is_empty(),
        "modules loaded without a preload in the head: {not_preloaded:?}"
    );
    // The first result needs the HTML alone: no request holds up rendering (the
    // screen styles and the head script are inline, the print stylesheet is
    // `media="print"`), and without a query the page script and the wasm are
    // requested only after the first paint, so nothing competes with the page.
    let timing = eval(
        &page,
        &mut browser,
        r#"(() => {
            const fcp = performance.getEntriesByName("first-contentful-paint")[0]?.startTime ?? -1;
            const resources = performance.getEntriesByType("resource");
            return {
                fcp,
                blocking: resources.filter((e) => e.renderBlockingStatus === "blocking")
                    .map((e) => e.name.split("/").pop()),
                early: resources.filter((e) => /\.(wasm|js)$/.test(e.name) && e.startTime < fcp)
                    .map((e) => e.name.split("/").pop()),
            };
        })()"#,
    );
    assert!(timing["fcp"].as_f64().is_some_and(|t| t > 0.0), "{timing}");
    assert_eq!(timing["blocking"], json!([]), "render-blocking requests: {timing}");
    assert_eq!(timing["early"], json!([]), "requested before the first paint: {timing}");
    // The preload matches the glue's own fetch (same URL, CORS mode): the module is
    // downloaded once, not twice.
    let fetched = eval(
        &page,
        &mut browser,
        "performance.getEntriesByType('resource').filter((e) => e.name.endsWith('.wasm')).length",
    );
    assert_eq!(fetched, json!(1), "the wasm module was fetched {fetched} times");
    let errors = page_errors(&browser, &page);
    assert!(errors.is_empty(), "console errors:\n{}", errors.join("\n"));
}

/// Issue 9: the first response of every calculator page (its HTML, which shows the
/// demo result by itself) stays within the budget gzipped, so a page that grows
/// fails here with its size. The build prints every file's size.
#[test]
fn every_calculator_page_is_within_the_first_response_budget() {
    use fluxledger_site::build::{gzip_size, FIRST_RESPONSE_GZIP_BUDGET};
    let site = fixture();
    let mut sizes = Vec::new();
    for calculator in calculators::CALCULATORS {
        let file = fluxledger_site::pages::page_file(calculator.key);
        let html = std::fs::read(site.dir.join(&file)).unwrap_or_else(|e| panic!("{file}: {e}"));
        sizes.push((file, gzip_size(&html)));
    }
    let over: Vec<String> = sizes
        .iter()
        .filter(|(_, gzip)| *gzip > FIRST_RESPONSE_GZIP_BUDGET)
        .map(|(file, gzip)| format!("{file}: {gzip} bytes gzip"))
        .collect();
    assert!(
        over.is_empty(),
        "over the {FIRST_RESPONSE_GZIP_BUDGET} bytes gzip budget:\n{}\nall: {sizes:?}",
        over.join("\n")
    );
    // The measure can fail: a page's HTML is far from empty.
    assert!(sizes.iter().all(|(_, gzip)| *gzip > 2_000), "{sizes:?}");
}

/// The first response carries the method note's first section and a link to the
/// whole note; after the first result the page script puts the later sections in
/// place of the link, so the page ends up with the whole note, the same text as
/// its own page, each section once.
#[test]
fn every_page_completes_its_method_note_from_the_note_page() {
    let _turn = one_at_a_time();
    let site = fixture();
    let (mut browser, page) = launched(Launch {
        width: 360,
        height: 740,
    });
    let mut problems = Vec::new();
    for calculator in calculators::CALCULATORS {
        let url = format!("{}/{}.html", site.base, calculator.key);
        page.goto(&mut browser, &url).unwrap_or_else(|e| panic!("{e}"));
        page.wait_rendered(&mut browser).unwrap_or_else(|e| panic!("{e}"));
        let served_link = eval(
            &page,
            &mut browser,
            r#"fetch(location.href, { cache: "no-store" }).then((r) => r.text()).then((html) =>
                new DOMParser().parseFromString(html, "text/html").querySelector(".method-note > .note-more a")?.getAttribute("href") ?? null)"#,
        );
        let Some(note_page) = served_link.as_str().map(str::to_string) else {
            continue;
        };
        if page
            .wait_for(
                &mut browser,
                "!document.querySelector('.method-note > .note-more')",
                std::time::Duration::from_secs(15),
            )
            .is_err()
        {
            problems.push(format!("{}: the link to {note_page} is still there", calculator.key));
            continue;
        }
        let compared = eval(
            &page,
            &mut browser,
            &format!(
                r#"fetch({note_page:?}).then((r) => r.text()).then((html) => {{
                    const words = (e) => (e ? e.textContent : "").replace(/\s+/g, " ").trim();
                    const whole = new DOMParser().parseFromString(html, "text/html").querySelector("article.method-note");
                    const live = document.querySelector("article.method-note");
                    return {{ same: words(whole) === words(live) && words(live).length > 0,
                              headings: [whole.querySelectorAll(":scope > h2").length, live.querySelectorAll(":scope > h2").length] }};
                }})"#
            ),
        );
        if compared["same"] != json!(true) || compared["headings"][0] != compared["headings"][1] {
            problems.push(format!(
                "{}: the note differs from {note_page}: {compared}",
                calculator.key
            ));
        }
    }
    assert!(problems.is_empty(), "\n{}", problems.join("\n"));
    let errors = page_errors(&browser, &page);
    assert!(errors.is_empty(), "console errors:\n{}", errors.join("\n"));
}

#[test]
fn what_is_typed_before_the_page_script_takes_over_is_kept_and_computed() {
    let _turn = one_at_a_time();
    let site = fixture();
    let (mut browser, page) = launched(Launch {
        width: 360,
        height: 740,
    });
    // The module's request waits until the test lets it go: until then the page
    // is what a slow network shows after the first paint.
    page.call(
        &mut browser,
        "Fetch.enable",
        json!({ "patterns": [{ "urlPattern": "*.wasm", "requestStage": "Request" }] }),
    )
    .unwrap_or_else(|e| panic!("{e}"));
    let url = format!("{}/bend.html", site.base);
    page.call(&mut browser, "Page.navigate", json!({ "url": url }))
        .unwrap_or_else(|e| panic!("{e}"));
    page.wait_for(
        &mut browser,
        "document.readyState !== 'loading' && document.querySelector('.calc-grid[data-demo]') && performance.getEntriesByName('first-contentful-paint').length > 0",
        std::time::Duration::from_secs(30),
    )
    .unwrap_or_else(|e| panic!("the served page did not paint: {e}"));

    // The served form takes typing; the demo result no longer answers it.
    type_into(&page, &mut browser, "p", "16").unwrap_or_else(|e| panic!("{e}"));
    // Enter sends nothing: the page stays, with what was typed.
    for kind in ["keyDown", "keyUp"] {
        page.call(
            &mut browser,
            "Input.dispatchKeyEvent",
            json!({ "type": kind, "key": "Enter", "code": "Enter", "windowsVirtualKeyCode": 13 }),
        )
        .unwrap_or_else(|e| panic!("{e}"));
    }
    browser
        .pump(std::time::Duration::from_millis(300))
        .unwrap_or_else(|e| panic!("{e}"));
    let before = eval(
        &page,
        &mut browser,
        "JSON.stringify([document.getElementById('field-p').value, location.search, document.documentElement.classList.contains('is-editing'), getComputedStyle(document.querySelector('.headline-values')).visibility, document.body.dataset.state || ''])",
    );
    assert_eq!(
        before,
        json!(r#"["16","",true,"hidden",""]"#),
        "typed before the script: [value, query, marked, demo result, state]"
    );

    // The module arrives: the script takes the form over with what was typed.
    let paused: Vec<String> = page
        .events(&browser)
        .filter(|e| e.method == "Fetch.requestPaused")
        .filter_map(|e| e.params["requestId"].as_str().map(str::to_string))
        .collect();
    assert!(!paused.is_empty(), "the module was not requested");
    for id in &paused {
        page.call(&mut browser, "Fetch.continueRequest", json!({ "requestId": id }))
            .unwrap_or_else(|e| panic!("{e}"));
    }
    page.call(&mut browser, "Fetch.disable", json!({}))
        .unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(page.wait_rendered(&mut browser).unwrap_or_default(), "ready");
    // The link follows after a pause, as after any edit.
    page.wait_for(
        &mut browser,
        "new URLSearchParams(location.search).get('p') === '16bar'",
        std::time::Duration::from_secs(5),
    )
    .unwrap_or_else(|e| panic!("what was typed did not reach the link: {e}"));
    let after = eval(
        &page,
        &mut browser,
        "JSON.stringify([document.getElementById('field-p').value, new URLSearchParams(location.search).get('p'), document.querySelector('[data-output=thrust]').textContent])",
    );
    let after: (String, String, String) =
        serde_json::from_str(after.as_str().unwrap_or("")).unwrap_or_else(|e| panic!("{after}: {e}"));
    assert_eq!((after.0.as_str(), after.1.as_str()), ("16", "16bar"), "{after:?}");

    // The result is the core's for that link, as a fresh load of it shows.
    page.goto(&mut browser, &format!("{}/bend.html?p=16bar", site.base))
        .unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(page.wait_rendered(&mut browser).unwrap_or_default(), "ready");
    let linked = eval(
        &page,
        &mut browser,
        "document.querySelector('[data-output=thrust]').textContent",
    );
    assert_eq!(
        linked.as_str(),
        Some(after.2.as_str()),
        "typed before the take-over against the link"
    );
    let errors = page_errors(&browser, &page);
    assert!(errors.is_empty(), "console errors:\n{}", errors.join("\n"));
}
