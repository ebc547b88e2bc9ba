//! The calculation sheet and cases side by side: page-level sheet fields kept in
//! the link and printed in the header block, the printed link readable and drawn
//! as a QR code, every calculator with its demo values printing on at most two
//! A4 or Letter pages with no text running out of its box, and pinned cases shown
//! beside the current one with their differences, kept in the link.

use std::time::Duration;

use serde_json::{json, Value};

use crate::cdp::{self, Browser, Launch, Page};
use crate::harness::{fixture, launched, one_at_a_time, page_errors, query_string};

fn eval(page: &Page, browser: &mut Browser, expression: &str) -> Value {
    page.eval(browser, expression).unwrap_or_else(|e| panic!("{e}"))
}

fn open(page: &Page, browser: &mut Browser, url: &str) {
    page.goto(browser, url).unwrap_or_else(|e| panic!("{url}: {e}"));
    let state = page.wait_rendered(browser).unwrap_or_else(|e| panic!("{url}: {e}"));
    assert_eq!(state, "ready", "{url}: the page did not compute");
}

/// The sheet fields of the tests' link, with text that needs escaping in a query.
fn sheet_pairs() -> Vec<(String, String)> {
    [
        ("project", "Main St/Phase 2"),
        ("tag", "TB-4, north leg"),
        ("calc_no", "C-101"),
        ("rev", "B"),
        ("prepared_by", "A. Rao"),
        ("checked_by", "J. Kim"),
        ("date", "2026-12-02"),
    ]
    .iter()
    .map(|(k, v)| (k.to_string(), v.to_string()))
    .collect()
}

#[test]
fn sheet_fields_travel_in_the_link_and_head_the_printed_sheet() {
    let _turn = one_at_a_time();
    let site = fixture();
    let (mut browser, page) = launched(Launch::default());
    let pairs = sheet_pairs();
    let url = format!("{}/thrust-block.html?{}", site.base, query_string(&pairs));
    open(&page, &mut browser, &url);

    // Page-level keys are not reported as keys the page does not use.
    let notices = eval(&page, &mut browser, "document.getElementById('notices').textContent");
    assert_eq!(notices, "", "notices for sheet keys");
    // Each is in its field and in the printed header, with the version.
    let header = eval(
        &page,
        &mut browser,
        "document.querySelector('.sheet-header').textContent",
    );
    let header = header.as_str().unwrap_or_default();
    for (key, value) in &pairs {
        let field = eval(
            &page,
            &mut browser,
            &format!("document.getElementById('sheet-{key}').value"),
        );
        assert_eq!(field.as_str(), Some(value.as_str()), "field {key}");
        assert!(header.contains(value.as_str()), "header lacks {value:?}: {header}");
    }
    assert!(
        header.contains(&format!("Fluxledger {}", env!("CARGO_PKG_VERSION"))),
        "header lacks the version: {header}"
    );
    // The inputs print as a table of what was typed, with units.
    let inputs = eval(
        &page,
        &mut browser,
        "document.querySelector('.sheet-inputs-table').textContent",
    );
    assert!(
        inputs.as_str().is_some_and(|t| t.contains("bar")),
        "inputs table: {inputs}"
    );
    // A plain number prints bare (`1.5`, not `1.5 -`), and nothing prints "null".
    let cells = eval(
        &page,
        &mut browser,
        "JSON.stringify([...document.querySelectorAll('.sheet-inputs td')].map(td => td.textContent))",
    );
    let cells: Vec<String> = serde_json::from_str(cells.as_str().unwrap_or("[]")).unwrap_or_default();
    assert!(cells.iter().any(|c| c == "1.5"), "no bare safety factor: {cells:?}");
    assert!(!cells.iter().any(|c| c.ends_with(" -")), "a unit dash: {cells:?}");
    let sheet_inputs = eval(
        &page,
        &mut browser,
        "document.querySelector('.sheet-inputs').textContent",
    );
    assert!(
        !sheet_inputs.as_str().unwrap_or_default().contains("null"),
        "{sheet_inputs}"
    );

    // Typing in a sheet field rewrites the link; `/` and `,` stay readable.
    eval(
        &page,
        &mut browser,
        "(() => { const i = document.getElementById('sheet-checked_by'); i.focus(); i.select(); })()",
    );
    page.call(&mut browser, "Input.insertText", json!({ "text": "M. Ode/QA" }))
        .unwrap_or_else(|e| panic!("{e}"));
    page.wait_for(
        &mut browser,
        "new URLSearchParams(location.search).get('checked_by') === 'M. Ode/QA'",
        Duration::from_secs(5),
    )
    .unwrap_or_else(|e| panic!("the link did not follow the sheet field: {e}"));
    let search = eval(&page, &mut browser, "location.search");
    let search = search.as_str().unwrap_or_default();
    assert!(
        search.contains("checked_by=M.+Ode/QA") && search.contains("project=Main+St/Phase+2"),
        "{search}"
    );
    assert!(!search.to_ascii_uppercase().contains("%2F"), "{search}");
    // The calculation did not change: sheet fields are not inputs.
    assert_eq!(eval(&page, &mut browser, "document.body.dataset.state"), "ready");

    // The printed link is readable and the QR code is a well-formed symbol of it.
    let printed = eval(
        &page,
        &mut browser,
        "document.querySelector('.sheet-url-text').textContent",
    );
    let printed = printed.as_str().unwrap_or_default().to_string();
    assert!(printed.contains("checked_by=M.+Ode/QA"), "{printed}");
    let size = eval(
        &page,
        &mut browser,
        "Number(document.querySelector('svg.sheet-qr').getAttribute('viewBox').split(' ')[2]) - 8",
    )
    .as_f64()
    .unwrap_or(0.0) as usize;
    assert!(size >= 21 && (size - 17).is_multiple_of(4), "QR size {size}");
    let squares = eval(
        &page,
        &mut browser,
        "document.querySelector('svg.sheet-qr path').getAttribute('d').split('M').length - 1",
    )
    .as_u64()
    .unwrap_or(0) as usize;
    // Three finder patterns alone have 3 × 33 dark modules.
    assert!(
        squares > 99 && squares < size * size,
        "{squares} dark modules of {size}²"
    );

    // Reloading the link restores the sheet fields.
    page.call(&mut browser, "Page.reload", json!({}))
        .unwrap_or_else(|e| panic!("{e}"));
    browser
        .pump(Duration::from_millis(200))
        .unwrap_or_else(|e| panic!("{e}"));
    page.wait_for(
        &mut browser,
        "document.readyState === 'complete'",
        Duration::from_secs(30),
    )
    .unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(page.wait_rendered(&mut browser).unwrap_or_default(), "ready");
    assert_eq!(
        eval(&page, &mut browser, "document.getElementById('sheet-checked_by').value"),
        "M. Ode/QA"
    );
    let errors = page_errors(&browser, &page);
    assert!(errors.is_empty(), "console errors:\n{}", errors.join("\n"));
}

/// Pages of a PDF: the page objects, cross-checked against the page tree's count.
fn pdf_pages(pdf: &[u8]) -> usize {
    let text = String::from_utf8_lossy(pdf);
    let objects = text
        .match_indices("/Type /Page")
        .filter(|(i, m)| !text[i + m.len()..].starts_with('s'))
        .count();
    let counted = text
        .split("/Type /Pages")
        .nth(1)
        .and_then(|rest| rest.split("/Count ").nth(1))
        .and_then(|rest| rest.split(|c: char| !c.is_ascii_digit()).next())
        .and_then(|n| n.parse::<usize>().ok());
    // The page tree's count sits either before or after its type; take the object count
    // when the tree cannot be read, and make sure both agree when it can.
    if let Some(counted) = counted {
        assert_eq!(counted, objects, "page tree count against page objects");
    }
    objects
}

/// Elements of the printed sheet whose content is wider than their box.
const OVERFLOWING: &str = "JSON.stringify([...document.querySelectorAll(\
    '.sheet-header, .sheet-header *, .sheet-inputs, .sheet-inputs *, \
     .headline, .headline *, .details > *, .details .table-scroll, .details td, .details th, .details dd, \
     .details dt, .cautions, .cautions li, .method-note, .method-note > *, .print-footer')]\
    .filter(e => e.getClientRects().length > 0 && getComputedStyle(e).overflowX !== 'auto')\
    .filter(e => e.clientWidth > 0 && e.scrollWidth > e.clientWidth + 1)\
    .map(e => e.tagName.toLowerCase() + (e.className && e.className.baseVal === undefined ? '.' + e.className : '') \
        + ' ' + e.scrollWidth + '>' + e.clientWidth + ': ' + (e.textContent || '').slice(0, 60)))";

/// Pages that do not yet fit two sheets with their demo values, with the count they
/// print on today on the longer of A4 and Letter (issue 10 §1 wants two for every
/// page). Empty: every page fits. The test fails when a page listed here comes down
/// to two on both papers (so this list only shrinks).
const OVER_TWO_PAGES: &[(&str, usize)] = &[];

/// Set to a folder to keep every printed PDF (`<page>-<paper>.pdf`) for looking at.
const KEEP_PDFS: &str = "FLUXLEDGER_SHEET_PDFS";

#[test]
fn every_calculator_prints_on_at_most_two_pages_with_nothing_cut_off() {
    let _turn = one_at_a_time();
    let site = fixture();
    let (mut browser, page) = launched(Launch::default());
    let mut problems = Vec::new();
    for calculator in fluxledger_core::calculators::CALCULATORS {
        let key = calculator.key;
        let url = format!("{}/{key}.html?{}", site.base, query_string(&sheet_pairs()));
        open(&page, &mut browser, &url);
        page.call(&mut browser, "Emulation.setEmulatedMedia", json!({ "media": "print" }))
            .unwrap_or_else(|e| panic!("{e}"));
        // The width of an A4 sheet inside the page margins (210 − 2 × 12 mm at 96 px/in).
        page.call(
            &mut browser,
            "Emulation.setDeviceMetricsOverride",
            json!({ "width": 703, "height": 1000, "deviceScaleFactor": 1, "mobile": false }),
        )
        .unwrap_or_else(|e| panic!("{e}"));
        browser
            .pump(Duration::from_millis(300))
            .unwrap_or_else(|e| panic!("{e}"));
        let overflowing = eval(&page, &mut browser, OVERFLOWING);
        let overflowing: Vec<String> = serde_json::from_str(overflowing.as_str().unwrap_or("[]")).unwrap_or_default();
        for element in overflowing {
            problems.push(format!("{key}: printed text runs out of its box: {element}"));
        }
        page.call(&mut browser, "Emulation.clearDeviceMetricsOverride", json!({}))
            .unwrap_or_else(|e| panic!("{e}"));
        page.call(&mut browser, "Emulation.setEmulatedMedia", json!({ "media": "" }))
            .unwrap_or_else(|e| panic!("{e}"));
        let allowed = OVER_TWO_PAGES
            .iter()
            .find(|(page, _)| *page == key)
            .map_or(2, |(_, pages)| *pages);
        let mut most = 0;
        for (paper, width, height) in [("A4", 8.27, 11.69), ("Letter", 8.5, 11.0)] {
            let printed = page
                .call(
                    &mut browser,
                    "Page.printToPDF",
                    json!({ "paperWidth": width, "paperHeight": height, "printBackground": false }),
                )
                .unwrap_or_else(|e| panic!("{key}: printing failed: {e}"));
            let pdf =
                cdp::base64_decode(printed["data"].as_str().unwrap_or_default()).unwrap_or_else(|e| panic!("{e}"));
            if let Some(dir) = std::env::var_os(KEEP_PDFS) {
                let path = std::path::Path::new(&dir).join(format!("{key}-{paper}.pdf"));
                std::fs::write(&path, &pdf).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
            }
            let pages = pdf_pages(&pdf);
            if pages == 0 || pages > allowed {
                problems.push(format!("{key}: prints on {pages} {paper} pages (at most {allowed})"));
            }
            most = most.max(pages);
        }
        if allowed > 2 && most <= 2 {
            problems.push(format!("{key}: now prints on {most} pages: take it off OVER_TWO_PAGES"));
        }
    }
    let errors = page_errors(&browser, &page);
    problems.extend(errors);
    assert!(problems.is_empty(), "\n{}", problems.join("\n"));
}

#[test]
fn pinned_cases_stand_beside_the_current_one_and_stay_in_the_link() {
    let _turn = one_at_a_time();
    let site = fixture();
    let (mut browser, page) = launched(Launch::default());
    open(&page, &mut browser, &format!("{}/bend.html", site.base));
    let pin = "document.querySelector('.compare-panel button[data-action=pin]').click()";
    eval(&page, &mut browser, pin);
    page.wait_for(
        &mut browser,
        "location.search.includes('pin1=')",
        Duration::from_secs(5),
    )
    .unwrap_or_else(|e| panic!("pinning did not reach the link: {e}"));

    // Change the pressure: 10 bar (the demo) pinned, 16 bar current.
    eval(
        &page,
        &mut browser,
        "(() => { const i = document.getElementById('field-p'); i.focus(); i.select(); })()",
    );
    page.call(&mut browser, "Input.insertText", json!({ "text": "16" }))
        .unwrap_or_else(|e| panic!("{e}"));
    page.wait_for(
        &mut browser,
        "new URLSearchParams(location.search).get('p') === '16bar' && document.querySelector('.compare-table td.differs')",
        Duration::from_secs(5),
    )
    .unwrap_or_else(|e| panic!("the comparison did not follow the edit: {e}"));
    // The pinned case holds the old pressure; only differing inputs are marked.
    let differing = eval(
        &page,
        &mut browser,
        "JSON.stringify([...document.querySelectorAll('.compare-table tr.compare-input')].filter(r => r.querySelector('td.differs')).map(r => r.querySelector('th').textContent))",
    );
    let differing: Vec<String> = serde_json::from_str(differing.as_str().unwrap_or("[]")).unwrap_or_default();
    assert_eq!(differing.len(), 1, "differing inputs: {differing:?}");
    // Inputs read as people read them (the unit by its label, as the core applied
    // it), not in the link's spelling: `10 bar` for `10bar`, `m³/h` for `m3/h`.
    let shown = eval(
        &page,
        &mut browser,
        "JSON.stringify([...document.querySelectorAll('.compare-table tr.compare-input')].map(r => [...r.querySelectorAll('th, td')].map(c => c.firstChild ? c.firstChild.textContent : '')))",
    );
    let shown: Vec<Vec<String>> = serde_json::from_str(shown.as_str().unwrap_or("[]")).unwrap_or_default();
    let row = |label: &str| -> Vec<String> {
        shown
            .iter()
            .find(|r| r.first().is_some_and(|l| l.starts_with(label)))
            .cloned()
            .unwrap_or_else(|| panic!("no row {label:?} in {shown:?}"))
    };
    assert_eq!(row("Gauge pressure")[1..], ["10 bar", "16 bar"], "{shown:?}");
    assert_eq!(row("Volumetric flow")[1..], ["850 m³/h", "850 m³/h"], "{shown:?}");
    assert_eq!(row("Unit system")[1..], ["SI", "SI"], "{shown:?}");
    let pinned_p = eval(
        &page,
        &mut browser,
        "new URLSearchParams(new URLSearchParams(location.search).get('pin1')).get('p')",
    );
    assert_eq!(pinned_p, "10bar");

    // The thrust of each case as the page shows it for the case on its own, and the
    // ratio the comparison gives: current ÷ pinned.
    let row = "[...document.querySelectorAll('.compare-table tr.compare-result')].find(r => r.querySelector('th').textContent.startsWith('Thrust'))";
    let cells = eval(
        &page,
        &mut browser,
        &format!("JSON.stringify([...{row}.querySelectorAll('td')].map(td => [td.firstChild.textContent, td.querySelector('.compare-note')?.textContent ?? '']))"),
    );
    let cells: Vec<(String, String)> = serde_json::from_str(cells.as_str().unwrap_or("[]")).unwrap_or_default();
    assert_eq!(cells.len(), 2, "{cells:?}");
    let number = |text: &str| -> f64 {
        text.split_whitespace()
            .next()
            .and_then(|n| n.parse().ok())
            .unwrap_or_else(|| panic!("no number in {text:?}"))
    };
    let (pinned, current) = (number(&cells[0].0), number(&cells[1].0));
    let shown_now = eval(
        &page,
        &mut browser,
        "document.querySelector('[data-output=thrust]').textContent",
    );
    assert_eq!(
        shown_now.as_str(),
        Some(cells[1].0.as_str()),
        "current column against the headline"
    );
    let ratio: f64 = cells[0]
        .1
        .rsplit("current ÷ this: ")
        .next()
        .and_then(|r| r.trim().parse().ok())
        .unwrap_or_else(|| panic!("no ratio in {:?}", cells[0].1));
    // Four significant figures on each side.
    assert!(
        (ratio - current / pinned).abs() < 2e-3 * ratio,
        "ratio {ratio} against {current} / {pinned}"
    );
    // The pressure term dominates the bend thrust: the ratio is near 16 / 10.
    assert!(ratio > 1.5 && ratio < 1.7, "ratio {ratio}");

    // Up to four pins: the button stops there.
    for _ in 0..4 {
        eval(&page, &mut browser, pin);
    }
    browser
        .pump(Duration::from_millis(200))
        .unwrap_or_else(|e| panic!("{e}"));
    let search = eval(&page, &mut browser, "location.search");
    let search = search.as_str().unwrap_or_default().to_string();
    assert!(search.contains("pin4=") && !search.contains("pin5="), "{search}");
    assert_eq!(
        eval(
            &page,
            &mut browser,
            "document.querySelector('.compare-panel button[data-action=pin]').disabled"
        ),
        true
    );

    // A reload restores the cases; removing one renumbers the rest.
    page.call(&mut browser, "Page.reload", json!({}))
        .unwrap_or_else(|e| panic!("{e}"));
    browser
        .pump(Duration::from_millis(200))
        .unwrap_or_else(|e| panic!("{e}"));
    page.wait_for(
        &mut browser,
        "document.readyState === 'complete'",
        Duration::from_secs(30),
    )
    .unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(page.wait_rendered(&mut browser).unwrap_or_default(), "ready");
    assert_eq!(
        eval(
            &page,
            &mut browser,
            "document.querySelectorAll('.compare-table thead th').length"
        ),
        6
    );
    eval(
        &page,
        &mut browser,
        "document.querySelector('.compare-table button.unpin').click()",
    );
    page.wait_for(
        &mut browser,
        "!location.search.includes('pin4=')",
        Duration::from_secs(5),
    )
    .unwrap_or_else(|e| panic!("removing a pin did not reach the link: {e}"));
    assert_eq!(
        eval(&page, &mut browser, "document.getElementById('notices').textContent"),
        ""
    );
    let errors = page_errors(&browser, &page);
    assert!(errors.is_empty(), "console errors:\n{}", errors.join("\n"));
}
