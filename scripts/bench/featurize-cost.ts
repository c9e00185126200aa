// What featurizing ordinary text costs, against an earlier checkout: each side's runtime
// featurizes the micro-benchmark's 20- and 300-token demo texts (scripts/bench/micro.ts) with
// the same settings, in fresh child processes, interleaved round by round, in CPU µs per call.
// Sides: the earlier checkout (normalization 1, all it may know), this one at normalization 1,
// 2 (evasion folding) and 3 (folding with every letter run read as one letter). Prints a table
// and the load. Not a test.
// node --import tsx scripts/bench/featurize-cost.ts --before DIR [--rounds 5]
// DIR is a `git worktree add --detach DIR COMMIT` with its own `npm ci`.
import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { loadavg, tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { readExamples } from "../../compiler/read/index.ts";
import { integerFlag } from "../load-options.ts";
import { median } from "./timing.ts";

const beforeIndex = process.argv.indexOf("--before");
if (beforeIndex < 0) throw new Error("--before DIR: a checkout of the earlier commit, with node_modules installed");
const before = resolve(process.argv[beforeIndex + 1]);
const after = resolve(new URL("../..", import.meta.url).pathname);
const rounds = integerFlag("--rounds", 5, 20);

const SETTINGS = [
  ["words + pairs", { wordSpan: 2, charMin: 0, charMax: 0 }],
  ["words + pairs + char 3-4", { wordSpan: 2, charMin: 3, charMax: 4 }],
] as const;
const SIDES = [
  ["before", before, 1],
  ["normalization 1", after, 1],
  ["normalization 2", after, 2],
  ["normalization 3", after, 3],
] as const;

// The child: one checkout's runtime featurizes each text (median of 21 windows of about 25 ms,
// CPU time of the process, after a warm-up).
const CHILD = `
const [runtimePath, settingsJson, textsPath] = process.argv.slice(-3);
const { createFeaturizer, createFeatureBuffer } = await import(runtimePath);
const { readFileSync } = await import("node:fs");
const featurizer = createFeaturizer(JSON.parse(settingsJson));
const buffer = createFeatureBuffer();
const texts = JSON.parse(readFileSync(textsPath, "utf8"));
const cpu = () => { const u = process.cpuUsage(); return u.user + u.system; };
function time(text) {
  for (let i = 0; i < 3000; i++) featurizer.featurize(text, buffer);
  const windows = [];
  for (let w = 0; w < 21; w++) {
    const c0 = cpu(), t0 = performance.now();
    let calls = 0;
    do { for (let i = 0; i < 50; i++) featurizer.featurize(text, buffer); calls += 50; } while (performance.now() - t0 < 25);
    windows.push((cpu() - c0) / calls);
  }
  windows.sort((a, b) => a - b);
  return windows[10];
}
console.log(JSON.stringify(texts.map(time)));
`;

/** A text of about `tokens` tokens cut from the demo data, as micro.ts cuts it. */
function textOfTokens(pool: string[], tokens: number): string {
  return pool.join(" ").split(/\s+/).slice(0, tokens).join(" ");
}

const pool: string[] = [];
for await (const e of readExamples(join(after, "demo-data/support-topics.csv"), { textFields: ["subject", "body"], labelField: "topic" })) {
  if (pool.length < 400) pool.push(e.text);
}
const texts = [textOfTokens(pool, 20), textOfTokens(pool.slice(50), 300)];
const directory = mkdtempSync(join(tmpdir(), "sluice-featurize-cost-"));
try {
  const childPath = join(directory, "child.mjs");
  writeFileSync(childPath, CHILD);
  const textsPath = join(directory, "texts.json");
  writeFileSync(textsPath, JSON.stringify(texts));
  const loadBefore = loadavg();
  const samples: Record<string, number[][]> = {};
  for (let round = 0; round < rounds; round++) {
    for (const [label, shape] of SETTINGS) {
      for (const [side, checkout, normalization] of SIDES) {
        const settings = { normalization, ...shape, hashBits: 20, hashSeed: 0, maxTokens: 2000 };
        const child = spawnSync(process.execPath, ["--import", "tsx", childPath, join(checkout, "runtime/index.ts"), JSON.stringify(settings), textsPath], { cwd: checkout, encoding: "utf8" });
        if (child.status !== 0) throw new Error(`featurizing in ${checkout} failed: ${child.stderr}`);
        (samples[`${label}|${side}`] ??= []).push(JSON.parse(child.stdout.trim().split("\n").pop() as string) as number[]);
      }
    }
  }
  const loadAfter = loadavg();
  const f = (n: number) => n.toFixed(2);
  console.log(`before: ${before}\nafter:  ${after}\n`);
  console.log("| settings | text | before (normalization 1) | after, normalization 1 | after, normalization 2 | after, normalization 3 |");
  console.log("| --- | --- | ---: | ---: | ---: | ---: |");
  for (const [label] of SETTINGS) {
    texts.forEach((_, t) => {
      const base = samples[`${label}|before`];
      const cell = (side: string) => {
        const runs = samples[`${label}|${side}`];
        const ratio = median(runs.map((run, r) => run[t] / base[r][t]));
        return `${f(median(runs.map((run) => run[t])))} µs (${f(ratio)}×)`;
      };
      console.log(`| ${label} | ${t === 0 ? 20 : 300} tokens | ${f(median(base.map((run) => run[t])))} µs | ${cell("normalization 1")} | ${cell("normalization 2")} | ${cell("normalization 3")} |`);
    });
  }
  console.log(`\nCPU µs per featurize call, medians over ${rounds} interleaved rounds; ratios are medians of same-round ratios to "before". Load average before ${loadBefore.map((l) => l.toFixed(2)).join(" / ")}, after ${loadAfter.map((l) => l.toFixed(2)).join(" / ")}.`);
} finally {
  rmSync(directory, { recursive: true, force: true });
}
