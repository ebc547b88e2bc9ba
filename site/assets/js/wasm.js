// The wasm module. Loaded on calculator pages only; re-initialised after a trap.
// `glue` is a live binding: importers always see the current instance (or null).

export let glue = null;
let generation = 0;

export async function loadGlue() {
  // A new query string gives a fresh module instance (a trapped instance cannot be
  // reset); the service worker answers it from the cache as well.
  const suffix = generation === 0 ? "" : `?instance=${generation}`;
  generation += 1;
  const module = await import("./__GLUE__" + suffix);
  await module.default();
  glue = module;
}

/** Forgets a module instance that trapped (a fresh one is loaded by `loadGlue`). */
export function dropGlue() {
  glue = null;
}
