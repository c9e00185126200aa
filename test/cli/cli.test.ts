// The command line as users run it: `node bin/sluice.js <command>` in a child process, from
// the repository root, on the demo data (an invented scenario, demo-data/README.md), with
// small settings to stay fast. Outputs go to a temporary directory.

import { mkdtemp, readFile, rm, stat, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { REPO, sluice, type Run } from "./run-sluice.ts";
import { readExamples } from "../../compiler/read/index.ts";

const SUPPORT_TOPICS = "demo-data/support-topics.csv";
const SAMPLES = "demo-data/samples.txt";
const SUPPORT_FIELDS = ["--text-field", "subject,body", "--label-field", "topic"];
const SMALL = ["--epochs", "2", "--hash-bits", "16"];
const TINY = ["--epochs", "2", "--hash-bits", "12"];



/** RFC 4180 field: quoted, inner quotes doubled. */
function csvField(value: string): string {
  return `"${value.replace(/"/g, '""')}"`;
}

let directory = "";
let model = "";
let build: Run;
/** A text,label CSV with one record per line (line n + 2 holds example n), and its contents. */
let smallCsv = "";
let smallCsvLines: string[] = [];

beforeAll(async () => {
  directory = await mkdtemp(join(tmpdir(), "sluice-cli-"));
  model = join(directory, "support.sluice");
  build = await sluice(["build", SUPPORT_TOPICS, ...SUPPORT_FIELDS, ...SMALL, "--out", model, "--json"]);
  const lines = ["text,label"];
  for await (const example of readExamples(join(REPO, SUPPORT_TOPICS), { textFields: ["subject", "body"], labelField: "topic" })) {
    lines.push(`${csvField(example.text.replace(/\s+/g, " "))},${csvField(example.labels[0])}`);
    if (lines.length > 400) break;
  }
  smallCsvLines = lines;
  smallCsv = join(directory, "small.csv");
  await writeFile(smallCsv, `${lines.join("\n")}\n`);
});

afterAll(async () => {
  if (directory) await rm(directory, { recursive: true, force: true });
});

/** The small CSV with a three-field row put in at line 5 (the header has two fields). */
async function csvWithBadRow(): Promise<string> {
  const path = join(directory, "with-bad-row.csv");
  const lines = [...smallCsvLines];
  lines.splice(4, 0, "a row,with three,fields");
  await writeFile(path, `${lines.join("\n")}\n`);
  return path;
}

describe("sluice build --json", () => {
  it("prints one JSON object on stdout with the build report", async () => {
    expect(build.code, build.stderr).toBe(0);
    const lines = build.stdout.trim().split("\n");
    expect(lines).toHaveLength(1);
    const report = JSON.parse(lines[0]);
    for (const key of ["bytes", "trainSeconds", "tokensPerSecond", "draft", "compiled", "sections"]) expect(report).toHaveProperty(key);
    expect(typeof report.validation.accuracy).toBe("number");
    expect(typeof report.validation.macroF1).toBe("number");
    expect(report.bytes).toBe((await stat(model)).size);
  });
});

describe("sluice eval --json", () => {
  it("prints the metrics, per-label scores and confusion as one JSON object", async () => {
    const run = await sluice(["eval", model, SUPPORT_TOPICS, "--json"]);
    expect(run.code, run.stderr).toBe(0);
    const report = JSON.parse(run.stdout);
    for (const key of ["examples", "accuracy", "macroF1", "microF1", "logLoss", "labels", "confusion", "usPerDoc"]) expect(report).toHaveProperty(key);
    // demo-data/README.md: 6000 rows over six topics.
    expect(report.examples).toBe(6000);
    const labels = Object.keys(report.labels).sort();
    expect(labels).toEqual(["account-access", "billing", "product-question", "returns", "shipping", "technical-fault"]);
    for (const label of labels) {
      for (const key of ["precision", "recall", "f1", "support"]) expect(typeof report.labels[label][key]).toBe("number");
    }
    // demo-data/README.md label counts (after the deliberate mislabelling).
    expect(report.labels.billing.support).toBe(1202);
    // A confusion matrix counts every example once (common practice, no source).
    const cells = (report.confusion as number[][]).flat();
    expect(cells.reduce((a, b) => a + b, 0)).toBe(6000);
  });
});

describe("sluice classify", () => {
  it("prints one JSON line per input line with label, score and the listed labels", async () => {
    const run = await sluice(["classify", model, SAMPLES, "--json", "--top", "3"]);
    expect(run.code, run.stderr).toBe(0);
    const expectedLines = (await readFile(join(REPO, SAMPLES), "utf8")).split("\n").filter((line) => line.trim() !== "").length;
    const lines = run.stdout.trim().split("\n");
    expect(lines).toHaveLength(expectedLines);
    for (const line of lines) {
      const result = JSON.parse(line);
      expect(typeof result.label).toBe("string");
      expect(result.score).toBeGreaterThan(0);
      expect(result.score).toBeLessThanOrEqual(1);
      expect(result.labels).toHaveLength(3);
      expect(result.labels[0]).toEqual({ label: result.label, score: result.score });
    }
  });

  it("prints aligned columns under a header without --json, one row per text", async () => {
    const run = await sluice(["classify", model, SAMPLES, "--top", "2"]);
    expect(run.code, run.stderr).toBe(0);
    const [header, ...rows] = run.stdout.trimEnd().split("\n");
    expect(header).toMatch(/^row +decision +label 1 +score 1 +label 2 +score 2 +text$/);
    // Every row's text starts in the header's "text" column, and its first score sits under "score 1".
    const textColumn = header.indexOf("text");
    const scoreEnd = header.indexOf("score 1") + "score 1".length;
    for (const row of rows) {
      expect(row[textColumn - 1]).toBe(" ");
      expect(row.slice(scoreEnd - 5, scoreEnd)).toMatch(/^[01]\.\d{3}$/);
      expect(row).not.toContain("\t");
    }
  });

  it('reads texts from stdin when the input is "-"', async () => {
    const run = await sluice(["classify", model, "-", "--json"], { input: "Where is my parcel? The tracking hasn't moved.\nI was charged twice for one order.\n" });
    expect(run.code, run.stderr).toBe(0);
    const results = run.stdout.trim().split("\n").map((line) => JSON.parse(line));
    expect(results).toHaveLength(2);
    expect(results.map((r) => r.label)).toEqual(["shipping", "billing"]);
  });
});

describe("bad data", () => {
  it("stops at a CSV row with the wrong number of fields, naming the file, the line and what was expected", async () => {
    const path = await csvWithBadRow();
    const run = await sluice(["build", path, ...TINY, "--out", join(directory, "never.sluice")]);
    expect(run.code).not.toBe(0);
    expect(run.stderr).toContain(`${path} line 5`);
    expect(run.stderr).toMatch(/expected 2 fields/);
    expect(run.stderr).toMatch(/found 3/);
  });

  it("skips the bad row with --skip-bad and reports how many were skipped", async () => {
    const path = await csvWithBadRow();
    const run = await sluice(["build", path, ...TINY, "--skip-bad", "--out", join(directory, "skipped.sluice")]);
    expect(run.code, run.stderr).toBe(0);
    expect(run.stderr).toMatch(/1 bad row skipped/);
    await expect(stat(join(directory, "skipped.sluice"))).resolves.toBeTruthy();
  });
});

describe("safety of outputs and inputs", () => {
  it("refuses to overwrite an existing output without --force and leaves it byte-identical", async () => {
    const out = join(directory, "existing.sluice");
    const before = Buffer.from("precious bytes that must survive\n");
    await writeFile(out, before);
    const run = await sluice(["build", smallCsv, ...TINY, "--out", out]);
    expect(run.code).not.toBe(0);
    expect(run.stderr).toMatch(/already exists/);
    expect(run.stderr).toMatch(/--force/);
    expect(Buffer.compare(await readFile(out), before)).toBe(0);
  });

  it("refuses a model file with a flipped byte, naming the file and the CRC-32 mismatch", async () => {
    const bytes = await readFile(model);
    bytes[bytes.length >> 1] ^= 0x5a;
    const corrupt = join(directory, "corrupt.sluice");
    await writeFile(corrupt, bytes);
    const run = await sluice(["eval", corrupt, SUPPORT_TOPICS, "--json"]);
    expect(run.code).not.toBe(0);
    expect(run.stdout).toBe("");
    expect(run.stderr).toContain(corrupt);
    // The loader refuses it with code "checksum"; the message names the check and the cause.
    expect(run.stderr).toMatch(/checksum mismatch \(CRC-32\).*corrupt/);
  });

  it("exits with status 2 for an unknown flag and names the flag", async () => {
    const run = await sluice(["build", smallCsv, "--bogus-flag", "3"]);
    expect(run.code).toBe(2);
    expect(run.stderr).toContain("--bogus-flag");
  });
});

describe("reproducible builds through the CLI", () => {
  it("writes byte-identical model files twice with SOURCE_DATE_EPOCH=0", async () => {
    // SOURCE_DATE_EPOCH fixes the recorded build time (reproducible-builds.org specification).
    const first = join(directory, "epoch-first.sluice");
    const second = join(directory, "epoch-second.sluice");
    const env = { SOURCE_DATE_EPOCH: "0" };
    const runs = [await sluice(["build", smallCsv, ...TINY, "--out", first, "--quiet"], { env }), await sluice(["build", smallCsv, ...TINY, "--out", second, "--quiet"], { env })];
    for (const run of runs) expect(run.code, run.stderr).toBe(0);
    expect(Buffer.compare(await readFile(first), await readFile(second))).toBe(0);
  });
});
