// Fluxledger page script, entry module: loads the core, reads the link, builds the
// form and recomputes on every change.
//
// It renders what the core describes and nothing more. It parses no numbers and
// holds no physics: what the user typed goes to the wasm `solve` as text, and the
// page shows the values, the ledger tables, the diagrams and plots, the warnings
// and the field errors that come back, each already split by the core into its
// number, unit and shown text. The state of a calculation lives in the URL
// (`?p=150psi&d=12in&system=us`); every piece of URL or user text is written to the
// page through `textContent` or `value`, never as markup, and never into an `href`
// or `src`.
//
// Modules: dom (element helpers), notices, wasm (the core, re-initialised after a
// trap), state (the page's state and the core's field rules), url (reading links
// through the glossary, writing them back), form (frame, fields, unit switch, the
// delegated listeners), csv, render-results / render-table / render-diagram /
// render-plot, sheet (the calculation sheet: page-level fields, printed header,
// inputs table, link and QR code), compare (cases side by side), layout (the result
// box folding on a phone, the cue of a table that scrolls sideways), note (the
// method note's later sections, fetched after the first result). The site tool
// joins the modules into one file (site/src/bundle.rs): top-level names must not
// repeat across modules, and imports and exports keep to the forms it accepts.
//
// Layout of the calculator section (filled into `<section id="calculator">`):
//   toolbar (unit system, copy link, print) · #notices · headline results ·
//   input form · details (links to a next calculator, other outputs, warnings,
//   tables with a CSV download, diagrams, plots) · print footer (link and version).

import { clip, quote } from "./dom.js";
import { notice } from "./notices.js";
import { state, defaultUnit, isQuantity } from "./state.js";
import { glue, loadGlue, dropGlue } from "./wasm.js";
import { readUrl, writeUrl } from "./url.js";
import { applyVisibility, buildPage, completeForm, normaliseField, syncUnitSelectors, updatePrintFooter } from "./form.js";
import { completeResult, holdCatchUp, measureFigureWidth, partsWait, render } from "./render-results.js";
import { buildSheet, updateSheet } from "./sheet.js";
import { buildCompare, updateCompare } from "./compare.js";
import { watchHeadline } from "./layout.js";
import { loadNoteRest } from "./note.js";
import { afterPause, whenIdle } from "./pause.js";

/**
 * What the core solves: the fields that hold text, and the unit each of those
 * quantities shows. A field not sent reads as a field sent empty (the core's test
 * `a_field_not_sent_reads_as_a_field_sent_empty`); on the bend page most fields are
 * empty, and every entry the core reads costs the keystroke's solve two strings.
 */
function request() {
  const inputs = {};
  const fieldUnits = {};
  for (const field of state.spec.fields) {
    const value = state.values[field.key] ?? "";
    if (value === "") continue;
    inputs[field.key] = value;
    if (isQuantity(field)) fieldUnits[field.key] = state.units[field.key] || defaultUnit(field, state.system);
  }
  return { inputs, fieldUnits };
}

/**
 * Calls the wasm solve (`headline`: without the tables, diagrams and plots);
 * recovers from a trap by loading a fresh module instance.
 */
function solveNow({ headline = false } = {}) {
  const { inputs, fieldUnits } = request();
  try {
    // JSON text both ways: the fields go in as one string and the result comes
    // back as one, instead of every key, value and result crossing one by one
    // (`solve` in the wasm crate).
    const solve = headline ? glue.solve_headline : glue.solve;
    return JSON.parse(solve(state.spec.key, JSON.stringify(inputs), JSON.stringify(fieldUnits), state.system));
  } catch (error) {
    const trapped = error instanceof WebAssembly.RuntimeError;
    notice("error", [
      trapped
        ? "The calculation stopped unexpectedly for these inputs. The calculator was restarted; please check the inputs. This is a fault in Fluxledger."
        : "The calculation could not be run for these inputs. This is a fault in Fluxledger.",
    ]);
    dropGlue();
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

/** The animation frame that will recompute for keystrokes typed since the last one. */
let frame = 0;
/** Whether the recompute that frame runs writes the URL. */
let frameWritesUrl = false;
/** Whether a keystroke has been solved at once since the last animation frame began. */
let keystrokeSolvedThisFrame = false;

/**
 * Recomputes for a keystroke. The first keystroke after a frame is solved at once,
 * in its input event: its result is then painted in the next frame, and the solve
 * runs while the browser waits for that frame instead of inside it. Keystrokes that
 * follow it before the next frame cost one solve at that frame, with the latest
 * inputs (the field values are stored as they are typed): a burst costs at most
 * two solves a frame, and the last one shown is always the latest inputs'.
 */
function recomputeForKeystroke({ writeToUrl }) {
  frameWritesUrl = frameWritesUrl || writeToUrl;
  // Parts off screen wait for this keystroke's result, and the URL for a pause in
  // typing after it: catching up or writing the link now would only delay its frame.
  holdCatchUp();
  urlWrite.postpone();
  if (frame) return;
  if (!keystrokeSolvedThisFrame) {
    keystrokeSolvedThisFrame = true;
    requestAnimationFrame(() => {
      keystrokeSolvedThisFrame = false;
    });
    recompute({ writeToUrl: false, typed: true });
    return;
  }
  frame = requestAnimationFrame(() => {
    frame = 0;
    recompute({ writeToUrl: false, typed: true });
  });
}

/** Pause in typing after which the URL is written. */
const URL_PAUSE_MS = 300;

/**
 * Writes the URL (and the printed sheet's link and QR code) once typing pauses: the
 * browser takes milliseconds to replace the URL and the QR code is drawn by the
 * core, so a burst of keystrokes pays for one write, the last, after its results
 * have been painted. Copying the link, printing, saving a CSV, changing a unit and
 * leaving the page write it at once (`settlePending`, `pagehide`).
 */
const urlWrite = afterPause(writeUrlNow, URL_PAUSE_MS);

function writeUrlNow() {
  urlWrite.cancel();
  writeUrl();
  updatePrintFooter();
  // The sheet header prints the link and its QR code: written with the URL, after
  // the frame that shows the result.
  updateSheet();
}

// A reload or a closed tab right after a keystroke still leaves its URL behind.
window.addEventListener("pagehide", () => {
  if (urlWrite.pending()) writeUrlNow();
});
// A sheet printed from the browser's menu carries the latest link too.
window.addEventListener("beforeprint", () => {
  if (urlWrite.pending()) writeUrlNow();
});

/**
 * Runs a recompute still waiting for its frame, and a URL write still waiting for
 * its task, now (before reading the echoes of the last solve, or the URL).
 */
function settlePending() {
  if (frame) recompute({ writeToUrl: false });
  // A table's CSV is read from the last result: a full one.
  completeResult();
  if (urlWrite.pending()) writeUrlNow();
}

/**
 * Recomputes, renders, and optionally writes the URL. `solved`: the result of a
 * solve of the current inputs already made (the page's first), used instead of
 * solving them again. The core is asked for a headline result while the tables,
 * diagrams and plots are all off screen (`partsWait`), unless `full`. `typed`: the
 * inputs changed by typing in a text field, which shows or hides no field.
 */
function recompute({ writeToUrl, solved = null, full = false, typed = false }) {
  // A recompute now also answers the keystrokes waiting for the next frame.
  if (frame) cancelAnimationFrame(frame);
  frame = 0;
  writeToUrl = writeToUrl || frameWritesUrl;
  frameWritesUrl = false;
  // Without a module (being reloaded after a trap) the recompute after the reload
  // still owes the URL its write.
  const result = solved || (glue ? solveNow({ headline: !full && partsWait() }) : null);
  if (!result) {
    frameWritesUrl = writeToUrl;
    return;
  }
  recordEchoes(result);
  syncUnitSelectors();
  if (!typed) applyVisibility();
  render(result);
  if (writeToUrl) urlWrite.restart();
  updateCompare();
}

/**
 * Fills the fields: a value the link gives is kept exactly as given, valid or not
 * (nothing the user sent is lost); fields the link does not give take the demo
 * values. A link value the core refuses is named in a notice, and the page shows
 * no result until it is corrected: a result computed from a demo value in its
 * place would look like the link's calculation and is not.
 *
 * Returns the result of that check (the solve of exactly these values), which the
 * first render shows instead of solving them a second time; null without a link.
 */
function settleInitialValues(spec, fromUrl) {
  for (const field of spec.fields) {
    state.values[field.key] = fromUrl.has(field.key) ? fromUrl.get(field.key) : field.demo || "";
    if (isQuantity(field)) state.units[field.key] = defaultUnit(field, state.system);
  }
  if (fromUrl.size === 0) return null;
  // The headline only: the first render shows it, and asks for the tables and
  // figures once it is painted (render-results.js).
  const result = solveNow({ headline: true });
  if (!result || result.ok) return result;
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
  return result;
}

/**
 * What the reader typed into the served form before this script took it over (the
 * form takes typing from the first paint; query.js marks the page `is-editing`):
 * field key → {text, unit}, the unit being the one the served selector showed
 * beside the field. Served selectors show their one chosen option, so only typed
 * text can differ from what was served.
 */
function typedBeforeTakeOver(spec) {
  const typed = new Map();
  if (!document.querySelector("#calculator .calc-grid[data-demo]")) return typed;
  for (const field of spec.fields) {
    if (field.kind === "choice") continue;
    const control = document.getElementById(`field-${field.key}`);
    if (!(control instanceof HTMLInputElement || control instanceof HTMLTextAreaElement)) continue;
    if (control.value === control.defaultValue) continue;
    const entry = control.closest(".entry");
    const select = isQuantity(field) && entry ? entry.querySelector("select.unit") : null;
    typed.set(field.key, { text: control.value, unit: select ? select.value : "" });
  }
  return typed;
}

/**
 * Registers the service worker in idle time (after the first result, when called
 * at the end of `start`), so its precache does not compete with the page's own
 * requests; browsers without `requestIdleCallback` wait a second instead.
 */
function registerServiceWorker() {
  if (!("serviceWorker" in navigator)) return;
  whenIdle(registerNow, 5000, 1000);
}

function registerNow() {
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

/** Waits until the document is parsed (at once when it is). */
function whenParsed() {
  if (document.readyState !== "loading") return Promise.resolve();
  return new Promise((resolve) => document.addEventListener("DOMContentLoaded", resolve, { once: true }));
}

async function start() {
  // The head script adds this script as a module, which can run before the parser
  // has reached the body (a link's script from the HTTP cache): the page's key is
  // on <body>.
  if (!document.body) await whenParsed();
  const key = document.body.dataset.calculator;
  if (!key) {
    loadNoteRest();
    registerServiceWorker();
    return;
  }
  try {
    await loadGlue();
  } catch (error) {
    notice("error", [
      "The calculator could not be loaded. Reload the page; if this persists, the browser may be blocking WebAssembly. ",
      `(${quote(error && error.message ? error.message : String(error))})`,
    ]);
    document.body.dataset.state = "error";
    loadNoteRest();
    registerServiceWorker();
    return;
  }
  // The head script adds this script as a module, which can run before the parser
  // has reached the end of the page (a fast connection, a module from the cache);
  // the calculator the site tool served is taken over where it stands, so it must
  // be whole first.
  await whenParsed();
  try {
    state.page = JSON.parse(glue.calculator(key));
  } catch (error) {
    notice("error", [`This page asks for a calculator ${quote(key)} that this version does not have.`]);
    document.body.dataset.state = "error";
    loadNoteRest();
    registerServiceWorker();
    return;
  }
  state.spec = state.page.calculator;
  state.recompute = recompute;
  state.recomputeForKeystroke = recomputeForKeystroke;
  state.settlePending = settlePending;
  state.writeUrl = writeUrl;
  const spec = state.spec;
  const fromUrl = readUrl(spec);
  // What was typed into the served form before this script took it over (read
  // before the take-over gives the controls the page's values).
  const typed = typedBeforeTakeOver(spec);
  // With a link the values are solved once here (to name a refused value); the
  // first render shows that result: the same inputs, the same result.
  const settled = settleInitialValues(spec, fromUrl);
  for (const [key, { text, unit }] of typed) {
    state.values[key] = text;
    if (unit) state.units[key] = unit;
  }
  const solved = typed.size > 0 ? null : settled;
  const prerendered = document.querySelector("#calculator .details");
  if (prerendered && prerendered.clientWidth > 0) measureFigureWidth(prerendered);
  // A link's first result is shown before the form is complete (`completeForm`).
  const linkFirst = Boolean(solved && solved.headline_only);
  buildPage({ deferForm: linkFirst });
  watchHeadline();
  window.addEventListener("resize", () => {
    state.viewportHeight = window.innerHeight || 800;
    const before = state.figureWidth;
    const width = measureFigureWidth();
    if (width !== before && state.lastResult) render(state.lastResult);
  });
  // What was typed is a change of the calculation: the link follows it.
  recompute({ writeToUrl: typed.size > 0, solved });
  // The printed sheet's panel and the comparison lie below the result: built after
  // it, in the same task (a link's first result is shown a few milliseconds sooner).
  buildSheet();
  buildCompare();
  // Show each quantity as the core read it: the number, with its unit selected.
  for (const field of spec.fields) normaliseField(field);
  if (linkFirst) {
    // A link's first result is its headline: painted first; then, in one task,
    // the rest of the form, the printed sheet (its link and QR code) and the
    // tables and figures, after which the page is ready.
    requestAnimationFrame(() =>
      setTimeout(() => {
        completeForm();
        updatePrintFooter();
        updateSheet();
        completeResult();
      }, 0),
    );
  } else {
    updatePrintFooter();
    updateSheet();
  }
  // The note's later sections lie far below the result: fetched (in idle time)
  // only now, so that they never share the connection with the module the first
  // result waits for.
  loadNoteRest();
  registerServiceWorker();
}

start();
