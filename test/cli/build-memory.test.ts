// How a build chooses between memory and disk: from the projected memory of an in-memory
// build (examples × tokens, sampled from the file), not from the file's size, against
// --max-memory or the default budget of 2 × the file + 300 MB; and the build report states
// the peak memory it used. Peak memory itself is measured by `npm run bench`, not here.
import { mkdtempSync, rmSync, statSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, relative } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { defaultBuildSettings } from "../../compiler/build/build-settings.ts";
import { BASE_BYTES, chooseBuildPath, projectInMemoryBytes } from "../../compiler/cli/choose-build-path.ts";
import { REPO, sluice } from "./run-sluice.ts";

let folder: string;
let data: string;
const settings = defaultBuildSettings();

beforeAll(() => {
  folder = mkdtempSync(join(tmpdir(), "sluice-memory-"));
  data = join(folder, "small.csv");
  const rows = ["text,label"];
  for (let i = 0; i < 60; i++) rows.push(`refund my card payment ${i},billing`, `where is my parcel ${i},shipping`);
  writeFileSync(data, `${rows.join("\n")}\n`);
});

afterAll(() => rmSync(folder, { recursive: true, force: true }));

describe("chooseBuildPath", () => {
  it("should build a small file in memory under the default budget", () => {
    const choice = chooseBuildPath(data, settings, { forceOnDisk: false });
    expect(choice.onDisk).toBe(false);
    expect(choice.reason).toContain("2 × the file + 300 MB");
  });

  it("should go on disk when the projection exceeds --max-memory", () => {
    const choice = chooseBuildPath(data, settings, { forceOnDisk: false, maxMemoryBytes: 1024 * 1024 });
    expect(choice.onDisk).toBe(true);
    expect(choice.reason).toContain("--max-memory");
  });

  it("should project more memory per byte for many short texts than for few long ones", () => {
    // Each example carries fixed overhead (objects, offsets), so 40x the examples in about
    // the same bytes must project more: the choice follows examples and tokens, not bytes.
    const short = join(folder, "short.csv");
    const long = join(folder, "long.csv");
    writeFileSync(short, `text,label\n${"abcd abcd abcd,a\n".repeat(40_000)}`);
    writeFileSync(long, `text,label\n${`${"abcd ".repeat(120)},a\n`.repeat(1_000)}`);
    const perByte = (path: string) => (projectInMemoryBytes(path, statSync(path).size, settings) - BASE_BYTES) / statSync(path).size;
    expect(perByte(short)).toBeGreaterThan(perByte(long));
  });
});

describe("sluice build memory", () => {
  it("should state its peak memory and its path in the JSON report and the summary", async () => {
    const out = join(folder, "m.sluice");
    const json = await sluice(["build", relative(REPO, data), "--out", relative(REPO, out), "--epochs", "1", "--json", "--quiet", "--force"]);
    expect(json.code).toBe(0);
    const report = JSON.parse(json.stdout.trim().split("\n").pop() as string);
    expect(report.peakMemoryBytes).toBeGreaterThan(10 * 1024 * 1024);
    expect(report.onDisk).toBe(false);
    const summary = await sluice(["build", relative(REPO, data), "--out", relative(REPO, out), "--epochs", "1", "--max-memory", "1m", "--force"]);
    expect(summary.code).toBe(0);
    expect(summary.stdout).toMatch(/peak memory \d+ MB/);
    expect(summary.stderr).toContain("on disk: an in-memory build would need about");
  });
});
