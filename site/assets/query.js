// Fluxledger: the one inline script of a calculator page, run in the head before
// the body is parsed. The site tool inlines it (comment lines removed) and allows
// it in the content security policy by its SHA-256 hash.
//
// 1. A link with a query is a different calculation from the demo result the HTML
//    carries (rendered at build time, marked `data-demo`): `has-query` on <html>
//    makes the stylesheet hide the demo parts and show "computing…" until the page
//    script has rendered the link's own result.
// 2. It loads the page script (one file, its modules joined by the site tool).
//    With a query, at once, with the page's own wasm module (filled in per page
//    by the site tool) and the glue requested together
//    (preloads, in that order), because the link's result waits for them. Without
//    one, after the first contentful paint
//    (paint timing; two frames where that is missing): the demo result is already
//    in the HTML, and nothing should compete with it for the connection or the
//    processor. A fallback timer covers a page that is never painted (a tab in the
//    background).
// 3. The served form takes typing from the first paint (the page script takes
//    over what was typed). From the first edit the demo result no longer answers
//    the form: `is-editing` on <html> makes the stylesheet hide it and show
//    "computing…" until the page script's own result replaces it. The form is
//    never sent (it has no action of its own: Enter must not reload the page and
//    lose what was typed).
(function (doc, script, preloads, wasm) {
  var root = doc.documentElement;
  var query = location.search.length > 1;
  var started = false;
  function onEdit(event) {
    var target = event.target;
    if (!target || !target.closest || !target.closest(".calc-grid[data-demo] form.inputs")) return;
    root.classList.add("is-editing");
    doc.removeEventListener("input", onEdit, true);
  }
  doc.addEventListener("input", onEdit, true);
  doc.addEventListener(
    "submit",
    function (event) {
      if (event.target && event.target.matches && event.target.matches("form.inputs")) event.preventDefault();
    },
    true
  );
  function add(rel, href, as) {
    var link = doc.createElement("link");
    link.rel = rel;
    link.href = href;
    if (as) {
      link.as = as;
      link.type = "application/wasm";
      link.crossOrigin = "anonymous";
    }
    doc.head.appendChild(link);
  }
  function start() {
    if (started) return;
    started = true;
    // The module first: it is the largest download on the link's critical path,
    // and over HTTP/1.1 (six connections) a request queued behind the scripts'
    // waits for a free connection (about 150 ms later in a 4x, 150 ms trace).
    if (wasm) {
      add("preload", wasm, "fetch");
      // Compiled while it downloads, on the browser's own threads: the page script
      // runs only after the document is parsed, and would otherwise start the
      // compile once every byte has arrived. The fetch takes the preload's
      // response (same URL, mode and credentials): the module is requested once.
      // js/wasm.js instantiates this compiled module, or loads it itself if the
      // compile failed.
      if (window.WebAssembly && WebAssembly.compileStreaming && window.fetch) {
        window.fluxledgerModule = WebAssembly.compileStreaming(fetch(wasm, { credentials: "same-origin" }));
        window.fluxledgerModule.catch(function () {});
      }
    }
    for (var i = 0; i < preloads.length; i += 1) add("modulepreload", preloads[i]);
    var element = doc.createElement("script");
    element.type = "module";
    element.src = script;
    doc.head.appendChild(element);
  }
  if (query) {
    root.classList.add("has-query");
    start();
  } else {
    var types = (window.PerformanceObserver && PerformanceObserver.supportedEntryTypes) || [];
    if (types.indexOf("paint") >= 0) {
      new PerformanceObserver(function (list, observer) {
        var entries = list.getEntries();
        for (var i = 0; i < entries.length; i += 1) {
          if (entries[i].name === "first-contentful-paint") {
            observer.disconnect();
            setTimeout(start, 0);
          }
        }
      }).observe({ type: "paint", buffered: true });
    } else {
      requestAnimationFrame(function () {
        requestAnimationFrame(function () {
          setTimeout(start, 0);
        });
      });
    }
    setTimeout(start, 3000);
  }
})(document, "__PAGE_SCRIPT__", "__PRELOADS__", "__WASM__");
