// Explanations are exact: the model is linear up to the output nonlinearity, so each
// label's logit is its bias plus the sum of every feature's contribution.
import { describe, expect, it } from "vitest";
import { build } from "../../../compiler/build/build.ts";
import { defaultBuildSettings } from "../../../compiler/build/build-settings.ts";
import { loadModel, type Model } from "../../../runtime/index.ts";

const examples = [
  ...["refund my card payment", "charged twice on my invoice", "billing amount is wrong", "refund the extra charge"].map((text) => ({ text, labels: ["billing"] })),
  ...["where is my parcel", "tracking has not moved", "delivery is late", "parcel lost in transit"].map((text) => ({ text, labels: ["shipping"] })),
  ...["cannot log in to my account", "password reset mail missing", "account locked again", "login code never arrives"].map((text) => ({ text, labels: ["account"] })),
];

async function modelWith(overrides: Partial<ReturnType<typeof defaultBuildSettings>>): Promise<Model> {
  const settings = { ...defaultBuildSettings(), holdout: 0, epochs: 30, minDocs: 1, hashBits: 14, ...overrides };
  const { bytes } = await build({ examples, settings, buildTime: "2026-01-01T00:00:00.000Z" });
  return loadModel(bytes);
}

function logOdds(model: Model, text: string): number[] {
  // For softmax, log p_k − log p_0 = logit_k − logit_0: compare logits through score ratios.
  const scores = model.score(text).scores;
  return Array.from(scores, (p) => Math.log(p) - Math.log(scores[0]));
}

describe("model.explain", () => {
  for (const [name, overrides] of [
    ["int8 logit rows, TF-IDF weighting (the defaults)", {}],
    ["int8 logit rows, mean weighting", { weighting: "mean" as const }],
    ["float32 logit rows, TF-IDF weighting", { precision: "float32" as const, weighting: "tfidf" as const }],
    ["int8 hidden rows and output layer, mean weighting", { foldOutput: false, weighting: "mean" as const }],
    ["int8 hidden rows and output layer, TF-IDF weighting", { foldOutput: false }],
    ["float32 hidden rows and output layer, TF-IDF weighting", { precision: "float32" as const, weighting: "tfidf" as const, foldOutput: false }],
  ] as const) {
    it(`should split each logit exactly into bias plus feature contributions (${name})`, async () => {
      const model = await modelWith(overrides);
      expect(model.meta.rowSpace).toBe("foldOutput" in overrides ? "hidden" : "logits");
      const text = "refund the parcel charge, my account is locked";
      const explanation = model.explain(text, { top: 3, features: 10_000 });
      expect(explanation.labels).toHaveLength(3);
      for (const label of explanation.labels) {
        const total = label.bias + label.features.reduce((sum, f) => sum + f.contribution, 0);
        expect(total).toBeCloseTo(label.logit, 5);
      }
      // And the logits are the ones the scores come from: differences match log score ratios.
      const byLabel = new Map(explanation.labels.map((l) => [l.label, l.logit]));
      const ratios = logOdds(model, text);
      const first = model.labels[0];
      for (const [k, label] of model.labels.entries()) {
        if (byLabel.has(label) && byLabel.has(first)) expect((byLabel.get(label) as number) - (byLabel.get(first) as number)).toBeCloseTo(ratios[k], 4);
      }
    });
  }

  it("should name features as words, word pairs and character pieces, not hashes", async () => {
    const model = await modelWith({ charSpan: [3, 4] });
    const names = model.explain("refund my card", { features: 10_000 }).labels[0].features.map((f) => f.feature);
    expect(names).toContain("refund");
    expect(names).toContain("refund my");
    expect(names.some((n) => n.startsWith("·"))).toBe(true);
  });

  it("should give reasons with the driving features when a policy decides", async () => {
    const model = await modelWith({ holdout: 0.34, targetPrecision: { billing: 0.6 } });
    const decision = model.decide("refund my card payment please");
    expect(decision.reasons.join(" ")).toMatch(/billing|no rule fired/);
  });
});
