// The build's setting search by default does not pick settings more than 2× slower than words
// only (serving work, counted) unless they gain at least one point of validation macro-F1 (a
// rule of this project, stated in README); --max-us is a hard limit on the compiled model's
// measured time. Times are measured, never asserted: these checks pin the rule, the count and
// that a time is reported.
import { describe, expect, it } from "vitest";
import { build } from "../../../compiler/build/build.ts";
import { latencyProblem, servingWork, SLOW_CANDIDATE_GAIN, SLOWDOWN_LIMIT } from "../../../compiler/build/candidate-latency.ts";
import { defaultBuildSettings } from "../../../compiler/build/build-settings.ts";
import { readExamples, type Example } from "../../../compiler/read/index.ts";

describe("the search's latency rule", () => {
  const words = { microseconds: 30, workPerText: 1000, macroF1: 0.9 };

  it("should let a candidate up to twice as slow as words only through without a gain", () => {
    expect(SLOWDOWN_LIMIT).toBe(2);
    expect(latencyProblem({ microseconds: 99, workPerText: 2000, macroF1: 0.901 }, words, 0)).toBeNull();
  });

  it("should refuse a candidate more than twice as slow unless it gains at least one point of macro-F1", () => {
    expect(SLOW_CANDIDATE_GAIN).toBe(0.01);
    expect(latencyProblem({ microseconds: 31, workPerText: 2040, macroF1: 0.905 }, words, 0)).toMatch(/^2\.0× the serving work of words only for less than 1 point/);
    expect(latencyProblem({ microseconds: 31, workPerText: 4000, macroF1: 0.9101 }, words, 0)).toBeNull();
  });

  it("should refuse any candidate over --max-us, however accurate", () => {
    expect(latencyProblem({ microseconds: 40, workPerText: 1000, macroF1: 0.99 }, words, 35)).toBe("40.0 µs for 300 tokens is above --max-us 35");
    expect(latencyProblem(words, words, 35)).toBeNull();
  });

  it("should not compare words only with itself, nor with an unknown amount of work", () => {
    expect(latencyProblem(words, words, 0)).toBeNull();
    expect(latencyProblem({ microseconds: 90, workPerText: 9000, macroF1: 0.9 }, null, 0)).toBeNull();
    expect(latencyProblem({ microseconds: 90, workPerText: 9000, macroF1: 0.9 }, { microseconds: 30, workPerText: NaN, macroF1: 0.9 }, 0)).toBeNull();
  });
});

describe("serving work", () => {
  const validation = [{ text: "ab ab", labels: ["x"] }, { text: "ab cd", labels: ["y"] }];
  const base = { ...defaultBuildSettings(), wordSpan: 1 };

  it("should count one row per word for words only", () => {
    // 2 words per text; 2 labels < 24 dims, so logit rows 2 wide and no output layer.
    expect(servingWork({ ...base, charSpan: [0, 0] }, "softmax", 2, validation)).toBe(2 * 2);
  });

  it("should count a word's character n-grams only the first time the word is met", () => {
    // Worked by hand: "·ab·" has the 2-3 pieces ·a ·ab ab ab· b· (an edge alone is no piece), so a
    // new word reads 1 + 5 rows and adds 1 cached sum; "ab" is new once, "cd" once:
    // (1 + 6) + 1 + 1 + (1 + 6) = 16 over 2 texts, 2 wide.
    expect(servingWork({ ...base, charSpan: [2, 3] }, "softmax", 2, validation)).toBe(8 * 2);
  });

  it("should add the output layer for hidden rows", () => {
    expect(servingWork({ ...base, charSpan: [0, 0], foldOutput: false }, "softmax", 2, validation)).toBe(2 * 24 + 2 * 24);
  });
});

describe("the search's candidate times", () => {
  it("should report a positive classify time of the compiled model for every candidate that ran, and its serving work", async () => {
    const examples: Example[] = [];
    for await (const e of readExamples("demo-data/support-topics.csv", { textFields: ["subject", "body"], labelField: "topic" })) if (examples.push(e) >= 1200) break;
    const { report } = await build({ examples, settings: { ...defaultBuildSettings(), hashBits: 16, searchTime: 600 }, explicit: ["hashBits", "searchTime"], buildTime: "2024-05-01T12:00:00.000Z" });
    const ran = (report.search?.candidates ?? []).filter((c) => !c.verdict.startsWith("skipped"));
    for (const candidate of ran) expect(candidate.workPerText).toBeGreaterThan(0);
    // Probes (a few epochs on a subsample) are not what would ship, so they are not timed.
    const timed = ran.filter((c) => !c.name.startsWith("probe:"));
    expect(timed.some((c) => c.settings.charSpan[0] > 0)).toBe(true); // a character n-gram candidate was timed too
    for (const candidate of timed) expect(candidate.microseconds).toBeGreaterThan(0);
    for (const candidate of ran.filter((c) => c.name.startsWith("probe:"))) expect(candidate.microseconds).toBeNaN();
  }, 300_000);
});
