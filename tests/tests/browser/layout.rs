//! Every page at 360 px (a small phone): the page never scrolls sideways. Wide
//! content (display equations, tables) must scroll inside its own box.

use std::time::Duration;

use serde_json::json;

use crate::cdp::Launch;
use crate::harness::{fixture, launched, one_at_a_time, page_errors};

const PHONE_WIDTH: u32 = 360;

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
        "pages that scroll sideways at {PHONE_WIDTH} px:\n{}",
        problems.join("\n")
    );
}
