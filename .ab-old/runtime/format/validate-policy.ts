// The policy of a model header, checked field by field. A policy decides what gets through,
// so nothing in it is taken on trust: an unknown action, a threshold outside [0, 1] (or NaN,
// which fails every comparison and so would never block) or a rule about a label the model
// does not have would silently change what is blocked.

import type { Policy, PolicyRule } from "../model/policy.ts";
import { isUnitInterval, MAX_POLICY_RULES } from "./header-limits.ts";

/** Actions a rule may take ("allow" is what happens when no rule fires). */
const RULE_ACTIONS: ReadonlySet<string> = new Set(["review", "block", "route"]);

/**
 * Checks a decoded policy against the model's labels; calls `fail(field, expected)` (which
 * throws) at the first bad field, else returns a clean copy holding only known keys.
 * @example validatePolicy({ rules: [{ label: "spam", action: "block", threshold: 0.98 }] }, ["ok", "spam"], fail)
 */
export function validatePolicy(value: unknown, labels: readonly string[], fail: (field: string, expected: string) => never): Policy | null {
  if (value === null || value === undefined) return null;
  if (!isPlainMap(value)) return fail("policy", "a map or nil");
  const policy = value as Record<string, unknown>;
  const rules = policy.rules;
  if (!Array.isArray(rules) || rules.length > MAX_POLICY_RULES) return fail("policy.rules", `an array of at most ${MAX_POLICY_RULES} rules`);
  const checked: PolicyRule[] = rules.map((rule, i) => validateRule(rule, `policy.rules[${i}]`, labels, fail));
  const result: Policy = { rules: checked };
  // The review floor is stored under its first name (stored-policy.ts, FORMAT.md).
  if (policy.uncertainBelow !== undefined && policy.uncertainBelow !== null) {
    if (!isUnitInterval(policy.uncertainBelow)) return fail("policy.uncertainBelow", "a number in [0, 1]");
    result.reviewBelow = policy.uncertainBelow;
  }
  return result;
}

function validateRule(value: unknown, at: string, labels: readonly string[], fail: (field: string, expected: string) => never): PolicyRule {
  if (!isPlainMap(value)) return fail(at, "a map with label, action and threshold");
  const rule = value as Record<string, unknown>;
  if (typeof rule.label !== "string" || !labels.includes(rule.label)) return fail(`${at}.label`, "one of the model's labels");
  if (typeof rule.action !== "string" || !RULE_ACTIONS.has(rule.action)) return fail(`${at}.action`, '"review", "block" or "route"');
  if (!isUnitInterval(rule.threshold)) return fail(`${at}.threshold`, "a number in [0, 1]");
  const checked: PolicyRule = { label: rule.label, action: rule.action as PolicyRule["action"], threshold: rule.threshold };
  if (rule.reviewFrom !== undefined && rule.reviewFrom !== null) {
    if (!isUnitInterval(rule.reviewFrom) || rule.reviewFrom > rule.threshold) return fail(`${at}.reviewFrom`, "a number in [0, threshold]");
    checked.reviewFrom = rule.reviewFrom;
  }
  if (rule.routeTo !== undefined && rule.routeTo !== null) {
    if (typeof rule.routeTo !== "string" || rule.routeTo.length === 0) return fail(`${at}.routeTo`, "a non-empty string");
    checked.routeTo = rule.routeTo;
  }
  if (rule.action === "route" && checked.routeTo === undefined) return fail(`${at}.routeTo`, 'a destination for a "route" rule');
  if (rule.target !== undefined && rule.target !== null) {
    if (!isPlainMap(rule.target) || !Object.values(rule.target as object).every((v) => typeof v === "number" && Number.isFinite(v))) {
      return fail(`${at}.target`, "a map of finite numbers");
    }
    checked.target = { ...(rule.target as Record<string, number>) };
  }
  return checked;
}

/** A MessagePack map decoded as an object (not an array, bytes or a Date). */
export function isPlainMap(value: unknown): boolean {
  if (typeof value !== "object" || value === null || Array.isArray(value)) return false;
  const prototype = Object.getPrototypeOf(value);
  return prototype === Object.prototype || prototype === null;
}
