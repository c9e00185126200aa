// Per-client rate limiting through the platform's Rate Limiting binding. The key is the
// client address Cloudflare puts in CF-Connecting-IP; without it (local runs) all callers
// share one key. Without a binding nothing is limited.

import type { MiddlewareHandler } from "hono";
import { errorResponse } from "./api-error.ts";
import type { RateLimitBinding } from "./platform-types.ts";

/**
 * Middleware answering 429 when the binding says the client is over its limit.
 * @example app.use("/v1/*", limitRate(env.RATE_LIMITER ?? null))
 */
export function limitRate(limiter: RateLimitBinding | null): MiddlewareHandler {
  return async (c, next) => {
    if (limiter === null || c.req.method === "OPTIONS") return next();
    const key = c.req.header("cf-connecting-ip") ?? "anonymous";
    const { success } = await limiter.limit({ key });
    if (!success) return errorResponse("rate-limited", "too many requests from this client; slow down and try again later");
    return next();
  };
}
