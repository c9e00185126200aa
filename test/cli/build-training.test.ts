// `sluice build` on what training can get wrong: a learning rate that makes training diverge
// (clear message, exit code 1, no file), rows of one group kept on one side of the validation
// split (--group-field), and the report of the build's own setting search.

import { mkdtemp, rm, stat, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { readExamples } from "../../compiler/read/index.ts";
import { REPO, sluice } from "./run-sluice.ts";

let directory = "";
let data = "";

beforeAll(async () => {
  directory = await mkdtemp(join(tmpdir(), "sluice-train-"));
  data = join(directory, "contact.jsonl");
  const lines: string[] = [];
  // The demo contact form (invented, demo-data/README.md); each message gets a group of its sender.
  for await (const example of readExamples(join(REPO, "demo-data/contact-form.jsonl"), { textFields: ["message"] })) {
    lines.push(JSON.stringify({ text: example.text, label: example.labels[0], sender: `s${lines.length % 97}` }));
    if (lines.length >= 800) break;
  }
  await writeFile(data, `${lines.join("\n")}\n`);
});

afterAll(async () => {
  await rm(directory, { recursive: true, force: true });
});

describe("sluice build when training diverges", () => {
  it("exits 1 with the epoch and the rate to lower, and writes no model file", async () => {
    const out = join(directory, "diverged.sluice");
    // Plain SGD: adaptive rates (the default) bound each step and did not diverge even at 10.
    const run = await sluice(["build", data, "--learning-rate", "10", "--no-adaptive-rates", "--weighting", "mean", "--char-span", "1-4", "--hash-bits", "16", "--out", out]);
    expect(run.code).toBe(1);
    expect(run.stderr).toMatch(/training diverged at epoch \d+: .+; lower --learning-rate \(now 10\)/);
    expect(run.stderr).not.toMatch(/int8|row scale/);
    await expect(stat(out)).rejects.toThrow();
  });
});

describe("sluice build --group-field", () => {
  it("keeps each group on one side and reports the search it ran", async () => {
    const out = join(directory, "grouped.sluice");
    const run = await sluice(["build", data, "--group-field", "sender", "--hash-bits", "16", "--search-time", "60", "--epochs", "3", "--out", out, "--json"]);
    expect(run.code).toBe(0);
    const report = JSON.parse(run.stdout);
    expect(report.split).toMatchObject({ kind: "holdout", grouped: true, groups: 97 });
    expect(report.validationInterval.low).toBeLessThanOrEqual(report.validation.accuracy);
    expect(report.validationInterval.high).toBeGreaterThanOrEqual(report.validation.accuracy);
    // --epochs was given, so the search kept it and says so.
    expect(report.search.chosen.epochs).toBe(3);
    expect(report.search.explicit).toContain("epochs");
    expect(report.search.candidates.length).toBeGreaterThan(1);
  });

  it("names the line and field when a row has no group", async () => {
    const broken = join(directory, "broken.jsonl");
    await writeFile(broken, `${JSON.stringify({ text: "hello there", label: "ok", sender: "a" })}\n${JSON.stringify({ text: "buy now", label: "spam" })}\n`);
    const run = await sluice(["build", broken, "--group-field", "sender", "--out", join(directory, "never.sluice")]);
    expect(run.code).toBe(1);
    expect(run.stderr).toMatch(/line 2, field "sender": missing/);
  });
});
