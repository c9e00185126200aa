// Building from a file through shards on disk (data larger than memory): the same model
// quality as in memory, a hash-chosen validation split, and no shard left behind.
import { mkdirSync, mkdtempSync, readdirSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { buildFromFile } from "../../../compiler/build/build-from-file.ts";
import { defaultBuildSettings } from "../../../compiler/build/build-settings.ts";
import { evaluateModel } from "../../../compiler/evaluate/evaluate.ts";
import { readExamples } from "../../../compiler/read/index.ts";
import { loadModel } from "../../../runtime/index.ts";

const temporary = mkdtempSync(join(tmpdir(), "sluice-on-disk-test-"));
afterAll(() => rmSync(temporary, { recursive: true, force: true }));

describe("buildFromFile", () => {
  it("should train from shards on disk as well as in memory, and remove the shards", async () => {
    const shards = join(temporary, "shards");
    rmSync(shards, { recursive: true, force: true });
    mkdirSync(shards);
    const settings = { ...defaultBuildSettings(), epochs: 5 };
    const { bytes, report } = await buildFromFile({
      path: "demo-data/contact-form.jsonl",
      readOptions: { textFields: ["message"] },
      settings,
      buildTime: "2026-01-01T00:00:00.000Z",
      tempDirectory: shards,
    });
    // About 10% held out by hash (binomial spread on 5,000 examples: 10% ± 1.3% at 3 sigma).
    expect(report.validationExamples / 5000).toBeGreaterThan(0.087);
    expect(report.validationExamples / 5000).toBeLessThan(0.113);
    expect(report.trainExamples + report.validationExamples).toBe(5000);
    expect(report.compiled.accuracy).toBeGreaterThan(0.95);
    expect(readdirSync(shards)).toEqual([]);
    const all = [];
    for await (const e of readExamples("demo-data/contact-form.jsonl", { textFields: ["message"] })) all.push(e);
    expect(evaluateModel(loadModel(bytes), all).accuracy).toBeGreaterThan(0.95);
  }, 120_000);

  it("should still learn when the file is sorted by label (shards and their contents are shuffled)", async () => {
    const sorted = [];
    for await (const e of readExamples("demo-data/support-topics.csv", { textFields: ["subject", "body"], labelField: "topic" })) sorted.push(e);
    sorted.sort((a, b) => (a.labels[0] < b.labels[0] ? -1 : a.labels[0] > b.labels[0] ? 1 : 0));
    const path = join(temporary, "sorted.jsonl");
    writeFileSync(path, sorted.map((e) => JSON.stringify({ text: e.text, label: e.labels[0] })).join("\n") + "\n");
    const { report } = await buildFromFile({ path, readOptions: {}, settings: { ...defaultBuildSettings(), epochs: 5 }, buildTime: "2026-01-01T00:00:00.000Z" });
    // Trained in file order, SGD would end up predicting the last label; shuffled, it matches in-memory quality (~0.96).
    expect(report.compiled.accuracy).toBeGreaterThan(0.93);
  }, 120_000);
});
