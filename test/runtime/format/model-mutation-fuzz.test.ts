// Seeded mutation fuzzing of whole model files: 5,000 mutations of each demo model and each
// golden file (bit flips, byte edits, truncations, splices, directory edits, stray bytes,
// header-field and policy edits, nearly all with a recomputed CRC-32). Each mutant must be
// refused with a coded ModelFormatError, or load, give finite scores in [0, 1], decide without
// failing closed and explain without throwing. `npm run fuzz` runs 20,000 per model.
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { DEMO_CANDIDATE_MODEL_PATH, DEMO_ROUTING_MODEL_PATH, ensureDemoModel } from "../../../scripts/demo-model.ts";
import { checkMutatedModel, mutationsOf } from "./model-mutations.ts";

const MUTATIONS_PER_MODEL = 5000;
const SEED = 17;

const files: [string, () => string][] = [
  ["the demo moderation model", () => ensureDemoModel()],
  ["the demo routing model", () => (ensureDemoModel(), DEMO_ROUTING_MODEL_PATH)],
  ["the version 1 golden file", () => new URL("../../fixtures/golden/tiny.sluice", import.meta.url).pathname],
  ["the demo shadow candidate (today's defaults, normalization 3)", () => (ensureDemoModel(), DEMO_CANDIDATE_MODEL_PATH)],
  ["the version 2 golden file", () => new URL("../../fixtures/golden/tiny-v2.sluice", import.meta.url).pathname],
  ["the version 3 golden file", () => new URL("../../fixtures/golden/tiny-v3.sluice", import.meta.url).pathname],
  ["the version 3 golden file with normalization 2", () => new URL("../../fixtures/golden/tiny-v3-n2.sluice", import.meta.url).pathname],
  ["the version 3 golden file with normalization 3", () => new URL("../../fixtures/golden/tiny-v3-n3.sluice", import.meta.url).pathname],
];

describe.each(files)("mutations of %s", (_name, pathOf) => {
  it(`should refuse or safely load each of ${MUTATIONS_PER_MODEL} seeded mutants`, () => {
    const file = new Uint8Array(readFileSync(pathOf()));
    const violations: string[] = [];
    let loaded = 0;
    let index = 0;
    for (const { kind, bytes } of mutationsOf(file, MUTATIONS_PER_MODEL, SEED)) {
      try {
        if (checkMutatedModel(bytes) === "loaded") loaded++;
      } catch (error) {
        violations.push(`mutation ${index} (${kind}): ${(error as Error).message}`);
      }
      index++;
    }
    expect(violations).toEqual([]);
    // Both outcomes must occur, or the mutations would not be exercising the loader.
    expect(loaded).toBeGreaterThan(MUTATIONS_PER_MODEL / 20);
    expect(loaded).toBeLessThan(MUTATIONS_PER_MODEL);
  }, 600_000); // about 3 s per model on an idle 2-core machine; the limit allows a busy one
});
