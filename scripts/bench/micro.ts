// Micro-benchmarks of the hot paths: featurize, classify (20-, 100- and 300-token texts),
// model load, and training throughput on one core. Run alone: node --expose-gc --import tsx scripts/bench/micro.ts
import { build } from "../../compiler/build/build.ts";
import { defaultBuildSettings, type BuildSettings } from "../../compiler/build/build-settings.ts";
import { readExamples } from "../../compiler/read/index.ts";
import { createFeatureBuffer, createFeaturizer, loadModel } from "../../runtime/index.ts";
import { median, quickestWindow, settleHeap, timeBatch, timePerCall } from "./timing.ts";

export interface MicroResult {
  name: string;
  value: number;
  unit: string;
  note?: string;
}

async function supportTopics() {
  const examples = [];
  for await (const e of readExamples("demo-data/support-topics.csv", { textFields: ["subject", "body"], labelField: "topic" })) examples.push(e);
  return examples;
}

/** A text of about `tokens` tokens cut from the demo data (real words, real punctuation). */
function textOfTokens(pool: string[], tokens: number): string {
  const words = pool.join(" ").split(/\s+/);
  return words.slice(0, tokens).join(" ");
}

/** Runs the micro-benchmarks and returns their results. */
export async function runMicro(): Promise<MicroResult[]> {
  const examples = await supportTopics();
  const results: MicroResult[] = [];
  const pool = examples.slice(0, 400).map((e) => e.text);
  const texts = { 20: textOfTokens(pool, 20), 100: textOfTokens(pool.slice(10), 100), 300: textOfTokens(pool.slice(50), 300) };
  const configurations: [string, Partial<BuildSettings>][] = [
    ["words+pairs, dims 16", { dims: 16, charSpan: [0, 0], maxBytes: 0 }],
    ["defaults (words+pairs, TF-IDF, dims 24, logit rows), 128 KB", { maxBytes: 128 * 1024 }],
    ["words+pairs+char 3-4, dims 24, 128 KB", { charSpan: [3, 4], maxBytes: 128 * 1024 }],
  ];
  for (const [label, overrides] of configurations) {
    const settings = { ...defaultBuildSettings(), ...overrides };
    const { bytes, report } = await build({ examples, settings, buildTime: "2026-01-01T00:00:00.000Z" });
    if (overrides.charSpan?.[0] === 0) {
      results.push({ name: `train tokens/s, one core (${label}, softmax, 6 labels)`, value: Math.round(report.tokensPerSecond), unit: "tokens/s" });
    }
    const model = loadModel(bytes);
    settleHeap();
    const featurizer = createFeaturizer(model.meta.featurizer);
    const buffer = createFeatureBuffer();
    for (const tokens of [20, 100, 300] as const) {
      const text = texts[tokens];
      const perCall = timePerCall(() => model.classify(text), 20000, 5000);
      const batch = timeBatch(() => model.classify(text), 50000, 5000);
      results.push({ name: `classify ${tokens}-token text, p50 (${label})`, value: round(perCall.p50), unit: "µs" });
      results.push({ name: `classify ${tokens}-token text, p99 (${label})`, value: round(perCall.p99), unit: "µs" });
      results.push({ name: `classify ${tokens}-token text, batch mean (${label})`, value: round(batch), unit: "µs" });
      results.push({ name: `classify ${tokens}-token text, quickest of 20 windows of 2000 calls (${label})`, value: round(quickestWindow(() => model.classify(text))), unit: "µs", note: "machine-noise floor" });
      results.push({ name: `featurize ${tokens}-token text, batch mean (${label})`, value: round(timeBatch(() => featurizer.featurize(text, buffer), 50000, 5000)), unit: "µs" });
    }
    const loads = Array.from({ length: 5 }, () => timeBatch(() => loadModel(bytes), 200, 20));
    const loadUs = median(loads);
    results.push({ name: `load ${(bytes.length / 1024).toFixed(0)} KB model (${label})`, value: round(loadUs / 1000, 3), unit: "ms", note: `${round(loadUs / 1000 / (bytes.length / 1048576), 3)} ms per MB` });
  }
  // A large model for load speed per MB: float32 hidden rows (no folding), every row.
  const big = await build({ examples, settings: { ...defaultBuildSettings(), precision: "float32", charSpan: [3, 5], dims: 32, maxBytes: 0, foldOutput: false }, buildTime: "2026-01-01T00:00:00.000Z" });
  const bigLoad = median(Array.from({ length: 5 }, () => timeBatch(() => loadModel(big.bytes), 20, 3))) / 1000;
  results.push({ name: `load ${(big.bytes.length / 1048576).toFixed(2)} MB float32 model`, value: round(bigLoad, 3), unit: "ms", note: `${round(bigLoad / (big.bytes.length / 1048576), 3)} ms per MB` });
  return results;
}

function round(value: number, digits = 2): number {
  const f = 10 ** digits;
  return Math.round(value * f) / f;
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const { describeMachine, machineInfo, markdownTable, writeResults } = await import("./results-writer.ts");
  const results = await runMicro();
  for (const r of results) console.log(`${r.name.padEnd(80)} ${String(r.value).padStart(12)} ${r.unit}${r.note ? `  (${r.note})` : ""}`);
  if (process.argv.includes("--write")) {
    const machine = machineInfo();
    const table = markdownTable(["measurement", "value", "unit", "note"], results.map((r) => [r.name, String(r.value), r.unit, r.note ?? ""]), ["left", "right", "left", "left"]);
    const written = writeResults("micro", { machine, date: new Date().toISOString(), results }, `# Sluice micro-benchmarks\n\n${new Date().toISOString()} · ${describeMachine(machine)} · command: \`node --expose-gc --import tsx scripts/bench/micro.ts --write\`\n\n${table}\n`);
    console.log(`wrote ${written.json} and ${written.markdown}`);
  }
}
