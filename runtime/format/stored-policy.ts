// The policy as a model file stores it. The review floor is `reviewBelow` everywhere in code,
// the CLI and HTTP; files store it under its first name, `uncertainBelow` (FORMAT.md), so
// every file ever written keeps its floor and runtimes that know only that key still apply it.

import type { Policy } from "../model/policy.ts";

/** The header's policy map as read from a file → the policy the runtime applies. */
export function policyFromStored(stored: Record<string, unknown> | null): Policy | null {
  if (stored === null) return null;
  const { uncertainBelow, ...rest } = stored;
  const policy = rest as unknown as Policy;
  return uncertainBelow === undefined ? policy : { ...policy, reviewBelow: uncertainBelow as number };
}

/** The policy → the map a file stores. */
export function policyToStored(policy: Policy | null): Record<string, unknown> | null {
  if (policy === null) return null;
  const { reviewBelow, ...rest } = policy;
  return reviewBelow === undefined ? rest : { ...rest, uncertainBelow: reviewBelow };
}
