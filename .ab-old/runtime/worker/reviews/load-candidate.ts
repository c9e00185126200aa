// The shadow candidate is a second model file bundled beside the live one. A zero-byte file
// means there is none. A candidate that does not load is logged and left out: it never
// answers a request, so it must never stop the Worker from starting.

import { loadModel } from "../../index.ts";
import type { Model } from "../../index.ts";

/**
 * The candidate model, or null when there is none or it cannot be loaded.
 * @example const candidate = loadCandidate(candidateBytes) // Model | null
 */
export function loadCandidate(bytes: ArrayBuffer | Uint8Array): Model | null {
  if (bytes.byteLength === 0) return null;
  try {
    return loadModel(bytes);
  } catch (error) {
    console.error(`sluice: the bundled candidate model cannot be loaded, shadow scoring is off: ${(error as Error).message}`);
    return null;
  }
}
