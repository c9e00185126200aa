// `sluice eval` as users run it: `node bin/sluice.js eval` in a child process. A softmax model
// with a policy is built from part of the demo contact-form data (an invented scenario,
// demo-data/README.md), a sigmoid model from a tiny invented inbox, and a hand-made model
// carries a training fingerprint for the leakage warning.

import { mkdtemp, readFile, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { REPO, sluice } from "./run-sluice.ts";
import { trainingFingerprint } from "../../compiler/read/text-fingerprints.ts";
import { handMadeModelBytes } from "../compiler/evaluate/evaluate-hand-made-model.ts";




let directory = "";
let contact = "";
let policyModel = "";
let inbox = "";
let sigmoidModel = "";
let contactRecords: { message: string; label: string }[] = [];

const INBOX_PHRASES: Record<string, string[]> = {
  billing: ["I was charged twice", "the invoice is wrong", "refund the duplicate payment"],
  shipping: ["the parcel has not arrived", "tracking says delivered", "the courier lost the box"],
  urgent: ["please answer today", "this is urgent", "fix this immediately"],
};

beforeAll(async () => {
  directory = await mkdtemp(join(tmpdir(), "sluice-eval-"));
  const lines = (await readFile(join(REPO, "demo-data/contact-form.jsonl"), "utf8")).split("\n").filter(Boolean).slice(0, 2000);
  contact = join(directory, "contact.jsonl");
  await writeFile(contact, `${lines.join("\n")}\n`);
  contactRecords = lines.map((line) => JSON.parse(line) as { message: string; label: string });
  const inboxLines: string[] = [];
  for (const labels of [["billing"], ["shipping"], ["billing", "urgent"], ["shipping", "urgent"]]) {
    for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) inboxLines.push(JSON.stringify({ text: `Hello, ${labels.map((l, n) => INBOX_PHRASES[l][(i + n * j) % 3]).join(" and ")}. Customer ${i}${j}`, label: labels }));
  }
  inbox = join(directory, "inbox.jsonl");
  await writeFile(inbox, `${inboxLines.join("\n")}\n`);
  policyModel = join(directory, "policy.sluice");
  sigmoidModel = join(directory, "inbox.sluice");
  const builds = await Promise.all([
    sluice(["build", contact, "--text-field", "message", "--epochs", "4", "--hash-bits", "16", "--target-precision", "spam=0.95", "--target-recall", "abusive=0.9", "--review-below", "0.6", "--search-time", "0", "--out", policyModel, "--quiet", "--force"]),
    sluice(["build", inbox, "--head", "sigmoid", "--min-docs", "1", "--epochs", "20", "--hash-bits", "14", "--no-fingerprint", "--search-time", "0", "--near-duplicates", "apart", "--out", sigmoidModel, "--quiet", "--force"]),
  ]);
  for (const run of builds) if (run.code !== 0) throw new Error(`build failed: ${run.stderr}`);
});

afterAll(async () => {
  if (directory) await rm(directory, { recursive: true, force: true });
});

describe("sluice eval on a model with a policy", () => {
  it("reports per policy label the action, threshold, precision with its interval, recall and review share", async () => {
    const run = await sluice(["eval", policyModel, contact, "--json", "--quiet"]);
    expect(run.code).toBe(0);
    const report = JSON.parse(run.stdout) as Record<string, any>;
    for (const label of Object.keys(report.policy)) {
      expect(Object.keys(report.policy[label])).toEqual(expect.arrayContaining(["action", "threshold", "precision", "precisionLow", "precisionHigh", "recall", "reviewShare"]));
      expect(report.policy[label].precisionLow).toBeLessThanOrEqual(report.policy[label].precision);
      expect(report.policy[label].precisionHigh).toBeGreaterThanOrEqual(report.policy[label].precision);
    }
    expect(report.policy.spam.action).toBe("block");
    expect(typeof report.ece).toBe("number");
    expect(typeof report.eceUncalibrated).toBe("number");
  });

  it("measures the spam rule's precision and recall as the classify command's scores do", async () => {
    // Independent path: every label's score from `sluice classify --json --top 3`, gold from the file.
    const report = JSON.parse((await sluice(["eval", policyModel, contact, "--json", "--quiet"])).stdout) as Record<string, any>;
    const classified = (await sluice(["classify", policyModel, contact, "--json", "--top", "3", "--quiet"])).stdout.trim().split("\n");
    const threshold = report.policy.spam.threshold as number;
    let fired = 0;
    let hits = 0;
    let positives = 0;
    classified.forEach((line, i) => {
      const spam = (JSON.parse(line) as { labels: { label: string; score: number }[] }).labels.find((t) => t.label === "spam")?.score ?? 0;
      const isSpam = contactRecords[i].label === "spam";
      if (isSpam) positives++;
      if (spam >= threshold) {
        fired++;
        if (isSpam) hits++;
      }
    });
    // classify rounds scores to 6 decimals and the threshold is itself a validation score, so the
    // example sitting exactly at the threshold may fall either side: allow one example of slack.
    expect(Math.abs(report.policy.spam.fired - fired)).toBeLessThanOrEqual(1);
    expect(Math.abs(report.policy.spam.truePositives - hits)).toBeLessThanOrEqual(1);
    expect(report.policy.spam.positives).toBe(positives);
    expect(report.policy.spam.recall).toBeCloseTo(hits / positives, 2);
  });

  it("shows the policy table, the decision shares and both calibration errors", async () => {
    const run = await sluice(["eval", policyModel, contact, "--quiet"]);
    expect(run.stdout).toMatch(/label\s+action\s+threshold\s+review from\s+precision\s+95% interval\s+recall\s+review share/);
    expect(run.stdout).toMatch(/spam\s+block\s+\d\.\d{3}/);
    expect(run.stdout).toMatch(/decisions: allow \d+\.\d%, review \d+\.\d% \(review bands \d+\.\d%, review rules \d+\.\d%, review floor \d+\.\d%\)/);
    // 200 validation examples: the build may have skipped temperature scaling (compile/calibrate.ts).
    expect(run.stdout).toMatch(/calibration: ECE \d\.\d{3} (as shipped \(temperature \d\.\d{3}\), \d\.\d{3} before temperature scaling|\(15 bins; no temperature scaling\))/);
  });
});

describe("sluice eval on a sigmoid model", () => {
  it("prints the multi-label metrics under the documented --json keys", async () => {
    const run = await sluice(["eval", sigmoidModel, inbox, "--json", "--quiet"]);
    expect(run.code).toBe(0);
    const report = JSON.parse(run.stdout) as Record<string, unknown>;
    const keys = ["examples", "subsetAccuracy", "hammingLoss", "microF1", "macroF1", "microPrecision", "microRecall", "precisionAt1", "precisionAt3", "recallAt1", "recallAt3", "labels", "usPerDoc"];
    expect(Object.keys(report)).toEqual(expect.arrayContaining(keys));
    expect(report.examples).toBe(36);
    expect(report.recallAt3).toBe(1); // three labels: the top 3 hold every gold label
  });

  it("shows subset accuracy, Hamming loss and precision@k in the table output", async () => {
    const run = await sluice(["eval", sigmoidModel, inbox, "--quiet"]);
    expect(run.stdout).toMatch(/subset accuracy \d\.\d{3}\s+Hamming loss \d\.\d{3}/);
    expect(run.stdout).toMatch(/precision@1 \d\.\d{3}\s+precision@3 \d\.\d{3}\s+recall@1 \d\.\d{3}\s+recall@3 1\.000/);
    expect(run.stdout).toMatch(/urgent\s+0\.500/);
  });
});

describe("sluice eval leakage warning", () => {
  it("warns with the approximate count and samples when examples were trained on", async () => {
    const trained = Array.from({ length: 500 }, (_, i) => `the lamp from order ${i} flickers`);
    const modelPath = join(directory, "fingerprinted.sluice");
    await writeFile(modelPath, handMadeModelBytes({ labels: ["ok", "spam"], words: { quandrel: 1 }, outputWeights: [0, 1], provenance: { trainFingerprint: trainingFingerprint(trained) } }));
    const evaluated = [...trained.slice(0, 5), "a brand new complaint about a kettle"].map((text) => JSON.stringify({ text, label: "ok" }));
    const dataPath = join(directory, "leaky.jsonl");
    await writeFile(dataPath, `${evaluated.join("\n")}\n`);
    const run = await sluice(["eval", modelPath, dataPath, "--json", "--quiet"]);
    expect(run.stderr).toMatch(/warning: [56] of 6 examples \(≈, Bloom filter with ~2% false positives\) also appear in the training data/);
    expect(run.stderr).toMatch(/line 1 "the lamp from order 0 flickers"/);
    expect((JSON.parse(run.stdout) as { leakage: { count: number } }).leakage.count).toBeGreaterThanOrEqual(5);
  });

  it("says the check did not run for a model without a fingerprint", async () => {
    const run = await sluice(["eval", sigmoidModel, inbox, "--quiet"]);
    expect(run.stdout).toMatch(/leakage: not checked \(the model carries no training fingerprint/);
  });
});
