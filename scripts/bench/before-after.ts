// Before/after on one machine: this checkout against an earlier one (a `git worktree add
// --detach DIR COMMIT` with its own `npm ci`), on the demo support topics. Each checkout
// builds the same training part with the same fixed settings (words only, and character
// 2-5-grams; no setting search), and each checkout's runtime times classify on the models it
// built, in fresh child processes, interleaved round by round, in CPU µs per call. Prints a
// table and the load. Not a test.
// node --import tsx scripts/bench/before-after.ts --before DIR [--rounds 5] [--build-rounds 3] [--after-flags "--no-fold-evasion"]
// --after-flags adds build flags on this side only, e.g. to read text as an earlier
// normalization did, so the two sides build the same features.
import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { loadavg, tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { textOfTokens } from "../../compiler/evaluate/measure-latency.ts";
import { loadModel } from "../../runtime/index.ts";
import { integerFlag } from "../load-options.ts";
import { supportTopicsSplit } from "./support-topics-split.ts";
import { median } from "./timing.ts";

const beforeIndex = process.argv.indexOf("--before");
if (beforeIndex < 0) throw new Error("--before DIR: a checkout of the earlier commit, with node_modules installed");
const checkouts = { before: resolve(process.argv[beforeIndex + 1]), after: resolve(new URL("../..", import.meta.url).pathname) };
const rounds = integerFlag("--rounds", 5, 20);
const buildRounds = integerFlag("--build-rounds", 3, 20);
const afterFlagsIndex = process.argv.indexOf("--after-flags");
const sideFlags: Record<string, string[]> = { before: [], after: afterFlagsIndex < 0 ? [] : process.argv[afterFlagsIndex + 1].split(" ").filter(Boolean) };
const MODELS = [
  ["words only", ["--char-span", "0"]],
  ["char 2-5", ["--char-span", "2-5"]],
] as const;

// The child: loads one checkout's runtime and times classify (median of 15 windows of 20 ms,
// CPU time of the process), for a 20-token and a 300-token text and the held-out texts in turn.
const CHILD = `
const [runtimePath, modelPath, textsPath] = process.argv.slice(-3);
const { loadModel } = await import(runtimePath);
const { readFileSync } = await import("node:fs");
const model = loadModel(new Uint8Array(readFileSync(modelPath)));
const texts = JSON.parse(readFileSync(textsPath, "utf8"));
const cpu = () => { const u = process.cpuUsage(); return u.user + u.system; };
function time(pick) {
  for (let i = 0; i < 2000; i++) model.classify(pick(i));
  const windows = [];
  for (let w = 0; w < 15; w++) {
    const c0 = cpu(), t0 = performance.now();
    let calls = 0;
    do { for (let i = 0; i < 50; i++) model.classify(pick(calls + i)); calls += 50; } while (performance.now() - t0 < 20);
    windows.push((cpu() - c0) / calls);
  }
  windows.sort((a, b) => a - b);
  return windows[7];
}
console.log(JSON.stringify({ short: time(() => texts.short), long: time(() => texts.long), traffic: time((i) => texts.traffic[i % texts.traffic.length]) }));
`;

type Timings = { short: number; long: number; traffic: number };

// Each build's own CPU time (user + system), written by a preloaded exit hook: on a shared
// machine wall time also counts the time other processes held the core.
const CPU_HOOK = `data:text/javascript,process.on("exit",()=>{const u=process.cpuUsage();process.stderr.write("build-cpu-us "+(u.user+u.system)+"\\n")})`;

function buildWith(checkout: string, dataPath: string, flags: readonly string[], out: string): { wall: number; cpu: number } {
  const started = performance.now();
  const args = ["--import", CPU_HOOK, join(checkout, "bin/sluice.js"), "build", dataPath, "--label-field", "topic", "--search-time", "0", ...flags, "--out", out, "--force", "--quiet"];
  const child = spawnSync(process.execPath, args, { cwd: checkout, encoding: "utf8" });
  if (child.status !== 0) throw new Error(`build in ${checkout} failed: ${child.stderr}`);
  const cpu = /build-cpu-us (\d+)/.exec(child.stderr);
  return { wall: (performance.now() - started) / 1000, cpu: cpu === null ? Number.NaN : Number(cpu[1]) / 1e6 };
}

function timeWith(checkout: string, childPath: string, modelPath: string, textsPath: string): Timings {
  const child = spawnSync(process.execPath, ["--import", "tsx", childPath, join(checkout, "runtime/index.ts"), modelPath, textsPath], { cwd: checkout, encoding: "utf8" });
  if (child.status !== 0) throw new Error(`timing in ${checkout} failed: ${child.stderr}`);
  return JSON.parse(child.stdout.trim().split("\n").pop() as string) as Timings;
}

const { train, test } = await supportTopicsSplit();
const directory = mkdtempSync(join(tmpdir(), "sluice-before-after-"));
try {
  const dataPath = join(directory, "train.jsonl");
  writeFileSync(dataPath, train.map((e) => JSON.stringify({ text: e.text, topic: e.labels[0] })).join("\n") + "\n");
  const childPath = join(directory, "child.mjs");
  writeFileSync(childPath, CHILD);
  const loadBefore = loadavg();
  const buildSeconds: Record<string, { wall: number; cpu: number }[]> = {};
  const models: Record<string, string> = {};
  for (let round = 0; round < buildRounds; round++) {
    for (const [name, flags] of MODELS) {
      for (const [side, checkout] of Object.entries(checkouts)) {
        const out = join(directory, `${side}-${name.replace(/\W+/g, "-")}.sluice`);
        (buildSeconds[`${side} ${name}`] ??= []).push(buildWith(checkout, dataPath, [...flags, ...sideFlags[side]], out));
        models[`${side} ${name}`] = out;
      }
    }
  }
  const cutter = loadModel(new Uint8Array(readFileSync(models["after words only"])));
  const pool = test.map((e) => e.text);
  const textsPath = join(directory, "texts.json");
  writeFileSync(textsPath, JSON.stringify({ short: textOfTokens(cutter, pool, 20), long: textOfTokens(cutter, pool.slice(50), 300), traffic: pool }));
  const samples: Record<string, Timings[]> = {};
  for (let round = 0; round < rounds; round++) {
    for (const [name] of MODELS) {
      for (const [side, checkout] of Object.entries(checkouts)) (samples[`${side} ${name}`] ??= []).push(timeWith(checkout, childPath, models[`${side} ${name}`], textsPath));
    }
  }
  const loadAfter = loadavg();
  const f = (n: number) => n.toFixed(2);
  console.log(`before: ${checkouts.before}\nafter:  ${checkouts.after}${sideFlags.after.length > 0 ? ` (build flags ${sideFlags.after.join(" ")})` : ""}\n`);
  console.log(`| model | classify µs, 20 tokens (before → after) | 300 tokens | held-out texts in turn | build s, wall (median of ${buildRounds}) | build s, CPU |`);
  console.log("| --- | ---: | ---: | ---: | ---: | ---: |");
  for (const [name] of MODELS) {
    const before = samples[`before ${name}`];
    const after = samples[`after ${name}`];
    const cell = (key: keyof Timings) => {
      const ratio = median(after.map((t, r) => t[key] / before[r][key]));
      return `${f(median(before.map((t) => t[key])))} → ${f(median(after.map((t) => t[key])))} (${f(ratio)}×)`;
    };
    const build = (key: "wall" | "cpu") => {
      const b = median(buildSeconds[`before ${name}`].map((run) => run[key]));
      const a = median(buildSeconds[`after ${name}`].map((run) => run[key]));
      return `${f(b)} → ${f(a)} (${f(a / b)}×)`;
    };
    console.log(`| ${name} | ${cell("short")} | ${cell("long")} | ${cell("traffic")} | ${build("wall")} | ${build("cpu")} |`);
  }
  console.log(`\nRatios are medians of same-round after/before ratios over ${rounds} rounds. Load average before ${loadBefore.map((l) => l.toFixed(2)).join(" / ")}, after ${loadAfter.map((l) => l.toFixed(2)).join(" / ")}.`);
} finally {
  rmSync(directory, { recursive: true, force: true });
}
