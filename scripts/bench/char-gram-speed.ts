// Character n-grams against words only, on the demo support topics (subject + body → topic,
// 80/20 by CSV line as in bench.ts): classify µs for a 20-token and a 300-token held-out text
// and over the 1,200 held-out texts in turn, each model timed in fresh child processes, the two
// interleaved for several rounds (one process can time the same code up to 1.8× apart,
// depending on what ran before), plus build and training time per feature from one build of
// each. Also the character model with its word cache off (the straightforward path: every
// feature of every word looked up on every call), which is what a text of all-new words costs.
// Run alone: node --expose-gc --import tsx scripts/bench/char-gram-speed.ts [--write]
import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { loadavg, tmpdir } from "node:os";
import { join } from "node:path";
import { build } from "../../compiler/build/build.ts";
import { featurizerSettingsOf } from "../../compiler/build/base-header.ts";
import { defaultBuildSettings, type BuildSettings } from "../../compiler/build/build-settings.ts";
import { textOfTokens } from "../../compiler/evaluate/measure-latency.ts";
import { buildVocabulary, encodeTexts, mapToRows } from "../../compiler/train/encode.ts";
import { createFeaturizer, loadModel } from "../../runtime/index.ts";
import { median } from "./timing.ts";
import { supportTopicsSplit } from "./support-topics-split.ts";

/** One model's numbers. */
export interface CharGramModelRow {
  model: string;
  bytes: number;
  rows: number;
  buildSeconds: number;
  trainSeconds: number;
  /** Features per training example (after min-docs), the work of one training step. */
  featuresPerExample: number;
  /** Training µs per feature and epoch. */
  trainMicrosecondsPerFeature: number;
  /** Medians over rounds, µs per classify call. */
  short: number;
  long: number;
  traffic: number;
  /** The same model with its word cache off (character models only). */
  straightforward: { short: number; long: number; traffic: number } | null;
}

export interface CharGramSpeed {
  rounds: number;
  shortTokens: number;
  longTokens: number;
  trafficTexts: number;
  loadBefore: number[];
  loadAfter: number[];
  rows: CharGramModelRow[];
  /** Per round, character / words-only time, then the median over rounds. */
  ratios: { short: number; long: number; traffic: number };
}

const CONFIGURATIONS: [string, Partial<BuildSettings>][] = [
  ["words only (--char-span 0)", { charSpan: [0, 0] }],
  ["char 2-5 (--char-span 2-5)", { charSpan: [2, 5] }],
];

type Timings = { short: number; long: number; traffic: number };

function timeInChild(modelPath: string, textsPath: string, straightforward: boolean): Timings {
  const child = spawnSync(process.execPath, ["--import", "tsx", "scripts/bench/classify-timing-child.ts", modelPath, textsPath, ...(straightforward ? ["straightforward"] : [])], { encoding: "utf8" });
  if (child.status !== 0) throw new Error(`classify-timing-child failed: ${child.stderr}`);
  return JSON.parse(child.stdout.trim().split("\n").pop() as string) as Timings;
}

/** Builds both models, then times them in child processes, interleaved, for `rounds` rounds. */
export async function runCharGramSpeed(rounds = 5): Promise<CharGramSpeed> {
  const { train, test } = await supportTopicsSplit();
  const directory = mkdtempSync(join(tmpdir(), "sluice-char-speed-"));
  try {
    const built: { name: string; path: string; row: Omit<CharGramModelRow, "short" | "long" | "traffic" | "straightforward"> }[] = [];
    for (const [name, overrides] of CONFIGURATIONS) {
      // Fixed settings (no search), so the two differ only in character n-grams.
      const settings: BuildSettings = { ...defaultBuildSettings(), searchTime: 0, ...overrides };
      const started = performance.now();
      const { bytes, report } = await build({ examples: train, settings, buildTime: "2026-01-01T00:00:00.000Z" });
      const buildSeconds = (performance.now() - started) / 1000;
      const path = join(directory, `${built.length}.sluice`);
      writeFileSync(path, bytes);
      // The features one training step sees: the training part's texts, mapped to kept slots
      // (the build trains on its own split of `train`, nine tenths of it; the per-example
      // count is what matters).
      const featurizer = createFeaturizer(featurizerSettingsOf(settings));
      const encoded = encodeTexts(featurizer, train.map((e) => e.text), train.map(() => [0]));
      const mapped = mapToRows(encoded, buildVocabulary(encoded, settings.hashBits, settings.minDocs).slots, settings.hashBits);
      const featuresPerExample = mapped.features.length / mapped.count;
      const trainCount = report.trainExamples;
      built.push({
        name,
        path,
        row: {
          model: name,
          bytes: bytes.length,
          rows: loadModel(bytes).meta.rowCount,
          buildSeconds,
          trainSeconds: report.trainSeconds,
          featuresPerExample,
          trainMicrosecondsPerFeature: (report.trainSeconds * 1e6) / (settings.epochs * trainCount * featuresPerExample),
        },
      });
    }
    const cutter = loadModel(new Uint8Array(readFileSync(built[0].path)));
    const pool = test.map((e) => e.text);
    const texts = { short: textOfTokens(cutter, pool, 20), long: textOfTokens(cutter, pool.slice(50), 300), traffic: pool };
    const textsPath = join(directory, "texts.json");
    writeFileSync(textsPath, JSON.stringify(texts));
    const loadBefore = loadavg();
    const samples = built.map(() => [] as Timings[]);
    const straightforward: Timings[] = [];
    for (let round = 0; round < rounds; round++) {
      built.forEach((model, i) => samples[i].push(timeInChild(model.path, textsPath, false)));
      straightforward.push(timeInChild(built[1].path, textsPath, true));
    }
    const loadAfter = loadavg();
    const medianOf = (list: Timings[], key: keyof Timings) => median(list.map((t) => t[key]));
    const rows: CharGramModelRow[] = built.map((model, i) => ({
      ...model.row,
      short: medianOf(samples[i], "short"),
      long: medianOf(samples[i], "long"),
      traffic: medianOf(samples[i], "traffic"),
      straightforward: i === 1 ? { short: medianOf(straightforward, "short"), long: medianOf(straightforward, "long"), traffic: medianOf(straightforward, "traffic") } : null,
    }));
    const ratioOf = (key: keyof Timings) => median(samples[1].map((t, r) => t[key] / samples[0][r][key]));
    const tokensOf = (text: string) => cutter.score(text).tokenCount;
    return { rounds, shortTokens: tokensOf(texts.short), longTokens: tokensOf(texts.long), trafficTexts: texts.traffic.length, loadBefore, loadAfter, rows, ratios: { short: ratioOf("short"), long: ratioOf("long"), traffic: ratioOf("traffic") } };
  } finally {
    rmSync(directory, { recursive: true, force: true });
  }
}

const f = (value: number, digits = 2) => value.toFixed(digits);

/** The results as markdown: one table of times, one of build and training costs, the ratios and the load. */
export function charGramSpeedMarkdown(result: CharGramSpeed): string {
  const [words, chars] = result.rows;
  const off = chars.straightforward as NonNullable<CharGramModelRow["straightforward"]>;
  const line = (label: string, key: "short" | "long" | "traffic") => [label, f(words[key]), f(chars[key]), `${f(chars[key] / words[key])}×`, f(off[key]), `${f(off[key] / words[key])}×`];
  const times = [
    "| classify, µs per call (median of rounds) | words only | char 2-5 | char / words | char 2-5, word cache off | off / words |",
    "| --- | ---: | ---: | ---: | ---: | ---: |",
    ...[line(`${result.shortTokens}-token text, repeated`, "short"), line(`${result.longTokens}-token text, repeated`, "long"), line(`${result.trafficTexts} held-out texts in turn`, "traffic")].map((cells) => `| ${cells.join(" | ")} |`),
  ];
  const costs = [
    "| model | bytes | rows | build s | train s | features per example | train µs per feature-epoch |",
    "| --- | ---: | ---: | ---: | ---: | ---: | ---: |",
    ...result.rows.map((r) => `| ${r.model} | ${r.bytes} | ${r.rows} | ${f(r.buildSeconds)} | ${f(r.trainSeconds)} | ${f(r.featuresPerExample, 1)} | ${f(r.trainMicrosecondsPerFeature, 4)} |`),
  ];
  return [
    ...times,
    "",
    `Same-round ratios, char 2-5 / words only (median of ${result.rounds} rounds, each model in a fresh process, interleaved): ${f(result.ratios.short)}× at ${result.shortTokens} tokens, ${f(result.ratios.long)}× at ${result.longTokens} tokens, ${f(result.ratios.traffic)}× over the held-out texts. Load average before ${result.loadBefore.map((x) => f(x)).join(" / ")}, after ${result.loadAfter.map((x) => f(x)).join(" / ")} (1 / 5 / 15 min).`,
    "",
    ...costs,
  ].join("\n");
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const { describeMachine, machineInfo, writeResults } = await import("./results-writer.ts");
  const result = await runCharGramSpeed(Number(process.argv.find((a) => a.startsWith("--rounds="))?.slice(9) ?? 5));
  const markdown = charGramSpeedMarkdown(result);
  console.log(markdown);
  if (process.argv.includes("--write")) {
    const machine = machineInfo();
    const written = writeResults("char-grams", { machine, date: new Date().toISOString(), result }, `${new Date().toISOString()} · ${describeMachine(machine)} · command: \`node --expose-gc --import tsx scripts/bench/char-gram-speed.ts --write\`\n\n${markdown}\n`);
    console.log(`wrote ${written.json} and ${written.markdown}`);
  }
}
