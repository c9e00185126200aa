import fc from "fast-check";
import { pack, unpack } from "msgpackr";
import { describe, expect, it } from "vitest";
import {
  findLeaks,
  fingerprintCovers,
  fingerprintFalsePositiveRate,
  fingerprintMayContain,
  fingerprintText,
  leakWarning,
  readTrainingFingerprint,
  summarizeTrainingFingerprint,
  trainingFingerprint,
  TrainingTextCollector,
  utf8Of,
} from "../../../compiler/read/text-fingerprints.ts";
import { murmur3Bytes, murmur3String } from "../../../runtime/featurizer/murmur3.ts";

const members = Array.from({ length: 2000 }, (_, i) => `order ${i} arrived damaged, please send a replacement`);
const strangers = Array.from({ length: 20000 }, (_, i) => `where is parcel number ${i}?`);

describe("fingerprintText", () => {
  it("treats texts that differ in case, width or spacing as the same text", () => {
    // NFKC maps fullwidth forms to ASCII (Unicode Standard Annex #15, compatibility decomposition);
    // the tokenizer lower-cases, so the model cannot tell these apart either.
    expect(fingerprintText("  ＦＲＥＥ\tGift\n\ncard ")).toBe("free gift card");
  });
});

describe("utf8Of", () => {
  it("gives the bytes murmur3String hashes, so fingerprints of older models still match", () => {
    // murmur3String is pinned to MurmurHash3's published vectors in test/runtime/featurizer/murmur3.test.ts;
    // the platform's UTF-8 encoder must feed murmur3Bytes the same bytes, lone surrogates included.
    for (const text of ["", "refund please", "café ＦＲＥＥ 😩", "lone \ud83d high", "lone \ude29 low", "\udc00\ud800"]) {
      expect(murmur3Bytes(utf8Of(text), 7)).toBe(murmur3String(text, 7));
    }
    fc.assert(fc.property(fc.string({ unit: "binary", maxLength: 40 }), (text) => murmur3Bytes(utf8Of(text), 1) === murmur3String(text, 1)), { numRuns: 2000 });
  });
});

describe("trainingFingerprint", () => {
  it("lays out version, hash count, text count and sample limit before the bits, as documented", () => {
    // Layout in text-fingerprints.ts: u8 version 1 | u8 k = 5 | u16 0 | u32 LE count | u32 LE sampleMax | bits.
    const bytes = trainingFingerprint(["a", "b", "A"]);
    expect(Array.from(bytes.subarray(0, 12))).toEqual([1, 5, 0, 0, 2, 0, 0, 0, 255, 255, 255, 255]);
  });

  it("sets the k = 5 bits g_i = (h1 + i·h2) mod m of Kirsch and Mitzenmacher's double hashing", () => {
    // Recomputed here from MurmurHash3 with the documented seeds, independently of the builder.
    const bytes = trainingFingerprint(["refund please"]);
    const bits = bytes.subarray(12);
    const m = bits.length * 8;
    const h1 = murmur3String("refund please", 0x243f6a88) % m;
    const h2 = murmur3String("refund please", 0xb7e15162) % m || 1;
    const expected = new Set(Array.from({ length: 5 }, (_, i) => (h1 + i * h2) % m));
    const set: number[] = [];
    for (let j = 0; j < m; j++) if (bits[j >> 3] & (1 << (j & 7))) set.push(j);
    expect(set).toEqual([...expected].sort((a, b) => a - b));
  });

  it("takes about one byte per distinct training text", () => {
    // 8 bits per element (Bloom 1970 sizing chosen in text-fingerprints.ts) plus the 12-byte prefix.
    expect(trainingFingerprint(members).length).toBe(12 + 2000);
    expect(trainingFingerprint([...members, ...members]).length).toBe(12 + 2000);
  });

  it("keeps a hash sample of about capacity texts once the filter reaches its size cap", () => {
    // A 250-byte cap holds 250 texts at 8 bits each: of 2000 texts, a 12.5% hash sample.
    const fingerprint = readTrainingFingerprint(trainingFingerprint(members, 250));
    if (fingerprint === null) throw new Error("no fingerprint");
    expect(fingerprint.bitCount).toBeLessThanOrEqual(250 * 8);
    expect(fingerprint.sampledShare).toBeCloseTo(0.125, 6);
    expect(fingerprint.count).toBeGreaterThan(190); // binomial(2000, 1/8): mean 250, sd ≈ 15
    expect(fingerprint.count).toBeLessThan(310);
  });

  it("covers exactly the sampled training texts and finds each of them", () => {
    const fingerprint = readTrainingFingerprint(trainingFingerprint(members, 250));
    if (fingerprint === null) throw new Error("no fingerprint");
    const covered = members.filter((text) => fingerprintCovers(fingerprint, text));
    expect(covered.length).toBe(fingerprint.count);
    expect(covered.every((text) => fingerprintMayContain(fingerprint, text))).toBe(true);
  });

  it("finds every training text again (a Bloom filter has no false negatives)", () => {
    // Bloom 1970: a member's k bits were all set when it was inserted.
    fc.assert(
      fc.property(fc.array(fc.string({ minLength: 1, maxLength: 40 }), { minLength: 1, maxLength: 50 }), (texts) => {
        const fingerprint = readTrainingFingerprint(trainingFingerprint(texts));
        return fingerprint !== null && texts.every((text) => fingerprintMayContain(fingerprint, text));
      }),
    );
  });

  it("gives false positives at about the rate (1 − e^(−kn/m))^k", () => {
    // The standard Bloom-filter estimate (Bloom 1970; Broder & Mitzenmacher 2004, from memory):
    // k = 5, m/n = 8 → (1 − e^(−5/8))^5 ≈ 0.0217. 20000 fixed strangers: a deterministic count.
    const fingerprint = readTrainingFingerprint(trainingFingerprint(members));
    if (fingerprint === null) throw new Error("no fingerprint");
    expect(fingerprintFalsePositiveRate(fingerprint)).toBeCloseTo(0.0217, 4);
    const hits = strangers.filter((text) => fingerprintMayContain(fingerprint, text)).length;
    expect(hits / strangers.length).toBeGreaterThan(0.012);
    expect(hits / strangers.length).toBeLessThan(0.032);
  });

  it("survives a MessagePack round trip as binary data", () => {
    // MessagePack spec: bin 8/16/32 carry byte arrays; msgpackr decodes them as Uint8Array (Buffer in Node).
    const bytes = trainingFingerprint(members);
    const decoded = unpack(pack({ trainFingerprint: bytes })) as { trainFingerprint: unknown };
    expect(decoded.trainFingerprint).toBeInstanceOf(Uint8Array);
    const fingerprint = readTrainingFingerprint(decoded.trainFingerprint);
    expect(fingerprint?.count).toBe(2000);
    expect(fingerprintMayContain(fingerprint!, members[123])).toBe(true);
  });
});

describe("readTrainingFingerprint", () => {
  it("returns null when the model has no fingerprint", () => {
    expect(readTrainingFingerprint(undefined)).toBeNull();
  });

  it("refuses a layout version it does not read, naming it", () => {
    const bytes = trainingFingerprint(["hello"]);
    bytes[0] = 9;
    expect(() => readTrainingFingerprint(bytes)).toThrow(/layout version 9, this tool reads version 1/);
  });

  it("refuses something that is not binary data", () => {
    expect(() => readTrainingFingerprint([1, 5, 0])).toThrow(/expected binary data, got an array/);
  });
});

describe("summarizeTrainingFingerprint", () => {
  it("describes a fingerprint by size, text count and false-positive rate instead of its bytes", () => {
    // 2000 texts at 8 bits each: (1 − e^(−5/8))^5 ≈ 0.0217 (Bloom 1970 estimate).
    const summary = summarizeTrainingFingerprint(trainingFingerprint(members));
    expect(summary).toMatchObject({ bytes: 2012, texts: 2000, sampledShare: 1 });
    expect(summary !== null && "falsePositiveRate" in summary && summary.falsePositiveRate).toBeCloseTo(0.0217, 4);
  });

  it("reports an unreadable fingerprint as an error message", () => {
    expect(summarizeTrainingFingerprint("nope")).toEqual({ error: "provenance.trainFingerprint: expected binary data, got string" });
  });
});

describe("findLeaks", () => {
  it("counts every evaluated example whose normalized text is a training text, with three samples", () => {
    const train = ["Refund please", "Where is my parcel?", "cancel my order"];
    const evaluated = ["refund   please", "hello", "WHERE IS MY PARCEL?", "Refund please", "cancel my order", "bye"];
    expect(findLeaks(train, evaluated)).toEqual({ count: 4, samples: ["refund   please", "WHERE IS MY PARCEL?", "Refund please"] });
  });

  it("finds nothing when the texts differ", () => {
    expect(findLeaks(["a b"], ["a c"])).toEqual({ count: 0, samples: [] });
  });
});

describe("TrainingTextCollector", () => {
  it("writes the same fingerprint as trainingFingerprint over the same texts", () => {
    const collector = new TrainingTextCollector();
    for (const text of members) collector.add(text);
    expect(Buffer.from(collector.fingerprint()).equals(Buffer.from(trainingFingerprint(members)))).toBe(true);
  });

  it("finds the same leaks as the exact Set-based check", () => {
    const collector = new TrainingTextCollector();
    const train = ["Refund please", "Where is my parcel?", "cancel my order"];
    for (const text of train) collector.add(text);
    const evaluated = ["refund   please", "hello", "WHERE IS MY PARCEL?", "Refund please", "cancel my order", "bye"];
    expect(collector.findLeaks(evaluated)).toEqual({ count: 4, samples: ["refund   please", "WHERE IS MY PARCEL?", "Refund please"] });
  });
});

describe("leakWarning", () => {
  it("names the count and quotes the samples", () => {
    expect(leakWarning({ count: 2, samples: ["hi", "ho"] }, "validation")).toBe(
      '2 validation examples also appear in the training data (same text after normalization), so their metrics are optimistic; e.g. "hi", "ho"',
    );
  });

  it("says nothing when nothing leaked", () => {
    expect(leakWarning({ count: 0, samples: [] }, "validation")).toBeNull();
  });
});
