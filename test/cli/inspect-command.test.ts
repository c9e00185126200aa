// `sluice inspect` prints tables and phrases for people; the raw values stay behind --json.
import { mkdtemp, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sluice } from "./run-sluice.ts";

let directory = "";
let model = "";

beforeAll(async () => {
  directory = await mkdtemp(join(tmpdir(), "sluice-inspect-"));
  model = join(directory, "m.sluice");
  const build = await sluice(["build", "demo-data/contact-form.jsonl", "--text-field", "message", "--epochs", "3", "--char-span", "0", "--hash-bits", "16", "--target-precision", "spam=0.9", "--out", model, "--quiet", "--force"]);
  if (build.code !== 0) throw new Error(build.stderr);
}, 120_000);

afterAll(async () => {
  if (directory) await rm(directory, { recursive: true, force: true });
});

describe("sluice inspect", () => {
  it("should print sections, metrics, policy, provenance and settings without raw JSON", async () => {
    const run = await sluice(["inspect", model]);
    expect(run.code, run.stderr).toBe(0);
    expect(run.stdout).toMatch(/^section +bytes +share$/m);
    expect(run.stdout).toMatch(/^compiled \(this file\) +\d\.\d{3} +\d\.\d{3}$/m);
    expect(run.stdout).toMatch(/^ {2}spam: block at/m);
    expect(run.stdout).toMatch(/training-text fingerprint +Bloom filter of/);
    expect(run.stdout).toMatch(/^ {2}charSpan +off$/m);
    // No JSON objects or arrays anywhere in the human output.
    expect(run.stdout).not.toMatch(/[{}[\]]/);
  });

  it("should keep every raw value in --json", async () => {
    const report = JSON.parse((await sluice(["inspect", model, "--json"])).stdout);
    expect(report.provenance.settings.charSpan).toEqual([0, 0]);
    expect(report.policy.rules[0].label).toBe("spam");
  });
});
