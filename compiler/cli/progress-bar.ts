// A one-line progress bar on stderr, only when stderr is a terminal and not --quiet.

import type { TrainProgress } from "../train/train-draft.ts";

/** A progress callback for training, or undefined when progress should stay silent. */
export function createProgressBar(enabled: boolean): ((stage: string, progress: TrainProgress) => void) | undefined {
  if (!enabled || !process.stderr.isTTY) return undefined;
  let lastDraw = 0;
  return (stage, progress) => {
    const now = Date.now();
    if (now - lastDraw < 100 && progress.done < 1) return;
    lastDraw = now;
    const width = 24;
    const filled = Math.round(progress.done * width);
    const bar = "█".repeat(filled) + "░".repeat(width - filled);
    const line = `${stage} ${bar} ${(progress.done * 100).toFixed(0).padStart(3)}%  epoch ${progress.epoch}/${progress.epochs}  loss ${progress.loss.toFixed(4)}  ${(progress.tokensPerSecond / 1e6).toFixed(2)}M tokens/s  ETA ${progress.etaSeconds.toFixed(0)}s`;
    process.stderr.write(`\r${line}\x1b[K`);
    if (progress.done >= 1) process.stderr.write("\n");
  };
}

/** Clears the progress line (before printing results). */
export function clearProgressLine(): void {
  if (process.stderr.isTTY) process.stderr.write("\r\x1b[K");
}
