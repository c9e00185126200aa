// The keyed hash stored instead of a text when text storage is off: HMAC-SHA256 (RFC 2104,
// FIPS 180-4) through Web Crypto, hex-encoded. Without the key nobody can test a guessed
// text against the stored hashes; with it, the operator can find repeats of one text.

const encoder = new TextEncoder();
const keys = new Map<string, Promise<CryptoKey>>();

function importKey(secret: string): Promise<CryptoKey> {
  let key = keys.get(secret);
  if (key === undefined) {
    key = crypto.subtle.importKey("raw", encoder.encode(secret), { name: "HMAC", hash: "SHA-256" }, false, ["sign"]);
    keys.set(secret, key);
  }
  return key;
}

/**
 * HMAC-SHA256 of `text` under `secret`, as 64 lower-case hex digits.
 * @example await keyedHash("key", "The quick brown fox jumps over the lazy dog") // "f7bc83f4…"
 */
export async function keyedHash(secret: string, text: string): Promise<string> {
  const mac = new Uint8Array(await crypto.subtle.sign("HMAC", await importKey(secret), encoder.encode(text)));
  let hex = "";
  for (let i = 0; i < mac.length; i++) hex += mac[i].toString(16).padStart(2, "0");
  return hex;
}
