//! The calculator section of each page, rendered at build time: the form with the
//! demo values, the demo result (headline, warnings, other results, tables,
//! diagrams and plots as inline SVG) computed by the core natively.
//!
//! Why: a phone's first visit used to show nothing until the wasm had arrived
//! (issue 9). The page now carries its demo result in the first response; the page
//! script takes over for edits and for links with a query.
//!
//! How: the core solves the demo request exactly as the page script would send it
//! (every field's demo text, each quantity field's default unit, the SI system), and
//! the result goes through the adapter's own wire view
//! (`fluxledger_wasm::view::solve_view`, serialised as JSON values, natively). The
//! markup below mirrors the page script's render functions in `site/assets/js/`
//! (`form.js`, `render-results.js`, `render-table.js`, `render-diagram.js`,
//! `render-plot.js`: same elements, classes and order), so that when the script re-renders the same
//! result nothing moves (no layout shift); the page's cautions box stands between
//! the form and the details, where `form.js` puts it. Figures are drawn for a phone: the width
//! and viewport height the script measures at 360 × 740 CSS px.
//!
//! Demo marking: the toolbar and the calculator's grid carry `data-demo`, and the
//! parts the script replaces are `inert` (the toolbar, the headline, the details).
//! The form is not: it takes typing from the first paint, and the page script
//! takes over what was typed (`typedBeforeTakeOver` in `main.js`); once something
//! is typed, `query.js` sets `is-editing` on `<html>` and the stylesheet hides the
//! demo result and says "computing…" until the script's own result replaces it.
//! The result heading says "demo values". A page opened with a
//! query must not show the demo as the link's result: the small classic script
//! `query.js` (loaded before the body) sets `has-query` on `<html>` when the address
//! has a query, and the stylesheet then hides every `[data-demo]` part and shows
//! "computing…" in its place until the script has the link's own result.

use serde_json::Value;

use fluxledger_core::calculators;
use fluxledger_core::catalog::{CalculatorSpec, Request};
use fluxledger_core::UnitSystem;
use fluxledger_wasm::view;

use crate::pages::{escape, escape_symbols};

/// The query key of the unit system in links (`SYSTEM_KEY` in `site/assets/js/url.js`).
const SYSTEM_KEY: &str = "system";

/// Width the page script gives figures on a 360 px wide phone (the details panel's
/// client width less the panel padding and border, as `measureFigureWidth` does).
pub const FIGURE_WIDTH: f64 = 310.0;
/// Viewport height the figures are laid out for (a 360 × 740 phone).
pub const VIEWPORT_HEIGHT: f64 = 740.0;

/// Plain names of the shape styles, for diagram legends (as in the page script).
fn style_name(style: &str) -> &str {
    match style {
        "restraint" => "Restraint: force the supports exert on the fitting",
        "thrust" => "Thrust: force the fluid exerts on the fitting",
        "pressure" => "Pressure force (gauge)",
        "momentum" => "Momentum flux",
        "weight" => "Weight",
        "velocity" => "Velocity",
        "flow" => "Flow direction",
        "control_volume" => "Control volume",
        "wall" => "Pipe or body",
        "fluid" => "Fluid",
        "guide" => "Guide line",
        other => other,
    }
}

// ---------------------------------------------------------------------------------
// Small helpers over JSON values.

fn text<'a>(value: &'a Value, key: &str) -> &'a str {
    value.get(key).and_then(Value::as_str).unwrap_or("")
}

fn list<'a>(value: &'a Value, key: &str) -> &'a [Value] {
    value
        .get(key)
        .and_then(Value::as_array)
        .map(Vec::as_slice)
        .unwrap_or(&[])
}

fn flag(value: &Value, key: &str) -> bool {
    value.get(key).and_then(Value::as_bool).unwrap_or(false)
}

fn number(value: &Value) -> Option<f64> {
    value.as_f64().filter(|n| n.is_finite())
}

fn pair(value: Option<&Value>) -> Option<[f64; 2]> {
    let items = value?.as_array()?;
    Some([number(items.first()?)?, number(items.get(1)?)?])
}

/// A number as JavaScript's `String(number)` writes it (shortest round trip).
pub fn js_number(n: f64) -> String {
    if n == 0.0 || !n.is_finite() {
        return if n.is_nan() {
            "NaN".into()
        } else if n == 0.0 {
            "0".into()
        } else {
            format!("{}Infinity", if n < 0.0 { "-" } else { "" })
        };
    }
    let abs = n.abs();
    if (1e-6..1e21).contains(&abs) {
        format!("{n}")
    } else {
        exponent_js(format!("{n:e}"))
    }
}

/// Resolution of the prerendered figures' coordinates, in screen pixels: far below
/// what a screen shows, and the page script redraws them at full precision.
pub const DRAWN_STEP_PX: f64 = 0.01;

/// `n` with as many decimals as a resolution of `step` needs (at least the
/// resolution, at most 15 decimals), trailing zeros dropped: the figures' numbers
/// are about a third of their bytes when written to 17 digits (issue 9). A step
/// that is not a positive finite number leaves `n` as JavaScript writes it.
pub fn rounded(n: f64, step: f64) -> String {
    if !n.is_finite() || !step.is_finite() || step <= 0.0 {
        return js_number(n);
    }
    let decimals = (-step.log10()).ceil().clamp(0.0, 15.0) as usize;
    let fixed = format!("{n:.decimals$}");
    let trimmed = if fixed.contains('.') {
        fixed.trim_end_matches('0').trim_end_matches('.')
    } else {
        fixed.as_str()
    };
    match trimmed {
        "-0" | "" => "0".to_string(),
        t => t.to_string(),
    }
}

/// Rust's `1.5e6` / `1.5e-7` as JavaScript writes them: `1.5e+6` / `1.5e-7`.
fn exponent_js(rust: String) -> String {
    match rust.split_once('e') {
        Some((mantissa, exp)) if !exp.starts_with('-') => format!("{mantissa}e+{exp}"),
        _ => rust,
    }
}

/// JavaScript's `Math.round`.
fn js_round(n: f64) -> f64 {
    (n + 0.5).floor()
}

/// An attribute list: ` name="value"` for each pair, values escaped.
fn attrs(pairs: &[(&str, String)]) -> String {
    pairs
        .iter()
        .map(|(name, value)| format!(" {name}=\"{}\"", escape(value)))
        .collect()
}

fn tag(name: &str, pairs: &[(&str, String)], inner: &str) -> String {
    format!("<{name}{}>{inner}</{name}>", attrs(pairs))
}

fn a(value: impl Into<String>) -> String {
    value.into()
}

// ---------------------------------------------------------------------------------
// The demo solve.

/// The request the page script sends for the demo: every field's demo text (empty
/// when it has none), each quantity field's default unit in `system` (as `request()`
/// in `site/assets/js/main.js` builds it).
pub fn demo_request(spec: &CalculatorSpec, system: UnitSystem) -> Request {
    let calculator = view::calculator_view(spec);
    let mut request = Request {
        system,
        ..Request::default()
    };
    for field in &calculator.fields {
        request.inputs.insert(field.key.to_string(), field.demo.to_string());
        if field.kind == "quantity" && !field.units.is_empty() {
            // The script's `defaultUnit`: the core's default for the system.
            let unit = match system {
                UnitSystem::UsCustomary => field.default_units.us,
                _ => field.default_units.si,
            };
            request.field_units.insert(field.key.to_string(), unit.to_string());
        }
    }
    request
}

/// The calculator section's inner HTML for the page's demo, or `None` when the
/// demo does not solve (the page then shows the script's own result only; the
/// tidy and fuzz tests make sure every demo solves).
pub fn calculator_section(spec: &CalculatorSpec) -> Option<String> {
    let system = UnitSystem::Si;
    let request = demo_request(spec, system);
    let outcome = calculators::solve(spec.key, &request);
    let solved = serde_json::to_value(view::solve_view(&outcome, Some(spec))).ok()?;
    if !flag(&solved, "ok") {
        return None;
    }
    let page_view = serde_json::to_value(view::page_view(calculators::CALCULATORS, spec.key)?).ok()?;
    let calculator = page_view.get("calculator")?;
    let page = Page {
        page: &page_view,
        spec: calculator,
        request: &request,
        result: &solved,
        system: system.key(),
        cautions: crate::pages::cautions_html(spec),
    };
    Some(page.render())
}

struct Page<'a> {
    /// The page's description, as `calculator(key)` gives it to the script.
    page: &'a Value,
    spec: &'a Value,
    request: &'a Request,
    result: &'a Value,
    system: &'a str,
    /// The cautions box (`pages::cautions_html`), placed beside the result as the
    /// script places it.
    cautions: String,
}

/// What the demo's toolbar carries: the marker and `inert` (its switch and buttons
/// work only with the page script).
const DEMO: &str = " data-demo inert";

impl Page<'_> {
    fn render(&self) -> String {
        let mut html = String::new();
        html.push_str(&self.toolbar());
        html.push_str("<div id=\"notices\" class=\"notices\" role=\"status\" aria-live=\"polite\"></div>\n");
        // The grid is marked, not inert: its form takes typing from the first paint
        // (the page script takes over what was typed); the parts the script
        // replaces are inert (the toolbar, the headline, the details).
        html.push_str("<div class=\"calc-grid\" data-demo>");
        html.push_str("<div class=\"calc-main\">");
        html.push_str(&self.headline());
        html.push_str(&self.form());
        html.push_str("</div>");
        html.push_str(&self.cautions);
        html.push_str(crate::pages::DETAILS_START);
        html.push_str(&self.details());
        html.push_str("</div>");
        html.push_str("</div>\n");
        html
    }

    fn toolbar(&self) -> String {
        let mut systems = String::from("<legend>Units</legend>");
        for system in list(self.page, "unit_systems") {
            let key = text(system, "key");
            let checked = if key == self.system { " checked" } else { "" };
            systems.push_str(&format!(
                "<label class=\"system-option\"><input type=\"radio\" name=\"unit-system\" value=\"{}\"{checked}><span>{}</span></label>",
                escape(key),
                escape(text(system, "label"))
            ));
        }
        format!(
            concat!(
                "<div class=\"toolbar\"{demo}>",
                "<fieldset class=\"system-switch\" aria-describedby=\"system-help\">{systems}</fieldset>",
                "<div class=\"toolbar-actions\"><button type=\"button\" class=\"button\" data-action=\"copy-link\">Copy link</button>",
                "<button type=\"button\" class=\"button\" data-action=\"print\">Print sheet</button>",
                "<span class=\"copy-status\" role=\"status\" aria-live=\"polite\"></span></div>",
                "<input type=\"text\" class=\"copy-field\" readonly aria-label=\"Link to this calculation\" hidden>",
                "<p id=\"system-help\" class=\"system-help\">Switching converts filled values; switching back restores them as typed.</p>",
                "<p class=\"system-status\" role=\"status\" aria-live=\"polite\"></p>",
                "</div>\n"
            ),
            demo = DEMO,
            systems = systems
        )
    }

    fn headline(&self) -> String {
        let mut values = String::new();
        for output in list(self.result, "outputs").iter().filter(|o| flag(o, "headline")) {
            values.push_str(&output_item(output));
        }
        let warnings = list(self.result, "warnings");
        let warning_list = if warnings.is_empty() {
            String::new()
        } else {
            let items: String = warnings
                .iter()
                .map(|w| format!("<li>{}</li>", escape_symbols(text(w, "message"))))
                .collect();
            format!("<ul class=\"warnings headline-warnings\" aria-label=\"Warnings\">{items}</ul>")
        };
        let class = if warnings.is_empty() {
            "headline"
        } else {
            "headline has-warnings"
        };
        format!(
            concat!(
                // Focusable: on a phone the box scrolls when its values outgrow a
                // quarter of the screen, and a keyboard must be able to scroll it.
                "<div class=\"{class}\" tabindex=\"0\" aria-live=\"polite\" aria-atomic=\"true\" inert>",
                "<h2 class=\"panel-title\">Result <span class=\"demo-note\">(demo values)</span>",
                "<span class=\"computing-note\">(computing the link’s values…)</span></h2>",
                "<dl class=\"headline-values\">{values}</dl>{warnings}</div>"
            ),
            class = class,
            values = values,
            warnings = warning_list
        )
    }

    fn value_of(&self, key: &str) -> &str {
        self.request.inputs.get(key).map(String::as_str).unwrap_or("")
    }

    /// Whether a field is shown: every condition of the core's chain holds (the
    /// script's `isVisible`).
    fn is_visible(&self, field: &Value) -> bool {
        list(field, "shown_when").iter().all(|rule| {
            let value = self.value_of(text(rule, "field"));
            list(rule, "values").iter().any(|v| v.as_str() == Some(value))
        })
    }

    fn form(&self) -> String {
        let mut html = String::from(
            "<form class=\"inputs\" novalidate aria-label=\"Inputs\"><h2 class=\"panel-title\">Inputs</h2>",
        );
        let echoes = list(self.result, "echoes");
        let warnings = list(self.result, "warnings");
        for field in list(self.spec, "fields") {
            // A field the demo hides is left out: the page script writes the whole
            // form, hidden fields included, when it takes over (the bytes of the
            // first response, issue 9); a choice made before then needs the script
            // anyway to show or hide fields.
            if !self.is_visible(field) {
                continue;
            }
            let key = text(field, "key");
            let label = text(field, "label");
            let id = format!("field-{key}");
            let typed = self.value_of(key);
            let echo = echoes.iter().find(|e| text(e, "field") == key);
            let is_quantity = text(field, "kind") == "quantity" && !list(field, "units").is_empty();
            let mut entry = String::new();
            let control_attrs = |extra: &[(&'static str, String)]| -> Vec<(&'static str, String)> {
                let mut pairs = vec![("id", id.clone()), ("name", a(key))];
                pairs.extend(extra.iter().cloned());
                pairs
            };
            let described_by = {
                let mut ids = Vec::new();
                if !text(field, "help").is_empty() {
                    ids.push(format!("{id}-help"));
                }
                ids.push(format!("{id}-error"));
                ids.push(format!("{id}-warning"));
                ids.join(" ")
            };
            match text(field, "kind") {
                "choice" => {
                    let options = shown_option(list(field, "options"), "key", typed);
                    entry.push_str(&tag(
                        "select",
                        &control_attrs(&[("class", a("choice")), ("aria-describedby", described_by.clone())]),
                        &options,
                    ));
                }
                "text" => {
                    let lines = typed.split('\n').count();
                    let rows = (lines + 1).clamp(4, 14);
                    entry.push_str(&tag(
                        "textarea",
                        &control_attrs(&[
                            ("rows", rows.to_string()),
                            ("spellcheck", a("false")),
                            ("autocapitalize", a("off")),
                            ("autocomplete", a("off")),
                            ("aria-describedby", described_by.clone()),
                        ]),
                        // A newline right after <textarea> is dropped by the parser.
                        &format!("\n{}", escape(typed)),
                    ));
                }
                _ => {
                    // The script shows each quantity as the core read it: the number
                    // alone, its unit in the selector.
                    let (shown, unit) = match (is_quantity, echo) {
                        (true, Some(echo)) => (text(echo, "number"), text(echo, "unit")),
                        _ => (
                            typed,
                            self.request.field_units.get(key).map(String::as_str).unwrap_or(""),
                        ),
                    };
                    entry.push_str(&format!(
                        "<input{}>",
                        attrs(&control_attrs(&[
                            ("type", a("text")),
                            ("class", a("quantity")),
                            ("autocomplete", a("off")),
                            ("autocapitalize", a("off")),
                            ("spellcheck", a("false")),
                            ("enterkeyhint", a("done")),
                            ("value", a(shown)),
                            ("aria-describedby", described_by.clone()),
                        ]))
                    ));
                    if is_quantity {
                        let options = shown_option(list(field, "units"), "id", unit);
                        entry.push_str(&tag(
                            "select",
                            &[
                                ("class", a("unit")),
                                ("aria-label", format!("Unit of {label}")),
                                ("data-unit-for", a(key)),
                            ],
                            &options,
                        ));
                    }
                }
            }
            let mut inner = format!(
                "<label for=\"{}\" class=\"field-label\">{}",
                escape(&id),
                escape_symbols(label)
            );
            if flag(field, "optional") {
                inner.push_str("<span class=\"optional\"> (optional)</span>");
            }
            inner.push_str("</label>");
            inner.push_str(&format!("<div class=\"entry\">{entry}</div>"));
            if !text(field, "help").is_empty() {
                inner.push_str(&format!(
                    "<p class=\"help\" id=\"{id}-help\">{}</p>",
                    escape_symbols(text(field, "help")),
                    id = escape(&id)
                ));
            }
            inner.push_str(&format!(
                "<p class=\"field-error\" id=\"{id}-error\" data-error-for=\"{key}\" hidden></p>",
                id = escape(&id),
                key = escape(key)
            ));
            let warning = warnings
                .iter()
                .rfind(|w| w.get("field").and_then(Value::as_str) == Some(key));
            match warning {
                Some(w) => inner.push_str(&format!(
                    "<p class=\"field-warning\" id=\"{}-warning\">{}</p>",
                    escape(&id),
                    escape_symbols(text(w, "message"))
                )),
                None => inner.push_str(&format!(
                    "<p class=\"field-warning\" id=\"{}-warning\" hidden></p>",
                    escape(&id)
                )),
            }
            let empty = if typed.trim().is_empty() { " data-empty" } else { "" };
            html.push_str(&format!(
                "<div class=\"field\" data-field=\"{}\"{empty}>{inner}</div>",
                escape(key)
            ));
        }
        html.push_str("</form>");
        html
    }

    fn details(&self) -> String {
        let mut parts = String::new();
        parts.push_str(&self.carry_over());
        let others: String = list(self.result, "outputs")
            .iter()
            .filter(|o| !flag(o, "headline"))
            .map(output_item)
            .collect();
        if !others.is_empty() {
            parts.push_str(&format!(
                "<section class=\"panel\"><h2 class=\"panel-title\">Other results</h2><dl class=\"output-list\">{others}</dl></section>"
            ));
        }
        for (index, table) in list(self.result, "tables").iter().enumerate() {
            parts.push_str(&render_table(table, index));
        }
        for (index, diagram) in list(self.result, "diagrams").iter().enumerate() {
            parts.push_str(&render_diagram(diagram, index, FIGURE_WIDTH, VIEWPORT_HEIGHT));
        }
        for plot in list(self.result, "plots") {
            parts.push_str(&render_plot(plot, FIGURE_WIDTH));
        }
        parts
    }

    /// Links to a next calculator (the script's `renderCarryOver`): the core's
    /// inputs, form-encoded, and the page's unit system.
    fn carry_over(&self) -> String {
        let mut items = String::new();
        for item in list(self.result, "carry_over") {
            let target_key = text(item, "calculator");
            let title = text(item, "title");
            if target_key.is_empty() || title.is_empty() {
                continue;
            }
            let mut query: Vec<(String, String)> = item
                .get("inputs")
                .and_then(Value::as_object)
                .map(|m| {
                    m.iter()
                        .filter_map(|(k, v)| v.as_str().map(|v| (k.clone(), v.to_string())))
                        .collect()
                })
                .unwrap_or_default();
            query.retain(|(k, _)| k != SYSTEM_KEY);
            query.push((SYSTEM_KEY.into(), self.system.to_string()));
            let query: Vec<String> = query
                .iter()
                .map(|(k, v)| format!("{}={}", form_encode(k), form_encode(v)))
                .collect();
            let label = match text(item, "label") {
                "" => title,
                l => l,
            };
            items.push_str(&format!(
                "<li><a class=\"carry-link\" href=\"{href}\" data-carry-to=\"{key}\"><span class=\"carry-label\">{label}</span><span class=\"carry-target\">{title}</span></a></li>",
                href = escape(&format!("{target_key}.html?{}", query.join("&"))),
                key = escape(target_key),
                label = escape(label),
                title = escape(title)
            ));
        }
        if items.is_empty() {
            return String::new();
        }
        format!(
            "<nav class=\"panel panel-next\" aria-label=\"Next step\"><h2 class=\"panel-title\">Next step</h2><ul class=\"carry-over\">{items}</ul></nav>"
        )
    }
}

/// The one option a demo selector shows: the selected one (the option whose `key`
/// is `selected`), or the first, which a browser selects when none is marked.
///
/// Why only one: the other options wait for the page script, which gives the
/// selectors their options when it takes the form over (typing into the served
/// form's text fields is kept; a choice needs the script to show or hide the
/// fields that depend on it, so none is offered before it); a choice
/// selector fills the field's width and a unit selector has a fixed width, so
/// their size does not depend on the options. A list of pipe-size presets is about
/// 5 kB gzip of a page (issue 9).
fn shown_option(options: &[Value], key: &str, selected: &str) -> String {
    let chosen = options
        .iter()
        .find(|o| text(o, key) == selected)
        .map(|o| (o, " selected"))
        .or_else(|| options.first().map(|o| (o, "")));
    match chosen {
        Some((option, mark)) => format!(
            "<option value=\"{}\"{mark}>{}</option>",
            escape(text(option, key)),
            escape(text(option, "label"))
        ),
        None => String::new(),
    }
}

/// `application/x-www-form-urlencoded`, as `URLSearchParams` writes it.
pub fn form_encode(text: &str) -> String {
    let mut out = String::new();
    for byte in text.bytes() {
        match byte {
            b'a'..=b'z' | b'A'..=b'Z' | b'0'..=b'9' | b'*' | b'-' | b'.' | b'_' => out.push(byte as char),
            b' ' => out.push('+'),
            _ => out.push_str(&format!("%{byte:02X}")),
        }
    }
    out
}

fn output_item(output: &Value) -> String {
    format!(
        "<div class=\"output\"><dt>{label}</dt><dd data-output=\"{key}\" title=\"{title}\">{shown}</dd></div>",
        label = escape_symbols(text(output, "label")),
        key = escape(text(output, "key")),
        title = escape(text(output, "text")),
        shown = escape(text(output, "shown"))
    )
}

/// A table panel as the script's `renderTable` builds it: a column's unit goes into
/// its header, its kind sets the cells' alignment, and each cell shows the text the
/// core prepared (`shown`).
fn render_table(table: &Value, index: usize) -> String {
    let title = text(table, "title");
    let columns = list(table, "columns");
    let mut html = format!("<table class=\"ledger\" data-table=\"{}\">", escape(text(table, "key")));
    if !title.is_empty() {
        html.push_str(&format!(
            "<caption class=\"visually-hidden\">{}</caption>",
            escape_symbols(title)
        ));
    }
    html.push_str("<thead><tr>");
    for column in columns {
        let heading = match text(column, "unit") {
            "" => text(column, "title").to_string(),
            unit => format!("{} ({unit})", text(column, "title")),
        };
        html.push_str(&format!("<th scope=\"col\">{}</th>", escape_symbols(&heading)));
    }
    html.push_str("</tr></thead><tbody>");
    let emphasised: Vec<u64> = list(table, "emphasised_rows")
        .iter()
        .filter_map(Value::as_u64)
        .collect();
    for (row_index, row) in list(table, "rows").iter().enumerate() {
        if emphasised.contains(&(row_index as u64)) {
            html.push_str("<tr class=\"emphasised\">");
        } else {
            html.push_str("<tr>");
        }
        for (column, cell) in row.as_array().map(Vec::as_slice).unwrap_or(&[]).iter().enumerate() {
            let kind = columns.get(column).map(|c| text(c, "kind"));
            // What the user typed (a tag) as it is; the core's words with subscripts.
            let shown = if kind == Some("typed") {
                escape(text(cell, "shown"))
            } else {
                escape_symbols(text(cell, "shown"))
            };
            // Numbers line up on the right; words wrap on the left.
            let words = kind != Some("number");
            if column == 0 {
                html.push_str(&format!("<th scope=\"row\">{shown}</th>"));
            } else if words {
                html.push_str(&format!("<td class=\"text\">{shown}</td>"));
            } else {
                html.push_str(&format!("<td>{shown}</td>"));
            }
        }
        html.push_str("</tr>");
    }
    html.push_str("</tbody></table>");
    // The visible text first: a spoken command ("Download CSV") matches the name.
    let aria = format!("Download CSV of {}", if title.is_empty() { "the table" } else { title });
    format!(
        concat!(
            "<section class=\"panel panel-table\">{heading}",
            "<div class=\"table-scroll\" tabindex=\"0\">{table}</div>",
            "<div class=\"table-actions\"><button type=\"button\" class=\"button button-small csv-download\" aria-label=\"{aria}\" data-action=\"csv\" data-table-index=\"{index}\">Download CSV</button></div>",
            "</section>"
        ),
        heading = if title.is_empty() {
            String::new()
        } else {
            format!("<h3 class=\"table-title\" aria-hidden=\"true\">{}</h3>", escape_symbols(title))
        },
        table = html,
        aria = escape(&aria),
        index = index
    )
}

// ---------------------------------------------------------------------------------
// Diagrams (the page script's planDiagram, step for step).

/// Screen size of diagram labels, in CSS pixels.
const LABEL_PX: f64 = 13.0;

/// How far a label that overlaps another looks for a free place, in 5 px steps:
/// along its arrow, to either side, and up or down for plain text.
const ALONG_STEPS: usize = 16;
const SIDE_STEPS: usize = 8;
const PLAIN_STEPS: usize = 24;

fn char_count(text: &str) -> usize {
    // JavaScript's Array.from counts code points, as chars() does.
    text.chars().count()
}

/// Breaks text at spaces into lines of at most `max` characters.
fn wrap_words(text: &str, max: usize) -> Vec<String> {
    let mut lines: Vec<String> = Vec::new();
    let mut line = String::new();
    for word in text.split_whitespace() {
        if !line.is_empty() && char_count(&line) + 1 + char_count(word) > max {
            lines.push(std::mem::take(&mut line));
            line = word.to_string();
        } else if line.is_empty() {
            line = word.to_string();
        } else {
            line = format!("{line} {word}");
        }
    }
    if !line.is_empty() {
        lines.push(line);
    }
    if lines.len() > 1 && lines.last().is_some_and(|l| char_count(l) <= 2) {
        let last = lines.pop().unwrap_or_default();
        let before = lines.pop().unwrap_or_default();
        lines.push(format!("{before} {last}"));
    }
    if lines.is_empty() {
        vec![text.to_string()]
    } else {
        lines
    }
}

struct Label {
    at: [f64; 2],
    ux: f64,
    uy: f64,
    text: String,
    /// The label without its trailing value, and the value (split by the adapter).
    name: String,
    value: String,
    style: String,
    plain: bool,
    lines: Vec<String>,
    anchor: &'static str,
    baseline: &'static str,
    bbox: [f64; 4],
    x: f64,
    y: f64,
}

fn label_layout(label: &mut Label) {
    let mut anchor = "middle";
    let mut baseline = "central";
    if !label.plain {
        if label.ux > 0.3 {
            anchor = "start";
        } else if label.ux < -0.3 {
            anchor = "end";
        }
        if label.uy.abs() > label.ux.abs() {
            baseline = if label.uy > 0.0 { "auto" } else { "hanging" };
        }
    }
    let longest = label.lines.iter().map(|l| char_count(l)).max().unwrap_or(0) as f64;
    let w = longest * LABEL_PX * 0.64;
    let h = LABEL_PX * 1.2 * label.lines.len() as f64 + LABEL_PX * 0.05;
    let x0 = match anchor {
        "start" => 0.0,
        "end" => -w,
        _ => -w / 2.0,
    };
    let y0 = match baseline {
        "auto" => -h * 0.85,
        "hanging" => 0.0,
        _ => -h / 2.0,
    };
    label.anchor = anchor;
    label.baseline = baseline;
    label.bbox = [x0, y0, x0 + w, y0 + h];
}

enum Geometry {
    Points {
        tag: String,
        style: String,
        points: Vec<[f64; 2]>,
    },
    Circle {
        style: String,
        c: [f64; 2],
        r: f64,
    },
    Arrow {
        style: String,
        a: [f64; 2],
        b: [f64; 2],
    },
}

/// One diagram as the page script draws it at `width` px for a viewport
/// `viewport_height` px high.
pub fn render_diagram(diagram: &Value, index: usize, width: f64, viewport_height: f64) -> String {
    let bounds: Vec<Option<f64>> = list(diagram, "bounds").iter().map(number).collect();
    let [mut min_x, mut min_y, mut max_x, mut max_y] = [0.0, 0.0, 1.0, 1.0];
    if let [Some(a), Some(b), Some(c), Some(d)] = bounds.as_slice() {
        if c > a && d > b {
            [min_x, min_y, max_x, max_y] = [*a, *b, *c, *d];
        }
    }
    let centre = [(min_x + max_x) / 2.0, (min_y + max_y) / 2.0];
    let mut styles: Vec<String> = Vec::new();
    let mut arrow_styles: Vec<String> = Vec::new();
    let mut geometry = Vec::new();
    let mut labels: Vec<Label> = Vec::new();
    let add = |set: &mut Vec<String>, style: &str| {
        if !set.iter().any(|s| s == style) {
            set.push(style.to_string());
        }
    };
    for shape in list(diagram, "shapes") {
        let style = match text(shape, "style") {
            "" => "label",
            s => s,
        };
        match text(shape, "type") {
            kind @ ("polygon" | "polyline") => {
                let points: Vec<[f64; 2]> = list(shape, "points").iter().filter_map(|p| pair(Some(p))).collect();
                if points.len() < 2 {
                    continue;
                }
                geometry.push(Geometry::Points {
                    tag: kind.to_string(),
                    style: style.into(),
                    points,
                });
                add(&mut styles, style);
            }
            "circle" => {
                let (Some(c), Some(r)) = (pair(shape.get("center")), shape.get("radius").and_then(number)) else {
                    continue;
                };
                geometry.push(Geometry::Circle {
                    style: style.into(),
                    c,
                    r: r.abs(),
                });
                add(&mut styles, style);
            }
            "arrow" => {
                let (Some(a), Some(b)) = (pair(shape.get("from")), pair(shape.get("to"))) else {
                    continue;
                };
                geometry.push(Geometry::Arrow {
                    style: style.into(),
                    a,
                    b,
                });
                add(&mut arrow_styles, style);
                add(&mut styles, style);
                let label = text(shape, "label");
                if !label.is_empty() {
                    let far = |p: [f64; 2]| (p[0] - centre[0]).hypot(p[1] - centre[1]);
                    let at_tip = far(b) >= far(a);
                    let (at, other) = if at_tip { (b, a) } else { (a, b) };
                    let mut length = (at[0] - other[0]).hypot(at[1] - other[1]);
                    if length == 0.0 {
                        length = 1.0;
                    }
                    labels.push(Label {
                        at,
                        ux: (at[0] - other[0]) / length,
                        uy: (at[1] - other[1]) / length,
                        text: label.to_string(),
                        name: text(shape, "name").to_string(),
                        value: text(shape, "value").to_string(),
                        style: style.into(),
                        plain: false,
                        lines: Vec::new(),
                        anchor: "middle",
                        baseline: "central",
                        bbox: [0.0; 4],
                        x: 0.0,
                        y: 0.0,
                    });
                }
            }
            "text" => {
                let content = text(shape, "text");
                let Some(at) = pair(shape.get("at")) else { continue };
                if content.is_empty() {
                    continue;
                }
                labels.push(Label {
                    at,
                    ux: 0.0,
                    uy: 0.0,
                    text: content.to_string(),
                    name: text(shape, "name").to_string(),
                    value: text(shape, "value").to_string(),
                    style: style.into(),
                    plain: true,
                    lines: Vec::new(),
                    anchor: "middle",
                    baseline: "central",
                    bbox: [0.0; 4],
                    x: 0.0,
                    y: 0.0,
                });
            }
            _ => {}
        }
    }
    let narrow = width < 480.0;
    let max_chars = if narrow { 16 } else { 30 };
    for label in &mut labels {
        label.lines = if narrow && !label.name.is_empty() && !label.value.is_empty() {
            let mut lines = wrap_words(&label.name, max_chars);
            lines.push(label.value.clone());
            lines
        } else {
            wrap_words(&label.text, max_chars)
        };
        label_layout(label);
    }

    let pad = 0.04 * (max_x - min_x).max(max_y - min_y);
    let max_h = (viewport_height * 0.7).clamp(260.0, 560.0);
    let mut view = [min_x - pad, min_y - pad, max_x + pad, max_y + pad];
    let mut scale = 1.0;
    let priority = |l: &Label| {
        if l.style == "restraint" || l.style == "thrust" {
            0
        } else if l.plain {
            2
        } else {
            1
        }
    };
    // A stable sort, as Array.prototype.sort is.
    labels.sort_by_key(priority);
    let overlaps = |a: &[f64; 4], b: &[f64; 4]| a[0] < b[2] && b[0] < a[2] && a[1] < b[3] && b[1] < a[3];
    let fit = |v: &[f64; 4]| (width / (v[2] - v[0])).min(max_h / (v[3] - v[1]));
    let place = |labels: &mut Vec<Label>, scale: f64| -> [f64; 4] {
        let mut next = [min_x - pad, min_y - pad, max_x + pad, max_y + pad];
        let mut placed: Vec<[f64; 4]> = Vec::new();
        for label in labels.iter_mut() {
            let gap = if label.plain { 0.0 } else { 6.0 / scale };
            let mut x = label.at[0] + label.ux * gap;
            let mut y = label.at[1] + label.uy * gap;
            let [bx0, by0, bx1, by1] = label.bbox;
            let screen = |x: f64, y: f64| {
                [
                    x * scale + bx0 - 2.0,
                    -y * scale + by0 - 2.0,
                    x * scale + bx1 + 2.0,
                    -y * scale + by1 + 2.0,
                ]
            };
            let (mx, my) = if label.plain || (label.ux == 0.0 && label.uy == 0.0) {
                (0.0, -1.0)
            } else {
                (label.ux, label.uy)
            };
            let start = [x, y];
            let mut tries: Vec<[f64; 2]> = vec![[0.0, 0.0]];
            let along = if label.plain { PLAIN_STEPS } else { ALONG_STEPS };
            for k in 1..=along {
                let k = k as f64;
                tries.push([mx * k, my * k]);
                if k <= SIDE_STEPS as f64 {
                    tries.push([-my * k, mx * k]);
                    tries.push([my * k, -mx * k]);
                }
                if label.plain {
                    tries.push([-mx * k, -my * k]);
                }
            }
            let mut free = false;
            for [tx, ty] in tries {
                x = start[0] + (tx * 5.0) / scale;
                y = start[1] + (ty * 5.0) / scale;
                let candidate = screen(x, y);
                if !placed.iter().any(|b| overlaps(b, &candidate)) {
                    free = true;
                    break;
                }
            }
            if !free {
                [x, y] = start;
            }
            placed.push(screen(x, y));
            label.x = x;
            label.y = y;
            next[0] = next[0].min(x + bx0 / scale - 3.0 / scale);
            next[2] = next[2].max(x + bx1 / scale + 3.0 / scale);
            next[1] = next[1].min(y - by1 / scale - 3.0 / scale);
            next[3] = next[3].max(y - by0 / scale + 3.0 / scale);
        }
        next
    };
    let eps = 1e-9 * (max_x - min_x).max(max_y - min_y);
    for _ in 0..12 {
        scale = fit(&view);
        let next = place(&mut labels, scale);
        if next[0] >= view[0] - eps && next[1] >= view[1] - eps && next[2] <= view[2] + eps && next[3] <= view[3] + eps
        {
            break;
        }
        view = [
            view[0].min(next[0]),
            view[1].min(next[1]),
            view[2].max(next[2]),
            view[3].max(next[3]),
        ];
    }
    let px = |n: f64| n / scale;
    let vb_w = view[2] - view[0];
    let vb_h = view[3] - view[1];
    let prefix = format!("d{index}");
    let marker_for = |style: &str| format!("{prefix}-head-{style}");
    // The view box and size as the script writes them; every coordinate inside to
    // a hundredth of a screen pixel.
    let step = px(DRAWN_STEP_PX);
    let n = |v: f64| rounded(v, step);

    let mut svg = format!(
        "<svg class=\"diagram\" viewBox=\"{} {} {} {}\" width=\"{}\" height=\"{}\" role=\"img\" aria-label=\"{}\" font-size=\"{}\"><defs>",
        js_number(view[0]),
        js_number(-view[3]),
        js_number(vb_w),
        js_number(vb_h),
        js_number(js_round(vb_w * scale)),
        js_number(js_round(vb_h * scale)),
        escape(match text(diagram, "title") {
            "" => "Diagram",
            t => t,
        }),
        n(px(LABEL_PX))
    );
    for style in &arrow_styles {
        let size = px(if style == "restraint" || style == "thrust" {
            12.0
        } else {
            10.0
        });
        svg.push_str(&format!(
            "<marker id=\"{}\" class=\"head s-{}\" viewBox=\"0 0 10 10\" refX=\"9\" refY=\"5\" markerWidth=\"{s}\" markerHeight=\"{s}\" markerUnits=\"userSpaceOnUse\" orient=\"auto-start-reverse\"><path d=\"M0,0 L10,5 L0,10 z\"></path></marker>",
            escape(&marker_for(style)),
            escape(style),
            s = n(size)
        ));
    }
    svg.push_str("</defs>");
    for item in &geometry {
        match item {
            Geometry::Circle { style, c, r } => svg.push_str(&format!(
                "<circle class=\"shape s-{}\" cx=\"{}\" cy=\"{}\" r=\"{}\" vector-effect=\"non-scaling-stroke\"></circle>",
                escape(style),
                n(c[0]),
                n(-c[1]),
                n(*r)
            )),
            Geometry::Arrow { style, a, b } => svg.push_str(&format!(
                "<line class=\"shape s-{s} arrow\" x1=\"{}\" y1=\"{}\" x2=\"{}\" y2=\"{}\" vector-effect=\"non-scaling-stroke\" marker-end=\"url(#{})\"></line>",
                n(a[0]),
                n(-a[1]),
                n(b[0]),
                n(-b[1]),
                escape(&marker_for(style)),
                s = escape(style)
            )),
            Geometry::Points { tag, style, points } => {
                let pts: Vec<String> = points.iter().map(|p| format!("{},{}", n(p[0]), n(-p[1]))).collect();
                svg.push_str(&format!(
                    "<{tag} class=\"shape s-{}\" points=\"{}\" vector-effect=\"non-scaling-stroke\"></{tag}>",
                    escape(style),
                    escape(&pts.join(" "))
                ));
            }
        }
    }
    let line_step = px(LABEL_PX * 1.2);
    for label in &labels {
        let count = label.lines.len() as f64;
        let first = match label.baseline {
            "auto" => -(count - 1.0) * line_step,
            "hanging" => 0.0,
            _ => (-(count - 1.0) * line_step) / 2.0,
        };
        svg.push_str(&format!(
            "<text class=\"label s-{}\" x=\"{}\" y=\"{}\" text-anchor=\"{}\" dominant-baseline=\"{}\" stroke-width=\"{}\">",
            escape(&label.style),
            n(label.x),
            n(-label.y),
            label.anchor,
            label.baseline,
            n(px(3.0))
        ));
        for (i, line) in label.lines.iter().enumerate() {
            svg.push_str(&format!(
                "<tspan x=\"{}\" dy=\"{}\">{}</tspan>",
                n(label.x),
                n(if i == 0 { first } else { line_step }),
                escape(line)
            ));
        }
        svg.push_str("</text>");
    }
    svg.push_str("</svg>");

    let mut figure = String::from("<figure class=\"panel figure\">");
    let title = text(diagram, "title");
    if !title.is_empty() {
        figure.push_str(&format!("<h2 class=\"panel-title\">{}</h2>", escape_symbols(title)));
    }
    figure.push_str(&format!("<div class=\"figure-canvas\">{svg}</div>"));
    figure.push_str(&render_legend(&styles));
    let caption = text(diagram, "caption");
    if !caption.is_empty() {
        figure.push_str(&format!("<figcaption>{}</figcaption>", escape_symbols(caption)));
    }
    figure.push_str("</figure>");
    figure
}

fn render_legend(styles: &[String]) -> String {
    const ORDER: [&str; 10] = [
        "restraint",
        "thrust",
        "pressure",
        "momentum",
        "weight",
        "velocity",
        "flow",
        "control_volume",
        "wall",
        "fluid",
    ];
    const ARROWS: [&str; 7] = [
        "restraint",
        "thrust",
        "pressure",
        "momentum",
        "weight",
        "velocity",
        "flow",
    ];
    let shown: Vec<&str> = ORDER.into_iter().filter(|s| styles.iter().any(|x| x == s)).collect();
    if shown.is_empty() {
        return String::new();
    }
    let mut html = String::from("<ul class=\"legend\">");
    for style in shown {
        let swatch = if ARROWS.contains(&style) {
            format!(
                "<line class=\"shape s-{style} arrow\" x1=\"1\" y1=\"6\" x2=\"28\" y2=\"6\"></line><path class=\"head s-{style}\" d=\"M26,1 L35,6 L26,11 z\"></path>"
            )
        } else {
            format!("<rect class=\"shape s-{style}\" x=\"2\" y=\"1\" width=\"32\" height=\"10\"></rect>")
        };
        html.push_str(&format!(
            "<li><svg class=\"swatch\" viewBox=\"0 0 36 12\" width=\"36\" height=\"12\" aria-hidden=\"true\">{swatch}</svg><span>{}</span></li>",
            escape_symbols(style_name(style))
        ));
    }
    html.push_str("</ul>");
    html
}

// ---------------------------------------------------------------------------------
// Plots (the page script's planPlot).

struct Ticks {
    lo: f64,
    hi: f64,
    values: Vec<f64>,
    step: f64,
}

fn ticks(lo: f64, hi: f64, count: usize) -> Ticks {
    if hi <= lo || hi.is_nan() || lo.is_nan() {
        return Ticks {
            lo: lo - 1.0,
            hi: hi + 1.0,
            values: vec![lo],
            step: 0.0,
        };
    }
    let raw = (hi - lo) / count.max(1) as f64;
    let power = 10f64.powf(raw.log10().floor());
    let step = [1.0, 2.0, 5.0, 10.0]
        .into_iter()
        .map(|m| m * power)
        .find(|s| *s >= raw)
        .unwrap_or(raw);
    let start = (lo / step).floor() * step;
    let end = (hi / step).ceil() * step;
    let mut values = Vec::new();
    let mut v = start;
    while v <= end + step * 1e-9 && values.len() < 50 {
        values.push(if v.abs() < step * 1e-9 { 0.0 } else { v });
        v += step;
    }
    Ticks {
        lo: start,
        hi: end,
        values,
        step,
    }
}

fn tick_text(value: f64, step: f64) -> String {
    let step = if step == 0.0 { 1.0 } else { step };
    let decimals = (-(step.log10() + 1e-9).floor()).clamp(0.0, 6.0) as usize;
    let abs = value.abs();
    if abs != 0.0 && !(1e-4..1e6).contains(&abs) {
        return exponent_js(format!("{value:.1e}"));
    }
    let fixed = format!("{value:.decimals$}");
    // JavaScript writes -0 as "0" (and -0.00 as "-0.00": only a bare zero differs).
    if fixed == "-0" {
        "0".into()
    } else {
        fixed
    }
}

/// One plot as the page script draws it at `width` px.
pub fn render_plot(plot: &Value, width: f64) -> String {
    let mut points: Vec<[f64; 2]> = Vec::new();
    for series in list(plot, "series") {
        points.extend(list(series, "points").iter().filter_map(|p| pair(Some(p))));
    }
    for marker in list(plot, "markers") {
        points.extend(pair(marker.get("at")));
    }
    let mut figure = format!(
        "<figure class=\"panel figure plot\" data-plot=\"{}\">",
        escape(text(plot, "key"))
    );
    let title = text(plot, "title");
    if !title.is_empty() {
        figure.push_str(&format!("<h2 class=\"panel-title\">{}</h2>", escape_symbols(title)));
    }
    if points.is_empty() {
        figure.push_str("<p>Nothing to plot for these inputs.</p></figure>");
        return figure;
    }
    let w = width.max(280.0);
    let h = js_round((w * 0.62).clamp(220.0, 360.0));
    let (left, right, top, bottom) = (58.0, 14.0, 12.0, 44.0);
    let min = |v: &mut dyn Iterator<Item = f64>| v.fold(f64::INFINITY, f64::min);
    let max = |v: &mut dyn Iterator<Item = f64>| v.fold(f64::NEG_INFINITY, f64::max);
    let tx = ticks(
        min(&mut points.iter().map(|p| p[0])),
        max(&mut points.iter().map(|p| p[0])),
        if w < 420.0 { 4 } else { 6 },
    );
    let ty = ticks(
        min(&mut points.iter().map(|p| p[1])).min(0.0),
        max(&mut points.iter().map(|p| p[1])),
        5,
    );
    let sx = |x: f64| left + ((x - tx.lo) / (tx.hi - tx.lo)) * (w - left - right);
    let sy = |y: f64| h - bottom - ((y - ty.lo) / (ty.hi - ty.lo)) * (h - top - bottom);
    // Coordinates to a hundredth of a pixel (the view box is in pixels).
    let n = |v: f64| rounded(v, DRAWN_STEP_PX);

    let mut grid = String::from("<g class=\"plot-grid\">");
    let mut tick_labels = String::new();
    for &v in &tx.values {
        grid.push_str(&format!(
            "<line x1=\"{x}\" y1=\"{}\" x2=\"{x}\" y2=\"{}\"></line>",
            n(top),
            n(h - bottom),
            x = n(sx(v))
        ));
        tick_labels.push_str(&format!(
            "<text class=\"tick\" x=\"{}\" y=\"{}\" text-anchor=\"middle\">{}</text>",
            n(sx(v)),
            n(h - bottom + 16.0),
            escape(&tick_text(v, tx.step))
        ));
    }
    for &v in &ty.values {
        grid.push_str(&format!(
            "<line x1=\"{}\" y1=\"{y}\" x2=\"{}\" y2=\"{y}\"></line>",
            n(left),
            n(w - right),
            y = n(sy(v))
        ));
        tick_labels.push_str(&format!(
            "<text class=\"tick\" x=\"{}\" y=\"{}\" text-anchor=\"end\" dominant-baseline=\"central\">{}</text>",
            n(left - 6.0),
            n(sy(v)),
            escape(&tick_text(v, ty.step))
        ));
    }
    grid.push_str("</g>");
    let mut svg = format!(
        "<svg class=\"plot-svg\" viewBox=\"0 0 {w} {h}\" width=\"{w}\" height=\"{h}\" role=\"img\" aria-label=\"{}\">",
        escape(if title.is_empty() { "Plot" } else { title }),
        w = js_number(w),
        h = js_number(h)
    );
    svg.push_str(&grid);
    svg.push_str(&tick_labels);
    svg.push_str(&format!(
        "<line class=\"axis\" x1=\"{l}\" y1=\"{b}\" x2=\"{r}\" y2=\"{b}\"></line><line class=\"axis\" x1=\"{l}\" y1=\"{t}\" x2=\"{l}\" y2=\"{b}\"></line>",
        l = n(left),
        b = n(h - bottom),
        r = n(w - right),
        t = n(top)
    ));
    svg.push_str(&format!(
        "<text class=\"axis-label\" x=\"{}\" y=\"{}\" text-anchor=\"middle\">{}</text>",
        n((left + w - right) / 2.0),
        n(h - 6.0),
        escape(text(plot, "x_label"))
    ));
    svg.push_str(&format!(
        "<text class=\"axis-label\" x=\"0\" y=\"0\" transform=\"translate(14 {}) rotate(-90)\" text-anchor=\"middle\">{}</text>",
        n((top + h - bottom) / 2.0),
        escape(text(plot, "y_label"))
    ));
    let mut legend = String::new();
    for (index, series) in list(plot, "series").iter().enumerate() {
        let pts: Vec<[f64; 2]> = list(series, "points").iter().filter_map(|p| pair(Some(p))).collect();
        if pts.is_empty() {
            continue;
        }
        let class = format!("series series-{}", index % 4);
        let joined: Vec<String> = pts.iter().map(|p| format!("{},{}", n(sx(p[0])), n(sy(p[1])))).collect();
        svg.push_str(&format!(
            "<polyline class=\"{class}\" points=\"{}\"></polyline>",
            joined.join(" ")
        ));
        let name = match text(series, "name") {
            "" => format!("Series {}", index + 1),
            name => name.to_string(),
        };
        legend.push_str(&format!(
            "<li><svg class=\"swatch\" viewBox=\"0 0 36 12\" width=\"36\" height=\"12\" aria-hidden=\"true\"><line class=\"{class}\" x1=\"1\" y1=\"6\" x2=\"35\" y2=\"6\"></line></svg><span>{}</span></li>",
            escape_symbols(&name)
        ));
    }
    let mut marker_list = String::new();
    let mut count = 0;
    for marker in list(plot, "markers") {
        let Some(at) = pair(marker.get("at")) else { continue };
        count += 1;
        let x = sx(at[0]);
        let y = sy(at[1]);
        let right_side = x < w * 0.75;
        let below = count % 2 == 0;
        svg.push_str(&format!(
            "<circle class=\"marker\" cx=\"{}\" cy=\"{}\" r=\"5\"></circle><text class=\"marker-label\" x=\"{}\" y=\"{}\" text-anchor=\"{}\">{count}</text>",
            n(x),
            n(y),
            n(if right_side { x + 8.0 } else { x - 8.0 }),
            n(if below { y + 15.0 } else { y - 8.0 }),
            if right_side { "start" } else { "end" }
        ));
        let label = match text(marker, "label") {
            "" => format!("Point {count}"),
            l => l.to_string(),
        };
        marker_list.push_str(&format!("<li>{}</li>", escape_symbols(&label)));
    }
    svg.push_str("</svg>");
    figure.push_str(&format!("<div class=\"figure-canvas\">{svg}</div>"));
    if !legend.is_empty() {
        figure.push_str(&format!("<ul class=\"legend\">{legend}</ul>"));
    }
    if !marker_list.is_empty() {
        figure.push_str(&format!("<ol class=\"plot-markers\">{marker_list}</ol>"));
    }
    figure.push_str("</figure>");
    figure
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn numbers_are_written_as_javascript_writes_them() {
        assert_eq!(js_number(5.0), "5");
        assert_eq!(js_number(-0.0), "0");
        assert_eq!(js_number(0.1 + 0.2), "0.30000000000000004");
        assert_eq!(js_number(1e21), "1e+21");
        assert_eq!(js_number(1.5e-7), "1.5e-7");
        assert_eq!(js_round(2.5), 3.0);
        assert_eq!(js_round(-2.5), -2.0);
        assert_eq!(tick_text(2_500_000.0, 500_000.0), "2.5e+6");
        assert_eq!(tick_text(0.25, 0.05), "0.25");
        assert_eq!(tick_text(40.0, 20.0), "40");
    }

    #[test]
    fn figure_numbers_keep_the_resolution_asked_for_and_no_more() {
        assert_eq!(rounded(110.39999999999999, 0.01), "110.4");
        assert_eq!(rounded(58.0, 0.01), "58");
        assert_eq!(rounded(-0.0001, 0.01), "0");
        assert_eq!(rounded(0.027500000000000004, 1.6e-5), "0.0275");
        assert_eq!(rounded(0.06614409482612661, 1.6e-5), "0.06614");
        assert_eq!(rounded(-1234.5678, 1.0), "-1235");
        assert_eq!(rounded(4.592425496802574e-18, 1e-5), "0");
        // Within half a step of the value.
        for (value, step) in [(0.123456789, 1e-4), (987.654321, 0.01), (-3.3333333, 2e-3)] {
            let back: f64 = rounded(value, step).parse().expect("a number");
            assert!((back - value).abs() <= step / 2.0, "{value} at {step}: {back}");
        }
        assert_eq!(rounded(0.5, 0.0), "0.5");
        assert_eq!(rounded(f64::NAN, 0.01), "NaN");
    }

    #[test]
    fn labels_wrap_at_spaces_like_the_script() {
        assert_eq!(
            wrap_words("a long label that wraps here", 10),
            ["a long", "label that", "wraps here"]
        );
        assert_eq!(wrap_words("force on the block = x", 16), ["force on the", "block = x"]);
    }

    #[test]
    fn query_values_are_form_encoded() {
        assert_eq!(form_encode("150 psi/ü"), "150+psi%2F%C3%BC");
    }

    #[test]
    fn every_calculator_prerenders_its_demo_with_every_shown_field_and_output() {
        for spec in calculators::catalog() {
            let html = calculator_section(&spec).unwrap_or_else(|| panic!("{}: demo did not solve", spec.key));
            let request = demo_request(&spec, UnitSystem::Si);
            for field in &spec.fields {
                // The fields the demo shows are served; those it hides are left to
                // the page script.
                let shown = fluxledger_core::catalog::is_shown(&spec, field, &request);
                assert_eq!(
                    html.contains(&format!("id=\"field-{}\"", field.key)),
                    shown,
                    "{}: {} (shown: {shown})",
                    spec.key,
                    field.key
                );
            }
            let outcome = calculators::solve(spec.key, &demo_request(&spec, UnitSystem::Si));
            let solution = outcome.result.expect("demo solves");
            for output in &solution.outputs {
                let shown = format!("data-output=\"{}\" title=\"{}\"", output.key, escape(&output.text));
                assert!(
                    html.contains(&shown),
                    "{}: output {} as {}",
                    spec.key,
                    output.key,
                    output.text
                );
            }
            // The toolbar and the grid are the demo's; of the grid, the headline and
            // the details are inert, the form takes typing.
            assert_eq!(html.matches(" data-demo").count(), 2, "{}", spec.key);
            assert_eq!(html.matches(" data-demo inert").count(), 1, "{}", spec.key);
            assert_eq!(html.matches(" inert>").count(), 3, "{}", spec.key);
            assert!(html.contains("<div class=\"details\" inert>"), "{}", spec.key);
            assert!(
                !html.contains("<form class=\"inputs\" novalidate aria-label=\"Inputs\" inert"),
                "{}",
                spec.key
            );
            assert!(!html.contains(" style="), "no inline styles under the CSP");
        }
    }
}
