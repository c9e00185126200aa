// Plain HTML tables for the report: the per-label table, the settings, and the data tables
// that stand in for each chart as its text alternative. Every cell is escaped here.

import { escapeHtml } from "./escape-html.ts";

/** A cell: plain text (escaped), or a number (printed as is and right-aligned). */
export type TableCell = string | number;

export interface TableSpec {
  caption: string;
  headings: string[];
  rows: TableCell[][];
  /** The first cell of each row names the row (`<th scope="row">`). Default true. */
  rowHeadings?: boolean;
  className?: string;
  /** Columns to right-align; by default a column is numeric when its cell is a number or looks like one. */
  numericColumns?: number[];
}

/**
 * A `<table>` with a caption, column headings (scope="col") and row headings (scope="row").
 * @example htmlTable({ caption: "Sizes", headings: ["model", "bytes"], rows: [["draft", 1024]] })
 */
export function htmlTable(spec: TableSpec): string {
  const rowHeadings = spec.rowHeadings ?? true;
  const head = spec.headings.map((heading) => `<th scope="col">${escapeHtml(heading)}</th>`).join("");
  const body = spec.rows
    .map((row) => {
      const cells = row.map((cell, column) => {
        const numeric = spec.numericColumns ? spec.numericColumns.includes(column) : typeof cell === "number" || /^[-+−]?[\d.,\u202f ]+%?$/.test(cell);
        const text = escapeHtml(String(cell));
        const attributes = numeric ? ' class="number"' : "";
        return column === 0 && rowHeadings ? `<th scope="row"${attributes}>${text}</th>` : `<td${attributes}>${text}</td>`;
      });
      return `<tr>${cells.join("")}</tr>`;
    })
    .join("");
  const className = spec.className ? ` class="${escapeHtml(spec.className)}"` : "";
  return `<div class="table-scroll"><table${className}><caption>${escapeHtml(spec.caption)}</caption><thead><tr>${head}</tr></thead><tbody>${body}</tbody></table></div>`;
}

/**
 * A chart's data table, folded into `<details>` so it is one click away for everyone and
 * reachable by screen readers, without crowding the page.
 * @example chartDataTable({ caption: "Bins", headings: ["bin", "count"], rows: [] })
 */
export function chartDataTable(spec: TableSpec, summary = `Data table: ${spec.caption}`): string {
  return `<details class="data-table"><summary>${escapeHtml(summary)}</summary>${htmlTable(spec)}</details>`;
}
