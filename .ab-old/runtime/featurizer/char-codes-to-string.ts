// A string from a run of UTF-16 code units, in bounded pieces. `String.fromCharCode(...codes)`
// passes every code unit as a call argument, and engines cap the arguments of one call
// (V8 overflows its stack somewhere above 100,000): one long word would then throw.

/** Code units per String.fromCharCode call: far below any engine's argument limit. */
const PIECE = 4096;

/**
 * The string of `codes[start..end)`.
 * @example charCodesToString(new Uint16Array([104, 105]), 0, 2) // "hi"
 */
export function charCodesToString(codes: Uint16Array, start: number, end: number): string {
  if (end - start <= PIECE) return String.fromCharCode.apply(null, codes.subarray(start, end) as unknown as number[]);
  const pieces: string[] = [];
  for (let at = start; at < end; at += PIECE) {
    pieces.push(String.fromCharCode.apply(null, codes.subarray(at, Math.min(end, at + PIECE)) as unknown as number[]));
  }
  return pieces.join("");
}
