// Reads GNU gettext's compiled message catalogs (.mo files). The layout is the one the
// gettext manual documents (section "The Format of GNU MO Files"): a 28-byte header of u32s
// (magic 0x950412de in the file's byte order, revision, string count N, offset of the
// original-string table, offset of the translation table, hash size, hash offset), then two
// tables of N (length, offset) u32 pairs pointing at NUL-terminated strings.

/** One entry of a catalog: the original (with any context before "\u0004") and its translation forms. */
export interface CatalogEntry {
  original: string;
  /** Plural forms are NUL-separated in the file; this is every form, in order. */
  translations: string[];
}

const MAGIC = 0x950412de;

/**
 * Every entry of a .mo file except the header entry (the one with an empty original).
 * Throws with the file name and byte offset when the layout is not what the format says.
 * @example readMoFile(bytes, "de/gtk30.mo")[0].translations[0] // "Abbrechen"
 */
export function readMoFile(bytes: Uint8Array, name: string): CatalogEntry[] {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  if (bytes.byteLength < 28) throw new Error(`${name}: ${bytes.byteLength} bytes is shorter than the 28-byte .mo header`);
  let littleEndian: boolean;
  if (view.getUint32(0, true) === MAGIC) littleEndian = true;
  else if (view.getUint32(0, false) === MAGIC) littleEndian = false;
  else throw new Error(`${name}: expected the .mo magic 0x950412de at byte 0`);
  const u32 = (offset: number) => {
    if (offset + 4 > bytes.byteLength) throw new Error(`${name}: truncated at byte ${offset}`);
    return view.getUint32(offset, littleEndian);
  };
  const count = u32(8);
  const originalsAt = u32(12);
  const translationsAt = u32(16);
  const header = readString(bytes, u32, translationsAt, name, findHeaderIndex(bytes, u32, originalsAt, count, name));
  const charset = /charset=([^\s;]+)/i.exec(header ?? "")?.[1] ?? "UTF-8";
  const decoder = new TextDecoder(charset.toLowerCase() === "charset" ? "utf-8" : charset, { fatal: true });
  const entries: CatalogEntry[] = [];
  for (let index = 0; index < count; index++) {
    const original = decoder.decode(stringBytes(bytes, u32, originalsAt, name, index));
    if (original === "") continue;
    const translation = decoder.decode(stringBytes(bytes, u32, translationsAt, name, index));
    entries.push({ original, translations: translation.split("\u0000") });
  }
  return entries;
}

function findHeaderIndex(bytes: Uint8Array, u32: (offset: number) => number, originalsAt: number, count: number, name: string): number {
  for (let index = 0; index < count; index++) {
    if (stringBytes(bytes, u32, originalsAt, name, index).length === 0) return index;
  }
  return -1;
}

function readString(bytes: Uint8Array, u32: (offset: number) => number, tableAt: number, name: string, index: number): string | null {
  if (index < 0) return null;
  return new TextDecoder("utf-8").decode(stringBytes(bytes, u32, tableAt, name, index));
}

function stringBytes(bytes: Uint8Array, u32: (offset: number) => number, tableAt: number, name: string, index: number): Uint8Array {
  // Table entry i: u32 length (without the NUL), u32 offset from the file start.
  const length = u32(tableAt + index * 8);
  const offset = u32(tableAt + index * 8 + 4);
  if (offset + length > bytes.byteLength) throw new Error(`${name}: string ${index} at byte ${offset} runs past the end of the file`);
  return bytes.subarray(offset, offset + length);
}
