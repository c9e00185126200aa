// HTTP errors of the Sluice API: one code map (code → status and meaning) and one error
// class (made by the runtime's coded-error factory). Every error leaves the app as
// { "error": { "code", "message" } }; never a stack.

import { codedErrorClass } from "../index.ts";

/** Error codes of the HTTP API, their status and what they mean. */
export const API_ERROR_CODES = {
  "malformed-body": { status: 400, meaning: "the body is not valid JSON, form data or multipart data" },
  unauthorized: { status: 401, meaning: "a bearer token is required and was missing or wrong" },
  "not-found": { status: 404, meaning: "no such route" },
  "method-not-allowed": { status: 405, meaning: "the route exists but not for this method" },
  "already-decided": { status: 409, meaning: "the review item has a decision already; a second one is refused" },
  leased: { status: 409, meaning: "another reviewer holds this review item's lease" },
  "body-too-large": { status: 413, meaning: "the request body is larger than the configured limit" },
  "too-many-texts": { status: 413, meaning: "more texts in one call than the configured limit" },
  "unsupported-media-type": { status: 415, meaning: "the Content-Type is not one the route reads" },
  "invalid-input": { status: 422, meaning: "the body parsed but a field has the wrong type or value" },
  "missing-text": { status: 422, meaning: "no text, or only an empty one, was given" },
  "rate-limited": { status: 429, meaning: "too many requests from this client; try again later" },
  "bad-config": { status: 500, meaning: "a configuration variable of the server is invalid" },
  "reviews-off": { status: 503, meaning: "the reviewer API needs REVIEWER_TOKEN and the REVIEWS database, and one is missing or failing" },
  internal: { status: 500, meaning: "an unexpected error; details are in the server log" },
} as const;

export type ApiErrorCode = keyof typeof API_ERROR_CODES;
export type ApiErrorStatus = (typeof API_ERROR_CODES)[ApiErrorCode]["status"];

/** An error with an API code; `status` comes from the code map. */
export class ApiError extends codedErrorClass("ApiError", API_ERROR_CODES) {
  readonly status: ApiErrorStatus;

  constructor(code: ApiErrorCode, message: string) {
    super(code, message);
    this.status = API_ERROR_CODES[code].status;
  }
}

/**
 * The JSON response for an error code.
 * @example errorResponse("missing-text", 'the body needs "text"') // 422 { error: { code, message } }
 */
export function errorResponse(code: ApiErrorCode, message: string, headers?: Record<string, string>): Response {
  return new Response(JSON.stringify({ error: { code, message } }), {
    status: API_ERROR_CODES[code].status,
    headers: { "content-type": "application/json; charset=utf-8", ...headers },
  });
}
