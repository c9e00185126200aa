// Explanations sum contributions by slot (one model row) and show features as a reader names
// them; a decision names its drivers from the same reading as explain does.
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { loadModel } from "../../../runtime/index.ts";

const contactForm = loadModel(new Uint8Array(readFileSync(new URL("../../../demo-data/models/worker-contact-form.sluice", import.meta.url))));

describe("explanations by slot", () => {
  it("show a word and a character n-gram that read alike as one feature with their summed contribution", () => {
    // "free" is a token and, inside "·free·", also a character 4-gram: two rows of the model,
    // one name to a reader. The whole logit still splits exactly into bias plus the features.
    expect(contactForm.meta.featurizer.charMax).toBeGreaterThanOrEqual(4);
    const label = contactForm.explain("free free free", { top: 1, features: 1000 }).labels[0];
    expect(label.features.filter((f) => f.feature === "free")).toHaveLength(1);
    const total = label.bias + label.features.reduce((sum, f) => sum + f.contribution, 0);
    expect(total).toBeCloseTo(label.logit, 9);
  });

  it("sum a feature's occurrences into one contribution", () => {
    const once = contactForm.explain("refund", { top: 1, features: 1000 }).labels[0];
    const thrice = contactForm.explain("refund refund refund", { top: 1, features: 1000 }).labels[0];
    // The same features, each three times: the mean of the rows is unchanged (weights cancel).
    expect(thrice.features.map((f) => f.feature).sort()).toEqual(once.features.map((f) => f.feature).sort());
    for (const f of once.features) expect(thrice.features.find((g) => g.feature === f.feature && Math.abs(g.contribution - f.contribution) < 1e-9)).toBeDefined();
  });

  it("give a decision the drivers explain gives for its label", () => {
    const text = "WIN A FREE PRIZE!!! claim your free money now";
    const decision = contactForm.decide(text);
    expect(decision.action).not.toBe("allow");
    const top = contactForm
      .explain(text, { top: contactForm.labels.length, features: 3 })
      .labels.find((l) => l.label === decision.label)!
      .features.filter((f) => f.contribution > 0)
      .map((f) => `"${f.feature}" (+${f.contribution.toFixed(2)})`)
      .join(", ");
    expect(decision.reasons).toContain(`pushed by ${top}`);
  });
});
