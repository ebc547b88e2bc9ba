// CSV of a table: the adapter writes it from the core's cells (as the core wrote
// them) and neutralises every cell a spreadsheet would run as a formula (one rule,
// tested natively in wasm/src/csv.rs); this module only saves the file.

import { el } from "./dom.js";
import { state } from "./state.js";
import { glue } from "./wasm.js";

/** Saves a table as `<calculator>-<table key>.csv` through a temporary object URL. */
export function downloadCsv(table) {
  const rows = (table.rows || []).map((row) => row.map((cell) => cell.text));
  const text = glue.table_csv(table.headers || [], rows);
  const name = `${state.spec.key}-${table.key || "table"}.csv`;
  // A byte order mark, so that spreadsheet programs read the file as UTF-8.
  const url = URL.createObjectURL(new Blob(["\ufeff", text], { type: "text/csv;charset=utf-8" }));
  const link = el("a", { href: url, download: name, hidden: true });
  document.body.append(link);
  link.click();
  link.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}
