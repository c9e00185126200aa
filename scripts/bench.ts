// `npm run bench`: every benchmark in one run, printed as tables and written as JSON and
// Markdown under test/bench/results/ (with the machine, Node version and date).
// `npm run bench -- --quick` skips the 1 GB larger-than-memory build and shortens the rest.
// These are measurements, not tests: nothing here passes or fails on speed.
import { loadSpamAssassin, splitSpamAssassin } from "../test/fixtures/spam-assassin.ts";
import { charGramSpeedMarkdown, runCharGramSpeed, type CharGramSpeed } from "./bench/char-gram-speed.ts";
import { runComparison } from "./bench/comparison.ts";
import { comparisonTable, comparisonRatios, comparisonNotes } from "./bench/comparison-print.ts";
import type { ComparisonRow } from "./bench/comparison-rows.ts";
import { runCompression, type CompressionRow } from "./bench/compression.ts";
import { describeBuildPathCost, IN_MEMORY_FLAGS, runDefaultBuildMemory, type DefaultBuildMemoryResult } from "./bench/default-build-memory.ts";
import { runLargeFile, type LargeFileResult } from "./bench/large-file.ts";
import { runMicro, type MicroResult } from "./bench/micro.ts";
import { describeMachine, machineInfo, markdownTable, writeResults } from "./bench/results-writer.ts";
import { runHeads, runThreads, type HeadRow, type ThreadRow } from "./bench/scale.ts";
import { supportTopicsSplit } from "./bench/support-topics-split.ts";

const quick = process.argv.includes("--quick");
const log = (line: string) => console.log(line);

const f = (value: number, digits = 3) => (Number.isFinite(value) ? value.toFixed(digits) : "n/a");

const machine = machineInfo();
log(`Sluice benchmarks, ${new Date().toISOString()}\n${describeMachine(machine)}\n`);

log("## Micro-benchmarks");
const micro: MicroResult[] = await runMicro();
const microTable = markdownTable(["measurement", "value", "unit", "note"], micro.map((r) => [r.name, String(r.value), r.unit, r.note ?? ""]), ["left", "right", "left", "left"]);
log(microTable);

log("\n## Character n-grams against words only (demo support topics; each model in fresh processes, interleaved)");
const charGrams: CharGramSpeed = await runCharGramSpeed(quick ? 3 : 5);
const charGramTable = charGramSpeedMarkdown(charGrams);
log(charGramTable);

log("\n## What compression costs (held-out test parts)");
const spam = splitSpamAssassin(loadSpamAssassin());
const topics = await supportTopicsSplit();
const compression: CompressionRow[] = [
  ...(await runCompression("SpamAssassin", spam.train, spam.test, 256 * 1024)),
  ...(await runCompression("support topics", topics.train, topics.test, 128 * 1024)),
];
const compressionTable = markdownTable(
  ["dataset", "model", "bytes", "rows", "accuracy", "macro-F1", "µs/doc", "load ms/MB"],
  compression.map((r) => [r.dataset, r.model, String(r.bytes), String(r.rows), f(r.accuracy, 4), f(r.macroF1, 4), f(r.usPerDoc, 1), f(r.loadMsPerMB, 3)]),
  ["left", "left", "right", "right", "right", "right", "right", "right"],
);
log(compressionTable);
for (const dataset of ["SpamAssassin", "support topics"]) {
  const rows = compression.filter((r) => r.dataset === dataset);
  const draft = rows[0];
  const budget = rows[2];
  log(`${dataset}: compiled ${budget.model} costs ${f((draft.accuracy - budget.accuracy) * 100, 2)} accuracy points and ${f((draft.macroF1 - budget.macroF1) * 100, 2)} macro-F1 points against the draft, at ${f(draft.bytes / budget.bytes, 1)}× smaller`);
}

log("\n## Scale: tree head vs softmax, threads");
const heads: HeadRow[] = await runHeads(quick ? [64, 1000] : [16, 64, 256, 1000]);
const headTable = markdownTable(["labels", "head", "train s", "accuracy"], heads.map((r) => [String(r.labels), r.head, f(r.trainSeconds, 2), f(r.accuracy, 4)]), ["right", "left", "right", "right"]);
log(headTable);
for (const labels of [...new Set(heads.map((h) => h.labels))]) {
  const softmax = heads.find((h) => h.labels === labels && h.head === "softmax") as HeadRow;
  const tree = heads.find((h) => h.labels === labels && h.head === "tree") as HeadRow;
  log(`${labels} labels: tree trains ${f(softmax.trainSeconds / tree.trainSeconds, 1)}× faster, accuracy ${f((tree.accuracy - softmax.accuracy) * 100, 2)} points vs softmax`);
}
const threads: ThreadRow[] = await runThreads(spam.train, quick ? 5 : 10);
const threadTable = markdownTable(["threads", "train s", "tokens/s", "accuracy"], threads.map((r) => [String(r.threads), f(r.trainSeconds, 2), String(Math.round(r.tokensPerSecond)), f(r.accuracy, 4)]), ["right", "right", "right", "right"]);
log(threadTable);
log(`2 threads: ${f(threads[1].tokensPerSecond / threads[0].tokensPerSecond, 2)}× the single-thread throughput (SpamAssassin training part, dims 16, words + pairs)`);

let large: LargeFileResult | null = null;
if (!quick) {
  log("\n## Larger than memory: a 1 GB JSONL file built on disk");
  large = await runLargeFile(1024 ** 3);
  log(`${(large.fileBytes / 1024 ** 3).toFixed(2)} GiB, ${large.lines} lines: built in ${f(large.seconds, 0)} s with peak RSS ${f(large.peakRssMB, 0)} MB (child process), validation accuracy ${f(large.accuracy, 4)}`);
}

let memory: DefaultBuildMemoryResult[] = [];
if (!quick) {
  log("\n## Peak memory of a default build: 100 MB CSV of short texts, 12 labels");
  // The default (which chooses the path from projected memory) against a forced in-memory
  // build, one after the other in child processes; peak RSS from getrusage.
  for (const flags of [[], IN_MEMORY_FLAGS]) {
    const run = await runDefaultBuildMemory(100 * 1024 * 1024, flags);
    memory.push(run);
    log(`${flags.length === 0 ? "default" : flags.join(" ")}: ${run.lines} lines, ${run.onDisk ? "on disk" : "in memory"}, ${f(run.seconds, 0)} s wall, ${f(run.cpuSeconds, 0)} s CPU, peak RSS ${f(run.peakRssMB, 0)} MB (ceiling 2 × input + 300 = ${f(run.ceilingMB, 0)} MB), accuracy ${f(run.accuracy, 4)}`);
  }
  log(describeBuildPathCost(memory[0], memory[1]));
}

log("\n## Side by side");
const comparison: ComparisonRow[] = await runComparison({ quick, log: () => {} });
const sideBySide = comparisonTable(comparison);
log(sideBySide);
for (const line of [...comparisonRatios(comparison), ...comparisonNotes(comparison)]) log(line);

const markdown = [
  `# Sluice benchmarks`,
  "",
  `${new Date().toISOString()} · ${describeMachine(machine)} · command: \`npm run bench${quick ? " -- --quick" : ""}\``,
  "",
  "## Micro-benchmarks",
  microTable,
  "",
  "## Character n-grams against words only",
  charGramTable,
  "",
  "## What compression costs",
  compressionTable,
  "",
  "## Scale",
  headTable,
  "",
  threadTable,
  "",
  ...memory.map((run) => `Default build, 100 MB CSV (${run.lines} short texts, 12 labels)${run.flags.length > 0 ? ` with ${run.flags.join(" ")}` : ""}: ${run.onDisk ? "on disk" : "in memory"}, ${f(run.seconds, 0)} s wall, ${f(run.cpuSeconds, 0)} s CPU, peak RSS ${f(run.peakRssMB, 0)} MB (ceiling ${f(run.ceilingMB, 0)} MB).`),
  ...(memory.length === 2 ? [`Default build: ${describeBuildPathCost(memory[0], memory[1])}.`] : []),
  "",
  large ? `Larger than memory: ${(large.fileBytes / 1024 ** 3).toFixed(2)} GiB JSONL built on disk in ${f(large.seconds, 0)} s, peak RSS ${f(large.peakRssMB, 0)} MB.` : "Larger than memory: skipped (--quick).",
  "",
  "## Side by side",
  sideBySide,
  "",
  ...comparisonRatios(comparison),
  "",
  ...comparisonNotes(comparison),
  "",
].join("\n");
const written = writeResults(quick ? "bench-quick" : "bench", { machine, date: new Date().toISOString(), quick, micro, charGrams, compression, heads, threads, memory, large, comparison }, markdown);
log(`\nwrote ${written.json} and ${written.markdown}`);
