// The result: headline values with their warnings, links to a next calculator,
// other outputs, tables, diagrams and plots, or the field errors of a failed solve.

import { clip, el } from "./dom.js";
import { state } from "./state.js";
import { SYSTEM_KEY } from "./url.js";
import { renderTable } from "./render-table.js";
import { renderDiagram } from "./render-diagram.js";
import { renderPlot } from "./render-plot.js";

export function render(result) {
  state.lastResult = result;
  const ui = state.ui;
  for (const error of ui.fieldErrors.values()) {
    error.hidden = true;
    error.textContent = "";
  }
  for (const warning of ui.fieldWarnings.values()) {
    warning.hidden = true;
    warning.textContent = "";
  }
  for (const control of ui.controls.values()) control.removeAttribute("aria-invalid");

  if (!result.ok) {
    const general = [];
    for (const error of result.errors || []) {
      const box = ui.fieldErrors.get(error.field);
      const wrap = ui.fieldWraps.get(error.field);
      if (box && wrap && !wrap.hidden) {
        box.textContent = `${error.label || "This field"}: ${clip(error.message)}`;
        box.hidden = false;
        ui.controls.get(error.field)?.setAttribute("aria-invalid", "true");
      } else {
        general.push(error.label ? `${error.label}: ${error.message}` : error.message);
      }
    }
    ui.headline.classList.remove("has-warnings");
    ui.headline.replaceChildren(
      el("p", { class: "no-result", text: "No result yet: correct the marked inputs." }),
      ...general.map((text) => el("p", { class: "general-error", text })),
    );
    ui.details.replaceChildren();
    finishRender("error");
    return;
  }

  const headline = el("dl", { class: "headline-values" });
  const others = el("dl", { class: "output-list" });
  for (const output of result.outputs || []) {
    const target = output.headline ? headline : others;
    target.append(
      el(
        "div",
        { class: "output" },
        el("dt", { text: output.label }),
        el("dd", { dataset: { output: output.key }, title: output.text, text: output.shown }),
      ),
    );
  }
  // Warnings belong with the numbers they qualify: in the headline, where nobody
  // reads a force without them (a check that failed, a value that could not be
  // computed, a mode left unchecked). A warning about one field is also shown there.
  const warnings = result.warnings || [];
  let warningList = null;
  if (warnings.length > 0) {
    warningList = el("ul", { class: "warnings headline-warnings", "aria-label": "Warnings" });
    for (const warning of warnings) {
      warningList.append(el("li", { text: warning.message }));
      const box = warning.field ? ui.fieldWarnings.get(warning.field) : null;
      if (box) {
        box.textContent = warning.message;
        box.hidden = false;
      }
    }
  }
  ui.headline.classList.toggle("has-warnings", warningList !== null);
  // (replaceChildren would write a missing warning list as the text "null")
  ui.headline.replaceChildren(...[el("h2", { class: "panel-title", text: "Result" }), headline, warningList].filter(Boolean));

  const parts = [];
  const links = renderCarryOver(result.carry_over || []);
  if (links) parts.push(links);
  if (others.childElementCount > 0) {
    parts.push(el("section", { class: "panel" }, el("h2", { class: "panel-title", text: "Other results" }), others));
  }
  for (const [index, table] of (result.tables || []).entries()) parts.push(renderTable(table, index));
  const width = state.figureWidth || measureFigureWidth();
  for (const [index, diagram] of (result.diagrams || []).entries()) parts.push(renderDiagram(diagram, index, width));
  for (const plot of result.plots || []) parts.push(renderPlot(plot, width));
  ui.details.replaceChildren(...parts);
  finishRender("ready");
}

function finishRender(status) {
  document.body.dataset.state = status;
  if (!state.firstResultMarked) {
    state.firstResultMarked = true;
    performance.mark("fluxledger:first-result");
  }
}

/** Width available to figures, in CSS pixels (measured once per layout change). */
export function measureFigureWidth() {
  const details = state.ui.details;
  // Panels have 0.75 rem of padding and a 1 px border on each side.
  const width = details ? Math.round(details.clientWidth) - 26 : 0;
  state.figureWidth = width > 0 ? Math.min(width, 720) : 300;
  return state.figureWidth;
}

/**
 * Renders the result's `carry_over` links. The page name is a key the core wrote
 * (never text from the address bar); the inputs are the core's text, encoded by
 * URLSearchParams; the page's unit system goes along.
 */
function renderCarryOver(items) {
  const list = el("ul", { class: "carry-over" });
  for (const item of items) {
    if (!item || !item.calculator || !item.title) continue;
    const params = new URLSearchParams();
    for (const [key, value] of Object.entries(item.inputs || {})) {
      if (typeof value === "string") params.set(key, value);
    }
    params.set(SYSTEM_KEY, state.system);
    const link = el(
      "a",
      { class: "carry-link", href: `${item.calculator}.html?${params.toString()}`, dataset: { carryTo: item.calculator } },
      el("span", { class: "carry-label", text: item.label || item.title }),
      el("span", { class: "carry-target", text: item.title }),
    );
    list.append(el("li", {}, link));
  }
  if (list.childElementCount === 0) return null;
  return el("nav", { class: "panel panel-next", "aria-label": "Next step" }, el("h2", { class: "panel-title", text: "Next step" }), list);
}
