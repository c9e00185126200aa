// The long mutation fuzz run: `npm run fuzz [-- --count N --seed S]` mutates each demo model
// (built when missing) and each golden file N times (default 20,000) and checks that every
// mutant is refused with a coded error or loads, scores finite numbers, decides and explains
// without throwing (test/runtime/format/model-mutations.ts). Prints counts per model and
// mutation kind, and every violation; exits 1 when there is one. The suite runs 5,000 per model.

import { readFileSync } from "node:fs";
import { DEMO_CANDIDATE_MODEL_PATH, DEMO_ROUTING_MODEL_PATH, ensureDemoModel } from "./demo-model.ts";
import { checkMutatedModel, mutationsOf, type MutationKind } from "../test/runtime/format/model-mutations.ts";

const argument = (name: string, fallback: number): number => {
  const at = process.argv.indexOf(name);
  return at < 0 ? fallback : Number(process.argv[at + 1]);
};
const count = argument("--count", 20_000);
const seed = argument("--seed", 2026);

const files: [string, string][] = [
  ["demo contact-form (moderation)", ensureDemoModel()],
  ["demo support-topics (routing)", DEMO_ROUTING_MODEL_PATH],
  ["demo candidate (shadow)", DEMO_CANDIDATE_MODEL_PATH],
  ["golden tiny.sluice (v1)", new URL("../test/fixtures/golden/tiny.sluice", import.meta.url).pathname],
  ["golden tiny-v2.sluice (v2)", new URL("../test/fixtures/golden/tiny-v2.sluice", import.meta.url).pathname],
  ["golden tiny-v3.sluice (v3)", new URL("../test/fixtures/golden/tiny-v3.sluice", import.meta.url).pathname],
  ["golden tiny-v3-n2.sluice (v3, normalization 2)", new URL("../test/fixtures/golden/tiny-v3-n2.sluice", import.meta.url).pathname],
  ["golden tiny-v3-n3.sluice (v3, normalization 3)", new URL("../test/fixtures/golden/tiny-v3-n3.sluice", import.meta.url).pathname],
];

let violations = 0;
for (const [name, path] of files) {
  const file = new Uint8Array(readFileSync(path));
  const started = performance.now();
  const tally = new Map<MutationKind, { refused: number; loaded: number }>();
  let index = 0;
  for (const { kind, bytes } of mutationsOf(file, count, seed)) {
    const counts = tally.get(kind) ?? { refused: 0, loaded: 0 };
    tally.set(kind, counts);
    try {
      counts[checkMutatedModel(bytes)]++;
    } catch (error) {
      violations++;
      console.log(`  VIOLATION ${name} mutation ${index} (${kind}): ${(error as Error).message}`);
    }
    index++;
  }
  const seconds = ((performance.now() - started) / 1000).toFixed(1);
  const totals = [...tally.values()].reduce((a, b) => ({ refused: a.refused + b.refused, loaded: a.loaded + b.loaded }), { refused: 0, loaded: 0 });
  console.log(`${name}: ${count} mutations (seed ${seed}, ${file.length} bytes) in ${seconds} s: ${totals.refused} refused with a coded error, ${totals.loaded} loaded and scored finite`);
  for (const [kind, counts] of tally) console.log(`  ${kind.padEnd(15)} refused ${String(counts.refused).padStart(6)}  loaded ${String(counts.loaded).padStart(6)}`);
}
console.log(violations === 0 ? "0 violations: no crash after load, no non-finite score, no throwing decide" : `${violations} violations`);
process.exitCode = violations === 0 ? 0 : 1;
