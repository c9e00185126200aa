// Multi-threaded training arrives with the scale work; until then more than one thread is refused clearly.
import type { Draft } from "./draft.ts";
import type { EncodedExamples } from "./encode.ts";
import type { TreePaths } from "./steps.ts";
import type { TrainProgress, TrainResult, TrainSettings } from "./train-draft.ts";

export async function trainParallel(_draft: Draft, _data: EncodedExamples, _settings: TrainSettings, threads: number, _paths: TreePaths | null, _onProgress: (p: TrainProgress) => void): Promise<TrainResult> {
  throw new Error(`--threads ${threads}: multi-threaded training is not available in this version; use --threads 1`);
}
