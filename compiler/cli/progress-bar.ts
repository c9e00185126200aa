// Progress on stderr, only when stderr is a terminal and not --quiet: a bar while training,
// and a status line for every other stage (reading, preparing, compiling) with the seconds
// spent in it, so no stage longer than a moment is silent. Off a terminal nothing is drawn.

import type { TrainProgress } from "../train/train-draft.ts";

export interface BuildProgress {
  /** The training callback for `build` (draws the bar; ends the "preparing" stage). */
  onTrain?: (stage: string, progress: TrainProgress) => void;
  /** The stage callback for `build` (compile, calibrate, verify). */
  onStage?: (stage: "compile" | "calibrate" | "verify") => void;
  /** Marks the start of a named stage; its line shows the seconds since. */
  stage(name: string): void;
  /** Clears the line so a message can be printed; the next redraw brings it back. */
  clear(): void;
  /** Clears the line and stops the clock. */
  done(): void;
}

const STAGE_NAMES = {
  compile: "compiling: prune, quantize, fine-tune the output layer",
  calibrate: "calibrating and choosing the policy on validation data",
  verify: "verifying: reload the written bytes and compare",
} as const;

const SILENT: BuildProgress = { onTrain: undefined, stage: () => {}, clear: () => {}, done: () => {} };

/**
 * A progress display for a build, or a silent one off a terminal or with --quiet.
 * @example const progress = createBuildProgress(!quiet); progress.stage("reading data.csv"); … progress.done();
 */
export function createBuildProgress(enabled: boolean, stream: NodeJS.WriteStream = process.stderr): BuildProgress {
  if (!enabled || !stream.isTTY) return SILENT;
  let stageName = "";
  let stageStarted = 0;
  let training = false;
  let lastDraw = 0;
  const draw = (line: string) => stream.write(`\r${line}\x1b[K`);
  const drawStage = () => draw(`${stageName} … ${((Date.now() - stageStarted) / 1000).toFixed(1)} s`);
  // The clock redraws whenever the event loop is free (reading streams, awaiting workers);
  // synchronous stretches show the stage name they started with.
  const timer = setInterval(() => {
    if (stageName !== "" && !training) drawStage();
  }, 250);
  timer.unref();
  const bar = (_stage: string, progress: TrainProgress) => {
    training = progress.done < 1;
    const now = Date.now();
    if (now - lastDraw < 100 && progress.done < 1) return;
    lastDraw = now;
    const width = 24;
    const filled = Math.round(progress.done * width);
    draw(`training ${"█".repeat(filled)}${"░".repeat(width - filled)} ${(progress.done * 100).toFixed(0).padStart(3)}%  epoch ${progress.epoch}/${progress.epochs}  loss ${progress.loss.toFixed(4)}  ${(progress.tokensPerSecond / 1e6).toFixed(2)}M tokens/s  ETA ${progress.etaSeconds.toFixed(0)}s`);
    if (progress.done >= 1) stream.write("\n");
  };
  const startStage = (name: string) => {
    stageName = name;
    stageStarted = Date.now();
    training = false;
    drawStage();
  };
  return {
    onTrain: bar,
    onStage: (stage) => {
      if (training || lastDraw > 0) stream.write("\n");
      lastDraw = 0;
      startStage(STAGE_NAMES[stage]);
    },
    stage: startStage,
    clear: () => stream.write("\r\x1b[K"),
    done: () => {
      clearInterval(timer);
      stageName = "";
      stream.write("\r\x1b[K");
    },
  };
}
