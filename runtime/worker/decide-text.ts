// The decision the HTTP API and the e-mail handler act on: the model's policy, plus the
// server's review floor, so a confident-looking "allow" on a weak score goes to a person.
// The floor only ever turns "allow" into "review"; it never blocks.

import type { Model } from "../model/model.ts";
import type { Decision } from "../model/policy.ts";

/**
 * `model.decide(text)`, with "allow" below `reviewBelow` turned into "review".
 * @example decideText(model, "hello?", 0.6) // { action: "review", label: "ok", score: 0.52, reasons: [...] }
 */
export function decideText(model: Model, text: string, reviewBelow: number): Decision {
  const decision = model.decide(text);
  if (decision.action === "allow" && decision.score < reviewBelow) {
    return {
      ...decision,
      action: "review",
      reasons: [...decision.reasons, `top label ${decision.label} ${decision.score.toFixed(3)} is below the review floor ${reviewBelow.toFixed(3)}`],
    };
  }
  return decision;
}
