// The last check of a build: the written bytes score like the model that was measured.

import { loadModel } from "../../runtime/format/load-model.ts";
import type { HeadKind } from "../../runtime/format/model-header.ts";
import type { Model } from "../../runtime/model/model.ts";

/** The written bytes load and score exactly like the model that was measured. */
export function verifyRoundTrip(bytes: Uint8Array, measured: Model, texts: string[], head: HeadKind): void {
  const reloaded = loadModel(bytes);
  for (const text of texts) {
    const a = measured.score(text).scores;
    const b = reloaded.score(text).scores;
    for (let k = 0; k < a.length; k++) {
      if (Math.abs(a[k] - b[k]) > 1e-6) throw new Error(`verification failed: the written ${head} model scores differently from the measured one`);
    }
  }
}
