// How numbers read in the report: three decimals for rates, grouped digits for counts and
// sizes (a narrow no-break space groups digits: the SI thin space, kept from breaking a
// number across lines; no locale is assumed).

/**
 * A rate or score with three decimals; "n/a" when not a finite number.
 * @example formatRate(0.96153) // "0.962"
 */
export function formatRate(value: number | null | undefined, digits = 3): string {
  return typeof value === "number" && Number.isFinite(value) ? value.toFixed(digits) : "n/a";
}

/**
 * An integer with digit groups of three separated by a narrow no-break space (U+202F).
 * @example formatCount(1245916) // "1 245 916"
 */
export function formatCount(value: number): string {
  const digits = String(Math.round(Math.abs(value)));
  const grouped = digits.replace(/\B(?=(\d{3})+(?!\d))/g, "\u202f");
  return value < 0 ? `−${grouped}` : grouped;
}

/**
 * A size in bytes, with KiB or MiB (powers of 1024, as the size budgets are) alongside.
 * @example formatBytes(129296) // "129 296 B (126.3 KiB)"
 */
export function formatBytes(bytes: number): string {
  if (bytes < 1024) return `${formatCount(bytes)} B`;
  const unit = bytes < 1024 * 1024 ? ["KiB", 1024] : ["MiB", 1024 * 1024];
  return `${formatCount(bytes)} B (${(bytes / (unit[1] as number)).toFixed(1)} ${unit[0]})`;
}

/**
 * A share as a whole percentage.
 * @example formatPercent(0.254) // "25%"
 */
export function formatPercent(share: number): string {
  return `${Math.round(share * 100)}%`;
}

/**
 * Shortens a label or text for a chart, with an ellipsis; the full text stays in the data table.
 * @example shorten("product-question", 10) // "product-q…"
 */
export function shorten(text: string, length: number): string {
  const characters = [...text];
  return characters.length <= length ? text : `${characters.slice(0, length - 1).join("")}…`;
}

/**
 * A count with its noun, singular for exactly one.
 * @example countOf(1, "example") // "1 example"
 */
export function countOf(count: number, singular: string, plural = `${singular}s`): string {
  return `${formatCount(count)} ${count === 1 ? singular : plural}`;
}
