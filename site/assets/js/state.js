// The page's state: the calculator's description, what the user typed, the unit
// each selector shows and the unit system. Rules about fields come from the core's
// description (default unit per system, the chain of conditions under which a
// field is shown); this module only applies them.

export const state = {
  /** `calculator(key)`: {version, unit_systems, common_cautions, calculator} */
  page: null,
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
  /** Set by main.js: recomputes and renders ({writeToUrl, full}). */
  recompute: () => {},
  /** Set by main.js: the same for a keystroke (at once, or once at the next animation frame). */
  recomputeForKeystroke: () => {},
  /** Set by main.js: runs a recompute waiting for its frame now. */
  settlePending: () => {},
};

/** The unit a field starts in for `system` (the core's rule, sent per field). */
export function defaultUnit(field, system) {
  return (field.default_units && field.default_units[system]) || "";
}

export function isQuantity(field) {
  return field.kind === "quantity" && Array.isArray(field.units) && field.units.length > 0;
}

/** The label of a unit system key, from the core's list. */
export function systemLabel(system) {
  const found = (state.page?.unit_systems || []).find((s) => s.key === system);
  return found ? found.label : system;
}

/** Whether a field is shown: every condition of the core's chain holds. */
export function isVisible(field) {
  return (field.shown_when || []).every(
    (rule) => Array.isArray(rule.values) && rule.values.includes(state.values[rule.field] ?? ""),
  );
}
