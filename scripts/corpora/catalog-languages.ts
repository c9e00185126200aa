// Language identification from the translated message catalogs (.mo files) that Debian
// packages ship under usr/share/locale/<locale>/LC_MESSAGES/. One label per language (and
// per script where one language is written in two: zh-Hans / zh-Hant, sr / sr@latin); a
// row is consecutive translated messages of one catalog joined until it reaches
// MIN_ROW_CHARS. The group is the catalog's domain and the language, so the regional
// variants of one catalog (pt, pt_BR) stay on one side of the split.
import { readdirSync, readFileSync, existsSync } from "node:fs";
import { join } from "node:path";
import type { CorpusDefinition, CorpusRow } from "./corpus-writer.ts";
import type { DebianArchive } from "./debian-archive.ts";
import { readMoFile } from "./mo-file.ts";

/** Packages with many catalogs, in many scripts (GTK, GLib and GNOME ship about 100 languages each). */
export const CATALOG_PACKAGES = [
  "libgtk-3-common",
  "libglib2.0-data",
  "gnome-control-center-data",
  "nautilus-data",
  "gnome-shell-common",
  "evolution-data-server-common",
  "coreutils",
  "libc-l10n",
  "util-linux-locales",
  "dpkg",
  "apt",
  "tar",
  "gettext",
] as const;

const MIN_ROW_CHARS = 100;
/** At most this many rows from one catalog file (spread evenly), so big catalogs do not dominate. */
const MAX_ROWS_PER_CATALOG = 20;
/** A language needs this many groups (catalogs) and rows to be kept. */
const MIN_LANGUAGE_GROUPS = 3;
const MIN_LANGUAGE_ROWS = 40;

const SCRIPT_MODIFIERS = new Set(["latin", "cyrillic", "shaw", "devanagari", "arabic"]);

/**
 * The label of a locale directory name, or null for a locale that is not a language of its
 * own (gettext's en@quot / en@boldquot are English with other quote marks; bare "zh" does
 * not say which script).
 * @example languageLabel("zh_TW") // "zh-Hant"
 * @example languageLabel("sr@latin") // "sr@latin"
 * @example languageLabel("pt_BR") // "pt"
 */
export function languageLabel(locale: string): string | null {
  const match = /^([a-z]{2,3})(?:_([A-Z]{2}))?(?:\.[^@]+)?(?:@([a-z]+))?$/.exec(locale);
  if (!match) return null;
  const [, language, territory, modifier] = match;
  if (modifier === "quot" || modifier === "boldquot") return null;
  if (language === "zh") {
    if (territory === "CN" || territory === "SG") return "zh-Hans";
    if (territory === "TW" || territory === "HK" || territory === "MO") return "zh-Hant";
    return null;
  }
  const base = language === "no" ? "nb" : language;
  return modifier && SCRIPT_MODIFIERS.has(modifier) ? `${base}@${modifier}` : base;
}

/**
 * A translated message as plain text: the first plural form, without printf and brace
 * placeholders, markup tags and GTK mnemonic underscores, which are the same in every language.
 * @example cleanMessage("_Öffnen %s <b>jetzt</b>") // "Öffnen jetzt"
 */
export function cleanMessage(message: string): string {
  return message
    .replace(/%(?:\d+\$)?[-+ #0']*\d*(?:\.\d+)?[hlLqjzt]*[a-zA-Z%]/g, " ")
    .replace(/\$\{[^}]*\}|\{[0-9a-z_]*\}/g, " ")
    .replace(/<[^>]{1,40}>/g, " ")
    .replace(/_(?=\p{L})/gu, "")
    .replace(/\s+/g, " ")
    .trim();
}

interface CatalogFile {
  path: string;
  domain: string;
  locale: string;
  label: string;
}

function catalogFiles(root: string): CatalogFile[] {
  const localeDir = join(root, "usr/share/locale");
  if (!existsSync(localeDir)) return [];
  const files: CatalogFile[] = [];
  for (const locale of readdirSync(localeDir).sort()) {
    const label = languageLabel(locale);
    const messages = join(localeDir, locale, "LC_MESSAGES");
    if (label === null || !existsSync(messages)) continue;
    for (const file of readdirSync(messages).sort()) {
      if (file.endsWith(".mo")) files.push({ path: join(messages, file), domain: file.slice(0, -3), locale, label });
    }
  }
  return files;
}

function catalogRows(file: CatalogFile): string[] {
  const rows: string[] = [];
  let current: string[] = [];
  let length = 0;
  for (const entry of readMoFile(readFileSync(file.path), file.path)) {
    const translation = entry.translations[0] ?? "";
    // An untranslated copy of the English original would be English under another label.
    if (translation === "" || translation === entry.original) continue;
    const text = cleanMessage(translation);
    if (!/\p{L}.*\p{L}/u.test(text)) continue;
    current.push(text);
    length += [...text].length + 1;
    if (length >= MIN_ROW_CHARS) {
      rows.push(current.join(" "));
      current = [];
      length = 0;
    }
  }
  if (rows.length <= MAX_ROWS_PER_CATALOG) return rows;
  const step = rows.length / MAX_ROWS_PER_CATALOG;
  return Array.from({ length: MAX_ROWS_PER_CATALOG }, (_, i) => rows[Math.floor(i * step)]);
}

/** "catalog-languages". */
export function catalogLanguageCorpus(archive: DebianArchive): CorpusDefinition {
  const sourcesBefore = archive.sources.length;
  const rows: CorpusRow[] = [];
  for (const name of CATALOG_PACKAGES) {
    for (const file of catalogFiles(archive.unpack(name))) {
      for (const text of catalogRows(file)) rows.push({ text, label: file.label, group: `${file.domain}/${file.label}` });
    }
  }
  const groups = new Map<string, Set<string>>();
  const counts = new Map<string, number>();
  for (const row of rows) {
    const label = row.label as string;
    if (!groups.has(label)) groups.set(label, new Set());
    groups.get(label)?.add(row.group);
    counts.set(label, (counts.get(label) ?? 0) + 1);
  }
  const keep = (label: string) => (groups.get(label)?.size ?? 0) >= MIN_LANGUAGE_GROUPS && (counts.get(label) ?? 0) >= MIN_LANGUAGE_ROWS;
  const dropped = [...groups.keys()].filter((l) => !keep(l)).sort();
  return {
    name: "catalog-languages",
    shape: "language identification, many scripts incl. unsegmented (zh, ja, th, km, …)",
    description: `translated message catalogs (.mo) of ${CATALOG_PACKAGES.length} Debian packages, one label per language`,
    rows: rows.filter((r) => keep(r.label as string)),
    sources: archive.sources.slice(sourcesBefore),
    notes: [
      `a row joins consecutive translated messages of one catalog until it has ${MIN_ROW_CHARS} characters; at most ${MAX_ROWS_PER_CATALOG} rows per catalog file, spread evenly`,
      "placeholders, markup and mnemonic underscores removed; untranslated copies of the original left out",
      "labels: language code, regions merged (pt_BR → pt), scripts kept apart (zh-Hans/zh-Hant, sr/sr@latin); en@quot, en@boldquot and bare zh left out",
      "group = catalog domain + language",
      `languages with fewer than ${MIN_LANGUAGE_GROUPS} catalogs or ${MIN_LANGUAGE_ROWS} rows left out: ${dropped.join(", ") || "none"}`,
    ],
  };
}
