// The settled options and the report of one read, shared by the CSV and JSONL readers so
// both apply the same defaults and the same checks.

import { DataError } from "./data-error.ts";
import { detectFormat } from "./detect-format.ts";
import type { ReadReport } from "./read-report.ts";
import type { DataFormat, ReadOptions } from "./read-types.ts";

/** Everything a reader needs, with defaults filled in and options checked. */
export interface ReadContext {
  file: string;
  format: DataFormat;
  textFields: readonly string[];
  labelField: string;
  /** null when no group field was asked for. */
  groupField: string | null;
  labelSep: string | null;
  requireLabels: boolean;
  skipBad: boolean;
  report: ReadReport;
}

function badOption(file: string, detail: string): DataError {
  return new DataError("bad-option", { file }, detail);
}

function isNonEmptyString(value: unknown): value is string {
  return typeof value === "string" && value.length > 0;
}

/**
 * Fills in defaults (text field "text", label field "label", labels required, bad rows
 * fatal) and checks the options; throws DataError "bad-option" or "unknown-format".
 * @example createReadContext("data.csv", { labelSep: "|" }, createReadReport("data.csv")).format // "csv"
 */
export function createReadContext(file: string, options: ReadOptions, report: ReadReport): ReadContext {
  const textFields = options.textFields ?? ["text"];
  if (!Array.isArray(textFields) || textFields.length === 0 || !textFields.every(isNonEmptyString)) {
    throw badOption(file, "textFields must list at least one field name, each a non-empty string");
  }
  const labelField = options.labelField ?? "label";
  if (!isNonEmptyString(labelField)) throw badOption(file, "labelField must be a non-empty string");
  const groupField = options.groupField ?? null;
  if (groupField !== null && !isNonEmptyString(groupField)) throw badOption(file, "groupField must be a non-empty string when given");
  const labelSep = options.labelSep ?? null;
  if (labelSep !== null && !isNonEmptyString(labelSep)) {
    throw badOption(file, "labelSep must be a non-empty string when given");
  }
  return {
    file,
    format: detectFormat(file, options.format),
    textFields: [...textFields],
    labelField,
    groupField,
    labelSep,
    requireLabels: options.requireLabels ?? true,
    skipBad: options.skipBad ?? false,
    report,
  };
}
