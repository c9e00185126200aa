// The Sluice HTTP API as one hono app over a loaded model. The Worker entry and
// `sluice serve` both build it here, so the Worker and the local server answer alike.
// Order of the /v1/* middleware: CORS (so preflights pass), rate limit (so token guessing
// is limited too), bearer token, body limit, then the route.

import { Hono } from "hono";
import { bodyLimit } from "hono/body-limit";
import { cors } from "hono/cors";
import { HTTPException } from "hono/http-exception";
import { NONCE, secureHeaders, type SecureHeadersVariables } from "hono/secure-headers";
import { InputError, type Model } from "../index.ts";
import { ApiError, errorResponse } from "./api-error.ts";
import { resolveAppConfig, type AppConfig } from "./app-config.ts";
import { classifyRoute } from "./classify-route.ts";
import { explainRoute } from "./explain-route.ts";
import { limitRate } from "./limit-rate.ts";
import { modelRoute } from "./model-route.ts";
import { moderateRoute } from "./moderate-route.ts";
import { playgroundPage } from "./playground-page.ts";
import { mountReviewLoop } from "./reviews/mount-review-loop.ts";
import { separateTokens } from "./reviews/reviewer-token.ts";

export type SluiceApp = Hono<{ Variables: SecureHeadersVariables }>;

/** Routes and the methods they answer, for 405 replies and the 404 hint. */
const ROUTES: Record<string, "GET" | "POST"> = {
  "/": "GET",
  "/healthz": "GET",
  "/v1/model": "GET",
  "/v1/classify": "POST",
  "/v1/moderate": "POST",
  "/v1/explain": "POST",
};

/**
 * Builds the app for a model; `config` fields left out take their defaults.
 * @example
 * const app = createApp(loadModel(bytes), { maxTexts: 50 });
 * const response = await app.request("/v1/classify", { method: "POST", headers: { "content-type": "application/json" }, body: '{"text":"hi"}' });
 */
export function createApp(model: Model, partialConfig: Partial<AppConfig> = {}): SluiceApp {
  const config = resolveAppConfig(partialConfig);
  const app: SluiceApp = new Hono();

  app.onError((error) => toErrorResponse(error));
  app.notFound((c) => {
    const known = Object.entries(ROUTES).map(([path, method]) => `${method} ${path}`).join(", ");
    return errorResponse("not-found", `no route ${c.req.method} ${c.req.path.slice(0, 200)}; this server has ${known}`);
  });

  app.use(
    secureHeaders({
      contentSecurityPolicy: {
        defaultSrc: ["'none'"],
        scriptSrc: [NONCE],
        styleSrc: [NONCE],
        connectSrc: ["'self'"],
        imgSrc: ["'self'"],
        formAction: ["'self'"],
        baseUri: ["'none'"],
        frameAncestors: ["'none'"],
      },
      xFrameOptions: "DENY",
    }),
  );
  if (config.corsOrigins.length > 0) {
    app.use("/v1/*", cors({ origin: [...config.corsOrigins], allowMethods: ["GET", "POST", "OPTIONS"], allowHeaders: ["Content-Type", "Authorization"], maxAge: 600 }));
  }
  app.use("/v1/*", limitRate(config.rateLimiter));
  app.use("/v1/*", separateTokens(config.apiToken, config.reviewLoop?.config.reviewerToken ?? null));
  app.use(
    "/v1/*",
    bodyLimit({
      maxSize: config.maxBodyBytes,
      onError: () => errorResponse("body-too-large", `the body is larger than ${config.maxBodyBytes} bytes, this server's limit`),
    }),
  );
  app.use("/v1/*", async (c, next) => {
    await next();
    // Classifications are about the caller's text: no shared cache may keep them.
    c.header("cache-control", "no-store");
  });

  app.get("/", (c) => c.html(playgroundPage(model, c.get("secureHeadersNonce") ?? "")));
  // Browsers ask for an icon next to every page; answer "nothing here" instead of a 404 error.
  app.get("/favicon.ico", (c) => c.body(null, 204));
  app.get("/healthz", (c) => c.json({ status: "ok", contentId: model.meta.contentId, labels: model.labels.length }));
  app.get("/v1/model", modelRoute(model));
  app.post("/v1/classify", classifyRoute(model, config));
  app.post("/v1/moderate", moderateRoute(model, config));
  app.post("/v1/explain", explainRoute(model, config));
  mountReviewLoop(app, model, config.reviewLoop);
  for (const [path, method] of Object.entries(ROUTES)) {
    app.all(path, (c) => errorResponse("method-not-allowed", `${path} answers ${method}, not ${c.req.method}`, { allow: method === "GET" ? "GET, HEAD" : "POST" }));
  }
  return app;
}

/** Any thrown error as the API's JSON error; unexpected ones are logged, not shown. */
function toErrorResponse(error: unknown): Response {
  if (error instanceof ApiError) return errorResponse(error.code, error.message);
  if (error instanceof InputError) return errorResponse("invalid-input", error.message);
  if (error instanceof HTTPException) {
    if (error.status === 413) return errorResponse("body-too-large", "the body is larger than this server's limit");
    if (error.status === 401) return errorResponse("unauthorized", "a valid bearer token is required");
    if (error.status === 400) return errorResponse("malformed-body", error.message || "the request cannot be read");
  }
  console.error("sluice: unexpected error", error);
  return errorResponse("internal", "an unexpected error occurred; it has been logged");
}
