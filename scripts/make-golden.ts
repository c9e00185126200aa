// Writes test/fixtures/golden/tiny-v3-n3.sluice, the golden file of the current format version and
// normalization rules, pinned by test/runtime/format/golden-model.test.ts. Run only when the format
// version or the normalization version changes (then rename the output and keep the older files:
// the loader must keep reading them, and featurize their texts exactly as before):
//   npm run golden
// tiny.sluice is the version 1 file this script wrote before version 2 existed, tiny-v2.sluice the
// version 2 file it wrote before version 3, tiny-v3.sluice the version 3 file with normalization 1
// it wrote before normalization 2 (evasion folding), tiny-v3-n2.sluice the one with normalization 2
// it wrote before normalization 3 (without the two examples marked below); all are kept as they are.
import { writeFileSync } from "node:fs";
import { build } from "../compiler/build/build.ts";
import { defaultBuildSettings } from "../compiler/build/build-settings.ts";

const examples = [
  { text: "refund my payment please", labels: ["billing"] },
  { text: "charged twice on my card", labels: ["billing"] },
  { text: "invoice amount is wrong", labels: ["billing"] },
  { text: "where is my parcel", labels: ["shipping"] },
  { text: "parcel tracking has not moved", labels: ["shipping"] },
  { text: "delivery is late again", labels: ["shipping"] },
  // Version 3: unspaced scripts split into one token per letter (配送 = delivery, 返金 = refund).
  { text: "配送が遅れています", labels: ["shipping"] },
  { text: "返金してください", labels: ["billing"] },
  // Normalization 3: words with a doubled letter, which read as one letter ("account" as "acount").
  { text: "my account was billed twice", labels: ["billing"] },
  { text: "the parcel is still missing", labels: ["shipping"] },
];
// Every setting the file depends on is spelled out, so the script reproduces it whatever the defaults become.
const settings = { ...defaultBuildSettings(), weighting: "mean" as const, dims: 4, hashBits: 12, charSpan: [0, 0] as [number, number], epochs: 20, holdout: 0, calibrate: false, minDocs: 1, fineTuneEpochs: 1, unspacedScripts: true, foldEvasion: true, searchTime: 0 };
const { bytes } = await build({ examples, settings, buildTime: "2026-01-01T00:00:00.000Z", dataName: "golden-inline" });
writeFileSync(new URL("../test/fixtures/golden/tiny-v3-n3.sluice", import.meta.url), bytes);
console.log(`wrote test/fixtures/golden/tiny-v3-n3.sluice (${bytes.length} bytes)`);
