// The policy as a model file stores it. The review floor is `reviewBelow` everywhere in code,
// the CLI and HTTP; files store it under its first name, `uncertainBelow` (FORMAT.md), so
// every file ever written keeps its floor and runtimes that know only that key still apply it.
// The loader reads it back in validate-policy.ts.

import type { Policy } from "../model/policy.ts";

/** The policy → the map a file stores. */
export function policyToStored(policy: Policy | null): Record<string, unknown> | null {
  if (policy === null) return null;
  const { reviewBelow, ...rest } = policy;
  return reviewBelow === undefined ? rest : { ...rest, uncertainBelow: reviewBelow };
}
