// Fluxledger page script: the later sections of the method note.
//
// A calculator page's first response carries its note's first section (the
// governing equation, which the printed sheet shows) and a link to the whole note
// on a page of its own (`<key>-method.html`, see `split_note` in
// site/src/pages.rs); the rest of the note is most of its bytes and lies far below
// the first result. In idle time this fetches that page (from the service
// worker's cache when offline), and puts the sections the page does not have yet
// in place of the link: both articles open with the same children. When the fetch
// fails the link stays, and it works without script. On every page with a note, a
// box of it that scrolls sideways on a narrow screen takes the keyboard's focus.

import { whenIdle } from "./pause.js";

/** Observes the note's boxes that can scroll sideways (see `watchScrollers`). */
let scrollers = null;

/**
 * A paragraph or list item holding a formula, and a code block, scroll sideways
 * when they are wider than the screen (a formula never breaks); while one does,
 * it takes the keyboard's focus, so that it can be scrolled without a pointer
 * (WCAG 2.2 SC 2.1.1), and one that fits takes none (no tab stop for every
 * paragraph with a symbol in it). A box that holds something focusable already
 * (a display formula is served focusable, a link) is left as it is.
 */
function watchScrollers(article) {
  if (!article || !("ResizeObserver" in window)) return;
  if (!scrollers) {
    scrollers = new ResizeObserver((entries) => {
      // Every width read before any attribute is written.
      const marks = entries.map((entry) => [entry.target, entry.target.scrollWidth > entry.target.clientWidth + 1]);
      for (const [box, wide] of marks) {
        if (wide === box.hasAttribute("tabindex")) continue;
        if (wide) box.setAttribute("tabindex", "0");
        else box.removeAttribute("tabindex");
      }
    });
  }
  // The boxes the stylesheet lets scroll (`p:has(> math)`, `li:has(> math)`, `pre`),
  // found without `:has`, which an older browser's selector engine would refuse.
  for (const box of article.querySelectorAll("p, li, pre")) {
    const scrolls = box.localName === "pre" || Array.from(box.children).some((child) => child.localName === "math");
    if (scrolls && !box.querySelector("[tabindex], a[href]")) scrollers.observe(box);
  }
}

/**
 * Gives the note's wide boxes the keyboard (`watchScrollers`), and replaces the
 * note's link with the whole note's later sections, in idle time.
 */
export function loadNoteRest() {
  watchScrollers(document.querySelector("article.method-note"));
  const more = document.querySelector(".method-note > .note-more");
  const link = more && more.querySelector("a[href]");
  if (!link) return;
  const run = () => {
    fetch(link.getAttribute("href"))
      .then((response) => (response.ok ? response.text() : Promise.reject(new Error(String(response.status)))))
      .then((html) => {
        const whole = new DOMParser().parseFromString(html, "text/html").querySelector("article.method-note");
        const article = more.parentElement;
        if (!whole || !article || !more.isConnected) return;
        // The first element the page does not have, then every node after it
        // (the text between elements too, as the note page has it).
        let node = whole.children[Array.from(article.children).indexOf(more)];
        if (!node) return;
        while (node) {
          const next = node.nextSibling;
          article.insertBefore(document.adoptNode(node), more);
          node = next;
        }
        more.remove();
        watchScrollers(article);
      })
      .catch(() => {
        // The link stays: it opens the whole note.
      });
  };
  whenIdle(run, 3000, 500);
}
