// Compares a presented secret with the expected one in time that depends only on the
// presented length, so response timing tells a client nothing about how many leading bytes
// it got right, nor how long the real secret is. (Common practice, no source: the loop runs
// over the attacker-chosen input and folds every byte difference and the length difference
// into one accumulator, with no early exit.)

const encoder = new TextEncoder();

/**
 * True when both strings have the same UTF-8 bytes.
 * @example constantTimeEqual("s3cret", "s3cret") // true
 */
export function constantTimeEqual(presented: string, expected: string): boolean {
  const given = encoder.encode(presented);
  const wanted = encoder.encode(expected);
  if (wanted.length === 0) return false;
  let difference = given.length ^ wanted.length;
  for (let i = 0; i < given.length; i++) difference |= given[i] ^ wanted[i % wanted.length];
  return difference === 0;
}
