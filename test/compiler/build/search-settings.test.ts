// The build's own setting search (compiler/build/search-settings.ts) on the demo support topics
// (an invented scenario, demo-data/README.md): reproducible for a seed, never overriding what
// the user set, and bounded by its time budget. Times are checked only against generous
// bounds (the machine may be busy); speed itself is measured by the benchmarks.

import { beforeAll, describe, expect, it } from "vitest";
import { build } from "../../../compiler/build/build.ts";
import { defaultBuildSettings } from "../../../compiler/build/build-settings.ts";
import { autoSearchSeconds, dimsForLabels, probeSubset } from "../../../compiler/build/search-settings.ts";
import type { EncodedExamples } from "../../../compiler/train/encode.ts";
import { readExamples, type Example } from "../../../compiler/read/index.ts";

const SUPPORT_TOPICS = new URL("../../../demo-data/support-topics.csv", import.meta.url).pathname;
const BUILD_TIME = "2024-05-01T12:00:00.000Z";
let examples: Example[] = [];

beforeAll(async () => {
  for await (const example of readExamples(SUPPORT_TOPICS, { textFields: ["subject", "body"], labelField: "topic" })) examples.push(example);
  examples = examples.slice(0, 1200);
});

const settings = (overrides: Record<string, unknown> = {}) => ({ ...defaultBuildSettings(), hashBits: 16, searchTime: 600, ...overrides });

describe("the build's setting search", () => {
  it("chooses the same settings and writes the same bytes for the same seed", async () => {
    const first = await build({ examples, settings: settings(), explicit: ["hashBits", "searchTime"], buildTime: BUILD_TIME });
    const second = await build({ examples, settings: settings(), explicit: ["hashBits", "searchTime"], buildTime: BUILD_TIME });
    expect(first.report.search?.chosen).toEqual(second.report.search?.chosen);
    expect(first.report.search?.candidates.map((c) => c.macroF1)).toEqual(second.report.search?.candidates.map((c) => c.macroF1));
    expect(Buffer.compare(Buffer.from(first.bytes), Buffer.from(second.bytes))).toBe(0);
    // It compared more than its starting point and says why it kept what it kept.
    expect(first.report.search?.candidates.length).toBeGreaterThan(2);
    for (const candidate of first.report.search?.candidates ?? []) expect(candidate.verdict).not.toBe("");
  });

  it("tries no character n-gram encoding of all the data that the memory budget cannot hold", async () => {
    // Room for nothing: the search may still probe characters on its small subsample, but it
    // neither starts from them nor tries them on all the data.
    const { report } = await build({ examples, settings: settings(), explicit: ["hashBits", "searchTime"], buildTime: BUILD_TIME, searchMemoryRoomBytes: 0 });
    expect(report.search?.chosen.charSpan).toEqual([0, 0]);
    const full = report.search?.candidates.filter((c) => c.settings.charSpan[0] > 0 && !c.name.startsWith("probe")) ?? [];
    expect(full.length).toBeGreaterThan(0);
    for (const candidate of full) expect(candidate.verdict).toMatch(/^skipped: its encoding would add about \d+ MB, more than the 0 MB the memory budget leaves$/);
    // With room, the same search does try them.
    const roomy = await build({ examples, settings: settings(), explicit: ["hashBits", "searchTime"], buildTime: BUILD_TIME, searchMemoryRoomBytes: 2 ** 40 });
    expect(roomy.report.search?.candidates.some((c) => c.settings.charSpan[0] > 0 && !c.name.startsWith("probe") && !c.verdict.startsWith("skipped"))).toBe(true);
  });

  it("never changes a setting the user gave", async () => {
    // An explicit --dims also keeps hidden rows: the search tries no linear rows.
    const given = { epochs: 3, learningRate: 0.3, charSpan: [3, 5] as [number, number], weighting: "mean" as const, dims: 12, loss: "margin" as const };
    const { report } = await build({ examples, settings: settings(given), explicit: ["hashBits", "searchTime", "epochs", "learningRate", "charSpan", "weighting", "dims", "loss"], buildTime: BUILD_TIME });
    expect(report.search?.chosen).toMatchObject({ ...given, head: "softmax", linear: false });
    // Nothing was left to try but the starting point.
    expect(report.search?.candidates).toHaveLength(1);
    expect(report.search?.explicit.sort()).toEqual(["charSpan", "dims", "epochs", "learningRate", "loss", "weighting"]);
  });

  it("stops trying candidates once its time budget is spent", async () => {
    const { report } = await build({ examples, settings: settings({ searchTime: 0.5 }), explicit: ["hashBits", "searchTime"], buildTime: BUILD_TIME });
    const search = report.search;
    expect(search?.budgetSeconds).toBe(0.5);
    // The starting point always runs; after it nothing starts that the budget cannot pay for.
    // Generous margin (not a speed test): a few candidates' time plus 10 s, as a shared machine
    // can run a candidate several times slower than the estimate made from the first one.
    expect(search?.seconds ?? Infinity).toBeLessThanOrEqual(0.5 + 5 * (search?.candidates[0].seconds ?? 0) + 10);
    expect(search?.stoppedByBudget).toBe(true);
    expect(report.warnings.some((w) => /stopped at its time budget/.test(w))).toBe(true);
  });

  it("does not search when --search-time is 0", async () => {
    const { report } = await build({ examples, settings: settings({ searchTime: 0, epochs: 2 }), buildTime: BUILD_TIME });
    expect(report.search).toBeNull();
  });
});

describe("the character n-gram probe", () => {
  it("runs first on a subsample, both options, and says which one the search starts from", async () => {
    const { report } = await build({ examples, settings: settings(), explicit: ["hashBits", "searchTime"], buildTime: BUILD_TIME });
    const probes = report.search?.candidates.filter((c) => c.name.startsWith("probe:")) ?? [];
    expect(probes.map((c) => c.settings.charSpan[0] === 0)).toEqual([true, false]);
    expect(probes.filter((c) => /won/.test(c.verdict))).toHaveLength(1);
    expect(report.search?.candidates[2].name).toBe("defaults");
  });

  it("takes every k-th example: about the asked features, at least the minimum, never more than there are", () => {
    // 100 examples of 10 features each.
    const encoded = { count: 100, features: new Uint32Array(1000), offsets: new Uint32Array(101), tokenTotal: 500 } as unknown as EncodedExamples;
    expect(Array.from(probeSubset(encoded, 200, 5))).toEqual(Array.from({ length: 20 }, (_, i) => i * 5));
    expect(probeSubset(encoded, 10, 30)).toHaveLength(30);
    expect(probeSubset(encoded, 1e9, 5)).toHaveLength(100);
  });
});

describe("budget-aware dims", () => {
  it("tries narrower rows when the size budget prunes rows that store dims values", async () => {
    // Hidden rows (linear rows are as wide as the label count whatever dims is, and would win here).
    const { report } = await build({ examples, settings: settings({ maxBytes: 24_000, foldOutput: false, linear: false }), explicit: ["hashBits", "searchTime", "maxBytes", "foldOutput", "linear"], buildTime: BUILD_TIME });
    const narrower = report.search?.candidates.find((c) => c.name.startsWith("dims 12"));
    expect(narrower?.settings.dims).toBe(12);
    expect(narrower?.rowsKept).toBeLessThan(narrower?.rows ?? 0);
  });

  it("leaves dims alone when rows store logits (fewer labels than dims), whose width dims does not change", async () => {
    const { report } = await build({ examples, settings: settings({ maxBytes: 24_000 }), explicit: ["hashBits", "searchTime", "maxBytes"], buildTime: BUILD_TIME });
    expect(report.search?.candidates.some((c) => c.name.startsWith("dims"))).toBe(false);
  });
});

describe("search defaults", () => {
  it("sizes dims to the label count and scales the budget with the data", () => {
    expect(dimsForLabels(2)).toBe(24);
    expect(dimsForLabels(40)).toBe(32);
    expect(dimsForLabels(456)).toBe(48);
    expect(autoSearchSeconds(0)).toBe(15);
    expect(autoSearchSeconds(1_500_000)).toBe(30);
    expect(autoSearchSeconds(1e9)).toBe(120);
  });
});
