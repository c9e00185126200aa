// Reading the text and label fields of one parsed JSONL object, with errors that name the
// field and the JSON type found.

import { DataError } from "./data-error.ts";
import type { ReadContext } from "./read-context.ts";
import { cleanLabels, splitLabelCell } from "./split-labels.ts";

/**
 * The JSON type of a parsed value, with its article, for messages.
 * @example describeJsonType([1, 2]) // "an array"
 */
export function describeJsonType(value: unknown): string {
  if (value === null) return "null";
  if (Array.isArray(value)) return "an array";
  switch (typeof value) {
    case "string":
      return "a string";
    case "number":
      return "a number";
    case "boolean":
      return "a boolean";
    default:
      return "an object";
  }
}

/** Whether a parsed JSON value is an object (not an array, not null). */
export function isJsonObject(value: unknown): value is Record<string, unknown> {
  return typeof value === "object" && value !== null && !Array.isArray(value);
}

/**
 * The text parts of one record, in the requested order. Numbers are written as JSON wrote
 * them; a missing field or any other type throws a row DataError.
 * @example readJsonTextParts({ title: "Late", body: 2 }, context, 4) // ["Late", "2"] for textFields title, body
 */
export function readJsonTextParts(record: Record<string, unknown>, context: ReadContext, line: number): string[] {
  return context.textFields.map((field) => {
    const where = { file: context.file, line, field };
    // Own keys only: a field named "constructor" must not find Object.prototype's.
    if (!Object.hasOwn(record, field)) {
      throw new DataError("missing-field", where, "missing; expected a string");
    }
    const value = record[field];
    if (typeof value === "string") return value;
    if (typeof value === "number") return String(value);
    throw new DataError("bad-field-type", where, `expected a string, found ${describeJsonType(value)}`);
  });
}

/**
 * The group of one record (a string or a number), or undefined when no group field was asked
 * for; a missing or other-typed value throws a row DataError.
 * @example readJsonGroup({ doc: "a-12" }, context, 3) // "a-12" for groupField doc
 */
export function readJsonGroup(record: Record<string, unknown>, context: ReadContext, line: number): string | undefined {
  const field = context.groupField;
  if (field === null) return undefined;
  const where = { file: context.file, line, field };
  if (!Object.hasOwn(record, field)) throw new DataError("missing-field", where, "missing; expected the row's group (a string or a number)");
  const value = record[field];
  if (typeof value === "string") return value;
  if (typeof value === "number") return String(value);
  throw new DataError("bad-field-type", where, `expected a string or a number naming the row's group, found ${describeJsonType(value)}`);
}

/**
 * The labels of one record: null when the label field is absent or null; a string (split
 * on labelSep when given), a number, or an array of strings/numbers otherwise.
 * @example readJsonLabels({ label: ["billing", "refund"] }, context, 2) // ["billing", "refund"]
 */
export function readJsonLabels(record: Record<string, unknown>, context: ReadContext, line: number): string[] | null {
  const field = context.labelField;
  if (!Object.hasOwn(record, field) || record[field] === null) return null;
  const value = record[field];
  const where = { file: context.file, line, field };
  if (typeof value === "string") return splitLabelCell(value, context.labelSep);
  if (typeof value === "number") return [String(value)];
  if (Array.isArray(value)) {
    const pieces = value.map((item, index) => {
      if (typeof item === "string") return item;
      if (typeof item === "number") return String(item);
      throw new DataError("bad-field-type", where, `item ${index + 1} of the array is ${describeJsonType(item)}, expected a string`);
    });
    return cleanLabels(pieces);
  }
  throw new DataError(
    "bad-field-type",
    where,
    `expected a string, a number or an array of strings, found ${describeJsonType(value)}`,
  );
}
