// A decision fails closed: a non-finite score or an error while deciding gives "review"
// with a fault code, never "allow". The loader refuses files that could produce either, so
// these tests build broken models past it (a Model made from edited parts), the way a bug in
// a later change would, and check the last line of defence on its own.
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { decideFromScores, DECISION_FAULT_CODES, loadModel, Model } from "../../../runtime/index.ts";

const golden = loadModel(new Uint8Array(readFileSync(new URL("../../fixtures/golden/tiny-v2.sluice", import.meta.url))));
const BLOCK_SPAM = { rules: [{ label: "spam", action: "block" as const, threshold: 0.98, reviewFrom: 0.6 }], reviewBelow: 0.5 };

/** The golden model with one header field changed, built without the loader's checks. */
function brokenModel(change: Record<string, unknown>): Model {
  return new Model({ ...golden.parts, header: { ...golden.parts.header, ...change } });
}

describe("decideFromScores", () => {
  it("should review, not allow, when a score is NaN", () => {
    // NaN compares false with everything (ECMA-262, IsLessThan returns undefined for NaN),
    // so "score >= threshold" and "score < floor" are both false: without a check it allows.
    const decision = decideFromScores(BLOCK_SPAM, ["ok", "spam"], [NaN, NaN]);
    expect(decision.action).toBe("review");
    expect(decision.fault?.code).toBe("non-finite-score");
  });

  it("should review when a score is infinite", () => {
    expect(decideFromScores(null, ["ok", "spam"], [Infinity, 0]).fault?.code).toBe("non-finite-score");
  });

  it("should decide as before when the scores are finite", () => {
    const decision = decideFromScores(BLOCK_SPAM, ["ok", "spam"], [0.01, 0.99]);
    expect(decision.action).toBe("block");
    expect(decision.fault).toBeUndefined();
  });
});

describe("model.decide", () => {
  it("should review a text whose scores are NaN because of a broken temperature", () => {
    const model = brokenModel({ calibration: { temperature: 5e-324 } });
    expect(Number.isNaN(model.score("refund my parcel").scores[0])).toBe(true); // the fault is real
    const decision = model.decide("refund my parcel");
    expect(decision.action).toBe("review");
    expect(decision.fault?.code).toBe("non-finite-score");
    expect(decision.reasons.join(" ")).toContain("failed closed");
  });

  it("should review, with a decision-error fault, when scoring throws", () => {
    const model = brokenModel({});
    (model as unknown as { featurizer: unknown }).featurizer = {
      featurize() {
        throw new RangeError("Maximum call stack size exceeded");
      },
    };
    const decision = model.decide("WIN A FREE PRIZE");
    expect(decision).toMatchObject({ action: "review", fault: { code: "decision-error" } });
    expect(decision.fault?.message).toContain("RangeError");
  });

  it("should review when the policy is malformed past the loader", () => {
    const model = brokenModel({ policy: { rules: 5 } });
    expect(model.decide("hello").fault?.code).toBe("decision-error");
  });

  it("should still throw for a text that is not a string (the caller's mistake, not a fault)", () => {
    expect(() => golden.decide(42 as unknown as string)).toThrow(/expected the text as a string/);
  });

  it("should document every fault code", () => {
    expect(Object.keys(DECISION_FAULT_CODES).sort()).toEqual(["decision-error", "non-finite-score"]);
  });
});
