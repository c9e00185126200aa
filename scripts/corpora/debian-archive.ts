// Inputs from the Debian archive: the bookworm main Packages index (from apt's lists, as
// `apt-get update` left them), its English long descriptions (Translation-en, downloaded
// with apt's own helper, which checks the SHA-256 the signed Release file states), and
// binary packages (`apt-get download NAME=VERSION`, checked against the index's SHA256
// field), unpacked with `dpkg-deb -x`. Each is checked against scripts/corpora/pins.json.
import { execFileSync } from "node:child_process";
import { existsSync, mkdirSync, readdirSync, readFileSync, renameSync, rmSync } from "node:fs";
import { join } from "node:path";
import { readParagraphs, type Paragraph } from "./deb822.ts";
import { sha256, type PinBook } from "./pins.ts";

const LISTS = "/var/lib/apt/lists";
const APT_HELPER = "/usr/lib/apt/apt-helper";
const ARCHIVE = "http://deb.debian.org/debian";
const SUITE = "bookworm";

export interface SourceRecord {
  name: string;
  version?: string;
  sha256: string;
  note?: string;
}

export class DebianArchive {
  private packages: Paragraph[] | null = null;
  private descriptions: Map<string, string> | null = null;
  readonly sources: SourceRecord[] = [];

  constructor(private readonly cacheDir: string, private readonly pins: PinBook) {
    mkdirSync(cacheDir, { recursive: true });
  }

  /** The Release file's SHA-256 line for a path of the suite, e.g. "main/binary-amd64/Packages". */
  private releaseHash(path: string): { sha256: string; version: string } {
    const release = join(LISTS, `deb.debian.org_debian_dists_${SUITE}_InRelease`);
    if (!existsSync(release)) throw new Error(`${release} is missing: run \`apt-get update\` once first (as root)`);
    const text = readFileSync(release, "utf8");
    const version = /^Version: (.+)$/m.exec(text)?.[1] ?? "unknown";
    const sha256Block = text.split(/^SHA256:$/m)[1] ?? "";
    const line = sha256Block.split("\n").find((l) => l.trim().split(/\s+/)[2] === path);
    if (!line) throw new Error(`${release}: no SHA256 entry for ${path}`);
    return { sha256: line.trim().split(/\s+/)[0], version };
  }

  /** Every paragraph of bookworm's main/binary-amd64/Packages, checked against the signed Release and the pin. */
  packageIndex(): Paragraph[] {
    if (this.packages) return this.packages;
    const path = "main/binary-amd64/Packages";
    const { sha256: stated, version } = this.releaseHash(path);
    const compressed = readdirSync(LISTS).find((f) => f.startsWith(`deb.debian.org_debian_dists_${SUITE}_main_binary-amd64_Packages`));
    if (!compressed) throw new Error(`no ${SUITE} main amd64 Packages index in ${LISTS}: run \`apt-get update\` once first`);
    const text = execFileSync(APT_HELPER, ["cat-file", join(LISTS, compressed)], { maxBuffer: 1 << 30 });
    const actual = sha256(text);
    if (actual !== stated) throw new Error(`${compressed}: sha256 ${actual} differs from the Release file's ${stated}`);
    this.pins.checkInput(`debian:${SUITE}/${path}`, { version: `Debian ${version}`, sha256: actual });
    this.sources.push({ name: `Debian ${SUITE} ${path}`, version: `Debian ${version}`, sha256: actual });
    this.packages = [...readParagraphs(text.toString("utf8"))];
    return this.packages;
  }

  /** Long descriptions by "Package/Description-md5", from main/i18n/Translation-en. */
  longDescriptions(): Map<string, string> {
    if (this.descriptions) return this.descriptions;
    const path = "main/i18n/Translation-en.xz";
    const { sha256: stated, version } = this.releaseHash(path);
    const file = join(this.cacheDir, `Translation-en-${stated.slice(0, 16)}.xz`);
    if (!existsSync(file) || sha256(readFileSync(file)) !== stated) {
      // apt-helper refuses a download whose hash differs from the one given.
      execFileSync(APT_HELPER, ["download-file", `${ARCHIVE}/dists/${SUITE}/${path}`, `${file}.part`, `SHA256:${stated}`], { stdio: "pipe" });
      renameSync(`${file}.part`, file);
    }
    this.pins.checkInput(`debian:${SUITE}/${path}`, { version: `Debian ${version}`, sha256: stated });
    this.sources.push({ name: `Debian ${SUITE} ${path}`, version: `Debian ${version}`, sha256: stated });
    const text = execFileSync("xz", ["-dc", file], { maxBuffer: 1 << 30 }).toString("utf8");
    this.descriptions = new Map();
    for (const paragraph of readParagraphs(text)) {
      const name = paragraph.get("Package");
      const md5 = paragraph.get("Description-md5");
      const description = paragraph.get("Description-en");
      if (name && md5 && description) this.descriptions.set(`${name}/${md5}`, description);
    }
    return this.descriptions;
  }

  /**
   * Downloads the index's version of a binary package (or the pinned one), checks its
   * SHA-256 and unpacks it; returns the directory it was unpacked into.
   */
  unpack(name: string): string {
    const paragraph = this.packageIndex().find((p) => p.get("Package") === name);
    if (!paragraph) throw new Error(`package ${name} is not in the ${SUITE} main index`);
    const version = paragraph.get("Version") as string;
    const stated = paragraph.get("SHA256") as string;
    const debDir = join(this.cacheDir, "debs");
    mkdirSync(debDir, { recursive: true });
    const debName = `${name}_${version.replace(/^\d+:/, "")}.deb`;
    const deb = join(debDir, debName);
    if (!existsSync(deb) || sha256(readFileSync(deb)) !== stated) {
      const before = new Set(readdirSync(debDir));
      execFileSync("apt-get", ["download", "-q", `${name}=${version}`], { cwd: debDir, stdio: "pipe" });
      const fetched = readdirSync(debDir).find((f) => !before.has(f) && f.startsWith(`${name}_`));
      if (!fetched) throw new Error(`apt-get download ${name}=${version} wrote no file in ${debDir}`);
      renameSync(join(debDir, fetched), deb);
    }
    const actual = sha256(readFileSync(deb));
    if (actual !== stated) throw new Error(`${deb}: sha256 ${actual} differs from the index's ${stated}`);
    this.pins.checkInput(`deb:${name}`, { version, sha256: actual });
    this.sources.push({ name: `${name}.deb`, version, sha256: actual });
    const target = join(this.cacheDir, "unpacked", `${name}_${version.replace(/^\d+:/, "")}`);
    if (!existsSync(join(target, ".done"))) {
      rmSync(target, { recursive: true, force: true });
      mkdirSync(target, { recursive: true });
      execFileSync("dpkg-deb", ["-x", deb, target]);
      execFileSync("touch", [join(target, ".done")]);
    }
    return target;
  }
}
