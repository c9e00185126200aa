// POST /v1/moderate: the policy decision for a submitted form. Reads JSON, URL-encoded or
// multipart bodies; the configured fields hold the text and are joined in order. Uncertain
// cases come back as "review", with a note that a person must decide them.

import type { Handler } from "hono";
import type { Model } from "../index.ts";
import { ApiError } from "./api-error.ts";
import type { AppConfig } from "./app-config.ts";
import { readBodyFields, type BodyFields } from "./read-request-body.ts";
import { deferWith } from "./reviews/review-loop.ts";

/** Carried by every /v1/moderate response: automated decisions in the review band need a person. */
export const HUMAN_REVIEW_NOTE =
  'This is an automated decision. Anything with action "review" is in the uncertain band and must be checked by a person before it is published, rejected or acted on.';

/**
 * The /v1/moderate handler.
 * @example app.post("/v1/moderate", moderateRoute(model, config))
 */
export function moderateRoute(model: Model, config: AppConfig): Handler {
  return async (c) => {
    const body = await readBodyFields(c, ["json", "form", "multipart"]);
    const text = textOfFields(body, config.moderateFields);
    const decision = model.decide(text, { reviewBelow: config.reviewBelow });
    config.reviewLoop?.observe(deferWith(() => c.executionCtx), { source: "moderate", text, decision, reviewBelow: config.reviewBelow });
    const { tokenCount, truncated } = model.score(text);
    return c.json({
      contentId: model.meta.contentId,
      action: decision.action,
      label: decision.label,
      score: decision.score,
      ...(decision.routeTo !== undefined ? { routeTo: decision.routeTo } : {}),
      reasons: decision.reasons,
      ...(decision.fault !== undefined ? { fault: decision.fault } : {}),
      humanReview: { required: decision.action === "review", note: HUMAN_REVIEW_NOTE },
      tokenCount,
      truncated,
    });
  };
}

/** The configured fields' texts joined by blank lines; 422 when none has text. */
function textOfFields(body: BodyFields, fields: readonly string[]): string {
  const parts: string[] = [];
  for (const field of fields) {
    const value = body[field];
    if (value === undefined || value === null) continue;
    if (typeof value === "string") {
      if (value.trim() !== "") parts.push(value);
      continue;
    }
    if (Array.isArray(value)) throw new ApiError("invalid-input", `field "${field}" was given more than once; expected one text`);
    if (typeof File !== "undefined" && value instanceof File) throw new ApiError("invalid-input", `field "${field}" is a file upload; expected text`);
    throw new ApiError("invalid-input", `field "${field}" must be a string, got ${typeof value}`);
  }
  if (parts.length === 0) {
    throw new ApiError("missing-text", `no text to moderate: expected a non-empty string in ${fields.length === 1 ? "field" : "one of the fields"} ${fields.map((f) => `"${f}"`).join(", ")}`);
  }
  return parts.join("\n\n");
}
