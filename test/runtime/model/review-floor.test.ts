// The review floor is one idea with one name (`reviewBelow`) and one implementation
// (decideFromScores): the model's own floor (--review-below) and a server's (REVIEW_BELOW)
// meet there, the higher one applies, and it only ever turns "allow" into "review".
// Files store the model's floor as `uncertainBelow`, its first name (FORMAT.md).

import { describe, expect, it } from "vitest";
import { policyToStored } from "../../../runtime/format/stored-policy.ts";
import { validatePolicy } from "../../../runtime/format/validate-policy.ts";
import { decideFromScores, type Policy } from "../../../runtime/model/policy.ts";

const LABELS = ["ok", "spam"];
const SPAM_RULE: Policy["rules"][number] = { label: "spam", action: "block", threshold: 0.9 };

describe("the review floor", () => {
  it("sends a weak allow to review when the caller's floor is above the top score, even without a policy", () => {
    const decision = decideFromScores(null, LABELS, [0.55, 0.45], 0.6);
    expect(decision.action).toBe("review");
    expect(decision.reasons).toEqual(["top label ok 0.550 is below the review floor 0.600"]);
  });

  it("applies the higher of the model's floor and the caller's", () => {
    const policy: Policy = { rules: [SPAM_RULE], reviewBelow: 0.7 };
    expect(decideFromScores(policy, LABELS, [0.65, 0.35], 0.6).action).toBe("review");
    expect(decideFromScores(policy, LABELS, [0.65, 0.35], 0).action).toBe("review");
    expect(decideFromScores({ rules: [SPAM_RULE] }, LABELS, [0.65, 0.35], 0.6).action).toBe("allow");
    expect(decideFromScores(policy, LABELS, [0.75, 0.25], 0.8).reasons).toEqual(["top label ok 0.750 is below the review floor 0.800"]);
  });

  it("never turns a block into a review or an allow above the floor into anything else", () => {
    expect(decideFromScores({ rules: [SPAM_RULE], reviewBelow: 0.99 }, LABELS, [0.05, 0.95], 0.99).action).toBe("block");
    expect(decideFromScores(null, LABELS, [0.61, 0.39], 0.6).action).toBe("allow");
  });

  it("is stored under the key uncertainBelow and read back as reviewBelow", () => {
    const policy: Policy = { rules: [SPAM_RULE], reviewBelow: 0.6 };
    expect(policyToStored(policy)).toEqual({ rules: [SPAM_RULE], uncertainBelow: 0.6 });
    const fail = (field: string, expected: string): never => {
      throw new Error(`${field}: expected ${expected}`);
    };
    expect(validatePolicy({ rules: [SPAM_RULE], uncertainBelow: 0.6 }, LABELS, fail)).toEqual(policy);
    expect(validatePolicy({ rules: [SPAM_RULE] }, LABELS, fail)).toEqual({ rules: [SPAM_RULE] });
    expect(policyToStored(null)).toBeNull();
  });
});
