// Fluxledger service worker: makes every page work offline after one visit.
//
// Strategy: cache first for same-origin GET requests, from one cache per site
// build. The site tool fills in the build's version and the list of every file of
// the site (relative to this script, which sits at the site root so that its scope
// covers every page, also under a sub-path of a static host).
//
// Updates: a new build has a new version, so its worker installs beside the old one
// and precaches the whole new site. It then takes over at once (skipWaiting +
// clients.claim) rather than waiting for every tab to close. That is safe here
// because an open page has already loaded everything it uses (script, wasm glue and
// wasm, whose names carry a content hash), and the page offers a reload when the
// controller changes. The first install also claims the page it was installed from,
// so one visit is enough for offline use.
//
// No byte twice: the page registers this worker after its first result, when the
// page, its script and glue are already in the HTTP cache. Files whose names
// carry a content hash never change, so the install reads them from that cache
// (`cache: "default"`) instead of downloading the same bytes again; only the
// unhashed files (pages, manifest, icons) are fetched fresh (`cache: "reload"`),
// compressed in transit like every other response. The build prints the total.
//
// One module for every page: each calculator page loads a wasm module of its own
// (`fluxledger_<page>.<hash>.wasm`, only its calculator), which keeps a first visit
// short; storing all of them would make the offline copy several times larger.
// The precache holds instead the offline module, which serves every calculator
// through the same exports, so the pages' one glue runs it. A request for one of
// this build's page modules is answered by the page's own module when the browser
// already holds it (its first visit), and otherwise by the offline module: no page
// waits for its module on the network once the worker is installed, online or not.
// Only this build's page modules are answered so (`PAGE_MODULES`): a page of another
// build has another glue. The site build refuses an offline module whose glue
// differs from the pages', and a test of the wasm crate checks that it answers each
// page exactly as the page's own module does.

const VERSION = "__CACHE_VERSION__";
const CACHE = `fluxledger-${VERSION}`;
const PRECACHE = __PRECACHE__;
const OFFLINE_MODULE = "__OFFLINE_MODULE__";
/** File names of this build's calculator page modules. */
const PAGE_MODULES = new Set(__PAGE_MODULES__);

self.addEventListener("install", (event) => {
  event.waitUntil(
    (async () => {
      const cache = await caches.open(CACHE);
      // `reload` bypasses the HTTP cache, so a new version never precaches a stale
      // page; a hashed file cannot be stale, and the HTTP cache already holds the
      // ones the first visit used.
      const hashed = /\.[0-9a-f]{8}\.[a-z0-9]+$/;
      await cache.addAll(
        PRECACHE.map((url) => new Request(url, { cache: hashed.test(url) ? "default" : "reload" })),
      );
      await self.skipWaiting();
    })(),
  );
});

self.addEventListener("activate", (event) => {
  event.waitUntil(
    (async () => {
      const names = await caches.keys();
      await Promise.all(
        names.filter((name) => name.startsWith("fluxledger-") && name !== CACHE).map((name) => caches.delete(name)),
      );
      await self.clients.claim();
    })(),
  );
});

/** A response that can answer a navigation (a redirected one cannot be reused as is). */
async function clean(response) {
  if (!response || !response.redirected) return response;
  const body = await response.blob();
  return new Response(body, { status: response.status, statusText: response.statusText, headers: response.headers });
}

async function fromCache(request) {
  const cache = await caches.open(CACHE);
  const url = new URL(request.url);
  if (request.mode === "navigate") {
    // A bookmarked page carries its calculation in the query string: match the page
    // itself. The site root is stored as "./" and as "index.html".
    const page =
      (await cache.match(request, { ignoreSearch: true })) ||
      (url.pathname.endsWith("/") ? await cache.match(new URL("index.html", url), { ignoreSearch: true }) : undefined);
    return clean(page);
  }
  // Files are matched exactly first; a query (the page script adds one when it has
  // to load a fresh copy of the wasm glue) does not change a static file.
  return (await cache.match(request)) || (await cache.match(request, { ignoreSearch: true }));
}

/**
 * One of this build's page modules: the page's own when the browser holds it
 * already (HTTP cache), else the offline module, else the network.
 */
async function pageModule(request) {
  try {
    const own = await fetch(new Request(request.url, { cache: "only-if-cached", mode: "same-origin" }));
    if (own.ok) return own;
  } catch (error) {
    // Not in the HTTP cache.
  }
  const standIn = await (await caches.open(CACHE)).match(new URL(OFFLINE_MODULE, self.location.href));
  return standIn || fetch(request);
}

self.addEventListener("fetch", (event) => {
  const request = event.request;
  if (request.method !== "GET") return;
  const url = new URL(request.url);
  if (url.origin !== self.location.origin) return;
  // The worker script itself is always fetched by the browser's update check.
  if (url.pathname.endsWith("/sw.js")) return;

  event.respondWith(
    (async () => {
      const cached = await fromCache(request);
      if (cached) return cached;
      let response;
      try {
        if (PAGE_MODULES.has(url.pathname.split("/").pop())) return await pageModule(request);
        response = await fetch(request);
      } catch (error) {
        // Offline and not stored: a plain network error for the page to handle,
        // not an uncaught rejection in the worker.
        return Response.error();
      }
      // Keep a copy of plain same-origin files not in the precache list (not pages
      // with a query string: the page itself is already stored once).
      if (response.ok && response.type === "basic" && url.search === "") {
        const copy = response.clone();
        event.waitUntil(caches.open(CACHE).then((cache) => cache.put(request, copy)));
      }
      return response;
    })(),
  );
});
