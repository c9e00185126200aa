// Metrics and provenance are free-form maps a newer writer may extend, so only their kind of
// data is checked: what JSON can hold. MessagePack can also carry 64-bit integers, which
// msgpackr decodes as BigInt when they do not fit a double, and JSON.stringify throws on a
// BigInt: a flipped bit would then break /v1/model and `sluice inspect`. Those are refused.

import { MAX_METADATA_DEPTH } from "./header-limits.ts";
import { isPlainMap } from "./validate-policy.ts";

/**
 * Null when `value` is JSON-like data (maps, arrays, strings, numbers, booleans, nil,
 * dates, bytes) at most MAX_METADATA_DEPTH deep; else a short note of what and where.
 * @example metadataProblem({ f1: 0.93 }) // null
 */
export function metadataProblem(value: unknown, path = "", depth = 0): string | null {
  // NaN and ±Infinity become null in JSON (a build records NaN for a metric it could not compute).
  if (value === null || typeof value === "string" || typeof value === "boolean" || typeof value === "number") return null;
  if (typeof value === "bigint") return `${path || "(value)"} is a 64-bit integer outside the exact range of a double`;
  if (value instanceof Date || value instanceof Uint8Array) return null;
  if (depth >= MAX_METADATA_DEPTH) return `${path} nests deeper than ${MAX_METADATA_DEPTH} levels`;
  if (Array.isArray(value)) {
    for (let i = 0; i < value.length; i++) {
      const problem = metadataProblem(value[i], `${path}[${i}]`, depth + 1);
      if (problem !== null) return problem;
    }
    return null;
  }
  if (isPlainMap(value)) {
    for (const [key, item] of Object.entries(value as Record<string, unknown>)) {
      const problem = metadataProblem(item, path === "" ? key : `${path}.${key}`, depth + 1);
      if (problem !== null) return problem;
    }
    return null;
  }
  return `${path || "(value)"} is a ${typeof value}, which JSON cannot hold`;
}
