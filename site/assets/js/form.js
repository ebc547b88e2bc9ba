// The page frame and the input form: toolbar, fields, the unit-system switch. One
// delegated listener per event type on the calculator section reads every control
// (fields by `name`, unit selectors by `data-unit-for`, buttons by `data-action`).

import { el, setChildren, symbolNodes } from "./dom.js";
import { clearPassingNotices, noticesBox } from "./notices.js";
import { state, defaultUnit, isQuantity, isVisible, systemLabel } from "./state.js";
import { glue } from "./wasm.js";
import { downloadCsv } from "./csv.js";

function controlId(key) {
  return "field-" + key;
}

function buildToolbar() {
  const bar = el("div", { class: "toolbar" });

  const systems = el("fieldset", { class: "system-switch" }, el("legend", { text: "Units" }));
  for (const system of state.page.unit_systems || []) {
    const input = el("input", { type: "radio", name: "unit-system", value: system.key });
    input.checked = system.key === state.system;
    systems.append(el("label", { class: "system-option" }, input, el("span", { text: system.label })));
  }

  const systemStatus = el("p", { class: "system-status", role: "status", "aria-live": "polite" });
  systems.setAttribute("aria-describedby", "system-help");

  const copy = el("button", { type: "button", class: "button", text: "Copy link", dataset: { action: "copy-link" } });
  const print = el("button", { type: "button", class: "button", text: "Print sheet", dataset: { action: "print" } });
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
 * unit as typed, as long as the converted value was not edited in between; a value
 * already in the new system's unit is left as it is both ways.
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
      if (memo.text !== state.values[key] || memo.unit !== state.units[key]) restored += 1;
      setField(field, memo.text, memo.unit);
      continue;
    }
    // What the field holds now, to restore on switching back while it shows this.
    const remember = (shown, shownUnit) =>
      state.converted.set(key, { system: from, text: state.values[key], unit: state.units[key] || unit, shown, shownUnit });
    if (unit === target) {
      // Already in the new system's unit (typed with its own unit, `12 in` in SI):
      // left as typed, and remembered, so that switching back leaves it as typed too
      // instead of converting it (to 304.8 mm).
      remember(text, unit);
      continue;
    }
    let answer = null;
    try {
      answer = JSON.parse(glue.convert(state.spec.key, key, text, state.units[key] || unit, system));
    } catch (error) {
      answer = null;
    }
    if (answer && answer.ok) {
      remember(answer.number, answer.unit);
      setField(field, answer.number, answer.unit);
      converted += 1;
    } else {
      refused.push(field.label);
    }
  }
  state.recompute({ writeToUrl: true });
  const name = systemLabel(system);
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
  if (select && unit) {
    ensureOptions(select);
    select.value = unit;
  }
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
  const label = el("label", { for: id, class: "field-label" }, ...symbolNodes(field.label));
  if (field.optional) label.append(el("span", { class: "optional", text: " (optional)" }));
  wrap.append(label);

  let control;
  const entry = el("div", { class: "entry" });
  if (field.kind === "choice") {
    control = el("select", { id, name: field.key, class: "choice" });
    fillOptions(control, field.options || [], "key");
    control.value = state.values[field.key] ?? "";
    entry.append(control);
  } else if (field.kind === "text") {
    control = el("textarea", {
      id,
      name: field.key,
      rows: textRows(state.values[field.key]),
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
      const select = el("select", { class: "unit", "aria-label": `Unit of ${field.label}`, dataset: { unitFor: field.key } });
      fillOptions(select, field.units, "id");
      select.value = state.units[field.key];
      state.ui.unitSelects.set(field.key, select);
      entry.append(select);
    }
  }
  wrap.append(entry);

  if (field.help) {
    const help = el("p", { class: "help", id: id + "-help" }, ...symbolNodes(field.help));
    describedBy.push(help.id);
    wrap.append(help);
  }
  const error = el("p", { class: "field-error", id: id + "-error", dataset: { errorFor: field.key }, hidden: true });
  describedBy.push(error.id);
  const warning = el("p", { class: "field-warning", id: id + "-warning", hidden: true });
  describedBy.push(warning.id);
  wrap.append(error, warning);
  control.setAttribute("aria-describedby", describedBy.join(" "));
  register(field, { wrap, control, error, warning });
  return wrap;
}

/** Where the page finds a field's parts (its unit selector is registered where it is made or taken over). */
function register(field, { wrap, control, error, warning }) {
  state.ui.controls.set(field.key, control);
  state.ui.fieldWraps.set(field.key, wrap);
  state.ui.fieldErrors.set(field.key, error);
  state.ui.fieldWarnings.set(field.key, warning);
}

/** The rows a free-text field opens with: one more than its lines, 4 to 14. */
function textRows(text) {
  return Math.max(4, Math.min(14, (text ?? "").split("\n").length + 1));
}

/**
 * A selector's options as the core lists them (`items`: units `{id, label}`,
 * choices `{key, label}`; `valueKey` names the value), replacing any it had.
 */
function fillOptions(select, items, valueKey) {
  select.replaceChildren(...items.map((item) => new Option(item.label, item[valueKey])));
}

/**
 * Served selectors whose options wait (`completeForm`): selector → the items and
 * value key of `fillOptions`.
 */
const optionsToFill = new Map();

/**
 * A served selector's options: filled now, or, with `defer` while it shows the
 * value wanted, left to wait for `completeForm` (a link's first result does not
 * wait for the dozens of options it shows no one: about 25 ms at 4× CPU on the
 * bend page).
 */
function adoptOptions(select, items, valueKey, value, defer) {
  if (defer && select.options.length === 1 && select.options[0].value === value) {
    optionsToFill.set(select, { items, valueKey });
  } else {
    fillOptions(select, items, valueKey);
    select.value = value;
  }
}

/**
 * Fills a selector's options when they still wait: before the script sets its
 * value, and when it is focused or pressed (before it opens).
 */
function ensureOptions(select) {
  const waiting = optionsToFill.get(select);
  if (!waiting) return;
  optionsToFill.delete(select);
  const value = select.value;
  fillOptions(select, waiting.items, waiting.valueKey);
  select.value = value;
  if (optionsToFill.size === 0) listenForOpening(false);
}

/** Listens (or stops) for a selector being focused or pressed while options wait. */
function listenForOpening(on) {
  const section = state.ui.section;
  if (!section) return;
  for (const type of ["focusin", "pointerdown"]) {
    if (on) section.addEventListener(type, onOpen, true);
    else section.removeEventListener(type, onOpen, true);
  }
}

/** A selector focused or pressed while its options wait gets them first. */
function onOpen(event) {
  if (event.target instanceof HTMLSelectElement) ensureOptions(event.target);
}

/**
 * Takes over a field the site tool wrote into the page for the demo
 * (site/src/prerender.rs writes it as `buildField` makes it, with the demo's
 * values, and each selector with its shown option only): the selectors get their
 * options, every control the page state's value, the boxes are cleared, and the
 * field is wired as `buildField` wires one. Returns false, changing nothing, when
 * the field is not laid out as `buildField` lays it out (it is then built).
 *
 * The browser test `the_form_the_page_takes_over_is_the_form_its_script_builds`
 * compares every page's form taken over with the form the script builds.
 */
function adoptField(field, wrap, deferOptions) {
  const id = controlId(field.key);
  const find = (suffix) => {
    const node = document.getElementById(id + suffix);
    return node && wrap.contains(node) ? node : null;
  };
  const control = find("");
  const error = find("-error");
  const warning = find("-warning");
  const select = isQuantity(field) ? wrap.querySelector(":scope > .entry > select.unit") : null;
  const kind =
    field.kind === "choice" ? HTMLSelectElement : field.kind === "text" ? HTMLTextAreaElement : HTMLInputElement;
  if (!(control instanceof kind) || !error || !warning || (isQuantity(field) && !select)) return false;
  if (Boolean(field.help) !== Boolean(find("-help"))) return false;

  const value = state.values[field.key] ?? "";
  if (field.kind === "choice") {
    adoptOptions(control, field.options || [], "key", value, deferOptions);
  } else if (field.kind === "text") {
    // The served text is the element's default; the script's own has none.
    control.textContent = "";
    control.value = value;
    control.rows = textRows(value);
  } else {
    // The value as a property, as `buildField` sets it; the served attribute is
    // dropped after (the typed value stays).
    control.value = value;
    control.removeAttribute("value");
  }
  if (select) {
    adoptOptions(select, field.units, "id", state.units[field.key], deferOptions);
    state.ui.unitSelects.set(field.key, select);
  }
  for (const box of [error, warning]) {
    box.hidden = true;
    box.textContent = "";
  }
  register(field, { wrap, control, error, warning });
  return true;
}

/**
 * The form: the one the site tool served, taken over field by field, or a new one.
 * Building a field costs far more than finding it: building the whole form took
 * about 100 ms of a link's first result at 4× CPU. The served form leaves out the
 * fields its demo hides: they are built here, or with `defer` (a link's first
 * result) those the page's values hide are built by `completeForm`, or when a
 * choice shows them, and the served selectors' options wait too.
 */
function formFrom(served, defer) {
  const form = served || el("form", { class: "inputs", novalidate: true, "aria-label": "Inputs" });
  const title = (served && served.querySelector(":scope > h2.panel-title")) || el("h2", { class: "panel-title", text: "Inputs" });
  const servedFields = new Map();
  if (served) {
    for (const wrap of served.querySelectorAll(":scope > .field[data-field]")) servedFields.set(wrap.dataset.field, wrap);
  }
  const wraps = [];
  for (const field of state.spec.fields) {
    const wrap = servedFields.get(field.key);
    if (wrap && adoptField(field, wrap, defer)) wraps.push(wrap);
    else if (!defer || isVisible(field)) wraps.push(buildField(field));
  }
  setChildren(form, [title, ...wraps]);
  form.addEventListener("submit", (event) => event.preventDefault());
  return form;
}

/**
 * A field's wrapper, built now (hidden or not, as the page's values say) when the
 * form does not have it yet, in the core's order among the fields built.
 */
function fieldWrap(field) {
  const made = state.ui.fieldWraps.get(field.key);
  if (made) return made;
  const wrap = buildField(field);
  wrap.hidden = !isVisible(field);
  markEmpty(field, wrap);
  const fields = state.spec.fields;
  let before = state.ui.form.firstElementChild;
  for (let i = fields.indexOf(field) - 1; i >= 0; i--) {
    const built = state.ui.fieldWraps.get(fields[i].key);
    if (built) {
      before = built;
      break;
    }
  }
  before.after(wrap);
  return wrap;
}

/**
 * Completes a form built with `defer`: the fields it lacks (hidden by the page's
 * values) and the options of the selectors that wait for them.
 */
export function completeForm() {
  if (!state.ui.form) return;
  for (const field of state.spec.fields) fieldWrap(field);
  for (const select of [...optionsToFill.keys()]) ensureOptions(select);
}

/**
 * When the user leaves a quantity field, shows the number alone with its unit in
 * the selector, as the core read it (`150 psi` -> `150` [psi]).
 */
export function normaliseField(field) {
  const echo = state.echoes[field.key];
  if (!echo || !isQuantity(field)) return;
  // A field not built yet (hidden) has its value in the page state only.
  const control = state.ui.controls.get(field.key);
  if ((state.values[field.key] ?? "").trim() !== echo.number) {
    if (control) control.value = echo.number;
    state.values[field.key] = echo.number;
  }
  if (state.units[field.key] !== echo.unit) {
    state.units[field.key] = echo.unit;
    const select = state.ui.unitSelects.get(field.key);
    if (select) {
      ensureOptions(select);
      select.value = echo.unit;
    }
  }
}

/** Keeps each unit selector on the unit the core actually applied. */
export function syncUnitSelectors() {
  for (const key in state.echoes) {
    const unit = state.echoes[key].unit;
    if (!unit) continue;
    // A field not built yet (hidden) keeps the unit in the page state only.
    const select = state.ui.unitSelects.get(key);
    if (select ? select.value !== unit : state.units[key] !== unit) {
      if (select) {
        ensureOptions(select);
        select.value = unit;
      }
      state.units[key] = unit;
    }
  }
}

export function applyVisibility() {
  for (const field of state.spec.fields) {
    const hidden = !isVisible(field);
    // A field that a form built with `defer` lacks is built when it is shown.
    const wrap = hidden ? state.ui.fieldWraps.get(field.key) : fieldWrap(field);
    if (!wrap) continue;
    // Written only when it changes: a keystroke restyles nothing it does not change.
    if (wrap.hidden !== hidden) wrap.hidden = hidden;
    markEmpty(field, wrap);
  }
}

/** Lets the printed sheet show an empty optional field as "not given". */
function markEmpty(field, wrap) {
  const empty = (state.values[field.key] ?? "").trim() === "";
  if (wrap.hasAttribute("data-empty") !== empty) wrap.toggleAttribute("data-empty", empty);
}

/** The field a form control belongs to (by its `name`), if any. */
function fieldOf(target) {
  const key = target && target.name;
  return key ? state.spec.fields.find((f) => f.key === key) : undefined;
}

/**
 * A keystroke in a text field recomputes at once, or once at the next frame when
 * a keystroke was already solved in this one (`recomputeForKeystroke`); a choice
 * recomputes at once when it is changed.
 */
function onInput(event) {
  const target = event.target;
  if (!(target instanceof HTMLInputElement || target instanceof HTMLTextAreaElement)) return;
  if (target.type === "radio") return;
  const field = fieldOf(target);
  if (!field) return;
  clearPassingNotices();
  state.values[field.key] = target.value;
  // Typing in a text field shows or hides no field (only a choice does: applyVisibility).
  const wrap = state.ui.fieldWraps.get(field.key);
  if (wrap) markEmpty(field, wrap);
  state.recomputeForKeystroke({ writeToUrl: true });
}

function onChange(event) {
  // What follows reads the last solve's echoes: it must be the current inputs' solve.
  state.settlePending();
  const target = event.target;
  if (target instanceof HTMLInputElement && target.name === "unit-system") {
    if (target.checked) changeSystem(target.value);
    return;
  }
  if (target instanceof HTMLSelectElement && target.dataset.unitFor) {
    clearPassingNotices();
    state.units[target.dataset.unitFor] = target.value;
    state.recompute({ writeToUrl: true });
    return;
  }
  const field = fieldOf(target);
  if (!field) return;
  if (target instanceof HTMLSelectElement) {
    clearPassingNotices();
    state.values[field.key] = target.value;
    state.recompute({ writeToUrl: true });
  } else if (target instanceof HTMLInputElement) {
    normaliseField(field);
  }
}

function onClick(event) {
  const button = event.target instanceof Element ? event.target.closest("button[data-action]") : null;
  if (!button) return;
  // The link copied, the sheet printed and the CSV saved follow the latest keystroke.
  state.settlePending();
  const action = button.dataset.action;
  if (action === "copy-link") copyLink();
  else if (action === "print") window.print();
  else if (action === "csv") {
    const table = (state.lastResult?.tables || [])[Number(button.dataset.tableIndex)];
    if (table) downloadCsv(table);
  }
}

/**
 * Builds the page's calculator, taking over the form the site tool served.
 * `deferForm`: the fields the page's values hide and the served selectors' options
 * wait for `completeForm` (a link's first result).
 */
export function buildPage({ deferForm = false } = {}) {
  const section = document.getElementById("calculator") || document.body.appendChild(el("section", { id: "calculator" }));
  state.ui.controls = new Map();
  state.ui.unitSelects = new Map();
  state.ui.fieldWraps = new Map();
  state.ui.fieldErrors = new Map();
  state.ui.fieldWarnings = new Map();

  const toolbar = buildToolbar();
  const notices = noticesBox();

  // Focusable, as served: on a phone the box scrolls when its values outgrow a
  // quarter of the screen, and a keyboard must be able to scroll it.
  const headline = el("div", { class: "headline", tabindex: "0", "aria-live": "polite", "aria-atomic": "true" });
  const form = formFrom(section.querySelector(".calc-main > form.inputs"), deferForm);

  const details = el("div", { class: "details" });
  const printFooter = el("div", { class: "print-footer" });
  // The page's cautions (written into the page by the site tool) stand beside the
  // result: under the headline on a wide screen, before the result's details on a
  // phone, after the key results on the printed sheet.
  const cautions = document.getElementById("cautions");

  if (!takeOverServedGrid(section, { toolbar, headline, form, cautions, details })) {
    // The headline stays in view while the inputs scroll past (on phones), and no
    // further: it sticks within this wrapper only.
    const main = el("div", { class: "calc-main" }, headline, form);
    const grid = el("div", { class: "calc-grid" }, main, cautions, details);
    // Stylesheets in the section (the rules the first screen does not use, print)
    // move to the head, in their order, before the section is rebuilt.
    document.head.append(...section.querySelectorAll("style, link[rel=stylesheet]"));
    section.replaceChildren(toolbar, notices, grid);
  }
  // The printed sheet ends with the link and version, after the method and cautions.
  (section.closest("main") || section).append(printFooter);
  Object.assign(state.ui, { section, headline, form, details, printFooter });

  // One listener per event type for every control of the calculator.
  section.addEventListener("input", onInput);
  section.addEventListener("change", onChange);
  section.addEventListener("click", onClick);
  // A selector whose options still wait gets them before it opens.
  if (optionsToFill.size > 0) listenForOpening(true);
}

/**
 * Takes over the calculator the site tool served (`prerender.rs`: toolbar, notices,
 * and a grid of the headline and form, the cautions, the stylesheets of the rules
 * the first screen does not use and of print, and the demo's details) where it
 * stands: the demo's toolbar, headline and details give way to the page's own, the
 * form and cautions stay, and the grid is no longer a demo part. The stylesheets
 * stay where they are: a <style> moved is parsed again (7.5 ms at 4× CPU in a
 * DevTools trace of a link's first result), and moving the grid's large subtree
 * cost as much again. False, with nothing changed, when the section is not as served.
 */
function takeOverServedGrid(section, { toolbar, headline, form, cautions, details }) {
  const grid = section.querySelector(":scope > .calc-grid");
  const main = grid && grid.querySelector(":scope > .calc-main");
  const servedToolbar = section.querySelector(":scope > .toolbar");
  if (!main || !servedToolbar || form.parentElement !== main || !cautions || cautions.parentElement !== grid) return false;
  servedToolbar.replaceWith(toolbar);
  for (const child of [...main.children]) if (child !== form) child.remove();
  main.prepend(headline);
  for (const child of [...grid.children]) {
    if (child !== main && child !== cautions && !child.matches("style, link[rel=stylesheet]")) child.remove();
  }
  grid.append(details);
  grid.removeAttribute("data-demo");
  grid.inert = false;
  return true;
}

export function updatePrintFooter() {
  const footer = state.ui.printFooter;
  if (!footer) return;
  footer.replaceChildren(
    el("p", {}, el("strong", { text: "Link to this calculation: " }), el("span", { class: "print-url", text: location.href })),
    el("p", {
      text: `Fluxledger ${state.page.version || ""} · printed ${new Date().toISOString().slice(0, 10)} · unit system ${systemLabel(
        state.system,
      )}`,
    }),
  );
}
