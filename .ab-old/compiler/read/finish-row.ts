// The rules every record goes through once its format-specific reader has pulled out the
// text parts and labels: bad rows throw or are skipped, empty texts and missing labels are
// counted (not errors: callers print the counts), the rest become examples.

import { DataError, describeLocation, isSkippableDataError } from "./data-error.ts";
import type { ReadContext } from "./read-context.ts";
import { addReportSample, noteSkippedRow } from "./read-report.ts";
import type { Example } from "./read-types.ts";

/**
 * Throws `error` unless it is a row problem and the read skips bad rows; then counts it,
 * with the physical lines the row spanned (a CSV record may run over several).
 * @example rejectBadRow(context, new DataError("bad-json", { file, line }, "invalid JSON"))
 */
export function rejectBadRow(context: ReadContext, error: DataError, lines = 1): void {
  if (!context.skipBad || !isSkippableDataError(error)) throw error;
  noteSkippedRow(context.report, error, lines);
}

function describeTextFields(fields: readonly string[]): string {
  const names = fields.map((field) => `"${field}"`).join(", ");
  return fields.length === 1 ? `field ${names}` : `fields ${names}`;
}

/**
 * The example for one record, or null when its text is empty or (with requireLabels) it
 * has no label. `labels` is null when the label field is absent, [] when it is empty.
 * @example finishRow(context, 3, ["Refund please"], ["billing"]) // { text: "Refund please", labels: ["billing"], line: 3 }
 */
export function finishRow(
  context: ReadContext,
  line: number,
  textParts: readonly string[],
  labels: string[] | null,
  group?: string,
): Example | null {
  const { report, file } = context;
  const text = textParts.join("\n");
  if (text.trim() === "") {
    report.emptyText++;
    addReportSample(report, `${describeLocation({ file, line })}: text is empty (${describeTextFields(context.textFields)})`);
    return null;
  }
  if (labels === null || labels.length === 0) {
    if (context.requireLabels) {
      report.missingLabel++;
      const state = labels === null ? "is missing" : "is empty";
      addReportSample(report, `${describeLocation({ file, line })}: field "${context.labelField}" ${state}`);
      return null;
    }
    labels = [];
  }
  report.examples++;
  return group === undefined ? { text, labels, line } : { text, labels, line, group };
}
