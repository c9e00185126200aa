// Parses Debian control-file paragraphs (deb822: "Field: value" lines, continuation lines
// starting with a space, paragraphs separated by empty lines), as in the archive's Packages
// and Translation-en indexes (Debian Policy, section 5.1).

/** One paragraph: field name (as written) → value, continuation lines joined with "\n". */
export type Paragraph = Map<string, string>;

/**
 * Every paragraph of a deb822 text, in order.
 * @example [...readParagraphs("Package: a\nTag: x,\n y\n\nPackage: b\n")].length // 2
 */
export function* readParagraphs(text: string): Generator<Paragraph> {
  let current: Paragraph = new Map();
  let lastField = "";
  let lineNumber = 0;
  for (const line of text.split("\n")) {
    lineNumber++;
    if (line === "") {
      if (current.size > 0) yield current;
      current = new Map();
      lastField = "";
      continue;
    }
    if (line.startsWith(" ") || line.startsWith("\t")) {
      if (lastField === "") throw new Error(`deb822 line ${lineNumber}: a continuation line before any field`);
      current.set(lastField, `${current.get(lastField)}\n${line.slice(1)}`);
      continue;
    }
    const colon = line.indexOf(":");
    if (colon <= 0) throw new Error(`deb822 line ${lineNumber}: expected "Field: value", got ${JSON.stringify(line.slice(0, 60))}`);
    lastField = line.slice(0, colon);
    current.set(lastField, line.slice(colon + 1).trim());
  }
  if (current.size > 0) yield current;
}

/**
 * A long description as readable text: continuation lines joined, " ." paragraph
 * separators become blank lines (Debian Policy, section 5.6.13).
 * @example longDescriptionText("A tool\n that does x.\n .\n More.") // "A tool that does x.\n\nMore."
 */
export function longDescriptionText(value: string): string {
  return value
    .split("\n")
    .map((line) => (line.trim() === "." ? "\n" : line.trim()))
    .join(" ")
    .replace(/ ?\n ?/g, "\n\n")
    .replace(/[ \t]+/g, " ")
    .trim();
}
