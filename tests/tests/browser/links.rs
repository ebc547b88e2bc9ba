//! Browser tests of what a result leads to: the link that carries a fitting's thrust
//! to the thrust-restraint page, the CSV download of every table, and the unit-system
//! switch converting the filled inputs (and restoring them on the way back).

use std::time::Duration;

use serde_json::{json, Value};

use fluxledger_core::calculators;
use fluxledger_core::catalog::{demo_inputs, FieldKind};
use fluxledger_core::units::QuantityKind;
use fluxledger_core::{Request, UnitSystem};
use fluxledger_tests::parse_typed;

use crate::cdp::{Browser, Launch, Page};
use crate::harness::{carried_query, fixture, launched, one_at_a_time, page_errors};

/// Text of one output on the page, or `None` when it is not shown.
fn output_text(page: &Page, browser: &mut Browser, key: &str) -> Option<String> {
    page.eval(
        browser,
        &format!("document.querySelector('[data-output=\"{key}\"]')?.textContent ?? null"),
    )
    .unwrap_or_else(|e| panic!("{e}"))
    .as_str()
    .map(str::to_string)
}

fn eval(page: &Page, browser: &mut Browser, expression: &str) -> Value {
    page.eval(browser, expression).unwrap_or_else(|e| panic!("{e}"))
}

fn wait(page: &Page, browser: &mut Browser, condition: &str) {
    page.wait_for(browser, condition, Duration::from_secs(15))
        .unwrap_or_else(|e| panic!("{e}"));
}

fn open(page: &Page, browser: &mut Browser, url: &str) {
    page.goto(browser, url).unwrap_or_else(|e| panic!("{e}"));
    let state = page.wait_rendered(browser).unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(state, "ready", "{url} did not compute");
}

// ---------------------------------------------------------------------------------
// The fitting's thrust, carried to the thrust-restraint page.

/// The page shows four significant figures and the link carries five: the thrust
/// read back on the thrust-block page agrees within 0.1 %.
const CARRIED_THRUST_TOLERANCE: f64 = 1e-3;

#[test]
fn bend_links_to_the_thrust_block_page_with_the_same_thrust() {
    let _turn = one_at_a_time();
    let site = fixture();
    let (mut browser, page) = launched(Launch::default());
    for (system, unit_suffix) in [("si", " kN"), ("us", " lbf")] {
        open(&page, &mut browser, &format!("{}/bend.html?system={system}", site.base));
        let bend_thrust = output_text(&page, &mut browser, "thrust").expect("the bend page shows its thrust");
        assert!(
            bend_thrust.ends_with(unit_suffix),
            "{system}: bend thrust {bend_thrust:?}"
        );

        let links = eval(
            &page,
            &mut browser,
            "JSON.stringify([...document.querySelectorAll('a.carry-link')].map(a => [a.getAttribute('href'), a.textContent]))",
        );
        let links: Vec<(String, String)> = serde_json::from_str(links.as_str().unwrap_or("[]")).unwrap_or_default();
        assert_eq!(
            links.len(),
            1,
            "{system}: one carry-over link on the bend page: {links:?}"
        );
        let (href, text) = &links[0];
        assert!(href.starts_with("thrust-block.html?"), "{system}: href {href:?}");
        assert!(!text.is_empty(), "the link has a label");
        let params: Value = eval(
            &page,
            &mut browser,
            "Object.fromEntries(new URL(document.querySelector('a.carry-link').href).searchParams)",
        );
        assert_eq!(
            params["system"],
            json!(system),
            "the link keeps the page's unit system: {params}"
        );
        assert_eq!(params["fitting"], json!("force"), "{params}");
        let carried = params["thrust"].as_str().unwrap_or_default();
        let carried_n = parse_typed(carried, QuantityKind::Force).unwrap_or_else(|e| panic!("{e}"));
        let shown_n = parse_typed(&bend_thrust, QuantityKind::Force).unwrap_or_else(|e| panic!("{e}"));
        assert!(
            (carried_n - shown_n).abs() <= 5e-4 * shown_n.abs(),
            "{system}: carried {carried} but the bend page shows {bend_thrust}"
        );

        // Follow the link as a user does.
        eval(&page, &mut browser, "document.querySelector('a.carry-link').click()");
        wait(
            &page,
            &mut browser,
            "location.pathname.endsWith('/thrust-block.html') && document.readyState === 'complete' && document.body.dataset.state",
        );
        assert_eq!(eval(&page, &mut browser, "document.body.dataset.state"), "ready");
        assert_eq!(
            eval(&page, &mut browser, "document.getElementById('notices').textContent"),
            "",
            "{system}: the thrust-block page refused part of the link"
        );
        assert_eq!(
            eval(
                &page,
                &mut browser,
                "document.querySelector('input[name=unit-system]:checked').value"
            ),
            json!(system)
        );
        let block_thrust = output_text(&page, &mut browser, "thrust").expect("the thrust-block page shows its thrust");
        let block_n = parse_typed(&block_thrust, QuantityKind::Force).unwrap_or_else(|e| panic!("{e}"));
        assert!(
            (block_n - shown_n).abs() <= CARRIED_THRUST_TOLERANCE * shown_n.abs(),
            "{system}: bend thrust {bend_thrust}, thrust-block page {block_thrust}"
        );
    }
    let errors = page_errors(&browser, &page);
    assert!(errors.is_empty(), "console errors:\n{}", errors.join("\n"));
}

/// Every page whose demo result carries inputs to another calculator shows one link
/// per carry-over, to that calculator's page with exactly the core's inputs and the
/// page's unit system, and the page it opens accepts every one of them.
#[test]
fn every_carry_over_link_holds_the_core_inputs_and_opens_cleanly() {
    let _turn = one_at_a_time();
    let site = fixture();
    let (mut browser, page) = launched(Launch::default());
    let mut pages_with_links = Vec::new();
    for spec in calculators::catalog() {
        let request = Request {
            inputs: demo_inputs(&spec),
            field_units: Default::default(),
            system: UnitSystem::Si,
        };
        let Ok(solution) = fluxledger_core::solve(spec.key, &request).result else {
            panic!("{}: the demo does not solve natively", spec.key);
        };
        open(&page, &mut browser, &format!("{}/{}.html", site.base, spec.key));
        let links = eval(
            &page,
            &mut browser,
            "JSON.stringify([...document.querySelectorAll('a.carry-link')].map(a => [a.getAttribute('href').split('?')[0], [...new URL(a.href).searchParams]]))",
        );
        let links: Vec<(String, Vec<(String, String)>)> =
            serde_json::from_str(links.as_str().unwrap_or("[]")).unwrap_or_default();
        assert_eq!(links.len(), solution.carry_over.len(), "{}: {links:?}", spec.key);
        for (carry, (path, params)) in solution.carry_over.iter().zip(&links) {
            assert_eq!(path, &format!("{}.html", carry.calculator), "{}", spec.key);
            let mut got = params.clone();
            got.sort();
            assert_eq!(got, carried_query(carry, "si"), "{}: link inputs", spec.key);
        }
        for (index, (target, _)) in links.iter().enumerate() {
            open(&page, &mut browser, &format!("{}/{}.html", site.base, spec.key));
            eval(
                &page,
                &mut browser,
                &format!("document.querySelectorAll('a.carry-link')[{index}].click()"),
            );
            wait(
                &page,
                &mut browser,
                &format!("location.pathname.endsWith('/{target}') && document.readyState === 'complete' && document.body.dataset.state"),
            );
            assert_eq!(
                eval(&page, &mut browser, "document.body.dataset.state"),
                "ready",
                "{} -> {target}",
                spec.key
            );
            assert_eq!(
                eval(&page, &mut browser, "document.getElementById('notices').textContent"),
                "",
                "{} -> {target}: the page refused part of the link",
                spec.key
            );
        }
        if !links.is_empty() {
            pages_with_links.push(spec.key);
        }
    }
    for key in ["bend", "reducer", "dead-end", "tee", "nozzle", "line-schedule"] {
        assert!(
            pages_with_links.contains(&key),
            "{key} shows no carry-over link: {pages_with_links:?}"
        );
    }
    let errors = page_errors(&browser, &page);
    assert!(errors.is_empty(), "console errors:\n{}", errors.join("\n"));
}

// ---------------------------------------------------------------------------------
// CSV of every table.

/// Reads CSV text as RFC 4180 describes it: fields separated by commas, records by
/// CRLF, fields with commas, quotes or line breaks in double quotes, a quote inside
/// written twice. Returns an error for anything else (a bare LF, a stray quote).
fn parse_csv(text: &str) -> Result<Vec<Vec<String>>, String> {
    let mut records = Vec::new();
    let mut record = Vec::new();
    let mut field = String::new();
    let mut chars = text.chars().peekable();
    let mut quoted = false;
    let mut was_quoted = false;
    while let Some(ch) = chars.next() {
        if quoted {
            if ch == '"' {
                if chars.peek() == Some(&'"') {
                    chars.next();
                    field.push('"');
                } else {
                    quoted = false;
                }
            } else {
                field.push(ch);
            }
            continue;
        }
        match ch {
            '"' if field.is_empty() && !was_quoted => {
                quoted = true;
                was_quoted = true;
            }
            '"' => return Err(format!("a quote inside an unquoted field after {field:?}")),
            ',' => {
                record.push(std::mem::take(&mut field));
                was_quoted = false;
            }
            '\r' => {
                if chars.next() != Some('\n') {
                    return Err("CR without LF".into());
                }
                record.push(std::mem::take(&mut field));
                records.push(std::mem::take(&mut record));
                was_quoted = false;
            }
            '\n' => return Err("a line ends in LF alone, not CRLF".into()),
            _ if was_quoted => return Err(format!("text after a closing quote: {ch:?}")),
            _ => field.push(ch),
        }
    }
    if quoted {
        return Err("a quoted field is not closed".into());
    }
    if !field.is_empty() || !record.is_empty() {
        return Err("the last record does not end in CRLF".into());
    }
    Ok(records)
}

#[test]
fn csv_reader_of_these_tests_follows_rfc_4180() {
    // Examples written from RFC 4180 section 2 (rules 5-7).
    let text = "a,\"b,c\",\"say \"\"hi\"\"\"\r\n\"x\r\ny\",,z\r\n";
    assert_eq!(
        parse_csv(text).unwrap(),
        vec![vec!["a", "b,c", "say \"hi\""], vec!["x\r\ny", "", "z"]]
    );
    assert!(parse_csv("a,b\n").is_err());
    assert!(parse_csv("a,b").is_err());
    assert!(parse_csv("a\"b\r\n").is_err());
    assert!(parse_csv("\"ab\r\n").is_err());
}

/// Characters that start a formula in a spreadsheet cell (ASCII and full-width).
const FORMULA_STARTS: [char; 8] = ['=', '+', '-', '@', '＝', '＋', '－', '＠'];
/// Characters where some reader starts a new cell: the separators of every locale
/// and line breaks.
const CELL_BREAKS: [char; 5] = [',', ';', '\t', '\r', '\n'];

/// A plain decimal number (`-12.5`, `+3`, `1.2e-5`): what a spreadsheet reads as a
/// number, not a formula. Written for these tests, apart from the adapter's rule.
fn plain_number(text: &str) -> bool {
    text.chars().any(|c| c.is_ascii_digit())
        && text.chars().all(|c| c.is_ascii_digit() || "+-.eE".contains(c))
        && text.parse::<f64>().is_ok()
}

/// Whether a spreadsheet in some locale would run part of `cell` as a formula: the
/// cell start, or the start of any piece after a separator or line break (a reader
/// that splits there), begins with a formula character and is not a plain number.
/// A tab or CR at the very start is stripped by some readers.
fn would_run_as_formula(cell: &str) -> bool {
    let risky = |piece: &str| piece.starts_with(FORMULA_STARTS) && !plain_number(piece);
    let first = cell.split(CELL_BREAKS).next().unwrap_or("");
    cell.starts_with(['\t', '\r'])
        || risky(first)
        || cell.match_indices(CELL_BREAKS).any(|(i, sep)| {
            let rest = &cell[i + sep.len()..];
            risky(rest.split(CELL_BREAKS).next().unwrap_or(""))
        })
}

/// Takes out the apostrophes a neutralised cell gained: one at the start or after a
/// separator, before a formula character, tab or CR.
fn without_neutralising(cell: &str) -> String {
    let mut out = String::new();
    let mut at_start = true;
    let mut chars = cell.chars().peekable();
    while let Some(ch) = chars.next() {
        let before_formula = chars
            .peek()
            .is_some_and(|next| FORMULA_STARTS.contains(next) || *next == '\t' || *next == '\r');
        if !(ch == '\'' && at_start && before_formula) {
            out.push(ch);
        }
        at_start = CELL_BREAKS.contains(&ch);
    }
    out
}

#[test]
fn the_formula_oracle_of_these_tests_knows_numbers_from_formulas() {
    for safe in [
        "-12.5", "+3", "1.2e-5", "B1", "1,500", "'=1+1", "a - b", "x;'=cmd", "a;-12.5",
    ] {
        assert!(!would_run_as_formula(safe), "{safe:?}");
    }
    for risky in [
        "=1+1",
        "-1+cmd|'/C calc'!A0",
        "@SUM(A1)",
        "+A1",
        "x;=cmd",
        "x,=cmd",
        "x\t=cmd",
        "\t1",
        "-12.5 kN",
        "＝1",
        "-inf",
    ] {
        assert!(would_run_as_formula(risky), "{risky:?}");
    }
    assert_eq!(without_neutralising("'=1;'@x,'-12.5 kN"), "=1;@x,-12.5 kN");
    assert_eq!(without_neutralising("it's"), "it's");
}

/// Clicks every table's "Download CSV" on `key`'s page opened with its demo inputs
/// and `overrides`, and checks each file against the core's own table for the same
/// inputs: the file name, the header and every cell, with no cell a spreadsheet
/// would run as a formula, and any cell that differs from the core's only by the
/// apostrophes that neutralise a formula. Returns the CSV texts.
fn check_csv_of_every_table(
    page: &Page,
    browser: &mut Browser,
    base: &str,
    key: &str,
    overrides: &[(&str, &str)],
) -> Vec<String> {
    let query: Vec<(String, String)> = overrides.iter().map(|(k, v)| (k.to_string(), v.to_string())).collect();
    open(
        page,
        browser,
        &format!("{base}/{key}.html?{}", crate::harness::query_string(&query)),
    );
    let spec = calculators::spec(key).unwrap_or_else(|| panic!("{key} is registered"));
    let mut inputs = demo_inputs(&spec);
    for (k, v) in overrides {
        inputs.insert(k.to_string(), v.to_string());
    }
    let request = Request {
        inputs,
        field_units: Default::default(),
        system: UnitSystem::Si,
    };
    let solution = fluxledger_core::solve(key, &request)
        .result
        .unwrap_or_else(|e| panic!("{key}: the inputs do not solve natively: {e:?}"));
    let keys = eval(
        page,
        browser,
        "JSON.stringify([...document.querySelectorAll('table[data-table]')].map(t => t.dataset.table))",
    );
    let keys: Vec<String> = serde_json::from_str(keys.as_str().unwrap_or("[]")).unwrap_or_default();
    let expected_keys: Vec<&str> = solution.tables.iter().map(|t| t.key).collect();
    assert_eq!(keys, expected_keys, "{key}: the page shows the core's tables");
    assert!(!keys.is_empty(), "{key}: no table to download");
    let mut texts = Vec::new();
    // Files are named `<page>-<table>-<date>.csv`, the date as the page's clock gives it.
    let date = eval(page, browser, "new Date().toISOString().slice(0, 10)");
    let date = date.as_str().unwrap_or_default().to_string();
    let link = eval(page, browser, "location.href");
    let link = link.as_str().unwrap_or_default().to_string();
    for (index, table) in solution.tables.iter().enumerate() {
        let name = format!("{key}-{}-{date}.csv", table.key);
        let click =
            format!("document.querySelectorAll('.panel-table')[{index}].querySelector('button.csv-download').click()");
        let bytes = download(page, browser, &click, &name);
        let text = String::from_utf8(bytes).unwrap_or_else(|e| panic!("{name} is not UTF-8: {e}"));
        // The file starts with a byte order mark so that spreadsheets read UTF-8.
        let text = text
            .strip_prefix('\u{feff}')
            .unwrap_or_else(|| panic!("{name} has no byte order mark"))
            .to_string();
        let name = name.as_str();
        let all = parse_csv(&text).unwrap_or_else(|e| panic!("{name} is not RFC 4180 CSV ({e}):\n{text}"));
        // A header block that traces the file, then an empty line, then the table.
        let blank = all
            .iter()
            .position(|r| r.len() == 1 && r[0].is_empty())
            .unwrap_or_else(|| panic!("{name}: no header block before the table:\n{text}"));
        let (header, records) = (&all[..blank], &all[blank + 1..]);
        for cell in header.iter().flatten() {
            assert!(
                !would_run_as_formula(cell),
                "{name}: the header cell {cell:?} would run as a formula"
            );
        }
        let row = |label: &str| header.iter().find(|r| r.first().is_some_and(|c| c == label));
        assert!(
            row("Fluxledger").is_some_and(|r| r.get(1).is_some_and(|v| v.starts_with(env!("CARGO_PKG_VERSION")))),
            "{name}: no version in the header block: {header:?}"
        );
        // The link in the file opens the same page with the same pairs (it may be
        // written more readably: `/` and `,` unescaped).
        let shown_link = row("Link").and_then(|r| r.get(1)).cloned().unwrap_or_default();
        let same = eval(
            page,
            browser,
            &format!(
                "(() => {{ const a = new URL({}), b = new URL({}); return a.origin + a.pathname === b.origin + b.pathname && JSON.stringify([...a.searchParams]) === JSON.stringify([...b.searchParams]); }})()",
                serde_json::to_string(&without_neutralising(&shown_link)).unwrap_or_default(),
                serde_json::to_string(&link).unwrap_or_default()
            ),
        );
        assert_eq!(
            same,
            Value::Bool(true),
            "{name}: the link in the header block is {shown_link:?}, the page's {link:?}"
        );
        let inputs = header
            .iter()
            .filter(|r| r.first().is_some_and(|c| c == "Input"))
            .count();
        assert!(inputs > 0, "{name}: no input in the header block: {header:?}");
        let mut expected = vec![table.columns.clone()];
        expected.extend(table.rows.iter().cloned());
        assert_eq!(records.len(), expected.len(), "{name}: row count");
        for (record, wanted) in records.iter().zip(&expected) {
            assert_eq!(record.len(), wanted.len(), "{name}: cells in {wanted:?}");
            for (cell, core) in record.iter().zip(wanted) {
                assert!(
                    !would_run_as_formula(cell),
                    "{name}: the cell {cell:?} would run as a formula"
                );
                assert_eq!(
                    &without_neutralising(cell),
                    core,
                    "{name}: the cell differs from the core's"
                );
                assert!(
                    cell == core || would_run_as_formula(core),
                    "{name}: {core:?} was changed to {cell:?} although no spreadsheet would run it"
                );
            }
        }
        texts.push(text);
    }
    texts
}

/// Clicks what `click` names and returns the bytes of the file the browser saves
/// as `name`, captured through the DevTools protocol (downloads allowed into a
/// fresh folder): the production script has no test hook.
fn download(page: &Page, browser: &mut Browser, click: &str, name: &str) -> Vec<u8> {
    static COUNT: std::sync::atomic::AtomicUsize = std::sync::atomic::AtomicUsize::new(0);
    let n = COUNT.fetch_add(1, std::sync::atomic::Ordering::Relaxed);
    let dir = std::env::temp_dir().join(format!("fluxledger-downloads-{}-{n}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).unwrap_or_else(|e| panic!("{}: {e}", dir.display()));
    browser
        .call(
            None,
            "Browser.setDownloadBehavior",
            json!({ "behavior": "allow", "downloadPath": dir.to_string_lossy(), "eventsEnabled": true }),
        )
        .unwrap_or_else(|e| panic!("{e}"));
    eval(page, browser, click);
    let path = dir.join(name);
    let deadline = std::time::Instant::now() + Duration::from_secs(15);
    loop {
        let partial = std::fs::read_dir(&dir)
            .map(|entries| {
                entries
                    .flatten()
                    .any(|e| e.file_name().to_string_lossy().ends_with(".crdownload"))
            })
            .unwrap_or(false);
        if path.is_file() && !partial {
            let bytes = std::fs::read(&path).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
            let _ = std::fs::remove_dir_all(&dir);
            return bytes;
        }
        if std::time::Instant::now() > deadline {
            let seen: Vec<String> = std::fs::read_dir(&dir)
                .map(|entries| {
                    entries
                        .flatten()
                        .map(|e| e.file_name().to_string_lossy().into_owned())
                        .collect()
                })
                .unwrap_or_default();
            panic!("no download named {name} within 15 s (the folder holds {seen:?})");
        }
        browser
            .pump(Duration::from_millis(50))
            .unwrap_or_else(|e| panic!("{e}"));
    }
}

/// Line-schedule rows whose tags (text the user typed, shown in a table cell) a
/// spreadsheet would run, and one plain negative number that must stay a number.
const HOSTILE_TAGS: [&str; 7] = [
    "-1+cmd|'/Ccalc'!A0",
    "=1+1",
    "@SUM(A1:A9)",
    "+A1",
    "x;=cmd",
    "x,=cmd",
    "-12.5",
];

#[test]
fn every_table_downloads_as_csv_with_the_cells_of_the_result() {
    let _turn = one_at_a_time();
    let site = fixture();
    let (mut browser, page) = launched(Launch::default());
    // The tests read the file through the page's hook; nothing is written to disk.
    browser
        .call(None, "Browser.setDownloadBehavior", json!({ "behavior": "deny" }))
        .unwrap_or_else(|e| panic!("{e}"));

    let bend = check_csv_of_every_table(&page, &mut browser, &site.base, "bend", &[]);
    assert!(bend.iter().all(|t| t.ends_with("\r\n")));

    // Some of the line schedule's cells hold commas: they must come out quoted.
    let spec = calculators::spec("line-schedule").expect("line-schedule is registered");
    let demo_rows = demo_inputs(&spec)
        .get("rows")
        .cloned()
        .expect("the line schedule has demo rows");
    let mut rows = demo_rows.clone();
    for tag in HOSTILE_TAGS {
        rows.push_str(&format!("\nforce thrust=40kN tag={tag}"));
    }
    let schedule = check_csv_of_every_table(&page, &mut browser, &site.base, "line-schedule", &[("rows", &rows)]);
    let request = Request {
        inputs: {
            let mut inputs = demo_inputs(&spec);
            inputs.insert("rows".into(), rows.clone());
            inputs
        },
        field_units: Default::default(),
        system: UnitSystem::Si,
    };
    let solution = fluxledger_core::solve("line-schedule", &request)
        .result
        .expect("the rows solve");
    let cells: Vec<&String> = solution.tables.iter().flat_map(|t| t.rows.iter().flatten()).collect();
    let with_comma: Vec<&&String> = cells.iter().filter(|cell| cell.contains(',')).collect();
    assert!(
        !with_comma.is_empty(),
        "the line-schedule demo has no cell with a comma to quote"
    );
    for cell in with_comma {
        let written = format!("\"{}\"", cell.replace('"', "\"\"").replace(",=", ",'="));
        assert!(
            schedule.iter().any(|t| t.contains(&written)),
            "the cell {cell:?} is not quoted in the CSV"
        );
    }
    // Each hostile tag reached a cell (so the check above saw it), and came out inert.
    for tag in HOSTILE_TAGS {
        assert!(
            cells.iter().any(|c| c.as_str() == tag),
            "no table cell holds the tag {tag:?}"
        );
    }
    let text = schedule.join("");
    for written in [
        "'-1+cmd|'/Ccalc'!A0",
        "'=1+1",
        "'@SUM(A1:A9)",
        "'+A1",
        "\"x;'=cmd\"",
        "\"x,'=cmd\"",
        ",-12.5,",
    ] {
        assert!(text.contains(written), "the CSV does not hold {written:?}:\n{text}");
    }
    let errors = page_errors(&browser, &page);
    assert!(errors.is_empty(), "console errors:\n{}", errors.join("\n"));
}

// ---------------------------------------------------------------------------------
// The unit-system switch converts filled inputs, and switching back restores them.

/// 10 bar in psi: 10⁶ Pa ÷ 6894.757 293 168 Pa/psi = 145.037 74 psi (derived from
/// the definitions, NIST SP 811 Appendix B: psi = lbf/in², lbf = 0.453 592 37 kg ×
/// 9.806 65 m/s², in = 0.0254 m).
const TEN_BAR_IN_PSI: f64 = 145.037_74;

/// Value and unit of field `key` as the page shows them.
fn field(page: &Page, browser: &mut Browser, key: &str) -> (String, String) {
    let value = eval(page, browser, &format!("document.getElementById('field-{key}').value"));
    let unit = eval(
        page,
        browser,
        &format!("document.querySelector('[data-field=\"{key}\"] select.unit')?.value ?? ''"),
    );
    (
        value.as_str().unwrap_or_default().to_string(),
        unit.as_str().unwrap_or_default().to_string(),
    )
}

fn switch_to(page: &Page, browser: &mut Browser, system: &str) {
    eval(
        page,
        browser,
        &format!("document.querySelector('input[name=unit-system][value={system}]').click()"),
    );
    wait(
        page,
        browser,
        &format!("new URLSearchParams(location.search).get('system') === '{system}' && document.body.dataset.state === 'ready'"),
    );
}

#[test]
fn unit_switch_converts_filled_inputs_and_switching_back_restores_them() {
    let _turn = one_at_a_time();
    let site = fixture();
    let (mut browser, page) = launched(Launch {
        width: 360,
        height: 800,
    });
    // The bore in inches: already in the US customary unit, so left as it is both
    // ways (it was converted to 304.8 mm on the way back).
    open(&page, &mut browser, &format!("{}/bend.html?p=10bar&d=12in", site.base));
    assert_eq!(field(&page, &mut browser, "p"), ("10".to_string(), "bar".to_string()));
    assert_eq!(field(&page, &mut browser, "d"), ("12".to_string(), "in".to_string()));
    let si_thrust = output_text(&page, &mut browser, "thrust").expect("thrust shown");
    let si_fields = eval(
        &page,
        &mut browser,
        "JSON.stringify([...document.querySelectorAll('input.quantity')].map(i => i.value))",
    );

    switch_to(&page, &mut browser, "us");
    let (p, unit) = field(&page, &mut browser, "p");
    assert_eq!(unit, "psi");
    // Rounded for the eye (one figure more than typed, at least four): 145.0 psi,
    // shown without the trailing zero.
    assert_eq!(p, "145", "10 bar shown as {p} psi");
    let psi: f64 = p.parse().unwrap_or_else(|e| panic!("{p:?}: {e}"));
    assert!(
        (psi - TEN_BAR_IN_PSI).abs() <= 5e-4 * TEN_BAR_IN_PSI,
        "10 bar shown as {p} psi"
    );
    assert_eq!(
        eval(&page, &mut browser, "new URLSearchParams(location.search).get('p')"),
        json!(format!("{p}psi")),
        "the URL follows the converted field"
    );
    // Every filled quantity field is now in its US customary default unit.
    let spec = calculators::spec("bend").expect("bend is registered");
    for field_spec in spec.fields.iter().filter(|f| matches!(f.kind, FieldKind::Quantity(_))) {
        let (value, unit) = field(&page, &mut browser, field_spec.key);
        if !value.trim().is_empty() {
            assert_eq!(unit, field_spec.us_unit, "{}: {value} {unit}", field_spec.key);
        }
    }
    let us_thrust = output_text(&page, &mut browser, "thrust").expect("thrust shown");
    assert!(us_thrust.ends_with(" lbf"), "{us_thrust}");
    let si_n = parse_typed(&si_thrust, QuantityKind::Force).unwrap_or_else(|e| panic!("{e}"));
    let us_n = parse_typed(&us_thrust, QuantityKind::Force).unwrap_or_else(|e| panic!("{e}"));
    assert!(
        (si_n - us_n).abs() <= 1e-3 * si_n.abs(),
        "the same inputs in other units give another thrust: {si_thrust} vs {us_thrust}"
    );
    let status = eval(
        &page,
        &mut browser,
        "document.querySelector('.system-status').textContent",
    );
    assert!(
        status.as_str().is_some_and(|s| s.contains("converted to US customary")),
        "{status}"
    );

    // Back to SI: everything as typed, and the same result as before.
    switch_to(&page, &mut browser, "si");
    assert_eq!(field(&page, &mut browser, "p"), ("10".to_string(), "bar".to_string()));
    assert_eq!(field(&page, &mut browser, "d"), ("12".to_string(), "in".to_string()));
    assert_eq!(
        eval(
            &page,
            &mut browser,
            "JSON.stringify([...document.querySelectorAll('input.quantity')].map(i => i.value))"
        ),
        si_fields
    );
    assert_eq!(
        output_text(&page, &mut browser, "thrust").as_deref(),
        Some(si_thrust.as_str())
    );

    // A value edited after a switch is converted, not replaced by the old text:
    // 150 psi = 1034.21 kPa (150 × 6.894 757 kPa, from the definitions), shown to
    // four figures.
    switch_to(&page, &mut browser, "us");
    eval(
        &page,
        &mut browser,
        "(() => { const i = document.getElementById('field-p'); i.value = '150'; i.dispatchEvent(new Event('input', {bubbles: true})); i.dispatchEvent(new Event('change', {bubbles: true})); })()",
    );
    wait(
        &page,
        &mut browser,
        "new URLSearchParams(location.search).get('p') === '150psi'",
    );
    switch_to(&page, &mut browser, "si");
    let (p, unit) = field(&page, &mut browser, "p");
    assert_eq!(unit, "kPa");
    let kpa: f64 = p.parse().unwrap_or_else(|e| panic!("{p:?}: {e}"));
    assert_eq!(p, "1034", "150 psi shown as {p} kPa");
    assert!((kpa - 1034.2136).abs() <= 0.5, "150 psi shown as {p} kPa");

    let errors = page_errors(&browser, &page);
    assert!(errors.is_empty(), "console errors:\n{}", errors.join("\n"));
}

// ---------------------------------------------------------------------------------
// Old links: retired keys read through the core's glossary.

/// An old link for `page`: every retired key of the glossary that the page no
/// longer has but whose new key it has (with a value it takes), every renamed option
/// value of one of its choices, and the retired unit-system key `units=`. Returns
/// the old pairs and how many glossary entries (besides `units=`) they exercise.
fn old_link(page: &str) -> (Vec<(String, String)>, usize) {
    use fluxledger_core::glossary::{KEY_ALIASES, VALUE_ALIASES};
    let Some(spec) = calculators::spec(page) else {
        return (Vec::new(), 0);
    };
    let mut pairs: Vec<(String, String)> = Vec::new();
    let offers = |key: &str, value: &str| {
        spec.field(key).is_some_and(|f| match f.kind {
            FieldKind::Choice(options) => options.iter().any(|o| o.key == value),
            _ => true,
        })
    };
    for alias in KEY_ALIASES.iter().filter(|a| a.page == page) {
        if spec.field(alias.old).is_some() || pairs.iter().any(|(k, _)| k == alias.old) {
            continue;
        }
        let Some(field) = spec.field(alias.new) else { continue };
        // A renamed value that reads as the field's example first (the example
        // inputs are known to solve), else any renamed value the field offers.
        let renamed = alias
            .values
            .iter()
            .find(|(_, new)| *new == field.demo)
            .or_else(|| alias.values.iter().find(|(_, new)| offers(alias.new, new)))
            .map(|(old, _)| *old);
        let value = match field.kind {
            FieldKind::Choice(_) => renamed.or((!field.demo.is_empty()).then_some(field.demo)),
            _ => (!field.demo.is_empty()).then_some(field.demo),
        };
        if let Some(value) = value {
            pairs.push((alias.old.to_string(), value.to_string()));
        }
    }
    for alias in VALUE_ALIASES.iter().filter(|a| a.page == page) {
        if offers(alias.key, alias.new) && !offers(alias.key, alias.old) && !pairs.iter().any(|(k, _)| k == alias.key) {
            pairs.push((alias.key.to_string(), alias.old.to_string()));
        }
    }
    let exercised = pairs.len();
    pairs.push(("units".into(), "si".into()));
    (pairs, exercised)
}

/// A bookmarked link in retired keys (`bend.html?d_in=300mm&basis=od&plane=vertical_up`
/// once the pages use the glossary's keys) opens with today's keys in the address
/// bar, shows the same result as the link written in today's keys, and names every
/// translation in one notice. The old keys come from the core's alias table, so the
/// test follows the glossary rather than a page's key list of today.
#[test]
fn an_old_key_link_opens_in_todays_keys_with_the_same_result_and_one_notice() {
    let _turn = one_at_a_time();
    let site = fixture();
    let (mut browser, page) = launched(Launch::default());

    // The page whose link exercises the most glossary entries (the bend page first).
    let mut pages: Vec<&str> = calculators::CALCULATORS.iter().map(|c| c.key).collect();
    pages.sort_by_key(|p| (std::cmp::Reverse(old_link(p).1), *p != "bend"));
    let key = pages[0];
    let (old, _) = old_link(key);
    // Today's link, from the core's glossary (each pair on its own, as the page
    // reads pairs it does not understand) and the unit-system key renamed.
    let mut expected_notes = Vec::new();
    let mut new: Vec<(String, String)> = Vec::new();
    for (k, v) in &old {
        if k == "units" {
            expected_notes.push(format!("units={v} → system={v}"));
            new.push(("system".into(), v.clone()));
            continue;
        }
        let up = fluxledger_core::glossary::upgrade(key, &[(k.clone(), v.clone())]);
        expected_notes.extend(up.translations.iter().map(|t| t.to_string()));
        new.extend(up.pairs);
    }
    assert_eq!(
        expected_notes.len(),
        old.len(),
        "{key}: every old pair is translated: {old:?}"
    );

    let outputs =
        "JSON.stringify([...document.querySelectorAll('[data-output]')].map(e => [e.dataset.output, e.textContent]))";
    open(
        &page,
        &mut browser,
        &format!("{}/{key}.html?{}", site.base, crate::harness::query_string(&new)),
    );
    let today = eval(&page, &mut browser, outputs);
    let today_notices = eval(&page, &mut browser, "document.getElementById('notices').textContent");
    assert_eq!(today_notices, json!(""), "{key}: today's link needs no notice");

    open(
        &page,
        &mut browser,
        &format!("{}/{key}.html?{}", site.base, crate::harness::query_string(&old)),
    );
    let before = eval(&page, &mut browser, outputs);
    assert_eq!(before, today, "{key}: the old link gives the same result as today's");
    assert_ne!(before, json!("[]"), "{key}: no result shown");
    let search = eval(
        &page,
        &mut browser,
        "JSON.stringify([...new URLSearchParams(location.search)])",
    );
    let shown: Vec<(String, String)> = serde_json::from_str(search.as_str().unwrap_or("[]")).unwrap_or_default();
    assert_eq!(shown, new, "{key}: the address bar shows the link in today's keys");
    let notices: Vec<String> = serde_json::from_str(
        eval(
            &page,
            &mut browser,
            "JSON.stringify([...document.querySelectorAll('#notices > p')].map(p => p.firstChild.textContent))",
        )
        .as_str()
        .unwrap_or("[]"),
    )
    .unwrap_or_default();
    assert_eq!(
        notices,
        [format!("Old link keys read as: {}.", expected_notes.join(", "))],
        "{key}: one notice naming every translation"
    );
    let errors = page_errors(&browser, &page);
    assert!(errors.is_empty(), "console errors:\n{}", errors.join("\n"));
}

/// Event listeners the DevTools protocol finds on the element `expression` names
/// (event types, sorted).
fn listeners(page: &Page, browser: &mut Browser, expression: &str) -> Vec<String> {
    let found = page
        .call(browser, "Runtime.evaluate", json!({ "expression": expression }))
        .unwrap_or_else(|e| panic!("{e}"));
    let object = found["result"]["objectId"]
        .as_str()
        .unwrap_or_else(|| panic!("{expression} names no element: {found}"))
        .to_string();
    let listed = page
        .call(browser, "DOMDebugger.getEventListeners", json!({ "objectId": object }))
        .unwrap_or_else(|e| panic!("{e}"));
    let mut types: Vec<String> = listed["listeners"]
        .as_array()
        .cloned()
        .unwrap_or_default()
        .iter()
        .filter_map(|l| l["type"].as_str().map(str::to_string))
        .collect();
    types.sort();
    types
}

/// The form has one listener per event type on the calculator section and none on
/// its controls, unit selectors, unit-system switch or buttons, and the delegated
/// listeners still drive the page: typing recomputes, a unit selector and the
/// unit-system switch take effect.
#[test]
fn one_delegated_listener_per_event_drives_every_control() {
    let _turn = one_at_a_time();
    let site = fixture();
    let (mut browser, page) = launched(Launch::default());
    open(&page, &mut browser, &format!("{}/bend.html", site.base));

    assert_eq!(
        listeners(&page, &mut browser, "document.getElementById('calculator')"),
        ["change", "click", "input"]
    );
    let count = eval(
        &page,
        &mut browser,
        "document.querySelectorAll('#calculator input, #calculator select, #calculator textarea, #calculator button').length",
    );
    let count = count.as_u64().unwrap_or(0);
    assert!(count > 10, "only {count} controls");
    for index in 0..count {
        let expression = format!(
            "document.querySelectorAll('#calculator input, #calculator select, #calculator textarea, #calculator button')[{index}]"
        );
        let own = listeners(&page, &mut browser, &expression);
        // The notices' own buttons (dismiss, reload) keep theirs; form controls have none.
        let in_notice = eval(
            &page,
            &mut browser,
            &format!("Boolean({expression}.closest('#notices'))"),
        );
        if in_notice != json!(true) {
            let what = eval(
                &page,
                &mut browser,
                &format!("(e => e.tagName + ' ' + (e.name || e.className))({expression})"),
            );
            assert!(own.is_empty(), "{what}: listeners of its own: {own:?}");
        }
    }

    // Typing into the pressure field recomputes through the delegated listener.
    let before = output_text(&page, &mut browser, "thrust").unwrap_or_default();
    eval(
        &page,
        &mut browser,
        "(() => { const f = document.getElementById('field-p'); f.value = '20'; f.dispatchEvent(new Event('input', { bubbles: true })); })()",
    );
    wait(&page, &mut browser, "new URLSearchParams(location.search).get('p') === '20kPa' || new URLSearchParams(location.search).get('p')?.startsWith('20')");
    let after = output_text(&page, &mut browser, "thrust").unwrap_or_default();
    assert_ne!(before, after, "typing did not recompute");
    // A unit selector takes effect.
    eval(
        &page,
        &mut browser,
        "(() => { const s = document.querySelector('[data-field=p] select.unit'); s.value = 'bar'; s.dispatchEvent(new Event('change', { bubbles: true })); })()",
    );
    wait(
        &page,
        &mut browser,
        "new URLSearchParams(location.search).get('p') === '20bar'",
    );
    let errors = page_errors(&browser, &page);
    assert!(errors.is_empty(), "console errors:\n{}", errors.join("\n"));
}
