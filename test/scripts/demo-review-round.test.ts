// npm run demo:review-round, as a user runs it: the round from moderation to the compare gate
// completes and prints every step (test/worker/reviews/review-round.test.ts checks the round's
// numbers; this checks the demo a newcomer runs).
import { spawnSync } from "node:child_process";
import { describe, expect, it } from "vitest";
import { REPO } from "../cli/run-sluice.ts";

describe("npm run demo:review-round", () => {
  it("should moderate, review, export, evaluate, rebuild, compare and save the shadow counts", () => {
    const run = spawnSync(process.execPath, ["--import", "tsx", "scripts/demo-review-round.ts", "--messages", "150"], { cwd: REPO, encoding: "utf8", timeout: 300_000 });
    expect(run.status, run.stderr).toBe(0);
    for (const step of ["1. moderate", "2. review", "3. export", "4. eval", "5. rebuild", "6. compare", "7. shadow"]) expect(run.stdout).toContain(step);
    const decided = Number(/(\d+) items decided/.exec(run.stdout)?.[1]);
    const reviewed = Number(/review (\d+)/.exec(run.stdout)?.[1]);
    expect(decided).toBeGreaterThan(0);
    expect(decided).toBe(reviewed); // every review answer reached the queue and was decided
  }, 320_000);
});
