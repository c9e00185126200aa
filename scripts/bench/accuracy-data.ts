// The rows `npm run bench:accuracy` trains and tests on: a corpus prepared by
// `npm run corpora`, its training part subsampled by group when larger than the bench's
// cap (so the scikit-learn references fit in the time budget). The subsample is fixed:
// a group is kept when the first four bytes of sha256("sluice-bench-subsample-v1:" + group)
// are below cap / rows × 2^32. Every system sees the same rows.
import { createHash } from "node:crypto";
import { existsSync, readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";

export interface SuiteRow {
  text: string;
  label: string | string[];
  group: string;
}

export interface SuiteCorpus {
  name: string;
  shape: string;
  multiLabel: boolean;
  train: SuiteRow[];
  test: SuiteRow[];
  /** Rows of the training part before subsampling. */
  fullTrainRows: number;
}

function readRows(file: string): SuiteRow[] {
  if (!existsSync(file)) throw new Error(`${file} is missing: run \`npm run corpora\` first`);
  return readFileSync(file, "utf8")
    .split("\n")
    .filter((line) => line !== "")
    .map((line, i) => {
      const row = JSON.parse(line) as SuiteRow;
      if (typeof row.text !== "string" || row.label === undefined) throw new Error(`${file}, line ${i + 1}: expected "text" and "label"`);
      return row;
    });
}

function keptGroup(group: string, fraction: number): boolean {
  const digest = createHash("sha256").update(`sluice-bench-subsample-v1:${group}`).digest();
  return digest.readUInt32BE(0) < fraction * 2 ** 32;
}

/** Reads one prepared corpus; caps its training part at about `maxTrainRows` rows. */
export function readSuiteCorpus(root: string, entry: { name: string; shape: string; multiLabel: boolean }, maxTrainRows: number): SuiteCorpus {
  const fullTrain = readRows(join(root, entry.name, "train.jsonl"));
  const test = readRows(join(root, entry.name, "test.jsonl"));
  const fraction = maxTrainRows / fullTrain.length;
  const train = fraction >= 1 ? fullTrain : fullTrain.filter((row) => keptGroup(row.group, fraction));
  return { ...entry, train, test, fullTrainRows: fullTrain.length };
}

/** Writes rows as JSONL (text, label, group) for a child process. */
export function writeRows(file: string, rows: readonly SuiteRow[]): void {
  writeFileSync(file, `${rows.map((r) => JSON.stringify({ text: r.text, label: r.label, group: r.group })).join("\n")}\n`);
}
