// Drawn parts (diagram and plot figures) are first described as plain data, a plan:
// an element's tag, its attributes as text, and either its text or its child plans.
// `create` makes the elements of a plan once. After an edit the figure is drawn
// again as a new plan, and `patch` brings the elements up to it by comparing the
// two plans, not the page: an attribute or text is written only where the plans
// differ, and nothing is read from the document. Where the two plans differ in
// structure (another tag, another number of children) that part's children are
// made afresh; the rest keeps its elements. Afterwards the elements are exactly
// what `create` would make of the new plan.

import { SVG_NS, attributesOf, setSymbolText, setText } from "./dom.js";

/**
 * Writes a plan's text: an HTML element's (a title, a caption, a legend's names)
 * with its symbols' subscripts, an SVG element's as it is (no HTML inside SVG).
 */
function writeText(node, plan) {
  if (plan.namespace) setText(node, plan.text);
  else setSymbolText(node, plan.text);
}

/** An element described as data: built by `htmlPlan` / `svgPlan`, made by `create`. */
class Plan {
  constructor(namespace, tag, attrs, children) {
    this.namespace = namespace;
    this.tag = tag;
    const { names, text } = attributesOf(attrs);
    /** Attribute name -> text, in the order they are set. */
    this.attrs = names;
    /** The element's text (a plan has text or children, not both). */
    this.text = text;
    this.children = [];
    this.append(...children);
  }

  append(...children) {
    for (const child of children) {
      if (child === null || child === undefined || child === false) continue;
      if (!(child instanceof Plan)) throw new TypeError("a plan's children are plans");
      this.children.push(child);
    }
    if (this.text !== undefined && this.children.length > 0) throw new TypeError("a plan has text or children, not both");
  }

  prepend(child) {
    this.children.unshift(child);
  }

  get childElementCount() {
    return this.children.length;
  }
}

/** Plan of an HTML element (attributes as `el` in dom.js takes them). */
export function htmlPlan(tag, attrs, ...children) {
  return new Plan(null, tag, attrs, children);
}

/** Plan of an SVG element. */
export function svgPlan(tag, attrs, ...children) {
  return new Plan(SVG_NS, tag, attrs, children);
}

/** Makes the elements of a plan. */
export function create(plan) {
  const node = plan.namespace ? document.createElementNS(plan.namespace, plan.tag) : document.createElement(plan.tag);
  for (const name in plan.attrs) node.setAttribute(name, plan.attrs[name]);
  if (plan.text !== undefined) writeText(node, plan);
  for (const child of plan.children) node.append(create(child));
  return node;
}

/**
 * Brings `node`, made from plan `before` (by `create` or an earlier `patch`), up to
 * plan `after`; returns the node now in the document (another one only when the
 * tag differs).
 */
export function patch(node, before, after) {
  if (before.tag !== after.tag || before.namespace !== after.namespace) {
    const fresh = create(after);
    node.replaceWith(fresh);
    return fresh;
  }
  const had = before.attrs;
  const wants = after.attrs;
  for (const name in wants) if (had[name] !== wants[name]) node.setAttribute(name, wants[name]);
  for (const name in had) if (!(name in wants)) node.removeAttribute(name);
  if ((before.text === undefined) !== (after.text === undefined)) {
    // Text in place of children, or children in place of text: the contents anew.
    node.textContent = "";
    if (after.text !== undefined) writeText(node, after);
    node.append(...after.children.map(create));
    return node;
  }
  if (before.text !== after.text) writeText(node, after);
  const kids = after.children;
  if (kids.length !== before.children.length) {
    node.replaceChildren(...kids.map(create));
    return node;
  }
  let child = node.firstChild;
  for (let i = 0; i < kids.length; i += 1) {
    // Read before patching: a child replaced by `patch` is no longer in the list.
    const next = child.nextSibling;
    patch(child, before.children[i], kids[i]);
    child = next;
  }
  return node;
}
