// Outputs are written to a temporary file in the same directory, flushed, renamed over the
// target, and the directory is flushed too: a failed or interrupted write never leaves a
// partial or half-overwritten file, and a crash right after the rename keeps the new name
// (POSIX rename is atomic but only durable once the directory entry is on disk).

import { closeSync, existsSync, fsyncSync, openSync, readdirSync, renameSync, rmSync, statSync, writeSync } from "node:fs";
import { basename, dirname, join } from "node:path";

/**
 * Writes `data` to `path` atomically; refuses to replace an existing file unless `force`.
 * Errors name `path`, never the temporary file.
 * @example writeFileAtomic("model.sluice", bytes, { force: true })
 */
export function writeFileAtomic(path: string, data: Uint8Array | string, options: { force?: boolean } = {}): void {
  if (!options.force && existsSync(path)) {
    throw new Error(`${path} already exists; pass --force to replace it`);
  }
  if (existsSync(path) && statSync(path).isDirectory()) throw new Error(`cannot write ${path}: it is a folder`);
  removeStaleTemporaryFiles(path);
  const temporary = join(dirname(path), `.${basename(path)}.${process.pid}.${Date.now()}.tmp`);
  let fd: number;
  try {
    fd = openSync(temporary, "w", 0o644);
  } catch (error) {
    throw writeError(path, error);
  }
  try {
    const bytes = typeof data === "string" ? Buffer.from(data, "utf8") : data;
    let written = 0;
    while (written < bytes.length) written += writeSync(fd, bytes, written, bytes.length - written);
    fsyncSync(fd);
  } catch (error) {
    closeSync(fd);
    rmSync(temporary, { force: true });
    throw writeError(path, error);
  }
  closeSync(fd);
  try {
    renameSync(temporary, path);
  } catch (error) {
    rmSync(temporary, { force: true });
    throw writeError(path, error);
  }
  syncFolder(dirname(path));
}

/** The temporary files of `path` written by processes that no longer run (a killed build's). */
export function removeStaleTemporaryFiles(path: string): string[] {
  const folder = dirname(path);
  const prefix = `.${basename(path)}.`;
  const removed: string[] = [];
  let names: string[];
  try {
    names = readdirSync(folder);
  } catch {
    return removed;
  }
  for (const name of names) {
    if (!name.startsWith(prefix) || !name.endsWith(".tmp")) continue;
    const pid = Number(name.slice(prefix.length).split(".")[0]);
    if (!Number.isInteger(pid) || pid <= 0 || pid === process.pid || isRunning(pid)) continue;
    rmSync(join(folder, name), { force: true });
    removed.push(name);
  }
  return removed;
}

function isRunning(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    return (error as NodeJS.ErrnoException).code === "EPERM"; // exists, owned by someone else
  }
}

/** fsync of the folder, so the rename survives a crash; some platforms cannot open folders. */
function syncFolder(folder: string): void {
  let fd: number | null = null;
  try {
    fd = openSync(folder, "r");
    fsyncSync(fd);
  } catch {
    // Windows and some network file systems refuse fsync on a directory; the file itself is synced.
  } finally {
    if (fd !== null) closeSync(fd);
  }
}

function writeError(path: string, error: unknown): Error {
  const code = (error as NodeJS.ErrnoException).code ?? "";
  const reasons: Record<string, string> = {
    ENOENT: `the folder ${dirname(path)} does not exist`,
    ENOTDIR: `${dirname(path)} is not a folder`,
    EACCES: "permission denied",
    EPERM: "permission denied",
    EROFS: "the file system is read-only",
    ENOSPC: "the disk is full",
    EISDIR: "it is a folder",
  };
  return new Error(`cannot write ${path}: ${reasons[code] ?? (error as Error).message}`);
}
