//! Every page at 360 px (a small phone): the page never scrolls sideways (wide
//! content, display equations and tables, scrolls inside its own box), no two
//! diagram labels overlap and none runs outside its drawing, and the result box
//! that sticks to the top takes at most a quarter of the screen. The result box
//! folds while the reader scrolls down and opens on scrolling back or a tap; a
//! table wider than its box shows that it scrolls; what the unit switch reported
//! is gone at the next edit. Every control a finger uses is tall enough to hit.

use std::time::Duration;

use serde_json::{json, Value};

use crate::cdp::{Browser, Launch, Page};
use crate::harness::{fixture, launched, one_at_a_time, page_errors, pin_a_case, wait_for_whole_note};

const PHONE_WIDTH: u32 = 360;
const PHONE_HEIGHT: u32 = 740;

/// Diagram labels (SVG text) that overlap another label or run outside their
/// drawing, measured as drawn (bounding boxes, half a pixel of slack).
const LABEL_PROBLEMS: &str = r#"JSON.stringify([...document.querySelectorAll('svg.diagram')].flatMap((svg, d) => {
  const box = svg.getBoundingClientRect();
  const labels = [...svg.querySelectorAll('text')]
    .filter((t) => t.getClientRects().length > 0 && t.textContent.trim() !== '')
    .map((t) => ({ text: t.textContent.trim().slice(0, 40), r: t.getBoundingClientRect() }));
  const out = [];
  for (const { text, r } of labels) {
    if (r.left < box.left - 0.5 || r.right > box.right + 0.5 || r.top < box.top - 0.5 || r.bottom > box.bottom + 0.5)
      out.push(`diagram ${d}: "${text}" runs outside the drawing`);
  }
  for (let i = 0; i < labels.length; i++) for (let j = i + 1; j < labels.length; j++) {
    const a = labels[i].r, b = labels[j].r;
    const w = Math.min(a.right, b.right) - Math.max(a.left, b.left);
    const h = Math.min(a.bottom, b.bottom) - Math.max(a.top, b.top);
    if (w > 0.5 && h > 0.5) out.push(`diagram ${d}: "${labels[i].text}" overlaps "${labels[j].text}" (${w.toFixed(1)} × ${h.toFixed(1)} px)`);
  }
  return out;
}))"#;

/// The result box's height and the viewport's.
const HEADLINE_HEIGHT: &str =
    "JSON.stringify([document.querySelector('.headline').getBoundingClientRect().height, innerHeight])";

fn eval(page: &Page, browser: &mut Browser, expression: &str) -> Value {
    page.eval(browser, expression).unwrap_or_else(|e| panic!("{e}"))
}

/// The list a probe returns as JSON text (`JSON.stringify([...])`); empty when it
/// returns something else.
fn eval_list<T: serde::de::DeserializeOwned>(page: &Page, browser: &mut Browser, expression: &str) -> Vec<T> {
    serde_json::from_str(eval(page, browser, expression).as_str().unwrap_or("[]")).unwrap_or_default()
}

fn phone() -> (Browser, Page) {
    let (mut browser, page) = launched(Launch {
        width: PHONE_WIDTH,
        height: PHONE_HEIGHT,
    });
    page.call(
        &mut browser,
        "Emulation.setDeviceMetricsOverride",
        json!({ "width": PHONE_WIDTH, "height": PHONE_HEIGHT, "deviceScaleFactor": 1, "mobile": true }),
    )
    .unwrap_or_else(|e| panic!("{e}"));
    (browser, page)
}

fn open(page: &Page, browser: &mut Browser, url: &str) {
    page.goto(browser, url).unwrap_or_else(|e| panic!("{url}: {e}"));
    let state = page.wait_rendered(browser).unwrap_or_else(|e| panic!("{url}: {e}"));
    assert_eq!(state, "ready", "{url}: the page did not compute");
}

/// Scrolls the window to `y` in steps of 40 px, a frame apart, as a finger would.
fn scroll_to(page: &Page, browser: &mut Browser, y: i64) {
    let from = eval(page, browser, "Math.round(scrollY)").as_i64().unwrap_or(0);
    let steps = ((y - from).abs() / 40).max(1);
    for i in 1..=steps {
        let at = from + (y - from) * i / steps;
        eval(page, browser, &format!("window.scrollTo(0, {at})"));
        browser
            .pump(Duration::from_millis(30))
            .unwrap_or_else(|e| panic!("{e}"));
    }
    browser
        .pump(Duration::from_millis(150))
        .unwrap_or_else(|e| panic!("{e}"));
}

fn folded(page: &Page, browser: &mut Browser) -> bool {
    eval(
        page,
        browser,
        "document.querySelector('.headline').hasAttribute('data-folded')",
    ) == json!(true)
}

#[test]
fn no_page_scrolls_sideways_at_360_px() {
    let _turn = one_at_a_time();
    let site = fixture();
    let mut pages = vec!["index.html".to_string(), "verify.html".to_string()];
    pages.extend(
        fluxledger_core::calculators::CALCULATORS
            .iter()
            .map(|c| format!("{}.html", c.key)),
    );
    let (mut browser, page) = launched(Launch {
        width: PHONE_WIDTH,
        height: 800,
    });
    page.call(
        &mut browser,
        "Emulation.setDeviceMetricsOverride",
        json!({ "width": PHONE_WIDTH, "height": 800, "deviceScaleFactor": 1, "mobile": true }),
    )
    .unwrap_or_else(|e| panic!("{e}"));
    let mut problems = Vec::new();
    for name in &pages {
        page.goto(&mut browser, &format!("{}/{name}", site.base))
            .unwrap_or_else(|e| panic!("{name}: {e}"));
        // Calculator pages and the verification page mark when they are filled in.
        if name != "index.html" {
            page.wait_for(&mut browser, "document.body.dataset.state", Duration::from_secs(180))
                .unwrap_or_else(|e| panic!("{name}: {e}"));
        }
        let measured = page
            .eval(
                &mut browser,
                concat!(
                    "JSON.stringify({ scroll: document.documentElement.scrollWidth, inner: innerWidth, ",
                    "wide: [...document.querySelectorAll('body *')].filter(e => e.getBoundingClientRect().right > document.documentElement.clientWidth + 0.5)",
                    ".filter(e => !e.parentElement.closest('.table-scroll, math[display=block], .case-checks'))",
                    ".slice(0, 5).map(e => e.tagName.toLowerCase() + (e.className && typeof e.className === 'string' ? '.' + e.className : '') ",
                    "+ ' ' + Math.round(e.getBoundingClientRect().right) + 'px') })"
                ),
            )
            .unwrap_or_else(|e| panic!("{name}: {e}"));
        if name != "index.html" && name != "verify.html" {
            let labels: Vec<String> = eval_list(&page, &mut browser, LABEL_PROBLEMS);
            problems.extend(labels.into_iter().map(|l| format!("{name}: {l}")));
            let heights = page
                .eval(&mut browser, HEADLINE_HEIGHT)
                .unwrap_or_else(|e| panic!("{name}: {e}"));
            let heights: [f64; 2] = serde_json::from_str(heights.as_str().unwrap_or("[0,0]")).unwrap_or([0.0; 2]);
            if heights[0] > heights[1] / 4.0 + 0.5 {
                problems.push(format!(
                    "{name}: the result box is {} px high on a {} px screen (at most a quarter)",
                    heights[0], heights[1]
                ));
            }
        }
        let measured: serde_json::Value =
            serde_json::from_str(measured.as_str().unwrap_or("{}")).unwrap_or_else(|e| panic!("{name}: {e}"));
        let (scroll, inner) = (
            measured["scroll"].as_u64().unwrap_or(0),
            measured["inner"].as_u64().unwrap_or(0),
        );
        // On a phone a page wider than the screen is zoomed out to fit, which
        // widens `innerWidth`: both must stay at the screen's width.
        let width = u64::from(PHONE_WIDTH);
        if scroll > width || inner > width {
            problems.push(format!(
                "{name}: scrollWidth {scroll} px, innerWidth {inner} px on a {width} px screen; wide: {}",
                measured["wide"]
            ));
        }
    }
    let errors = page_errors(&browser, &page);
    assert!(errors.is_empty(), "console errors:\n{}", errors.join("\n"));
    assert!(
        problems.is_empty(),
        "pages that scroll sideways, or whose labels overlap, at {PHONE_WIDTH} px:\n{}",
        problems.join("\n")
    );
}

#[test]
fn the_result_box_folds_while_scrolling_down_and_opens_again() {
    let _turn = one_at_a_time();
    let site = fixture();
    let (mut browser, page) = phone();
    open(&page, &mut browser, &format!("{}/bend.html", site.base));
    assert!(!folded(&page, &mut browser), "folded before any scrolling");

    // Down through the inputs: the box sticks at the top, folded to its first line.
    scroll_to(&page, &mut browser, 700);
    let top = eval(
        &page,
        &mut browser,
        "document.querySelector('.headline').getBoundingClientRect().top",
    );
    assert!(
        top.as_f64().is_some_and(|t| t.abs() < 1.0),
        "not stuck at the top: {top}"
    );
    assert!(folded(&page, &mut browser), "not folded while scrolling down");
    // What lies under the folded part is what scrolled under it, not the box: a
    // point 20 px below the fold hits the inputs.
    let under = eval(
        &page,
        &mut browser,
        "(() => { const h = document.querySelector('.headline');          const fold = parseFloat(h.style.getPropertyValue('--folded-height'));          const r = h.getBoundingClientRect();          if (!(fold > 0 && fold + 20 < r.height)) return 'fold ' + fold + ' of ' + r.height;          return h.contains(document.elementFromPoint(r.left + r.width / 2, r.top + fold + 20)) ? 'box' : 'under'; })()",
    );
    assert_eq!(under, json!("under"), "below the fold");
    // The first line stays: the first headline value is drawn above the fold.
    let first_visible = eval(
        &page,
        &mut browser,
        "(() => { const h = document.querySelector('.headline'); const dd = h.querySelector('dd');          const r = dd.getBoundingClientRect(); const hit = document.elementFromPoint(r.left + 2, (r.top + r.bottom) / 2);          return hit === dd || dd.contains(hit); })()",
    );
    assert_eq!(first_visible, json!(true), "the first value is hidden when folded");

    // Back up a little: it opens.
    scroll_to(&page, &mut browser, 600);
    assert!(!folded(&page, &mut browser), "still folded after scrolling back up");
    // Down again, then a tap opens it.
    scroll_to(&page, &mut browser, 900);
    assert!(folded(&page, &mut browser), "not folded on scrolling down again");
    eval(&page, &mut browser, "document.querySelector('.headline').click()");
    browser
        .pump(Duration::from_millis(100))
        .unwrap_or_else(|e| panic!("{e}"));
    assert!(!folded(&page, &mut browser), "a tap did not open it");
    // Down again, then the keyboard's focus opens it (it takes the focus: it
    // scrolls when its values outgrow a quarter of the screen).
    eval(&page, &mut browser, "document.querySelector('.headline').blur()");
    scroll_to(&page, &mut browser, 1300);
    assert!(folded(&page, &mut browser), "not folded on scrolling down once more");
    eval(&page, &mut browser, "document.querySelector('.headline').focus()");
    browser
        .pump(Duration::from_millis(100))
        .unwrap_or_else(|e| panic!("{e}"));
    assert!(!folded(&page, &mut browser), "the keyboard's focus did not open it");

    let errors = page_errors(&browser, &page);
    assert!(errors.is_empty(), "console errors:\n{}", errors.join("\n"));
}

#[test]
fn a_table_wider_than_its_box_shows_that_it_scrolls() {
    let _turn = one_at_a_time();
    let site = fixture();
    let (mut browser, page) = phone();
    open(&page, &mut browser, &format!("{}/bend.html", site.base));
    // A pinned case adds the comparison's table, drawn again at every edit.
    pin_a_case(&page, &mut browser).unwrap_or_else(|e| panic!("{e}"));
    browser
        .pump(Duration::from_millis(200))
        .unwrap_or_else(|e| panic!("{e}"));
    // Each table, read once it has been scrolled into view and painted (off screen a
    // table is not laid out, so its cue waits for the frame that shows it):
    // [key, wider than its box, marked, hint shown, faded edge].
    let tables = "(async () => { const rows = [];       for (const p of document.querySelectorAll('.panel-table, .compare-panel')) {         p.scrollIntoView();         await new Promise((r) => requestAnimationFrame(() => requestAnimationFrame(r)));         const box = p.querySelector('.table-scroll');         rows.push([p.querySelector('table').dataset.table ?? 'comparison', box.scrollWidth > box.clientWidth + 1,           p.hasAttribute('data-overflows'),           getComputedStyle(p.querySelector('.table-actions'), '::before').content.includes('Scroll'),           getComputedStyle(box).maskImage !== 'none']);       }       return JSON.stringify(rows); })()";
    let rows: Vec<(String, bool, bool, bool, bool)> = eval_list(&page, &mut browser, tables);
    assert!(rows.iter().any(|r| r.1), "no table is wider than a phone: {rows:?}");
    assert!(rows.iter().any(|r| !r.1), "every table is wider than a phone: {rows:?}");
    assert!(
        rows.iter().any(|r| r.0 == "comparison" && r.1),
        "the comparison is not wider than a phone: {rows:?}"
    );
    for (key, wide, marked, hint, faded) in &rows {
        assert_eq!((marked, hint, faded), (wide, wide, wide), "table {key}: wide {wide}");
    }
    // Scrolled to its end, a wide table's edge no longer fades.
    let wide = rows.iter().find(|r| r.1).map(|r| r.0.clone()).unwrap_or_default();
    eval(
        &page,
        &mut browser,
        &format!("(() => {{ const b = document.querySelector('table[data-table=\"{wide}\"]').closest('.table-scroll'); b.scrollLeft = b.scrollWidth; }})()"),
    );
    page.wait_for(
        &mut browser,
        &format!("getComputedStyle(document.querySelector('table[data-table=\"{wide}\"]').closest('.table-scroll')).maskImage === 'none'"),
        Duration::from_secs(5),
    )
    .unwrap_or_else(|e| panic!("the edge still fades at the end of table {wide}: {e}"));
    let errors = page_errors(&browser, &page);
    assert!(errors.is_empty(), "console errors:\n{}", errors.join("\n"));
}

#[test]
fn what_the_unit_switch_reported_is_gone_at_the_next_edit() {
    let _turn = one_at_a_time();
    let site = fixture();
    let (mut browser, page) = launched(Launch::default());
    open(&page, &mut browser, &format!("{}/bend.html", site.base));
    eval(
        &page,
        &mut browser,
        "document.querySelector('input[name=unit-system][value=us]').click()",
    );
    page.wait_for(
        &mut browser,
        "document.querySelector('.system-status').textContent.includes('converted')",
        Duration::from_secs(5),
    )
    .unwrap_or_else(|e| panic!("the switch reported nothing: {e}"));
    eval(
        &page,
        &mut browser,
        "(() => { const i = document.getElementById('field-p'); i.focus(); i.select(); })()",
    );
    page.call(&mut browser, "Input.insertText", json!({ "text": "150" }))
        .unwrap_or_else(|e| panic!("{e}"));
    page.wait_for(
        &mut browser,
        "new URLSearchParams(location.search).get('p') === '150psi'",
        Duration::from_secs(5),
    )
    .unwrap_or_else(|e| panic!("the edit did not reach the link: {e}"));
    assert_eq!(
        eval(
            &page,
            &mut browser,
            "document.querySelector('.system-status').textContent"
        ),
        json!(""),
        "the report of the switch outlived the next edit"
    );
    let errors = page_errors(&browser, &page);
    assert!(errors.is_empty(), "console errors:\n{}", errors.join("\n"));
}

/// Controls shorter than a fingertip at 360 px: every visible button, field,
/// selector and disclosure must be at least 44 CSS px tall (WCAG 2.2, success
/// criterion 2.5.5 Target Size (Enhanced): 44 × 44 CSS px), except the small
/// "remove this pinned case" crosses in the comparison's header row, which must be
/// at least 24 × 24 (criterion 2.5.8 Target Size (Minimum)). Elements drawn 1 px
/// wide or less are visually hidden (the unit switch's radios take their labels'
/// box). Links in running text are not controls here.
const SMALL_CONTROLS: &str = r#"JSON.stringify([...document.querySelectorAll('button, input, select, textarea, summary')]
  .filter((e) => e.getClientRects().length > 0 && e.getBoundingClientRect().width > 1)
  .flatMap((e) => {
    const r = e.getBoundingClientRect();
    const small = e.classList.contains('unpin');
    const [w, h] = small ? [24, 24] : [0, 44];
    if (r.width + 0.5 >= w && r.height + 0.5 >= h) return [];
    const name = e.tagName.toLowerCase() + (e.id ? '#' + e.id : '') + (e.className ? '.' + String(e.className).replace(/ +/g, '.') : '');
    return [`${name} "${(e.textContent || e.value || '').trim().slice(0, 30)}" ${r.width.toFixed(0)} × ${r.height.toFixed(1)} px`];
  }))"#;

#[test]
fn every_control_is_a_finger_high_at_360_px() {
    let _turn = one_at_a_time();
    let site = fixture();
    let (mut browser, page) = phone();
    let mut problems = Vec::new();
    for calculator in fluxledger_core::calculators::CALCULATORS {
        let url = format!("{}/{}.html", site.base, calculator.key);
        open(&page, &mut browser, &url);
        // A pinned case shows the comparison's table, its crosses and its download;
        // the calculation sheet's fields show when its panel is open.
        pin_a_case(&page, &mut browser).unwrap_or_else(|e| panic!("{url}: {e}"));
        eval(
            &page,
            &mut browser,
            "document.querySelectorAll('details').forEach((d) => { d.open = true; })",
        );
        browser
            .pump(Duration::from_millis(100))
            .unwrap_or_else(|e| panic!("{e}"));
        let small: Vec<String> = eval_list(&page, &mut browser, SMALL_CONTROLS);
        problems.extend(small.into_iter().map(|s| format!("{}: {s}", calculator.key)));
    }
    assert!(
        problems.is_empty(),
        "controls too small to hit:\n{}",
        problems.join("\n")
    );
    let errors = page_errors(&browser, &page);
    assert!(errors.is_empty(), "console errors:\n{}", errors.join("\n"));
}

/// Regions a keyboard cannot scroll, and names that do not hold their visible
/// text. A box that scrolls (overflow `auto` or `scroll` with more content than
/// room, either way) must take the focus or hold something that does, so it can
/// be scrolled without a pointer (WCAG 2.2 SC 2.1.1 Keyboard); a control named by
/// `aria-label` (a button, link or disclosure) must hold its visible text in that
/// name (SC 2.5.3 Label in Name).
const KEYBOARD_PROBLEMS: &str = r#"JSON.stringify((() => {
  const out = [];
  const focusable = 'a[href], button, input, select, textarea, summary, [tabindex]:not([tabindex="-1"])';
  const name = (e) => e.tagName.toLowerCase() + (e.id ? '#' + e.id : '') + (typeof e.className === 'string' && e.className ? '.' + e.className.trim().replace(/ +/g, '.') : '');
  for (const e of document.querySelectorAll('body *')) {
    if (e.getClientRects().length === 0) continue;
    const style = getComputedStyle(e);
    const scrolls = (o) => o === 'auto' || o === 'scroll';
    const sideways = scrolls(style.overflowX) && e.scrollWidth > e.clientWidth + 1;
    const down = scrolls(style.overflowY) && e.scrollHeight > e.clientHeight + 1;
    if ((sideways || down) && !(e.matches(focusable) || e.querySelector(focusable)))
      out.push(`${name(e)} scrolls ${sideways ? 'sideways' : 'down'} but takes no focus`);
    const label = e.matches('button, a[href], summary, [role=button], [role=link]') ? e.getAttribute('aria-label') : null;
    const text = (e.textContent || '').replace(/\s+/g, ' ').trim().toLowerCase();
    if (label && text && /^[a-z]/.test(text) && !label.toLowerCase().includes(text))
      out.push(`${name(e)} is named "${label}" but shows "${text}"`);
  }
  return out;
})())"#;

#[test]
fn every_scrolling_box_takes_the_keyboard_and_every_name_holds_its_text() {
    let _turn = one_at_a_time();
    let site = fixture();
    let (mut browser, page) = phone();
    let mut pages = vec!["index.html".to_string(), "verify.html".to_string()];
    for calculator in fluxledger_core::calculators::CALCULATORS {
        pages.push(format!("{}.html", calculator.key));
        pages.push(format!("{}-method.html", calculator.key));
    }
    let mut problems = Vec::new();
    for name in &pages {
        let url = format!("{}/{name}", site.base);
        if name.ends_with("-method.html") || name == "index.html" {
            page.goto(&mut browser, &url).unwrap_or_else(|e| panic!("{url}: {e}"));
        } else if name == "verify.html" {
            // The verification page marks when it has run every case.
            page.goto(&mut browser, &url).unwrap_or_else(|e| panic!("{url}: {e}"));
            page.wait_for(&mut browser, "document.body.dataset.state", Duration::from_secs(180))
                .unwrap_or_else(|e| panic!("{url}: {e}"));
        } else {
            open(&page, &mut browser, &url);
            // A pinned case adds the comparison's table.
            pin_a_case(&page, &mut browser).unwrap_or_else(|e| panic!("{url}: {e}"));
            // The note's later sections come in idle time; the note is laid out
            // only near the screen (`content-visibility`), as a reader reaches it.
            wait_for_whole_note(&page, &mut browser).unwrap_or_else(|e| panic!("{url}: {e}"));
            eval(
                &page,
                &mut browser,
                "document.querySelector('.method-note').scrollIntoView()",
            );
        }
        browser
            .pump(Duration::from_millis(200))
            .unwrap_or_else(|e| panic!("{e}"));
        let found: Vec<String> = eval_list(&page, &mut browser, KEYBOARD_PROBLEMS);
        problems.extend(found.into_iter().map(|p| format!("{name}: {p}")));
    }
    assert!(
        problems.is_empty(),
        "{} problems:\n{}",
        problems.len(),
        problems.join("\n")
    );
    let errors = page_errors(&browser, &page);
    assert!(errors.is_empty(), "console errors:\n{}", errors.join("\n"));
}
