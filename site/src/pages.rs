//! The HTML pages: the contents page and one page per calculator.
//!
//! Every page is static HTML that reads well without script: the calculator pages
//! carry the method note, the cautions and, in `<section id="calculator">`, the
//! demo's form and result rendered at build time ([`crate::prerender`]); the page
//! script takes that section over for edits and for links with a query.
//!
//! A first visit needs nothing but the HTML for its first result: the screen rules
//! of the stylesheet are inlined in a `<style>` element (the print rules are a
//! separate `media="print"` stylesheet, which does not hold up rendering); on a
//! calculator page the head carries only the rules its first screen may use and a
//! second `<style>` where the demo's details begin carries the rest, the cascade
//! unchanged ([`crate::first_screen`]). The
//! one inline script (`site/assets/query.js`) marks a page opened with a query and
//! loads the page script (one file, [`crate::bundle`]): at once, with the glue and
//! the wasm preloaded, when the link carries a query; after the first paint when it does
//! not; it comes before the rules, so that a link's requests do not wait for them.
//! The content security policy allows exactly those inline elements by their
//! SHA-256 hashes ([`csp`]). All text from the core (titles,
//! summaries, groups, cautions) is HTML-escaped here; the only unescaped markup is
//! the method note, which [`crate::notes`] renders from our own Markdown.
//!
//! Every URL is relative, so the site also works under a sub-path of a static host,
//! and the content security policy (a meta tag) allows nothing but the site's own
//! files, the two inline elements by hash, and `'wasm-unsafe-eval'` (without which
//! Chromium refuses to compile the module). A `referrer` meta tag keeps a calculation's link (its whole query) from
//! being sent on; the headers a meta tag cannot carry (`frame-ancestors`) come from
//! the server (see [`crate::server`] and the README).

use base64::Engine as _;

use crate::first_screen;
use fluxledger_core::catalog::{common_cautions, CalculatorSpec, COMMON_CAUTIONS};
use sha2::{Digest, Sha256};

/// The content security policy of a page: the site's own files, `'wasm-unsafe-eval'`
/// (without which Chromium refuses to compile the module), and the page's inline
/// style and script allowed by hash only (never `'unsafe-inline'`).
pub fn csp(inline_styles: &[&str], inline_script: &str) -> String {
    let hash = |text: &str| {
        format!(
            " 'sha256-{}'",
            base64::engine::general_purpose::STANDARD.encode(Sha256::digest(text.as_bytes()))
        )
    };
    let script = if inline_script.is_empty() {
        String::new()
    } else {
        hash(inline_script)
    };
    let style: String = inline_styles
        .iter()
        .filter(|text| !text.is_empty())
        .map(|text| hash(text))
        .collect();
    format!(
        "default-src 'self'; script-src 'self' 'wasm-unsafe-eval'{script}; style-src 'self'{style}; \
img-src 'self' data:; connect-src 'self'; object-src 'none'; base-uri 'none'; form-action 'self'"
    )
}

/// Splits the core's text at its symbols with a subscript, `C_d`, `L_run`, `V_θ2`,
/// `R_p0.2`: one or two letters not inside a longer word, `_`, then letters and
/// digits (a point between digits), not followed by a letter, a digit or `_`. Returns
/// the plain runs and the subscripts in order: `(plain, Some(subscript))` for a
/// symbol (its letters end the plain run), `(plain, None)` for the text after the
/// last one. The page script reads the same (`symbolNodes` in `assets/js/dom.js`);
/// the text itself keeps its `_` (CSV, error messages, the printed link).
pub fn symbol_parts(text: &str) -> Vec<(&str, Option<&str>)> {
    let word = |c: char| c.is_alphabetic() || c.is_ascii_digit() || c == '_';
    let mut parts = Vec::new();
    let mut plain_start = 0;
    for (underscore, _) in text.match_indices('_') {
        if underscore < plain_start {
            continue;
        }
        let before = &text[plain_start..underscore];
        let base = before.chars().rev().take_while(|c| c.is_alphabetic()).count();
        let base_ok = (1..=2).contains(&base) && {
            let base_bytes: usize = before.chars().rev().take(base).map(char::len_utf8).sum();
            !text[..underscore - base_bytes].chars().next_back().is_some_and(word)
        };
        if !base_ok {
            continue;
        }
        let after = &text[underscore + 1..];
        let letters: usize = after
            .chars()
            .take_while(|&c| c.is_alphabetic() || c.is_ascii_digit())
            .map(char::len_utf8)
            .sum();
        if letters == 0 {
            continue;
        }
        let decimals = after[letters..]
            .strip_prefix('.')
            .map(|rest| rest.bytes().take_while(u8::is_ascii_digit).count())
            .filter(|&digits| digits > 0)
            .map_or(0, |digits| 1 + digits);
        let ends = |len: usize| !after[len..].chars().next().is_some_and(word);
        let length = if decimals > 0 && ends(letters + decimals) {
            letters + decimals
        } else if ends(letters) {
            letters
        } else {
            continue;
        };
        parts.push((&text[plain_start..underscore], Some(&after[..length])));
        plain_start = underscore + 1 + length;
    }
    parts.push((&text[plain_start..], None));
    parts
}

/// Escapes the core's text for HTML element content, its symbols' subscripts as
/// `<sub>` ([`symbol_parts`]).
pub fn escape_symbols(text: &str) -> String {
    symbol_parts(text)
        .into_iter()
        .map(|(plain, subscript)| match subscript {
            Some(sub) => format!("{}<sub>{}</sub>", escape(plain), escape(sub)),
            None => escape(plain),
        })
        .collect()
}

/// Escapes text for HTML element content and double- or single-quoted attributes.
pub fn escape(text: &str) -> String {
    let mut out = String::with_capacity(text.len());
    for ch in text.chars() {
        match ch {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            '\'' => out.push_str("&#39;"),
            _ => out.push(ch),
        }
    }
    out
}

/// File names and values every page refers to.
#[derive(Clone, Debug, Default)]
pub struct PageAssets {
    /// Hashed stylesheet file name (`style.1a2b3c4d.css`): the print rules when
    /// `inline_style` holds the screen rules (linked `media="print"`), else all.
    pub stylesheet: String,
    /// The stylesheet's screen rules, inlined in every page's head; empty for none.
    pub inline_style: String,
    /// The same screen rules as a hashed file (`screen.1a2b3c4d.css`), linked
    /// instead of inlined by the method-note pages; empty for none.
    pub screen_stylesheet: String,
    /// Hashed page script file name (`app.1a2b3c4d.js`).
    pub script: String,
    /// Hashed wasm glue (`fluxledger_wasm.1a2b3c4d.js`), preloaded by calculator
    /// pages; empty for none.
    pub glue: String,
    /// Hashed wasm module, preloaded by calculator pages; empty for none.
    pub wasm: String,
    /// The inline head script of calculator pages (`query.js` with its
    /// placeholders filled): marks a page opened with a query and loads the page
    /// script. Empty: the page script and preloads are plain tags.
    pub head_script: String,
    /// Theme colour (`#1f4e5f`).
    pub theme_colour: String,
    /// The handbook's version, shown in the footer.
    pub version: String,
}

/// Where a prerendered calculator section's details (the result's tables,
/// diagram and plots, below the first screen) begin.
pub const DETAILS_START: &str = "<div class=\"details\" inert>";

/// The file name of a calculator's page.
pub fn page_file(key: &str) -> String {
    format!("{key}.html")
}

/// The links that let a calculator page request its code early when it has no
/// inline head script: the page script and the glue as module preloads, the wasm as a fetch preload (CORS mode, as
/// `instantiateStreaming` fetches it).
fn preloads(assets: &PageAssets) -> String {
    let mut html = format!("<link rel=\"modulepreload\" href=\"{}\">\n", escape(&assets.script));
    if !assets.glue.is_empty() {
        html.push_str(&format!(
            "<link rel=\"modulepreload\" href=\"{}\">\n",
            escape(&assets.glue)
        ));
    }
    if !assets.wasm.is_empty() {
        html.push_str(&format!(
            "<link rel=\"preload\" href=\"{}\" as=\"fetch\" type=\"application/wasm\" crossorigin>\n",
            escape(&assets.wasm)
        ));
    }
    html
}

pub(crate) fn head(title: &str, description: &str, assets: &PageAssets, calculator: bool) -> String {
    head_with(title, description, assets, calculator, "")
}

/// [`head`] of a page whose body holds a second `<style>` element,
/// `body_style` (allowed by its hash too; empty for none).
///
/// The print rules are linked after every screen rule, so that they win over a
/// screen rule of the same specificity: when the body holds screen rules, the
/// print stylesheet's `<link>` follows them there ([`print_after`]), not the head.
fn head_with(title: &str, description: &str, assets: &PageAssets, calculator: bool, body_style: &str) -> String {
    let inline_script = if calculator { assets.head_script.as_str() } else { "" };
    let styles = if assets.inline_style.is_empty() && !assets.screen_stylesheet.is_empty() {
        format!(
            "<link rel=\"stylesheet\" href=\"{}\">\n<link rel=\"stylesheet\" href=\"{}\" media=\"print\">\n",
            escape(&assets.screen_stylesheet),
            escape(&assets.stylesheet)
        )
    } else if assets.inline_style.is_empty() {
        format!("<link rel=\"stylesheet\" href=\"{}\">\n", escape(&assets.stylesheet))
    } else if !body_style.is_empty() {
        // The print rules follow the body's rules (see `print_after`).
        format!("<style>{}</style>\n", assets.inline_style)
    } else {
        // Our own stylesheet, not escaped (`<` would be wrong in CSS); the build
        // refuses one that could close the element.
        format!(
            "<style>{}</style>\n<link rel=\"stylesheet\" href=\"{}\" media=\"print\">\n",
            assets.inline_style,
            escape(&assets.stylesheet)
        )
    };
    let scripts = if !inline_script.is_empty() {
        format!("<script>{inline_script}</script>\n")
    } else if calculator {
        format!(
            "{}<script type=\"module\" src=\"{}\"></script>\n",
            preloads(assets),
            escape(&assets.script)
        )
    } else {
        format!("<script type=\"module\" src=\"{}\"></script>\n", escape(&assets.script))
    };
    let csp = csp(&[&assets.inline_style, body_style], inline_script);
    format!(
        concat!(
            "<!doctype html>\n<html lang=\"en\">\n<head>\n",
            "<meta charset=\"utf-8\">\n",
            "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n",
            "<meta http-equiv=\"Content-Security-Policy\" content=\"{csp}\">\n",
            "<meta name=\"referrer\" content=\"no-referrer\">\n",
            "<meta name=\"theme-color\" content=\"{theme}\">\n",
            "<meta name=\"description\" content=\"{description}\">\n",
            "<title>{title}</title>\n",
            // The script first: on a link with a query it requests the page
            // script, the glue and the wasm, which should not wait for the
            // browser to parse the inline rules.
            "{scripts}",
            "{styles}",
            "<link rel=\"manifest\" href=\"manifest.webmanifest\">\n",
            "<link rel=\"icon\" href=\"icon.svg\" type=\"image/svg+xml\">\n",
            "<link rel=\"apple-touch-icon\" href=\"icon-192.png\">\n",
            "</head>\n"
        ),
        styles = styles,
        scripts = scripts,
        csp = escape(&csp),
        theme = escape(&assets.theme_colour),
        description = escape(description),
        title = escape(title),
    )
}

pub(crate) fn header() -> &'static str {
    concat!(
        "<header>\n",
        "<a class=\"site-name\" href=\"index.html\">Fluxledger</a>\n",
        "<nav aria-label=\"Site\"><a href=\"index.html\">Contents</a></nav>\n",
        "</header>\n"
    )
}

pub(crate) fn footer(assets: &PageAssets, page: &str) -> String {
    format!(
        concat!(
            "<footer>\n",
            "<p>Fluxledger {version} · <span class=\"page-file\">{page}</span> · ",
            "an offline handbook of control-volume force calculations. ",
            "Printed sheets carry the link to the calculation and the version; ",
            "results support, and do not replace, a licensed engineer's judgement and local codes.</p>\n",
            "<p class=\"verify-link\"><a href=\"verify.html\">Checks: every sourced case, run in your browser</a></p>\n",
            "</footer>\n"
        ),
        version = escape(&assets.version),
        page = escape(page),
    )
}

/// The cautions box: the shared cautions this page concerns, then the page's own.
pub fn cautions_html(spec: &CalculatorSpec) -> String {
    let mut html = String::from(concat!(
        "<aside id=\"cautions\" class=\"cautions\" aria-labelledby=\"cautions-title\">\n",
        "<h2 id=\"cautions-title\">Cautions</h2>\n<ul>\n"
    ));
    for caution in common_cautions(spec).chain(spec.cautions.iter().copied()) {
        html.push_str(&format!("<li>{}</li>\n", escape_symbols(caution)));
    }
    html.push_str("</ul>\n</aside>\n");
    html
}

/// The file of a calculator's whole method note, a page of its own
/// ([`method_page`]).
pub fn method_file(key: &str) -> String {
    format!("{key}-method.html")
}

/// A rendered method note split into its first section (everything before its
/// second `<h2>`, or before its first one when it does not open with one) and the
/// rest (empty when the note has one section).
///
/// Why: the calculator page carries the first section, whose displayed equation is
/// the governing balance the printed sheet shows; the later sections (derivation,
/// worked example, sources) are most of a note's bytes and lie far below the first
/// result, so they come from [`method_file`] after it (issue 9: a page's first
/// response within 20 kB gzip).
pub fn split_note(note_html: &str) -> (&str, &str) {
    let body = note_html.trim_start();
    let lead = note_html.len() - body.len();
    // Past the opening heading when the note starts with one.
    let from = if body.starts_with("<h2") { 1 } else { 0 };
    match body[from..].find("\n<h2") {
        // The newline stays with the first part.
        Some(at) => note_html.split_at(lead + from + at + 1),
        None => (note_html, ""),
    }
}

/// The opening of a calculator's method-note article, the same on the calculator
/// page and the method page (the page script counts the children both share).
fn note_article_open(note_html: &str) -> &'static str {
    // A note that opens with its own heading (`# Method` becomes `<h2>`) keeps it;
    // otherwise the page gives the note a "Method" heading.
    if note_html.trim_start().starts_with("<h2") {
        "<article class=\"method-note\" aria-label=\"Method note\">\n"
    } else {
        "<article class=\"method-note\" aria-labelledby=\"method-title\">\n<h2 id=\"method-title\">Method</h2>\n"
    }
}

/// The page of a calculator's whole method note ([`method_file`]), or `None` when
/// the note has a single section (the calculator page then carries all of it).
///
/// It reads on its own (a link from the calculator page, without script) and it is
/// where the calculator page's script takes the note's later sections from
/// (`site/assets/js/note.js`); the service worker precaches it like every file.
pub fn method_page(spec: &CalculatorSpec, note_html: &str, assets: &PageAssets) -> Option<String> {
    if split_note(note_html).1.is_empty() {
        return None;
    }
    let file = method_file(spec.key);
    // The screen rules linked, not inlined, when they are a file: this page is no
    // first response, and the precache then holds the rules once.
    let linked;
    let assets = if assets.screen_stylesheet.is_empty() {
        assets
    } else {
        linked = PageAssets {
            inline_style: String::new(),
            ..assets.clone()
        };
        &linked
    };
    let mut html = head(
        &format!("Method: {} — Fluxledger", spec.title),
        spec.summary,
        assets,
        false,
    );
    html.push_str(&format!(
        "<body data-page=\"method\" data-group=\"{group}\">\n",
        group = escape(spec.group)
    ));
    html.push_str(header());
    html.push_str("<main>\n");
    html.push_str(&format!(
        concat!(
            "<p class=\"page-group\">{group}</p>\n<h1>{title}: the method</h1>\n",
            "<p class=\"summary\"><a href=\"{page}\">Open the {title} calculator</a></p>\n"
        ),
        group = escape(spec.group),
        title = escape(spec.title),
        page = escape(&page_file(spec.key))
    ));
    html.push_str(note_article_open(note_html));
    html.push_str(note_html);
    html.push_str("</article>\n");
    html.push_str(&cautions_html(spec));
    html.push_str("</main>\n");
    html.push_str(&footer(assets, &file));
    html.push_str("</body>\n</html>\n");
    Some(html)
}

/// One calculator page. `note_html` is the rendered method note: the page carries
/// its first section and a link to the whole note ([`split_note`],
/// [`method_page`]), which the page script replaces with the later sections.
///
/// `prerendered` is the calculator section's demo (from [`crate::prerender`]), put
/// in place so the first response already shows a result; `None` leaves the
/// section for the script to fill.
pub fn calculator_page(
    spec: &CalculatorSpec,
    note_html: &str,
    prerendered: Option<&str>,
    assets: &PageAssets,
) -> String {
    let file = page_file(spec.key);
    let mut html = format!(
        "<body data-calculator=\"{key}\" data-group=\"{group}\">\n",
        key = escape(spec.key),
        group = escape(spec.group)
    );
    html.push_str(header());
    html.push_str("<main>\n");
    html.push_str(&format!(
        "<p class=\"page-group\">{group}</p>\n<h1>{title}</h1>\n<p class=\"summary\">{summary}</p>\n",
        group = escape(spec.group),
        title = escape(spec.title),
        summary = escape(spec.summary)
    ));
    html.push_str(concat!(
        "<section id=\"calculator\" aria-label=\"Calculator\">\n",
        "<noscript><p class=\"no-result\">The live calculator needs JavaScript and WebAssembly. ",
        "The method and the cautions below apply without it.</p></noscript>\n"
    ));
    // The stylesheet split at the first screen (crate::first_screen): the rules the
    // markup before the result's details may use in the head, the rest where the
    // details begin.
    let mut split_style = None;
    if let Some(section) = prerendered {
        match section.find(DETAILS_START) {
            Some(at) if !assets.inline_style.is_empty() => {
                let shown = format!("{html}{}", &section[..at]);
                let names =
                    first_screen::Names::of_markup(&shown, &first_screen::classes_added_by(&assets.head_script));
                let (early, later) = first_screen::split(&assets.inline_style, &names);
                html.push_str(&section[..at]);
                if !later.is_empty() {
                    html.push_str(&print_after(&later, assets));
                }
                html.push_str(&section[at..]);
                split_style = Some((early, later));
            }
            _ => html.push_str(section),
        }
    }
    html.push_str("</section>\n");
    // A prerendered section holds the cautions beside its result, where the script
    // puts them; without one the script moves them there from here.
    if prerendered.is_none() {
        html.push_str(&cautions_html(spec));
    }
    html.push_str(note_article_open(note_html));
    let (first, rest) = split_note(note_html);
    html.push_str(first);
    if !rest.is_empty() {
        html.push_str(&format!(
            "<p class=\"note-more\"><a href=\"{}\">Read the whole method note</a></p>\n",
            escape(&method_file(spec.key))
        ));
    }
    html.push_str("</article>\n</main>\n");
    html.push_str(&footer(assets, &file));
    html.push_str("</body>\n</html>\n");
    let title = format!("{} — Fluxledger", spec.title);
    let head = match split_style {
        Some((early, later)) => {
            let split = PageAssets {
                inline_style: early,
                ..assets.clone()
            };
            head_with(&title, spec.summary, &split, true, &later)
        }
        None => head(&title, spec.summary, assets, true),
    };
    head + &html
}

/// The second `<style>` of a calculator page (the screen rules its first screen
/// does not use) and, after it, the print stylesheet. The page script takes the
/// calculator over around them and leaves both where they are (a `<style>` moved
/// is parsed again); were the section not as served, it moves both to the head, in
/// this order, before it rebuilds the section.
fn print_after(later_rules: &str, assets: &PageAssets) -> String {
    format!(
        "<style>{later_rules}</style><link rel=\"stylesheet\" href=\"{}\" media=\"print\">",
        escape(&assets.stylesheet)
    )
}

/// The contents page: calculators grouped by job group, groups in the order of
/// their first calculator.
pub fn contents_page(specs: &[CalculatorSpec], assets: &PageAssets) -> String {
    let mut html = head(
        "Fluxledger — control-volume force calculations",
        "Offline handbook of anchor, thrust-block, jet and turbine force calculations: method notes with live calculators.",
        assets,
        false,
    );
    html.push_str("<body data-page=\"contents\">\n");
    html.push_str(header());
    html.push_str("<main>\n<h1>Fluxledger</h1>\n");
    html.push_str(concat!(
        "<p class=\"summary\">Forces and torques that moving fluid puts on bends, reducers, dead ends, tees, ",
        "nozzles, plates, vanes and reaction turbines, from control-volume balances. Each page pairs a short ",
        "method note with a live calculator; after one visit every page also works offline.</p>\n"
    ));
    let mut groups: Vec<&str> = Vec::new();
    for spec in specs {
        if !groups.contains(&spec.group) {
            groups.push(spec.group);
        }
    }
    if groups.is_empty() {
        html.push_str("<p class=\"no-result\">No calculators are published in this build yet.</p>\n");
    }
    for (index, group) in groups.iter().enumerate() {
        html.push_str(&format!(
            "<section class=\"contents-group\" aria-labelledby=\"group-{index}\">\n<h2 id=\"group-{index}\">{}</h2>\n<ul>\n",
            escape(group)
        ));
        for spec in specs.iter().filter(|s| s.group == *group) {
            html.push_str(&format!(
                "<li><a href=\"{href}\"><span class=\"entry-title\">{title}</span> <span class=\"entry-summary\">{summary}</span></a></li>\n",
                href = escape(&page_file(spec.key)),
                title = escape(spec.title),
                summary = escape(spec.summary)
            ));
        }
        html.push_str("</ul>\n</section>\n");
    }
    html.push_str(concat!(
        "<aside id=\"cautions\" class=\"cautions\" aria-labelledby=\"cautions-title\">\n",
        "<h2 id=\"cautions-title\">Before you use a result</h2>\n<ul>\n"
    ));
    for caution in COMMON_CAUTIONS {
        html.push_str(&format!("<li>{}</li>\n", escape(caution.text)));
    }
    html.push_str("</ul>\n</aside>\n</main>\n");
    html.push_str(&footer(assets, "index.html"));
    html.push_str("</body>\n</html>\n");
    html
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn symbols_with_a_subscript_are_read_from_the_cores_text() {
        // (text, its HTML): symbols as the core writes them, and words with `_`
        // that are not symbols (a row keyword, a link key, a field key).
        let cases = [
            ("Discharge coefficient C_d", "Discharge coefficient C<sub>d</sub>"),
            ("p·A_eff (45.00 kN)", "p·A<sub>eff</sub> (45.00 kN)"),
            (
                "swirl V_θ2 = u₂ − V_m2/tan β₂",
                "swirl V<sub>θ2</sub> = u₂ − V<sub>m2</sub>/tan β₂",
            ),
            (
                "f_B = min(R_p0.2/3, R_m/4)",
                "f<sub>B</sub> = min(R<sub>p0.2</sub>/3, R<sub>m</sub>/4)",
            ),
            ("K·ρV_ref²/2", "K·ρV<sub>ref</sub>²/2"),
            ("closure time t_c.", "closure time t<sub>c</sub>."),
            ("(p_gauge + p_atm)/ρg", "(p<sub>gauge</sub> + p<sub>atm</sub>)/ρg"),
            ("R_p0.2x", "R<sub>p0</sub>.2x"),
            ("legs=one_level", "legs=one_level"),
            ("rel_tol 1e-9", "rel_tol 1e-9"),
            ("p_b1_x", "p_b1_x"),
            ("x2_a and _a and a_ and a_b_c", "x2_a and _a and a_ and a_b_c"),
            ("T_up < T_down", "T<sub>up</sub> &lt; T<sub>down</sub>"),
            ("no symbol here", "no symbol here"),
        ];
        for (text, html) in cases {
            assert_eq!(escape_symbols(text), html, "{text}");
        }
    }

    fn assets() -> PageAssets {
        PageAssets {
            stylesheet: "style.00aa11bb.css".into(),
            script: "app.22cc33dd.js".into(),
            glue: "fluxledger_wasm.44ee55ff.js".into(),
            wasm: "fluxledger_wasm.66aa77bb.wasm".into(),
            inline_style: String::new(),
            screen_stylesheet: String::new(),
            head_script: String::new(),
            theme_colour: "#1f4e5f".into(),
            version: "0.1.0".into(),
        }
    }

    fn spec(key: &'static str, group: &'static str, title: &'static str) -> CalculatorSpec {
        CalculatorSpec {
            key,
            title,
            group,
            summary: "Forces <on> a \"fitting\" & more.",
            fields: Vec::new(),
            outputs: Vec::new(),
            cautions: vec!["Check the <block> & soil."],
        }
    }

    #[test]
    fn escape_covers_markup_and_both_quotes() {
        assert_eq!(
            escape(r#"<a href="x" title='y'>&</a>"#),
            "&lt;a href=&quot;x&quot; title=&#39;y&#39;&gt;&amp;&lt;/a&gt;"
        );
    }

    #[test]
    fn calculator_page_has_the_frame_the_script_and_tests_rely_on() {
        let page = calculator_page(&spec("bend", "Pipe fittings", "Bend"), "<p>note</p>\n", None, &assets());
        for needle in [
            "<body data-calculator=\"bend\"",
            "<section id=\"calculator\"",
            "<noscript>",
            "<script type=\"module\" src=\"app.22cc33dd.js\"></script>",
            "<link rel=\"stylesheet\" href=\"style.00aa11bb.css\">",
            "<link rel=\"manifest\" href=\"manifest.webmanifest\">",
            "<meta name=\"theme-color\" content=\"#1f4e5f\">",
            "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">",
            "<meta name=\"referrer\" content=\"no-referrer\">",
            "script-src &#39;self&#39; &#39;wasm-unsafe-eval&#39;",
            "<a class=\"site-name\" href=\"index.html\">",
            "<p>note</p>",
            "Fluxledger 0.1.0",
            "<link rel=\"modulepreload\" href=\"app.22cc33dd.js\">",
            "<link rel=\"modulepreload\" href=\"fluxledger_wasm.44ee55ff.js\">",
            "<link rel=\"preload\" href=\"fluxledger_wasm.66aa77bb.wasm\" as=\"fetch\" type=\"application/wasm\" crossorigin>",
        ] {
            assert!(page.contains(needle), "missing {needle}:\n{page}");
        }
        assert!(!page.contains(" style="), "no inline styles under the CSP");
    }

    #[test]
    fn a_split_page_keeps_screen_rules_then_print_rules_and_allows_both_styles() {
        let assets = PageAssets {
            inline_style: ".summary { margin: 0; }\n.ledger { width: 1px; }".into(),
            head_script: "go(\"app.22cc33dd.js\");".into(),
            ..assets()
        };
        let section = format!("<div class=\"headline\"></div>{DETAILS_START}<table class=\"ledger\"></table></div>");
        let page = calculator_page(&spec("bend", "Pipe fittings", "Bend"), "", Some(&section), &assets);
        let head = &page[..page.find("</head>").expect("a head")];
        assert!(head.contains("<style>.summary { margin: 0; }</style>"), "{head}");
        assert!(
            !head.contains("media=\"print\""),
            "the print rules follow every screen rule: {head}"
        );
        let later = "<style>.ledger { width: 1px; }</style><link rel=\"stylesheet\" href=\"style.00aa11bb.css\" media=\"print\">";
        let at = page.find(later).unwrap_or_else(|| panic!("{page}"));
        assert_eq!(page[at + later.len()..].find(DETAILS_START), Some(0), "{page}");
        let policy = csp(
            &[".summary { margin: 0; }", ".ledger { width: 1px; }"],
            "go(\"app.22cc33dd.js\");",
        );
        assert!(page.contains(&escape(&policy)), "{page}");
        assert_eq!(policy.matches("'sha256-").count(), 3, "{policy}");
    }

    #[test]
    fn inline_style_and_script_are_allowed_by_their_hashes_only() {
        let assets = PageAssets {
            inline_style: "body { color: red; }".into(),
            head_script: "go(\"app.22cc33dd.js\");".into(),
            ..assets()
        };
        let page = calculator_page(&spec("bend", "Pipe fittings", "Bend"), "", None, &assets);
        assert!(page.contains("<style>body { color: red; }</style>"));
        assert!(page.contains("<link rel=\"stylesheet\" href=\"style.00aa11bb.css\" media=\"print\">"));
        assert!(page.contains("<script>go(\"app.22cc33dd.js\");</script>"));
        assert!(!page.contains("modulepreload"), "the head script requests the modules");
        assert!(!page.contains("unsafe-inline"));
        // SHA-256 of the texts, computed independently (Python hashlib, base64):
        // "body { color: red; }" and "go(\"app.22cc33dd.js\");".
        let policy = csp(&["body { color: red; }"], "go(\"app.22cc33dd.js\");");
        assert!(page.contains(&escape(&policy)));
        assert!(
            policy.contains("style-src 'self' 'sha256-XeYlw2NVzOfB1UCIJqCyGr+0n7bA4fFslFpvKu84IAw='"),
            "{policy}"
        );
        assert!(
            policy.contains("'wasm-unsafe-eval' 'sha256-DGDfJuHBHrBcjN/CrHl11O76Im1PxekNTwcwkJr+Pp4='"),
            "{policy}"
        );
        // The contents page has no inline script: its policy allows none.
        let contents = contents_page(&[], &assets);
        assert!(contents.contains("<script type=\"module\" src=\"app.22cc33dd.js\"></script>"));
        assert!(
            !contents.contains("'sha256-DGDfJuHBHrBcjN/CrHl11O76Im1PxekNTwcwkJr+Pp4='")
                && !contents.contains("&#39;sha256-DGDfJuHBHrBcjN/CrHl11O76Im1PxekNTwcwkJr+Pp4=")
        );
    }

    #[test]
    fn method_heading_comes_from_the_note_or_the_page_never_both() {
        let own = calculator_page(
            &spec("bend", "Pipe fittings", "Bend"),
            "<h2>Method</h2>\n<p>x</p>\n",
            None,
            &assets(),
        );
        assert_eq!(own.matches(">Method</h2>").count(), 1, "{own}");
        let bare = calculator_page(&spec("bend", "Pipe fittings", "Bend"), "<p>x</p>\n", None, &assets());
        assert!(bare.contains("<h2 id=\"method-title\">Method</h2>"), "{bare}");
    }

    #[test]
    fn a_note_is_split_after_its_first_section_and_the_rest_has_its_own_page() {
        let note = "<h2>What</h2>\n<p>$$</p>\n<h2>1. More</h2>\n<p>b</p>\n<h2>Sources</h2>\n";
        assert_eq!(
            split_note(note),
            (
                "<h2>What</h2>\n<p>$$</p>\n",
                "<h2>1. More</h2>\n<p>b</p>\n<h2>Sources</h2>\n"
            )
        );
        assert_eq!(split_note("<p>a</p>\n<h2>B</h2>\n"), ("<p>a</p>\n", "<h2>B</h2>\n"));
        assert_eq!(
            split_note("<h2>Only</h2>\n<p>a</p>\n"),
            ("<h2>Only</h2>\n<p>a</p>\n", "")
        );
        assert_eq!(split_note(""), ("", ""));
        let bend = spec("bend", "Pipe fittings", "Bend");
        let page = calculator_page(&bend, note, None, &assets());
        assert!(page.contains("<p>$$</p>") && !page.contains("<p>b</p>"), "{page}");
        assert!(
            page.contains("<p class=\"note-more\"><a href=\"bend-method.html\">"),
            "{page}"
        );
        let whole = method_page(&bend, note, &assets()).expect("a note of three sections");
        // The method page's article opens as the calculator page's does, then the
        // whole note: the script skips the children both share.
        let article = |html: &str| html.split("<article").nth(1).map(str::to_string).unwrap_or_default();
        assert!(
            article(&whole).starts_with(&article(&page)[..article(&page).find("<p class=\"note-more\"").unwrap_or(0)])
        );
        assert!(whole.contains("<p>b</p>") && whole.contains("<h2>Sources</h2>"));
        assert!(whole.contains("href=\"bend.html\""), "links back to the calculator");
        assert!(whole.contains("id=\"cautions\""), "shows the cautions");
        assert!(method_page(&bend, "<h2>Only</h2>\n<p>a</p>\n", &assets()).is_none());
        // With the screen rules as a file, the note page links them (and the print
        // rules for print) rather than inlining them; the calculator page inlines.
        let split = PageAssets {
            inline_style: "main { margin: 0; }".into(),
            screen_stylesheet: "screen.99aa99aa.css".into(),
            ..assets()
        };
        let linked = method_page(&bend, note, &split).expect("a note page");
        assert!(!linked.contains("<style>"), "{linked}");
        assert!(linked.contains("<link rel=\"stylesheet\" href=\"screen.99aa99aa.css\">"));
        assert!(linked.contains("<link rel=\"stylesheet\" href=\"style.00aa11bb.css\" media=\"print\">"));
        assert!(calculator_page(&bend, note, None, &split).contains("<style>main { margin: 0; }</style>"));
        let single = calculator_page(&bend, "<h2>Only</h2>\n<p>a</p>\n", None, &assets());
        assert!(!single.contains("note-more"));
    }

    #[test]
    fn cautions_list_common_then_page_cautions_escaped() {
        let bend = spec("bend", "Pipe fittings", "Bend");
        let page = calculator_page(&bend, "", None, &assets());
        let common = common_cautions(&bend).next().expect("a shared caution on every page");
        let first_common = page.find(&escape(common)).expect("common caution shown");
        let own = page
            .find("Check the &lt;block&gt; &amp; soil.")
            .expect("page caution shown, escaped");
        assert!(first_common < own);
        assert!(page.contains("id=\"cautions\""));
        assert!(!page.contains("<block>"));
    }

    #[test]
    fn contents_groups_in_first_appearance_order_with_links() {
        let specs = [
            spec("bend", "Pipe fittings", "Bend"),
            spec("jet-plate", "Jets", "Jet on a plate"),
            spec("reducer", "Pipe fittings", "Reducer"),
        ];
        let page = contents_page(&specs, &assets());
        let fittings = page.find(">Pipe fittings</h2>").expect("group heading");
        let jets = page.find(">Jets</h2>").expect("group heading");
        assert!(fittings < jets);
        let bend = page.find("href=\"bend.html\"").expect("link");
        let reducer = page.find("href=\"reducer.html\"").expect("link");
        assert!(bend < reducer && reducer < jets, "both fittings before the jets group");
        assert!(page.contains("Forces &lt;on&gt; a &quot;fitting&quot; &amp; more."));
        assert_eq!(page.matches("class=\"contents-group\"").count(), 2);
    }

    #[test]
    fn contents_page_without_calculators_still_renders() {
        let page = contents_page(&[], &assets());
        assert!(page.contains("No calculators are published in this build yet."));
        assert!(page.contains("<body data-page=\"contents\">"));
        assert!(page.trim_end().ends_with("</html>"));
    }
}
