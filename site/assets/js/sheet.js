// The calculation sheet: what a printed page carries so that a reviewing engineer
// can file and sign it.
//
// On screen this module adds a folded panel of page-level fields (project, location
// or tag, calculation number, revision, prepared by, checked by, date). They are
// not inputs of any calculation: they go in the link under their glossary keys
// (the core's `sheet_fields`), so a bookmark carries them, and on the printed sheet.
//
// In print it adds a header block with those fields and the handbook version and
// build, the inputs as a table (value and unit as typed, choices by their label),
// and the link printed readably in the header (no `%2F` escapes) beside the same
// link as a QR code, drawn as an SVG path the core made (`qr_code`). Which parts of the
// page print, and how, is the print section of style.css.
//
// It parses no numbers: values are shown as the user typed them.

import { el, svg, symbolNodes } from "./dom.js";
import { state, isQuantity, isVisible } from "./state.js";
import { glue } from "./wasm.js";

/** The core's page-level keys: {fields: [[key, label]], maxPins}, read once. */
let described = null;

export function sheetDescription() {
  if (!described) {
    const view = JSON.parse(glue.sheet_fields());
    described = { fields: view.fields || [], maxPins: view.max_pins || 0 };
  }
  return described;
}

/** Whether `key` is a sheet key (`project`, …). */
export function isSheetKey(key) {
  return sheetDescription().fields.some(([k]) => k === key);
}

/** The pin number of `pin1` … `pin<maxPins>`, or 0. */
export function pinNumber(key) {
  const match = /^pin([1-9])$/.exec(key);
  if (!match) return 0;
  const n = Number(match[1]);
  return n <= sheetDescription().maxPins ? n : 0;
}

/** Whether `key` is a page-level key: a sheet field or a pin. */
export function isPageLevelKey(key) {
  return isSheetKey(key) || pinNumber(key) > 0;
}

/** Takes a page-level pair from the link into state. */
export function takePageLevel(key, value) {
  if (!state.sheet) state.sheet = {};
  if (!state.pins) state.pins = [];
  const pin = pinNumber(key);
  if (pin > 0) state.pins[pin - 1] = value;
  else state.sheet[key] = value;
}

/** Appends the page-level pairs (sheet fields with text, then the pins) to `params`. */
export function writePageLevel(params) {
  for (const [key] of sheetDescription().fields) {
    const text = (state.sheet?.[key] ?? "").trim();
    if (text !== "") params.set(key, text);
  }
  (state.pins || [])
    .filter((query) => query)
    .forEach((query, i) => params.set(`pin${i + 1}`, query));
}

/**
 * The query string with the characters a query may hold as they are (RFC 3986
 * allows `/ : @ , ;` in a query), so a printed or pasted link reads as typed.
 */
export function readableQuery(params) {
  return params
    .toString()
    .replace(/%2F/gi, "/")
    .replace(/%3A/gi, ":")
    .replace(/%40/gi, "@")
    .replace(/%2C/gi, ",");
}

/** The build id: the content hash in the name of the page script. */
export function buildId() {
  const script = document.querySelector('script[type="module"][src]');
  const match = script ? /\.([0-9a-f]{6,})\.js$/i.exec(script.getAttribute("src") || "") : null;
  return match ? match[1] : "";
}

function onSheetInput(event) {
  // The calculator's own listener is for calculator fields only.
  event.stopPropagation();
  const key = event.target?.dataset?.sheetKey;
  if (!key) return;
  state.sheet[key] = event.target.value;
  // url.js imports this module, so the link is written through the hook main.js sets.
  state.writeUrl();
  updateSheet();
}

/** Builds the sheet panel (screen) and the print-only header; called once. */
export function buildSheet() {
  if (!state.sheet) state.sheet = {};
  const section = state.ui.section;
  if (!section) return;
  const grid = el("div", { class: "sheet-grid" });
  for (const [key, label] of sheetDescription().fields) {
    const id = `sheet-${key}`;
    grid.append(
      el("label", { class: "sheet-label", for: id, text: label }),
      el("input", {
        id,
        type: "text",
        class: "sheet-input",
        autocomplete: "off",
        maxlength: 120,
        value: state.sheet[key] ?? "",
        dataset: { sheetKey: key },
      }),
    );
  }
  const panel = el(
    "details",
    { class: "sheet-panel" },
    el("summary", { text: "Calculation sheet: project, tag, checker" }),
    el("p", {
      class: "sheet-help",
      text: "Printed in the sheet's header and kept in the link; not inputs of the calculation.",
    }),
    grid,
  );
  if (Object.values(state.sheet).some((v) => v)) panel.open = true;
  panel.addEventListener("input", onSheetInput);
  panel.addEventListener("change", (event) => event.stopPropagation());
  section.append(panel);

  const header = el("div", { class: "sheet-header", "aria-hidden": "true" });
  const inputs = el("div", { class: "sheet-inputs", "aria-hidden": "true" });
  const main = section.closest("main") || section;
  main.prepend(header);
  state.ui.form?.after(inputs);
  Object.assign(state.ui, { sheetHeader: header, sheetInputs: inputs });
}

/** The page's link as printed: the query with `/` and friends unescaped. */
export function readableLink() {
  const query = readableQuery(new URLSearchParams(location.search));
  return location.origin + location.pathname + (query ? "?" + query : "");
}

/**
 * The header block of a CSV file read alone: version and build, calculator, link,
 * unit system, the sheet fields given, and every shown input as typed with its unit.
 */
export function traceRows() {
  const build = buildId();
  const rows = [
    ["Fluxledger", `${state.page.version || ""}${build ? ` build ${build}` : ""}`],
    ["Calculator", state.spec.title || state.spec.key],
    ["Link", readableLink()],
    ["Unit system", state.system],
  ];
  for (const [key, label] of sheetDescription().fields) {
    const text = (state.sheet?.[key] ?? "").trim();
    if (text) rows.push([label, text]);
  }
  for (const field of state.spec.fields.filter((f) => isVisible(f))) {
    const { value, unit } = typedValue(field);
    rows.push(["Input", field.label, value, unit]);
  }
  return rows;
}

function headerCell(label, value) {
  return [el("th", { scope: "row", text: label }), el("td", { text: value || "" })];
}

/** The text of a field as typed, with its unit (quantities) or its option label. */
export function typedValue(field) {
  const text = (state.values[field.key] ?? "").trim();
  if (text === "") return { value: "not given", unit: "" };
  if (isQuantity(field)) {
    const unitId = state.units[field.key] || "";
    // A plain number (the core's unit `-`) is shown bare, as the core shows it.
    if (unitId === "-") return { value: text, unit: "" };
    const unit = (field.units || []).find((u) => u.id === unitId);
    return { value: text, unit: unit ? unit.label : unitId };
  }
  const option = (field.options || []).find((o) => o.key === text);
  return { value: option ? option.label : text, unit: "" };
}

/** Refreshes the printed header, inputs table and link; cheap, called after each change. */
export function updateSheet() {
  const ui = state.ui;
  if (!ui.sheetHeader) return;
  const build = buildId();
  const pairs = sheetDescription().fields.map(([key, label]) => [label, state.sheet?.[key] ?? ""]);
  pairs.push(["Handbook", `Fluxledger ${state.page.version || ""}${build ? ` · build ${build}` : ""}`]);
  const rows = [];
  for (let i = 0; i < pairs.length; i += 2) {
    rows.push(el("tr", {}, ...pairs.slice(i, i + 2).flatMap(([label, text]) => headerCell(label, text))));
  }

  // Two inputs to a row, a text field (a list of lines) on a row of its own;
  // optional fields left empty are named in one line.
  const shownFields = state.spec.fields.filter((field) => isVisible(field));
  const given = shownFields.filter((field) => (state.values[field.key] ?? "").trim() !== "");
  const notGiven = shownFields.filter((field) => (state.values[field.key] ?? "").trim() === "");
  const inputRows = [];
  let pending = [];
  const flush = () => {
    if (pending.length > 0) inputRows.push(el("tr", {}, ...pending));
    pending = [];
  };
  for (const field of given) {
    const { value: shown, unit } = typedValue(field);
    const label = el("th", { scope: "row" }, ...symbolNodes(field.label));
    if (field.kind === "text") {
      flush();
      inputRows.push(el("tr", {}, label, el("td", { class: "sheet-value sheet-text", colspan: 3, text: shown })));
      continue;
    }
    pending.push(label, el("td", { class: "sheet-value", text: unit ? `${shown} ${unit}` : shown }));
    if (pending.length === 4) flush();
  }
  flush();
  const parts = [
    el("h2", { class: "panel-title", text: "Inputs" }),
    el("table", { class: "sheet-inputs-table" }, el("tbody", {}, ...inputRows)),
  ];
  // (replaceChildren would write a missing part as the text "null")
  if (notGiven.length > 0) {
    parts.push(el("p", { class: "sheet-not-given" }, ...symbolNodes(`Not given: ${notGiven.map((f) => f.label).join("; ")}.`)));
  }
  ui.sheetInputs.replaceChildren(...parts);

  const link = readableLink();
  const code = JSON.parse(glue.qr_code(link));
  const qr =
    code && code.ok
      ? svg(
          "svg",
          {
            class: "sheet-qr",
            viewBox: `-4 -4 ${code.size + 8} ${code.size + 8}`,
            role: "img",
            "aria-label": "QR code of the link",
          },
          svg("rect", { x: -4, y: -4, width: code.size + 8, height: code.size + 8, fill: "#fff" }),
          svg("path", { d: code.path, fill: "#000" }),
        )
      : el("p", { class: "sheet-qr-missing", text: code?.message || "" });
  const system = (state.page.unit_systems || []).find((u) => u.key === state.system);
  // The header: title, the sheet fields beside the QR code, then the link in words.
  ui.sheetHeader.replaceChildren(
    el("p", { class: "sheet-kind" }, el("strong", { text: "Calculation sheet · " }), state.spec.title || ""),
    el(
      "div",
      { class: "sheet-head-row" },
      el("table", { class: "sheet-fields-table" }, el("tbody", {}, ...rows)),
      qr,
    ),
    el(
      "div",
      { class: "sheet-url" },
      el("p", {}, el("strong", { text: "Link to this calculation: " }), el("span", { class: "sheet-url-text", text: link })),
      el("p", {
        text: `Printed ${new Date().toISOString().slice(0, 10)} · unit system ${system ? system.label : state.system}`,
      }),
    ),
  );
}
