//! Fast edits: a keystroke after a quiet frame is solved at once and those that
//! follow it in the same frame once at the next frame, and the page updates
//! its parts in place; after a burst of edits the page shows exactly what the core
//! computes for the final URL (headline values, every table cell, a diagram's
//! restraint arrow, each value's full text in its title), and the table and the
//! diagram were updated, not rebuilt: the patched diagram's markup is exactly that
//! of a page opened with the final link.

use std::time::Duration;

use serde_json::Value;

use fluxledger_core::catalog::{demo_request, Shape, ShapeStyle, Solution};

use crate::cdp::{Browser, Launch, Page};
use crate::harness::{carried_query, fixture, launched, one_at_a_time, page_errors};

const OUTPUTS: &str =
    "JSON.stringify([...document.querySelectorAll('[data-output]')].map(e => [e.dataset.output, e.textContent]))";
/// Every value's full text, which it shows as its `title` once typing pauses.
const TITLES: &str =
    "JSON.stringify([...document.querySelectorAll('dd[data-output]')].map(e => [e.dataset.output, e.title]))";
const TABLES: &str = "JSON.stringify([...document.querySelectorAll('table.ledger')].map(t => [t.dataset.table, [...t.tBodies[0].rows].map(r => [...r.cells].map(c => c.textContent))]))";

/// Pressure and angle edits, some in the same frame, some a frame apart.
const BURST: &str = r#"(async () => {
  const frame = () => new Promise((r) => requestAnimationFrame(() => r()));
  const type = (id, value) => {
    const i = document.getElementById(id);
    i.value = value;
    i.dispatchEvent(new Event('input', { bubbles: true }));
  };
  const edits = [['field-p', '11'], ['field-p', '12'], ['field-angle', '30'], ['field-p', '13.5'],
    ['field-angle', '60'], ['field-p', '14'], ['field-angle', '75'], ['field-p', '17.5']];
  for (const [n, [id, value]] of edits.entries()) {
    type(id, value);
    if (n % 3 === 2) await frame();
  }
  return 'typed';
})()"#;

/// The markup of the diagram's figure.
const DIAGRAM_FIGURE: &str = "document.querySelector('svg.diagram').closest('figure').outerHTML";

/// The leading number of a shown text ("1.234 kN" -> "1.234", "45°" -> "45"),
/// empty for words.
fn leading_number(text: &str) -> String {
    text.chars()
        .take_while(|c| c.is_ascii_digit() || ".-+eE".contains(*c))
        .collect()
}

/// The core's solution of the bend page's demo with `overrides` typed over it.
fn core_bend(overrides: &[(&str, &str)]) -> Solution {
    let spec = fluxledger_core::calculators::spec("bend").expect("bend is registered");
    fluxledger_core::solve("bend", &demo_request(&spec, overrides))
        .result
        .unwrap_or_else(|e| panic!("{overrides:?} does not solve natively: {e:?}"))
}

/// The bend page on a phone-sized screen, rendered and ready for edits.
fn bend_page_ready() -> (Browser, Page) {
    let site = fixture();
    let (mut browser, page) = launched(Launch {
        width: 360,
        height: 740,
    });
    page.goto(&mut browser, &format!("{}/bend.html", site.base)).unwrap();
    assert_eq!(page.wait_rendered(&mut browser).unwrap(), "ready");
    (browser, page)
}

#[test]
fn after_fast_edits_the_page_equals_the_core_for_the_final_url() {
    let _turn = one_at_a_time();
    let (mut browser, page) = bend_page_ready();
    page.eval(
        &mut browser,
        "window.before = { svg: document.querySelector('svg.diagram'), table: document.querySelector('table.ledger') }",
    )
    .unwrap();
    let typed = page.eval(&mut browser, BURST).unwrap();
    assert_eq!(typed, "typed");
    page.wait_for(
        &mut browser,
        "new URLSearchParams(location.search).get('p') === '17.5bar' && new URLSearchParams(location.search).get('angle') === '75deg'",
        Duration::from_secs(5),
    )
    .unwrap_or_else(|e| panic!("the URL did not follow the last edits: {e}"));
    // Parts off screen are brought up to date in idle time.
    page.wait_for(
        &mut browser,
        "document.querySelector('[data-stale]') === null",
        Duration::from_secs(5),
    )
    .unwrap_or_else(|e| panic!("a part stayed stale: {e}"));
    assert_eq!(page.eval(&mut browser, "document.body.dataset.state").unwrap(), "ready");

    // The core's result for the page's final URL.
    let query = page
        .eval(
            &mut browser,
            "JSON.stringify([...new URLSearchParams(location.search)])",
        )
        .unwrap();
    let pairs: Vec<(String, String)> = serde_json::from_str(query.as_str().unwrap_or("[]")).unwrap();
    let system = pairs.iter().find(|(k, _)| k == "system").map(|(_, v)| v.as_str());
    assert!(matches!(system, None | Some("si")), "the page stays in SI: {pairs:?}");
    let overrides: Vec<(&str, &str)> = pairs
        .iter()
        .filter(|(k, _)| k != "system")
        .map(|(k, v)| (k.as_str(), v.as_str()))
        .collect();
    let solution = core_bend(&overrides);

    // Headline and other outputs: the core's numbers.
    let shown: Vec<(String, String)> =
        serde_json::from_str(page.eval(&mut browser, OUTPUTS).unwrap().as_str().unwrap_or("[]")).unwrap();
    assert!(!shown.is_empty(), "no output on the page");
    for (key, text) in &shown {
        let core = solution
            .output(key)
            .unwrap_or_else(|| panic!("the page shows an output '{key}' the core does not give"));
        assert_eq!(
            leading_number(text),
            leading_number(&core.text),
            "output {key}: page {text:?}, core {:?}",
            core.text
        );
    }

    // Every value's title: the core's full text. It is written once typing pauses,
    // so the demo's or an earlier keystroke's title would differ.
    let keys: Vec<(String, String)> =
        serde_json::from_str(page.eval(&mut browser, TITLES).unwrap().as_str().unwrap_or("[]")).unwrap();
    assert!(!keys.is_empty(), "no value on the page");
    let expected: Vec<(String, String)> = keys
        .iter()
        .map(|(key, _)| (key.clone(), solution.output(key).expect("checked above").text.clone()))
        .collect();
    let expected_json = serde_json::to_string(&expected).unwrap();
    let settled = page.wait_for(
        &mut browser,
        &format!("{TITLES} === {}", serde_json::to_string(&expected_json).unwrap()),
        Duration::from_secs(5),
    );
    let titles: Vec<(String, String)> =
        serde_json::from_str(page.eval(&mut browser, TITLES).unwrap().as_str().unwrap_or("[]")).unwrap();
    assert!(
        settled.is_ok(),
        "the values' titles are not the core's full texts: page {titles:?}, core {expected:?}"
    );

    // Every table cell: the core's text (its number, as units are shown prettier).
    let tables: Vec<(String, Vec<Vec<String>>)> =
        serde_json::from_str(page.eval(&mut browser, TABLES).unwrap().as_str().unwrap_or("[]")).unwrap();
    assert_eq!(
        tables.len(),
        solution.tables.len(),
        "the page's tables are not the core's"
    );
    let mut numbers_compared = 0;
    for ((key, rows), core) in tables.iter().zip(&solution.tables) {
        assert_eq!(key, core.key);
        assert_eq!(rows.len(), core.rows.len(), "table {key}: rows");
        for (r, (row, core_row)) in rows.iter().zip(&core.rows).enumerate() {
            assert_eq!(row.len(), core_row.len(), "table {key} row {r}: cells");
            for (c, (cell, core_cell)) in row.iter().zip(core_row).enumerate() {
                assert_eq!(
                    leading_number(cell),
                    leading_number(core_cell),
                    "table {key} row {r} column {c}: page {cell:?}, core {core_cell:?}"
                );
                numbers_compared += usize::from(!leading_number(core_cell).is_empty());
            }
        }
    }
    assert!(numbers_compared > 0, "no numeric table cell was compared");

    // The diagram's restraint arrow ends where the core's does (SVG y is down).
    let arrow = solution.diagrams[0]
        .shapes
        .iter()
        .find_map(|s| match s {
            Shape::Arrow {
                to,
                style: ShapeStyle::Restraint,
                ..
            } => Some(*to),
            _ => None,
        })
        .expect("the core draws a restraint arrow");
    let drawn = page
        .eval(
            &mut browser,
            "(() => { const l = document.querySelector('svg.diagram line.arrow.s-restraint'); return l ? [l.getAttribute('x2'), l.getAttribute('y2')] : null; })()",
        )
        .unwrap();
    let drawn: Vec<f64> = drawn
        .as_array()
        .unwrap_or_else(|| panic!("no restraint arrow drawn"))
        .iter()
        .map(|v| v.as_str().and_then(|t| t.parse().ok()).unwrap_or(f64::NAN))
        .collect();
    assert_eq!(
        drawn,
        vec![arrow[0], -arrow[1]],
        "the drawn restraint arrow is not the core's"
    );

    // Updated in place: the same table and the same drawing as before the edits.
    assert_eq!(
        page.eval(
            &mut browser,
            "[window.before.svg === document.querySelector('svg.diagram'), window.before.table === document.querySelector('table.ledger')]"
        )
        .unwrap(),
        Value::from(vec![true, true]),
        "the diagram or the table was rebuilt for an edit that keeps its structure"
    );
    // Patched attribute by attribute, the drawing is exactly the one a page opened
    // with the final link draws from scratch.
    let patched = page.eval(&mut browser, DIAGRAM_FIGURE).unwrap();
    let link = page.eval(&mut browser, "location.href").unwrap();
    page.goto(&mut browser, link.as_str().unwrap_or_default()).unwrap();
    assert_eq!(page.wait_rendered(&mut browser).unwrap(), "ready");
    let drawn = page.eval(&mut browser, DIAGRAM_FIGURE).unwrap();
    assert!(
        patched.as_str().is_some_and(|s| s.contains("<svg")),
        "no diagram figure: {patched}"
    );
    assert_eq!(
        patched, drawn,
        "the patched diagram differs from the one a page opened with the same link draws"
    );
    let errors = page_errors(&browser, &page);
    assert!(errors.is_empty(), "console errors:\n{}", errors.join("\n"));
}

/// Two keystrokes in one frame after quiet frames: the headline right after each,
/// and after the next frame.
const TWO_IN_ONE_FRAME: &str = r#"(async () => {
  const frame = () => new Promise((r) => requestAnimationFrame(() => r()));
  await frame();
  await frame();
  const value = document.querySelector('.headline dd[data-output]');
  const type = (text) => {
    const input = document.getElementById('field-p');
    input.value = text;
    input.dispatchEvent(new Event('input', { bubbles: true }));
    return value.textContent;
  };
  const before = value.textContent;
  const first = type('20');
  const second = type('30');
  await frame();
  return JSON.stringify({ key: value.dataset.output, before, first, second, next: value.textContent });
})()"#;

/// The first keystroke after a quiet frame is shown without waiting for a frame
/// (its result is painted in the next one); a second keystroke in that frame waits
/// for the next frame, which shows the latest inputs' result. Each shown value is
/// the core's for the inputs typed by then.
#[test]
fn a_keystroke_after_a_quiet_frame_is_solved_at_once_and_the_next_one_at_the_next_frame() {
    let _turn = one_at_a_time();
    let (mut browser, page) = bend_page_ready();
    let shown = page.eval(&mut browser, TWO_IN_ONE_FRAME).unwrap();
    let shown: Value = serde_json::from_str(shown.as_str().unwrap_or("null")).unwrap();
    let text = |name: &str| shown[name].as_str().unwrap_or_default().to_string();
    let key = text("key");
    let core_text = |pressure: &str| {
        core_bend(&[("p", pressure)])
            .output(&key)
            .unwrap_or_else(|| panic!("the core gives no output '{key}'"))
            .text
            .clone()
    };
    let (at_20, at_30) = (core_text("20bar"), core_text("30bar"));
    assert_ne!(
        leading_number(&at_20),
        leading_number(&at_30),
        "the two pressures must differ in {key}"
    );
    assert_ne!(
        text("before"),
        text("first"),
        "the first keystroke was not shown at once: {shown}"
    );
    assert_eq!(
        leading_number(&text("first")),
        leading_number(&at_20),
        "first keystroke: {shown}"
    );
    assert_eq!(
        text("second"),
        text("first"),
        "the second keystroke in the same frame was solved at once: {shown}"
    );
    assert_eq!(
        leading_number(&text("next")),
        leading_number(&at_30),
        "after the frame: {shown}"
    );
    let errors = page_errors(&browser, &page);
    assert!(errors.is_empty(), "console errors:\n{}", errors.join("\n"));
}

/// Types a pressure and, in the same task, clicks the carry-over link far below the
/// screen (whose update waits for it to come into view), reading the link's address
/// as the click's default action would follow it.
const CLICK_WAITING_LINK: &str = r#"(() => {
  const link = document.querySelector('a.carry-link');
  const below = link.getBoundingClientRect().top - window.innerHeight;
  let followed = null;
  window.addEventListener('click', (event) => {
    if (event.target.closest('a.carry-link')) {
      event.preventDefault();
      followed = event.target.closest('a.carry-link').href;
    }
  });
  const input = document.getElementById('field-p');
  input.value = '20';
  input.dispatchEvent(new Event('input', { bubbles: true }));
  const waited = link.closest('[data-stale]') !== null;
  link.click();
  return JSON.stringify({ below, waited, followed, params: [...new URL(followed).searchParams] });
})()"#;

/// The links to a next calculator wait off screen like the tables (a keystroke does
/// not write them), and one clicked while it waits is brought up to date first: it
/// carries exactly the core's inputs for the value just typed.
#[test]
fn a_waiting_link_clicked_right_after_a_keystroke_carries_that_keystrokes_inputs() {
    let _turn = one_at_a_time();
    let (mut browser, page) = bend_page_ready();
    let clicked = page.eval(&mut browser, CLICK_WAITING_LINK).unwrap();
    let clicked: Value = serde_json::from_str(clicked.as_str().unwrap_or("null")).unwrap();
    assert!(
        clicked["below"].as_f64().unwrap_or(0.0) > 200.0,
        "the link must start far below the screen: {clicked}"
    );
    assert_eq!(
        clicked["waited"],
        Value::Bool(true),
        "the keystroke wrote the link off screen: {clicked}"
    );
    let solution = core_bend(&[("p", "20bar")]);
    let carry = solution.carry_over.first().expect("the bend carries its thrust on");
    let mut followed: Vec<(String, String)> = serde_json::from_value(clicked["params"].clone()).unwrap_or_default();
    followed.sort();
    assert_eq!(followed, carried_query(carry, "si"), "the link followed: {clicked}");
    let errors = page_errors(&browser, &page);
    assert!(errors.is_empty(), "console errors:\n{}", errors.join("\n"));
}
