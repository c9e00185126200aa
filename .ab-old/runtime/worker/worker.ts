// The Sluice Worker: the HTTP API (fetch) and e-mail ingress (email) over two bundled models.
//   - moderation (demo: contact form, ok / spam / abusive) serves every HTTP route and is the
//     e-mail handler's first step (block → refuse, review → a person);
//   - routing (demo: support topics) picks the team an allowed e-mail is forwarded to.
// Each model is a Data module (an ArrayBuffer) parsed once per isolate, at module scope, so
// requests only score. Config comes from the bindings ([vars], secrets, [[ratelimits]]).
// `sluice serve` reuses createApp from runtime/worker/create-app.ts on Node (one model, no e-mail).

import moderationBytes from "../../demo-data/models/worker-contact-form.sluice";
import routingBytes from "../../demo-data/models/worker-support-topics.sluice";
// The shadow candidate: a zero-byte file means "no candidate" (scripts/demo-model.ts).
import candidateBytes from "../../demo-data/models/worker-candidate.sluice";
import { loadModel } from "../index.ts";
import { errorResponse } from "./api-error.ts";
import { appConfigFromEnv, ConfigError } from "./app-config.ts";
import { createApp, type SluiceApp } from "./create-app.ts";
import { handleEmail } from "./handle-email.ts";
import type { IncomingEmailMessage, WorkerEnv, WorkerExecutionContext } from "./platform-types.ts";
import { loadCandidate } from "./reviews/load-candidate.ts";
import { purgeExpired } from "./reviews/purge-expired.ts";
import { ReviewLoop } from "./reviews/review-loop.ts";
import { reviewLoopConfigFromEnv } from "./reviews/review-loop-config.ts";

export * from "./index.ts";

const moderationModel = loadModel(moderationBytes);
const routingModel = loadModel(routingBytes);
const emailModels = { moderation: moderationModel, routing: routingModel };
const candidateModel = loadCandidate(candidateBytes);

// The platform passes the same env object to every request of an isolate; the app is
// rebuilt only if it changes (e.g. a new deployment of vars), never per request.
let cachedEnv: WorkerEnv | null = null;
let cachedApp: SluiceApp | null = null;
let cachedLoop: ReviewLoop | null = null;

function appFor(env: WorkerEnv): SluiceApp {
  if (cachedApp === null || cachedEnv !== env) {
    const reviewLoop = loopFor(env);
    cachedApp = createApp(moderationModel, { ...appConfigFromEnv(env), reviewLoop });
    cachedEnv = env;
  }
  return cachedApp;
}

/** One review loop per isolate and env, shared by HTTP and e-mail (so its counters are too). */
function loopFor(env: WorkerEnv): ReviewLoop {
  if (cachedLoop === null || cachedLoop.env !== env) cachedLoop = new ReviewLoop(moderationModel, reviewLoopConfigFromEnv(env), candidateModel, env);
  return cachedLoop;
}

export default {
  /** HTTP: the Sluice API and the playground page. */
  async fetch(request: Request, env: WorkerEnv, ctx: WorkerExecutionContext): Promise<Response> {
    let app: SluiceApp;
    try {
      app = appFor(env);
    } catch (error) {
      if (!(error instanceof ConfigError)) throw error;
      console.error(`sluice: invalid configuration: ${error.message}`);
      return errorResponse("bad-config", "the server's configuration is invalid; the details are in its log");
    }
    return app.fetch(request, env, ctx);
  },

  /** E-mail Routing: moderate, then forward to the topic's team, a person, or refuse by policy. */
  async email(message: IncomingEmailMessage, env: WorkerEnv, ctx: WorkerExecutionContext): Promise<void> {
    let config;
    let loop: ReviewLoop;
    try {
      config = appConfigFromEnv(env).email;
      loop = loopFor(env);
    } catch (error) {
      // Throwing leaves the message to the platform's error handling; say why in the log.
      if (error instanceof ConfigError) console.error(`sluice: invalid configuration, e-mail not handled: ${error.message}`);
      throw error;
    }
    await handleEmail(emailModels, config, message, (text, outcome) => {
      const decision = { ...outcome.moderation, reasons: [outcome.reason] };
      loop.observe((work) => ctx.waitUntil(work), { source: "email", text, decision, reviewBelow: 0 });
    });
  },

  /** Cron trigger: deletes review items and shadow samples older than REVIEW_RETENTION_DAYS. */
  async scheduled(controller: { scheduledTime: number; cron: string }, env: WorkerEnv, ctx: WorkerExecutionContext): Promise<void> {
    void ctx;
    const config = reviewLoopConfigFromEnv(env);
    if (config.db === null) {
      console.log("sluice: retention: no REVIEWS database bound; nothing to delete");
      return;
    }
    const result = await purgeExpired(config.db, controller.scheduledTime || Date.now(), config.retentionDays);
    console.log(`sluice: retention (${config.retentionDays} days): deleted ${result.reviewItems} review items and ${result.shadowSamples} shadow samples older than ${result.cutoff}, ${result.hourlyRows} hourly rows`);
  },
};
