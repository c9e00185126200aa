// What happened while reading one data file. The readers fill it in as they go, so a
// caller that stops early still sees the counts so far, and can print them afterwards.

import type { DataError } from "./data-error.ts";

/** Counts and sample messages from one read of a data file. */
export interface ReadReport {
  file: string;
  /** Records seen, excluding the CSV/TSV header and blank lines. */
  rows: number;
  /** Examples yielded. rows = examples + skipped + emptyText + missingLabel. */
  examples: number;
  /** Bad rows skipped (only with skipBad). */
  skipped: number;
  /** Physical lines the skipped rows spanned (more than `skipped` when a record ran over several lines). */
  skippedLines: number;
  /** Error code of each skipped row -> count. */
  skippedByReason: Record<string, number>;
  /** Rows whose joined text is empty or whitespace; not yielded. */
  emptyText: number;
  /** Rows (with requireLabels) whose label is missing or empty; not yielded. */
  missingLabel: number;
  /** Up to MAX_REPORT_SAMPLES messages about skipped, empty-text and missing-label rows. */
  samples: string[];
}

/** How many sample messages a report keeps: enough to see a pattern, short enough to print. */
export const MAX_REPORT_SAMPLES = 5;

/**
 * A report with every count at zero, to pass to a reader.
 * @example const report = createReadReport("data.csv"); for await (const e of readExamples("data.csv", {}, report)) {}
 */
export function createReadReport(file: string): ReadReport {
  return {
    file,
    rows: 0,
    examples: 0,
    skipped: 0,
    skippedLines: 0,
    skippedByReason: {},
    emptyText: 0,
    missingLabel: 0,
    samples: [],
  };
}

/**
 * Keeps a sample message if the report has room for one more.
 * @example addReportSample(report, 'data.csv line 12: field "label" is empty')
 */
export function addReportSample(report: ReadReport, message: string): void {
  if (report.samples.length < MAX_REPORT_SAMPLES) report.samples.push(message);
}

/**
 * Counts a bad row that was skipped, under its error code.
 * @example noteSkippedRow(report, error, 3) // report.skipped + 1, report.skippedLines + 3, report.skippedByReason[error.code] + 1
 */
export function noteSkippedRow(report: ReadReport, error: DataError, lines = 1): void {
  report.skipped++;
  report.skippedLines += lines;
  report.skippedByReason[error.code] = (report.skippedByReason[error.code] ?? 0) + 1;
  addReportSample(report, error.message);
}
