// Multi-threaded training: lock-free asynchronous SGD (Hogwild!, Niu, Recht, Ré & Wright,
// NIPS 2011). Every worker thread runs the same SGD loop over its own share of the
// examples, reading and writing the shared parameters (SharedArrayBuffer) without locks.
// Updates are sparse (a few rows per example), so collisions are rare and harmless.
// Unlike one thread, the result depends on thread timing: runs may differ slightly.

import { createRequire } from "node:module";
import { fileURLToPath } from "node:url";
import { Worker } from "node:worker_threads";
import type { Draft } from "./draft.ts";
import type { EncodedExamples } from "./encode.ts";
import type { TreePaths } from "./steps.ts";
import type { TrainProgress, TrainResult, TrainSettings } from "./train-draft.ts";

/** What each worker thread receives (typed arrays over SharedArrayBuffers). */
export interface ParallelJob {
  draft: Draft;
  data: EncodedExamples;
  settings: TrainSettings;
  paths: TreePaths | null;
  subset: Int32Array;
  thread: number;
}

let bundledWorker: string | null | undefined;

/** True when this module runs as compiled JavaScript (the installed package's lib/). */
const COMPILED = import.meta.url.endsWith(".js");

/**
 * Compiled (the installed package): the worker is the sibling train-worker.js, plain Node
 * starts it as is. From the TypeScript sources: the worker's code as one plain-JavaScript
 * bundle (esbuild, once per process), so a thread starts in tens of milliseconds instead of
 * the ~0.3 s the TypeScript loader needs; the loader entry when esbuild cannot be used.
 */
function startWorker(job: ParallelJob): Worker {
  if (COMPILED) return new Worker(new URL("./train-worker.js", import.meta.url), { workerData: job });
  if (bundledWorker === undefined) {
    try {
      const require = createRequire(import.meta.url);
      const esbuild = require("esbuild") as typeof import("esbuild");
      const result = esbuild.buildSync({
        entryPoints: [fileURLToPath(new URL("./train-worker.ts", import.meta.url))],
        bundle: true,
        platform: "node",
        format: "cjs",
        target: "node20",
        write: false,
        logLevel: "silent",
      });
      bundledWorker = result.outputFiles[0].text;
    } catch {
      bundledWorker = null;
    }
  }
  if (bundledWorker !== null) return new Worker(bundledWorker, { eval: true, workerData: job });
  return new Worker(new URL("./train-worker-entry.mjs", import.meta.url), { workerData: job });
}

/** Copies a typed array into shared memory (workers then read it without a copy each). */
function shared<T extends Uint32Array | Int32Array | Float32Array>(array: T): T {
  if (array.buffer instanceof SharedArrayBuffer) return array;
  const Constructor = array.constructor as { new (buffer: SharedArrayBuffer): T };
  const copy = new Constructor(new SharedArrayBuffer(array.byteLength));
  copy.set(array as never);
  return copy;
}

/**
 * Trains `draft` in place with `threads` worker threads. The draft's rows, outputs and
 * bias must live in SharedArrayBuffers (createDraft with `shared: true`).
 * @example await trainParallel(draft, encoded, { epochs: 5, learningRate: 0.5, seed: 1 }, 2, null, () => {})
 */
export async function trainParallel(
  draft: Draft,
  data: EncodedExamples,
  settings: TrainSettings,
  threads: number,
  paths: TreePaths | null,
  onProgress: (progress: TrainProgress) => void,
): Promise<TrainResult> {
  for (const array of [draft.rows, draft.outputs, draft.bias]) {
    if (!(array.buffer instanceof SharedArrayBuffer)) throw new Error("trainParallel: the draft must be created with shared: true");
  }
  const sharedData: EncodedExamples = {
    ...data,
    offsets: shared(data.offsets),
    features: shared(data.features),
    labelOffsets: shared(data.labelOffsets),
    labelList: shared(data.labelList),
  };
  const started = performance.now();
  const progressByThread = new Float64Array(threads);
  const lossByThread = new Float64Array(threads);
  const runs: Promise<{ loss: number }>[] = [];
  for (let thread = 0; thread < threads; thread++) {
    // Strided shares keep every label spread over all threads.
    const subset = Int32Array.from({ length: Math.ceil((data.count - thread) / threads) }, (_, i) => thread + i * threads);
    const job: ParallelJob = { draft, data: sharedData, settings: { ...settings, seed: (settings.seed + 7919 * thread) >>> 0 }, paths, subset, thread };
    runs.push(
      new Promise((resolve, reject) => {
        const worker = startWorker(job);
        worker.on("message", (message: { type: string; progress?: TrainProgress; loss?: number }) => {
          if (message.type === "progress" && message.progress) {
            progressByThread[thread] = message.progress.done;
            lossByThread[thread] = message.progress.loss;
            const done = progressByThread.reduce((a, b) => a + b, 0) / threads;
            const seconds = (performance.now() - started) / 1000;
            onProgress({
              ...message.progress,
              done,
              loss: lossByThread.reduce((a, b) => a + b, 0) / threads,
              tokensPerSecond: (done * settings.epochs * data.tokenTotal) / Math.max(seconds, 1e-9),
              etaSeconds: done > 0 ? (seconds / done) * (1 - done) : 0,
            });
          } else if (message.type === "done") resolve({ loss: message.loss ?? 0 });
        });
        worker.on("error", reject);
        worker.on("exit", (code) => {
          if (code !== 0) reject(new Error(`training thread ${thread} exited with code ${code}`));
        });
      }),
    );
  }
  const results = await Promise.all(runs);
  const seconds = (performance.now() - started) / 1000;
  return {
    seconds,
    tokensPerSecond: (settings.epochs * data.tokenTotal) / Math.max(seconds, 1e-9),
    finalLoss: results.reduce((a, r) => a + r.loss, 0) / results.length,
  };
}
