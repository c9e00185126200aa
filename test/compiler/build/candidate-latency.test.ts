// The build's setting search times each candidate compiled as shipped, and by default does not
// pick settings more than 2× slower than words only unless they gain at least one point of
// validation macro-F1 (a rule of this project, stated in README); --max-us is a hard limit.
// Times are measured, never asserted: these checks pin the rule and that a time is reported.
import { describe, expect, it } from "vitest";
import { build } from "../../../compiler/build/build.ts";
import { latencyProblem, SLOW_CANDIDATE_GAIN, SLOWDOWN_LIMIT } from "../../../compiler/build/candidate-latency.ts";
import { defaultBuildSettings } from "../../../compiler/build/build-settings.ts";
import { readExamples, type Example } from "../../../compiler/read/index.ts";

describe("the search's latency rule", () => {
  const words = { microseconds: 30, macroF1: 0.9 };

  it("should let a candidate up to twice as slow as words only through without a gain", () => {
    expect(SLOWDOWN_LIMIT).toBe(2);
    expect(latencyProblem({ microseconds: 60, macroF1: 0.901 }, words, 0)).toBeNull();
  });

  it("should refuse a candidate more than twice as slow unless it gains at least one point of macro-F1", () => {
    expect(SLOW_CANDIDATE_GAIN).toBe(0.01);
    expect(latencyProblem({ microseconds: 61, macroF1: 0.905 }, words, 0)).toMatch(/^2\.0× slower than words only for less than 1 point/);
    expect(latencyProblem({ microseconds: 120, macroF1: 0.9101 }, words, 0)).toBeNull();
  });

  it("should refuse any candidate over --max-us, however accurate", () => {
    expect(latencyProblem({ microseconds: 40, macroF1: 0.99 }, words, 35)).toBe("40.0 µs for 300 tokens is above --max-us 35");
    expect(latencyProblem(words, words, 35)).toBeNull();
  });

  it("should not compare words only with itself, nor with an unknown time", () => {
    expect(latencyProblem(words, words, 0)).toBeNull();
    expect(latencyProblem({ microseconds: 90, macroF1: 0.9 }, null, 0)).toBeNull();
    expect(latencyProblem({ microseconds: 90, macroF1: 0.9 }, { microseconds: NaN, macroF1: 0.9 }, 0)).toBeNull();
  });
});

describe("the search's candidate times", () => {
  it("should report a positive classify time of the compiled model for every candidate that ran", async () => {
    const examples: Example[] = [];
    for await (const e of readExamples("demo-data/support-topics.csv", { textFields: ["subject", "body"], labelField: "topic" })) if (examples.push(e) >= 1200) break;
    const { report } = await build({ examples, settings: { ...defaultBuildSettings(), hashBits: 16, searchTime: 600 }, explicit: ["hashBits", "searchTime"], buildTime: "2024-05-01T12:00:00.000Z" });
    const ran = (report.search?.candidates ?? []).filter((c) => !c.verdict.startsWith("skipped"));
    expect(ran.some((c) => c.settings.charSpan[0] > 0)).toBe(true); // a character n-gram candidate was timed too
    for (const candidate of ran) expect(candidate.microseconds).toBeGreaterThan(0);
  }, 300_000);
});
