//! The stylesheet split at a calculator page's first screen: the rules that can
//! match something the page shows before its result's details go in the head, the
//! rest in a second `<style>` element where the details begin.
//!
//! Why: on a phone's first visit the browser parses the whole head before it paints
//! anything, and the screen rules were the most expensive part of it (about 115 ms
//! of a 4× throttled processor for 20 kB of rules, measured in a DevTools trace of
//! `bend.html`, issue 9). The first screen (site header, title, toolbar, headline,
//! inputs and cautions) needs about half of them; the rules of the tables, figures,
//! plots, method note, sheet and comparison are parsed with the part of the page
//! that uses them.
//!
//! The cascade is unchanged. The stylesheet is cut into top-level units (a rule, or
//! a whole at-rule block); a unit goes to the head when one of its selectors may
//! match the first screen: every class, id and attribute name the selector requires
//! (outside functional pseudo-classes such as `:not()` and `:has()`, which are
//! ignored, so that the test errs towards the head) occurs in the first screen's
//! markup or is a class the inline head script adds. At-rules without selectors
//! (`@font-face`, `@keyframes`, `@page`) go to the head. The second element holds
//! every unit from the first one left out of the head to the end, the later head
//! units included again, in their order: the last occurrence of each rule is then
//! in the original order, so any element gets the declarations it got from the one
//! stylesheet. The first screen never waits for a rule it needs, and its rules
//! repeated later change no value (no layout shift).

use std::collections::BTreeSet;

/// Class, id and attribute names that occur in a piece of markup.
#[derive(Debug, Default)]
pub struct Names {
    classes: BTreeSet<String>,
    ids: BTreeSet<String>,
    attributes: BTreeSet<String>,
}

impl Names {
    /// The names in `html` (markup written by the site tool: attribute values in
    /// double quotes), plus `extra_classes` (classes a script adds before the page
    /// is parsed).
    pub fn of_markup(html: &str, extra_classes: &[String]) -> Names {
        let mut names = Names::default();
        names.classes.extend(extra_classes.iter().cloned());
        let mut rest = html;
        while let Some(open) = rest.find('<') {
            rest = &rest[open + 1..];
            if !rest.starts_with(|c: char| c.is_ascii_alphabetic()) {
                continue;
            }
            // The tag's name, then its attributes up to `>`.
            let name_end = rest
                .find(|c: char| c.is_ascii_whitespace() || c == '>' || c == '/')
                .unwrap_or(rest.len());
            rest = &rest[name_end..];
            loop {
                rest = rest.trim_start_matches(|c: char| c.is_ascii_whitespace() || c == '/');
                if rest.is_empty() || rest.starts_with('>') {
                    break;
                }
                let end = rest
                    .find(|c: char| c.is_ascii_whitespace() || c == '=' || c == '>' || c == '/')
                    .unwrap_or(rest.len());
                let attribute = rest[..end].to_ascii_lowercase();
                rest = &rest[end..];
                let mut value = "";
                if let Some(after) = rest.strip_prefix('=') {
                    if let Some(quoted) = after.strip_prefix('"') {
                        let close = quoted.find('"').unwrap_or(quoted.len());
                        value = &quoted[..close];
                        rest = &quoted[(close + 1).min(quoted.len())..];
                    } else {
                        let close = after
                            .find(|c: char| c.is_ascii_whitespace() || c == '>')
                            .unwrap_or(after.len());
                        value = &after[..close];
                        rest = &after[close..];
                    }
                }
                match attribute.as_str() {
                    "class" => names.classes.extend(value.split_ascii_whitespace().map(String::from)),
                    "id" => {
                        names.ids.insert(value.to_string());
                    }
                    _ => {}
                }
                names.attributes.insert(attribute);
            }
        }
        names
    }

    /// Whether `selector` (one complex selector, no commas) may match an element
    /// of this markup: every name it requires outside parentheses is present.
    fn may_match(&self, selector: &str) -> bool {
        let bytes = selector.as_bytes();
        let mut depth = 0usize;
        let mut i = 0;
        while i < bytes.len() {
            match bytes[i] {
                b'(' => depth += 1,
                b')' => depth = depth.saturating_sub(1),
                b'\\' => i += 1,
                marker @ (b'.' | b'#' | b'[') if depth == 0 => {
                    let start = i + 1;
                    let mut end = start;
                    while end < bytes.len() && (bytes[end].is_ascii_alphanumeric() || matches!(bytes[end], b'-' | b'_'))
                    {
                        end += 1;
                    }
                    let name = &selector[start..end];
                    let present = match marker {
                        b'.' => self.classes.contains(name),
                        b'#' => self.ids.contains(name),
                        _ => self.attributes.contains(&name.to_ascii_lowercase()),
                    };
                    if !name.is_empty() && !present {
                        return false;
                    }
                    if marker == b'[' {
                        // Past the attribute's value (which may hold `.` or `#`).
                        end = selector[end..].find(']').map_or(bytes.len(), |at| end + at + 1);
                    }
                    i = end;
                    continue;
                }
                _ => {}
            }
            i += 1;
        }
        true
    }
}

/// The top-level units of a stylesheet (rules and at-rule blocks, each with its
/// braces), in order. Strings and comments are skipped when matching braces.
pub(crate) fn units(css: &str) -> Vec<&str> {
    let bytes = css.as_bytes();
    let mut out = Vec::new();
    let (mut depth, mut start, mut i) = (0usize, 0usize, 0usize);
    while i < bytes.len() {
        match bytes[i] {
            b'/' if bytes.get(i + 1) == Some(&b'*') => {
                i = css[i + 2..].find("*/").map_or(bytes.len(), |e| i + 2 + e + 2);
                continue;
            }
            quote @ (b'"' | b'\'') => {
                i += 1;
                while i < bytes.len() && bytes[i] != quote {
                    i += if bytes[i] == b'\\' { 2 } else { 1 };
                }
            }
            b'{' => depth += 1,
            b'}' => {
                depth = depth.saturating_sub(1);
                if depth == 0 {
                    out.push(css[start..=i].trim());
                    start = i + 1;
                }
            }
            // A statement at-rule (`@import …;`) is a unit of its own.
            b';' if depth == 0 => {
                out.push(css[start..=i].trim());
                start = i + 1;
            }
            _ => {}
        }
        i += 1;
    }
    let tail = css[start.min(css.len())..].trim();
    if !tail.is_empty() {
        out.push(tail);
    }
    out.retain(|unit| !unit.is_empty());
    out
}

/// The selector lists of a unit: its prelude for a rule, the preludes of its
/// nested rules for a conditional at-rule block; `None` for an at-rule whose
/// content is not selected by selectors (`@font-face`, `@keyframes`, `@page`).
fn selector_lists(unit: &str) -> Option<Vec<&str>> {
    let open = unit.find('{')?;
    let prelude = unit[..open].trim();
    if !prelude.starts_with('@') {
        return Some(vec![prelude]);
    }
    let conditional = ["@media", "@supports", "@container", "@layer"]
        .iter()
        .any(|at| prelude.starts_with(at));
    if !conditional {
        return None;
    }
    let inner = &unit[open + 1..unit.rfind('}').unwrap_or(unit.len())];
    let mut lists = Vec::new();
    for nested in units(inner) {
        match selector_lists(nested) {
            Some(mut more) => lists.append(&mut more),
            None => return None,
        }
    }
    Some(lists)
}

fn needed_by(unit: &str, first_screen: &Names) -> bool {
    match selector_lists(unit) {
        None => true,
        Some(lists) => lists
            .iter()
            .flat_map(|list| list.split(','))
            .any(|selector| first_screen.may_match(selector.trim())),
    }
}

/// Splits the screen rules `css` into the rules for the head and the rules for
/// the second element (empty when the first screen needs every unit); see the
/// module docs for the rule and why the cascade is unchanged.
pub fn split(css: &str, first_screen: &Names) -> (String, String) {
    let units = units(css);
    let needed: Vec<bool> = units.iter().map(|unit| needed_by(unit, first_screen)).collect();
    let Some(first_later) = needed.iter().position(|n| !n) else {
        return (css.to_string(), String::new());
    };
    let head: Vec<&str> = units
        .iter()
        .zip(&needed)
        .filter(|(_, needed)| **needed)
        .map(|(unit, _)| *unit)
        .collect();
    (head.join("\n"), units[first_later..].join("\n"))
}

/// The classes the inline head script adds (`classList.add("name")` in its
/// text), which the first screen may carry before the page is parsed.
pub fn classes_added_by(script: &str) -> Vec<String> {
    let mut classes = Vec::new();
    let mut rest = script;
    while let Some(at) = rest.find("classList.add(") {
        rest = &rest[at + "classList.add(".len()..];
        let close = rest.find(')').unwrap_or(rest.len());
        for argument in rest[..close].split(',') {
            let name = argument.trim().trim_matches(|c| c == '"' || c == '\'');
            if !name.is_empty() {
                classes.push(name.to_string());
            }
        }
    }
    classes
}

#[cfg(test)]
mod tests {
    use super::*;

    const CSS: &str = concat!(
        ":root { --a: 1; }\n",
        ".headline { color: red; }\n",
        ".ledger td { padding: 0; }\n",
        "html.has-query [data-demo] { visibility: hidden; }\n",
        ".field:not(.hidden) { margin: 0; }\n",
        "[aria-invalid=\"true\"] { border-color: red; }\n",
        ".x[data-kind=\"a.b\"] { top: 0; }\n",
        "@media (min-width: 60rem) { .ledger { width: 1px; } .headline { top: 0; } }\n",
        "@media (min-width: 70rem) { .figure { width: 1px; } }\n",
        "@keyframes spin { from { opacity: 0; } }\n",
        ".output { content: \"}\"; }\n",
    );

    fn first_screen() -> Names {
        Names::of_markup(
            "<html lang=\"en\"><div class=\"headline output\" data-demo inert><div class=\"field\" data-field=\"p\">",
            &["has-query".to_string()],
        )
    }

    #[test]
    fn markup_names_come_from_classes_ids_and_attributes() {
        let names = Names::of_markup("<p class=\"a b\" id=\"c\" data-x hidden><input value=\"<.z>\">", &[]);
        assert!(names.classes.contains("a") && names.classes.contains("b"));
        assert!(names.ids.contains("c"));
        assert!(names.attributes.contains("data-x") && names.attributes.contains("hidden"));
        assert!(!names.classes.contains("z"));
    }

    #[test]
    fn head_gets_what_the_first_screen_may_use_and_later_keeps_the_order() {
        let (head, later) = split(CSS, &first_screen());
        for needed in [
            ":root",
            ".headline { color",
            "html.has-query",
            ".field:not(.hidden)",
            "@media (min-width: 60rem)",
            "@keyframes",
            ".output",
        ] {
            assert!(head.contains(needed), "{needed} missing from the head:\n{head}");
        }
        for left in [
            ".ledger td",
            "[aria-invalid",
            ".x[data-kind",
            "@media (min-width: 70rem)",
        ] {
            assert!(!head.contains(left), "{left} in the head:\n{head}");
            assert!(later.contains(left), "{left} missing later:\n{later}");
        }
        // From the first unit left out to the end, head units again, in order.
        assert!(later.starts_with(".ledger td"), "{later}");
        let order = [
            "html.has-query",
            ".field:not",
            "[aria-invalid",
            "@media (min-width: 60rem)",
            ".output",
        ];
        let at: Vec<usize> = order.iter().map(|o| later.find(o).expect(o)).collect();
        assert!(at.windows(2).all(|w| w[0] < w[1]), "{later}");
        assert!(!later.contains(".headline { color"));
    }

    #[test]
    fn every_unit_needed_leaves_nothing_for_later() {
        let (head, later) = split(".headline { a: b; }\n.output { c: d; }", &first_screen());
        assert!(later.is_empty());
        assert!(head.contains(".output"));
    }

    #[test]
    fn classes_of_the_head_script() {
        let script = "if (q) { root.classList.add(\"has-query\"); } x.classList.add('a', \"b\");";
        assert_eq!(classes_added_by(script), ["has-query", "a", "b"]);
    }
}
