// Runs one natural classifier in a child process (natural-child.ts) under a training cap:
// the child is killed when training has not finished in time, and the outcome says so.

import { fork } from "node:child_process";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import type { CallTimings, TimingOptions } from "./single-call-timing.ts";

const HERE = dirname(fileURLToPath(import.meta.url));
const CHILD = join(HERE, "natural-child.ts");
const REPOSITORY = join(HERE, "..", "..");

/** What the child is asked to do. */
export interface NaturalJob {
  kind: "bayes" | "logistic";
  /** JSONL files of { text, label }. */
  trainFile: string;
  testFile: string;
  /** Killed when addDocument + train() take longer than this. */
  trainCapSeconds: number;
  /** Killed when size, restore and timing after training take longer than this. */
  measureCapSeconds: number;
  timing: TimingOptions;
  loadRepeats: number;
  loadBudgetMs: number;
}

/** Messages from the child, in order. */
export type NaturalChildMessage =
  | { type: "training" }
  | { type: "trained"; seconds: number }
  | { type: "result"; modelBytes: number; loadMs: number; loadRepeats: number; timings: CallTimings; predictions: string[] };

/** How a run ended. */
export type NaturalOutcome =
  | { status: "ok"; trainSeconds: number; modelBytes: number; loadMs: number; loadRepeats: number; timings: CallTimings; predictions: string[] }
  | { status: "too-slow"; capSeconds: number; phase: "train" | "measure"; trainSeconds: number | null }
  | { status: "failed"; reason: string; trainSeconds: number | null; elapsedSeconds: number };

/**
 * Trains and measures one natural classifier in a child process under `job.trainCapSeconds`.
 * @example const outcome = await runNaturalJob({ kind: "bayes", trainFile, testFile, trainCapSeconds: 120, … });
 */
export function runNaturalJob(job: NaturalJob): Promise<NaturalOutcome> {
  return new Promise((resolve) => {
    const child = fork(CHILD, [JSON.stringify(job)], { cwd: REPOSITORY, execArgv: ["--import", "tsx"], stdio: ["ignore", "ignore", "pipe", "ipc"] });
    const started = performance.now();
    let stderr = "";
    let trainSeconds: number | null = null;
    let outcome: NaturalOutcome | null = null;
    let timer: ReturnType<typeof setTimeout> | undefined;
    const stopAt = (seconds: number, phase: "train" | "measure") => {
      clearTimeout(timer);
      timer = setTimeout(() => {
        outcome = { status: "too-slow", capSeconds: seconds, phase, trainSeconds };
        child.kill("SIGKILL");
      }, seconds * 1000);
    };
    child.stderr?.on("data", (chunk: Buffer) => {
      stderr = (stderr + chunk.toString("utf8")).slice(-4000);
    });
    child.on("message", (message: NaturalChildMessage) => {
      if (message.type === "training") stopAt(job.trainCapSeconds, "train");
      else if (message.type === "trained") {
        trainSeconds = message.seconds;
        stopAt(job.measureCapSeconds, "measure");
      } else if (message.type === "result") {
        clearTimeout(timer);
        outcome = { status: "ok", trainSeconds: trainSeconds ?? NaN, modelBytes: message.modelBytes, loadMs: message.loadMs, loadRepeats: message.loadRepeats, timings: message.timings, predictions: message.predictions };
      }
    });
    child.on("exit", (code, signal) => {
      clearTimeout(timer);
      if (outcome) return resolve(outcome);
      const elapsedSeconds = (performance.now() - started) / 1000;
      const reason = /heap out of memory|allocation failed/i.test(stderr)
        ? "ran out of memory (JavaScript heap limit)"
        : `exited with ${signal ?? `code ${code}`}: ${stderr.trim().split("\n").slice(-3).join(" / ") || "no message"}`;
      resolve({ status: "failed", reason, trainSeconds, elapsedSeconds });
    });
  });
}
