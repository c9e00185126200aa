// One Hogwild training thread (see train-parallel.ts): trains its share of the examples on
// the shared draft and reports progress to the main thread.
//
// Feature rows are updated in shared memory directly (sparse: few collisions). The output
// layer is dense — every step writes all of it — so threads writing it in shared memory
// fight over the same cache lines and run slower together than alone (measured). Each
// thread therefore trains a private copy and adds its change to the shared layer every
// 256 steps, then refreshes its copy: lock-free, and the threads still learn from each other.

import { parentPort, workerData } from "node:worker_threads";
import type { ParallelJob } from "./train-parallel.ts";
import { trainDraft } from "./train-draft.ts";

const job = workerData as ParallelJob;
const sharedOutputs = job.draft.outputs;
const sharedBias = job.draft.bias;
// The output layer's adaptive accumulators stay private to the thread like the layer's copy;
// the rows' accumulators are shared like the rows.
const adaptive = job.draft.adaptive;
const localDraft = { ...job.draft, outputs: Float32Array.from(sharedOutputs), bias: Float32Array.from(sharedBias), adaptive: adaptive ? { rows: adaptive.rows, outputs: Float32Array.from(adaptive.outputs), bias: Float32Array.from(adaptive.bias) } : null };
const outputsAtSync = Float32Array.from(sharedOutputs);
const biasAtSync = Float32Array.from(sharedBias);

function merge(local: Float32Array, atSync: Float32Array, shared: Float32Array): void {
  for (let i = 0; i < local.length; i++) {
    shared[i] += local[i] - atSync[i];
    local[i] = shared[i];
    atSync[i] = local[i];
  }
}

let lastReport = 0;
const result = trainDraft(localDraft, job.data, job.settings, {
  paths: job.paths,
  subset: job.subset,
  onSync: () => {
    merge(localDraft.outputs, outputsAtSync, sharedOutputs);
    merge(localDraft.bias, biasAtSync, sharedBias);
  },
  onProgress: (progress) => {
    const now = Date.now();
    if (now - lastReport < 100) return;
    lastReport = now;
    parentPort?.postMessage({ type: "progress", progress });
  },
});
parentPort?.postMessage({ type: "done", loss: result.finalLoss });
