// Outputs are written to a temporary file in the same directory, flushed, then renamed
// over the target: a failed or interrupted write never leaves a partial or half-overwritten file.

import { closeSync, fsyncSync, openSync, renameSync, rmSync, writeSync, existsSync } from "node:fs";
import { basename, dirname, join } from "node:path";

/**
 * Writes `data` to `path` atomically; refuses to replace an existing file unless `force`.
 * @example writeFileAtomic("model.sluice", bytes, { force: true })
 */
export function writeFileAtomic(path: string, data: Uint8Array | string, options: { force?: boolean } = {}): void {
  if (!options.force && existsSync(path)) {
    throw new Error(`${path} already exists; pass --force to replace it`);
  }
  const temporary = join(dirname(path), `.${basename(path)}.${process.pid}.${Date.now()}.tmp`);
  const fd = openSync(temporary, "w", 0o644);
  try {
    const bytes = typeof data === "string" ? Buffer.from(data, "utf8") : data;
    let written = 0;
    while (written < bytes.length) written += writeSync(fd, bytes, written, bytes.length - written);
    fsyncSync(fd);
  } catch (error) {
    closeSync(fd);
    rmSync(temporary, { force: true });
    throw error;
  }
  closeSync(fd);
  try {
    renameSync(temporary, path);
  } catch (error) {
    rmSync(temporary, { force: true });
    throw error;
  }
}
