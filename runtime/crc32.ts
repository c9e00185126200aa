// CRC-32 as in IEEE 802.3 / zlib / PNG (reflected polynomial 0xEDB88320, init and final
// xor 0xFFFFFFFF). Its published check value is crc32("123456789") = 0xCBF43926.
// Slicing-by-8 (Kounavis & Berry, Intel, 2005) so a model file checks at well over 1 GB/s.

const TABLES = buildTables();

function buildTables(): Uint32Array {
  const tables = new Uint32Array(8 * 256);
  for (let n = 0; n < 256; n++) {
    let c = n;
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
    tables[n] = c >>> 0;
  }
  for (let n = 0; n < 256; n++) {
    let c = tables[n];
    for (let t = 1; t < 8; t++) {
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
  const fastEnd = start + ((end - start) & ~7);
  for (; i < fastEnd; i += 8) {
    const a = crc ^ (bytes[i] | (bytes[i + 1] << 8) | (bytes[i + 2] << 16) | (bytes[i + 3] << 24));
    crc =
      t[1792 + (a & 0xff)] ^
      t[1536 + ((a >>> 8) & 0xff)] ^
      t[1280 + ((a >>> 16) & 0xff)] ^
      t[1024 + (a >>> 24)] ^
      t[768 + bytes[i + 4]] ^
      t[512 + bytes[i + 5]] ^
      t[256 + bytes[i + 6]] ^
      t[bytes[i + 7]];
  }
  for (; i < end; i++) crc = t[(crc ^ bytes[i]) & 0xff] ^ (crc >>> 8);
  return (crc ^ 0xffffffff) >>> 0;
}
