// Turning raw label values into the label list of an example. Labels are trimmed, empty
// pieces dropped and repeats removed (an example either has a label or not), keeping the
// order of first appearance.

/**
 * Trimmed, non-empty, first-seen-order unique labels.
 * @example cleanLabels([" billing ", "", "billing", "refund"]) // ["billing", "refund"]
 */
export function cleanLabels(pieces: readonly string[]): string[] {
  const labels: string[] = [];
  for (const piece of pieces) {
    const label = piece.trim();
    if (label !== "" && !labels.includes(label)) labels.push(label);
  }
  return labels;
}

/**
 * The labels in one cell, split on `separator` when one is given.
 * @example splitLabelCell("billing | refund", "|") // ["billing", "refund"]
 */
export function splitLabelCell(cell: string, separator: string | null): string[] {
  return cleanLabels(separator === null ? [cell] : cell.split(separator));
}
