// The latency measurement the build and the setting searches use: what it times, not how fast
// it is (speed is never asserted in tests; `npm run bench` measures it).

import { describe, expect, it } from "vitest";
import { measureClassifyMicroseconds, measureLatency, textOfTokens } from "../../../compiler/evaluate/measure-latency.ts";
import { handMadeModel } from "./evaluate-hand-made-model.ts";

const SPEC = { labels: ["billing", "shipping"], words: { refund: 1, parcel: -1 }, outputWeights: [1, -1] };

describe("measureLatency", () => {
  it("cuts texts of exactly the asked token counts, cycling through a short pool", () => {
    const model = handMadeModel(SPEC);
    const pool = ["refund my order please", "where is my parcel", "the card was charged twice"];
    for (const tokens of [1, 20, 300]) {
      const text = textOfTokens(model, pool, tokens);
      expect(model.score(text).tokenCount).toBe(tokens);
    }
  });

  it("reports a positive time per call and the token and character counts of each text", () => {
    const model = handMadeModel(SPEC);
    const report = measureLatency(model, ["refund my order please, the card was charged twice"], { windowMs: 0.2, windows: 3 });
    expect(report.tokens20.tokens).toBe(20);
    expect(report.tokens300.tokens).toBe(300);
    expect(report.tokens300.characters).toBeGreaterThan(report.tokens20.characters);
    expect(report.tokens20.microseconds).toBeGreaterThan(0);
    expect(measureClassifyMicroseconds(model, "refund", { windowMs: 0.2, windows: 1 })).toBeGreaterThan(0);
  });
});
