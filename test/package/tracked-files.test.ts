// What the repository itself tracks: no symbolic links. A symlink to node_modules or to the
// git-ignored corpora folder, committed by mistake, replaces the real folder in every checkout
// (this has happened twice). Reads the index with git, so it checks what a clone gets.

import { execFileSync } from "node:child_process";
import { describe, expect, it } from "vitest";

const root = new URL("../..", import.meta.url).pathname;

describe("the tracked files", () => {
  it("include no symbolic links (git mode 120000)", () => {
    let listing: string;
    try {
      listing = execFileSync("git", ["ls-files", "--stage"], { cwd: root, encoding: "utf8", maxBuffer: 1 << 26 });
    } catch {
      return; // not a git checkout (e.g. an unpacked tarball): nothing to check
    }
    const links = listing.split("\n").filter((line) => line.startsWith("120000 ")).map((line) => line.split("\t")[1]);
    expect(links).toEqual([]);
  });
});
