// Cases side by side: pin the current case, change inputs, and see the pinned
// cases beside the current one (up to the core's limit, four).
//
// A pinned case is the query of that case (its visible inputs as the link writes
// them, and the unit system), kept in the link as `pin1=…` … `pin4=…`. Every case
// is solved by the core (`solve`), read through the glossary like any link; the
// difference and ratio of a headline result are made by the core
// (`case_difference`) from the SI values it returned. This module compares texts
// (which inputs differ) and lays out the table; it parses no numbers.
//
// The table prints (when a case is pinned) and downloads as CSV with the same
// header block as every table.

import { el, symbolNodes } from "./dom.js";
import { state, defaultUnit, isQuantity, systemLabel } from "./state.js";
import { glue } from "./wasm.js";
import { SYSTEM_KEY, caseParams, writeUrl } from "./url.js";
import { sheetDescription } from "./sheet.js";
import { saveCsv } from "./csv.js";
import { forgetTable, watchTable } from "./layout.js";

/** The inputs of a case query, read through the glossary: {values: Map, system}. */
function readCase(query) {
  const raw = [...new URLSearchParams(query)];
  const upgraded = raw.length > 0 ? JSON.parse(glue.upgrade_link(state.spec.key, JSON.stringify(raw))) : { pairs: [] };
  const values = new Map();
  let system = state.system;
  for (const [key, value] of upgraded.pairs || []) {
    if (key === SYSTEM_KEY) system = value;
    else values.set(key, value);
  }
  return { values, system };
}

/** Solves a case with the core; null when the core refuses the call. */
function solveCase(kase) {
  const inputs = {};
  const fieldUnits = {};
  for (const field of state.spec.fields) {
    inputs[field.key] = kase.values.get(field.key) ?? "";
    if (isQuantity(field)) fieldUnits[field.key] = defaultUnit(field, kase.system);
  }
  try {
    // JSON text both ways: one string crosses each way (see solve in the wasm crate).
    return JSON.parse(glue.solve(state.spec.key, JSON.stringify(inputs), JSON.stringify(fieldUnits), kase.system));
  } catch (error) {
    return null;
  }
}

/** Pins the current case (nothing when the limit is reached). */
function pinCurrent() {
  const pins = (state.pins || []).filter(Boolean);
  if (pins.length >= sheetDescription().maxPins) return;
  pins.push(caseParams().toString());
  state.pins = pins;
  writeUrl();
  updateCompare();
}

function unpin(index) {
  state.pins = (state.pins || []).filter(Boolean).filter((_, i) => i !== index);
  writeUrl();
  updateCompare();
}

function onComparePanelClick(event) {
  const button = event.target.closest("button");
  if (!button) return;
  event.stopPropagation();
  if (button.dataset.action === "pin") pinCurrent();
  else if (button.dataset.action === "unpin") unpin(Number(button.dataset.index));
  else if (button.dataset.action === "compare-csv") downloadComparison();
}

/** Builds the comparison panel; called once after the page is built. */
export function buildCompare() {
  if (!state.pins) state.pins = [];
  const section = state.ui.section;
  if (!section) return;
  const panel = el("div", { class: "panel compare-panel" });
  panel.addEventListener("click", onComparePanelClick);
  section.append(panel);
  state.ui.compare = panel;
  updateCompare();
}

/**
 * An input of a case as people read it: a quantity as the core read it (its echo:
 * the number and the unit applied, the unit by its label, `850 m³/h` for the link's
 * `850m3/h`), a choice by its label; the text as given when the core did not read it.
 */
function shownInput(field, text, result) {
  if (text === "") return "—";
  if (isQuantity(field)) {
    const echo = result && (result.echoes || []).find((e) => e && e.field === field.key);
    if (!echo || !echo.number) return text;
    // A plain number (the core's unit `-`) is shown bare, as the core shows it.
    if (!echo.unit || echo.unit === "-") return echo.number;
    const unit = (field.units || []).find((u) => u.id === echo.unit);
    return `${echo.number} ${unit ? unit.label : echo.unit}`;
  }
  const option = (field.options || []).find((o) => o.key === text);
  return option ? option.label : text;
}

/** The comparison as rows of texts: {columns, rows: [{label, cells, differs, kind}]}. */
function comparison() {
  const pins = (state.pins || []).filter(Boolean);
  const cases = pins.map(readCase);
  const current = readCase(caseParams().toString());
  const results = cases.map(solveCase);
  const currentResult = state.lastResult && state.lastResult.ok ? state.lastResult : solveCase(current);
  const columns = [...cases.map((_, i) => `Case ${i + 1} (pinned)`), "Current"];
  const rows = [];
  for (const field of state.spec.fields) {
    const texts = [...cases, current].map((c) => c.values.get(field.key) ?? "");
    if (texts.every((t) => t === "")) continue;
    const shown = texts.map((text, i) => shownInput(field, text, i < cases.length ? results[i] : currentResult));
    const differs = texts.map((t) => t !== texts[texts.length - 1]);
    rows.push({ label: field.label, cells: shown, differs, kind: "input" });
  }
  rows.push({
    label: "Unit system",
    cells: [...cases, current].map((c) => systemLabel(c.system)),
    differs: [...cases, current].map((c) => c.system !== current.system),
    kind: "input",
  });
  const headline = ((currentResult && currentResult.outputs) || []).filter((o) => o.headline);
  for (const output of headline) {
    const cells = [];
    const notes = [];
    results.forEach((result) => {
      const found = result && result.ok ? (result.outputs || []).find((o) => o.key === output.key) : null;
      cells.push(found ? found.shown : result && !result.ok ? "not solved (invalid input)" : "—");
      if (found && found.si != null && output.si != null) {
        const diff = JSON.parse(glue.case_difference(found.si, output.si, output.unit));
        notes.push(`current − this: ${diff.difference}; current ÷ this: ${diff.ratio}`);
      } else notes.push("");
    });
    cells.push(output.shown);
    notes.push("");
    rows.push({ label: output.label, cells, notes, differs: cells.map(() => false), kind: "result" });
  }
  return { columns, rows, pins: pins.length };
}

/** Redraws the panel: the pin button, and the table when a case is pinned. */
export function updateCompare() {
  const panel = state.ui.compare;
  if (!panel || !state.spec) return;
  const max = sheetDescription().maxPins;
  const pins = (state.pins || []).filter(Boolean);
  const full = pins.length >= max;
  // Without a pinned case the panel is a button and a line of help: drawn once,
  // not on every keystroke.
  const drawn = `${pins.length}/${max}`;
  if (pins.length === 0 && panel.dataset.drawn === drawn) return;
  panel.dataset.drawn = drawn;
  const parts = [
    el("h2", { class: "panel-title", text: "Cases side by side" }),
    el(
      "p",
      { class: "compare-actions" },
      el("button", { type: "button", class: "button", dataset: { action: "pin" }, disabled: full, text: "Pin this case" }),
      " ",
      el("span", {
        class: "compare-help",
        text: full
          ? `${max} cases are pinned; remove one to pin another.`
          : "Pin the current case, then change inputs to compare (up to " + max + " pinned cases).",
      }),
    ),
  ];
  panel.dataset.pins = String(pins.length);
  if (pins.length > 0) {
    const { columns, rows } = comparison();
    const head = el(
      "tr",
      {},
      el("th", { scope: "col", text: "" }),
      ...columns.map((title, i) =>
        el(
          "th",
          { scope: "col" },
          title,
          i < pins.length
            ? el("button", {
                type: "button",
                class: "button unpin",
                dataset: { action: "unpin", index: i },
                "aria-label": `Remove ${title}`,
                text: "×",
              })
            : null,
        ),
      ),
    );
    const body = rows.map((row) =>
      el(
        "tr",
        { class: `compare-${row.kind}` },
        el("th", { scope: "row" }, ...symbolNodes(row.label)),
        ...row.cells.map((text, i) =>
          el(
            "td",
            { class: row.differs[i] ? "differs" : null },
            text,
            row.notes && row.notes[i] ? el("span", { class: "compare-note", text: row.notes[i] }) : null,
          ),
        ),
      ),
    );
    parts.push(
      el(
        "div",
        { class: "table-scroll", tabindex: "0" },
        el("table", { class: "ledger compare-table" }, el("thead", {}, head), el("tbody", {}, ...body)),
      ),
      el(
        "p",
        { class: "table-actions" },
        el("button", { type: "button", class: "button button-small", dataset: { action: "compare-csv" }, text: "Download CSV" }),
      ),
    );
  }
  forgetTable(panel);
  panel.replaceChildren(...parts);
  if (pins.length > 0) watchTable(panel);
}

function downloadComparison() {
  const { columns, rows } = comparison();
  const headers = ["", ...columns];
  const lines = [];
  for (const row of rows) {
    lines.push([row.label, ...row.cells]);
    if (row.notes && row.notes.some(Boolean)) lines.push([`${row.label}: difference and ratio`, ...row.notes]);
  }
  saveCsv("comparison", headers, lines);
}
