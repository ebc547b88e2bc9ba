// Tables: headers and cells as the core describes them. A column's kind (text or
// number) sets its alignment, its unit goes into the header, and each cell shows
// the text the core prepared (`shown`); nothing here reads the text.

import { el } from "./dom.js";

/** A table panel; the CSV button names the table by its index in the result. */
export function renderTable(table, index) {
  const element = el("table", { class: "ledger", dataset: { table: table.key || "" } });
  // The title stands above the scrolling area, so a wide table scrolls under it
  // instead of cutting it off; the caption keeps it for screen readers.
  if (table.title) element.append(el("caption", { class: "visually-hidden", text: table.title }));
  const columns = table.columns || [];
  const head = el("tr");
  for (const column of columns) {
    head.append(el("th", { scope: "col", text: column.unit ? `${column.title} (${column.unit})` : column.title }));
  }
  element.append(el("thead", {}, head));
  const body = el("tbody");
  const emphasised = new Set(table.emphasised_rows || []);
  for (const [rowIndex, row] of (table.rows || []).entries()) {
    const tr = el("tr", emphasised.has(rowIndex) ? { class: "emphasised" } : {});
    row.forEach((cell, column) => {
      // Numbers line up on the right and never wrap; words (a basis table's
      // explanations) wrap on the left so a phone shows them whole.
      const words = columns[column]?.kind !== "number";
      tr.append(
        column === 0
          ? el("th", { scope: "row", text: cell.shown })
          : el("td", words ? { class: "text", text: cell.shown } : { text: cell.shown }),
      );
    });
    body.append(tr);
  }
  element.append(body);
  const download = el("button", {
    type: "button",
    class: "button button-small csv-download",
    text: "Download CSV",
    "aria-label": `Download ${table.title || "the table"} as CSV`,
    dataset: { action: "csv", tableIndex: String(index) },
  });
  return el(
    "section",
    { class: "panel panel-table" },
    table.title ? el("h3", { class: "table-title", "aria-hidden": "true", text: table.title }) : null,
    el("div", { class: "table-scroll", tabindex: "0" }, element),
    el("div", { class: "table-actions" }, download),
  );
}
