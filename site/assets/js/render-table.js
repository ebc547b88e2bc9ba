// Tables: headers and cells as the core describes them. A column's kind (text or
// number) sets its alignment, its unit goes into the header, and each cell shows
// the text the core prepared (`shown`); nothing here reads the text.
//
// On an edit a table is updated in place (`updateTable`): a cell's text is written
// only where it changed, rows are added or removed at the end when their number
// changes (a line schedule of 500 rows repaints only its changed rows); a change
// of columns rebuilds the table.

import { el, setSymbolText, setText, symbolNodes } from "./dom.js";
import { watchTable } from "./layout.js";

/** A table panel; the CSV button names the table by its index in the result. */
export function renderTable(table, index) {
  const element = el("table", { class: "ledger", dataset: { table: table.key || "" } });
  // The title stands above the scrolling area, so a wide table scrolls under it
  // instead of cutting it off; the caption keeps it for screen readers.
  if (table.title) element.append(el("caption", { class: "visually-hidden" }, ...symbolNodes(table.title)));
  const columns = table.columns || [];
  const head = el("tr");
  for (const column of columns) {
    head.append(el("th", { scope: "col" }, ...symbolNodes(column.unit ? `${column.title} (${column.unit})` : column.title)));
  }
  element.append(el("thead", {}, head));
  const body = el("tbody");
  const emphasised = new Set(table.emphasised_rows || []);
  for (const [rowIndex, row] of (table.rows || []).entries()) body.append(renderRow(row, columns, emphasised.has(rowIndex)));
  element.append(body);
  const download = el("button", {
    type: "button",
    class: "button button-small csv-download",
    text: "Download CSV",
    // The visible text first: a spoken command ("Download CSV") matches the name.
    "aria-label": `Download CSV of ${table.title || "the table"}`,
    dataset: { action: "csv", tableIndex: String(index) },
  });
  const panel = el(
    "section",
    { class: "panel panel-table", dataset: { shape: columnsShape(table) } },
    table.title ? el("h3", { class: "table-title", "aria-hidden": "true" }, ...symbolNodes(table.title)) : null,
    el("div", { class: "table-scroll", tabindex: "0" }, element),
    el("div", { class: "table-actions" }, download),
  );
  // A table wider than its box shows that it scrolls (layout.js).
  watchTable(panel);
  return panel;
}

function renderRow(row, columns, emphasised) {
  const tr = el("tr", emphasised ? { class: "emphasised" } : {});
  row.forEach((cell, column) => {
    // Numbers line up on the right and never wrap; words (a basis table's
    // explanations) wrap on the left so a phone shows them whole.
    const kind = columns[column]?.kind;
    const words = kind !== "number";
    // What the user typed (a tag) is shown as it is; the core's own words with
    // their symbols' subscripts.
    const shown = kind === "typed" ? [cell.shown] : symbolNodes(cell.shown);
    tr.append(
      column === 0 ? el("th", { scope: "row" }, ...shown) : el("td", words ? { class: "text" } : {}, ...shown),
    );
  });
  return tr;
}

/** What fixes a table's markup apart from its rows: key, title, columns. */
function columnsShape(table) {
  return JSON.stringify([table.key || "", table.title || "", (table.columns || []).map((c) => [c.title, c.unit || "", c.kind])]);
}

/**
 * Brings a panel made by `renderTable` up to `table`: cell text written where it
 * changed, rows added or removed at the end. Returns false (nothing touched) when
 * the columns differ, or the panel is not one of ours; the caller rebuilds it.
 */
export function updateTable(panel, table) {
  if (panel.dataset.shape !== columnsShape(table)) return false;
  const body = panel.querySelector("tbody");
  if (!body) return false;
  const columns = table.columns || [];
  const rows = table.rows || [];
  const emphasised = new Set(table.emphasised_rows || []);
  const existing = body.rows;
  const common = Math.min(existing.length, rows.length);
  for (let r = 0; r < common; r += 1) {
    const tr = existing[r];
    const row = rows[r];
    if (tr.cells.length !== row.length) {
      tr.replaceWith(renderRow(row, columns, emphasised.has(r)));
      continue;
    }
    if (tr.classList.contains("emphasised") !== emphasised.has(r)) tr.classList.toggle("emphasised", emphasised.has(r));
    const cells = tr.cells;
    for (let c = 0; c < row.length; c += 1) {
      if (columns[c]?.kind === "typed") setText(cells[c], row[c]?.shown);
      else setSymbolText(cells[c], row[c]?.shown);
    }
  }
  while (body.rows.length > rows.length) body.lastElementChild.remove();
  if (rows.length > common) {
    const added = document.createDocumentFragment();
    for (let r = common; r < rows.length; r += 1) added.append(renderRow(rows[r], columns, emphasised.has(r)));
    body.append(added);
  }
  return true;
}
