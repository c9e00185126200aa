// Typed errors for training and test data: one code map and one error class (made by the
// runtime's coded-error factory), so the CLI can switch on `code` and print the message as
// is. Every message starts with where the problem is (file, line, field), then says what was
// expected and what was found.

import { codedErrorClass } from "../../runtime/coded-error.ts";

/**
 * Why a data file or one of its rows was refused. "row" problems can be skipped with
 * `skipBad`; "fatal" ones stop the read because no later row could be trusted or used.
 */
export const DATA_ERROR_CODES = {
  "unknown-format": { scope: "fatal", means: "the data format cannot be told from the file name" },
  "bad-option": { scope: "fatal", means: "a read option has an invalid value" },
  unreadable: { scope: "fatal", means: "the file cannot be opened or read" },
  "missing-column": { scope: "fatal", means: "the CSV/TSV header lacks a requested field" },
  "duplicate-column": { scope: "fatal", means: "the CSV/TSV header names a requested field twice" },
  "bad-quote": { scope: "fatal", means: "CSV quoting is broken, so record boundaries are unknown" },
  "record-too-large": { scope: "fatal", means: "a CSV record exceeds the size limit (often an unclosed quote)" },
  "bad-csv": { scope: "fatal", means: "the CSV parser refused the input for another reason" },
  "column-count": { scope: "row", means: "a CSV/TSV row has a different number of fields than the header" },
  "bad-json": { scope: "row", means: "a JSONL line is not valid JSON" },
  "not-object": { scope: "row", means: "a JSONL line is valid JSON but not an object" },
  "missing-field": { scope: "row", means: "a JSONL object lacks a text field" },
  "bad-field-type": { scope: "row", means: "a JSONL field holds a value of the wrong type" },
} as const;

export type DataErrorCode = keyof typeof DATA_ERROR_CODES;

/** Where in the data a problem is: the file, and the line and field when known. */
export interface DataLocation {
  file: string;
  line?: number | null;
  field?: string | null;
}

/**
 * The "file line N, field "f"" prefix shared by error messages and report samples.
 * @example describeLocation({ file: "data.csv", line: 12, field: "label" }) // 'data.csv line 12, field "label"'
 */
export function describeLocation(location: DataLocation): string {
  let text = location.file;
  if (location.line != null) text += ` line ${location.line}`;
  if (location.field != null) text += `${location.line != null ? "," : ""} field "${location.field}"`;
  return text;
}

/** Data that cannot be read as examples. The message names the file, line and field. */
export class DataError extends codedErrorClass("DataError", DATA_ERROR_CODES) {
  readonly file: string;
  /** 1-based line where the offending record starts, when the problem belongs to one. */
  readonly line: number | null;
  readonly field: string | null;

  constructor(code: DataErrorCode, location: DataLocation, detail: string) {
    super(code, `${describeLocation(location)}: ${detail}`);
    this.file = location.file;
    this.line = location.line ?? null;
    this.field = location.field ?? null;
  }
}

/**
 * Whether rows with this problem may be skipped (with `skipBad`) instead of stopping the read.
 * @example isSkippableDataError(new DataError("bad-json", { file: "a.jsonl", line: 3 }, "...")) // true
 */
export function isSkippableDataError(error: DataError): boolean {
  return DATA_ERROR_CODES[error.code].scope === "row";
}
