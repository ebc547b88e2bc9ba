// Brings a drawn part (a diagram or plot figure) up to a freshly drawn copy without
// rebuilding it: where the two have the same structure (same element kinds, same
// number of children, level by level) only the attributes and text that differ are
// written; a subtree whose structure differs is replaced whole by the fresh one.
// Afterwards the old node's markup equals the fresh node's, attribute for attribute.

/** Makes `old` equal to `fresh`; returns the node now in the document. */
export function morph(old, fresh) {
  if (!sameKind(old, fresh)) {
    old.replaceWith(fresh);
    return fresh;
  }
  if (old.nodeType === Node.TEXT_NODE) {
    if (old.data !== fresh.data) old.data = fresh.data;
    return old;
  }
  syncAttributes(old, fresh);
  const oldChildren = old.childNodes;
  const freshChildren = fresh.childNodes;
  if (oldChildren.length !== freshChildren.length) {
    old.replaceChildren(...freshChildren);
    return old;
  }
  // Copied first: `morph` may move a fresh child into `old`, which shortens the live list.
  const pairs = Array.from(oldChildren, (child, i) => [child, freshChildren[i]]);
  for (const [child, freshChild] of pairs) morph(child, freshChild);
  return old;
}

function sameKind(a, b) {
  if (a.nodeType !== b.nodeType) return false;
  if (a.nodeType === Node.ELEMENT_NODE) return a.namespaceURI === b.namespaceURI && a.localName === b.localName;
  return a.nodeType === Node.TEXT_NODE;
}

function syncAttributes(old, fresh) {
  const have = old.attributes;
  const want = fresh.attributes;
  // The usual case: the same attributes in the same order (both drawn by the same
  // code), compared pairwise without copying the lists.
  if (have.length === want.length) {
    let sameNames = true;
    for (let i = 0; i < want.length; i += 1) {
      if (have[i].name !== want[i].name) {
        sameNames = false;
        break;
      }
    }
    if (sameNames) {
      for (let i = 0; i < want.length; i += 1) {
        const { name, value } = want[i];
        if (have[i].value !== value) old.setAttribute(name, value);
      }
      return;
    }
  }
  for (const { name } of Array.from(old.attributes)) {
    if (!fresh.hasAttribute(name)) old.removeAttribute(name);
  }
  for (const { name, value } of Array.from(fresh.attributes)) {
    if (old.getAttribute(name) !== value) old.setAttribute(name, value);
  }
}
