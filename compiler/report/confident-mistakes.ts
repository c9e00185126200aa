// The texts the model got wrong with the highest confidence. They are often labelling errors
// in the data, or the patterns a policy should not act on automatically; both are worth a look
// before trusting a block threshold. Folded away by default: they are users' texts.

import { chartDataTable } from "./html-table.ts";
import { formatRate, shorten } from "./report-format.ts";
import type { ConfidentMistake } from "./report-data.ts";

/** Longest text shown per mistake; the rest is cut with an ellipsis. */
export const MISTAKE_TEXT_LENGTH = 240;

/**
 * The confident-mistakes section body (a folded table), or a sentence when there are none.
 * @example renderConfidentMistakes(data.mistakes)
 */
export function renderConfidentMistakes(mistakes: readonly ConfidentMistake[]): string {
  if (mistakes.length === 0) return "<p>The model's top label matches the label in the data on every example.</p>";
  const withLines = mistakes.some((mistake) => mistake.line !== null);
  const headings = [...(withLines ? ["line"] : []), "gold", "predicted", "confidence", "text"];
  const rows = mistakes.map((mistake) => [...(withLines ? [mistake.line === null ? "—" : String(mistake.line)] : []), mistake.gold, mistake.predicted, formatRate(mistake.confidence), shorten(mistake.text.replace(/\s+/g, " "), MISTAKE_TEXT_LENGTH)]);
  return (
    `<p>The ${mistakes.length} wrong top labels given with the highest confidence. Check them for labelling errors, and for texts a policy should send to review instead of acting on.</p>` +
    chartDataTable({ caption: `the ${mistakes.length} most confident mistakes`, headings, rows, rowHeadings: false, numericColumns: withLines ? [0, 3] : [2], className: "mistakes" }, `Show the ${mistakes.length} most confident mistakes`)
  );
}
