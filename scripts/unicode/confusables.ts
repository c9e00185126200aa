// Generates runtime/featurizer/confusables-table.ts, the featurizer's lookalike table, from the
// Unicode Technical Standard #39 confusables data (confusables.txt) of a pinned Unicode version:
//   npm run confusables
// The data comes from ICU's source, as Debian bookworm ships it (icu_72.1.orig.tar.gz, whose
// SHA-256 the signed icu_72.1-3+deb12u1.dsc states), so nothing is fetched at run time and the
// table is reproducible. The download is cached in corpora/.cache/ (ignored by git).
//
// What is kept, and why (the rest of UTS #39's 6,311 mappings is left out on purpose):
// - sources outside ASCII only: ASCII text is read as written ("m" stays "m", not "rn"; "0" stays a digit);
// - sources that NFKC leaves alone: the featurizer applies NFKC first, so the others never reach the table;
// - sources up to U+FFFF: the tokenizer reads no letters above it (they separate words), and the 82
//   lookalikes there (Deseret, Carian, Lycian, Old Italic, Warang Citi, Osage…) would cost the
//   runtime bundle about 200 bytes of gzip for scripts that most systems cannot even display;
// - a letter whose prototype is ASCII letters, or a decimal digit whose prototype is ASCII digits.
//   Letters that look like punctuation or digits (Katakana ノ → "/", Hebrew י → "'", Cyrillic З → "3") and
//   digits that look like letters (Arabic-Indic ١ → "l") are left out: folding them would split or
//   reshape ordinary words and numbers of those scripts, where the tokenizer must keep them.
// Then, derived here (not in the data): each upper-case letter not kept whose lower case is a kept
// source maps to that prototype, so folding before lower-casing is idempotent: Ɡ → ɡ → g, and
// Σ → σ → o (Σ's own prototype, Ʃ, is not ASCII; after lower case it would fold on a second pass).
// Prototypes are stored lower-cased: the featurizer lower-cases right after folding.
//
// The generator also writes test/fixtures/unicode/confusables-lines.txt: the data's own header and
// every published line whose source is non-ASCII, NFKC-stable and has an ASCII prototype, verbatim,
// so the tests check the table against the standard's lines (kept ones fold, left-out ones do not).
import { execFileSync } from "node:child_process";
import { createHash } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, renameSync, writeFileSync } from "node:fs";
import { fileURLToPath } from "node:url";

const ORIGIN = {
  url: "http://deb.debian.org/debian/pool/main/i/icu/icu_72.1.orig.tar.gz",
  sha256: "a2d2d38217092a7ed56635e34467f92f976b370e20182ad325edea6681a71d68", // Checksums-Sha256 of icu_72.1-3+deb12u1.dsc
  member: "icu/source/data/unidata/confusables.txt",
};
const CONFUSABLES_SHA256 = "2b10130885c3370b101c52d7baedc452ab7f0e257b86c1e52ee657ecfc29ce64";
const root = new URL("../../", import.meta.url);
const cacheDir = fileURLToPath(new URL("corpora/.cache/", root));
const tableFile = new URL("runtime/featurizer/confusables-table.ts", root);
const linesFile = new URL("test/fixtures/unicode/confusables-lines.txt", root);

function sha256(bytes: Uint8Array | string): string {
  return createHash("sha256").update(bytes).digest("hex");
}

async function confusablesText(): Promise<string> {
  mkdirSync(cacheDir, { recursive: true });
  const tarball = `${cacheDir}icu_72.1.orig.tar.gz`;
  if (!existsSync(tarball) || sha256(readFileSync(tarball)) !== ORIGIN.sha256) {
    console.log(`downloading ${ORIGIN.url}`);
    const response = await fetch(ORIGIN.url);
    if (!response.ok) throw new Error(`${ORIGIN.url}: HTTP ${response.status}`);
    const bytes = new Uint8Array(await response.arrayBuffer());
    const actual = sha256(bytes);
    if (actual !== ORIGIN.sha256) throw new Error(`${ORIGIN.url}: sha256 ${actual}, expected ${ORIGIN.sha256} (the .dsc's)`);
    writeFileSync(`${tarball}.part`, bytes);
    renameSync(`${tarball}.part`, tarball);
  }
  const data = execFileSync("tar", ["-xzOf", tarball, ORIGIN.member], { maxBuffer: 1 << 26 });
  const actual = sha256(data);
  if (actual !== CONFUSABLES_SHA256) throw new Error(`${ORIGIN.member}: sha256 ${actual}, expected ${CONFUSABLES_SHA256}`);
  return data.toString("utf8");
}

interface Entry {
  source: number;
  prototype: string;
  line: string;
}

/** The data's mapping lines: "source ; prototype code points ; MA # comment". */
function parse(text: string): { version: string; date: string; entries: Entry[]; header: string[] } {
  const lines = text.split("\n");
  const version = /^# Version: (\S+)/m.exec(text)?.[1];
  const date = /^# Date: ([^,]+)/m.exec(text)?.[1];
  if (!version || !date) throw new Error("confusables.txt: no Version or Date line in the header");
  const header = [];
  for (const line of lines) {
    if (!line.startsWith("#")) break;
    header.push(line.replace(/^\uFEFF/, ""));
  }
  const entries: Entry[] = [];
  for (const raw of lines) {
    const line = raw.replace(/^\uFEFF/, "");
    const match = /^([0-9A-F]{4,6})\s*;\s*([0-9A-F ]+?)\s*;\s*MA\b/.exec(line);
    if (!match) continue;
    entries.push({ source: parseInt(match[1], 16), prototype: String.fromCodePoint(...match[2].split(" ").map((h) => parseInt(h, 16))), line });
  }
  return { version, date, entries, header };
}

const LETTER = /^\p{L}$/u;
const DIGIT = /^\p{Nd}$/u;

function isKept(entry: Entry): boolean {
  const char = String.fromCodePoint(entry.source);
  if (entry.source < 0x80 || entry.source > 0xffff || char.normalize("NFKC") !== char) return false;
  return (LETTER.test(char) && /^[A-Za-z]+$/.test(entry.prototype)) || (DIGIT.test(char) && /^[0-9]+$/.test(entry.prototype));
}

/** Groups "prototype:delta,delta,…" joined by ";", deltas in base 36 between sorted code points. */
function encode(map: Map<number, string>): string {
  const groups = new Map<string, number[]>();
  for (const [source, prototype] of map) {
    const list = groups.get(prototype) ?? [];
    list.push(source);
    groups.set(prototype, list);
  }
  return [...groups.entries()]
    .sort((a, b) => (a[0] < b[0] ? -1 : a[0] > b[0] ? 1 : 0))
    .map(([prototype, sources]) => {
      let previous = 0;
      const deltas = sources.sort((a, b) => a - b).map((source) => {
        const delta = source - previous;
        previous = source;
        return delta.toString(36);
      });
      return `${prototype}:${deltas.join(",")}`;
    })
    .join(";");
}

const text = await confusablesText();
const { version, date, entries, header } = parse(text);
const kept = new Map<number, string>();
for (const entry of entries) if (isKept(entry)) kept.set(entry.source, entry.prototype.toLowerCase());
let derived = 0;
for (let code = 0x80; code <= 0xffff; code++) {
  if ((code >= 0xd800 && code < 0xe000) || kept.has(code)) continue;
  const char = String.fromCodePoint(code);
  if (!LETTER.test(char) || char.normalize("NFKC") !== char) continue;
  const lower = char.toLowerCase();
  const lowerCode = lower.codePointAt(0) as number;
  if (lower.length === String.fromCodePoint(lowerCode).length && kept.has(lowerCode)) {
    kept.set(code, kept.get(lowerCode) as string);
    derived++;
  }
}
const encoded = encode(kept);
const table = `// GENERATED by scripts/unicode/confusables.ts (npm run confusables): do not edit by hand.
// Source: confusables.txt of Unicode ${version} (UTS #39 security data, dated ${date}),
// sha256 ${CONFUSABLES_SHA256},
// read from ${ORIGIN.member} in Debian's icu_72.1.orig.tar.gz (sha256 ${ORIGIN.sha256}).
// ${kept.size - derived} published mappings (non-ASCII BMP, NFKC-stable letters → ASCII letters, digits → ASCII digits)
// and ${derived} derived upper-case forms; generated with Node ${process.versions.node} (ICU ${process.versions.icu}, Unicode ${process.versions.unicode}).
// Encoding: "prototype:deltas;…", each group's source code points sorted, as base-36 differences.

/** The Unicode version of the confusables data the table was generated from. */
export const CONFUSABLES_UNICODE_VERSION = "${version}";

/** SHA-256 of the confusables.txt the table was generated from. */
export const CONFUSABLES_SOURCE_SHA256 = "${CONFUSABLES_SHA256}";

/** Lookalike → lower-cased prototype, grouped by prototype (decoded by confusables.ts). */
export const CONFUSABLE_GROUPS =
  "${encoded}";
`;
writeFileSync(tableFile, table);
const published = entries.filter((e) => {
  const char = String.fromCodePoint(e.source);
  return e.source >= 0x80 && char.normalize("NFKC") === char && /^[\x00-\x7f]+$/.test(e.prototype);
});
mkdirSync(new URL(".", linesFile), { recursive: true });
writeFileSync(
  linesFile,
  [
    ...header,
    `# Excerpt written by scripts/unicode/confusables.ts: every line of the file above (sha256 ${CONFUSABLES_SHA256})`,
    "# whose source is outside ASCII, unchanged by NFKC, and whose prototype is ASCII; verbatim, in the file's order.",
    ...published.map((e) => e.line),
    "",
  ].join("\n"),
);
console.log(`wrote ${fileURLToPath(tableFile)}: ${kept.size - derived} published + ${derived} derived mappings, ${encoded.length} characters`);
console.log(`wrote ${fileURLToPath(linesFile)}: ${published.length} published lines`);
