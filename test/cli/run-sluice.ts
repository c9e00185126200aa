// Runs the CLI as a user would (`node bin/sluice.js …` from the repo root), for the CLI tests.
import { execFile } from "node:child_process";
import { resolve } from "node:path";
import { fileURLToPath } from "node:url";

/** The repository root. */
export const REPO = resolve(fileURLToPath(new URL("../..", import.meta.url)));

export interface Run {
  code: number;
  stdout: string;
  stderr: string;
}

/** Runs the CLI to completion; never rejects, so exit codes can be asserted. */
export function sluice(args: string[], options: { input?: string; env?: Record<string, string> } = {}): Promise<Run> {
  return new Promise((done) => {
    const child = execFile(
      process.execPath,
      ["bin/sluice.js", ...args],
      { cwd: REPO, env: { ...process.env, ...options.env }, maxBuffer: 64 * 1024 * 1024, encoding: "utf8" },
      (error, stdout, stderr) => {
        const code = error ? (typeof error.code === "number" ? error.code : 1) : 0;
        done({ code, stdout, stderr });
      },
    );
    child.stdin?.end(options.input ?? "");
  });
}
