// Adds the review loop's routes to the app: the reviewer page (/review, no token: it asks
// for one), and behind REVIEWER_TOKEN the queue, its export, the traffic counts and the
// shadow report. The token check itself is separateTokens (reviewer-token.ts), on /v1/*.

import type { Hono } from "hono";
import type { SecureHeadersVariables } from "hono/secure-headers";
import type { Model } from "../../index.ts";
import { errorResponse } from "../api-error.ts";
import { exportReviewsRoute } from "./export-route.ts";
import { reviewPage } from "./review-page.ts";
import type { ReviewLoop } from "./review-loop.ts";
import { decideReviewRoute, listReviewsRoute } from "./reviews-routes.ts";
import { shadowRoute, statsRoute } from "./stats-routes.ts";

/** Routes of the review loop and their methods, for 405 answers. */
export const REVIEW_LOOP_ROUTES: Record<string, "GET" | "POST"> = {
  "/review": "GET",
  "/v1/reviews": "GET",
  "/v1/reviews/export": "GET",
  "/v1/reviews/:id": "POST",
  "/v1/stats": "GET",
  "/v1/shadow": "GET",
};

/**
 * @example mountReviewLoop(app, model, config.reviewLoop)
 */
export function mountReviewLoop(app: Hono<{ Variables: SecureHeadersVariables }>, model: Model, loop: ReviewLoop | null): void {
  app.get("/review", (c) => c.html(reviewPage(model, c.get("secureHeadersNonce") ?? "")));
  app.get("/v1/reviews", listReviewsRoute(model, loop));
  app.get("/v1/reviews/export", exportReviewsRoute(model, loop));
  app.post("/v1/reviews/:id", decideReviewRoute(model, loop));
  app.get("/v1/stats", statsRoute(model, loop));
  app.get("/v1/shadow", shadowRoute(model, loop));
  for (const [path, method] of Object.entries(REVIEW_LOOP_ROUTES)) {
    app.all(path, (c) => errorResponse("method-not-allowed", `${path} answers ${method}, not ${c.req.method}`, { allow: method === "GET" ? "GET, HEAD" : "POST" }));
  }
}
