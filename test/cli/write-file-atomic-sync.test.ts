// writeFileAtomic's order of system calls: the temporary file's bytes are fsynced before the
// rename, and the folder is fsynced after it. POSIX rename(2) replaces the name atomically,
// but the new directory entry is only durable once the directory itself is synced (fsync(2),
// "Calling fsync() does not necessarily ensure that the entry in the directory containing
// the file has also reached disk. For that an explicit fsync() on a file descriptor for the
// directory is also needed." — Linux man-pages). The calls are observed through node:fs.
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it, vi } from "vitest";

const calls: string[] = [];
const opened = new Map<number, string>();

vi.mock("node:fs", async (importOriginal) => {
  const fs = await importOriginal<typeof import("node:fs")>();
  return {
    ...fs,
    openSync: (path: string, ...rest: unknown[]) => {
      const fd = (fs.openSync as (...args: unknown[]) => number)(path, ...rest);
      opened.set(fd, String(path));
      return fd;
    },
    fsyncSync: (fd: number) => {
      calls.push(`fsync ${opened.get(fd)}`);
      fs.fsyncSync(fd);
    },
    renameSync: (from: string, to: string) => {
      calls.push(`rename ${from} -> ${to}`);
      fs.renameSync(from, to);
    },
  };
});

const { writeFileAtomic } = await import("../../compiler/cli/write-file-atomic.ts");
const folder = mkdtempSync(join(tmpdir(), "sluice-sync-"));
afterAll(() => rmSync(folder, { recursive: true, force: true }));

describe("writeFileAtomic durability", () => {
  it("should fsync the temporary file before the rename and the folder after it", () => {
    const target = join(folder, "model.sluice");
    writeFileAtomic(target, "bytes");
    expect(readFileSync(target, "utf8")).toBe("bytes");
    expect(calls).toHaveLength(3);
    const [fileSync, rename, folderSync] = calls;
    const temporary = /^fsync (.+)$/.exec(fileSync)?.[1] ?? "";
    expect(temporary).toMatch(new RegExp(`^${folder}/\\.model\\.sluice\\.${process.pid}\\.\\d+\\.tmp$`));
    expect(rename).toBe(`rename ${temporary} -> ${target}`);
    expect(folderSync).toBe(`fsync ${folder}`);
  });
});
