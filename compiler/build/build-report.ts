// What a build reports: sizes, qualities of the draft and of what ships, where the time went.

import type { CalibrationReport } from "../compile/calibrate.ts";
import type { HeadKind } from "../../runtime/format/model-header.ts";
import type { PolicyReport } from "../compile/choose-policy.ts";
import type { LeakFindings } from "../read/text-fingerprints.ts";

export interface Quality {
  accuracy: number;
  macroF1: number;
}

export interface StageSeconds {
  /** Splitting, the leak check and fingerprint, featurizing the training texts (in-memory builds). */
  prepare: number;
  /** Training the float draft (the SGD epochs). */
  train: number;
  /** Measuring the draft, pruning, quantizing, fine-tuning the output layer, folding. */
  compile: number;
  /** Temperature scaling, sigmoid thresholds and the policy, on the validation split. */
  calibrate: number;
  /** Validation metrics of what ships, the final write and the round-trip check. */
  verify: number;
}

export interface BuildReport {
  bytes: number;
  head: HeadKind;
  headReason: string;
  labels: string[];
  trainExamples: number;
  validationExamples: number;
  trainSeconds: number;
  /** Wall-clock seconds of each stage: where a build's time goes. */
  stageSeconds: StageSeconds;
  tokensPerSecond: number;
  finalLoss: number;
  rows: { seen: number; kept: number };
  draft: Quality & { bytes: number };
  compiled: Quality;
  validation: Quality & { microF1: number; logLoss: number; ece: number };
  /** Temperature scaling on validation: what was kept, or why it was skipped; null without validation or with --no-calibrate. */
  calibration: CalibrationReport | null;
  policy: PolicyReport | null;
  leaks: LeakFindings | null;
  sections: Record<string, number>;
  warnings: string[];
}

/** Adds the time since the previous lap to a stage (the first lap includes what came before). */
export function stageClock(before: number) {
  const seconds: StageSeconds = { prepare: before, train: 0, compile: 0, calibrate: 0, verify: 0 };
  let last = performance.now();
  return {
    seconds,
    lap(stage: keyof StageSeconds) {
      const now = performance.now();
      seconds[stage] += (now - last) / 1000;
      last = now;
    },
  };
}

export function quality(report: { accuracy: number; macroF1: number }): Quality {
  return { accuracy: report.accuracy, macroF1: report.macroF1 };
}

export function round(value: number): number {
  return Math.round(value * 1e6) / 1e6;
}

export function roundQuality(q: Quality): Quality {
  return { accuracy: round(q.accuracy), macroF1: round(q.macroF1) };
}
