// Fluxledger page script: the one script of every page.
//
// It renders what the core describes and nothing more. It parses no numbers and
// holds no physics: what the user typed goes to the wasm `solve` as text, and the
// page shows the formatted outputs, the ledger tables, the diagrams and plots, the
// warnings and the field errors that come back. The state of a calculation lives in
// the URL (`?p=150psi&d=12in&units=us`); every piece of URL or user text is written
// to the page through `textContent` or `value`, never as markup, and never into an
// `href` or `src`.
//
// Layout of the calculator section (filled into `<section id="calculator">`):
//   toolbar (unit system, copy link, print) · #notices · headline results ·
//   input form · details (links to a next calculator, other outputs, warnings,
//   tables with a CSV download, diagrams, plots) · print footer (link and version).
//
// The one `href` the script writes is a link to another calculator (`carry_over` of a
// result): the page name is a key found in the catalog, the query the inputs the core
// wrote, encoded by URLSearchParams; the target page reads them as data like any URL.

const SVG_NS = "http://www.w3.org/2000/svg";

/** Longest piece of URL text quoted back in a notice. */
const QUOTE_MAX = 60;

/** Plain names of the shape styles, for diagram legends. */
const STYLE_NAMES = {
  restraint: "Restraint: force the supports exert on the fitting",
  thrust: "Thrust: force the fluid exerts on the fitting",
  pressure: "Pressure force (gauge)",
  momentum: "Momentum flux",
  weight: "Weight",
  velocity: "Velocity",
  flow: "Flow direction",
  control_volume: "Control volume",
  wall: "Pipe or body",
  fluid: "Fluid",
  guide: "Guide line",
};

// ---------------------------------------------------------------------------
// Small DOM helpers (text only).

/** Creates an HTML element with attributes and text or child nodes. */
function el(tag, attrs, ...children) {
  const node = document.createElement(tag);
  setAttrs(node, attrs);
  for (const child of children) {
    if (child === null || child === undefined || child === false) continue;
    node.append(typeof child === "string" ? document.createTextNode(child) : child);
  }
  return node;
}

/** Creates an SVG element with attributes. */
function svg(tag, attrs, ...children) {
  const node = document.createElementNS(SVG_NS, tag);
  setAttrs(node, attrs);
  for (const child of children) {
    if (child === null || child === undefined) continue;
    node.append(typeof child === "string" ? document.createTextNode(child) : child);
  }
  return node;
}

function setAttrs(node, attrs) {
  if (!attrs) return;
  for (const [name, value] of Object.entries(attrs)) {
    if (value === null || value === undefined || value === false) continue;
    if (name === "text") node.textContent = value;
    else if (name === "dataset") Object.assign(node.dataset, value);
    else node.setAttribute(name, value === true ? "" : String(value));
  }
}

/** Shortens text for quoting (by code points, so no surrogate is split). */
function quote(text) {
  const chars = Array.from(String(text));
  const cut = chars.length > QUOTE_MAX ? chars.slice(0, QUOTE_MAX).join("") + "…" : chars.join("");
  return "“" + cut + "”" + (chars.length > QUOTE_MAX ? ` (${chars.length} characters)` : "");
}

/** Shortens a message that may repeat user text (at most 300 characters). */
function clip(text) {
  const chars = Array.from(String(text));
  return chars.length > 300 ? chars.slice(0, 300).join("") + "…" : chars.join("");
}

/** Shows unit ids with superscripts and a centre dot (display only; ids stay ASCII). */
function prettyUnit(id) {
  if (id === "degC") return "°C";
  if (id === "degF") return "°F";
  if (id === "deg") return "°";
  return id
    .replace(/([A-Za-z)])2(?![0-9])/g, "$1²")
    .replace(/([A-Za-z)])3(?![0-9])/g, "$1³")
    .replace(/\./g, "·");
}

/** Prettifies the unit of a formatted "number unit" value; other text is untouched. */
function prettyValue(text) {
  const match = /^([-+]?[0-9][0-9.,]*(?:e[-+]?[0-9]+)?) (\S+)$/.exec(text);
  if (!match) return text;
  const unit = prettyUnit(match[2]);
  return unit === "°" ? match[1] + "°" : match[1] + " " + unit;
}

// ---------------------------------------------------------------------------
// The wasm module. Loaded on calculator pages only; re-initialised after a trap.

let glue = null;
let glueGeneration = 0;

async function loadGlue() {
  // A new query string gives a fresh module instance (a trapped instance cannot be
  // reset); the service worker answers it from the cache as well.
  const suffix = glueGeneration === 0 ? "" : `?instance=${glueGeneration}`;
  glueGeneration += 1;
  const module = await import("./__GLUE__" + suffix);
  await module.default();
  glue = module;
}

// ---------------------------------------------------------------------------
// Page state.

const state = {
  catalog: null,
  spec: null,
  /** field key -> text as typed */
  values: {},
  /** field key -> unit id shown in the selector */
  units: {},
  system: "si",
  /** field key -> {number, unit} from the last solve */
  echoes: {},
  firstResultMarked: false,
  /** Refs to the DOM parts. */
  ui: {},
  figureWidth: 0,
  // Viewport height, read once and on resize: reading it while a result is being
  // drawn would force a synchronous layout on every keystroke.
  viewportHeight: window.innerHeight || 800,
  lastResult: null,
  /**
   * field key -> what the unit-system switch replaced, so that switching back
   * restores the text as typed: {system, text, unit} before, {shown, shownUnit} after.
   */
  converted: new Map(),
};

function defaultUnit(field, system) {
  return system === "us" ? field.us_unit || field.si_unit : field.si_unit || field.us_unit;
}

function isQuantity(field) {
  return field.kind === "quantity" && Array.isArray(field.units) && field.units.length > 0;
}

// ---------------------------------------------------------------------------
// Notices.

function noticesBox() {
  let box = document.getElementById("notices");
  if (!box) {
    box = el("div", { id: "notices", class: "notices", role: "status", "aria-live": "polite" });
    const host = document.getElementById("calculator") || document.body;
    host.prepend(box);
  }
  return box;
}

/** Most notices shown at once; any further ones are counted in one closing line. */
const NOTICES_MAX = 20;

/**
 * Shows a notice. `parts` are strings (plain text) or nodes; `action` an optional
 * `{label, run}` button. A notice with the same kind and text as one already shown
 * is not repeated; beyond NOTICES_MAX, notices are only counted.
 */
function notice(kind, parts, action) {
  const box = noticesBox();
  const text = parts.map((part) => (typeof part === "string" ? part : part.textContent)).join("");
  for (const shown of box.querySelectorAll(":scope > p.notice")) {
    if (shown.dataset.kind === kind && shown.dataset.text === text) return shown;
  }
  const items = box.querySelectorAll(":scope > p.notice:not(.notice-overflow)");
  if (items.length >= NOTICES_MAX) {
    let overflow = box.querySelector(":scope > p.notice-overflow");
    if (!overflow) {
      overflow = el("p", { class: "notice notice-warn notice-overflow" });
      box.append(overflow);
    }
    const count = Number(overflow.dataset.count || 0) + 1;
    overflow.dataset.count = String(count);
    overflow.textContent = `${count} further ${count === 1 ? "notice was" : "notices were"} left out.`;
    return overflow;
  }
  const item = el("p", { class: `notice notice-${kind}`, dataset: { kind, text } });
  for (const part of parts) item.append(typeof part === "string" ? document.createTextNode(part) : part);
  if (action) {
    const button = el("button", { type: "button", class: "notice-action", text: action.label });
    button.addEventListener("click", action.run);
    item.append(" ", button);
  }
  const dismiss = el("button", { type: "button", class: "notice-dismiss", "aria-label": "Dismiss this notice", text: "×" });
  dismiss.addEventListener("click", () => item.remove());
  item.append(dismiss);
  const overflow = box.querySelector(":scope > p.notice-overflow");
  if (overflow) box.insertBefore(item, overflow);
  else box.append(item);
  return item;
}

// ---------------------------------------------------------------------------
// URL state.

/** How many keys a notice names before it says "and N more". */
const NOTICE_NAMES_MAX = 10;

/** Quotes up to NOTICE_NAMES_MAX texts, then says how many more there are. */
function quoteList(texts) {
  const named = texts.slice(0, NOTICE_NAMES_MAX).map(quote).join(", ");
  const more = texts.length - NOTICE_NAMES_MAX;
  return more > 0 ? `${named} and ${more} more` : named;
}

/**
 * Reads the query string into state, collecting notices for what cannot be used:
 * one notice for every key this page does not use (naming the first few), one for
 * each key given more than once (the last value is the one used, as before, but
 * never silently), and one for an unknown unit system naming the system used.
 */
function readUrl(spec) {
  const params = new URLSearchParams(location.search);
  const fromUrl = new Map();
  const keys = new Set(spec.fields.map((f) => f.key));
  keys.add("units");
  /** key -> every value given, in order (known keys only) */
  const given = new Map();
  const unknown = [];
  const unknownSeen = new Set();
  for (const [key, value] of params) {
    if (!keys.has(key)) {
      if (!unknownSeen.has(key)) {
        unknownSeen.add(key);
        unknown.push(key);
      }
      continue;
    }
    if (!given.has(key)) given.set(key, []);
    given.get(key).push(value);
  }
  const repeated = [];
  for (const [key, values] of given) {
    const value = values[values.length - 1];
    if (values.length > 1) repeated.push([key, values]);
    if (key === "units") {
      if (value === "si" || value === "us") state.system = value;
      else
        notice("warn", [
          `The link asks for the unit system ${quote(value)}, which is not known (use “si” or “us”); ${
            state.system === "us" ? "US customary" : "SI"
          } is used.`,
        ]);
    } else {
      fromUrl.set(key, value);
    }
  }
  for (const [key, values] of repeated.slice(0, NOTICE_NAMES_MAX)) {
    const distinct = new Set(values).size;
    notice("warn", [
      `The link gives ${quote(key)} ${values.length} times${
        distinct === 1 ? " with the same value" : ` (${quoteList(values)})`
      }; the last, ${quote(values[values.length - 1])}, is used. Check it before using the result.`,
    ]);
  }
  if (repeated.length > NOTICE_NAMES_MAX) {
    notice("warn", [
      `The link gives ${repeated.length - NOTICE_NAMES_MAX} more entries more than once (${quoteList(
        repeated.slice(NOTICE_NAMES_MAX).map(([key]) => key),
      )}); the last value of each is used.`,
    ]);
  }
  if (unknown.length === 1) {
    notice("warn", [`The link has an entry ${quote(unknown[0])} that this page does not use; it was left out.`]);
  } else if (unknown.length > 1) {
    notice("warn", [
      `The link has ${unknown.length} entries that this page does not use; they were left out: ${quoteList(unknown)}.`,
    ]);
  }
  return fromUrl;
}

/** Writes the current inputs to the address bar (no new history entry). */
function writeUrl() {
  const params = new URLSearchParams();
  for (const field of state.spec.fields) {
    if (!isVisible(field)) continue;
    const text = (state.values[field.key] ?? "").trim();
    const echo = state.echoes[field.key];
    if (text === "") {
      if (field.demo) params.set(field.key, "");
    } else if (echo && isQuantity(field)) {
      params.set(field.key, echo.number + echo.unit);
    } else {
      params.set(field.key, text);
    }
  }
  params.set("units", state.system);
  history.replaceState(history.state, "", "?" + params.toString());
  updatePrintFooter();
}

// ---------------------------------------------------------------------------
// Solving.

function request() {
  const inputs = {};
  const units = {};
  for (const field of state.spec.fields) {
    inputs[field.key] = state.values[field.key] ?? "";
    if (isQuantity(field)) units[field.key] = state.units[field.key] || defaultUnit(field, state.system);
  }
  return { inputs, units };
}

/** Calls the wasm solve; recovers from a trap by loading a fresh module instance. */
function solveNow() {
  const { inputs, units } = request();
  try {
    return glue.solve(state.spec.key, inputs, units, state.system);
  } catch (error) {
    const trapped = error instanceof WebAssembly.RuntimeError;
    notice("error", [
      trapped
        ? "The calculation stopped unexpectedly for these inputs. The calculator was restarted; please check the inputs. This is a fault in Fluxledger."
        : "The calculation could not be run for these inputs. This is a fault in Fluxledger.",
    ]);
    glue = null;
    restart();
    return null;
  }
}

async function restart() {
  try {
    await loadGlue();
    recompute({ writeToUrl: false });
  } catch (error) {
    notice("error", ["The calculator could not be restarted; reload the page."]);
    document.body.dataset.state = "error";
  }
}

function recordEchoes(result) {
  state.echoes = {};
  for (const echo of result.echoes || []) {
    if (echo && echo.field) state.echoes[echo.field] = { number: echo.number, unit: echo.unit };
  }
}

/** Recomputes, renders, and optionally writes the URL. */
function recompute({ writeToUrl }) {
  if (!glue) return;
  const result = solveNow();
  if (!result) return;
  recordEchoes(result);
  syncUnitSelectors();
  applyVisibility();
  render(result);
  if (writeToUrl) writeUrl();
}

// ---------------------------------------------------------------------------
// Building the form.

function isVisible(field) {
  // A field is shown while its rule holds and the field it depends on is shown
  // (the core's catalog::is_shown follows the same chain).
  let current = field;
  for (let depth = 0; depth <= state.spec.fields.length; depth += 1) {
    const rule = current.visible_when;
    if (!rule) return true;
    if (!(Array.isArray(rule.values) && rule.values.includes(state.values[rule.field] ?? ""))) return false;
    const controller = state.spec.fields.find((f) => f.key === rule.field);
    if (!controller) return true;
    current = controller;
  }
  return true;
}

function controlId(key) {
  return "field-" + key;
}

function buildToolbar() {
  const bar = el("div", { class: "toolbar" });

  const systems = el("fieldset", { class: "system-switch" }, el("legend", { text: "Units" }));
  for (const system of state.catalog.unit_systems || [
    { key: "si", label: "SI" },
    { key: "us", label: "US customary" },
  ]) {
    const input = el("input", { type: "radio", name: "unit-system", value: system.key });
    input.checked = system.key === state.system;
    input.addEventListener("change", () => {
      if (!input.checked) return;
      changeSystem(system.key);
    });
    systems.append(el("label", { class: "system-option" }, input, el("span", { text: system.label })));
  }

  const systemStatus = el("p", { class: "system-status", role: "status", "aria-live": "polite" });
  systems.setAttribute("aria-describedby", "system-help");

  const copy = el("button", { type: "button", class: "button", text: "Copy link" });
  copy.addEventListener("click", copyLink);
  const print = el("button", { type: "button", class: "button", text: "Print sheet" });
  print.addEventListener("click", () => window.print());
  const copyStatus = el("span", { class: "copy-status", role: "status", "aria-live": "polite" });
  const copyField = el("input", {
    type: "text",
    class: "copy-field",
    readonly: true,
    "aria-label": "Link to this calculation",
    hidden: true,
  });

  const systemHelp = el("p", {
    id: "system-help",
    class: "system-help",
    text: "Switching converts filled values; switching back restores them as typed.",
  });
  bar.append(systems, el("div", { class: "toolbar-actions" }, copy, print, copyStatus), copyField, systemHelp, systemStatus);
  state.ui.systemInputs = systems.querySelectorAll("input");
  state.ui.systemStatus = systemStatus;
  state.ui.copyStatus = copyStatus;
  state.ui.copyField = copyField;
  return bar;
}

/**
 * Switches the page's unit system. Every filled quantity field is converted (by the
 * core, through `convert`) to the field's default unit in the new system, whatever
 * unit it was typed in; a field the core cannot read stays as typed and is named.
 * What a field held before is remembered: switching back restores the text and
 * unit as typed, as long as the converted value was not edited in between.
 * Empty fields take the new system's default unit.
 */
function changeSystem(system) {
  const from = state.system;
  if (system === from) return;
  state.system = system;
  let converted = 0;
  let restored = 0;
  const refused = [];
  for (const field of state.spec.fields) {
    if (!isQuantity(field)) continue;
    const key = field.key;
    const text = (state.values[key] ?? "").trim();
    const target = defaultUnit(field, system);
    if (text === "") {
      state.converted.delete(key);
      setField(field, "", target);
      continue;
    }
    const unit = state.echoes[key]?.unit || state.units[key] || target;
    const memo = state.converted.get(key);
    state.converted.delete(key);
    if (memo && memo.system === system && memo.shown === text && memo.shownUnit === unit) {
      setField(field, memo.text, memo.unit);
      restored += 1;
      continue;
    }
    if (unit === target) continue;
    let answer = null;
    try {
      answer = glue.convert(state.spec.key, key, text, state.units[key] || unit, system);
    } catch (error) {
      answer = null;
    }
    if (answer && answer.ok) {
      state.converted.set(key, {
        system: from,
        text: state.values[key],
        unit: state.units[key] || unit,
        shown: answer.number,
        shownUnit: answer.unit,
      });
      setField(field, answer.number, answer.unit);
      converted += 1;
    } else {
      refused.push(field.label);
    }
  }
  recompute({ writeToUrl: true });
  const name = system === "us" ? "US customary" : "SI";
  const parts = [];
  if (converted > 0) parts.push(`${converted} ${converted === 1 ? "value" : "values"} converted to ${name} units.`);
  if (restored > 0) parts.push(`${restored} ${restored === 1 ? "value" : "values"} restored as typed.`);
  if (refused.length > 0) parts.push(`Not converted (check the value): ${refused.join(", ")}.`);
  if (state.ui.systemStatus) state.ui.systemStatus.textContent = parts.join(" ");
}

/** Puts text and a unit into a field's input and selector (and the page state). */
function setField(field, text, unit) {
  state.values[field.key] = text;
  state.units[field.key] = unit;
  const control = state.ui.controls.get(field.key);
  if (control && control.value !== text) control.value = text;
  const select = state.ui.unitSelects.get(field.key);
  if (select && unit) select.value = unit;
}

async function copyLink() {
  const link = location.href;
  const status = state.ui.copyStatus;
  try {
    if (!navigator.clipboard || !window.isSecureContext) throw new Error("no clipboard");
    await navigator.clipboard.writeText(link);
    status.textContent = "Link copied.";
    state.ui.copyField.hidden = true;
  } catch (error) {
    const field = state.ui.copyField;
    field.value = link;
    field.hidden = false;
    field.focus();
    field.select();
    status.textContent = "Copy the selected link.";
  }
}

function buildField(field) {
  const id = controlId(field.key);
  const wrap = el("div", { class: "field", dataset: { field: field.key } });
  const describedBy = [];
  const label = el("label", { for: id, class: "field-label", text: field.label });
  if (field.optional) label.append(el("span", { class: "optional", text: " (optional)" }));
  wrap.append(label);

  let control;
  const entry = el("div", { class: "entry" });
  if (field.kind === "choice") {
    control = el("select", { id, name: field.key, class: "choice" });
    for (const option of field.options || []) {
      control.append(el("option", { value: option.key, text: option.label }));
    }
    control.value = state.values[field.key] ?? "";
    entry.append(control);
  } else if (field.kind === "text") {
    const lines = (state.values[field.key] ?? "").split("\n").length;
    control = el("textarea", {
      id,
      name: field.key,
      rows: Math.max(4, Math.min(14, lines + 1)),
      spellcheck: "false",
      autocapitalize: "off",
      autocomplete: "off",
    });
    control.value = state.values[field.key] ?? "";
    entry.append(control);
  } else {
    control = el("input", {
      id,
      name: field.key,
      type: "text",
      class: "quantity",
      autocomplete: "off",
      autocapitalize: "off",
      spellcheck: "false",
      enterkeyhint: "done",
    });
    control.value = state.values[field.key] ?? "";
    entry.append(control);
    if (isQuantity(field)) {
      const select = el("select", { class: "unit", "aria-label": `Unit of ${field.label}` });
      for (const unit of field.units) select.append(el("option", { value: unit, text: prettyUnit(unit) }));
      select.value = state.units[field.key];
      select.addEventListener("change", () => {
        state.units[field.key] = select.value;
        recompute({ writeToUrl: true });
      });
      state.ui.unitSelects.set(field.key, select);
      entry.append(select);
    }
    // When the user leaves a field, show the number alone with its unit in the
    // selector, as the core read it (`150 psi` -> `150` [psi]).
    control.addEventListener("change", () => normaliseField(field));
  }
  // Text fields recompute on every keystroke; a choice when it is changed.
  control.addEventListener(field.kind === "choice" ? "change" : "input", () => {
    state.values[field.key] = control.value;
    recompute({ writeToUrl: true });
  });
  wrap.append(entry);

  if (field.help) {
    const help = el("p", { class: "help", id: id + "-help", text: field.help });
    describedBy.push(help.id);
    wrap.append(help);
  }
  const error = el("p", { class: "field-error", id: id + "-error", dataset: { errorFor: field.key }, hidden: true });
  describedBy.push(error.id);
  const warning = el("p", { class: "field-warning", id: id + "-warning", hidden: true });
  describedBy.push(warning.id);
  wrap.append(error, warning);
  control.setAttribute("aria-describedby", describedBy.join(" "));

  state.ui.controls.set(field.key, control);
  state.ui.fieldWraps.set(field.key, wrap);
  state.ui.fieldErrors.set(field.key, error);
  state.ui.fieldWarnings.set(field.key, warning);
  return wrap;
}

function normaliseField(field) {
  const echo = state.echoes[field.key];
  const control = state.ui.controls.get(field.key);
  if (!echo || !control || !isQuantity(field)) return;
  if (control.value.trim() !== echo.number) {
    control.value = echo.number;
    state.values[field.key] = echo.number;
  }
  if (state.units[field.key] !== echo.unit) {
    state.units[field.key] = echo.unit;
    const select = state.ui.unitSelects.get(field.key);
    if (select) select.value = echo.unit;
  }
}

/** Keeps each unit selector on the unit the core actually applied. */
function syncUnitSelectors() {
  for (const [key, select] of state.ui.unitSelects) {
    const echo = state.echoes[key];
    if (echo && echo.unit && select.value !== echo.unit) {
      select.value = echo.unit;
      state.units[key] = echo.unit;
    }
  }
}

function applyVisibility() {
  for (const field of state.spec.fields) {
    const wrap = state.ui.fieldWraps.get(field.key);
    if (!wrap) continue;
    wrap.hidden = !isVisible(field);
    // Lets the printed sheet show an empty optional field as "not given".
    wrap.toggleAttribute("data-empty", (state.values[field.key] ?? "").trim() === "");
  }
}

function buildPage() {
  const section = document.getElementById("calculator") || document.body.appendChild(el("section", { id: "calculator" }));
  state.ui.controls = new Map();
  state.ui.unitSelects = new Map();
  state.ui.fieldWraps = new Map();
  state.ui.fieldErrors = new Map();
  state.ui.fieldWarnings = new Map();

  const toolbar = buildToolbar();
  const notices = noticesBox();

  const headline = el("div", { class: "headline", "aria-live": "polite", "aria-atomic": "true" });
  const form = el("form", { class: "inputs", novalidate: true, "aria-label": "Inputs" });
  form.addEventListener("submit", (event) => event.preventDefault());
  form.append(el("h2", { class: "panel-title", text: "Inputs" }));
  for (const field of state.spec.fields) form.append(buildField(field));

  const details = el("div", { class: "details" });
  const printFooter = el("div", { class: "print-footer" });

  // The headline stays in view while the inputs scroll past (on phones), and no
  // further: it sticks within this wrapper only.
  const main = el("div", { class: "calc-main" }, headline, form);
  const grid = el("div", { class: "calc-grid" }, main, details);
  section.replaceChildren(toolbar, notices, grid);
  // The printed sheet ends with the link and version, after the method and cautions.
  (section.closest("main") || section).append(printFooter);
  Object.assign(state.ui, { section, headline, form, details, printFooter });

  window.addEventListener("resize", () => {
    state.viewportHeight = window.innerHeight || 800;
    const width = measureFigureWidth();
    if (width !== state.figureWidth && state.lastResult) render(state.lastResult);
  });
}

function updatePrintFooter() {
  const footer = state.ui.printFooter;
  if (!footer) return;
  footer.replaceChildren(
    el("p", {}, el("strong", { text: "Link to this calculation: " }), el("span", { class: "print-url", text: location.href })),
    el("p", {
      text: `Fluxledger ${state.catalog.version || ""} · printed ${new Date().toISOString().slice(0, 10)} · unit system ${
        state.system === "us" ? "US customary" : "SI"
      }`,
    }),
  );
}

// ---------------------------------------------------------------------------
// Rendering results.

function render(result) {
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
        el("dd", { dataset: { output: output.key }, title: output.text, text: prettyValue(output.text) }),
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
  // replaceChildren writes a null argument as the text "null": pass only nodes.
  const headlineParts = [el("h2", { class: "panel-title", text: "Result" }), headline];
  if (warningList) headlineParts.push(warningList);
  ui.headline.replaceChildren(...headlineParts);

  const parts = [];
  const links = renderCarryOver(result.carry_over || []);
  if (links) parts.push(links);
  if (others.childElementCount > 0) {
    parts.push(el("section", { class: "panel" }, el("h2", { class: "panel-title", text: "Other results" }), others));
  }
  for (const table of result.tables || []) parts.push(renderTable(table));
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
function measureFigureWidth() {
  const details = state.ui.details;
  // Panels have 0.75 rem of padding and a 1 px border on each side.
  const width = details ? Math.round(details.clientWidth) - 26 : 0;
  state.figureWidth = width > 0 ? Math.min(width, 720) : 300;
  return state.figureWidth;
}

function renderTable(table) {
  const element = el("table", { class: "ledger", dataset: { table: table.key || "" } });
  // The title stands above the scrolling area, so a wide table scrolls under it
  // instead of cutting it off; the caption keeps it for screen readers.
  if (table.title) element.append(el("caption", { class: "visually-hidden", text: table.title }));
  const head = el("tr");
  for (const column of table.columns || []) {
    // "area (mm2)" -> "area (mm²)"
    const text = String(column).replace(/\(([A-Za-z0-9./%-]+)\)$/, (_, unit) => `(${prettyUnit(unit)})`);
    head.append(el("th", { scope: "col", text }));
  }
  element.append(el("thead", {}, head));
  const body = el("tbody");
  const emphasised = new Set(table.emphasised_rows || []);
  for (const [index, row] of (table.rows || []).entries()) {
    const tr = el("tr", emphasised.has(index) ? { class: "emphasised" } : {});
    row.forEach((cell, column) => {
      // Numbers line up on the right and never wrap; words (a basis table's
      // explanations) wrap on the left so a phone shows them whole.
      const wordy = /[A-Za-z]{3,}/.test(String(cell)) && !/^[-+]?[0-9]/.test(String(cell));
      tr.append(
        column === 0
          ? el("th", { scope: "row", text: cell })
          : el("td", wordy ? { class: "text", text: prettyValue(cell) } : { text: prettyValue(cell) }),
      );
    });
    body.append(tr);
  }
  element.append(body);
  const download = el("button", {
    type: "button",
    class: "button button-small csv-download",
    text: "Download CSV",
    "aria-label": `Download ${table.title || "the table"} as CSV`,
  });
  download.addEventListener("click", () => downloadCsv(table));
  return el(
    "section",
    { class: "panel panel-table" },
    table.title ? el("h3", { class: "table-title", "aria-hidden": "true", text: table.title }) : null,
    el("div", { class: "table-scroll", tabindex: "0" }, element),
    el("div", { class: "table-actions" }, download),
  );
}

// ---------------------------------------------------------------------------
// CSV of a table (the adapter writes it from the core's cells, as shown).

/** Saves a table as `<calculator>-<table key>.csv` through a temporary object URL. */
function downloadCsv(table) {
  // The adapter writes the CSV and neutralises every cell a spreadsheet would run
  // as a formula (one rule, tested natively in wasm/src/csv.rs).
  const text = glue.table_csv(table.columns || [], table.rows || []);
  const name = `${state.spec.key}-${table.key || "table"}.csv`;
  // The last file made, for the browser tests (name and text only).
  window.__fluxledgerLastCsv = { name, text };
  // A byte order mark, so that spreadsheet programs read the file as UTF-8.
  const url = URL.createObjectURL(new Blob(["\ufeff", text], { type: "text/csv;charset=utf-8" }));
  const link = el("a", { href: url, download: name, hidden: true });
  document.body.append(link);
  link.click();
  link.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}

// ---------------------------------------------------------------------------
// Links to another calculator with inputs carried over.

/**
 * Renders the result's `carry_over` links. The page name is a key found in the
 * catalog (never text from the address bar); the inputs are the core's text,
 * encoded by URLSearchParams; the page's unit system goes along.
 */
function renderCarryOver(items) {
  const list = el("ul", { class: "carry-over" });
  for (const item of items) {
    const target = (state.catalog.calculators || []).find((c) => c.key === item?.calculator);
    if (!target) continue;
    const params = new URLSearchParams();
    for (const [key, value] of Object.entries(item.inputs || {})) {
      if (typeof value === "string") params.set(key, value);
    }
    params.set("units", state.system);
    const link = el(
      "a",
      { class: "carry-link", href: `${target.key}.html?${params.toString()}`, dataset: { carryTo: target.key } },
      el("span", { class: "carry-label", text: item.label || target.title }),
      el("span", { class: "carry-target", text: target.title }),
    );
    list.append(el("li", {}, link));
  }
  if (list.childElementCount === 0) return null;
  return el("nav", { class: "panel panel-next", "aria-label": "Next step" }, el("h2", { class: "panel-title", text: "Next step" }), list);
}

// ---------------------------------------------------------------------------
// Diagrams: model coordinates in metres, y up; SVG y down, so y is negated.

function finite(...numbers) {
  return numbers.every((n) => typeof n === "number" && Number.isFinite(n));
}

/** Breaks text at spaces into lines of at most `max` characters (longer words stay whole). */
function wrapWords(text, max) {
  const lines = [];
  let line = "";
  for (const word of String(text).split(/\s+/).filter(Boolean)) {
    if (line && Array.from(line).length + 1 + Array.from(word).length > max) {
      lines.push(line);
      line = word;
    } else {
      line = line ? `${line} ${word}` : word;
    }
  }
  if (line) lines.push(line);
  // A lone "=" or unit letter joins the line before it.
  if (lines.length > 1 && Array.from(lines[lines.length - 1]).length <= 2) {
    const last = lines.pop();
    lines.push(`${lines.pop()} ${last}`);
  }
  return lines.length > 0 ? lines : [String(text)];
}

/** Screen size of diagram labels, in CSS pixels. */
const LABEL_PX = 13;

/**
 * Where a label sits relative to its point: text anchor, baseline, and its box in
 * screen pixels (x right, y down), estimated from its length.
 */
function labelLayout(label) {
  let anchor = "middle";
  let baseline = "central";
  if (!label.plain) {
    if (label.ux > 0.3) anchor = "start";
    else if (label.ux < -0.3) anchor = "end";
    if (Math.abs(label.uy) > Math.abs(label.ux)) baseline = label.uy > 0 ? "auto" : "hanging";
  }
  const w = Math.max(...label.lines.map((line) => Array.from(line).length)) * LABEL_PX * 0.64;
  const h = LABEL_PX * 1.2 * label.lines.length + LABEL_PX * 0.05;
  const x0 = anchor === "start" ? 0 : anchor === "end" ? -w : -w / 2;
  const y0 = baseline === "auto" ? -h * 0.85 : baseline === "hanging" ? 0 : -h / 2;
  return { anchor, baseline, box: [x0, y0, x0 + w, y0 + h] };
}

function renderDiagram(diagram, index, width) {
  let [minX, minY, maxX, maxY] = diagram.bounds || [0, 0, 1, 1];
  if (!finite(minX, minY, maxX, maxY) || maxX <= minX || maxY <= minY) [minX, minY, maxX, maxY] = [0, 0, 1, 1];
  const centre = [(minX + maxX) / 2, (minY + maxY) / 2];
  const styles = new Set();
  const arrowStyles = new Set();
  const geometry = [];
  const labels = [];

  for (const shape of diagram.shapes || []) {
    const style = String(shape.style || "label");
    switch (shape.type) {
      case "polygon":
      case "polyline": {
        const points = (shape.points || []).filter((p) => Array.isArray(p) && finite(p[0], p[1]));
        if (points.length < 2) break;
        geometry.push({ tag: shape.type, style, points });
        styles.add(style);
        break;
      }
      case "circle": {
        const c = shape.center || [];
        if (!finite(c[0], c[1], shape.radius)) break;
        geometry.push({ tag: "circle", style, c, r: Math.abs(shape.radius) });
        styles.add(style);
        break;
      }
      case "arrow": {
        const a = shape.from || [];
        const b = shape.to || [];
        if (!finite(a[0], a[1], b[0], b[1])) break;
        geometry.push({ tag: "arrow", style, a, b });
        arrowStyles.add(style);
        styles.add(style);
        if (shape.label) {
          // Label the end farther from the middle of the drawing, just beyond it,
          // so labels of arrows meeting at the fitting do not pile up.
          const far = (p) => Math.hypot(p[0] - centre[0], p[1] - centre[1]);
          const atTip = far(b) >= far(a);
          const at = atTip ? b : a;
          const other = atTip ? a : b;
          const length = Math.hypot(at[0] - other[0], at[1] - other[1]) || 1;
          labels.push({ at, ux: (at[0] - other[0]) / length, uy: (at[1] - other[1]) / length, text: String(shape.label), style });
        }
        break;
      }
      case "text": {
        const at = shape.at || [];
        if (!finite(at[0], at[1]) || !shape.text) break;
        labels.push({ at, ux: 0, uy: 0, text: String(shape.text), style, plain: true });
        break;
      }
      default:
        break;
    }
  }
  // On narrow screens a label "name value unit" puts its value on a line of its
  // own, and long text is wrapped at spaces, so that labels do not shrink the
  // drawing.
  const narrow = width < 480;
  const maxChars = narrow ? 16 : 30;
  for (const label of labels) {
    const split = narrow ? /^(.*\S)\s+([-+]?[0-9][0-9.,]*(?:e[-+]?[0-9]+)?\s*\S+)$/.exec(label.text) : null;
    label.lines = split ? [...wrapWords(split[1], maxChars), split[2]] : wrapWords(label.text, maxChars);
    Object.assign(label, labelLayout(label));
  }

  // Fit the drawing and its labels: the scale depends on the view, and the labels'
  // extent in model units on the scale, so settle both in a few rounds.
  const pad = 0.04 * Math.max(maxX - minX, maxY - minY);
  const maxH = Math.max(260, Math.min(560, state.viewportHeight * 0.7));
  let view = [minX - pad, minY - pad, maxX + pad, maxY + pad];
  let scale = 1;
  // Force labels are placed first; a label that would overlap one already placed
  // moves outward along its arrow (plain text moves down) until it is clear.
  const priority = (label) => (label.style === "restraint" || label.style === "thrust" ? 0 : label.plain ? 2 : 1);
  labels.sort((a, b) => priority(a) - priority(b));
  const overlaps = (a, b) => a[0] < b[2] && b[0] < a[2] && a[1] < b[3] && b[1] < a[3];
  const fit = (v) => Math.min(width / (v[2] - v[0]), maxH / (v[3] - v[1]));
  /** Places every label at `scale` and returns the view that holds them all. */
  const place = (scale) => {
    const next = [minX - pad, minY - pad, maxX + pad, maxY + pad];
    const placed = [];
    for (const label of labels) {
      const gap = label.plain ? 0 : 6 / scale;
      let x = label.at[0] + label.ux * gap;
      let y = label.at[1] + label.uy * gap;
      const [bx0, by0, bx1, by1] = label.box;
      // Screen box (px, y down) of the label at model point (x, y), 2 px clear.
      const screen = () => [x * scale + bx0 - 2, -y * scale + by0 - 2, x * scale + bx1 + 2, -y * scale + by1 + 2];
      const [mx, my] = label.plain || (label.ux === 0 && label.uy === 0) ? [0, -1] : [label.ux, label.uy];
      // Try further out along the arrow (up to 60 px), or a little to either side
      // (up to 20 px), 5 px a step; a label that finds no free place stays where
      // it belongs rather than wander away from what it names.
      const start = [x, y];
      const tries = [[0, 0]];
      const along = label.plain ? 4 : 12;
      for (let k = 1; k <= along; k += 1) {
        tries.push([mx * k, my * k]);
        if (k <= 4) tries.push([-my * k, mx * k], [my * k, -mx * k]);
      }
      let free = false;
      for (const [tx, ty] of tries) {
        x = start[0] + (tx * 5) / scale;
        y = start[1] + (ty * 5) / scale;
        if (!placed.some((box) => overlaps(box, screen()))) {
          free = true;
          break;
        }
      }
      if (!free) [x, y] = start;
      placed.push(screen());
      label.x = x;
      label.y = y;
      next[0] = Math.min(next[0], x + bx0 / scale - 3 / scale);
      next[2] = Math.max(next[2], x + bx1 / scale + 3 / scale);
      next[1] = Math.min(next[1], y - by1 / scale - 3 / scale);
      next[3] = Math.max(next[3], y - by0 / scale + 3 / scale);
    }
    return next;
  };
  // The view only grows, so the scale only shrinks and this settles; it stops when
  // the labels placed at the scale drawn fit inside the view.
  const eps = 1e-9 * Math.max(maxX - minX, maxY - minY);
  for (let round = 0; round < 12; round += 1) {
    scale = fit(view);
    const next = place(scale);
    if (next[0] >= view[0] - eps && next[1] >= view[1] - eps && next[2] <= view[2] + eps && next[3] <= view[3] + eps) break;
    view = [Math.min(view[0], next[0]), Math.min(view[1], next[1]), Math.max(view[2], next[2]), Math.max(view[3], next[3])];
  }
  const px = (n) => n / scale; // screen px -> model units
  const vbW = view[2] - view[0];
  const vbH = view[3] - view[1];
  const prefix = `d${index}`;
  const markerFor = (style) => `${prefix}-head-${style}`;

  const root = svg("svg", {
    class: "diagram",
    viewBox: `${view[0]} ${-view[3]} ${vbW} ${vbH}`,
    width: Math.round(vbW * scale),
    height: Math.round(vbH * scale),
    role: "img",
    "aria-label": diagram.title || "Diagram",
    "font-size": px(LABEL_PX),
  });
  const defs = svg("defs");
  root.append(defs);
  for (const style of arrowStyles) {
    const size = px(style === "restraint" || style === "thrust" ? 12 : 10);
    defs.append(
      svg(
        "marker",
        {
          id: markerFor(style),
          class: `head s-${style}`,
          viewBox: "0 0 10 10",
          refX: 9,
          refY: 5,
          markerWidth: size,
          markerHeight: size,
          markerUnits: "userSpaceOnUse",
          orient: "auto-start-reverse",
        },
        svg("path", { d: "M0,0 L10,5 L0,10 z" }),
      ),
    );
  }
  // Model y is up, SVG y is down: every y is negated.
  for (const item of geometry) {
    const cls = `shape s-${item.style}`;
    if (item.tag === "circle") {
      root.append(svg("circle", { class: cls, cx: item.c[0], cy: -item.c[1], r: item.r, "vector-effect": "non-scaling-stroke" }));
    } else if (item.tag === "arrow") {
      root.append(
        svg("line", {
          class: `${cls} arrow`,
          x1: item.a[0],
          y1: -item.a[1],
          x2: item.b[0],
          y2: -item.b[1],
          "vector-effect": "non-scaling-stroke",
          "marker-end": `url(#${markerFor(item.style)})`,
        }),
      );
    } else {
      root.append(
        svg(item.tag, {
          class: cls,
          points: item.points.map((p) => `${p[0]},${-p[1]}`).join(" "),
          "vector-effect": "non-scaling-stroke",
        }),
      );
    }
  }
  // Labels last, so they sit on top of the lines.
  const lineStep = px(LABEL_PX * 1.2);
  for (const label of labels) {
    const text = svg("text", {
      class: `label s-${label.style}`,
      x: label.x,
      y: -label.y,
      "text-anchor": label.anchor,
      "dominant-baseline": label.baseline,
      // The halo behind the text, 3 screen px (in model units: the lines of a
      // label inherit it, and non-scaling strokes do not reach them).
      "stroke-width": px(3),
    });
    const n = label.lines.length;
    const first = label.baseline === "auto" ? -(n - 1) * lineStep : label.baseline === "hanging" ? 0 : (-(n - 1) * lineStep) / 2;
    label.lines.forEach((line, i) => {
      text.append(svg("tspan", { x: label.x, dy: i === 0 ? first : lineStep, text: line }));
    });
    root.append(text);
  }

  const figure = el("figure", { class: "panel figure" });
  if (diagram.title) figure.append(el("h2", { class: "panel-title", text: diagram.title }));
  figure.append(el("div", { class: "figure-canvas" }, root));
  const legend = renderLegend(styles);
  if (legend) figure.append(legend);
  if (diagram.caption) figure.append(el("figcaption", { text: diagram.caption }));
  return figure;
}

function renderLegend(styles) {
  const order = ["restraint", "thrust", "pressure", "momentum", "weight", "velocity", "flow", "control_volume", "wall", "fluid"];
  const shown = order.filter((style) => styles.has(style));
  if (shown.length === 0) return null;
  const list = el("ul", { class: "legend" });
  for (const style of shown) {
    const isArrow = ["restraint", "thrust", "pressure", "momentum", "weight", "velocity", "flow"].includes(style);
    const swatch = svg("svg", { class: "swatch", viewBox: "0 0 36 12", width: 36, height: 12, "aria-hidden": "true" });
    if (isArrow) {
      swatch.append(
        svg("line", { class: `shape s-${style} arrow`, x1: 1, y1: 6, x2: 28, y2: 6 }),
        svg("path", { class: `head s-${style}`, d: "M26,1 L35,6 L26,11 z" }),
      );
    } else {
      swatch.append(svg("rect", { class: `shape s-${style}`, x: 2, y: 1, width: 32, height: 10 }));
    }
    list.append(el("li", {}, swatch, el("span", { text: STYLE_NAMES[style] || style })));
  }
  return list;
}

// ---------------------------------------------------------------------------
// Plots.

/** Round tick values spanning [lo, hi]: steps of 1, 2 or 5 times a power of ten. */
function ticks(lo, hi, count) {
  if (!(hi > lo)) return { lo: lo - 1, hi: hi + 1, values: [lo] };
  const raw = (hi - lo) / Math.max(1, count);
  const power = Math.pow(10, Math.floor(Math.log10(raw)));
  const step = [1, 2, 5, 10].map((m) => m * power).find((s) => s >= raw) || raw;
  const start = Math.floor(lo / step) * step;
  const end = Math.ceil(hi / step) * step;
  const values = [];
  for (let v = start; v <= end + step * 1e-9 && values.length < 50; v += step) values.push(Math.abs(v) < step * 1e-9 ? 0 : v);
  return { lo: start, hi: end, values, step };
}

function tickText(value, step) {
  const decimals = Math.max(0, Math.min(6, -Math.floor(Math.log10(step || 1) + 1e-9)));
  const abs = Math.abs(value);
  if (abs !== 0 && (abs >= 1e6 || abs < 1e-4)) return value.toExponential(1);
  return value.toFixed(decimals);
}

function renderPlot(plot, width) {
  const points = [];
  for (const series of plot.series || []) for (const p of series.points || []) if (finite(p[0], p[1])) points.push(p);
  for (const marker of plot.markers || []) if (finite(marker.at?.[0], marker.at?.[1])) points.push(marker.at);
  const figure = el("figure", { class: "panel figure plot", dataset: { plot: plot.key || "" } });
  if (plot.title) figure.append(el("h2", { class: "panel-title", text: plot.title }));
  if (points.length === 0) {
    figure.append(el("p", { text: "Nothing to plot for these inputs." }));
    return figure;
  }
  const W = Math.max(280, width);
  const H = Math.round(Math.min(360, Math.max(220, W * 0.62)));
  const pad = { left: 58, right: 14, top: 12, bottom: 44 };
  const xs = points.map((p) => p[0]);
  const ys = points.map((p) => p[1]);
  const tx = ticks(Math.min(...xs), Math.max(...xs), W < 420 ? 4 : 6);
  const ty = ticks(Math.min(0, Math.min(...ys)), Math.max(...ys), 5);
  const sx = (x) => pad.left + ((x - tx.lo) / (tx.hi - tx.lo)) * (W - pad.left - pad.right);
  const sy = (y) => H - pad.bottom - ((y - ty.lo) / (ty.hi - ty.lo)) * (H - pad.top - pad.bottom);

  const root = svg("svg", { class: "plot-svg", viewBox: `0 0 ${W} ${H}`, width: W, height: H, role: "img", "aria-label": plot.title || "Plot" });
  const grid = svg("g", { class: "plot-grid" });
  for (const v of tx.values) {
    grid.append(svg("line", { x1: sx(v), y1: pad.top, x2: sx(v), y2: H - pad.bottom }));
    root.append(svg("text", { class: "tick", x: sx(v), y: H - pad.bottom + 16, "text-anchor": "middle", text: tickText(v, tx.step) }));
  }
  for (const v of ty.values) {
    grid.append(svg("line", { x1: pad.left, y1: sy(v), x2: W - pad.right, y2: sy(v) }));
    root.append(svg("text", { class: "tick", x: pad.left - 6, y: sy(v), "text-anchor": "end", "dominant-baseline": "central", text: tickText(v, ty.step) }));
  }
  root.prepend(grid);
  root.append(
    svg("line", { class: "axis", x1: pad.left, y1: H - pad.bottom, x2: W - pad.right, y2: H - pad.bottom }),
    svg("line", { class: "axis", x1: pad.left, y1: pad.top, x2: pad.left, y2: H - pad.bottom }),
    svg("text", { class: "axis-label", x: (pad.left + W - pad.right) / 2, y: H - 6, "text-anchor": "middle", text: plot.x_label || "" }),
    svg("text", {
      class: "axis-label",
      x: 0,
      y: 0,
      transform: `translate(14 ${(pad.top + H - pad.bottom) / 2}) rotate(-90)`,
      "text-anchor": "middle",
      text: plot.y_label || "",
    }),
  );
  const legend = el("ul", { class: "legend" });
  (plot.series || []).forEach((series, index) => {
    const pts = (series.points || []).filter((p) => finite(p[0], p[1]));
    if (pts.length === 0) return;
    root.append(svg("polyline", { class: `series series-${index % 4}`, points: pts.map((p) => `${sx(p[0])},${sy(p[1])}`).join(" ") }));
    const swatch = svg("svg", { class: "swatch", viewBox: "0 0 36 12", width: 36, height: 12, "aria-hidden": "true" });
    swatch.append(svg("line", { class: `series series-${index % 4}`, x1: 1, y1: 6, x2: 35, y2: 6 }));
    legend.append(el("li", {}, swatch, el("span", { text: series.name || `Series ${index + 1}` })));
  });
  // Markers are numbered on the plot and named in a list below it: long labels
  // of nearby points would collide on a phone.
  const markerList = el("ol", { class: "plot-markers" });
  let number = 0;
  for (const marker of plot.markers || []) {
    if (!finite(marker.at?.[0], marker.at?.[1])) continue;
    number += 1;
    const x = sx(marker.at[0]);
    const y = sy(marker.at[1]);
    const right = x < W * 0.75;
    const below = number % 2 === 0;
    root.append(
      svg("circle", { class: "marker", cx: x, cy: y, r: 5 }),
      svg("text", {
        class: "marker-label",
        x: right ? x + 8 : x - 8,
        y: below ? y + 15 : y - 8,
        "text-anchor": right ? "start" : "end",
        text: String(number),
      }),
    );
    markerList.append(el("li", { text: marker.label || `Point ${number}` }));
  }
  figure.append(el("div", { class: "figure-canvas" }, root));
  if (legend.childElementCount > 0) figure.append(legend);
  if (markerList.childElementCount > 0) figure.append(markerList);
  return figure;
}

// ---------------------------------------------------------------------------
// Start-up.

/**
 * Fills the fields: a value the link gives is kept exactly as given, valid or not
 * (nothing the user sent is lost); fields the link does not give take the demo
 * values. A link value the core refuses is named in a notice, and the page shows
 * no result until it is corrected: a result computed from a demo value in its
 * place would look like the link's calculation and is not.
 */
function settleInitialValues(spec, fromUrl) {
  for (const field of spec.fields) {
    state.values[field.key] = fromUrl.has(field.key) ? fromUrl.get(field.key) : field.demo || "";
    if (isQuantity(field)) state.units[field.key] = defaultUnit(field, state.system);
  }
  if (fromUrl.size === 0) return;
  const result = solveNow();
  if (!result || result.ok) return;
  const fields = new Map(spec.fields.map((f) => [f.key, f]));
  const refused = new Set();
  for (const error of result.errors || []) {
    if (!fromUrl.has(error.field) || refused.has(error.field)) continue;
    refused.add(error.field);
    const field = fields.get(error.field);
    notice("warn", [
      `The link gives ${field.label} as ${quote(fromUrl.get(error.field))}: ${clip(error.message)}. `,
      "No result is shown until it is corrected.",
    ]);
  }
}

function registerServiceWorker() {
  if (!("serviceWorker" in navigator)) return;
  const hadController = Boolean(navigator.serviceWorker.controller);
  navigator.serviceWorker.addEventListener("controllerchange", () => {
    // The first install takes control silently; a later one means a new version.
    if (!hadController) return;
    notice("info", ["A new version of Fluxledger is ready."], { label: "Reload", run: () => location.reload() });
  });
  navigator.serviceWorker.register("./sw.js").catch(() => {
    // Without a service worker the page still works online; nothing to report.
  });
}

async function start() {
  const key = document.body.dataset.calculator;
  if (!key) {
    registerServiceWorker();
    return;
  }
  try {
    await loadGlue();
    state.catalog = glue.catalog();
  } catch (error) {
    notice("error", [
      "The calculator could not be loaded. Reload the page; if this persists, the browser may be blocking WebAssembly. ",
      `(${quote(error && error.message ? error.message : String(error))})`,
    ]);
    document.body.dataset.state = "error";
    registerServiceWorker();
    return;
  }
  const spec = (state.catalog.calculators || []).find((c) => c.key === key);
  if (!spec) {
    notice("error", [`This page asks for a calculator ${quote(key)} that this version does not have.`]);
    document.body.dataset.state = "error";
    registerServiceWorker();
    return;
  }
  state.spec = spec;
  const fromUrl = readUrl(spec);
  settleInitialValues(spec, fromUrl);
  buildPage();
  recompute({ writeToUrl: false });
  // Show each quantity as the core read it: the number, with its unit selected.
  for (const field of spec.fields) normaliseField(field);
  updatePrintFooter();
  registerServiceWorker();
}

start();
