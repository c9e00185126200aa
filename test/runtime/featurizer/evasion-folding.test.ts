// The evasion folding rules of normalizations 2 and 3, through the features they give: each
// kind of evasion recovers the clean text's features on hand-written cases, numbers, prices,
// codes, URLs and e-mail addresses read as version 1 reads them, and folding never throws and
// is idempotent (fast-check, including lone surrogates and combining marks). Version 3 differs
// from 2 in three rules (every run of one letter reads as one letter, a leetspeak reading drops
// the ". , :" between its digits, a spaced run starts again where its gap changes); version 2
// models keep reading text exactly by version 2's rules. The readings of leetspeak are common
// practice, no source.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { createFeatureBuffer, createFeaturizer, type FeaturizerSettings } from "../../../runtime/featurizer/featurizer.ts";
import { TextNormalizer } from "../../../runtime/featurizer/normalize.ts";

const V2: FeaturizerSettings = { normalization: 2, wordSpan: 2, charMin: 3, charMax: 4, hashBits: 20, hashSeed: 0, maxTokens: 2000 };
const V1: FeaturizerSettings = { ...V2, normalization: 1 };
const V3: FeaturizerSettings = { ...V2, normalization: 3 };

function featuresOf(text: string, settings = V2): { names: string[]; slots: number[]; sources: (string | null)[] } {
  const buffer = createFeatureBuffer(16, true);
  createFeaturizer(settings).featurize(text, buffer);
  return { names: [...(buffer.names as string[])], slots: Array.from(buffer.slots.subarray(0, buffer.count)), sources: [...(buffer.sources as (string | null)[])] };
}

/** The words (unigram names) of a text under normalization 2 (or `settings`'). */
function wordsOf(text: string, settings = V2): string[] {
  const buffer = createFeatureBuffer(16, true);
  createFeaturizer({ ...settings, wordSpan: 1, charMin: 0, charMax: 0 }).featurize(text, buffer);
  return [...(buffer.names as string[])];
}

/** Every feature slot of the clean text is among the perturbed text's (which may add evidence features). */
function expectRecoversUnder(perturbed: string, clean: string, extra: string[], settings: FeaturizerSettings): void {
  const got = featuresOf(perturbed, settings);
  const want = featuresOf(clean, settings);
  // Folding appends its own features after the text's: drop the last occurrence of each.
  for (const name of extra) {
    const at = got.names.lastIndexOf(name);
    if (at < 0) continue;
    got.names.splice(at, 1);
    got.slots.splice(at, 1);
  }
  expect(got.names, perturbed).toEqual(want.names);
  expect(got.slots, perturbed).toEqual(want.slots);
}

describe.each([
  ["normalization 2", V2],
  ["normalization 3", V3],
])("under %s, each kind of evasion recovers the clean text's features", (_, settings) => {
  const expectRecovers = (perturbed: string, clean: string, extra: string[] = []) => expectRecoversUnder(perturbed, clean, extra, settings);

  it.each([
    ["frее mоney", "free money"], // Cyrillic е (U+0435) and о (U+043E)
    ["FRЕЕ МОNЕY", "FREE MONEY"], // Cyrillic Е, М, О
    ["сlick hеrе", "click here"], // Cyrillic с (U+0441), е
    ["ꓑayPal", "paypal"], // Lisu ꓑ (U+A4D1)
  ])("lookalike letters: %s", (perturbed, clean) => {
    expectRecovers(perturbed, clean, ["[mixed-script]"]);
  });

  it.each([
    ["fr33 m0ney n0w", "free money now"],
    ["h4x0r l33t", "haxor leet"],
    ["v1agra 0ffer", "viagra offer"],
    ["$ex ca$h h@ck sh!t fr€€", "sex cash hack shit free"],
  ])("leetspeak: %s", (perturbed, clean) => {
    expectRecovers(perturbed, clean);
  });

  it.each([
    ["f r e e money", "free money"],
    ["f.r.e.e money", "free money"],
    ["f-r-e-e m-o-n-e-y", "free money"],
    ["c l i c k  h e r e", "click here"], // two spaces between the spaced words
  ])("spaced and dotted letters: %s", (perturbed, clean) => {
    expectRecovers(perturbed, clean);
  });

  it.each([
    ["fr*ee mo_ney", "free money"],
    ["cl~ick he^re", "click here"],
  ])("padding inside words: %s", (perturbed, clean) => {
    expectRecovers(perturbed, clean);
  });

  it.each([
    ["fr\u200Bee mo\u200Dney", "free money"],
    ["cl\u00ADick h\u2060ere", "click here"], // soft hyphen, word joiner
    ["fr\u202Eee", "free"], // RIGHT-TO-LEFT OVERRIDE
  ])("invisible and bidirectional characters: %j", (perturbed, clean) => {
    expectRecovers(perturbed, clean, ["[hidden-chars]"]);
  });

  it("mixed: several kinds in one text", () => {
    expectRecovers("FR33 m\u043en\u200Bey c l i c k h*ere", "free money click here", ["[mixed-script]", "[hidden-chars]"]);
  });
});

describe("stretched, spaced and leetspeak words under normalization 2", () => {
  it("runs of one letter: the one-letter form is the word, the two-letter form an extra feature", () => {
    expectRecoversUnder("mooooney nooow", "money now", ["mooney", "noow"], V2);
    expect(wordsOf("freeeeee")).toEqual(["fre", "free"]);
    expect(wordsOf("FREEEEE")).toEqual(["fre", "free"]);
    expect(wordsOf("soooo good")).toEqual(["so", "good", "soo"]);
  });
});

describe("what normalization 3 reads differently", () => {
  it("runs of one letter: every run reads as one letter, so a stretched word and its pairs are the clean word's", () => {
    expectRecoversUnder("a freeeee gift, mooooney nooow", "a free gift, money now", [], V3);
    expectRecoversUnder("WIIIINNER seleeeected", "winner selected", [], V3);
    expect(wordsOf("free freeeeee FREE fre", V3)).toEqual(["fre", "fre", "fre", "fre"]);
    expect(wordsOf("soooo good", V3)).toEqual(["so", "god"]); // an accepted collision: "good" and "god" are one word
  });

  it("spaced letters: a run whose gap changes starts again at the letter before the change", () => {
    expectRecoversUnder("YOUR E-M A I L", "your e-mail", [], V3);
    expect(wordsOf("e-m a i l", V3)).toEqual(["e", "mail"]);
    expect(wordsOf("e-m a i l")).toEqual(["e", "m", "ail"]); // normalization 2, kept as it was
  });

  it("leetspeak: the . , : between two digits of a leetspeak word is dropped", () => {
    expect(wordsOf("a3.0a", V3)).toEqual(["aeoa"]);
    expect(wordsOf("a3.0a")).toEqual(["ae.oa"]); // normalization 2, kept as it was
    expect(wordsOf("4.99 3.0 v2.0", V3)).toEqual(wordsOf("4.99 3.0 v2.0", V1));
  });

  it("leetspeak: a combining mark after a digit read as a letter is composed with it, so the word reads the same again", () => {
    // "3\u0301" cannot compose under NFKC; read as "e\u0301" it is "é" (found by the idempotence property below).
    const [word] = wordsOf("3\u0301\u0415\u0301a", V3); // Cyrillic Е with a combining acute
    expect(word).toBe("\u00e9a");
    expect(wordsOf(word, V3)).toEqual([word]);
  });
});

describe("the evidence features", () => {
  it("marks a word that mixes scripts, not a text in one other script or Japanese with Latin", () => {
    expect(featuresOf("frее").names).toContain("[mixed-script]");
    expect(featuresOf("привет мир").names).not.toContain("[mixed-script]");
    expect(featuresOf("Tシャツを買う").names).not.toContain("[mixed-script]"); // UTS #39 Highly Restrictive allows Latin + Japanese
  });

  it("marks hidden characters inside Latin words, not ZWNJ inside a Persian word or ZWJ between emoji", () => {
    expect(featuresOf("fr\u200Bee").names).toContain("[hidden-chars]");
    // Persian "می‌خواهم" (I want) is written with U+200C ZERO WIDTH NON-JOINER (common practice, from memory).
    expect(featuresOf("\u0645\u06cc\u200c\u062e\u0648\u0627\u0647\u0645").names).not.toContain("[hidden-chars]");
    expect(featuresOf("\u{1F468}\u200D\u{1F469}\u200D\u{1F467}").names).not.toContain("[hidden-chars]");
  });

  it("is absent from plain text", () => {
    const names = featuresOf("Please refund my order, it arrived broken!").names;
    expect(names).not.toContain("[mixed-script]");
    expect(names).not.toContain("[hidden-chars]");
  });
});

describe("what folding leaves alone", () => {
  it.each([
    ["prices and numbers", "$4.99 for 1000 items, 42.50 EUR, 3 days"],
    ["codes and ordinals", "order A12345 #B20417 x9y8z7 sent on the 14th at 10am, 2nd try"],
    ["product names", "mp3 win10 covid19 h2o b2b 4x4"],
    ["URLs and e-mail addresses", "visit https://fr33.example.com/p?q=1 or www.m0ney.example, mail b0b@example.com"],
    ["ordinary words without a doubled letter", "I am a customer and my parcel is late; please refund it."],
    ["words with one letter", "a b"],
  ])("%s: normalization 3 gives the same features as version 1", (_, text) => {
    expect(featuresOf(text, V3).slots).toEqual(featuresOf(text, V1).slots);
  });

  it.each([
    ["prices and numbers", "$4.99 for 1000 items, 42.50 EUR, 3 days"],
    ["codes and ordinals", "order A12345 #B20417 x9y8z7 shipped on the 14th at 10am, 2nd try"],
    ["product names", "mp3 win10 covid19 h2o b2b 4x4"],
    ["URLs and e-mail addresses", "see https://fr33.example.com/p?q=1 or www.m0ney.example, mail b0b@example.com"],
    ["ordinary words", "I am a customer and my account is locked; please help."],
    ["words with one letter", "a b"],
  ])("%s: the same features as version 1", (_, text) => {
    expect(featuresOf(text).slots).toEqual(featuresOf(text, V1).slots);
  });

  it("shows the original text of a folded feature, and none for a word read as written", () => {
    const { names, sources } = featuresOf("Get frее MONEY f r e e");
    expect(sources[names.indexOf("free")]).toBe("frее");
    expect(sources[names.indexOf("money")]).toBeNull();
    expect(sources[names.lastIndexOf("free")]).toBe("f r e e");
    expect(sources[names.indexOf("[mixed-script]")]).toBe("frее");
  });
});

const TRICKY = ["a", "e", "o", "f", "r", "E", "0", "3", "1", "2", " ", "  ", ".", "-", "*", "_", "@", "$", "!", "€", "'", "\u200b", "\u202e", "\u00ad", "е", "о", "Е", "р", "ꓑ", "\u0301", "\ud800", "\udc00", "👍", "\u200d", "ﬁ", "Ｆ", "\u03a3", "İ", "http://", "x.com", "a@b.co", "ノ", "१"];

describe.each([
  ["normalization 2", V2],
  ["normalization 3", V3],
])("folding under %s", (_, settings) => {
  it("never throws on any string, including lone surrogates and combining marks", () => {
    const featurizer = createFeaturizer(settings);
    const named = createFeatureBuffer(16, true);
    const plain = createFeatureBuffer(16);
    fc.assert(
      fc.property(fc.oneof(fc.string({ unit: "binary", maxLength: 60 }), fc.array(fc.constantFrom(...TRICKY), { maxLength: 30 }).map((p) => p.join(""))), (text) => {
        featurizer.featurize(text, named);
        featurizer.featurize(text, plain);
        // Names mode (explanations) yields exactly the slots of scoring.
        expect(Array.from(named.slots.subarray(0, named.count))).toEqual(Array.from(plain.slots.subarray(0, plain.count)));
        expect(named.sources?.length).toBe(named.count);
      }),
      { numRuns: 3000 },
    );
  });
});

describe("idempotence under normalization 3", () => {
  // Normalization 2 keeps a known gap, frozen with its rules (its models must read as they were
  // trained): a leetspeak reading keeps a ". , :" that joined two digits ("a3.0a" reads as
  // "ae.oa"), and that word read again splits at the dot. Normalization 3 drops it.
  it("is idempotent: normalizing again, or reading a folded word again, changes nothing", () => {
    const normalizer = new TextNormalizer(3);
    fc.assert(
      fc.property(fc.oneof(fc.string({ unit: "grapheme", maxLength: 40 }), fc.array(fc.constantFrom(...TRICKY), { maxLength: 30 }).map((p) => p.join(""))), (text) => {
        const once = normalizer.normalize(text);
        expect(normalizer.normalize(once)).toBe(once);
        for (const word of wordsOf(text, V3)) {
          if (word.startsWith("[") || /\s/.test(word)) continue;
          // Up to NFKC: a format character the tokenizer drops ("a\u00AD\u0301") can leave a letter and its mark uncomposed.
          expect(wordsOf(word, V3)[0], word).toBe(word.normalize("NFKC"));
        }
      }),
      { numRuns: 2000 },
    );
  });
});
