// Where an e-mail goes, decided from its text (pure: no message, no I/O).
//   block by the policy                    → refuse it at SMTP time
//   review by the policy                   → the fallback address (a person sorts it)
//   route by the policy (to an address)    → that address
//   top score below the label's threshold  → the fallback address
//   a route configured for the top label   → that route, else the fallback address
// A label's threshold is its policy rule's threshold when it has one, else the model's
// sigmoid threshold for it, else EMAIL_MIN_SCORE.

import type { Model } from "../model.ts";
import type { Action } from "../policy.ts";
import type { EmailConfig } from "./app-config.ts";
import { decideText } from "./decide-text.ts";

/** What to do with one message, and why. */
export interface EmailOutcome {
  kind: "forward" | "reject";
  /** Destination when forwarding. */
  to: string | null;
  /** True when `to` is the fallback address. */
  fallback: boolean;
  label: string;
  score: number;
  action: Action;
  tokenCount: number;
  reason: string;
}

/**
 * Routes a message's text under the model's policy and the e-mail config.
 * @example routeEmail(model, { routes: { billing: "billing@shop.example" }, fallback: "triage@shop.example", minScore: 0.5 }, "Refund please")
 */
export function routeEmail(model: Model, config: EmailConfig, text: string): EmailOutcome {
  const decision = decideText(model, text, 0);
  const [top] = model.classify(text, { top: 1 });
  const { tokenCount } = model.score(text);
  const base = { label: top.label, score: top.score, action: decision.action, tokenCount };
  const toFallback = (why: string): EmailOutcome =>
    config.fallback === null
      ? { ...base, kind: "reject", to: null, fallback: false, reason: `${why}, and no fallback address is configured` }
      : { ...base, kind: "forward", to: config.fallback, fallback: true, reason: why };
  if (decision.action === "block") {
    return { ...base, label: decision.label, score: decision.score, kind: "reject", to: null, fallback: false, reason: `refused by policy: classified as ${decision.label}` };
  }
  if (decision.action === "review") return toFallback(`the policy asks for review (${decision.label} ${decision.score.toFixed(3)})`);
  if (decision.action === "route" && decision.routeTo !== undefined && decision.routeTo.includes("@")) {
    return { ...base, label: decision.label, score: decision.score, kind: "forward", to: decision.routeTo, fallback: false, reason: `routed by policy for ${decision.label}` };
  }
  const threshold = thresholdFor(model, top.label, config.minScore);
  if (top.score < threshold) return toFallback(`top label ${top.label} ${top.score.toFixed(3)} is below its threshold ${threshold.toFixed(3)}`);
  const route = config.routes[top.label];
  if (route === undefined) return toFallback(`no route is configured for ${top.label}`);
  return { ...base, kind: "forward", to: route, fallback: false, reason: `routed as ${top.label}` };
}

function thresholdFor(model: Model, label: string, fallback: number): number {
  const rule = model.meta.policy?.rules.find((candidate) => candidate.label === label);
  if (rule !== undefined) return rule.threshold;
  const thresholds = model.meta.thresholds;
  if (thresholds !== null) return thresholds[model.labels.indexOf(label)];
  return fallback;
}
