//! Method notes: Markdown with LaTeX math, rendered to HTML with MathML at build
//! time, so pages need no math library at run time.
//!
//! Markdown is read by `pulldown-cmark` with its math extension (`$...$` inline,
//! `$$...$$` display); each formula is converted by `pulldown-latex` to MathML Core,
//! which browsers render natively. A formula the converter cannot read is a build
//! error naming the note and the formula, never red text on a page.
//!
//! Two adjustments keep notes inside the page's frame:
//! - headings are shifted so that the note's top level becomes `<h2>` (whether
//!   the note starts at `#` or `##`), because the page title is the one `<h1>`;
//!   a note that opens with a heading gets no extra "Method" heading from the page;
//! - the no-break space of `\ ` and `~`, which pulldown-latex 0.8 writes as
//!   escaped entity text, is written as a real no-break space;
//! - `style="..."` attributes that the converter writes for a few rare constructs
//!   (negative spaces, coloured text) are dropped, since the page's content security
//!   policy (`style-src 'self'`) would block them and log an error. Raw HTML in a
//!   note must not contain scripts or inline styles either; that is a build error.

use std::path::Path;

use pulldown_cmark::{CowStr, Event, HeadingLevel, Options, Parser, Tag, TagEnd};
use pulldown_latex::config::DisplayMode;
use pulldown_latex::{RenderConfig, Storage};

use crate::error::SiteError;

/// Renders a Markdown method note to an HTML fragment. `path` is used in errors.
///
/// # Errors
/// A formula that does not parse, or raw HTML with a script or inline style.
pub fn render_note(markdown: &str, path: &Path) -> Result<String, SiteError> {
    let options =
        Options::ENABLE_MATH | Options::ENABLE_TABLES | Options::ENABLE_FOOTNOTES | Options::ENABLE_STRIKETHROUGH;
    // The note's top heading level becomes <h2> (the page title is the one <h1>).
    let top_level = Parser::new_ext(markdown, options)
        .filter_map(|event| match event {
            Event::Start(Tag::Heading { level, .. }) => Some(level as usize),
            _ => None,
        })
        .min()
        .unwrap_or(1);
    let mut events = Vec::new();
    let mut in_code_block = false;
    for (event, range) in Parser::new_ext(markdown, options).into_offset_iter() {
        let event = match event {
            Event::Start(Tag::CodeBlock(kind)) => {
                in_code_block = true;
                Event::Start(Tag::CodeBlock(kind))
            }
            Event::End(TagEnd::CodeBlock) => {
                in_code_block = false;
                Event::End(TagEnd::CodeBlock)
            }
            Event::Text(text)
                if !in_code_block
                    && text.contains('$')
                    && has_unescaped_dollar(with_previous_char(markdown, range.clone())) =>
            {
                let line = markdown[..range.start].lines().count().max(1);
                return Err(SiteError::content(
                    path,
                    format!(
                        "line {line}: a `$` outside a formula (an unclosed or unbalanced formula?); \
                         write `\\$` for a dollar sign: {}",
                        text.trim()
                    ),
                ));
            }
            Event::InlineMath(tex) => Event::InlineHtml(CowStr::from(latex_to_mathml(&tex, false, path)?)),
            Event::DisplayMath(tex) => Event::Html(CowStr::from(latex_to_mathml(&tex, true, path)?)),
            Event::Html(html) | Event::InlineHtml(html) if blocked_markup(&html) => {
                return Err(SiteError::content(
                    path,
                    format!("raw HTML with a script, an event handler or an inline style is not allowed in a method note: {}", html.trim()),
                ));
            }
            Event::Start(Tag::Heading {
                level,
                id,
                classes,
                attrs,
            }) => Event::Start(Tag::Heading {
                level: shift(level, top_level),
                id,
                classes,
                attrs,
            }),
            Event::End(TagEnd::Heading(level)) => Event::End(TagEnd::Heading(shift(level, top_level))),
            other => other,
        };
        events.push(event);
    }
    let mut html = String::new();
    pulldown_cmark::html::push_html(&mut html, events.into_iter());
    Ok(html)
}

/// The source of an event with the character before it (which may be the
/// backslash that escaped a leading `$`).
fn with_previous_char(source: &str, range: std::ops::Range<usize>) -> &str {
    let start = source[..range.start]
        .char_indices()
        .next_back()
        .map(|(i, _)| i)
        .unwrap_or(range.start);
    &source[start..range.end]
}

/// Whether Markdown source has a `$` not escaped by a backslash.
fn has_unescaped_dollar(source: &str) -> bool {
    let mut escaped = false;
    for ch in source.chars() {
        match ch {
            '\\' => escaped = !escaped,
            '$' if !escaped => return true,
            _ => escaped = false,
        }
    }
    false
}

/// Moves a heading so that the note's `top` level becomes level 2.
fn shift(level: HeadingLevel, top: usize) -> HeadingLevel {
    match (level as usize + 2).saturating_sub(top).clamp(2, 6) {
        2 => HeadingLevel::H2,
        3 => HeadingLevel::H3,
        4 => HeadingLevel::H4,
        5 => HeadingLevel::H5,
        _ => HeadingLevel::H6,
    }
}

/// Whether raw HTML would run script or use inline styles (blocked by the CSP).
fn blocked_markup(html: &str) -> bool {
    let lower = html.to_ascii_lowercase();
    if lower.contains("<script") || lower.contains("style=") || lower.contains("javascript:") {
        return true;
    }
    // An event-handler attribute: whitespace, `on`, letters, `=`.
    let bytes = lower.as_bytes();
    bytes.windows(3).enumerate().any(|(i, w)| {
        w[0].is_ascii_whitespace() && w[1] == b'o' && w[2] == b'n' && {
            let rest = &bytes[i + 3..];
            let letters = rest.iter().take_while(|b| b.is_ascii_alphabetic()).count();
            letters > 0 && rest[letters..].iter().find(|b| !b.is_ascii_whitespace()) == Some(&b'=')
        }
    })
}

/// Converts one LaTeX formula to a `<math>` element.
///
/// # Errors
/// When the formula does not parse; the message names the note and the formula.
pub fn latex_to_mathml(tex: &str, display: bool, path: &Path) -> Result<String, SiteError> {
    if let Some(entity) = html_entity(tex) {
        return Err(SiteError::content(
            path,
            format!(
                "the formula `{}` contains the HTML entity `{entity}`, which a formula shows literally; \
                 use `\\,` or `~` for a space",
                tex.trim()
            ),
        ));
    }
    let storage = Storage::new();
    let events: Vec<_> = pulldown_latex::Parser::new(tex, &storage).collect();
    if let Some(Err(error)) = events.iter().find(|e| e.is_err()) {
        return Err(SiteError::content(
            path,
            format!("cannot convert the formula `{}` to MathML: {error}", tex.trim()),
        ));
    }
    let config = RenderConfig {
        display_mode: if display {
            DisplayMode::Block
        } else {
            DisplayMode::Inline
        },
        ..RenderConfig::default()
    };
    let mut mathml = String::new();
    pulldown_latex::push_mathml(&mut mathml, events.into_iter(), config)
        .map_err(|e| SiteError::content(path, format!("cannot write MathML for `{}`: {e}", tex.trim())))?;
    // pulldown-latex 0.8 writes the no-break space of `\ `, `~` and
    // `\nobreakspace` as an escaped entity (`&amp;nbsp;`), which a page would show
    // as text; it means a no-break space.
    let mathml = strip_style_attributes(&mathml).replace("&amp;nbsp;", "&#160;");
    // A display formula wider than a phone scrolls sideways (with the paragraph
    // that holds it); it takes the keyboard's focus so that it can be scrolled
    // without a pointer (WCAG 2.2 SC 2.1.1), as the result tables' boxes do.
    Ok(match (display, mathml.strip_prefix("<math")) {
        (true, Some(rest)) => format!("<math tabindex=\"0\"{rest}"),
        _ => mathml,
    })
}

/// The first `&name;` or `&#...;` HTML entity in a formula, if any.
fn html_entity(tex: &str) -> Option<&str> {
    tex.match_indices('&').find_map(|(start, _)| {
        let rest = &tex[start + 1..];
        let end = rest.find(';')?;
        let name = &rest[..end];
        let is_entity = !name.is_empty()
            && (name.chars().all(|c| c.is_ascii_alphanumeric()) || name.starts_with('#'))
            && name.len() <= 10;
        is_entity.then(|| &tex[start..start + end + 2])
    })
}

/// Removes every ` style="..."` attribute from generated markup.
fn strip_style_attributes(markup: &str) -> String {
    const ATTR: &str = " style=\"";
    let mut out = String::with_capacity(markup.len());
    let mut rest = markup;
    while let Some(start) = rest.find(ATTR) {
        out.push_str(&rest[..start]);
        let after = &rest[start + ATTR.len()..];
        match after.find('"') {
            Some(end) => rest = &after[end + 1..],
            None => {
                rest = "";
            }
        }
    }
    out.push_str(rest);
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    fn render(md: &str) -> String {
        render_note(md, Path::new("note.md")).unwrap_or_else(|e| panic!("{e}"))
    }

    #[test]
    fn inline_and_display_math_become_mathml() {
        let html = render("Force $F = \\dot{m} V$ on the bend.\n\n$$\\vec F = \\sum \\dot m \\vec V$$\n");
        assert!(html.contains("<math"), "{html}");
        assert!(html.contains("display=\"block\""), "{html}");
        assert!(!html.contains('$'), "{html}");
        // Only the display formula is a keyboard stop.
        assert_eq!(html.matches("<math").count(), 2, "{html}");
        assert_eq!(html.matches("<math tabindex=\"0\"").count(), 1, "{html}");
        let display = &html[html.find("<math tabindex").unwrap_or(0)..];
        assert!(
            display.split('>').next().unwrap_or("").contains("display=\"block\""),
            "{html}"
        );
        assert!(html.contains("<mover"), "dot and vec accents: {html}");
    }

    #[test]
    fn every_construct_the_notes_use_converts() {
        let formulas = [
            r"\frac{\pi D^2}{4}",
            r"\sqrt{2 g h}",
            r"p_1 A_1 - p_2 A_2 \cos\theta",
            r"\alpha \beta \gamma \Delta \theta \rho \omega \Omega",
            r"\rho Q \cdot V",
            r"\vec{F}_R",
            r"\sum_{i=1}^{n} \dot{m}_i",
            r"\left( \frac{a}{b} \right)",
            r"\sin\theta + \cos\theta + \tan\theta",
            r"\Delta p = f \frac{L}{D} \frac{\rho V^2}{2}",
            r"\text{thrust} = 2 p A \sin\frac{\theta}{2}",
            r"\frac{1}{\sqrt{f}} = -2 \log_{10}\left(\frac{\varepsilon/D}{3.7} + \frac{2.51}{\mathrm{Re}\sqrt{f}}\right)",
        ];
        for tex in formulas {
            let mathml = latex_to_mathml(tex, true, Path::new("note.md")).unwrap_or_else(|e| panic!("{e}"));
            assert!(mathml.starts_with("<math"), "{tex}: {mathml}");
            assert!(!mathml.contains("merror"), "{tex}: {mathml}");
            assert!(!mathml.contains("style="), "{tex}: {mathml}");
        }
    }

    #[test]
    fn a_bad_formula_is_an_error_naming_note_and_formula() {
        let error = render_note("Fine $a$, broken: $\\frac{1}$ here.", Path::new("site/notes/bend.md"))
            .map(|_| ())
            .map_err(|e| e.to_string());
        let message = error.err().unwrap_or_default();
        assert!(message.contains("site/notes/bend.md"), "{message}");
        assert!(message.contains("\\frac{1}"), "{message}");
    }

    #[test]
    fn an_unclosed_formula_is_an_error_and_an_escaped_dollar_is_text() {
        let message = render_note("Intro.\n\nUnbalanced: $\\frac{1}{$ here.", Path::new("n.md"))
            .err()
            .map(|e| e.to_string());
        assert!(message.as_deref().is_some_and(|m| m.contains("line 3")), "{message:?}");
        let html = render("Costs \\$5 per metre.\n\n```\n$ cargo run\n```\n");
        assert!(html.contains("Costs $5 per metre."), "{html}");
        assert!(html.contains("$ cargo run"), "{html}");
    }

    #[test]
    fn headings_move_down_one_level_and_text_is_escaped() {
        let html = render("# Method\n\n## Assumptions\n\nA < B & C\n");
        assert!(html.contains("<h2>Method</h2>"), "{html}");
        assert!(html.contains("<h3>Assumptions</h3>"), "{html}");
        assert!(html.contains("A &lt; B &amp; C"), "{html}");
    }

    #[test]
    fn scripts_handlers_and_inline_styles_in_raw_html_are_refused() {
        for bad in [
            "<script>alert(1)</script>\n",
            "<p style=\"color:red\">x</p>\n",
            "text <img src=x onerror=alert(1)> more\n",
            "<a href=\"javascript:void(0)\">x</a>\n",
        ] {
            assert!(render_note(bad, Path::new("n.md")).is_err(), "{bad}");
        }
        assert!(render_note("<abbr title=\"one\">x</abbr> fine\n", Path::new("n.md")).is_ok());
    }

    #[test]
    fn html_entities_in_formulas_are_refused_but_alignment_ampersands_are_not() {
        let message = latex_to_mathml(r"A = 0.075&nbsp;m^2", false, Path::new("n.md"))
            .err()
            .map(|e| e.to_string());
        assert!(message.as_deref().is_some_and(|m| m.contains("&nbsp;")), "{message:?}");
        assert!(latex_to_mathml(
            r"\begin{aligned} a &= b \\ c &= d \end{aligned}",
            true,
            Path::new("n.md")
        )
        .is_ok());
    }

    #[test]
    fn a_note_whose_top_headings_are_level_two_keeps_them_at_level_two() {
        let html = render("## Method\n\ntext\n\n### Detail\n\n## Sources\n");
        assert!(html.starts_with("<h2>Method</h2>"), "{html}");
        assert!(
            html.contains("<h3>Detail</h3>") && html.contains("<h2>Sources</h2>"),
            "{html}"
        );
    }

    #[test]
    fn control_and_tie_spaces_are_no_break_spaces_not_entity_text() {
        for tex in [r"3.13\ \mathrm{m/s}", r"3.13~\mathrm{m/s}"] {
            let mathml = latex_to_mathml(tex, false, Path::new("n.md")).unwrap_or_else(|e| panic!("{e}"));
            assert!(!mathml.contains("&amp;"), "{tex}: {mathml}");
            assert!(mathml.contains("&#160;"), "{tex}: {mathml}");
        }
    }

    #[test]
    fn negative_space_style_is_dropped() {
        let mathml = latex_to_mathml(r"a \! b", false, Path::new("n.md")).unwrap_or_else(|e| panic!("{e}"));
        assert!(!mathml.contains("style="), "{mathml}");
        assert!(mathml.contains("<mspace"), "{mathml}");
    }
}
