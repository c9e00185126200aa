// The featurizer (normalize → tokenize → n-grams → hash), read through the names it
// gives each slot (createFeatureBuffer(…, true)). Most checks compare two texts that a
// standard says are the same (Unicode normalization, case mapping, format characters);
// the rest pin the feature layout against counts derived here from first principles.

import { describe, expect, it } from "vitest";
import { createFeatureBuffer, createFeaturizer, type FeatureBuffer, type FeaturizerSettings } from "../../../runtime/featurizer/featurizer.ts";
import { NORMALIZATION_VERSION } from "../../../runtime/featurizer/normalize.ts";

const WORDS_ONLY: FeaturizerSettings = {
  normalization: NORMALIZATION_VERSION,
  wordSpan: 1,
  charMin: 0,
  charMax: 0,
  hashBits: 20,
  hashSeed: 0,
  maxTokens: 2000,
};

const DEFAULTS: FeaturizerSettings = { ...WORDS_ONLY, wordSpan: 2, charMin: 3, charMax: 4 };
/** The defaults under normalization 1 (no evasion folding). */
const V1: FeaturizerSettings = { ...DEFAULTS, normalization: 1 };

interface Features {
  slots: number[];
  names: string[];
  buffer: FeatureBuffer;
}

function featuresOf(text: string, settings: FeaturizerSettings = DEFAULTS): Features {
  const buffer = createFeatureBuffer(16, true);
  createFeaturizer(settings).featurize(text, buffer);
  return { slots: Array.from(buffer.slots.subarray(0, buffer.count)), names: [...(buffer.names as string[])], buffer };
}

function slotsOf(text: string, settings: FeaturizerSettings = DEFAULTS): number[] {
  return featuresOf(text, settings).slots;
}

/** The slot whose name is `name` (the test fails when there is none). */
function slotNamed(features: Features, name: string): number {
  const index = features.names.indexOf(name);
  expect(index, `no feature named ${name} in ${JSON.stringify(features.names)}`).toBeGreaterThanOrEqual(0);
  return features.slots[index];
}

describe("normalization", () => {
  it("gives fullwidth letters the features of plain ASCII letters (NFKC)", () => {
    // UAX #15 (Unicode Normalization Forms): NFKC applies compatibility decompositions;
    // U+FF26 FULLWIDTH LATIN CAPITAL LETTER F has the <wide> decomposition U+0046 (UnicodeData.txt, from memory).
    expect(slotsOf("ＦＲＥＥ ｏｆｆｅｒ")).toEqual(slotsOf("free offer"));
  });

  it("gives a ligature the features of its letters (NFKC)", () => {
    // UAX #15: NFKC applies compatibility decompositions; U+FB01 LATIN SMALL LIGATURE FI has the
    // <compat> decomposition 0066 0069 (UnicodeData.txt, from memory).
    expect(slotsOf("ﬁle")).toEqual(slotsOf("file"));
  });

  it("gives upper-case ASCII the features of lower case", () => {
    // Unicode default case mapping: the simple lowercase of U+0041..U+005A is U+0061..U+007A (UnicodeData.txt).
    expect(slotsOf("FREE Offer")).toEqual(slotsOf("free offer"));
  });

  it("gives upper-case non-ASCII letters the features of lower case", () => {
    // UnicodeData.txt: U+00C9 LATIN CAPITAL LETTER E WITH ACUTE lowercases to U+00E9 (from memory).
    expect(slotsOf("ÉCOLE")).toEqual(slotsOf("école"));
  });

  it("removes a zero-width space inside a word", () => {
    // U+200B ZERO WIDTH SPACE is General_Category Cf (format) and not White_Space
    // (UnicodeData.txt, PropList.txt, from memory): it is invisible, so "fr\u200Bee" reads as "free".
    expect(slotsOf("fr\u200Bee", V1)).toEqual(slotsOf("free", V1));
    // Version 2 reads the same word and adds the evidence of the attempt.
    expect(featuresOf("fr\u200Bee").names).toEqual([...featuresOf("free").names, "[hidden-chars]"]);
  });

  it("removes a zero-width joiner and a byte order mark inside a word", () => {
    // U+200D ZERO WIDTH JOINER and U+FEFF ZERO WIDTH NO-BREAK SPACE are Cf as well (UnicodeData.txt, from memory).
    expect(slotsOf("o\u200Dff\uFEFFer", V1)).toEqual(slotsOf("offer", V1));
    expect(featuresOf("o\u200Dff\uFEFFer").names).toEqual([...featuresOf("offer").names, "[hidden-chars]"]);
  });

  it.each([
    ["NUL", "\u0000"],
    ["BEL", "\u0007"],
    ["DEL", "\u007f"],
    ["NEL", "\u0085"],
  ])("treats the control character %s as a separator between words", (_, control) => {
    // General_Category Cc (UnicodeData.txt: U+0000..U+001F, U+007F..U+009F): control characters are not text, so they end a word.
    expect(slotsOf(`free${control}offer`)).toEqual(slotsOf("free offer"));
  });
});

describe("shape tokens", () => {
  it("names a URL by its host and adds a feature shared by every URL", () => {
    const features = featuresOf("visit https://www.example.com/deals now", WORDS_ONLY);
    // RFC 3986 section 3.2.2: the host follows "//" and ends at "/", "?", "#" or ":".
    // Dropping a leading "www." is common practice, no source.
    expect(features.names).toEqual(["visit", "[url example.com]", "[url]", "now"]);
  });

  it("gives two URLs on the same host the same host feature", () => {
    // Same host per RFC 3986 section 3.2.2 once "www." is dropped (common practice, no source);
    // the scheme and the path do not matter.
    const a = featuresOf("https://www.example.com/x", WORDS_ONLY);
    const b = featuresOf("http://example.com/y", WORDS_ONLY);
    expect(slotNamed(a, "[url example.com]")).toBe(slotNamed(b, "[url example.com]"));
    expect(a.slots).toEqual(b.slots);
  });

  it("gives URLs on different hosts different host features but the same [url] feature", () => {
    const a = featuresOf("https://example.com/x", WORDS_ONLY);
    const b = featuresOf("https://example.net/x", WORDS_ONLY);
    // RFC 3986 section 3.2.2: example.com and example.net are different hosts.
    expect(slotNamed(a, "[url example.com]")).not.toBe(slotNamed(b, "[url example.net]"));
    expect(slotNamed(a, "[url]")).toBe(slotNamed(b, "[url]"));
  });

  it("maps an e-mail address to one [email] feature", () => {
    // RFC 5322 section 3.4.1: addr-spec = local-part "@" domain.
    expect(featuresOf("write to kofi.mensah@example.org today", WORDS_ONLY).names).toEqual(["write", "to", "[email]", "today"]);
  });

  it("gives different e-mail addresses the same features", () => {
    // Both are RFC 5322 addr-specs; the shape, not the address, is the feature (common practice, no source).
    expect(slotsOf("mail a@example.org", WORDS_ONLY)).toEqual(slotsOf("mail tamsin.75@example.net", WORDS_ONLY));
  });

  it.each([
    ["7", "[number:1]"],
    ["42", "[number:2]"],
    ["365", "[number:3]"],
    ["2024", "[number:4]"],
    ["123456", "[number:5+]"],
    ["42.50", "[number:4]"],
    ["10:30", "[number:4]"],
  ])("maps the number %s to the bucket %s by its count of digits", (number, bucket) => {
    // Bucketing numbers by digit count is common practice, no source; "." and ":" between
    // digits belong to the number (a decimal point, a clock time).
    expect(featuresOf(number, WORDS_ONLY).names).toEqual([bucket]);
  });

  it("gives two numbers with the same count of digits the same features", () => {
    // Common practice, no source: the digit count is the feature, not the value.
    expect(slotsOf("order 12345 ok", WORDS_ONLY)).toEqual(slotsOf("order 98765 ok", WORDS_ONLY));
  });

  it.each([["a12345"], ["A12345"], ["#B20417"], ["x9y8z7"]])("maps the mixed letters-and-digits code %s to [code]", (code) => {
    // Common practice, no source: order numbers and similar codes become one shape token.
    expect(featuresOf(code, WORDS_ONLY).names).toEqual(["[code]"]);
  });

  it("keeps a word with fewer than three digits as a word", () => {
    // Common practice, no source: "a12" is more often a model name than an order code.
    expect(featuresOf("a12", WORDS_ONLY).names).toEqual(["a12"]);
  });
});

describe("punctuation and emoji", () => {
  it("gives a typographic apostrophe the features of the ASCII apostrophe", () => {
    // The Unicode Standard, section 6.2 ("Apostrophes"): U+2019 RIGHT SINGLE QUOTATION MARK is
    // the preferred apostrophe, U+0027 the ASCII one; both mean the same letter-joining mark (from memory).
    expect(slotsOf("don’t")).toEqual(slotsOf("don't"));
    expect(featuresOf("don’t", WORDS_ONLY).names).toEqual(["don't"]);
  });

  it("gives the modifier letter apostrophe the features of the ASCII apostrophe", () => {
    // U+02BC MODIFIER LETTER APOSTROPHE is the third apostrophe form the Unicode Standard lists (section 6.2, from memory).
    expect(slotsOf("donʼt")).toEqual(slotsOf("don't"));
  });

  it("makes an emoji a token of its own, even when it touches a word", () => {
    // U+1F600 is Extended_Pictographic (emoji-data.txt, UTS #51, from memory); an emoji is a symbol, not a letter.
    const touching = featuresOf("great😀", WORDS_ONLY);
    expect(touching.names).toEqual(["great", "😀"]);
    expect(touching.slots).toEqual(slotsOf("great 😀", WORDS_ONLY));
  });

  it("makes each of two adjacent emoji its own token", () => {
    // Each Extended_Pictographic code point is its own symbol (emoji-data.txt, UTS #51).
    expect(featuresOf("😀😡", WORDS_ONLY).names).toEqual(["😀", "😡"]);
  });

  it('gives "!!!" and "!!!!!" the same token', () => {
    // Common practice, no source: beyond three, more exclamation marks add no signal.
    expect(slotsOf("win !!!", WORDS_ONLY)).toEqual(slotsOf("win !!!!!", WORDS_ONLY));
  });

  it('gives "!!" and "!!!" different tokens', () => {
    // The counterpart of the check above (common practice, no source): runs are capped at three, not merged.
    expect(slotsOf("win !!", WORDS_ONLY)).not.toEqual(slotsOf("win !!!", WORDS_ONLY));
  });
});

describe("word n-grams", () => {
  it("adds word pairs when the word span is 2", () => {
    // Word bigrams: each pair of adjacent tokens (common practice, no source).
    expect(featuresOf("cheap deal now", { ...WORDS_ONLY, wordSpan: 2 }).names).toEqual(["cheap", "deal", "now", "cheap deal", "deal now"]);
  });

  it("adds no word pairs when the word span is 1", () => {
    expect(featuresOf("cheap deal now", WORDS_ONLY).names).toEqual(["cheap", "deal", "now"]);
  });

  it("adds T − n + 1 word n-grams of each length n up to the word span", () => {
    // T tokens have T − n + 1 windows of n adjacent tokens (common practice, no source).
    const text = "one two three four five six";
    const tokens = 6;
    for (let span = 1; span <= 4; span++) {
      let expected = tokens;
      for (let n = 2; n <= span; n++) expected += tokens - n + 1;
      expect(featuresOf(text, { ...WORDS_ONLY, wordSpan: span }).buffer.count, `word span ${span}`).toBe(expected);
    }
  });
});

describe("character n-grams", () => {
  // Derivation. A word of L characters is framed by an edge mark on each side, giving
  // F = L + 2 positions. The character n-grams of length n are the F − n + 1 windows of n
  // consecutive positions (none when n > F). Lengths run from charMin to charMax. A
  // window that is a lone edge mark says nothing, so when charMin = 1 the two length-1
  // windows at the edges are dropped:
  //   count(L) = Σ_{n = charMin}^{min(charMax, F)} (F − n + 1)  −  (charMin = 1 ? 2 : 0)
  function expectedCharGrams(length: number, charMin: number, charMax: number): number {
    const framed = length + 2;
    let count = 0;
    for (let n = charMin; n <= Math.min(charMax, framed); n++) count += framed - n + 1;
    return charMin === 1 ? count - 2 : count;
  }

  it.each([
    [1, 1],
    [1, 3],
    [2, 5],
    [3, 4],
    [3, 6],
    [5, 8],
  ])("adds the derived count of n-grams for words of every length from 1 to 12 with lengths %i-%i", (charMin, charMax) => {
    const settings = { ...WORDS_ONLY, charMin, charMax };
    for (let length = 1; length <= 12; length++) {
      const word = "abcdefghijkl".slice(0, length);
      // One feature is the word itself.
      expect(featuresOf(word, settings).buffer.count - 1, `word length ${length}`).toBe(expectedCharGrams(length, charMin, charMax));
    }
  });

  it('adds exactly the framed windows of "parcel" for lengths 3-4', () => {
    // The windows of "·parcel·" (· = edge mark), enumerated here independently of the featurizer.
    const framed = "·parcel·";
    const windows: string[] = [];
    for (let n = 3; n <= 4; n++) for (let start = 0; start + n <= framed.length; start++) windows.push(framed.slice(start, start + n));
    const names = featuresOf("parcel", { ...WORDS_ONLY, charMin: 3, charMax: 4 }).names;
    expect(names[0]).toBe("parcel");
    expect(names.slice(1).sort()).toEqual(windows.sort());
    expect(windows).toHaveLength(expectedCharGrams(6, 3, 4)); // 6 + 5 = 11
  });

  it("names every window by its own characters across many words and repeats (names are reused between words)", () => {
    // 3,000 distinct words plus a long run of one letter: far more windows than the featurizer
    // keeps recent names for, so reused and evicted names are both exercised. Each word's
    // windows are enumerated here as in the "parcel" case above. Normalization 1, whose
    // words read as written (2 would fold the letter runs).
    const settings = { ...WORDS_ONLY, normalization: 1, charMin: 3, charMax: 4 };
    const letters = "abcdefghijklmnopqrstuvwxyz";
    const words = Array.from({ length: 3000 }, (_, i) => `${letters[i % 26]}${letters[(i * 7) % 26]}${letters[(i * 11) % 26]}q${i.toString(36).replace(/[0-9]/g, (d) => letters[Number(d)])}`);
    words.push("z".repeat(5000), "zzz", "zzzz");
    const expected: string[] = [];
    for (const word of words) {
      const framed = `·${word}·`;
      expected.push(word);
      for (let start = 0; start < framed.length; start++) for (let n = 3; n <= 4 && start + n <= framed.length; n++) expected.push(framed.slice(start, start + n));
    }
    // Words come first, then each word's windows; compared as sorted lists like "parcel" above.
    expect(featuresOf(words.join(" "), { ...settings, maxTokens: 5000 }).names.sort()).toEqual(expected.sort());
  });

  it("adds no character n-grams for shape tokens", () => {
    // Shape tokens ([number:N], [code], [url …], [email]) stand for a class, not for letters.
    const settings = { ...WORDS_ONLY, charMin: 3, charMax: 4 };
    expect(featuresOf("12345 a12345 kofi@example.org https://example.com", settings).names).toEqual([
      "[number:5+]",
      "[code]",
      "[email]",
      "[url example.com]",
      "[url]",
    ]);
  });
});

describe("the token limit", () => {
  const LIMIT_3 = { ...WORDS_ONLY, maxTokens: 3 };

  it("stops at maxTokens and says the text was truncated", () => {
    const { names, buffer } = featuresOf("one two six four five", LIMIT_3);
    expect(names).toEqual(["one", "two", "six"]);
    expect(buffer.tokenCount).toBe(3);
    expect(buffer.truncated).toBe(true);
  });

  it("does not say truncated when the text has exactly maxTokens tokens", () => {
    const { buffer } = featuresOf("one two six", LIMIT_3);
    expect(buffer.tokenCount).toBe(3);
    expect(buffer.truncated).toBe(false);
  });

  it("says truncated when the token past the limit is in the same chunk as the last one read", () => {
    const { names, buffer } = featuresOf("one two six,four", LIMIT_3);
    expect(names).toEqual(["one", "two", "six"]);
    expect(buffer.truncated).toBe(true);
  });

  it("does not say truncated when only whitespace follows the last token", () => {
    const { buffer } = featuresOf("one two three ", LIMIT_3);
    expect(buffer.truncated).toBe(false);
  });
});

describe("hashing into slots", () => {
  const MIXED = "Hi Kofi, order #B20417 ($42.50) ships today!!! Track: https://www.example.com/t?id=7 or mail help@example.org 😀 don’t";

  it("gives the same slots for the same text on every call, reusing the buffer", () => {
    const featurizer = createFeaturizer(DEFAULTS);
    const buffer = createFeatureBuffer(1024);
    featurizer.featurize(MIXED, buffer);
    const first = Array.from(buffer.slots.subarray(0, buffer.count));
    const slotsArray = buffer.slots;
    featurizer.featurize("something else entirely, with other words", buffer);
    featurizer.featurize(MIXED, buffer);
    expect(Array.from(buffer.slots.subarray(0, buffer.count))).toEqual(first);
    expect(buffer.slots).toBe(slotsArray); // no new array once the buffer is large enough
    expect(first).toEqual(slotsOf(MIXED)); // and a fresh featurizer agrees
  });

  it("grows a buffer that is too small and still gives the same slots", () => {
    const small = createFeatureBuffer(2);
    createFeaturizer(DEFAULTS).featurize(MIXED, small);
    expect(Array.from(small.slots.subarray(0, small.count))).toEqual(slotsOf(MIXED));
  });

  it("gives different slots for a different hash seed", () => {
    const a = slotsOf(MIXED);
    const b = slotsOf(MIXED, { ...DEFAULTS, hashSeed: 1 });
    expect(b).toHaveLength(a.length);
    // With 2^20 slots, a shared slot between two independent hashes is a 1-in-a-million event.
    const same = a.filter((slot, i) => slot === b[i]).length;
    expect(same).toBeLessThan(a.length / 10);
  });

  it.each([10, 12, 16, 20])("keeps every slot below 2^%i", (hashBits) => {
    const { slots } = featuresOf(MIXED, { ...DEFAULTS, hashBits, wordSpan: 3, charMin: 1, charMax: 6 });
    expect(slots.length).toBeGreaterThan(100);
    for (const slot of slots) expect(slot).toBeLessThan(2 ** hashBits);
    // And the mask keeps the spread: many distinct slots, not a few.
    expect(new Set(slots).size).toBeGreaterThan(Math.min(50, 2 ** hashBits / 20));
  });
});
