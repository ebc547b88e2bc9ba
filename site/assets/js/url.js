// URL state: the link is read once, through the core's glossary (old keys of
// bookmarked links are read in today's vocabulary and the translation is shown),
// and written back on every change without a new history entry.

import { NOTICE_NAMES_MAX, quote, quoteList } from "./dom.js";
import { notice } from "./notices.js";
import { state, isQuantity, isVisible, systemLabel } from "./state.js";
import { glue } from "./wasm.js";
import { isPageLevelKey, readableQuery, takePageLevel, writePageLevel } from "./sheet.js";

/** The query key of the page's unit system (`units=` in older links). */
export const SYSTEM_KEY = "system";

/**
 * Reads the query string into state, collecting notices for what cannot be used:
 * the old keys translated (one notice), every key this page does not use (naming
 * the first few), each key given more than once (the last value is the one used,
 * never silently), and an unknown unit system naming the system used. When
 * anything was translated, the address bar shows the link in today's keys.
 */
export function readUrl(spec) {
  const raw = [...new URLSearchParams(location.search)];
  const upgraded = raw.length > 0 ? JSON.parse(glue.upgrade_link(spec.key, JSON.stringify(raw))) : { pairs: [], translations: [] };
  const translations = upgraded.translations || [];
  if (translations.length > 0) {
    notice("info", [`Old link keys read as: ${translations.join(", ")}.`]);
    const params = new URLSearchParams();
    for (const [key, value] of upgraded.pairs) params.append(key, value);
    history.replaceState(history.state, "", "?" + params.toString());
  }
  const fromUrl = new Map();
  const keys = new Set(spec.fields.map((f) => f.key));
  keys.add(SYSTEM_KEY);
  /** key -> every value given, in order (known keys only) */
  const given = new Map();
  const unknown = [];
  const unknownSeen = new Set();
  for (const [key, value] of upgraded.pairs || []) {
    // Sheet fields and pinned cases are the page's, not the calculator's.
    if (isPageLevelKey(key)) {
      takePageLevel(key, value);
      continue;
    }
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
  const systems = (state.page.unit_systems || []).map((s) => s.key);
  for (const [key, values] of given) {
    const value = values[values.length - 1];
    if (values.length > 1) repeated.push([key, values]);
    if (key === SYSTEM_KEY) {
      if (systems.includes(value)) state.system = value;
      else
        notice("warn", [
          `The link asks for the unit system ${quote(value)}, which is not known (use ${systems
            .map((s) => `“${s}”`)
            .join(" or ")}); ${systemLabel(state.system)} is used.`,
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

/** Writes the current inputs, sheet fields and pins to the address bar (no new history entry). */
export function writeUrl() {
  const params = caseParams();
  writePageLevel(params);
  history.replaceState(history.state, "", "?" + readableQuery(params));
}

/** The current case alone: its visible inputs and the unit system. */
export function caseParams() {
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
  params.set(SYSTEM_KEY, state.system);
  return params;
}
