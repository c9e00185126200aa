// Where an e-mail goes, decided from its text by two models (pure: no message, no I/O).
// Moderation first, on the whole text (subject and body):
//   block by the moderation policy          → refuse it at SMTP time
//   review by the moderation policy         → the fallback address (a person looks at it)
// then the routing model picks the topic:
//   top score below the topic's threshold   → the fallback address
//   a route configured for the top topic    → that route, else the fallback address
// A topic's threshold is the routing model's policy rule threshold for it when there is
// one, else its sigmoid threshold (sigmoid heads), else EMAIL_MIN_SCORE. Only moderation
// refuses mail and only EMAIL_ROUTES names destinations: other policy actions of either
// model ("route" rules, a routing model's "block") do not steer e-mail.

import type { Action, Model } from "../index.ts";
import type { EmailConfig } from "./app-config.ts";

/** The two models of the e-mail handler. */
export interface EmailModels {
  /** Decides block / review / allow (the contact-form model in the demo). */
  moderation: Model;
  /** Picks the topic, and with it the team address (the support-topics model in the demo). */
  routing: Model;
}

/** What to do with one message, and why. */
export interface EmailOutcome {
  kind: "forward" | "reject";
  /** Destination when forwarding. */
  to: string | null;
  /** True when `to` is the fallback address. */
  fallback: boolean;
  /** The moderation decision (action "review" with label "" when the text could not be read). */
  moderation: { action: Action; label: string; score: number };
  /** The routing model's top topic; null when the message never reached routing. */
  topic: { label: string; score: number } | null;
  /** Tokens the models read (both share the featurizer's tokenizer). */
  tokenCount: number;
  reason: string;
}

/**
 * Decides a message's fate from its text.
 * @example routeEmail({ moderation, routing }, { routes: { billing: "billing@shop.example" }, fallback: "triage@shop.example", minScore: 0.7 }, "Refund\n\nI was charged twice")
 */
export function routeEmail(models: EmailModels, config: EmailConfig, text: string): EmailOutcome {
  // The policy alone (no extra review floor): its own review floor is compiled in.
  const decision = models.moderation.decide(text);
  const moderation = { action: decision.action, label: decision.label, score: decision.score };
  const base = { moderation, topic: null, tokenCount: models.moderation.score(text).tokenCount };
  if (decision.action === "block") {
    return { ...base, kind: "reject", to: null, fallback: false, reason: `refused by the moderation policy: classified as ${decision.label} (${decision.score.toFixed(3)})` };
  }
  if (decision.action === "review") return toFallback(config, base, `the moderation policy asks for review (${decision.label} ${decision.score.toFixed(3)})`);

  const [top] = models.routing.classify(text, { top: 1 });
  const routed = { ...base, topic: { label: top.label, score: top.score } };
  const threshold = thresholdFor(models.routing, top.label, config.minScore);
  // Written as "not at least" so a NaN score (which fails every comparison) goes to a person.
  if (!(top.score >= threshold)) return toFallback(config, routed, `top topic ${top.label} ${top.score.toFixed(3)} is below its threshold ${threshold.toFixed(3)}`);
  const route = config.routes[top.label];
  if (route === undefined) return toFallback(config, routed, `no route is configured for ${top.label}`);
  return { ...routed, kind: "forward", to: route, fallback: false, reason: `routed as ${top.label}` };
}

/**
 * The outcome for a message that goes to a person: the fallback address, or a refusal
 * when none is configured (refused mail bounces to the sender; dropped mail is lost).
 * @example toFallback(config, { moderation, topic: null, tokenCount: 0 }, "the message has no readable text")
 */
export function toFallback(config: EmailConfig, base: Pick<EmailOutcome, "moderation" | "topic" | "tokenCount">, why: string): EmailOutcome {
  if (config.fallback === null) return { ...base, kind: "reject", to: null, fallback: false, reason: `${why}, and no fallback address is configured` };
  return { ...base, kind: "forward", to: config.fallback, fallback: true, reason: why };
}

function thresholdFor(model: Model, label: string, fallback: number): number {
  const rule = model.meta.policy?.rules.find((candidate) => candidate.label === label);
  if (rule !== undefined) return rule.threshold;
  const thresholds = model.meta.thresholds;
  if (thresholds !== null) return thresholds[model.labels.indexOf(label)];
  return fallback;
}
