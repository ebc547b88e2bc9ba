// How the page behaves as it scrolls on a phone.
//
// The result box sticks to the top of a phone's screen while the inputs scroll
// past (style.css caps it at a quarter of the screen's height). While the reader
// scrolls down it folds to its first line of values; it opens again when the
// reader scrolls back up or taps it. Folding clips what is drawn (`clip-path`,
// set through `data-folded`) and changes no layout: nothing below it moves, and
// the scroll position the reader has is kept.
//
// A table wider than its box shows that it scrolls sideways: its right edge fades
// out until the reader has scrolled to the end, and a hint stands beside the
// table's download button. Both follow `data-overflows` and `data-at-end` on the
// table's panel, set from the measured widths when the table or its box changes
// size and when it is scrolled; a table that fits shows neither.

import { state } from "./state.js";

/** The phone layout of style.css: the result box sticks only there. */
const NARROW = "(max-width: 899.98px)";
/** Pixels scrolled one way before the result box follows the direction. */
const TURN = 24;
/** Pixels of the box's first line kept below the values (their descenders). */
const FOLD_MARGIN = 8;

/** Starts folding the result box on scrolling; called once the page is built. */
export function watchHeadline() {
  const headline = state.ui.headline;
  if (!headline) return;
  const narrow = window.matchMedia(NARROW);
  // Read in the next frame, not now: the page is being built, and reading the
  // scroll position here would force a layout of the whole page mid-build (the
  // frame lays it out anyway).
  let lastY = 0;
  requestAnimationFrame(() => {
    lastY = window.scrollY;
  });
  /** Scrolled since the last change of direction: positive down, negative up. */
  let run = 0;
  let frame = 0;

  const onScroll = () => {
    if (frame) return;
    frame = requestAnimationFrame(() => {
      frame = 0;
      const y = window.scrollY;
      const step = y - lastY;
      lastY = y;
      if (!narrow.matches) {
        fold(headline, false);
        return;
      }
      run = Math.sign(step) === Math.sign(run) ? run + step : step;
      // Folded only while it sticks: at its own place it hides nothing.
      const stuck = headline.getBoundingClientRect().top <= 1 && y > 0;
      if (!stuck) fold(headline, false);
      else if (run >= TURN) fold(headline, true);
      else if (run <= -TURN) fold(headline, false);
    });
  };
  window.addEventListener("scroll", onScroll, { passive: true });
  narrow.addEventListener("change", () => fold(headline, false));
  // A tap on the folded box opens it, and so does the keyboard's focus (what it
  // holds is then shown whole, to be read or scrolled); scrolling on down folds it
  // again.
  const open = () => {
    run = 0;
    fold(headline, false);
  };
  headline.addEventListener("click", open);
  headline.addEventListener("focus", open);
}

/** Folds the result box to its first line of values, or opens it. */
function fold(headline, folded) {
  if (folded === headline.hasAttribute("data-folded")) return;
  if (folded) {
    const first = headline.querySelector(".headline-values > .output, .no-result");
    const top = headline.getBoundingClientRect().top;
    const line = first ? first.getBoundingClientRect().bottom - top + FOLD_MARGIN : 0;
    // Nothing to fold away when the first line is all there is.
    if (line <= 0 || line >= headline.offsetHeight) return;
    // CSSOM, not a style attribute: the page's CSP allows only its stylesheet.
    headline.style.setProperty("--folded-height", `${Math.ceil(line)}px`);
  }
  headline.toggleAttribute("data-folded", folded);
}

let resizes = null;

/** Marks a table panel (made by `renderTable`, or the comparison's) when its table
 * scrolls sideways. */
export function watchTable(panel) {
  const box = panel.querySelector(".table-scroll");
  if (!box) return;
  if (!("ResizeObserver" in window)) return;
  if (!resizes) {
    // Called after layout, before paint: the widths are read without forcing a
    // layout of their own, and the marks are drawn in the same frame.
    resizes = new ResizeObserver((entries) => {
      // Every width read before any mark is written: a mark written between two
      // reads would make the next read lay the page out again.
      const boxes = new Set();
      for (const entry of entries) {
        const scroller = entry.target.closest(".table-scroll");
        if (scroller) boxes.add(scroller);
      }
      const measured = [...boxes].map(measureOverflow);
      for (const marks of measured) applyOverflow(marks);
    });
    document.addEventListener(
      "scroll",
      (event) => {
        const target = event.target;
        if (target instanceof Element && target.classList.contains("table-scroll")) markOverflow(target);
      },
      { capture: true, passive: true },
    );
  }
  resizes.observe(box);
  const table = box.querySelector("table");
  if (table) resizes.observe(table);
}

/** Stops watching a table panel's table before the panel is redrawn (the observer
 * would otherwise keep the replaced elements). */
export function forgetTable(panel) {
  const box = panel.querySelector(".table-scroll");
  if (!box || !resizes) return;
  resizes.unobserve(box);
  const table = box.querySelector("table");
  if (table) resizes.unobserve(table);
}

function markOverflow(box) {
  applyOverflow(measureOverflow(box));
}

/** Whether a table's box scrolls sideways and is scrolled to its end (reads only). */
function measureOverflow(box) {
  const panel = box.closest(".panel-table, .compare-panel");
  if (!panel) return null;
  const overflows = box.scrollWidth > box.clientWidth + 1;
  const atEnd = box.scrollLeft + box.clientWidth >= box.scrollWidth - 1;
  return { panel, overflows, atEnd };
}

/** Writes the marks `measureOverflow` found (writes only). */
function applyOverflow(marks) {
  if (!marks) return;
  const { panel, overflows, atEnd } = marks;
  if (panel.hasAttribute("data-overflows") !== overflows) panel.toggleAttribute("data-overflows", overflows);
  if (panel.hasAttribute("data-at-end") !== atEnd) panel.toggleAttribute("data-at-end", atEnd);
}
