// `sluice serve` argument handling through the real CLI (the served API itself is covered by
// parity.test.ts, which compares it byte for byte with the Worker in workerd).

import { spawnSync } from "node:child_process";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";

const CLI = fileURLToPath(new URL("../../bin/sluice.js", import.meta.url));

function sluice(...args: string[]) {
  return spawnSync(process.execPath, [CLI, ...args], { encoding: "utf8", timeout: 60_000 });
}

describe("sluice serve", () => {
  it("lists its options and the environment variables it reads", () => {
    const run = sluice("serve", "--help");
    expect(run.status).toBe(0);
    expect(run.stdout).toContain("--port");
    expect(run.stdout).toContain("API_TOKEN");
  });

  it("refuses a port outside 0-65535 as a usage error", () => {
    const run = sluice("serve", "model.sluice", "--port", "70000");
    expect(run.status).toBe(2);
    expect(run.stderr).toContain("--port: expected an integer from 0 to 65535");
  });

  it("names the model file it cannot read", () => {
    const run = sluice("serve", "no-such-model.sluice", "--port", "0");
    expect(run.status).toBe(1);
    expect(run.stderr).toContain("no-such-model.sluice");
  });
});
