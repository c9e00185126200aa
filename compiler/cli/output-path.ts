// Checks of an output path made before any work starts (a build may train for an hour): the
// folder exists and takes a new file, the path is not a folder, an existing file is only
// replaced with --force, and the output is none of the inputs: `build x.csv --out x.csv
// --force` would otherwise replace the training data with the model. Paths are compared
// after resolving symlinks, `./` and `..`, so another spelling of the same file is caught.

import { closeSync, existsSync, openSync, realpathSync, rmSync, statSync } from "node:fs";
import { basename, dirname, join, resolve } from "node:path";
import { removeStaleTemporaryFiles } from "./write-file-atomic.ts";

/** An output path that cannot be used; the message names the path as the user wrote it. */
export class OutputPathError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "OutputPathError";
  }
}

/**
 * Throws OutputPathError unless `out` can be written; `inputs` are the files the command
 * reads (data, validation, config, model), undefined entries skipped.
 * @example checkOutputPath("model.sluice", { inputs: ["data.csv"], force: false })
 */
export function checkOutputPath(out: string, options: { inputs: (string | undefined)[]; force: boolean; flag?: string }): void {
  const flag = options.flag ?? "--out";
  const folder = dirname(resolve(out));
  if (!existsSync(folder)) throw new OutputPathError(`${flag} ${out}: the folder ${dirname(out)} does not exist`);
  if (!statSync(folder).isDirectory()) throw new OutputPathError(`${flag} ${out}: ${dirname(out)} is not a folder`);
  const target = realOutputPath(out);
  for (const input of options.inputs) {
    if (input === undefined || input === "-" || !existsSync(input)) continue;
    if (realpathSync(input) === target) throw new OutputPathError(`${flag} ${out} is the input file ${input}; writing there would destroy it, so choose another output path`);
  }
  if (existsSync(out)) {
    if (statSync(out).isDirectory()) throw new OutputPathError(`${flag} ${out} is a folder; give a file name`);
    if (!options.force) throw new OutputPathError(`${out} already exists; pass --force to replace it`);
  }
  removeStaleTemporaryFiles(out);
  probeWritable(out, flag);
}

/** Where `out` really points: the resolved file, or the resolved folder plus the new name. */
function realOutputPath(out: string): string {
  if (existsSync(out)) return realpathSync(out);
  return join(realpathSync(dirname(resolve(out))), basename(out));
}

/** Creates and removes a probe file beside `out` (permissions alone miss read-only mounts and root). */
function probeWritable(out: string, flag: string): void {
  const probe = join(dirname(out), `.${basename(out)}.${process.pid}.probe.tmp`);
  try {
    closeSync(openSync(probe, "wx"));
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code ?? "";
    const why = code === "EACCES" || code === "EPERM" ? "permission denied" : code === "EROFS" ? "the file system is read-only" : code === "ENOSPC" ? "the disk is full" : (error as Error).message;
    throw new OutputPathError(`${flag} ${out}: cannot create a file in ${dirname(out)} (${why})`);
  }
  rmSync(probe, { force: true });
}
