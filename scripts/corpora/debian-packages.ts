// Two corpora of Debian package descriptions (bookworm main, amd64): by archive section
// (one label, about 58 uneven labels) and by debtags (the Packages index's `Tag:` field,
// several labels per package). Text = the short description, a newline, and the long
// description from Translation-en (matched by Description-md5). A source package's binary
// packages share wording (libfoo1, libfoo-dev, foo-doc), so the group is the source package.
import type { CorpusDefinition, CorpusRow } from "./corpus-writer.ts";
import { longDescriptionText } from "./deb822.ts";
import type { DebianArchive } from "./debian-archive.ts";

/** A section label needs this many packages to be kept. */
const MIN_SECTION_ROWS = 20;
/** A tag needs this many packages to be a label of the multi-label corpus. */
const MIN_TAG_ROWS = 300;

interface DescribedPackage {
  text: string;
  section: string;
  tags: string[];
  group: string;
}

function describedPackages(archive: DebianArchive): { packages: DescribedPackage[]; duplicates: number; undescribed: number } {
  const long = archive.longDescriptions();
  const packages: DescribedPackage[] = [];
  const seenTexts = new Set<string>();
  let duplicates = 0;
  let undescribed = 0;
  for (const paragraph of archive.packageIndex()) {
    const name = paragraph.get("Package") as string;
    const full = long.get(`${name}/${paragraph.get("Description-md5")}`);
    if (full === undefined) {
      undescribed++;
      continue;
    }
    const newline = full.indexOf("\n");
    const short = (newline === -1 ? full : full.slice(0, newline)).trim();
    const text = newline === -1 ? short : `${short}\n${longDescriptionText(full.slice(newline + 1))}`;
    // Identical descriptions ("transitional package", generated texts) would be the same
    // example on both sides of a split; only the first is kept.
    const key = text.toLowerCase().replace(/\s+/g, " ");
    if (seenTexts.has(key)) {
      duplicates++;
      continue;
    }
    seenTexts.add(key);
    const section = (paragraph.get("Section") ?? "unknown").replace(/^(?:contrib|non-free|non-free-firmware)\//, "");
    const tags = (paragraph.get("Tag") ?? "").split(/[,\s]+/).filter((t) => t !== "" && !t.startsWith("special::"));
    const group = (paragraph.get("Source") ?? name).replace(/\s*\(.*\)$/, "");
    packages.push({ text, section, tags, group });
  }
  return { packages, duplicates, undescribed };
}

function countBy(values: Iterable<string>): Map<string, number> {
  const counts = new Map<string, number>();
  for (const value of values) counts.set(value, (counts.get(value) ?? 0) + 1);
  return counts;
}

/** "package-sections" and "package-tags". */
export function debianPackageCorpora(archive: DebianArchive): CorpusDefinition[] {
  const { packages, duplicates, undescribed } = describedPackages(archive);
  const common = [
    `${duplicates} packages whose description repeats an earlier one (case and spacing ignored) are left out`,
    `${undescribed} packages without an English long description in Translation-en are left out`,
    "group = the source package",
  ];
  const sectionCounts = countBy(packages.map((p) => p.section));
  const sectionRows: CorpusRow[] = packages
    .filter((p) => (sectionCounts.get(p.section) ?? 0) >= MIN_SECTION_ROWS)
    .map((p) => ({ text: p.text, label: p.section, group: p.group }));
  const rareSections = [...sectionCounts].filter(([, n]) => n < MIN_SECTION_ROWS).map(([s]) => s);

  const tagCounts = countBy(packages.flatMap((p) => p.tags));
  const kept = new Set([...tagCounts].filter(([, n]) => n >= MIN_TAG_ROWS).map(([t]) => t));
  const tagRows: CorpusRow[] = [];
  for (const p of packages) {
    const labels = p.tags.filter((t) => kept.has(t)).sort();
    if (labels.length > 0) tagRows.push({ text: p.text, label: labels, group: p.group });
  }
  return [
    {
      name: "package-sections",
      shape: "short descriptions, ~58 uneven labels",
      description: "Debian bookworm main package descriptions (short + long) labelled by archive section",
      rows: sectionRows,
      sources: archive.sources.slice(),
      notes: [...common, `sections with fewer than ${MIN_SECTION_ROWS} packages left out: ${rareSections.join(", ") || "none"}`],
    },
    {
      name: "package-tags",
      shape: "short descriptions, multi-label",
      description: "Debian bookworm main package descriptions labelled with their debtags (Tag: field)",
      rows: tagRows,
      sources: archive.sources.slice(),
      notes: [...common, `labels = tags on at least ${MIN_TAG_ROWS} packages (special::* left out); packages with none of them left out`],
    },
  ];
}
