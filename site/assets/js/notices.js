// The notices box: what the page tells about the link, a restart or a new version.

import { el } from "./dom.js";
import { state } from "./state.js";

/** Most notices shown at once; any further ones are counted in one closing line. */
const NOTICES_MAX = 20;

export function noticesBox() {
  let box = document.getElementById("notices");
  if (!box) {
    box = el("div", { id: "notices", class: "notices", role: "status", "aria-live": "polite" });
    const host = document.getElementById("calculator") || document.body;
    host.prepend(box);
  }
  return box;
}

/**
 * Shows a notice. `parts` are strings (plain text) or nodes; `action` an optional
 * `{label, run}` button. A notice with the same kind and text as one already shown
 * is not repeated; beyond NOTICES_MAX, notices are only counted.
 */
export function notice(kind, parts, action) {
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

/**
 * Removes what only reported the last action (the values a unit switch converted,
 * a copied link, old link keys read in today's words): called on the next edit.
 * Warnings, errors and notices that offer an action stay until dismissed.
 */
export function clearPassingNotices() {
  // Called on every keystroke: the two status lines by reference (a class list of
  // the calculator, live as it is, walked its thousand-odd elements again after
  // every keystroke's changes: 0.7 ms of the bend page's handler at 4x CPU), and
  // the notices box, which is small.
  for (const status of [state.ui.systemStatus, state.ui.copyStatus]) {
    if (status && status.firstChild) status.textContent = "";
  }
  const box = document.getElementById("notices");
  if (!box) return;
  for (const item of Array.from(box.getElementsByClassName("notice-info"))) {
    if (item.parentNode === box && item.localName === "p" && !item.querySelector(".notice-action")) item.remove();
  }
}
