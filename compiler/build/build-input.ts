// What a build is given: the examples and settings (in memory), or an encoded training
// source (shared by the in-memory and the on-disk paths).

import type { FeaturizerSettings } from "../../runtime/featurizer/featurizer.ts";
import type { HeadKind } from "../../runtime/format/model-header.ts";
import type { LabelledText } from "../evaluate/evaluate.ts";
import type { LeakFindings } from "../read/text-fingerprints.ts";
import type { TrainingSource } from "../train/training-source.ts";
import type { TrainProgress } from "../train/train-draft.ts";
import type { BuildSettings } from "./build-settings.ts";
import type { SearchReport } from "./search-settings.ts";
import type { SplitReport } from "./split-examples.ts";

export interface BuildInput {
  examples: readonly LabelledText[];
  /** Validation examples; when absent, `settings.holdout` of `examples` is held out. */
  validation?: readonly LabelledText[];
  settings: BuildSettings;
  /** ISO time recorded in provenance; fixed for reproducible builds. */
  buildTime: string;
  /** SHA-256 (hex) of the training data file, recorded in provenance. */
  dataSha256?: string;
  dataName?: string;
  onProgress?: (stage: string, progress: TrainProgress) => void;
  /** Called as each stage after training starts ("compile", "calibrate", "verify"), so a caller can show it. */
  onStage?: (stage: "compile" | "calibrate" | "verify") => void;
  onMessage?: (message: string) => void;
  /**
   * Bytes the setting search may add to memory for a candidate's encoding (the CLI passes its
   * memory budget minus the projected in-memory build); absent: no limit.
   */
  searchMemoryRoomBytes?: number;
  /** Which data fields held the text and the label(s), and the separator of several labels in
   * one cell (recorded so eval, classify, compare and report read data the same way). */
  fields?: { text: string[]; label: string; labelSep?: string };
  /**
   * Settings the user chose (flags, config keys); the build's search changes only the others.
   * Absent: every setting that differs from the table's default counts as chosen.
   */
  explicit?: readonly (keyof BuildSettings)[];
  /**
   * Record the measured latency in the file's metrics (the CLI does, unless SOURCE_DATE_EPOCH
   * asks for a reproducible build: a timing differs run to run, so it would change the bytes).
   * The report carries it either way.
   */
  latencyInFile?: boolean;
  /**
   * Extra training examples (e.g. reviewers' decisions exported from the review queue): they are
   * never held out, so validation stays the base data's, and each is trained on `repeat` times.
   */
  alsoTrain?: { examples: readonly LabelledText[]; repeat: number };
}

/** What the stages after encoding need (shared by the in-memory and the on-disk paths). */
export interface SourceBuild {
  input: Omit<BuildInput, "examples"> & { examples?: readonly LabelledText[]; exampleCount?: number };
  source: TrainingSource;
  labels: string[];
  head: HeadKind;
  headReason: string;
  validation: LabelledText[];
  featurizerSettings: FeaturizerSettings;
  warnings: string[];
  /** Validation texts that also occur in training (exact, after normalization). */
  leaks?: LeakFindings;
  /** Bloom filter of the training texts, so `eval` can warn about overlap later. */
  trainFingerprint?: Uint8Array;
  /** Seconds spent before this call (reading, splitting, encoding), for the report. */
  prepareSeconds?: number;
  /** How the validation split was made. */
  split?: SplitReport;
  /** What the build's setting search compared and chose (null: no search). */
  search?: SearchReport | null;
}
