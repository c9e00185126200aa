// `sluice tune`: search build settings for the best *compiled* model under a time, size and
// latency budget. Successive halving (Jamieson & Talwalkar, "Non-stochastic Best Arm
// Identification and Hyperparameter Optimization", AISTATS 2016), in brackets as in
// Hyperband (Li et al., JMLR 2017) with η = 3: nine random settings train on 1/9 of the
// training data, the best three on 1/3, the best one on all of it; brackets repeat until the
// time is spent. The default settings are always scored at full size first, so the result
// is never worse than them on the same validation data.

import { loadModel } from "../../runtime/format/load-model.ts";
import { build } from "../build/build.ts";
import type { BuildSettings } from "../build/build-settings.ts";
import type { LabelledText } from "../evaluate/evaluate.ts";
import { createRandom } from "../train/random.ts";
import { stratifiedSplit } from "../train/split.ts";
import { microsecondsPerDoc, scoreModel, type TuneMetric } from "./objective.ts";
import { baselineSettings, sampleSettings, sizeFloor } from "./search-space.ts";
import { defaultTuneSeconds } from "./tune-defaults.ts";

export interface TuneOptions {
  examples: readonly LabelledText[];
  /** Fixed choices (head, size budget, seed, policy targets) the search builds on. */
  base: BuildSettings;
  /** Time budget; undefined = a multiple of the default build's time (see tune-budget.ts). */
  timeSeconds?: number;
  /** Stop after this many trials even when time is left (makes runs reproducible). */
  maxTrials?: number;
  maxMicroseconds?: number;
  metric: TuneMetric;
  seed: number;
  onTrial?: (trial: TrialResult, state: TuneState) => void;
}

export interface TrialResult {
  id: number;
  settings: BuildSettings;
  /** Fraction of the training part this trial trained on. */
  resource: number;
  score: number;
  bytes: number;
  microsecondsPerDoc: number;
  seconds: number;
  /** False when it broke the latency budget (it is then never chosen). */
  withinBudget: boolean;
  baseline: boolean;
}

export interface TuneState {
  trials: number;
  best: TrialResult | null;
  secondsLeft: number;
}

export interface TuneResult {
  best: TrialResult;
  baseline: TrialResult;
  trials: TrialResult[];
  /** Full-size trials no other full-size trial beats on score, bytes and µs/doc at once. */
  pareto: TrialResult[];
  folds: number;
  /** The time budget the search ran under, in seconds. */
  timeSeconds: number;
  /** Seconds of one default build (the baseline trial's time per fold). */
  defaultBuildSeconds: number;
}

const ETA = 3;
const RUNGS = [1 / 9, 1 / 3, 1];
const SMALL_DATA = 3000;

/**
 * Runs the search.
 * @example const { best } = await tune({ examples, base: defaultBuildSettings(), timeSeconds: 300, metric: { kind: "macro-f1" }, seed: 1 });
 */
export async function tune(options: TuneOptions): Promise<TuneResult> {
  const started = performance.now();
  let timeSeconds = options.timeSeconds ?? Infinity;
  const secondsLeft = () => timeSeconds - (performance.now() - started) / 1000;
  const labels = [...new Set(options.examples.flatMap((e) => e.labels))].sort();
  const labelIndex = new Map(labels.map((l, i) => [l, i]));
  const firstLabel = options.examples.map((e) => labelIndex.get(e.labels[0]) as number);
  // Small data: 3 folds (every example validates once); otherwise one stratified 20% holdout.
  const folds = options.examples.length < SMALL_DATA ? 3 : 1;
  const splits = makeSplits(options.examples, firstLabel, folds, options.seed);
  const random = createRandom(options.seed ^ 0x7a3d);
  const trials: TrialResult[] = [];
  let best: TrialResult | null = null;
  const secondsByResource = new Map<number, number>();

  const runTrial = async (settings: BuildSettings, resource: number, baseline: boolean): Promise<TrialResult> => {
    const trialStarted = performance.now();
    let score = 0;
    let bytes = 0;
    let micros = 0;
    for (const split of splits) {
      const train = subsample(split.train, resource, options.seed + trials.length);
      const { bytes: modelBytes } = await build({
        examples: train,
        validation: split.validation,
        settings: { ...settings, holdout: 0, threads: 1, calibrate: false },
        buildTime: "1970-01-01T00:00:00.000Z",
      });
      const model = loadModel(modelBytes);
      score += scoreModel(model, split.validation, options.metric) / splits.length;
      bytes = Math.max(bytes, modelBytes.length);
      micros += microsecondsPerDoc(model, split.validation.slice(0, 200).map((e) => e.text)) / splits.length;
    }
    const seconds = (performance.now() - trialStarted) / 1000;
    secondsByResource.set(resource, Math.max(secondsByResource.get(resource) ?? 0, seconds));
    const trial: TrialResult = {
      id: trials.length + 1,
      settings,
      resource,
      score,
      bytes,
      microsecondsPerDoc: micros,
      seconds,
      withinBudget: options.maxMicroseconds === undefined || micros <= options.maxMicroseconds,
      baseline,
    };
    trials.push(trial);
    if (resource === 1 && trial.withinBudget && (best === null || trial.score > best.score)) best = trial;
    options.onTrial?.(trial, { trials: trials.length, best, secondsLeft: Math.max(0, secondsLeft()) });
    return trial;
  };

  const canAfford = (resource: number) => {
    if (options.maxTrials !== undefined && trials.length >= options.maxTrials) return false;
    const estimate = secondsByResource.get(resource) ?? (secondsByResource.get(1) ?? 0) * resource;
    return secondsLeft() > estimate;
  };

  const baseline = await runTrial(baselineSettings(options.base), 1, true);
  const defaultBuildSeconds = baseline.seconds / splits.length;
  if (options.timeSeconds === undefined) timeSeconds = defaultTuneSeconds(defaultBuildSeconds);
  while (canAfford(RUNGS[0])) {
    let rung = drawSettings(options.base, labels.length, ETA ** (RUNGS.length - 1), random);
    for (let r = 0; r < RUNGS.length && rung.length > 0; r++) {
      const results: TrialResult[] = [];
      for (const settings of rung) {
        if (!canAfford(RUNGS[r])) break;
        results.push(await runTrial(settings, RUNGS[r], false));
      }
      const promotable = results.filter((t) => t.withinBudget).sort((a, b) => b.score - a.score);
      rung = promotable.slice(0, Math.max(1, Math.floor(results.length / ETA))).map((t) => t.settings);
      if (r === RUNGS.length - 1 || results.length === 0) break;
    }
    if (options.maxTrials !== undefined && trials.length >= options.maxTrials) break;
  }
  const full = trials.filter((t) => t.resource === 1);
  const chosen = (best ?? baseline) as TrialResult;
  return { best: chosen, baseline, trials, pareto: paretoFront(full), folds, timeSeconds, defaultBuildSeconds };
}

function drawSettings(base: BuildSettings, labelCount: number, count: number, random: ReturnType<typeof createRandom>): BuildSettings[] {
  const drawn: BuildSettings[] = [];
  let attempts = 0;
  while (drawn.length < count && attempts < count * 20) {
    attempts++;
    const settings = sampleSettings(base, random);
    // Never run a trial that cannot fit the size budget.
    if (base.maxBytes > 0 && sizeFloor(settings, labelCount) > base.maxBytes) continue;
    drawn.push(settings);
  }
  return drawn;
}

function makeSplits(examples: readonly LabelledText[], firstLabel: number[], folds: number, seed: number) {
  if (folds === 1) {
    const { train, validation } = stratifiedSplit(firstLabel, 0.2, seed);
    return [{ train: Array.from(train, (i) => examples[i]), validation: Array.from(validation, (i) => examples[i]) }];
  }
  // Stratified folds: deal each label's shuffled examples round-robin into the folds.
  const assignment = new Int32Array(examples.length);
  const byLabel = new Map<number, number[]>();
  const random = createRandom(seed ^ 0x51f1);
  for (let i = 0; i < examples.length; i++) {
    const group = byLabel.get(firstLabel[i]);
    if (group) group.push(i);
    else byLabel.set(firstLabel[i], [i]);
  }
  for (const label of [...byLabel.keys()].sort((a, b) => a - b)) {
    const group = byLabel.get(label) as number[];
    for (let i = group.length - 1; i > 0; i--) {
      const j = Math.floor(random.next() * (i + 1));
      [group[i], group[j]] = [group[j], group[i]];
    }
    group.forEach((example, position) => (assignment[example] = position % folds));
  }
  return Array.from({ length: folds }, (_, fold) => ({
    train: examples.filter((_, i) => assignment[i] !== fold),
    validation: examples.filter((_, i) => assignment[i] === fold),
  }));
}

function subsample<T>(items: readonly T[], fraction: number, seed: number): T[] {
  if (fraction >= 1) return [...items];
  const random = createRandom(seed ^ 0x33a1);
  return items.filter(() => random.next() < fraction);
}

/** Non-dominated trials: no other is at least as good on all three and better on one. */
export function paretoFront(trials: readonly TrialResult[]): TrialResult[] {
  const eligible = trials.filter((t) => t.withinBudget);
  return eligible
    .filter((t) => !eligible.some((o) => o !== t && o.score >= t.score && o.bytes <= t.bytes && o.microsecondsPerDoc <= t.microsecondsPerDoc && (o.score > t.score || o.bytes < t.bytes || o.microsecondsPerDoc < t.microsecondsPerDoc)))
    .sort((a, b) => b.score - a.score);
}
