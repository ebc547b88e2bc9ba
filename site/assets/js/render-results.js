// The result: headline values with their warnings, links to a next calculator,
// other outputs, tables, diagrams and plots, or the field errors of a failed solve.
//
// An edit updates what is there instead of rebuilding it: the headline values'
// text in place while the same outputs are shown (the headline first, so it is
// never behind), each table's changed cells (render-table), each diagram's and
// plot's attributes and texts that differ from the last drawing (a figure is drawn
// as a plan and patched, render-patch). A change in the list of parts rebuilds
// them all. The elements an update writes to are found once, when they are made,
// not looked up again on every keystroke.
//
// The frame after a keystroke shows the headline and the parts on screen, and
// nothing else. A part off screen (IntersectionObserver) carries `data-stale` and
// is brought up to date when it comes into view, before printing, or once typing
// pauses: then in idle time, a part at a time, and a newer keystroke stops that
// catching up (its own result supersedes it). The other results (a few values)
// and the links to a next calculator come with every result, a headline result
// too, and wait off screen like the rest (a click or focus on a link that waits
// brings it up to date first).
//
// While every deferred part is off screen (`partsWait`), the page asks the core
// for a headline result (`headline_only`: no tables, diagrams or plots, most of a
// result's text); the deferred parts then wait for a full result, which catching
// up asks for (`state.recompute` with `full`) before bringing them up to date.
// A link's first result is a headline result too: the page's start asks for its
// tables and figures once the headline is painted, and the page is `ready` (body
// `data-state`) when they are shown.

import { clip, el, setSymbolText, setText, symbolNodes } from "./dom.js";
import { state } from "./state.js";
import { SYSTEM_KEY } from "./url.js";
import { renderTable, updateTable } from "./render-table.js";
import { planDiagram } from "./render-diagram.js";
import { planPlot } from "./render-plot.js";
import { create, patch } from "./render-patch.js";
import { afterPause, cancelIdle, whenIdle } from "./pause.js";

/**
 * The parts shown under the headline, in order: {id, node, build, update,
 * inHeadline, pending, plan}. `id` names a part's kind and key (a change of ids
 * rebuilds them all); `inHeadline`: a headline result carries it too; `pending`
 * says an update still waits for the part to come into view; a drawn part's `plan`
 * is the drawing its elements show (render-patch).
 */
let parts = [];
/** Parts off screen, by node (a node the observer has not reported yet counts as on screen). */
const offScreen = new WeakSet();
let observer = null;
/** The idle callback that catches parts up (after `catchUpTimer`). */
let idleCatchUp = 0;

/**
 * Quiet time after the last result before the parts off screen are caught up: a
 * burst of keystrokes pays for the headline of each and for the rest once.
 */
const CATCH_UP_PAUSE_MS = 150;

/**
 * The fields' error and warning boxes shown, and the controls marked invalid, by
 * the last render: the next one clears these (a keystroke neither visits nor
 * restyles the dozens of fields that show nothing).
 */
const marked = { boxes: new Set(), controls: new Set() };

export function render(result) {
  state.lastResult = result;
  const ui = state.ui;
  for (const box of marked.boxes) {
    box.hidden = true;
    box.textContent = "";
  }
  for (const control of marked.controls) control.removeAttribute("aria-invalid");
  marked.boxes.clear();
  marked.controls.clear();

  if (!result.ok) {
    const general = [];
    for (const error of result.errors || []) {
      const box = ui.fieldErrors.get(error.field);
      const wrap = ui.fieldWraps.get(error.field);
      if (box && wrap && !wrap.hidden) {
        box.replaceChildren(...symbolNodes(error.label || "This field"), `: ${clip(error.message)}`);
        box.hidden = false;
        marked.boxes.add(box);
        const control = ui.controls.get(error.field);
        if (control) {
          control.setAttribute("aria-invalid", "true");
          marked.controls.add(control);
        }
      } else {
        general.push(error.label ? [...symbolNodes(error.label), `: ${error.message}`] : [error.message]);
      }
    }
    ui.headline.classList.remove("has-warnings");
    ui.headline.replaceChildren(
      el("p", { class: "no-result", text: "No result yet: correct the marked inputs." }),
      ...general.map((parts) => el("p", { class: "general-error" }, ...parts)),
    );
    headlineParts = null;
    forgetParts();
    ui.details.replaceChildren();
    finishRender("error");
    return;
  }

  const outputs = result.outputs || [];
  // Warnings belong with the numbers they qualify: in the headline, where nobody
  // reads a force without them (a check that failed, a value that could not be
  // computed, a mode left unchecked). A warning about one field is also shown there.
  const warnings = result.warnings || [];
  for (const warning of warnings) {
    const box = warning.field ? ui.fieldWarnings.get(warning.field) : null;
    if (box) {
      setSymbolText(box, warning.message);
      box.hidden = false;
      marked.boxes.add(box);
    }
  }
  if (!updateHeadline(outputs.filter((o) => o.headline), warnings)) buildHeadline(outputs.filter((o) => o.headline), warnings);

  const next = [];
  const carried = result.carry_over || [];
  if (carried.some(isShownCarryOver)) {
    // The links are written when shown (a link followed carries the current inputs:
    // one that waits off screen is brought up to date when clicked or focused).
    next.push({
      id: "carry",
      build: () => renderCarryOver(carryOverLinks(carried)),
      update: (node) => updateCarryOver(node, carryOverLinks(carried)),
      inHeadline: true,
    });
  }
  const others = outputs.filter((o) => !o.headline);
  if (others.length > 0) {
    next.push({
      id: `others:${others.map((o) => o.key).join(",")}`,
      build: () => {
        const list = outputList(others, "output-list");
        const panel = el("section", { class: "panel" }, el("h2", { class: "panel-title", text: "Other results" }), list);
        panelLists.set(panel, list);
        return panel;
      },
      update: (node) => updateOutputList(panelLists.get(node), others),
      inHeadline: true,
    });
  }
  if (result.headline_only) {
    if (renderWithout(next) !== false) finishRender("ready");
    return;
  }
  for (const [index, table] of (result.tables || []).entries()) {
    next.push({ id: `table:${table.key || index}`, build: () => renderTable(table, index), update: (node) => updateTable(node, table) });
  }
  const width = state.figureWidth || measureFigureWidth();
  for (const [index, diagram] of (result.diagrams || []).entries()) {
    next.push(drawnPart(`diagram:${index}`, () => planDiagram(diagram, index, width)));
  }
  for (const [index, plot] of (result.plots || []).entries()) {
    next.push(drawnPart(`plot:${plot.key || index}`, () => planPlot(plot, width)));
  }
  updateParts(next);
  finishRender("ready");
}

/**
 * Shows a headline result: `next` (the parts it carries) updated, or marked to
 * wait when off screen; the other parts kept as they are and marked to wait for a
 * full result. A result whose parts differ from those shown is completed at once.
 * Returns false for a link's first result, whose tables and figures are still to
 * come.
 */
function renderWithout(next) {
  const deferred = parts.filter((p) => !p.inHeadline);
  const shown = parts.filter((p) => p.inHeadline);
  if (parts.length === 0 && !state.firstResultMarked) {
    // A link's first result (the page shows no part yet): the headline and the
    // parts this result carries now; the page's start asks for the tables and
    // figures once it is painted (`completeResult`), and the page is not `ready`
    // until they are shown.
    updateParts(next);
    markFirstResult();
    return false;
  }
  if (deferred.length === 0 || shown.length !== next.length || next.some((part, i) => part.id !== shown[i].id)) {
    state.recompute({ writeToUrl: false, full: true });
    return;
  }
  updateParts([...next, ...deferred.map((part) => ({ id: part.id, behind: true }))]);
}

/**
 * Whether a keystroke's result may leave the tables, diagrams and plots out: the
 * page shows some, and all of them are off screen (their update would wait anyway).
 */
export function partsWait() {
  const deferred = parts.filter((p) => !p.inHeadline);
  return deferred.length > 0 && deferred.every((p) => offScreen.has(p.node));
}

/** Whether the deferred parts wait for a full result: the last result was a headline result. */
function owed() {
  return Boolean(state.lastResult && state.lastResult.headline_only);
}

/**
 * Asks for the full result of the current inputs when the deferred parts wait for
 * one (before catching them up, printing, or reading a table for its CSV).
 */
export function completeResult() {
  if (owed()) state.recompute({ writeToUrl: false, full: true });
}

/**
 * A diagram or plot: drawn as a plan when it is built or updated (never while it
 * waits off screen); an update writes what differs from the plan its elements show.
 */
function drawnPart(id, draw) {
  return {
    id,
    build() {
      this.plan = draw();
      return create(this.plan);
    },
    update(node, part) {
      if (!part.plan) return false;
      const plan = draw();
      part.node = patch(node, part.plan, plan);
      part.plan = plan;
      return true;
    },
  };
}

function outputList(outputs, cls) {
  const list = el("dl", { class: cls });
  for (const output of outputs) {
    list.append(
      el(
        "div",
        { class: "output" },
        el("dt", {}, ...symbolNodes(output.label)),
        el("dd", { dataset: { output: output.key }, title: output.text, text: output.shown }),
      ),
    );
  }
  return list;
}

/** The list of values in the panel of other results, by panel. */
const panelLists = new WeakMap();

/** The value cells of lists made by `outputList` (a list is never edited otherwise). */
const listValues = new WeakMap();

/**
 * The outputs whose full text a list's values still show in their `title`, by list:
 * written once typing pauses (`TITLE_PAUSE_MS`). A `title` written on every
 * keystroke restyles its element in that keystroke's frame (the browser's own
 * stylesheet has rules on `[title]`), and nobody reads a tooltip while typing.
 */
const titlesOwed = new Map();

/** Pause in typing after which the values' titles are written. */
const TITLE_PAUSE_MS = 150;
const titleWrite = afterPause(writeTitles, TITLE_PAUSE_MS);

function writeTitles() {
  titleWrite.cancel();
  for (const [list, outputs] of titlesOwed) {
    const values = listValues.get(list);
    if (!values || !list.isConnected) continue;
    outputs.forEach((output, i) => {
      const dd = values[i];
      if (dd && dd.title !== (output.text ?? "")) dd.title = output.text ?? "";
    });
  }
  titlesOwed.clear();
}

/** Rewrites the values of a list made by `outputList` when it shows the same outputs. */
function updateOutputList(list, outputs) {
  if (!list) return false;
  let values = listValues.get(list);
  if (!values) {
    values = list.querySelectorAll("dd[data-output]");
    listValues.set(list, values);
  }
  if (values.length !== outputs.length || outputs.some((o, i) => values[i].dataset.output !== o.key)) return false;
  outputs.forEach((output, i) => {
    const dd = values[i];
    const label = dd.previousElementSibling;
    if (label) setSymbolText(label, output.label);
    setText(dd, output.shown);
  });
  // The full texts follow once typing pauses: a newer keystroke's outputs replace these.
  titlesOwed.set(list, outputs);
  titleWrite.restart();
  return true;
}

function warningList(warnings) {
  if (warnings.length === 0) return null;
  const list = el("ul", { class: "warnings headline-warnings", "aria-label": "Warnings" });
  for (const warning of warnings) list.append(el("li", {}, ...symbolNodes(warning.message)));
  return list;
}

/** The headline's list of values and of warnings (or null), as `buildHeadline` made them. */
let headlineParts = null;

function buildHeadline(outputs, warnings) {
  const headline = state.ui.headline;
  const list = warningList(warnings);
  const values = outputList(outputs, "headline-values");
  headline.classList.toggle("has-warnings", list !== null);
  // (replaceChildren would write a missing warning list as the text "null")
  headline.replaceChildren(...[el("h2", { class: "panel-title", text: "Result" }), values, list].filter(Boolean));
  headlineParts = { values, warnings: list };
}

/** Updates the headline in place; false when its outputs changed (then it is rebuilt). */
function updateHeadline(outputs, warnings) {
  if (!headlineParts || !updateOutputList(headlineParts.values, outputs)) return false;
  const shown = headlineParts.warnings;
  const count = shown ? shown.children.length : 0;
  if (count > 0 && count === warnings.length) {
    // The same number of warnings (their figures follow the inputs): text rewritten in place.
    warnings.forEach((warning, i) => setSymbolText(shown.children[i], warning.message));
  } else if (count !== warnings.length) {
    const list = warningList(warnings);
    if (shown) shown.remove();
    if (list) state.ui.headline.append(list);
    state.ui.headline.classList.toggle("has-warnings", list !== null);
    headlineParts.warnings = list;
  }
  return true;
}

/**
 * Shows `next` under the headline: the same list of parts is updated part by part
 * (parts off screen when they come into view); another list is rebuilt.
 */
function updateParts(next) {
  const same = next.length === parts.length && next.every((part, i) => part.id === parts[i].id);
  if (!same) {
    forgetParts();
    for (const part of next) part.node = part.build();
    parts = next;
    state.ui.details.replaceChildren(...parts.map((p) => p.node));
    for (const part of parts) watch(part.node);
    return;
  }
  next.forEach((part, i) => {
    const current = parts[i];
    part.node = current.node;
    part.plan = current.plan;
    parts[i] = part;
    if (part.behind || (part.update && offScreen.has(part.node))) {
      part.pending = true;
      // Written once: a keystroke restyles nothing it does not change.
      if (!part.node.hasAttribute("data-stale")) part.node.setAttribute("data-stale", "");
    } else if (!part.update) {
      replaceNode(part, part.build());
    } else {
      applyUpdate(part);
    }
  });
  if (parts.some((p) => p.pending)) scheduleCatchUp();
}

function replaceNode(part, fresh) {
  const old = part.node;
  if (observer) observer.unobserve(old);
  old.replaceWith(fresh);
  part.node = fresh;
  watch(fresh);
}

/** Brings one part up to date (or rebuilds it when it cannot be updated). */
function applyUpdate(part) {
  // A part kept from before a headline result waits for the full result.
  if (part.behind) return;
  part.pending = false;
  const before = part.node;
  if (!part.update(part.node, part)) replaceNode(part, part.build());
  else if (part.node !== before) {
    if (observer) observer.unobserve(before);
    watch(part.node);
  }
  if (part.node.hasAttribute("data-stale")) part.node.removeAttribute("data-stale");
}

/** Brings every part up to date at once (before printing). */
export function flushParts() {
  completeResult();
  writeTitles();
  for (const part of parts) if (part.pending) applyUpdate(part);
}

/**
 * Brings parts off screen up to date in idle time, a part at a time while the
 * browser has time left (a diagram takes a few milliseconds): the rest wait for
 * the next idle period, so a keystroke typed meanwhile is not kept waiting.
 */
function flushIdle(deadline) {
  idleCatchUp = 0;
  if (owed()) {
    completeResult();
    // The full result's own catch-up is this one.
    catchUpTimer.cancel();
    cancelIdleCatchUp();
    if (deadline && !deadline.didTimeout && deadline.timeRemaining() <= 0) {
      if (parts.some((p) => p.pending && !p.behind)) idleCatchUp = requestIdle(flushIdle);
      return;
    }
  }
  for (const part of parts) {
    if (!part.pending) continue;
    applyUpdate(part);
    if (deadline && !deadline.didTimeout && deadline.timeRemaining() <= 0) break;
  }
  if (parts.some((p) => p.pending && !p.behind)) idleCatchUp = requestIdle(flushIdle);
}

/** Waits for a pause in typing (`CATCH_UP_PAUSE_MS`), then catches up in idle time. */
const catchUpTimer = afterPause(() => {
  idleCatchUp = requestIdle(flushIdle);
}, CATCH_UP_PAUSE_MS);

/** Catches the parts off screen up once typing pauses. */
function scheduleCatchUp() {
  cancelIdleCatchUp();
  catchUpTimer.restart();
}

/**
 * Holds catching up back: called on a keystroke, whose result will reschedule it
 * (the pause is counted from the latest keystroke). Parts stay marked
 * `data-stale` meanwhile.
 */
export function holdCatchUp() {
  cancelIdleCatchUp();
  catchUpTimer.postpone();
}

function cancelIdleCatchUp() {
  if (idleCatchUp) cancelIdle(idleCatchUp);
  idleCatchUp = 0;
}

/** An idle callback (a short timer where the browser has none). */
function requestIdle(callback) {
  return whenIdle(callback, 1000, 50);
}

function forgetParts() {
  if (observer) observer.disconnect();
  parts = [];
}

function watch(node) {
  if (!("IntersectionObserver" in window)) return;
  if (!observer) {
    observer = new IntersectionObserver((entries) => {
      for (const entry of entries) {
        if (entry.isIntersecting) {
          offScreen.delete(entry.target);
          let part = parts.find((p) => p.node === entry.target);
          if (part && part.behind) {
            // The full result brings the parts on screen up to date itself.
            completeResult();
            part = null;
          }
          if (part && part.pending) applyUpdate(part);
        } else {
          offScreen.add(entry.target);
        }
      }
    }, { rootMargin: "200px 0px" });
    window.addEventListener("beforeprint", flushParts);
    // A part used before it came into view (a link clicked, focused or copied from
    // its menu) is brought up to date first, in the capture phase: before the link
    // is followed or its address read.
    for (const type of ["click", "focusin", "contextmenu"]) document.addEventListener(type, bringUpToDate, true);
  }
  observer.observe(node);
}

/** Brings the part an event's target lies in up to date when it waits. */
function bringUpToDate(event) {
  const target = event.target;
  if (!(target instanceof Node)) return;
  const part = parts.find((p) => p.pending && !p.behind && p.node.contains(target));
  if (part) applyUpdate(part);
}

function finishRender(status) {
  // Written when it changes: a keystroke restyles nothing it does not change.
  if (document.body.dataset.state !== status) document.body.dataset.state = status;
  markFirstResult();
}

/** Marks the first result the page shows (its headline values), once. */
function markFirstResult() {
  if (!state.firstResultMarked) {
    state.firstResultMarked = true;
    performance.mark("fluxledger:first-result");
  }
}

/**
 * Width available to figures, in CSS pixels (measured once per layout change), in
 * `details` (by default the page's own; at start the prerendered one, read while
 * the first paint's layout is still clean instead of forcing a layout mid-build).
 */
export function measureFigureWidth(details = state.ui.details) {
  // Panels have 0.75 rem of padding and a 1 px border on each side.
  const width = details ? Math.round(details.clientWidth) - 26 : 0;
  state.figureWidth = width > 0 ? Math.min(width, 720) : 300;
  return state.figureWidth;
}

/** Whether a carry-over item is shown as a link (it names its page). */
function isShownCarryOver(item) {
  return Boolean(item && item.calculator && item.title);
}

/** The link target, label and page title of each carry-over item that is shown. */
function carryOverLinks(items) {
  const links = [];
  for (const item of items) {
    if (!isShownCarryOver(item)) continue;
    const params = new URLSearchParams();
    for (const [key, value] of Object.entries(item.inputs || {})) {
      if (typeof value === "string") params.set(key, value);
    }
    params.set(SYSTEM_KEY, state.system);
    links.push({ calculator: item.calculator, href: `${item.calculator}.html?${params.toString()}`, label: item.label || item.title, title: item.title });
  }
  return links;
}

/** The links of panels made by `renderCarryOver` (a panel is never edited otherwise). */
const carryAnchors = new WeakMap();

/**
 * Brings carry-over links made by `renderCarryOver` up to `links` when they lead to
 * the same pages (the inputs they carry follow every keystroke): the `href` and
 * the texts written where they changed. False when the pages differ (rebuilt).
 */
function updateCarryOver(node, links) {
  let anchors = node ? carryAnchors.get(node) : undefined;
  if (node && !anchors) {
    anchors = node.querySelectorAll("a.carry-link");
    carryAnchors.set(node, anchors);
  }
  anchors = anchors || [];
  if (anchors.length === 0 || anchors.length !== links.length) return false;
  if (links.some((link, i) => anchors[i].dataset.carryTo !== link.calculator)) return false;
  links.forEach((link, i) => {
    const anchor = anchors[i];
    if (anchor.getAttribute("href") !== link.href) anchor.setAttribute("href", link.href);
    const [label, target] = anchor.children;
    if (label) setText(label, link.label);
    if (target) setText(target, link.title);
  });
  return true;
}

/**
 * Renders carry-over links (`carryOverLinks` of the result's `carry_over`, at least
 * one). The page name is a key the core wrote (never text from the address bar);
 * the inputs are the core's text, encoded by URLSearchParams; the page's unit
 * system goes along.
 */
function renderCarryOver(links) {
  const list = el("ul", { class: "carry-over" });
  for (const item of links) {
    const link = el(
      "a",
      { class: "carry-link", href: item.href, dataset: { carryTo: item.calculator } },
      el("span", { class: "carry-label", text: item.label }),
      el("span", { class: "carry-target", text: item.title }),
    );
    list.append(el("li", {}, link));
  }
  return el("nav", { class: "panel panel-next", "aria-label": "Next step" }, el("h2", { class: "panel-title", text: "Next step" }), list);
}
