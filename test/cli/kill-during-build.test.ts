// A build killed with SIGKILL at any moment leaves the model it was replacing intact: the
// new model is written to a temporary file, synced and renamed over the old one, so the
// output path holds either every byte of the old model or every byte of the new one, never a
// mix (rename(2) replaces the name atomically on POSIX file systems; common practice, no source).
// Kill times are spread over one measured build, from start-up to the final rename.
import { spawn } from "node:child_process";
import { mkdtempSync, readdirSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { loadModel } from "../../runtime/index.ts";
import { REPO } from "./run-sluice.ts";

const folder = mkdtempSync(join(tmpdir(), "sluice-kill-"));
const out = join(folder, "live.sluice");
// SOURCE_DATE_EPOCH pins the build time, so two builds with the same flags give the same bytes.
const env = { ...process.env, SOURCE_DATE_EPOCH: "1798761600" };
const common = ["build", "demo-data/support-topics.csv", "--text-field", "subject,body", "--label-field", "topic", "--search-time", "0", "--quiet"];

afterAll(() => rmSync(folder, { recursive: true, force: true }));

/** Runs a build; with `killAfterMs`, SIGKILLs it then. Resolves with the build's wall time. */
function runBuild(flags: string[], target: string, killAfterMs?: number): Promise<{ ms: number; signal: NodeJS.Signals | null; code: number | null }> {
  return new Promise((done) => {
    const started = performance.now();
    const child = spawn(process.execPath, ["bin/sluice.js", ...common, ...flags, "--out", target, "--force"], { cwd: REPO, env, stdio: "ignore" });
    const timer = killAfterMs === undefined ? null : setTimeout(() => child.kill("SIGKILL"), killAfterMs);
    child.on("exit", (code, signal) => {
      if (timer) clearTimeout(timer);
      done({ ms: performance.now() - started, signal, code });
    });
  });
}

describe("a build killed with SIGKILL", () => {
  it("should leave the old model or the whole new one at the output path, wherever it is killed", async () => {
    const oldFlags = ["--epochs", "2"];
    const newFlags = ["--epochs", "4"];
    expect((await runBuild(oldFlags, out)).code).toBe(0);
    const oldBytes = readFileSync(out);
    const reference = join(folder, "reference.sluice");
    const full = await runBuild(newFlags, reference);
    expect(full.code).toBe(0);
    const newBytes = readFileSync(reference);
    expect(newBytes.equals(oldBytes)).toBe(false);
    const outcomes = { old: 0, new: 0 };
    // Eight kill times from 5% to 110% of a full build (late ones may land after the rename).
    for (const fraction of [0.05, 0.2, 0.4, 0.6, 0.75, 0.9, 0.97, 1.1]) {
      const run = await runBuild(newFlags, out, Math.round(full.ms * fraction));
      const now = readFileSync(out);
      const which = now.equals(oldBytes) ? "old" : now.equals(newBytes) ? "new" : "mixed";
      expect(which, `killed at ${Math.round(fraction * 100)}% (${run.signal ?? `exit ${run.code}`})`).not.toBe("mixed");
      outcomes[which as "old" | "new"]++;
      expect(() => loadModel(new Uint8Array(now))).not.toThrow();
      if (which === "new") {
        // Put the old model back, so the next kill again has something to destroy.
        expect((await runBuild(oldFlags, out)).code).toBe(0);
        expect(readFileSync(out).equals(oldBytes)).toBe(true);
      }
    }
    expect(outcomes.old).toBeGreaterThan(0); // at least one kill landed mid-build
    // A later build removes what killed ones left behind: no temporary file stays.
    expect((await runBuild(oldFlags, out)).code).toBe(0);
    expect(readdirSync(folder).filter((name) => name.endsWith(".tmp"))).toEqual([]);
  }, 240_000);
});
