// Checks of an input path made before a command reads it. The first read of a folder fails
// with a bare "EISDIR: illegal operation on a directory, read", which names no file, and a
// missing file with an ENOENT line about `open`; both are said here in plain words, with the
// path as the user wrote it and what the command expected there.

import { existsSync, statSync } from "node:fs";

/** An input path that is missing or not a file; the message names the path as the user wrote it. */
export class InputPathError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "InputPathError";
  }
}

/**
 * Throws InputPathError when `path` is missing or a folder; undefined and "-" (standard
 * input) pass. `what` says what the command reads there ("model file", "data file").
 * @example checkInputFile("data.csv", "data file")
 */
export function checkInputFile(path: string | undefined, what: string): void {
  if (path === undefined || path === "-") return;
  if (!existsSync(path)) throw new InputPathError(`${what} ${path} does not exist`);
  if (statSync(path).isDirectory()) throw new InputPathError(`${what} ${path} is a folder, not a file`);
}

/**
 * checkInputFile for each `[path, what]`, in order, so a command refuses a bad path before
 * it does any work with the others.
 * @example checkInputFiles([["model.sluice", "model file"], ["data.csv", "data file"]])
 */
export function checkInputFiles(inputs: readonly (readonly [string | undefined, string])[]): void {
  for (const [path, what] of inputs) checkInputFile(path, what);
}
