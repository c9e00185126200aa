// `classify` with a policy model says what the policy would do with each text.
import { execFile } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { promisify } from "node:util";
import { afterAll, describe, expect, it } from "vitest";
import { SURFACE_DEFAULTS } from "../../runtime/surface-defaults.ts";

const run = promisify(execFile);
const directory = mkdtempSync(join(tmpdir(), "sluice-classify-decision-"));
afterAll(() => rmSync(directory, { recursive: true, force: true }));

describe("sluice classify on a model with a policy", () => {
  it("should add the policy's decision to every JSON line, and the shared review floor's without a policy", async () => {
    const withPolicy = join(directory, "policy.sluice");
    const without = join(directory, "plain.sluice");
    const common = ["bin/sluice.js", "build", "demo-data/contact-form.jsonl", "--text-field", "message", "--epochs", "3", "--hash-bits", "16", "--quiet", "--force"];
    await run(process.execPath, [...common, "--target-precision", "spam=0.9", "--review-below", "0.6", "--out", withPolicy]);
    await run(process.execPath, [...common, "--out", without]);
    const lines = (await run(process.execPath, ["bin/sluice.js", "classify", withPolicy, "demo-data/samples.txt", "--json"])).stdout.trim().split("\n").map((l) => JSON.parse(l));
    expect(lines).toHaveLength(8);
    for (const line of lines) {
      expect(["allow", "review", "block", "route"]).toContain(line.decision.action);
      expect(line.decision.reasons.length).toBeGreaterThan(0);
    }
    // The obvious spam sample is blocked only because a precision target made a block rule.
    expect(lines.some((l) => l.decision.action === "block" && l.decision.label === "spam")).toBe(true);
    expect(lines.map((l) => l.row)).toEqual([1, 2, 3, 4, 5, 6, 7, 8]);
    const plain = (await run(process.execPath, ["bin/sluice.js", "classify", without, "demo-data/samples.txt", "--json"])).stdout.trim().split("\n").map((l) => JSON.parse(l));
    // Without a policy the decision is the one /v1/moderate gives: allow, or review below the
    // shared floor (runtime/surface-defaults.ts), never block.
    for (const line of plain) expect(line.decision.action).toBe(line.score < SURFACE_DEFAULTS.reviewBelow ? "review" : "allow");
  }, 120_000);
});
