// Longer documents with many labels: passages of the Python 3.11 standard library
// reference (Debian's python3.11-doc ships the reST sources under
// usr/share/doc/python3.11/html/_sources/library/). The label is the chapter a module page
// is listed in ("Text Processing Services", "Internet Protocols and Support", …), read from
// the toctree directives of library/index and each chapter; pages nested below a module page
// (email.message under email) belong to its chapter and its group. A row is a passage of
// PASSAGE_WORDS words; the group is the module page, so passages of one page never straddle
// the split.
import { existsSync, readFileSync } from "node:fs";
import { join } from "node:path";
import type { CorpusDefinition, CorpusRow } from "./corpus-writer.ts";
import type { DebianArchive } from "./debian-archive.ts";

export const DOCS_PACKAGE = "python3.11-doc";
const LIBRARY = "usr/share/doc/python3.11/html/_sources/library";
const PASSAGE_WORDS = 200;
/** A last passage shorter than this is dropped (it is mostly a page's tail of links). */
const MIN_PASSAGE_WORDS = 50;
const MAX_PASSAGES_PER_PAGE = 30;
const MIN_CHAPTER_PAGES = 3;

/** The page names listed by a page's toctree directives ("string.rst" → "string"). */
export function toctreeEntries(source: string): string[] {
  const entries: string[] = [];
  const lines = source.split("\n");
  for (let i = 0; i < lines.length; i++) {
    if (!/^\s*\.\. toctree::/.test(lines[i])) continue;
    for (i++; i < lines.length && (lines[i].trim() === "" || /^\s+/.test(lines[i])); i++) {
      const entry = lines[i].trim();
      if (entry === "" || entry.startsWith(":")) continue;
      entries.push(entry.replace(/\.rst$/, "").replace(/^.*<(.+)>$/, "$1"));
    }
    i--;
  }
  return entries;
}

/** The first section title of a reST page (the line above or between over/underlines). */
function pageTitle(source: string): string {
  const lines = source.split("\n");
  for (let i = 1; i < lines.length; i++) {
    if (/^([=*#\-~^])\1{3,}\s*$/.test(lines[i]) && lines[i - 1].trim() !== "" && !/^([=*#\-~^])\1{3,}/.test(lines[i - 1])) {
      return lines[i - 1].trim();
    }
  }
  return "untitled";
}

/**
 * A reST page as plain words: directives keep their argument (a signature), options,
 * targets and heading lines go, inline roles and markup keep their text.
 * @example plainText(":func:`wrap` wraps *text*.") // "wrap wraps text."
 */
export function plainText(source: string): string {
  return source
    .split("\n")
    .filter((line) => !/^\s*\.\. _[^:]*:\s*$/.test(line) && !/^\s*:[\w-]+:(?!`)/.test(line) && !/^\s*([=*#\-~^"+`'])\1{2,}\s*$/.test(line))
    .map((line) => line.replace(/^\s*\.\. [\w:-]+::\s*/, ""))
    .join("\n")
    .replace(/:[\w:+-]+:`~?([^`<]*?)\s*(?:<[^>]*>)?`/g, "$1")
    .replace(/`([^`<]*?)\s*<[^>]*>`_{1,2}/g, "$1")
    .replace(/``([^`]*)``/g, "$1")
    .replace(/\*\*([^*]+)\*\*|\*([^*\s][^*]*)\*/g, "$1$2");
}

function passages(text: string): string[] {
  const words = text.split(/\s+/).filter((w) => w !== "");
  const rows: string[] = [];
  for (let start = 0; start < words.length; start += PASSAGE_WORDS) {
    const slice = words.slice(start, start + PASSAGE_WORDS);
    if (slice.length >= MIN_PASSAGE_WORDS) rows.push(slice.join(" "));
  }
  if (rows.length <= MAX_PASSAGES_PER_PAGE) return rows;
  const step = rows.length / MAX_PASSAGES_PER_PAGE;
  return Array.from({ length: MAX_PASSAGES_PER_PAGE }, (_, i) => rows[Math.floor(i * step)]);
}

/** "library-docs". */
export function libraryDocsCorpus(archive: DebianArchive): CorpusDefinition {
  const sourcesBefore = archive.sources.length;
  const root = join(archive.unpack(DOCS_PACKAGE), LIBRARY);
  const read = (page: string) => {
    const file = join(root, `${page}.rst.txt`);
    return existsSync(file) ? readFileSync(file, "utf8") : null;
  };
  const rows: CorpusRow[] = [];
  const skipped: string[] = [];
  for (const chapter of toctreeEntries(read("index") ?? "")) {
    const chapterSource = read(chapter);
    if (chapterSource === null) continue;
    const label = pageTitle(chapterSource);
    const pages = toctreeEntries(chapterSource);
    if (pages.length < MIN_CHAPTER_PAGES) {
      skipped.push(label);
      continue;
    }
    for (const page of pages) {
      // The page and every page below it, depth first, each read once.
      const seen = new Set<string>();
      const pending = [page];
      let text = "";
      while (pending.length > 0) {
        const current = pending.shift() as string;
        const source = seen.has(current) ? null : read(current);
        seen.add(current);
        if (source === null) continue;
        text += `\n${plainText(source)}`;
        pending.unshift(...toctreeEntries(source));
      }
      for (const passage of passages(text)) rows.push({ text: passage, label, group: page });
    }
  }
  return {
    name: "library-docs",
    shape: "longer documents (200-word passages), many labels",
    description: "Python 3.11 standard library reference (Debian python3.11-doc), passages labelled by chapter",
    rows,
    sources: archive.sources.slice(sourcesBefore),
    notes: [
      `passages of ${PASSAGE_WORDS} words (a shorter tail under ${MIN_PASSAGE_WORDS} words dropped), at most ${MAX_PASSAGES_PER_PAGE} per module page, spread evenly`,
      "reST markup reduced to its text; group = the module page listed in the chapter (with the pages below it)",
      `chapters listing fewer than ${MIN_CHAPTER_PAGES} pages left out: ${skipped.join("; ") || "none"}`,
    ],
  };
}
