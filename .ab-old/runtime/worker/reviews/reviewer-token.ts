// Keeps the two secrets apart: the reviewer routes (/v1/reviews…, /v1/stats, /v1/shadow)
// take only REVIEWER_TOKEN and are off without it (they show stored traffic); every other
// /v1 route takes only API_TOKEN and refuses a request that presents the reviewer token,
// even when the API is open, so a reviewer's token never doubles as a classify key.

import type { MiddlewareHandler } from "hono";
import { errorResponse } from "../api-error.ts";
import { constantTimeEqual } from "../constant-time-equal.ts";
import { requireBearerToken } from "../require-bearer-token.ts";

const REVIEWER_PREFIXES = ["/v1/reviews", "/v1/stats", "/v1/shadow"];

/** True for the routes behind REVIEWER_TOKEN. */
export function isReviewerPath(path: string): boolean {
  return REVIEWER_PREFIXES.some((prefix) => path === prefix || path.startsWith(`${prefix}/`));
}

// RFC 6750 §2.1, as in require-bearer-token.ts.
const BEARER = /^Bearer +([A-Za-z0-9\-._~+/]+=*)\s*$/i;

/**
 * The /v1/* token check with both secrets.
 * @example app.use("/v1/*", separateTokens(config.apiToken, loop?.config.reviewerToken ?? null))
 */
export function separateTokens(apiToken: string | null, reviewerToken: string | null): MiddlewareHandler {
  const apiGuard = requireBearerToken(apiToken);
  const reviewerGuard = reviewerToken === null ? null : requireBearerToken(reviewerToken);
  return async (c, next) => {
    if (isReviewerPath(c.req.path)) {
      if (c.req.method === "OPTIONS") return next();
      if (reviewerGuard === null) return errorResponse("reviews-off", "the reviewer API is off: set the REVIEWER_TOKEN secret to turn it on");
      return reviewerGuard(c, next);
    }
    if (reviewerToken !== null) {
      const presented = BEARER.exec(c.req.header("authorization") ?? "")?.[1];
      if (presented !== undefined && constantTimeEqual(presented, reviewerToken)) {
        return errorResponse("unauthorized", "the reviewer token does not open this route; it needs the API token", { "www-authenticate": 'Bearer realm="sluice", error="invalid_token"' });
      }
    }
    return apiGuard(c, next);
  };
}
