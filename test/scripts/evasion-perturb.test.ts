// The evasion suite's perturbations (scripts/bench/evasion-perturb.ts): reproducible from their
// seed, each kind rewrites the words it picks the way its name says, URLs and e-mail addresses
// stay working, and the featurizer's folding (normalization 2) reads most of them back.
// mulberry32's first outputs for seed 0 are checked against its reference code, from memory.
import { describe, expect, it } from "vitest";
import { PERTURBATION_KINDS, perturbText, perturbWord, seededRandom } from "../../scripts/bench/evasion-perturb.ts";

const TEXT = "Claim your FREE prize today at http://www.example.org/win or write to lena@example.com, winner";

describe("the evasion perturbations", () => {
  it("are reproducible from the seed and differ between seeds", () => {
    for (const kind of PERTURBATION_KINDS) {
      expect(perturbText(TEXT, kind, 0.5, 7)).toBe(perturbText(TEXT, kind, 0.5, 7));
      expect(perturbText(TEXT, kind, 0, 7)).toBe(TEXT);
    }
    expect(perturbText(TEXT, "spacing", 0.5, 1)).not.toBe(perturbText(TEXT, "spacing", 0.5, 2));
    // mulberry32(0): 1144304738 / 2^32 is its first value (from memory of the reference implementation).
    expect(seededRandom(0)()).toBeCloseTo(1144304738 / 4294967296, 12);
  });

  it("leave URLs and e-mail addresses as they are", () => {
    for (const kind of PERTURBATION_KINDS) {
      const out = perturbText(TEXT, kind, 1, 3);
      expect(out).toContain("http://www.example.org/win");
      expect(out).toContain("lena@example.com,");
    }
  });

  it("rewrite a word as each kind says", () => {
    const random = seededRandom(5);
    expect(perturbWord("free", "spacing", random)).toBe("f r e e");
    expect(perturbWord("free", "dotting", random)).toBe("f.r.e.e");
    expect(perturbWord("money", "repetition", random)).toMatch(/^m(o{3,6}ney|oney{3,6}|one{3,6}y)$/);
    expect(perturbWord("money", "padding", random).replace(/[*_~^]/g, "")).toBe("money");
    expect(perturbWord("money", "invisible", random).replace(/[\u200b-\u200d\u2060\u00ad\ufeff]/g, "")).toBe("money");
    expect(perturbWord("money", "leetspeak", random)).not.toBe("money");
    expect(perturbWord("money", "confusables", random)).not.toBe("money");
  });
});
