import { describe, expect, it } from "vitest";
import { readMoFile } from "../../../scripts/corpora/mo-file.ts";

// Builds a catalog in the layout the GNU gettext manual gives ("The Format of GNU MO
// Files"): magic, revision, N, offset of originals, offset of translations, hash size 0,
// hash offset, then the two (length, offset) tables and the NUL-terminated strings.
function buildMo(pairs: [string, string][], littleEndian: boolean): Uint8Array {
  const encoder = new TextEncoder();
  const originals = pairs.map(([o]) => encoder.encode(o));
  const translations = pairs.map(([, t]) => encoder.encode(t));
  const headerBytes = 28;
  const tablesBytes = pairs.length * 16;
  const stringsBytes = [...originals, ...translations].reduce((sum, s) => sum + s.length + 1, 0);
  const bytes = new Uint8Array(headerBytes + tablesBytes + stringsBytes);
  const view = new DataView(bytes.buffer);
  const put = (offset: number, value: number) => view.setUint32(offset, value, littleEndian);
  put(0, 0x950412de);
  put(4, 0);
  put(8, pairs.length);
  put(12, headerBytes);
  put(16, headerBytes + pairs.length * 8);
  put(20, 0);
  put(24, headerBytes + tablesBytes);
  let at = headerBytes + tablesBytes;
  [originals, translations].forEach((strings, table) => {
    strings.forEach((s, i) => {
      put(headerBytes + table * pairs.length * 8 + i * 8, s.length);
      put(headerBytes + table * pairs.length * 8 + i * 8 + 4, at);
      bytes.set(s, at);
      at += s.length + 1;
    });
  });
  return bytes;
}

const catalog: [string, string][] = [
  ["", "Content-Type: text/plain; charset=UTF-8\n"],
  ["Open", "開く"],
  ["%d file\u0000%d files", "%d Datei\u0000%d Dateien"],
];

describe("readMoFile", () => {
  it("should read every entry except the header, in both byte orders", () => {
    for (const littleEndian of [true, false]) {
      const entries = readMoFile(buildMo(catalog, littleEndian), "test.mo");
      expect(entries).toEqual([
        { original: "Open", translations: ["開く"] },
        { original: "%d file\u0000%d files", translations: ["%d Datei", "%d Dateien"] },
      ]);
    }
  });

  it("should refuse a file without the magic number", () => {
    const bytes = buildMo(catalog, true);
    bytes[0] = 0;
    expect(() => readMoFile(bytes, "bad.mo")).toThrow(/bad\.mo: expected the \.mo magic/);
  });

  it("should refuse a file whose strings run past its end", () => {
    const bytes = buildMo(catalog, true);
    expect(() => readMoFile(bytes.subarray(0, bytes.length - 8), "cut.mo")).toThrow(/cut\.mo: string \d+ at byte \d+ runs past the end/);
  });
});
