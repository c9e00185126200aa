// `sluice compare` as users run it: `node bin/sluice.js compare` in a child process, on part of
// the demo contact-form data (an invented scenario, demo-data/README.md). Two models of the same
// labels are built in beforeAll with different --epochs/--dims, plus one with other labels.

import { mkdtemp, readFile, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { REPO, sluice, type Run } from "./run-sluice.ts";
import { mcnemarTest } from "../../compiler/metrics/index.ts";




let directory = "";
let data = "";
let good = "";
let weak = "";
let otherLabels = "";
let dataLines: { message: string; label: string }[] = [];

beforeAll(async () => {
  directory = await mkdtemp(join(tmpdir(), "sluice-compare-"));
  const contactForm = (await readFile(join(REPO, "demo-data/contact-form.jsonl"), "utf8")).split("\n").filter(Boolean).slice(0, 1500);
  data = join(directory, "contact.jsonl");
  await writeFile(data, `${contactForm.join("\n")}\n`);
  dataLines = contactForm.map((line) => JSON.parse(line) as { message: string; label: string });
  // A tiny invented inbox with other labels.
  const topicsPath = join(directory, "topics.jsonl");
  const topics = Array.from({ length: 40 }, (_, i) =>
    JSON.stringify(i % 2 === 0 ? { message: `I was charged twice for order ${i}`, label: "billing" } : { message: `parcel ${i} has not arrived`, label: "shipping" }),
  );
  await writeFile(topicsPath, `${topics.join("\n")}\n`);
  good = join(directory, "good.sluice");
  weak = join(directory, "weak.sluice");
  otherLabels = join(directory, "inbox.sluice");
  const common = ["--hash-bits", "16", "--quiet", "--force"];
  const builds = await Promise.all([
    sluice(["build", data, "--text-field", "message", "--epochs", "6", "--dims", "16", "--out", good, ...common]),
    sluice(["build", data, "--text-field", "message", "--epochs", "1", "--dims", "2", "--out", weak, ...common]),
    sluice(["build", topicsPath, "--text-field", "message", "--epochs", "1", "--min-docs", "1", "--out", otherLabels, ...common]),
  ]);
  for (const run of builds) if (run.code !== 0) throw new Error(`build failed: ${run.stderr}`);
});

afterAll(async () => {
  if (directory) await rm(directory, { recursive: true, force: true });
});

async function compareJson(...args: string[]): Promise<{ run: Run; result: Record<string, any> }> {
  const run = await sluice(["compare", ...args, "--json", "--quiet"]);
  return { run, result: run.stdout ? (JSON.parse(run.stdout) as Record<string, any>) : {} };
}

describe("sluice compare", () => {
  it("prints both models' metrics with deltas, McNemar's test and the flipped examples", async () => {
    const run = await sluice(["compare", good, weak, data, "--quiet"]);
    expect(run.code).toBe(0);
    expect(run.stdout).toMatch(/accuracy\s+\d\.\d{3}\s+\d\.\d{3}\s+[-+]\d\.\d{3}/);
    expect(run.stdout).toMatch(/F1 spam/);
    expect(run.stdout).toMatch(/McNemar's test: b = \d+ \(live right, candidate wrong\), c = \d+ \(live wrong, candidate right\)/);
    expect(run.stdout).toMatch(/broken \(live right → candidate wrong\): \d+/);
    expect(run.stdout).toMatch(/line \d+: gold \w+; live \w+ \d\.\d{3} → candidate \w+ \d\.\d{3}/);
  });

  it("counts b and c as the classify command's top labels disagree with the gold labels", async () => {
    // Independent path: `sluice classify --json` per model, gold from the data file (line n + 1 = example n).
    const { result } = await compareJson(good, weak, data);
    const classify = async (model: string) => (await sluice(["classify", model, data, "--json", "--quiet"])).stdout.trim().split("\n").map((line) => (JSON.parse(line) as { label: string }).label);
    const [liveLabels, candidateLabels] = await Promise.all([classify(good), classify(weak)]);
    let b = 0;
    let c = 0;
    dataLines.forEach((example, i) => {
      const liveRight = liveLabels[i] === example.label;
      const candidateRight = candidateLabels[i] === example.label;
      if (liveRight && !candidateRight) b++;
      if (!liveRight && candidateRight) c++;
    });
    expect([result.mcnemar.b, result.mcnemar.c]).toEqual([b, c]);
    expect(result.flips.broken.count).toBe(b);
    expect(result.flips.fixed.count).toBe(c);
    // p-value from the metrics module's McNemar test (checked against R and contingencytables).
    expect(result.mcnemar.pValue).toBe(mcnemarTest(b, c).pValue);
  });

  it("lists at most 50 flipped examples of each kind in --json, with data-file lines", async () => {
    const { result } = await compareJson(good, weak, data);
    expect(result.flips.broken.examples.length).toBe(Math.min(50, result.flips.broken.count));
    const first = result.flips.broken.examples[0];
    // JSONL line n holds example n (one record per line).
    expect(dataLines[first.line - 1].message).toBe(first.text);
    expect(first.gold).toBe(dataLines[first.line - 1].label);
  });

  it("exits 3 with --require-better when the candidate is not significantly better", async () => {
    // A model against itself: b = c = 0, p = 1.
    const { run, result } = await compareJson(good, good, data, "--require-better");
    expect(result.mcnemar).toMatchObject({ b: 0, c: 0, pValue: 1 });
    expect(run.code).toBe(3);
  });

  it("exits 4 when the candidate's accuracy drops by more than --max-regression", async () => {
    const { run, result } = await compareJson(good, weak, data, "--max-regression", "0");
    expect(result.delta.accuracy).toBeLessThan(0); // the precondition: the weak model is worse
    expect(run.code).toBe(4);
  });

  it("exits 0 when the drop stays within --max-regression", async () => {
    const run = await sluice(["compare", good, weak, data, "--max-regression", "1", "--metric", "macro-f1", "--quiet"]);
    expect(run.code).toBe(0);
    expect(run.stdout).toMatch(/--max-regression 1: macro-F1 -\d\.\d{3} is within the limit: pass/);
  });

  it("exits 1 and names the difference when the models have different label sets", async () => {
    const run = await sluice(["compare", good, otherLabels, data, "--quiet"]);
    expect(run.code).toBe(1);
    expect(run.stderr).toMatch(/different label sets: only the live model has "abusive", "ok", "spam"; only the candidate has "billing", "shipping"/);
  });

  it("documents the exit codes in --help", async () => {
    const run = await sluice(["compare", "--help"]);
    expect(run.code).toBe(0);
    expect(run.stdout).toMatch(/exit codes:/);
    expect(run.stdout).toMatch(/3 {2}--require-better: the candidate is not significantly better/);
    expect(run.stdout).toMatch(/4 {2}--max-regression/);
  });

  it("exits 2 when a model or the data is missing from the command line", async () => {
    const run = await sluice(["compare", good, weak]);
    expect(run.code).toBe(2);
    expect(run.stderr).toMatch(/compare needs two models and a data file/);
  });

  it("exits 2 for a --metric it does not know", async () => {
    const run = await sluice(["compare", good, weak, data, "--metric", "recall"]);
    expect(run.code).toBe(2);
    expect(run.stderr).toMatch(/--metric: expected accuracy or macro-f1, got "recall"/);
  });
});
