// Fluxledger verification page script (verify.html).
//
// The page lists every sourced reference case as static HTML; this script runs
// each one through the wasm export `verify_case` (the core's case runner and
// tolerance rule, the same the native test suite uses) and writes the computed
// values and verdicts into the rows. It holds no physics, parses no numbers and
// judges nothing itself: agreement is what the core returns. Everything is written
// with textContent and DOM APIs.

/** Cases run between two pauses, so the page stays responsive. */
const BATCH = 8;

let glueGeneration = 0;

async function loadGlue() {
  // A trapped instance cannot be reset: a new query string gives a fresh one (the
  // service worker answers it from the cache as well, as on the calculator pages).
  const suffix = glueGeneration === 0 ? "" : `?instance=${glueGeneration}`;
  glueGeneration += 1;
  const module = await import("./__GLUE__" + suffix);
  await module.default();
  return module;
}

function registerServiceWorker() {
  if (!("serviceWorker" in navigator)) return;
  navigator.serviceWorker.register("./sw.js").catch(() => {
    // Without a service worker the page still works online; nothing to report.
  });
}

function readCases() {
  const block = document.getElementById("cases");
  return block ? JSON.parse(block.textContent) : [];
}

function setCell(row, selector, text, state) {
  const cell = row.querySelector(selector);
  if (!cell) return;
  cell.textContent = text;
  if (state) cell.dataset.state = state;
}

function relativeErrorText(value) {
  if (value === null || value === undefined) return "";
  return ` (off by ${value.toExponential(1)} of the expected value)`;
}

/** Writes one verdict into its case entry; returns whether the case agrees. */
function show(entry, verdict) {
  for (const output of verdict.outputs) {
    const row = entry.querySelector(`tr[data-output="${CSS.escape(output.output)}"]`);
    if (!row) continue;
    const computed = output.problem
      ? output.problem
      : output.computed === null
        ? "no value"
        : output.computed + (output.agrees ? "" : relativeErrorText(output.relative_error));
    setCell(row, ".computed", computed);
    setCell(row, ".agrees", output.agrees ? "yes" : "NO", output.agrees ? "pass" : "fail");
  }
  if (verdict.refusal) {
    const row = entry.querySelector("tr[data-refusal]");
    if (row) {
      const own = verdict.errors.filter((e) => e.field === verdict.refusal.field);
      const text =
        own.length > 0
          ? "refused: " + own.map((e) => e.message).join("; ")
          : verdict.errors.length > 0
            ? "refused on other fields: " + verdict.errors.map((e) => `${e.field}: ${e.message}`).join("; ")
            : "not refused";
      setCell(row, ".computed", text);
      setCell(row, ".agrees", verdict.refusal.agrees ? "yes" : "NO", verdict.refusal.agrees ? "pass" : "fail");
    }
  }
  const result = entry.querySelector(".case-result");
  if (result) {
    const reasons = [];
    if (verdict.problem) reasons.push(verdict.problem);
    for (const fault of verdict.faults) reasons.push(fault);
    if (!verdict.refusal) for (const e of verdict.errors) reasons.push(`refused ${e.field}: ${e.message}`);
    result.textContent = verdict.agrees
      ? "Agrees with its source."
      : "Does not agree with its source" + (reasons.length ? ": " + reasons.join(" · ") : ".");
    result.dataset.result = verdict.agrees ? "pass" : "fail";
  }
  entry.dataset.result = verdict.agrees ? "pass" : "fail";
  return verdict.agrees;
}

function failEntry(entry, message) {
  const result = entry.querySelector(".case-result");
  if (result) {
    result.textContent = "Could not run: " + message;
    result.dataset.result = "fail";
  }
  entry.dataset.result = "fail";
}

const pause = () => new Promise((resolve) => setTimeout(resolve, 0));

async function run() {
  const summary = document.getElementById("verify-summary");
  const cases = readCases();
  const entries = document.querySelectorAll("li.verify-case");
  const total = cases.length;
  summary.textContent = `Running ${total} cases in this browser…`;
  let glue;
  try {
    glue = await loadGlue();
  } catch (error) {
    summary.textContent = `The cases could not run: the WebAssembly module did not load (${error}).`;
    document.body.dataset.state = "error";
    return;
  }
  let agree = 0;
  const disagree = [];
  for (let index = 0; index < total; index += 1) {
    const entry = entries[index];
    if (!entry) continue;
    try {
      if (show(entry, JSON.parse(glue.verify_case(cases[index])))) agree += 1;
      else disagree.push(entry);
    } catch (error) {
      // A trap leaves the module unusable: load a fresh instance for the rest.
      failEntry(entry, String(error));
      disagree.push(entry);
      try {
        glue = await loadGlue();
      } catch {
        // The next case reports the failure again.
      }
    }
    if (index % BATCH === BATCH - 1) {
      summary.textContent = `Running: ${index + 1} of ${total} cases done…`;
      await pause();
    }
  }
  summary.textContent =
    agree === total
      ? `${agree} of ${total} agree in this browser.`
      : `${agree} of ${total} agree in this browser; ${total - agree} do not (marked NO below).`;
  summary.dataset.agree = String(agree);
  summary.dataset.total = String(total);
  if (disagree.length > 0) {
    const first = disagree[0];
    const link = document.createElement("a");
    link.href = "#" + first.id;
    link.textContent = "First disagreeing case";
    summary.append(" ", link);
  }
  document.body.dataset.state = agree === total ? "ready" : "disagree";
}

registerServiceWorker();
run();
