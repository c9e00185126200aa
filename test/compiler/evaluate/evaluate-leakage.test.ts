import { describe, expect, it } from "vitest";
import { trainingFingerprint } from "../../../compiler/read/text-fingerprints.ts";
import { checkLeakage, leakageMessage } from "../../../compiler/evaluate/evaluate-leakage.ts";
import { handMadeModel } from "./evaluate-hand-made-model.ts";

// 1000 invented training texts; the fingerprint travels inside the model file's header
// (MessagePack bin) and comes back through the runtime loader, as `eval` sees it.
const TRAIN = Array.from({ length: 1000 }, (_, i) => `ticket ${i}: the blender from order ${i * 7} stopped working`);

function modelWith(provenance: Record<string, unknown>) {
  return handMadeModel({ labels: ["ok", "spam"], words: { quandrel: 1 }, outputWeights: [0, 1], provenance });
}

describe("checkLeakage", () => {
  const model = modelWith({ trainFingerprint: trainingFingerprint(TRAIN) });
  const fresh = Array.from({ length: 200 }, (_, i) => ({ text: `my kettle ${i} arrived with a cracked lid`, labels: ["ok"], line: i + 2 }));

  it("counts the evaluated examples the model was trained on, with their lines", () => {
    // Ten trained-on texts, re-spaced and upper-cased, placed among 200 fresh ones. A Bloom filter
    // never misses a member (Bloom 1970), so all ten count, plus at most a few false positives.
    const leaked = TRAIN.slice(0, 10).map((text, i) => ({ text: `  ${text.toUpperCase()} `, labels: ["ok"], line: 500 + i }));
    const report = checkLeakage(model, [...leaked, ...fresh]);
    if (!report.checked) throw new Error(report.reason);
    expect(report.count).toBeGreaterThanOrEqual(10);
    expect(report.count).toBeLessThan(10 + 15); // 200 × ~2% ≈ 4 expected false positives
    expect(report.samples.map((s) => s.line)).toEqual([500, 501, 502]);
    expect(report.trainingTexts).toBe(1000);
  });

  it("reports the filter's false-positive rate (1 − e^(−kn/m))^k", () => {
    // k = 5, n = 1000, m = 8000 bits → (1 − e^(−0.625))^5 ≈ 0.0217 (Bloom 1970 estimate).
    const report = checkLeakage(model, fresh);
    expect(report.checked && report.falsePositiveRate).toBeCloseTo(0.0217, 4);
  });

  it("estimates the count from the hash sample of a capped filter", () => {
    // A 100-byte cap holds a 10% hash sample of the 1000 training texts. Evaluating all of them:
    // every covered text is found (no false negatives), and hits / 0.1 estimates 1000.
    const capped = modelWith({ trainFingerprint: trainingFingerprint(TRAIN, 100) });
    const report = checkLeakage(capped, TRAIN.map((text) => ({ text, labels: ["ok"] })));
    if (!report.checked) throw new Error(report.reason);
    expect(report.sampledShare).toBeCloseTo(0.1, 6);
    expect(report.matched).toBe(report.covered);
    expect(report.count).toBe(Math.round(report.matched / report.sampledShare));
    expect(report.count).toBeGreaterThan(700); // binomial sampling: sd of the estimate ≈ 95
    expect(report.count).toBeLessThan(1300);
  });

  it("numbers the samples by position when the examples carry no line", () => {
    const report = checkLeakage(model, [{ text: "fresh text", labels: ["ok"] }, { text: TRAIN[5], labels: ["ok"] }]);
    expect(report.checked && report.samples[0].line).toBe(2);
  });

  it("says why it did not check a model without a fingerprint", () => {
    expect(checkLeakage(modelWith({}), fresh)).toEqual({ checked: false, reason: "the model carries no training fingerprint; it was built without one" });
  });

  it("says what is wrong with a fingerprint it cannot read", () => {
    const report = checkLeakage(modelWith({ trainFingerprint: "not bytes" }), fresh);
    expect(report).toEqual({ checked: false, reason: "provenance.trainFingerprint: expected binary data, got string" });
  });
});

describe("leakageMessage", () => {
  it("gives the approximate count, the false-positive rate and samples with lines", () => {
    const message = leakageMessage({ checked: true, method: "bloom-filter", count: 12, matched: 12, examples: 300, covered: 300, sampledShare: 1, falsePositiveRate: 0.0217, trainingTexts: 1000, samples: [{ line: 7, text: "refund please" }] });
    expect(message).toBe('12 of 300 examples (≈, Bloom filter with ~2% false positives) also appear in the training data, so these metrics are optimistic; e.g. line 7 "refund please"');
  });

  it("says the count is estimated from a hash sample when the filter holds one", () => {
    const message = leakageMessage({ checked: true, method: "bloom-filter", count: 80, matched: 10, examples: 300, covered: 37, sampledShare: 0.125, falsePositiveRate: 0.0217, trainingTexts: 262000, samples: [{ line: 7, text: "refund please" }] });
    expect(message).toMatch(/^80 of 300 examples \(estimated from the 37 examples in a 13% hash sample, Bloom filter with ~2% false positives\)/);
  });

  it("stays silent when nothing matched", () => {
    expect(leakageMessage({ checked: true, method: "bloom-filter", count: 0, matched: 0, examples: 300, covered: 300, sampledShare: 1, falsePositiveRate: 0.02, trainingTexts: 1000, samples: [] })).toBeNull();
  });
});
