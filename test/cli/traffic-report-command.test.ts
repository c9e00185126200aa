// `sluice traffic-report` on the JSON a Worker's /v1/stats and /v1/shadow return: traffic whose
// top labels and scores match the validation split stored in the model reads as stable
// (population stability 0.000); traffic of one label only reads as a large shift; the shadow
// section lists the flips. Outputs are HTML files in a temporary directory.

import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { loadModel } from "../../runtime/index.ts";
import { sluice } from "./run-sluice.ts";

const directory = mkdtempSync(join(tmpdir(), "sluice-traffic-report-"));
const modelPath = join(directory, "model.sluice");
let traffic: { labels: Record<string, number>; topScores: Record<string, number> };

beforeAll(async () => {
  const built = await sluice(["build", "demo-data/contact-form.jsonl", "--text-field", "message", "--epochs", "2", "--hash-bits", "14", "--quiet", "--out", modelPath]);
  expect(built.code, built.stderr).toBe(0);
  traffic = (loadModel(readFileSync(modelPath)).meta.metrics as { traffic: typeof traffic }).traffic;
}, 120_000);

afterAll(() => rmSync(directory, { recursive: true, force: true }));

function statsFile(name: string, labels: Record<string, number>, topScores: Record<string, number>): string {
  const version = loadModel(readFileSync(modelPath)).meta.version;
  const path = join(directory, name);
  writeFileSync(path, JSON.stringify({ modelVersion: version, hours: [{ hour: 493_000, modelVersion: version, actions: { allow: 90, review: 10 }, labels, topScores }] }));
  return path;
}

describe("sluice traffic-report", () => {
  it("should store the validation split's top labels and score buckets in the model", () => {
    const total = Object.values(traffic.labels).reduce((a, b) => a + b, 0);
    expect(total).toBeGreaterThan(0);
    expect(Object.values(traffic.topScores).reduce((a, b) => a + b, 0)).toBe(total);
  });

  it("should read traffic shaped like validation as stable and one-label traffic as a large shift", async () => {
    const out = join(directory, "stable.html");
    const stable = await sluice(["traffic-report", modelPath, "--stats", statsFile("stable.json", traffic.labels, traffic.topScores), "--out", out, "--quiet"]);
    expect(stable.code, stable.stderr).toBe(0);
    const html = readFileSync(out, "utf8");
    expect(html).toContain("Top labels: population stability 0.000</strong> (little change");
    const skewed = join(directory, "skewed.html");
    const run = await sluice(["traffic-report", modelPath, "--stats", statsFile("skewed.json", { spam: 100 }, { "0.9": 100 }), "--out", skewed, "--quiet"]);
    expect(run.code, run.stderr).toBe(0);
    expect(readFileSync(skewed, "utf8")).toMatch(/Top labels: population stability \d+\.\d{3}<\/strong> \(large shift/);
  });

  it("should list the shadow candidate's flips, and refuse a file that is not a /v1/shadow answer", async () => {
    const shadowPath = join(directory, "shadow.json");
    writeFileSync(shadowPath, JSON.stringify({ live: { version: "aaaa" }, candidate: { version: "bbbb" }, total: 10, agreements: 8, flips: 2, cells: [{ liveLabel: "ok", candidateLabel: "ok", liveAction: "allow", candidateAction: "allow", count: 8 }, { liveLabel: "ok", candidateLabel: "spam", liveAction: "review", candidateAction: "block", count: 2 }], hours: [], samples: [] }));
    const out = join(directory, "shadow.html");
    const run = await sluice(["traffic-report", modelPath, "--shadow", shadowPath, "--out", out, "--quiet"]);
    expect(run.code, run.stderr).toBe(0);
    const html = readFileSync(out, "utf8");
    expect(html).toContain("would have decided 2 differently");
    expect(html).toContain("review → block");
    const bad = await sluice(["traffic-report", modelPath, "--shadow", modelPath, "--out", join(directory, "bad.html")]);
    expect(bad.code).toBe(1);
    expect(bad.stderr).toContain("expected the JSON answer of GET /v1/shadow");
  });
});
