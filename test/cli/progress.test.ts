// Every stage of a build shows itself on a terminal (stderr), and nothing is drawn off a
// terminal or with --quiet. The terminal is a real pseudo-terminal from util-linux `script`.
import { execFile } from "node:child_process";
import { mkdtemp, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { promisify } from "node:util";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { REPO, sluice } from "./run-sluice.ts";

const run = promisify(execFile);
let directory = "";
const BUILD = ["build", "demo-data/contact-form.jsonl", "--text-field", "message", "--epochs", "3", "--hash-bits", "16", "--force"];

beforeAll(async () => {
  directory = await mkdtemp(join(tmpdir(), "sluice-progress-"));
});

afterAll(async () => {
  if (directory) await rm(directory, { recursive: true, force: true });
});

describe("build progress", () => {
  it("should name every stage on a terminal: reading, preparing, training, compiling", async () => {
    const command = ["node", "bin/sluice.js", ...BUILD, "--out", join(directory, "tty.sluice")].map((word) => `'${word}'`).join(" ");
    const { stdout } = await run("script", ["-qec", command, "/dev/null"], { cwd: REPO, maxBuffer: 16 * 1024 * 1024 });
    for (const stage of ["reading demo-data/contact-form.jsonl", "preparing: featurizing", "training █", "compiling: prune, quantize", "calibrating and choosing", "verifying: reload"]) expect(stdout).toContain(stage);
    expect(stdout).toMatch(/wrote .*tty\.sluice/);
  }, 120_000);

  it("should draw nothing off a terminal, and print nothing on stderr with --quiet", async () => {
    const plain = await sluice([...BUILD, "--out", join(directory, "plain.sluice")]);
    expect(plain.code, plain.stderr).toBe(0);
    expect(plain.stderr).not.toContain("\r");
    expect(plain.stderr).not.toMatch(/preparing|compiling:|█/);
    // --quiet leaves only warnings about the data (here: repeated texts), never progress or the read report.
    const quiet = await sluice([...BUILD, "--out", join(directory, "quiet.sluice"), "--quiet"]);
    for (const line of quiet.stderr.split("\n").filter(Boolean)) expect(line).toMatch(/^warning: /);
  }, 120_000);
});
