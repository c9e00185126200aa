// One model timed in a process of its own, in CPU µs (so neither the JIT's state nor the heap of another
// model or of the build colours the number): prints one JSON line of µs per classify call.
// node --import tsx scripts/bench/classify-timing-child.ts <model.sluice> <texts.json> [straightforward]
// texts.json: { short: string, long: string, traffic: string[] }.
import { readFileSync } from "node:fs";
import { cpuMicroseconds, measureClassifyMicroseconds } from "../../compiler/evaluate/measure-latency.ts";
import { loadModel } from "../../runtime/index.ts";

const [modelPath, textsPath, mode] = process.argv.slice(2);
const model = loadModel(new Uint8Array(readFileSync(modelPath)));
if (mode === "straightforward") model.wordCache = null; // every feature of every word looked up on each call
const texts = JSON.parse(readFileSync(textsPath, "utf8")) as { short: string; long: string; traffic: string[] };
const options = { windowMs: 20, windows: 15 };

/** Median over windows of the mean CPU µs per call when cycling through many different texts (as measureClassifyMicroseconds times one). */
function trafficMicroseconds(pool: readonly string[]): number {
  for (const text of pool) model.classify(text); // one pass to warm up (and fill the word cache, as traffic would)
  const windows: number[] = [];
  for (let w = 0; w < options.windows; w++) {
    const cpuStarted = cpuMicroseconds();
    const started = performance.now();
    let calls = 0;
    do {
      for (let i = 0; i < 50; i++) model.classify(pool[(calls + i) % pool.length]);
      calls += 50;
    } while (performance.now() - started < options.windowMs);
    windows.push((cpuMicroseconds() - cpuStarted) / calls);
  }
  windows.sort((a, b) => a - b);
  return windows[windows.length >> 1];
}

const result = {
  short: measureClassifyMicroseconds(model, texts.short, options),
  long: measureClassifyMicroseconds(model, texts.long, options),
  traffic: trafficMicroseconds(texts.traffic),
  misses: model.wordCache?.misses ?? 0,
};
process.stdout.write(`${JSON.stringify(result)}\n`);
