// Lookalike folding (normalization 2) against the standard: the published lines of UTS #39's
// confusables.txt (Unicode 15.0.0), kept verbatim in test/fixtures/unicode/confusables-lines.txt
// by scripts/unicode/confusables.ts, parsed here by a parser of our own; and against a
// general-purpose npm package implementing the same standard, unhomoglyph 1.0.6 (its README:
// data from confusables.txt, v13.0.0).
import { readFileSync } from "node:fs";
import fc from "fast-check";
import unhomoglyph from "unhomoglyph";
import { describe, expect, it } from "vitest";
import { CONFUSABLES_SOURCE_SHA256, CONFUSABLES_UNICODE_VERSION } from "../../../runtime/featurizer/confusables-table.ts";
import { TextNormalizer } from "../../../runtime/featurizer/normalize.ts";

const excerpt = readFileSync(new URL("../../fixtures/unicode/confusables-lines.txt", import.meta.url), "utf8");

interface Line {
  hex: string;
  source: string;
  prototype: string;
}

/** "source ; prototype ; MA # comment", as UTS #39 section 4 describes the file (fields separated by ";"). */
function parseLines(text: string): Line[] {
  const lines: Line[] = [];
  for (const line of text.split("\n")) {
    if (line.startsWith("#") || line.trim() === "") continue;
    const [sourceField, prototypeField, type] = line.split("#")[0].split(";").map((field) => field.trim());
    expect(type).toBe("MA");
    lines.push({
      hex: sourceField,
      source: String.fromCodePoint(parseInt(sourceField, 16)),
      prototype: String.fromCodePoint(...prototypeField.split(/\s+/).map((hex) => parseInt(hex, 16))),
    });
  }
  return lines;
}

const lines = parseLines(excerpt);
const normalizer = new TextNormalizer(2);
const v1 = new TextNormalizer(1);

/** What the table keeps (scripts/unicode/confusables.ts): up to U+FFFF, letters to ASCII letters, decimal digits to ASCII digits. */
function isKept(line: Line): boolean {
  if ((line.source.codePointAt(0) as number) > 0xffff) return false;
  return (/^\p{L}$/u.test(line.source) && /^[A-Za-z]+$/.test(line.prototype)) || (/^\p{Nd}$/u.test(line.source) && /^[0-9]+$/.test(line.prototype));
}

const kept = lines.filter(isKept);
const leftOut = lines.filter((line) => !isKept(line));

/** The Unicode block of a code point, coarsely (its code point divided by 128), to show coverage. */
function blockOf(line: Line): number {
  return (line.source.codePointAt(0) as number) >> 7;
}

describe("the lookalike table", () => {
  it("was generated from the pinned confusables.txt", () => {
    // The excerpt's own header (copied from the file) names the version; its note names the file's SHA-256.
    expect(excerpt).toMatch(new RegExp(`^# Version: ${CONFUSABLES_UNICODE_VERSION.replace(/\./g, "\\.")}$`, "m"));
    expect(CONFUSABLES_UNICODE_VERSION).toBe("15.0.0");
    expect(excerpt).toContain(`(sha256 ${CONFUSABLES_SOURCE_SHA256})`);
    expect(lines.length).toBe(649);
    expect(kept.length).toBe(285);
  });

  it("folds each kept lookalike to its published prototype, lower-cased, in every block the data covers", () => {
    const blocks = new Set(kept.map(blockOf));
    expect(blocks.size).toBe(40); // Latin, Greek, Cyrillic, Armenian, Cherokee, Lisu, Coptic, …: every kept line is checked below
    for (const line of kept) expect(normalizer.normalize(line.source), `U+${line.hex}`).toBe(line.prototype.toLowerCase());
  });

  it("folds a lookalike inside a Latin word, and the word's Latin letters stay", () => {
    for (const line of kept) {
      const folded = normalizer.normalize(`x${line.source}x`);
      expect(folded, `U+${line.hex}`).toBe(`x${line.prototype.toLowerCase()}x`);
    }
  });

  it("leaves the lines it does not keep as version 1 reads them (letters that look like punctuation, digits that look like letters, sources above U+FFFF)", () => {
    // E.g. U+30CE KATAKANA LETTER NO → "/" would split Japanese words, U+0661 ARABIC-INDIC DIGIT ONE → "l" would turn numbers into words;
    // above U+FFFF (U+1043D DESERET SMALL LETTER CHEE → "c") the tokenizer reads no letters at all.
    expect(leftOut.some((line) => line.hex === "1043D")).toBe(true);
    expect(leftOut.some((line) => line.hex === "30CE")).toBe(true);
    // (Their lower case is read like any other text: U+01BC Ƽ → "5" is left out, but its lower case
    // U+01BD ƽ → "s" is kept, so Ƽ reads as "s", the generator's derived upper-case form.)
    for (const line of leftOut) expect(normalizer.normalize(line.source), `U+${line.hex}`).toBe(normalizer.normalize(v1.normalize(line.source)));
    expect(leftOut.filter((line) => normalizer.normalize(line.source) !== v1.normalize(line.source)).map((line) => line.hex)).toEqual(["01BC"]);
  });

  it("folds the upper-case form of a kept lower-case lookalike that the data lists only in lower case", () => {
    // Derived by the generator, not published: U+A7AC LATIN CAPITAL LETTER SCRIPT G lower-cases to U+0261, whose prototype is "g".
    expect(normalizer.normalize("\uA7AC")).toBe("g");
    expect(normalizer.normalize("\u0261")).toBe("g");
  });

  it("agrees with unhomoglyph on a few thousand random words of lookalikes and ASCII letters", () => {
    // The word's ASCII letters avoid "m", which unhomoglyph (like UTS #39) maps to "rn"; the
    // featurizer reads ASCII as written. No other disagreement: the kept lines did not change
    // between the 13.0.0 data unhomoglyph ships and the 15.0.0 data pinned here.
    const letters = "abcdefghijklnopqrstuvwxyz".split("");
    const word = fc.array(fc.oneof(fc.constantFrom(...kept.map((line) => line.source)), fc.constantFrom(...letters)), { minLength: 1, maxLength: 12 }).map((parts) => parts.join(""));
    fc.assert(
      fc.property(word, (text) => {
        expect(normalizer.normalize(text)).toBe(unhomoglyph(text).toLowerCase());
      }),
      { numRuns: 4000 },
    );
  });
});

describe("words that are not Latin", () => {
  it("keep their letters when some letter has no Latin prototype", () => {
    // Russian "привет" (hello) holds р, е (lookalikes) and п, и, в, т (none): it stays Cyrillic.
    expect(normalizer.normalize("Привет мир")).toBe("привет мир");
    // Greek "και" (and): κ has no prototype in lower case.
    expect(normalizer.normalize("και")).toBe("και");
  });

  it("fold when every letter is a lookalike (a whole-script lookalike of a Latin word)", () => {
    // Cyrillic с, о, р: the word reads as "cop".
    expect(normalizer.normalize("\u0441\u043e\u0440")).toBe("cop");
  });
});
