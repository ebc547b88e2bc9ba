// Fluxledger page script: the later sections of the method note.
//
// A calculator page's first response carries its note's first section (the
// governing equation, which the printed sheet shows) and a link to the whole note
// on a page of its own (`<key>-method.html`, see `split_note` in
// site/src/pages.rs); the rest of the note is most of its bytes and lies far below
// the first result. In idle time this fetches that page (from the service
// worker's cache when offline), and puts the sections the page does not have yet
// in place of the link: both articles open with the same children. When the fetch
// fails the link stays, and it works without script.

import { whenIdle } from "./pause.js";

/** Replaces the note's link with the whole note's later sections, in idle time. */
export function loadNoteRest() {
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
      })
      .catch(() => {
        // The link stays: it opens the whole note.
      });
  };
  whenIdle(run, 3000, 500);
}
