// Every command that reads a file names the user's path when it is missing or a folder,
// instead of a bare EISDIR (which names no file) or an ENOENT about `open`, and before any
// work: model files, data files, classify's input, --validation, --also, --config,
// traffic-report's --stats and --shadow, report's --evasion. The commands run in this
// process through main(), as bin/sluice.js runs them; output-paths.test.ts covers the
// spawned CLI for build.
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { main } from "../../compiler/cli/main.ts";
import { ensureDemoModel } from "../../scripts/demo-model.ts";

let folder: string;
let model: string;
let data: string;
let stats: string;

beforeAll(() => {
  folder = mkdtempSync(join(tmpdir(), "sluice-in-"));
  model = ensureDemoModel();
  data = join(folder, "data.jsonl");
  writeFileSync(data, '{"text":"where is my parcel","label":"ok"}\n');
  stats = join(folder, "stats.json");
  writeFileSync(stats, '{"hours":[]}\n');
  // Folders named like the files each command expects, so the extension gives nothing away.
  for (const name of ["dir.sluice", "dir.jsonl", "dir.csv", "dir.txt", "dir.json"]) mkdirSync(join(folder, name));
});

afterAll(() => rmSync(folder, { recursive: true, force: true }));

/** Runs the CLI in this process; resolves with the exit code and what went to stderr. */
async function run(args: string[]): Promise<{ code: number; stderr: string }> {
  let stderr = "";
  const spy = vi.spyOn(process.stderr, "write").mockImplementation((chunk: string | Uint8Array) => {
    stderr += String(chunk);
    return true;
  });
  try {
    return { code: await main(args), stderr };
  } finally {
    spy.mockRestore();
  }
}

const out = () => join(folder, `out-${Math.random().toString(36).slice(2)}`);

// [what the case is, what the message calls the path, the extension of the bad path, the arguments]
const CASES: [string, string, string, (bad: string) => string[]][] = [
  ["eval's model", "model file", "sluice", (bad) => ["eval", bad, data]],
  ["eval's data", "data file", "jsonl", (bad) => ["eval", model, bad]],
  ["eval's data without an extension", "data file", "", (bad) => ["eval", model, bad]],
  ["classify's model", "model file", "sluice", (bad) => ["classify", bad, data]],
  ["classify's data", "input file", "jsonl", (bad) => ["classify", model, bad]],
  ["classify's plain text input", "input file", "txt", (bad) => ["classify", model, bad]],
  ["explain's model", "model file", "sluice", (bad) => ["explain", bad, "hello"]],
  ["inspect's model", "model file", "sluice", (bad) => ["inspect", bad]],
  ["compare's live model", "live model file", "sluice", (bad) => ["compare", bad, model, data]],
  ["compare's candidate model", "candidate model file", "sluice", (bad) => ["compare", model, bad, data]],
  ["compare's data", "data file", "jsonl", (bad) => ["compare", model, model, bad]],
  ["report's model", "model file", "sluice", (bad) => ["report", bad, data, "--out", `${out()}.html`]],
  ["report's data", "data file", "jsonl", (bad) => ["report", model, bad, "--out", `${out()}.html`]],
  ["report's --evasion results", "evasion results file", "json", (bad) => ["report", "--evasion", bad, "--out", `${out()}.html`]],
  ["traffic-report's model", "model file", "sluice", (bad) => ["traffic-report", bad, "--stats", stats, "--out", `${out()}.html`]],
  ["traffic-report's --stats", "--stats file", "json", (bad) => ["traffic-report", model, "--stats", bad, "--out", `${out()}.html`]],
  ["traffic-report's --shadow", "--shadow file", "json", (bad) => ["traffic-report", model, "--shadow", bad, "--out", `${out()}.html`]],
  ["serve's model", "model file", "sluice", (bad) => ["serve", bad, "--port", "0"]],
  ["build's data", "data file", "csv", (bad) => ["build", bad, "--out", `${out()}.sluice`, "--quiet"]],
  ["build's --validation", "validation file", "jsonl", (bad) => ["build", data, "--validation", bad, "--out", `${out()}.sluice`, "--quiet"]],
  ["build's --also", "--also file", "jsonl", (bad) => ["build", data, "--also", bad, "--out", `${out()}.sluice`, "--quiet"]],
  ["build's --config", "config file", "json", (bad) => ["build", data, "--config", bad, "--out", `${out()}.sluice`, "--quiet"]],
  ["tune's data", "data file", "csv", (bad) => ["tune", bad, "--out", `${out()}.json`, "--quiet"]],
];

describe("an input path that is a folder", () => {
  it.each(CASES)("should be named for %s", async (_case, what, extension, args) => {
    const bad = join(folder, extension === "" ? "dir.csv" : `dir.${extension}`);
    const result = await run(args(bad));
    expect(result.code).toBe(1);
    expect(result.stderr).toContain(`${what} ${bad} is a folder, not a file`);
    expect(result.stderr).not.toContain("EISDIR");
  });
});

describe("an input path that does not exist", () => {
  it.each(CASES)("should be named for %s", async (_case, what, extension, args) => {
    const bad = join(folder, extension === "" ? "absent" : `absent.${extension}`);
    const result = await run(args(bad));
    expect(result.code).toBe(1);
    expect(result.stderr).toContain(`${what} ${bad} does not exist`);
    expect(result.stderr).not.toContain("ENOENT");
  });
});
