// Reads a request body by its media type: JSON for every route, and also
// application/x-www-form-urlencoded and multipart/form-data where a route accepts forms.
// Wrong type → 415, unparseable → 400, parsed but not an object → 422.

import type { Context } from "hono";
import { ApiError } from "./api-error.ts";

export type BodyKind = "json" | "form" | "multipart";

const MEDIA_TYPES: Record<BodyKind, string> = {
  json: "application/json",
  form: "application/x-www-form-urlencoded",
  multipart: "multipart/form-data",
};

/** A body as field → value; form files arrive as File objects. */
export type BodyFields = Record<string, unknown>;

/**
 * Reads the body as an object of fields, accepting only the given kinds.
 * @example const fields = await readBodyFields(c, ["json", "form", "multipart"]);
 */
export async function readBodyFields(c: Context, accepted: readonly BodyKind[]): Promise<BodyFields> {
  const header = c.req.header("content-type");
  const kind = bodyKindOf(header);
  if (kind === null || !accepted.includes(kind)) {
    const expected = accepted.map((k) => MEDIA_TYPES[k]).join(" or ");
    throw new ApiError("unsupported-media-type", `expected Content-Type ${expected}, got ${header === undefined ? "none" : `"${header}"`}`);
  }
  if (kind === "json") return readJsonObject(await c.req.text());
  let parsed: Record<string, unknown>;
  try {
    parsed = (await c.req.parseBody({ all: true })) as Record<string, unknown>;
  } catch (error) {
    throw new ApiError("malformed-body", `the ${MEDIA_TYPES[kind]} body cannot be parsed: ${(error as Error).message}`);
  }
  return parsed;
}

/** The body kind of a Content-Type header (parameters such as charset are ignored), or null. */
export function bodyKindOf(header: string | undefined): BodyKind | null {
  if (header === undefined) return null;
  const mediaType = header.split(";")[0].trim().toLowerCase();
  if (mediaType === MEDIA_TYPES.json || /^application\/[a-z0-9.+-]+\+json$/.test(mediaType)) return "json"; // RFC 6839 §3.1 +json suffix
  if (mediaType === MEDIA_TYPES.form) return "form";
  if (mediaType === MEDIA_TYPES.multipart) return "multipart";
  return null;
}

function readJsonObject(text: string): BodyFields {
  if (text.trim() === "") throw new ApiError("malformed-body", "the body is empty; expected a JSON object");
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch (error) {
    throw new ApiError("malformed-body", `the body is not valid JSON: ${(error as Error).message}`);
  }
  if (typeof value !== "object" || value === null || Array.isArray(value)) {
    throw new ApiError("invalid-input", `expected a JSON object, got ${value === null ? "null" : Array.isArray(value) ? "an array" : typeof value}`);
  }
  return value as BodyFields;
}
