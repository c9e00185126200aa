// Checks the texts and options of a request body, with messages that name the field.

import { ApiError } from "./api-error.ts";

/**
 * The text in `value`, or a 422 naming `field` when it is missing, not a string, or blank.
 * @example requireText(body.text, "text") // "where is my parcel?"
 */
export function requireText(value: unknown, field: string): string {
  if (value === undefined || value === null) throw new ApiError("missing-text", `"${field}" is missing; expected a non-empty string`);
  if (typeof value !== "string") throw new ApiError("invalid-input", `"${field}" must be a string, got ${Array.isArray(value) ? "an array" : typeof value}`);
  if (value.trim() === "") throw new ApiError("missing-text", `"${field}" is empty; expected some text`);
  return value;
}

/**
 * An optional integer option in [min, max], or `fallback` when absent.
 * @example integerOption(body.top, "top", 1, 6, 6) // 6
 */
export function integerOption(value: unknown, field: string, min: number, max: number, fallback: number): number {
  if (value === undefined || value === null) return fallback;
  if (typeof value !== "number" || !Number.isInteger(value) || value < min || value > max) {
    throw new ApiError("invalid-input", `"${field}" must be an integer from ${min} to ${max}, got ${JSON.stringify(value)}`);
  }
  return value;
}

/**
 * An optional number option in [min, max], or `fallback` when absent.
 * @example numberOption(body.minScore, "minScore", 0, 1, 0) // 0
 */
export function numberOption(value: unknown, field: string, min: number, max: number, fallback: number): number {
  if (value === undefined || value === null) return fallback;
  if (typeof value !== "number" || !Number.isFinite(value) || value < min || value > max) {
    throw new ApiError("invalid-input", `"${field}" must be a number from ${min} to ${max}, got ${JSON.stringify(value)}`);
  }
  return value;
}
