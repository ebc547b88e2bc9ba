// CSV of a table: the adapter writes it from the core's cells (as the core wrote
// them) after a header block that traces the file (version, calculator, link,
// inputs with units; sheet.js `traceRows`), and neutralises every cell a
// spreadsheet would run as a formula (one rule, tested natively in
// wasm/src/csv.rs); this module only saves the file.

import { el } from "./dom.js";
import { state } from "./state.js";
import { glue } from "./wasm.js";
import { traceRows } from "./sheet.js";

/** Saves a table as `<calculator>-<table key>-<date>.csv`. */
export function downloadCsv(table) {
  const rows = (table.rows || []).map((row) => row.map((cell) => cell.text));
  saveCsv(table.key || "table", table.headers || [], rows);
}

/** Saves rows of texts under a header block as `<calculator>-<name>-<date>.csv`. */
export function saveCsv(name, headers, rows) {
  const text = glue.table_csv_traced(JSON.stringify(traceRows()), JSON.stringify(headers), JSON.stringify(rows));
  const date = new Date().toISOString().slice(0, 10);
  const file = `${state.spec.key}-${name}-${date}.csv`;
  // A byte order mark, so that spreadsheet programs read the file as UTF-8.
  const url = URL.createObjectURL(new Blob(["\ufeff", text], { type: "text/csv;charset=utf-8" }));
  const link = el("a", { href: url, download: file, hidden: true });
  document.body.append(link);
  link.click();
  link.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}
