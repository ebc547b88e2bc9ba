//! The live verification page, `verify.html`: every sourced reference case of
//! `tests/data/reference/`, run in the reader's browser through the same wasm
//! module as the calculators.
//!
//! The cases are read at build time by the tests crate's loader
//! (`fluxledger_tests::load_cases`, the very one the native reference test uses),
//! so the page can never list other cases than the tests run. The page is static
//! HTML that reads without script: per case its title, calculator (or core
//! function), its inputs as a link that opens the case on its page, each expected
//! value with its tolerance, and its source. The page script
//! (`site/assets/verify.js`) fills in the computed values and the verdicts by
//! calling the wasm export `verify_case` for each case, whose judgement is
//! `fluxledger_core::verification::verify`: the same case runner and tolerance
//! rule as the native reference test driver. The cases travel to the script as a
//! JSON data block (`<script type="application/json" id="cases">`, not executed,
//! so the content security policy allows it), every `<` escaped.

use std::collections::BTreeMap;
use std::fs;
use std::path::Path;

use fluxledger_core::calculators;
use fluxledger_core::verification::{self, Target, Tolerance};
use fluxledger_tests::{load_cases, Case};

use crate::build::{json_string, short_hash, GLUE_PLACEHOLDER};
use crate::error::SiteError;
use crate::pages::{self, escape, PageAssets};

/// The page's file name.
pub const PAGE: &str = "verify.html";
/// The page script's source in `site/assets/`.
pub const SCRIPT: &str = "verify.js";
/// The text of the link to this page in every page's footer.
pub const FOOTER_LINK: &str = "Checks: every sourced case, run in your browser";

/// Adds the page and its hashed script (`verify.<hash>.js`, with the hashed wasm
/// glue name filled in) to the site's files.
///
/// # Errors
/// A missing script, a script without the glue placeholder, or case files that do
/// not load (all listed).
pub fn add_page(
    site: &Path,
    root: &Path,
    glue_name: &str,
    assets: &PageAssets,
    files: &mut BTreeMap<String, Vec<u8>>,
) -> Result<(), SiteError> {
    let script_path = site.join("assets").join(SCRIPT);
    let source = fs::read_to_string(&script_path).map_err(|e| SiteError::io(&script_path, e))?;
    if !source.contains(GLUE_PLACEHOLDER) {
        return Err(SiteError::content(
            &script_path,
            format!("the placeholder {GLUE_PLACEHOLDER} is missing"),
        ));
    }
    let script = source.replace(GLUE_PLACEHOLDER, glue_name);
    let script_name = format!("verify.{}.js", short_hash(script.as_bytes()));

    let dir = root.join("tests").join("data").join("reference");
    let (cases, errors) = load_cases(&dir);
    if !errors.is_empty() {
        return Err(SiteError::content(&dir, errors.join("\n")));
    }
    let page_assets = PageAssets {
        script: script_name.clone(),
        ..assets.clone()
    };
    files.insert(script_name, script.into_bytes());
    files.insert(PAGE.into(), verify_page(&cases, &page_assets).into_bytes());
    Ok(())
}

/// Percent-encodes a query component: unreserved characters and `/` stay.
fn encode(text: &str) -> String {
    let mut out = String::with_capacity(text.len());
    for byte in text.bytes() {
        if byte.is_ascii_alphanumeric() || b"-._~/".contains(&byte) {
            out.push(byte as char);
        } else {
            out.push_str(&format!("%{byte:02X}"));
        }
    }
    out
}

/// The text a user would type for one input: a bare number read in a selector
/// unit carries that unit, so the link means what the case means.
fn typed_input(case: &Case, key: &str, text: &str) -> String {
    match case.units.get(key) {
        Some(unit) if text.trim().parse::<f64>().is_ok() => format!("{} {unit}", text.trim()),
        _ => text.to_string(),
    }
}

/// The link that opens a calculator case on its page (`bend.html?angle=90%20deg&…
/// &units=si`); `None` for a function case, which has no page.
pub fn case_link(case: &Case) -> Option<String> {
    let Target::Calculator(key) = &case.target else {
        return None;
    };
    let mut query: Vec<String> = case
        .inputs
        .iter()
        .map(|(k, v)| format!("{}={}", encode(k), encode(&typed_input(case, k, v))))
        .collect();
    // The page script reads the unit system from `units`.
    query.push(format!("units={}", case.system.key()));
    Some(format!("{}?{}", pages::page_file(key), query.join("&")))
}

/// The case as the script hands it to `verify_case` (see `wasm/src/verify.rs`).
pub fn case_json(case: &Case) -> String {
    let map = |m: &BTreeMap<String, String>| {
        let entries: Vec<String> = m
            .iter()
            .map(|(k, v)| format!("{}:{}", json_string(k), json_string(v)))
            .collect();
        format!("{{{}}}", entries.join(","))
    };
    let target = match &case.target {
        Target::Calculator(key) => format!("\"calculator\":{}", json_string(key)),
        Target::Function(name) => format!("\"function\":{}", json_string(name)),
    };
    let expected: Vec<String> = case
        .expected
        .iter()
        .map(|e| {
            let tolerance = match &e.tolerance {
                Tolerance::Relative(rel) => format!("\"rel_tol\":{rel:e}"),
                Tolerance::Absolute(abs) => format!("\"abs\":{}", json_string(abs)),
            };
            format!(
                "{{\"output\":{},\"value\":{},{tolerance}}}",
                json_string(&e.output),
                json_string(&e.value)
            )
        })
        .collect();
    let expect_error = match &case.expect_error {
        None => "null".to_string(),
        Some(e) => format!(
            "{{\"field\":{},\"contains\":{}}}",
            json_string(&e.field),
            e.contains.as_deref().map(json_string).unwrap_or_else(|| "null".into())
        ),
    };
    format!(
        "{{{target},\"system\":{},\"inputs\":{},\"units\":{},\"expected\":[{}],\"expect_error\":{expect_error}}}",
        json_string(case.system.key()),
        map(&case.inputs),
        map(&case.units),
        expected.join(",")
    )
}

/// The embedded JSON array of every case, safe inside a `<script>` data block.
pub fn cases_json(cases: &[Case]) -> String {
    let items: Vec<String> = cases.iter().map(case_json).collect();
    // `<` only occurs inside JSON strings, where `\u003c` is the same character.
    format!("[\n{}\n]", items.join(",\n")).replace('<', "\\u003c")
}

/// What the case runs: the calculator's title or the core function's.
fn target_title(target: &Target) -> String {
    match target {
        Target::Calculator(key) => calculators::spec(key)
            .map(|s| s.title.to_string())
            .unwrap_or_else(|| key.clone()),
        Target::Function(name) => verification::function(name)
            .map(|f| f.title.to_string())
            .unwrap_or_else(|| name.clone()),
    }
}

/// The id of a case's entry (from its file name).
fn case_id(case: &Case) -> String {
    let name = case.name();
    let stem = name.trim_end_matches(".toml");
    let clean: String = stem
        .chars()
        .map(|c| if c.is_ascii_alphanumeric() || c == '-' { c } else { '-' })
        .collect();
    format!("case-{clean}")
}

fn case_html(index: usize, case: &Case) -> String {
    let mut html = format!(
        "<li class=\"verify-case\" id=\"{id}\" data-case=\"{index}\">\n<h2 class=\"case-title\">{title}</h2>\n",
        id = escape(&case_id(case)),
        title = escape(&case.title)
    );
    let target = target_title(&case.target);
    match &case.target {
        Target::Calculator(key) => html.push_str(&format!(
            "<p class=\"case-target\">Calculator: <a href=\"{href}\">{title}</a></p>\n",
            href = escape(&pages::page_file(key)),
            title = escape(&target)
        )),
        Target::Function(_) => html.push_str(&format!(
            "<p class=\"case-target\">Core function: {} (no page of its own)</p>\n",
            escape(&target)
        )),
    }
    let inputs: Vec<String> = case
        .inputs
        .iter()
        .map(|(k, v)| format!("{k} = {}", typed_input(case, k, v)))
        .collect();
    let inputs_text = if inputs.is_empty() {
        "none".to_string()
    } else {
        inputs.join(" · ")
    };
    let system = if case.system.key() == "us" {
        "US customary"
    } else {
        "SI"
    };
    match case_link(case) {
        Some(link) => html.push_str(&format!(
            "<p class=\"case-inputs\">Inputs ({system}): <a class=\"case-link\" href=\"{href}\">{text}</a></p>\n",
            href = escape(&link),
            text = escape(&inputs_text)
        )),
        None => html.push_str(&format!(
            "<p class=\"case-inputs\">Inputs: {}</p>\n",
            escape(&inputs_text)
        )),
    }
    html.push_str(concat!(
        // Focusable, as every table's box: it scrolls sideways on a phone.
        "<div class=\"table-scroll\" tabindex=\"0\"><table class=\"case-checks\">\n",
        "<thead><tr><th scope=\"col\">Output</th><th scope=\"col\">Expected</th><th scope=\"col\">Tolerance</th>",
        "<th scope=\"col\">Computed here</th><th scope=\"col\">Agrees</th></tr></thead>\n<tbody>\n"
    ));
    if let Some(refusal) = &case.expect_error {
        let expected = match &refusal.contains {
            Some(text) => format!("refused, message containing “{text}”"),
            None => "refused".to_string(),
        };
        html.push_str(&format!(
            "<tr data-refusal=\"{field}\"><th scope=\"row\">{field}</th><td>{expected}</td><td>–</td>\
             <td class=\"computed\">not run</td><td class=\"agrees\">–</td></tr>\n",
            field = escape(&refusal.field),
            expected = escape(&expected)
        ));
    }
    for expected in &case.expected {
        let tolerance = match &expected.tolerance {
            Tolerance::Relative(rel) => format!("± {}", relative_text(*rel)),
            Tolerance::Absolute(abs) => format!("± {abs}"),
        };
        html.push_str(&format!(
            "<tr data-output=\"{output}\"><th scope=\"row\">{output}</th><td>{value}</td><td>{tolerance}</td>\
             <td class=\"computed\">not run</td><td class=\"agrees\">–</td></tr>\n",
            output = escape(&expected.output),
            value = escape(&expected.value),
            tolerance = escape(&tolerance)
        ));
    }
    html.push_str("</tbody>\n</table></div>\n");
    html.push_str("<p class=\"case-result\" data-result=\"pending\">Not run yet.</p>\n");
    html.push_str(&format!(
        "<p class=\"case-source\">Source: {}</p>\n<p class=\"case-file\">Case file: {}</p>\n</li>\n",
        escape(&case.source),
        escape(&case.name())
    ));
    html
}

/// A relative tolerance as a percentage or parts per million.
fn relative_text(rel: f64) -> String {
    if rel >= 1e-4 {
        format!("{} %", fluxledger_core::units::format_significant(rel * 100.0, 3))
    } else {
        format!("{} ppm", fluxledger_core::units::format_significant(rel * 1e6, 3))
    }
}

/// The verification page.
pub fn verify_page(cases: &[Case], assets: &PageAssets) -> String {
    let functions = cases.iter().filter(|c| matches!(c.target, Target::Function(_))).count();
    let mut html = pages::head(
        "Checks: every sourced case, run in your browser — Fluxledger",
        "Every sourced reference case of the handbook, run on this device through the same module as the calculators.",
        assets,
        false,
    );
    html.push_str("<body data-page=\"verify\">\n");
    html.push_str(pages::header());
    html.push_str("<main>\n<h1>Checks: every sourced case, run in your browser</h1>\n");
    html.push_str(&format!(
        "<p id=\"verify-summary\" class=\"verify-summary\" role=\"status\" aria-live=\"polite\" data-total=\"{total}\">\
         {total} cases; running them needs JavaScript and WebAssembly.</p>\n",
        total = cases.len()
    ));
    html.push_str(&format!(
        concat!(
            "<p class=\"summary\">Each case below is what a user types into one calculator (or into one of the core ",
            "functions the calculators use), with the value a published source, a handbook table or an independent ",
            "library gives for it. This page runs all {total} of them ({calculators} through calculators, {functions} ",
            "through core functions) on this device, through the same WebAssembly module as the calculator pages, ",
            "and compares each result with its source within the tolerance the source's precision allows. A case that ",
            "must be refused agrees when the named input is refused. The same cases run in the handbook's own test ",
            "suite with the same comparison. Open a case's inputs to see it on its page.</p>\n"
        ),
        total = cases.len(),
        calculators = cases.len() - functions,
        functions = functions
    ));
    html.push_str(concat!(
        "<aside class=\"cautions\" aria-labelledby=\"cautions-title\">\n",
        "<h2 id=\"cautions-title\">What agreement shows</h2>\n<ul>\n",
        "<li>Agreement shows that this copy of the handbook reproduces its sources on this device; ",
        "it does not make a result fit for a particular design.</li>\n",
        "<li>Each calculator page shows the cautions of its method; results support, and do not replace, ",
        "the judgement of a licensed engineer and the local codes that govern the work.</li>\n",
        "</ul>\n</aside>\n<ol class=\"verify-cases\">\n"
    ));
    for (index, case) in cases.iter().enumerate() {
        html.push_str(&case_html(index, case));
    }
    html.push_str("</ol>\n");
    html.push_str("<script type=\"application/json\" id=\"cases\">");
    html.push_str(&cases_json(cases));
    html.push_str("</script>\n</main>\n");
    html.push_str(&pages::footer(assets, PAGE));
    html.push_str("</body>\n</html>\n");
    html
}

#[cfg(test)]
mod tests {
    use super::*;
    use fluxledger_tests::{reference_dir, Expected};
    use std::path::PathBuf;

    fn assets() -> PageAssets {
        PageAssets {
            stylesheet: "style.00aa11bb.css".into(),
            script: "verify.22cc33dd.js".into(),
            theme_colour: "#1f4e5f".into(),
            version: "0.1.0".into(),
            ..PageAssets::default()
        }
    }

    fn hostile_case() -> Case {
        Case {
            path: PathBuf::from("bend-x.toml"),
            title: "a </script><b>bold</b> title".into(),
            source: "book & table <1>".into(),
            target: Target::Calculator("bend".into()),
            system: fluxledger_core::UnitSystem::UsCustomary,
            inputs: [
                ("d_in".to_string(), "12 in".to_string()),
                ("sigma".to_string(), "2000".to_string()),
            ]
            .into(),
            units: [("sigma".to_string(), "psf".to_string())].into(),
            expected: vec![Expected {
                output: "thrust".into(),
                value: "1 kN</script>".into(),
                tolerance: Tolerance::Relative(1e-6),
                note: None,
            }],
            expect_error: None,
        }
    }

    #[test]
    fn every_case_file_is_on_the_page_and_in_the_data_block() {
        let (cases, errors) = load_cases(&reference_dir());
        assert!(errors.is_empty(), "{errors:?}");
        let page = verify_page(&cases, &assets());
        assert_eq!(page.matches("<li class=\"verify-case\"").count(), cases.len());
        let start = page
            .find("<script type=\"application/json\" id=\"cases\">")
            .expect("data block");
        let rest = &page[start..];
        let json = &rest[rest.find('>').expect("tag end") + 1..rest.find("</script>").expect("block end")];
        let value: serde_json::Value = serde_json::from_str(json).expect("valid JSON");
        assert_eq!(value.as_array().map(Vec::len), Some(cases.len()));
        assert!(page.contains("<script type=\"module\" src=\"verify.22cc33dd.js\"></script>"));
    }

    #[test]
    fn text_is_escaped_and_the_data_block_cannot_close_early() {
        let page = verify_page(&[hostile_case()], &assets());
        assert!(!page.contains("<b>bold</b>"));
        assert!(page.contains("book &amp; table &lt;1&gt;"));
        assert_eq!(
            page.matches("</script>").count(),
            2,
            "the module tag and the data block only"
        );
        let json = cases_json(&[hostile_case()]);
        let value: serde_json::Value = serde_json::from_str(&json).expect("valid JSON");
        assert_eq!(value[0]["expected"][0]["value"], "1 kN</script>");
        assert_eq!(value[0]["system"], "us");
    }

    #[test]
    fn link_opens_the_case_on_its_page_with_units_on_bare_numbers() {
        let link = case_link(&hostile_case()).expect("calculator case");
        assert_eq!(link, "bend.html?d_in=12%20in&sigma=2000%20psf&units=us");
    }
}
