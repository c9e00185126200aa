// Bearer-token check for /v1/*: `Authorization: Bearer <token>` (RFC 6750 §2.1), compared
// in constant time. Without a configured token every request passes.

import type { MiddlewareHandler } from "hono";
import { errorResponse } from "./api-error.ts";
import { constantTimeEqual } from "./constant-time-equal.ts";

// RFC 6750 §2.1: credentials = "Bearer" 1*SP b64token; the scheme is case-insensitive (RFC 7235 §2.1).
const BEARER = /^Bearer +([A-Za-z0-9\-._~+/]+=*)\s*$/i;

/**
 * Middleware refusing requests without the right token (401 with a WWW-Authenticate challenge).
 * @example app.use("/v1/*", requireBearerToken(config.apiToken))
 */
export function requireBearerToken(token: string | null): MiddlewareHandler {
  return async (c, next) => {
    if (token === null || c.req.method === "OPTIONS") return next();
    const header = c.req.header("authorization");
    if (header === undefined) {
      return errorResponse("unauthorized", "this server needs an Authorization: Bearer <token> header", { "www-authenticate": 'Bearer realm="sluice"' });
    }
    const match = BEARER.exec(header);
    if (match === null || !constantTimeEqual(match[1], token)) {
      // RFC 6750 §3.1: invalid_token for a token that is malformed or wrong.
      return errorResponse("unauthorized", "the bearer token is not valid", { "www-authenticate": 'Bearer realm="sluice", error="invalid_token"' });
    }
    return next();
  };
}
