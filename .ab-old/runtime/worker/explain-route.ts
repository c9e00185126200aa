// POST /v1/explain: for the top labels of a text, the features with the largest exact
// contributions to each label's logit (what the playground page shows), plus the decision.
// Options: "top" (labels) and "features" (per label, at most 50), with the defaults every
// surface shares (runtime/surface-defaults.ts).

import type { Handler } from "hono";
import { SURFACE_DEFAULTS, type Model } from "../index.ts";
import type { AppConfig } from "./app-config.ts";
import { readBodyFields } from "./read-request-body.ts";
import { integerOption, requireText } from "./text-input.ts";

/**
 * The /v1/explain handler.
 * @example app.post("/v1/explain", explainRoute(model, config))
 */
export function explainRoute(model: Model, config: AppConfig): Handler {
  const labelCount = model.labels.length;
  return async (c) => {
    const body = await readBodyFields(c, ["json"]);
    const text = requireText(body.text, "text");
    const top = integerOption(body.top, "top", 1, labelCount, Math.min(SURFACE_DEFAULTS.explainTop, labelCount));
    const features = integerOption(body.features, "features", 1, 50, SURFACE_DEFAULTS.explainFeatures);
    const explanation = model.explain(text, { top, features });
    const decision = model.decide(text, { reviewBelow: config.reviewBelow });
    return c.json({ contentId: model.meta.contentId, ...explanation, decision });
  };
}
