// Plain aligned text tables for human-readable CLI output.

/**
 * Renders rows as a table; numbers are right-aligned.
 * @example formatTable(["label", "f1"], [["spam", "0.981"]])
 */
export function formatTable(headings: string[], rows: (string | number)[][]): string {
  const cells = [headings, ...rows.map((row) => row.map((cell) => String(cell)))];
  const widths = headings.map((_, column) => Math.max(...cells.map((row) => (row[column] ?? "").length)));
  const numeric = headings.map((_, column) => rows.every((row) => typeof row[column] === "number" || /^[-+]?[\d.]+%?$/.test(String(row[column]))));
  const render = (row: string[]) => row.map((cell, column) => (numeric[column] ? cell.padStart(widths[column]) : cell.padEnd(widths[column]))).join("  ").trimEnd();
  return [render(cells[0]), widths.map((w) => "-".repeat(w)).join("  "), ...cells.slice(1).map(render)].join("\n");
}

/** 0.96123 → "0.961"; NaN → "n/a". */
export function fixed(value: number, digits = 3): string {
  return Number.isFinite(value) ? value.toFixed(digits) : "n/a";
}
