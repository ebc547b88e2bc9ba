// Small DOM helpers: every piece of text goes in through `textContent` or an
// attribute, never as markup.

export const SVG_NS = "http://www.w3.org/2000/svg";

/** Longest piece of URL text quoted back in a notice. */
const QUOTE_MAX = 60;

/** How many keys a notice names before it says "and N more". */
export const NOTICE_NAMES_MAX = 10;

/** Creates an HTML element with attributes and text or child nodes. */
export function el(tag, attrs, ...children) {
  const node = document.createElement(tag);
  setAttrs(node, attrs);
  for (const child of children) {
    if (child === null || child === undefined || child === false) continue;
    node.append(typeof child === "string" ? document.createTextNode(child) : child);
  }
  return node;
}

/** Creates an SVG element with attributes. */
export function svg(tag, attrs, ...children) {
  const node = document.createElementNS(SVG_NS, tag);
  setAttrs(node, attrs);
  for (const child of children) {
    if (child === null || child === undefined) continue;
    node.append(typeof child === "string" ? document.createTextNode(child) : child);
  }
  return node;
}

/**
 * The attributes `el`, `svg` and the plans of render-patch take, as an element gets
 * them: `null`, `undefined` and `false` are left out, `true` is an empty value,
 * `dataset` keys become `data-*` names (`tableIndex` → `data-table-index`, as the
 * DOM maps them), everything else is text; `text` is the element's text.
 * Returns `{names, text}`: attribute name → text, and the text or `undefined`.
 */
export function attributesOf(attrs) {
  const names = {};
  let text;
  for (const [name, value] of Object.entries(attrs || {})) {
    if (value === null || value === undefined || value === false) continue;
    if (name === "text") text = String(value);
    else if (name === "dataset") {
      for (const [key, data] of Object.entries(value)) {
        names["data-" + key.replace(/[A-Z]/g, (c) => "-" + c.toLowerCase())] = String(data);
      }
    } else names[name] = value === true ? "" : String(value);
  }
  return { names, text };
}

function setAttrs(node, attrs) {
  const { names, text } = attributesOf(attrs);
  for (const name in names) node.setAttribute(name, names[name]);
  if (text !== undefined) node.textContent = text;
}

/**
 * Makes `nodes` the children of `parent`, in order, as `replaceChildren` does, but
 * moving only the nodes out of place: where most are already in place (the served
 * form's fields), taking each out and putting it back costs a link's first result
 * several milliseconds at 4× CPU.
 */
export function setChildren(parent, nodes) {
  const keep = new Set(nodes);
  for (const child of [...parent.childNodes]) if (!keep.has(child)) child.remove();
  let before = parent.firstChild;
  for (const node of nodes) {
    if (node === before) before = before.nextSibling;
    else parent.insertBefore(node, before);
  }
}

/**
 * Writes `text` into an element that shows one piece of text, only when it differs.
 * A lone text node has its data rewritten: the browser then lays out the changed
 * text alone, where `textContent` would remove the node and insert a new one (and
 * restyle everything that depends on the element's children).
 */
export function setText(node, text) {
  const value = text ?? "";
  const only = node.firstChild;
  if (only && only === node.lastChild && only.nodeType === Node.TEXT_NODE) {
    if (only.data !== value) only.data = value;
  } else if (node.textContent !== value) {
    node.textContent = value;
  }
}

/**
 * A symbol with a subscript in the core's text, `C_d`, `L_run`, `V_θ2`, `R_p0.2`:
 * one or two letters not inside a longer word, `_`, then letters and digits (a point
 * between digits), not followed by a letter, a digit or `_`. The page shows the part
 * after `_` as a subscript; the text keeps its `_` (CSV, error messages, the link).
 * `symbol_parts` in site/src/pages.rs reads the same for the served page.
 */
const SYMBOL = /(?<![\p{Alphabetic}\d_])(\p{Alphabetic}{1,2})_([\p{Alphabetic}\d]+(?:\.\d+)?)(?![\p{Alphabetic}\d_])/gu;

/** The core's text as nodes for `el` or `append`: plain text, and `<sub>` for each symbol's subscript. */
export function symbolNodes(text) {
  const value = text ?? "";
  if (!value.includes("_")) return [value];
  const nodes = [];
  let from = 0;
  for (const match of value.matchAll(SYMBOL)) {
    const underscore = match.index + match[1].length;
    nodes.push(value.slice(from, underscore), el("sub", { text: match[2] }));
    from = underscore + 1 + match[2].length;
  }
  nodes.push(value.slice(from));
  return nodes.filter((node) => node !== "");
}

/**
 * Writes the core's `text` into an element with its symbols' subscripts
 * (`symbolNodes`), only when what it shows differs: text without a symbol as
 * `setText` writes it.
 */
export function setSymbolText(node, text) {
  const nodes = symbolNodes(text);
  if (nodes.length === 1 && typeof nodes[0] === "string") {
    // A subscript shown before goes even when the text reads the same without it.
    if (node.firstElementChild) node.textContent = nodes[0];
    else setText(node, nodes[0]);
    return;
  }
  const shown = node.childNodes;
  const same =
    shown.length === nodes.length &&
    nodes.every((part, i) =>
      typeof part === "string"
        ? shown[i].nodeType === Node.TEXT_NODE && shown[i].data === part
        : shown[i].nodeName === "SUB" && shown[i].textContent === part.textContent,
    );
  if (!same) node.replaceChildren(...nodes);
}

/** Shortens text for quoting (by code points, so no surrogate is split). */
export function quote(text) {
  const chars = Array.from(String(text));
  const cut = chars.length > QUOTE_MAX ? chars.slice(0, QUOTE_MAX).join("") + "…" : chars.join("");
  return "“" + cut + "”" + (chars.length > QUOTE_MAX ? ` (${chars.length} characters)` : "");
}

/** Shortens a message that may repeat user text (at most 300 characters). */
export function clip(text) {
  const chars = Array.from(String(text));
  return chars.length > 300 ? chars.slice(0, 300).join("") + "…" : chars.join("");
}

/** Quotes up to NOTICE_NAMES_MAX texts, then says how many more there are. */
export function quoteList(texts) {
  const named = texts.slice(0, NOTICE_NAMES_MAX).map(quote).join(", ");
  const more = texts.length - NOTICE_NAMES_MAX;
  return more > 0 ? `${named} and ${more} more` : named;
}

/** Whether every argument is a finite number. */
export function finite(...numbers) {
  return numbers.every((n) => typeof n === "number" && Number.isFinite(n));
}
