// Seeded perturbations of the kinds people use to get text past a moderation model, for the
// evasion suite (scripts/bench/evasion.ts). Each kind rewrites a share of a text's words (runs
// of three or more ASCII letters; URLs and e-mail addresses are left alone, as an evader needs
// them to keep working), chosen with a seeded generator, so a run is reproducible:
//   confusables  Cyrillic or Greek lookalikes for some letters ("frее", "МОNЕY")
//   leetspeak    digits and symbols for some letters ("fr33", "m0n3y", "ca$h")
//   spacing      letters one space apart ("f r e e")
//   dotting      letters one dot apart ("f.r.e.e")
//   repetition   one vowel (or letter) stretched to 3–6 ("freeeee", "mooooney")
//   invisible    a zero-width or soft-hyphen character inside the word ("fr\u200Bee")
//   padding      a padding symbol inside the word ("fr*ee")
//   mixed        each chosen word gets one of the kinds above
// Common practice, no source: these are the spellings seen in spam and abuse, not a standard.

export const PERTURBATION_KINDS = ["confusables", "leetspeak", "spacing", "dotting", "repetition", "invisible", "padding", "mixed"] as const;
export type PerturbationKind = (typeof PERTURBATION_KINDS)[number];
type SingleKind = Exclude<PerturbationKind, "mixed">;

/** mulberry32: a small seeded generator (public domain, Tommy Ettinger), uniform in [0, 1). */
export function seededRandom(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** FNV-1a of a string: the seed of one text's perturbation (kind, rate and row index in it). */
export function seedOf(key: string): number {
  let hash = 0x811c9dc5;
  for (let i = 0; i < key.length; i++) hash = Math.imul(hash ^ key.charCodeAt(i), 0x01000193) >>> 0;
  return hash;
}

// Lookalikes from Cyrillic and Greek (each pair is in UTS #39 confusables.txt).
const LOOKALIKES: Record<string, string> = {
  a: "\u0430", c: "\u0441", e: "\u0435", o: "\u043e", p: "\u0440", x: "\u0445", y: "\u0443", i: "\u0456", s: "\u0455", j: "\u0458", h: "\u04bb",
  A: "\u0410", B: "\u0412", C: "\u0421", E: "\u0415", H: "\u041d", K: "\u041a", M: "\u041c", O: "\u041e", P: "\u0420", T: "\u0422", X: "\u0425", Y: "\u03a5", N: "\u039d",
};
const LEET: Record<string, string> = { a: "4", e: "3", i: "1", o: "0", s: "5", t: "7", A: "4", E: "3", I: "1", O: "0", S: "$", T: "7" };
const INVISIBLE = ["\u200b", "\u200c", "\u200d", "\u2060", "\u00ad", "\ufeff"];
const PADDING = ["*", "_", "~", "^"];
const SINGLE_KINDS: SingleKind[] = ["confusables", "leetspeak", "spacing", "dotting", "repetition", "invisible", "padding"];

function pick<T>(items: readonly T[], random: () => number): T {
  return items[Math.floor(random() * items.length)];
}

/** Replaces about half of the letters that have a replacement (at least one). */
function replaceSome(word: string, table: Record<string, string>, random: () => number): string {
  const positions = [...word].map((c, i) => (table[c] ? i : -1)).filter((i) => i >= 0);
  if (positions.length === 0) return word;
  const chosen = new Set(positions.filter(() => random() < 0.5));
  if (chosen.size === 0) chosen.add(pick(positions, random));
  return [...word].map((c, i) => (chosen.has(i) ? table[c] : c)).join("");
}

function insertInside(word: string, piece: string, random: () => number): string {
  const at = 1 + Math.floor(random() * (word.length - 1));
  return word.slice(0, at) + piece + word.slice(at);
}

/** One word rewritten by one kind. */
export function perturbWord(word: string, kind: SingleKind, random: () => number): string {
  switch (kind) {
    case "confusables":
      return replaceSome(word, LOOKALIKES, random);
    case "leetspeak":
      return replaceSome(word, LEET, random);
    case "spacing":
      return [...word].join(" ");
    case "dotting":
      return [...word].join(".");
    case "repetition": {
      const vowels = [...word].map((c, i) => (/[aeiouAEIOU]/.test(c) ? i : -1)).filter((i) => i >= 0);
      const at = vowels.length > 0 ? pick(vowels, random) : Math.floor(random() * word.length);
      return word.slice(0, at) + word[at].repeat(3 + Math.floor(random() * 4)) + word.slice(at + 1);
    }
    case "invisible":
      return insertInside(word, pick(INVISIBLE, random), random);
    case "padding":
      return insertInside(word, pick(PADDING, random), random);
  }
}

/** A URL or an e-mail address: an evader keeps those working, so they are left as they are. */
const LINK = /^[("'<[]*(https?:\/\/|www\.)|@/i;

/**
 * `text` with about `rate` of its words (runs of 3+ ASCII letters outside URLs and e-mail
 * addresses) rewritten by `kind`; `seed` fixes the choice.
 * @example perturbText("free money now", "leetspeak", 1, 7) // e.g. "fr3e m0ney n0w"
 */
export function perturbText(text: string, kind: PerturbationKind, rate: number, seed: number): string {
  const random = seededRandom(seed);
  return text.replace(/\S+/g, (chunk) => {
    if (LINK.test(chunk)) return chunk;
    return chunk.replace(/[A-Za-z]{3,}/g, (word) => {
      if (random() >= rate) return word;
      return perturbWord(word, kind === "mixed" ? pick(SINGLE_KINDS, random) : kind, random);
    });
  });
}
