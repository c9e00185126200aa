// The Sluice rows of the comparison: compiled, draft and size-budget builds, timed with the
// same single-call loop as the other JS systems.

import { build } from "../../compiler/build/build.ts";
import { defaultBuildSettings, type BuildSettings } from "../../compiler/build/build-settings.ts";
import { loadModel } from "../../runtime/index.ts";
import { emptyRow, scorePredictions, type ComparisonRow, type Dataset, type Plan, type SystemRole } from "./comparison-rows.ts";
import { medianMilliseconds, timeSingleCalls } from "./single-call-timing.ts";
import { settleHeap } from "./timing.ts";

/** Fixed so that builds are reproducible (it is only recorded in provenance). */
const BUILD_TIME = "2000-01-01T00:00:00.000Z";

export async function sluiceRow(dataset: Dataset, plan: Plan, system: string, role: SystemRole, settings: BuildSettings): Promise<ComparisonRow> {
  const row = emptyRow(dataset, system, role, settings.threads);
  const started = performance.now();
  const { bytes, report } = await build({ examples: dataset.train, settings, buildTime: BUILD_TIME });
  row.trainSeconds = (performance.now() - started) / 1000;
  const model = loadModel(bytes);
  settleHeap();
  const { timings, firstPass } = timeSingleCalls((text) => model.classify(text)[0]?.label ?? "", dataset.test.map((e) => e.text), plan.timing);
  Object.assign(row, scorePredictions(dataset, firstPass));
  row.classify = timings;
  row.modelBytes = bytes.length;
  loadModel(bytes); // warm-up
  const load = medianMilliseconds(() => loadModel(bytes), plan.loadRepeats, 30_000);
  row.loadMs = load.median;
  row.details = {
    settings: { dims: settings.dims, wordSpan: settings.wordSpan, charSpan: settings.charSpan, hashBits: settings.hashBits, weighting: settings.weighting, epochs: settings.epochs, precision: settings.precision, foldOutput: settings.foldOutput, fineTuneEpochs: settings.fineTuneEpochs, maxBytes: settings.maxBytes, holdout: settings.holdout },
    draftTrainSeconds: report.trainSeconds,
    stageSeconds: report.stageSeconds,
    tokensPerSecond: report.tokensPerSecond,
    trainedOn: report.trainExamples,
    rows: report.rows,
    reportDraft: report.draft,
    reportCompiledOnValidation: report.compiled,
    loadRepeats: load.repeats,
  };
  return row;
}

export async function sluiceRows(dataset: Dataset, plan: Plan, log: (line: string) => void): Promise<ComparisonRow[]> {
  const rows: ComparisonRow[] = [];
  for (const threads of plan.threads) {
    const base = { ...defaultBuildSettings(), threads };
    const label = threads === 1 ? "1 thread" : `${threads} threads`;
    log(`  Sluice compiled, ${label}`);
    rows.push(await sluiceRow(dataset, plan, `Sluice compiled int8 (${label})`, "sluice-compiled", base));
    // The draft as a file: float32, every row, its own output layer (not folded), no fine-tune, no byte budget.
    log(`  Sluice draft, ${label}`);
    rows.push(await sluiceRow(dataset, plan, `Sluice draft float32 (${label})`, "sluice-draft", { ...base, precision: "float32", keepFeatures: 0, fineTuneEpochs: 0, maxBytes: 0, foldOutput: false }));
  }
  log(`  Sluice compiled, --max-bytes ${dataset.budgetText}`);
  rows.push(await sluiceRow(dataset, plan, `Sluice compiled int8, max-bytes ${dataset.budgetText} (1 thread)`, "sluice-budget", { ...defaultBuildSettings(), threads: 1, maxBytes: dataset.budgetBytes }));
  return rows;
}
