// Lookalike letters and digits (UTS #39 confusables with an ASCII prototype; see
// scripts/unicode/confusables.ts for what the table keeps and why). The table is decoded on
// the first non-ASCII text, so ASCII-only traffic never pays for it.

import { CONFUSABLE_GROUPS } from "./confusables-table.ts";

/** The lower-cased prototypes, indexed by the values of `bmpIndex` minus one. */
const prototypes: string[] = [];
let bmpIndex: Uint16Array | null = null;

function decode(): Uint16Array {
  const table = new Uint16Array(65536);
  for (const group of CONFUSABLE_GROUPS.split(";")) {
    const colon = group.indexOf(":");
    prototypes.push(group.slice(0, colon));
    const value = prototypes.length;
    let code = 0;
    for (const delta of group.slice(colon + 1).split(",")) {
      code += parseInt(delta, 36);
      table[code] = value;
    }
  }
  bmpIndex = table;
  return table;
}

/**
 * The lower-cased ASCII prototype of a lookalike UTF-16 code unit, or "" when it has none in
 * the table (which holds none above U+FFFF).
 * @example confusablePrototype(0x0435) // "e" (CYRILLIC SMALL LETTER IE)
 */
export function confusablePrototype(code: number): string {
  const value = (bmpIndex ?? decode())[code];
  return value === 0 ? "" : prototypes[value - 1];
}
