// POST /v1/classify: labels and scores for one text ({ "text" }) or several ({ "texts" }),
// the policy decision when the model has a policy, and what the featurizer read.
// Options: "top" (labels per text; by default the model's own choice, as in the library and
// the CLI: the best label, or every label above its threshold for a sigmoid head) and
// "minScore" (leave out lower scores).

import type { Handler } from "hono";
import type { Decision, LabelScore, Model } from "../index.ts";
import { ApiError } from "./api-error.ts";
import type { AppConfig } from "./app-config.ts";
import { readBodyFields } from "./read-request-body.ts";
import { deferWith } from "./reviews/review-loop.ts";
import { integerOption, numberOption, requireText } from "./text-input.ts";

/** The classification of one text. */
export interface TextResult {
  labels: LabelScore[];
  decision?: Decision;
  tokenCount: number;
  /** True when the text had more tokens than the model reads; the rest was ignored. */
  truncated: boolean;
  knownFeatures: number;
}

/**
 * The /v1/classify handler.
 * @example app.post("/v1/classify", classifyRoute(model, config))
 */
export function classifyRoute(model: Model, config: AppConfig): Handler {
  const labelCount = model.labels.length;
  const hasPolicy = model.meta.policy !== null;
  return async (c) => {
    const body = await readBodyFields(c, ["json"]);
    const top = body.top === undefined || body.top === null ? undefined : integerOption(body.top, "top", 1, labelCount, labelCount);
    const minScore = numberOption(body.minScore, "minScore", 0, 1, 0);
    const classifyOne = (text: string): TextResult => {
      const labels = model.classify(text, { top, minScore });
      const { tokenCount, truncated, knownFeatures } = model.score(text);
      const result: TextResult = { labels, tokenCount, truncated, knownFeatures };
      if (hasPolicy) {
        const decision = model.decide(text, { reviewBelow: config.reviewBelow });
        result.decision = decision;
        config.reviewLoop?.observe(deferWith(() => c.executionCtx), { source: "classify", text, decision, reviewBelow: config.reviewBelow });
      }
      return result;
    };
    if (body.text !== undefined && body.texts !== undefined) throw new ApiError("invalid-input", 'give either "text" or "texts", not both');
    if (body.texts === undefined) {
      const text = requireText(body.text, "text");
      return c.json({ contentId: model.meta.contentId, ...classifyOne(text) });
    }
    if (!Array.isArray(body.texts)) throw new ApiError("invalid-input", `"texts" must be an array of strings, got ${typeof body.texts}`);
    if (body.texts.length === 0) throw new ApiError("missing-text", '"texts" is empty; expected at least one text');
    if (body.texts.length > config.maxTexts) throw new ApiError("too-many-texts", `"texts" has ${body.texts.length} texts; this server takes at most ${config.maxTexts} per call`);
    const texts = body.texts.map((value: unknown, i: number) => requireText(value, `texts[${i}]`));
    return c.json({ contentId: model.meta.contentId, results: texts.map(classifyOne) });
  };
}
