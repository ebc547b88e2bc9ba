// The wasm module. Loaded on calculator pages only; re-initialised after a trap.
// `glue` is a live binding: importers always see the current instance (or null).

export let glue = null;
let generation = 0;

export async function loadGlue() {
  // A new query string gives a fresh module instance (a trapped instance cannot be
  // reset); the service worker answers it from the cache as well.
  const suffix = generation === 0 ? "" : `?instance=${generation}`;
  // The first instance comes from the module the head script compiled while it
  // downloaded (`fluxledgerModule`, a promise); without it, or when that compile
  // failed, the glue fetches and compiles the module itself.
  const compiling = generation === 0 ? window.fluxledgerModule : undefined;
  generation += 1;
  const module = await import("./__GLUE__" + suffix);
  let compiled = null;
  if (compiling) {
    try {
      compiled = await compiling;
    } catch (error) {
      compiled = null;
    }
  }
  // Every page has a module of its own (one glue serves them all): without a
  // compiled one, the glue fetches the module the page preloads.
  const preload = document.querySelector('link[rel="preload"][href$=".wasm"]');
  const own = compiled instanceof WebAssembly.Module ? compiled : preload ? preload.href : undefined;
  await module.default(own === undefined ? undefined : { module_or_path: own });
  glue = module;
}

/** Forgets a module instance that trapped (a fresh one is loaded by `loadGlue`). */
export function dropGlue() {
  glue = null;
}
