// Fluxledger: marks a page opened with a query string, before its body is parsed.
//
// Each calculator page carries its demo result in the HTML (rendered at build time,
// marked `data-demo`). A link with a query is a different calculation: the
// stylesheet hides the demo parts under `html.has-query` and shows "computing…"
// until the page script has rendered the link's own result. A classic script in
// the head (the content security policy allows no inline script) runs before the
// first paint, so the demo is never shown as the link's result.
if (location.search.length > 1) document.documentElement.classList.add("has-query");
