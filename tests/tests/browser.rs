//! Browser tests: the built site in a real headless Chromium.
//!
//! The site is built once per test process (through the `fluxledger-site` library,
//! exactly as `cargo run -p fluxledger-site -- build` does) into a temporary folder
//! and served on a loopback port. Each test starts its own Chromium with a fresh
//! profile and drives it over the DevTools protocol ([`cdp`]); the tests take turns
//! (one browser at a time: the machine has two cores).
//!
//! Every test also fails on any console error, uncaught exception or error-level log
//! entry of the page or its service worker, and on any dialog.
//!
//! Chromium is required: when `/usr/bin/chromium` is missing these tests fail and
//! name the install command. They are not skipped.
//!
//! Load size and timing figures are measurements, not tests: they are printed by
//! `cargo bench -p fluxledger-tests --bench pages` (`benches/pages.rs`).

#[path = "browser/cdp.rs"]
mod cdp;
#[path = "browser/fast_edits.rs"]
mod fast_edits;
#[path = "browser/harness.rs"]
mod harness;
#[path = "browser/layout.rs"]
mod layout;
#[path = "browser/links.rs"]
mod links;
#[path = "browser/pages.rs"]
mod pages;
#[path = "browser/prerender.rs"]
mod prerender;
#[path = "browser/sheet.rs"]
mod sheet;
#[path = "browser/verify.rs"]
mod verify;

use std::time::Duration;

use serde_json::Value;

use cdp::Launch;
use harness::{fixture, launched, one_at_a_time, page_errors, query_string};

// ---------------------------------------------------------------------------------
// A sourced reference case, opened by URL: the page shows the published value.
mod reference_by_url {
    use super::*;
    use fluxledger_core::units::QuantityKind;
    use fluxledger_tests::{load_cases, output_kinds, parse_difference, parse_typed, reference_dir, Target, Tolerance};

    /// The page shows four significant figures: allow half a unit in the fourth
    /// figure on top of the case's own tolerance.
    const DISPLAY_ROUNDING: f64 = 5e-4;

    #[test]
    fn bend_reference_case_opened_by_url_shows_the_published_force() {
        let _turn = one_at_a_time();
        let site = fixture();
        let (cases, errors) = load_cases(&reference_dir());
        assert!(errors.is_empty(), "reference files that do not load: {errors:#?}");
        let bend_cases: Vec<_> = cases
            .iter()
            .filter(|c| c.target == Target::Calculator("bend".into()))
            .filter(|c| c.expect_error.is_none() && !c.expected.is_empty() && c.units.is_empty())
            .collect();
        assert!(
            !bend_cases.is_empty(),
            "no bend reference case (calculator = \"bend\", with expected values and no `units` table) in {}",
            reference_dir().display()
        );
        let kinds = output_kinds(&Target::Calculator("bend".into())).expect("bend outputs");

        let (mut browser, page) = launched(Launch {
            width: 1280,
            height: 900,
        });
        let mut failures = Vec::new();
        for case in &bend_cases {
            let mut params: Vec<(String, String)> = case.inputs.iter().map(|(k, v)| (k.clone(), v.clone())).collect();
            params.push(("system".into(), case.system.key().into()));
            let url = format!("{}/bend.html?{}", site.base, query_string(&params));
            page.goto(&mut browser, &url).unwrap_or_else(|e| panic!("{e}"));
            let state = page.wait_rendered(&mut browser).unwrap_or_else(|e| panic!("{e}"));
            let notices = page
                .eval(&mut browser, "document.getElementById('notices').textContent")
                .unwrap();
            if state != "ready" || notices.as_str().is_some_and(|n| !n.is_empty()) {
                failures.push(format!("{}: page state {state:?}, notices {notices}", case.name()));
                continue;
            }
            for expected in &case.expected {
                let Some(&kind) = kinds.get(&expected.output) else {
                    failures.push(format!("{}: no output '{}'", case.name(), expected.output));
                    continue;
                };
                let shown = page
                    .eval(
                        &mut browser,
                        &format!(
                            "document.querySelector('[data-output=\"{}\"]')?.textContent ?? null",
                            expected.output
                        ),
                    )
                    .unwrap();
                let Some(shown) = shown.as_str() else {
                    failures.push(format!("{}: output '{}' not on the page", case.name(), expected.output));
                    continue;
                };
                let actual = parse_typed(shown, kind).unwrap_or_else(|e| panic!("page text {shown:?}: {e}"));
                let wanted = parse_typed(&expected.value, kind).unwrap();
                let allowed = tolerance(&expected.tolerance, wanted, kind) + DISPLAY_ROUNDING * wanted.abs();
                if (actual - wanted).abs() > allowed {
                    failures.push(format!(
                        "{}\n  source:   {}\n  output:   {}\n  expected: {} (±{allowed:e} SI)\n  shown:    {shown}\n  url:      {url}",
                        case.name(),
                        case.source,
                        expected.output,
                        expected.value
                    ));
                }
            }
        }
        let errors = page_errors(&browser, &page);
        assert!(errors.is_empty(), "console errors:\n{}", errors.join("\n"));
        assert!(
            failures.is_empty(),
            "\n{}\n{}\n{}",
            "─".repeat(60),
            failures.join("\n"),
            "─".repeat(60)
        );
    }

    fn tolerance(tolerance: &Tolerance, wanted: f64, kind: QuantityKind) -> f64 {
        match tolerance {
            Tolerance::Relative(rel) => rel * wanted.abs(),
            Tolerance::Absolute(text) => {
                parse_difference(text, kind).unwrap_or_else(|e| panic!("tolerance {text}: {e}"))
            }
        }
    }
}

// ---------------------------------------------------------------------------------
// Editing a field recomputes and rewrites the URL; a reload restores the same state.
mod url_state {
    use super::*;

    const OUTPUTS: &str = "JSON.stringify(Object.fromEntries([...document.querySelectorAll('[data-output]')].map(e => [e.dataset.output, e.textContent])))";

    #[test]
    fn editing_updates_result_and_url_and_reload_restores_it() {
        let _turn = one_at_a_time();
        let site = fixture();
        let (mut browser, page) = launched(Launch {
            width: 360,
            height: 800,
        });
        page.goto(&mut browser, &format!("{}/bend.html", site.base)).unwrap();
        assert_eq!(page.wait_rendered(&mut browser).unwrap(), "ready");
        let before = page.eval(&mut browser, OUTPUTS).unwrap();
        let unit = page
            .eval(
                &mut browser,
                "document.querySelector('[data-field=p] select.unit').value",
            )
            .unwrap();
        assert_eq!(
            unit, "bar",
            "the demo pressure is typed in bar, so the selector shows bar"
        );

        // Type a new pressure with real key input: select the field's text, insert.
        page.eval(
            &mut browser,
            "(() => { const i = document.getElementById('field-p'); i.focus(); i.select(); })()",
        )
        .unwrap();
        page.call(&mut browser, "Input.insertText", serde_json::json!({ "text": "16" }))
            .unwrap();
        page.wait_for(
            &mut browser,
            "new URLSearchParams(location.search).get('p') === '16bar'",
            Duration::from_secs(5),
        )
        .unwrap_or_else(|e| panic!("the URL did not follow the edit: {e}"));
        let after = page.eval(&mut browser, OUTPUTS).unwrap();
        assert_ne!(before, after, "the result did not change after editing the pressure");

        // A second kind of edit: the choice of plane.
        page.eval(
            &mut browser,
            "(() => { const s = document.getElementById('field-plane'); s.value = 'vertical_sag'; s.dispatchEvent(new Event('change', {bubbles: true})); })()",
        )
        .unwrap();
        page.wait_for(
            &mut browser,
            "location.search.includes('plane=vertical_sag')",
            Duration::from_secs(5),
        )
        .unwrap();

        // A field shown only for one choice: velocity appears, flow hides.
        let shown = "' ' + [...document.querySelectorAll('[data-field]')].filter(e => !e.hidden).map(e => e.dataset.field).join(' ') + ' '";
        let before_basis = page.eval(&mut browser, shown).unwrap();
        assert!(
            before_basis
                .as_str()
                .is_some_and(|f| f.contains(" q ") && !f.contains(" v ")),
            "{before_basis}"
        );
        page.eval(
            &mut browser,
            "(() => { const s = document.getElementById('field-flow_given'); s.value = 'v'; s.dispatchEvent(new Event('change', {bubbles: true})); })()",
        )
        .unwrap();
        let after_basis = page.eval(&mut browser, shown).unwrap();
        assert!(
            after_basis
                .as_str()
                .is_some_and(|f| f.contains(" v ") && !f.contains(" q ")),
            "{after_basis}"
        );
        let state = page.eval(&mut browser, "document.body.dataset.state").unwrap();
        let error = page
            .eval(&mut browser, "document.querySelector('[data-error-for=v]').textContent")
            .unwrap();
        assert_eq!(state, "error", "an empty required velocity is an error");
        assert!(
            error.as_str().is_some_and(|e| e.contains("required")),
            "error next to the field: {error}"
        );
        page.eval(
            &mut browser,
            "(() => { const i = document.getElementById('field-v'); i.focus(); i.select(); })()",
        )
        .unwrap();
        page.call(
            &mut browser,
            "Input.insertText",
            serde_json::json!({ "text": "2.5 m/s" }),
        )
        .unwrap();
        page.wait_for(
            &mut browser,
            "document.body.dataset.state === 'ready'",
            Duration::from_secs(5),
        )
        .unwrap();
        page.wait_for(
            &mut browser,
            "location.search.includes('v=2.5m/s')",
            Duration::from_secs(5),
        )
        .unwrap();

        // The page-level unit system: results in US customary units, kept in the URL.
        page.eval(
            &mut browser,
            "document.querySelector('input[name=unit-system][value=us]').click()",
        )
        .unwrap();
        page.wait_for(
            &mut browser,
            "location.search.includes('system=us')",
            Duration::from_secs(5),
        )
        .unwrap();
        let thrust = page
            .eval(
                &mut browser,
                "document.querySelector('[data-output=thrust]').textContent",
            )
            .unwrap();
        assert!(
            thrust.as_str().is_some_and(|t| t.ends_with(" lbf")),
            "thrust in US units: {thrust}"
        );

        // Copy link: the clipboard, or (where it is refused) a selected read-only field.
        page.eval(
            &mut browser,
            "[...document.querySelectorAll('button')].find(b => b.textContent === 'Copy link').click()",
        )
        .unwrap();
        page.wait_for(
            &mut browser,
            "document.querySelector('.copy-status').textContent !== ''",
            Duration::from_secs(5),
        )
        .unwrap();
        let copied = page
            .eval(
                &mut browser,
                "(() => { const f = document.querySelector('.copy-field'); return f.hidden ? document.querySelector('.copy-status').textContent : f.value === location.href; })()",
            )
            .unwrap();
        assert!(
            copied == Value::Bool(true) || copied == "Link copied.",
            "copy link: {copied}"
        );

        let edited = page.eval(&mut browser, OUTPUTS).unwrap();
        let url = page.eval(&mut browser, "location.href").unwrap();

        page.call(&mut browser, "Page.reload", serde_json::json!({})).unwrap();
        browser.pump(Duration::from_millis(200)).unwrap();
        page.wait_for(
            &mut browser,
            "document.readyState === 'complete'",
            Duration::from_secs(30),
        )
        .unwrap();
        assert_eq!(page.wait_rendered(&mut browser).unwrap(), "ready");
        assert_eq!(page.eval(&mut browser, "location.href").unwrap(), url);
        assert_eq!(
            page.eval(&mut browser, OUTPUTS).unwrap(),
            edited,
            "reload did not restore the same results"
        );
        // The switch to US customary converted the filled fields (16 bar = 232.06 psi,
        // 2.5 m/s = 8.2021 ft/s; derived from the unit definitions, NIST SP 811 App. B),
        // rounded to one figure more than typed, at least four.
        assert_eq!(
            page.eval(&mut browser, "document.getElementById('field-p').value")
                .unwrap(),
            "232.1"
        );
        assert_eq!(
            page.eval(&mut browser, "document.getElementById('field-plane').value")
                .unwrap(),
            "vertical_sag"
        );
        assert_eq!(
            page.eval(&mut browser, "document.getElementById('field-v').value")
                .unwrap(),
            "8.202"
        );
        assert_eq!(
            page.eval(
                &mut browser,
                "document.querySelector('[data-field=v] select.unit').value"
            )
            .unwrap(),
            "ft/s"
        );
        assert_eq!(
            page.eval(
                &mut browser,
                "document.querySelector('input[name=unit-system]:checked').value"
            )
            .unwrap(),
            "us"
        );
        assert_eq!(
            page.eval(&mut browser, "document.getElementById('notices').childElementCount")
                .unwrap(),
            0
        );

        let errors = page_errors(&browser, &page);
        assert!(errors.is_empty(), "console errors:\n{}", errors.join("\n"));
    }
}

// ---------------------------------------------------------------------------------
// Hostile URL parameters are data: inert, reported, kept in their fields, and
// never replaced by demo values behind the user's back.
mod hostile_parameters {
    use super::*;

    /// Counts of the elements that would run or load something, outside `#notices`.
    const ACTIVE: &str = "JSON.stringify(['SCRIPT', 'IMG', 'IFRAME', 'OBJECT', 'EMBED'].map(t => [...document.getElementsByTagName(t)].filter(e => !document.getElementById('notices').contains(e)).length))";
    const NOTICE_TAGS: &str =
        "JSON.stringify([...new Set([...document.querySelectorAll('#notices *')].map(e => e.tagName))].sort())";
    const OUTPUT_COUNT: &str = "document.querySelectorAll('[data-output]').length";
    const OUTPUTS: &str =
        "JSON.stringify([...document.querySelectorAll('[data-output]')].map(e => [e.dataset.output, e.textContent]))";

    #[test]
    fn hostile_parameters_are_inert_reported_kept_and_give_no_result() {
        let _turn = one_at_a_time();
        let site = fixture();
        let (mut browser, page) = launched(Launch::default());

        page.goto(&mut browser, &format!("{}/bend.html", site.base)).unwrap();
        assert_eq!(page.wait_rendered(&mut browser).unwrap(), "ready");
        let clean_active = page.eval(&mut browser, ACTIVE).unwrap();
        let clean_outputs = page.eval(&mut browser, OUTPUTS).unwrap();

        // A 100 kB value: the server takes heads up to 1 MiB, so this loads from it
        // as well as from the service worker.
        let long = "9".repeat(100_000);
        let hostile: Vec<(String, String)> = vec![
            ("d2".into(), "<script>alert(1)</script>".into()),
            (
                "<img src=x onerror=alert(1)>".into(),
                "<img src=x onerror=alert(1)>".into(),
            ),
            ("plane".into(), "javascript:alert(1)".into()),
            ("k".into(), long.clone()),
            ("angle".into(), "NaN".into()),
            ("d".into(), "inf".into()),
            ("p".into(), "12 m".into()),
            ("system".into(), "javascript:alert(1)".into()),
        ];
        let url = format!("{}/bend.html?{}", site.base, query_string(&hostile));
        page.goto(&mut browser, &url).unwrap();
        assert_eq!(
            page.wait_rendered(&mut browser).unwrap(),
            "error",
            "refused link values give no result"
        );
        browser.pump(Duration::from_millis(300)).unwrap();

        assert_eq!(browser.dialogs_seen(), 0, "a dialog opened");
        assert_eq!(
            page.eval(&mut browser, ACTIVE).unwrap(),
            clean_active,
            "a script, image or frame was added outside #notices"
        );
        let tags = page.eval(&mut browser, NOTICE_TAGS).unwrap();
        assert_eq!(
            tags, r#"["BUTTON","P"]"#,
            "notices hold only text paragraphs and buttons"
        );
        assert_eq!(
            page.eval(&mut browser, OUTPUT_COUNT).unwrap(),
            0,
            "no result may be shown: a demo value in place of a refused one is not the link's calculation"
        );
        // What the link gave stays in its field, to be corrected, not replaced.
        for (field, value) in [
            ("d2", "<script>alert(1)</script>"),
            ("k", long.as_str()),
            ("angle", "NaN"),
            ("d", "inf"),
            ("p", "12 m"),
        ] {
            let shown = page
                .eval(&mut browser, &format!("document.getElementById('field-{field}').value"))
                .unwrap();
            assert_eq!(
                shown.as_str(),
                Some(value),
                "field {field} does not keep the link's value"
            );
            let error = page
                .eval(
                    &mut browser,
                    &format!("(() => {{ const e = document.querySelector('[data-error-for={field}]'); return e && !e.hidden ? e.textContent : ''; }})()"),
                )
                .unwrap();
            assert!(
                error.as_str().is_some_and(|e| !e.is_empty()),
                "field {field} shows no error beside it"
            );
        }
        let notices = page
            .eval(&mut browser, "document.getElementById('notices').textContent")
            .unwrap();
        let notices = notices.as_str().unwrap_or_default().to_string();
        for needle in [
            "<script>alert(1)</script>",
            "<img src=x onerror=alert(1)>",
            "javascript:alert(1)",
            "NaN",
            "inf",
            "12 m",
            "100000 characters",
            "No result is shown until it is corrected",
            "; SI is used",
        ] {
            assert!(
                notices.contains(needle),
                "#notices does not quote {needle:?}:\n{notices}"
            );
        }
        assert!(
            !notices.contains("example value"),
            "a demo value was offered in place of a link value:\n{notices}"
        );
        let count = page
            .eval(&mut browser, "document.querySelectorAll('#notices > p').length")
            .unwrap();
        assert_eq!(count, hostile.len(), "one notice per refused parameter:\n{notices}");
        assert_eq!(page.eval(&mut browser, "typeof window.alert").unwrap(), "function");

        // Typing the demo values over the refused ones brings the demo's result back.
        let spec = fluxledger_core::calculators::spec("bend").expect("bend is registered");
        for field in spec
            .fields
            .iter()
            .filter(|f| ["d2", "k", "angle", "d", "p", "plane"].contains(&f.key))
        {
            let event = if field.key == "plane" { "change" } else { "input" };
            page.eval(
                &mut browser,
                &format!(
                    "(() => {{ const i = document.getElementById('field-{}'); i.value = {}; i.dispatchEvent(new Event('{event}', {{bubbles: true}})); }})()",
                    field.key,
                    serde_json::to_string(field.demo).unwrap_or_default()
                ),
            )
            .unwrap();
        }
        // A keystroke recomputes at once, or at the next animation frame when one
        // was solved in this frame already.
        page.eval(&mut browser, "new Promise(r => requestAnimationFrame(() => r(true)))")
            .unwrap();
        let errors = page
            .eval(&mut browser, "[...document.querySelectorAll('[data-error-for]')].filter(e => !e.hidden).map(e => e.textContent).join(' | ')")
            .unwrap();
        assert_eq!(
            page.eval(&mut browser, "document.body.dataset.state").unwrap(),
            "ready",
            "corrected inputs give a result again: {errors}"
        );
        assert_eq!(
            page.eval(&mut browser, OUTPUTS).unwrap(),
            clean_outputs,
            "the demo's values give the demo's result"
        );

        let errors = page_errors(&browser, &page);
        assert!(errors.is_empty(), "console errors:\n{}", errors.join("\n"));
    }

    /// A link whose one value is invalid (a negative gauge pressure) shows the notice
    /// and no result, never the demo's result.
    #[test]
    fn an_invalid_link_value_shows_the_notice_and_no_result() {
        let _turn = one_at_a_time();
        let site = fixture();
        let (mut browser, page) = launched(Launch::default());
        page.goto(&mut browser, &format!("{}/bend.html?p=-0.5bar", site.base))
            .unwrap();
        assert_eq!(page.wait_rendered(&mut browser).unwrap(), "error");
        assert_eq!(page.eval(&mut browser, OUTPUT_COUNT).unwrap(), 0);
        // Kept as read: the number in the field, its unit in the selector.
        let kept = page
            .eval(
                &mut browser,
                "document.getElementById('field-p').value + ' ' + document.querySelector('[data-field=p] select.unit').value",
            )
            .unwrap();
        assert_eq!(kept, "-0.5 bar");
        let notices = page
            .eval(&mut browser, "document.getElementById('notices').textContent")
            .unwrap();
        assert!(
            notices
                .as_str()
                .is_some_and(|n| n.contains("“-0.5bar”") && n.contains("No result is shown")),
            "{notices}"
        );
        assert_eq!(
            page.eval(&mut browser, "document.querySelector('.headline .no-result') !== null")
                .unwrap(),
            true
        );
        let errors = page_errors(&browser, &page);
        assert!(errors.is_empty(), "console errors:\n{}", errors.join("\n"));
    }

    /// Repeated keys are reported; thousands of unknown keys give one capped notice
    /// and a quick first result; an unknown unit system names the system used.
    #[test]
    fn repeated_and_unknown_keys_are_reported_once_and_capped() {
        let _turn = one_at_a_time();
        let site = fixture();
        let (mut browser, page) = launched(Launch::default());

        let mut params: Vec<(String, String)> = vec![
            ("p".into(), "10bar".into()),
            ("p".into(), "12bar".into()),
            ("angle".into(), "45deg".into()),
            ("angle".into(), "45deg".into()),
            ("system".into(), "us".into()),
            ("system".into(), "metric".into()),
        ];
        for i in 0..5000 {
            params.push((format!("junk{i}"), "1".into()));
        }
        // The same unknown key twice more is still one entry.
        params.push(("junk7".into(), "2".into()));
        let url = format!("{}/bend.html?{}", site.base, query_string(&params));
        page.goto(&mut browser, &url).unwrap();
        assert_eq!(page.wait_rendered(&mut browser).unwrap(), "ready");
        let notices: Vec<String> = serde_json::from_str(
            page.eval(
                &mut browser,
                "JSON.stringify([...document.querySelectorAll('#notices > p')].map(p => p.textContent))",
            )
            .unwrap()
            .as_str()
            .unwrap_or("[]"),
        )
        .unwrap_or_default();
        let all = notices.join("\n");
        assert!(notices.len() <= 5, "too many notices ({}):\n{all}", notices.len());
        let pressure = notices
            .iter()
            .find(|n| n.contains("“p” 2 times"))
            .unwrap_or_else(|| panic!("{all}"));
        assert!(
            pressure.contains("“10bar”") && pressure.contains("the last, “12bar”, is used"),
            "{pressure}"
        );
        assert!(
            notices
                .iter()
                .any(|n| n.contains("“angle” 2 times with the same value")),
            "{all}"
        );
        let unknown = notices
            .iter()
            .find(|n| n.contains("5000 entries that this page does not use"))
            .unwrap_or_else(|| panic!("{all}"));
        assert!(
            unknown.contains("“junk0”") && unknown.contains("and 4990 more"),
            "{unknown}"
        );
        assert_eq!(unknown.matches("“junk").count(), 10, "{unknown}");
        // `system` was given as "us" then "metric": the last is unknown, so the page
        // says which system it used, and uses it.
        let system = notices
            .iter()
            .find(|n| n.contains("“metric”"))
            .unwrap_or_else(|| panic!("{all}"));
        assert!(system.contains("SI is used"), "{system}");
        assert_eq!(
            page.eval(
                &mut browser,
                "document.querySelector('input[name=unit-system]:checked').value"
            )
            .unwrap(),
            "si"
        );
        assert_eq!(
            page.eval(&mut browser, "document.getElementById('field-p').value")
                .unwrap(),
            "12"
        );
        // A first result without thousands of notices is quick: well under the 20 s
        // one notice per key took (a generous bound on a loaded two-core machine).
        let first = page
            .eval(
                &mut browser,
                "performance.getEntriesByName('fluxledger:first-result')[0]?.startTime ?? 1e9",
            )
            .unwrap()
            .as_f64()
            .unwrap_or(1e9);
        assert!(first < 5000.0, "first result after {first} ms");
        let errors = page_errors(&browser, &page);
        assert!(errors.is_empty(), "console errors:\n{}", errors.join("\n"));
    }
}

// ---------------------------------------------------------------------------------
// Every page loads without a console error, computes its demo, and asks only its
// own origin for anything.
mod every_page {
    use super::*;

    #[test]
    fn every_page_is_clean_and_requests_stay_on_the_origin() {
        let _turn = one_at_a_time();
        let site = fixture();
        let (mut browser, page) = launched(Launch {
            width: 360,
            height: 800,
        });

        page.goto(&mut browser, &format!("{}/index.html", site.base)).unwrap();
        browser.pump(Duration::from_millis(300)).unwrap();
        let keys: Vec<&str> = fluxledger_core::calculators::CALCULATORS
            .iter()
            .map(|c| c.key)
            .collect();
        assert!(!keys.is_empty(), "no calculator is registered");
        let mut problems = Vec::new();
        for key in &keys {
            let linked = page
                .eval(
                    &mut browser,
                    &format!("document.querySelector('a[href=\"{key}.html\"], a[href=\"./{key}.html\"]') !== null"),
                )
                .unwrap();
            if linked != Value::Bool(true) {
                problems.push(format!("index.html does not link {key}.html"));
            }
        }
        for key in &keys {
            page.goto(&mut browser, &format!("{}/{key}.html", site.base)).unwrap();
            let state = page.wait_rendered(&mut browser).unwrap();
            if state != "ready" {
                problems.push(format!("{key}.html: the demo did not compute (state {state:?})"));
            }
            let mark = page
                .eval(
                    &mut browser,
                    "performance.getEntriesByName('fluxledger:first-result').length",
                )
                .unwrap();
            if mark != 1 {
                problems.push(format!("{key}.html: no first-result mark"));
            }
        }
        browser.pump(Duration::from_millis(500)).unwrap();
        let errors = page_errors(&browser, &page);
        problems.extend(errors);
        for url in cdp::request_urls(page.events(&browser)) {
            let local =
                url.starts_with(&format!("{}/", site.base)) || url.starts_with("data:") || url.starts_with("blob:");
            if !local {
                problems.push(format!("request outside the origin: {}", cdp::shorten(&url)));
            }
        }
        assert!(problems.is_empty(), "\n{}", problems.join("\n"));
    }
}

// ---------------------------------------------------------------------------------
// Offline: after one visit, a bookmarked calculation loads with the server gone.
mod offline {
    use super::*;

    #[test]
    fn bookmarked_url_loads_and_computes_after_the_server_stops() {
        let _turn = one_at_a_time();
        let site = fixture();
        // A server of its own, so that stopping it leaves the shared one running.
        let server = harness::serve(&site.dir).unwrap_or_else(|e| panic!("{e}"));
        let base = server.base();
        let (mut browser, page) = launched(Launch {
            width: 360,
            height: 800,
        });

        page.goto(&mut browser, &format!("{base}/bend.html")).unwrap();
        assert_eq!(page.wait_rendered(&mut browser).unwrap(), "ready");
        page.wait_for(
            &mut browser,
            "navigator.serviceWorker.controller !== null",
            Duration::from_secs(30),
        )
        .unwrap_or_else(|e| panic!("the service worker did not take control after the first visit: {e}"));
        page.wait_for(
            &mut browser,
            "navigator.serviceWorker.ready.then(r => r.active && r.active.state === 'activated')",
            Duration::from_secs(30),
        )
        .unwrap();
        // The offline copy holds the offline module and no page's own module, so
        // every page below but bend runs on the offline module in place of its own.
        let stored = page
            .eval(
                &mut browser,
                "caches.keys().then(async (names) => { const cache = await caches.open(names.find(n => n.startsWith('fluxledger-')));                  return (await cache.keys()).map(r => new URL(r.url).pathname.split('/').pop()).filter(n => n.endsWith('.wasm')).sort().join(' '); })",
            )
            .unwrap();
        let stored = stored.as_str().unwrap_or_default().to_string();
        assert!(
            stored.split(' ').any(|n| n.starts_with("fluxledger_offline.")),
            "the offline module is not stored: {stored}"
        );
        let own: Vec<&str> = stored
            .split(' ')
            .filter(|n| {
                !n.starts_with("fluxledger_offline.")
                    && !n.starts_with("fluxledger_verify.")
                    && !n.starts_with("fluxledger_bend.")
            })
            .collect();
        assert!(
            own.is_empty(),
            "pages' own modules stored, not only the offline one: {own:?}"
        );

        // Online, once the worker is installed, another page's module is not
        // downloaded: the worker answers with the offline module it stores.
        let before = browser.events.len();
        page.goto(&mut browser, &format!("{base}/tee.html")).unwrap();
        assert_eq!(page.wait_rendered(&mut browser).unwrap(), "ready", "tee.html online");
        // The page's request is answered by the worker, and the worker's only
        // response for it is its own store's (a lookup in the HTTP cache that
        // misses starts a request but receives no response).
        let tee_module = |e: &&cdp::Event| {
            e.method == "Network.responseReceived"
                && e.params["response"]["url"]
                    .as_str()
                    .is_some_and(|u| u.contains("/fluxledger_tee.") && u.ends_with(".wasm"))
        };
        let is_page = |e: &&cdp::Event| e.session.as_deref() == Some(page.session.as_str());
        let events = &browser.events[before..];
        let to_page: Vec<&cdp::Event> = events.iter().filter(tee_module).filter(is_page).collect();
        assert!(
            !to_page.is_empty()
                && to_page
                    .iter()
                    .all(|e| e.params["response"]["fromServiceWorker"] == true),
            "tee's module did not come from the worker: {:?}",
            to_page
                .iter()
                .map(|e| cdp::shorten(&e.params.to_string()))
                .collect::<Vec<_>>()
        );
        let downloaded: Vec<String> = events
            .iter()
            .filter(tee_module)
            .filter(|e| !is_page(e))
            .map(|e| cdp::shorten(&e.params["response"]["url"].to_string()))
            .collect();
        assert!(
            downloaded.is_empty(),
            "the worker downloaded tee's own module instead of answering with the offline one: {downloaded:?}"
        );
        // The page's own idle fetch of its note's later sections ends online (on a
        // loaded machine it could come after the stop, and be refused).
        harness::wait_for_whole_note(&page, &mut browser).unwrap_or_else(|e| panic!("tee.html online: {e}"));

        server.stop();
        // The server is really gone: a file the worker never stored cannot load.
        let probe = page
            .eval(
                &mut browser,
                "fetch('never-stored-' + Date.now() + '.txt').then(() => 'loaded', () => 'failed')",
            )
            .unwrap();
        assert_eq!(probe, "failed", "the server still answers after stop()");

        let bookmark = format!("{base}/bend.html?angle=30deg&d=12in&p=150psi&plane=horizontal&system=us");
        page.goto(&mut browser, &bookmark)
            .unwrap_or_else(|e| panic!("offline load of a bookmarked URL failed: {e}"));
        assert_eq!(page.wait_rendered(&mut browser).unwrap(), "ready");
        let p = page
            .eval(&mut browser, "document.getElementById('field-p').value")
            .unwrap();
        let unit = page
            .eval(
                &mut browser,
                "document.querySelector('[data-field=p] select.unit').value",
            )
            .unwrap();
        assert_eq!((p.as_str(), unit.as_str()), (Some("150"), Some("psi")));
        let thrust = page
            .eval(
                &mut browser,
                "document.querySelector('[data-output=thrust]')?.textContent ?? ''",
            )
            .unwrap();
        assert!(
            thrust.as_str().is_some_and(|t| t.ends_with("lbf")),
            "thrust not shown in US units offline: {thrust}"
        );

        // Every other page was stored on the first visit too: the site root and
        // each calculator open offline and compute their demo.
        page.goto(&mut browser, &format!("{base}/"))
            .unwrap_or_else(|e| panic!("offline site root: {e}"));
        let contents = page.eval(&mut browser, "document.body.dataset.page ?? ''").unwrap();
        assert_eq!(contents, "contents", "the site root offline is the contents page");
        // The outputs are the core's for the page's demo, whichever module ran.
        for calculator in fluxledger_core::calculators::CALCULATORS {
            let key = calculator.key;
            page.goto(&mut browser, &format!("{base}/{key}.html"))
                .unwrap_or_else(|e| panic!("offline {key}: {e}"));
            let state = page.wait_rendered(&mut browser).unwrap();
            assert_eq!(state, "ready", "{key}.html offline");
            let system = page
                .eval(
                    &mut browser,
                    "document.querySelector('input[name=unit-system]:checked')?.value ?? ''",
                )
                .unwrap();
            let system = fluxledger_core::UnitSystem::from_key(system.as_str().unwrap_or_default())
                .unwrap_or_else(|| panic!("{key}: no unit system chosen"));
            let spec = fluxledger_core::calculators::spec(key).expect("registered");
            let request = fluxledger_core::Request {
                system,
                ..fluxledger_core::catalog::demo_request(&spec, &[])
            };
            let solution = fluxledger_core::solve(key, &request)
                .result
                .unwrap_or_else(|e| panic!("{key}: the demo does not solve natively: {e:?}"));
            let shown: Vec<(String, String)> = serde_json::from_str(
                page.eval(
                    &mut browser,
                    "JSON.stringify([...document.querySelectorAll('[data-output]')].map(e => [e.dataset.output, e.textContent]))",
                )
                .unwrap()
                .as_str()
                .unwrap_or("[]"),
            )
            .unwrap();
            assert!(!shown.is_empty(), "{key}: no output offline");
            for (output, text) in &shown {
                let core = solution
                    .output(output)
                    .unwrap_or_else(|| panic!("{key}: the page shows '{output}', which the core does not give"));
                let number = |t: &str| -> String {
                    t.chars()
                        .take_while(|c| c.is_ascii_digit() || ".-+eE".contains(*c))
                        .collect()
                };
                assert_eq!(
                    number(text),
                    number(&core.text),
                    "{key} offline, {output}: page {text:?}, core {:?}",
                    core.text
                );
            }
        }

        // Errors from the deliberate failed probe are expected; nothing else.
        let errors: Vec<String> = page_errors(&browser, &page)
            .into_iter()
            .filter(|e| !e.contains("never-stored-"))
            .collect();
        assert!(errors.is_empty(), "console errors:\n{}", errors.join("\n"));
    }
}
