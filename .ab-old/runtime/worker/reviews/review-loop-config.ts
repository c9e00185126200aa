// Settings of the review loop (queue, traffic counts, shadow candidate), read from the
// Worker's bindings. Every variable is parsed with an error that names it; the database
// binding is never an error: without it the loop counts what it could not store.

import { ConfigError } from "../app-config.ts";
import { isD1Database, type D1Database } from "./d1-types.ts";

export interface ReviewLoopConfig {
  /** The REVIEWS D1 binding; null when missing (nothing is stored, losses are counted). */
  db: D1Database | null;
  /** REVIEW_STORE_TEXT: keep submitted text (personal data). Off by default. */
  storeText: boolean;
  /** REVIEW_HASH_KEY: key of the HMAC-SHA256 kept instead of the text; null = no hash. */
  hashKey: string | null;
  /** REVIEW_RETENTION_DAYS: rows holding per-message data older than this are deleted by the cron handler. */
  retentionDays: number;
  /** REVIEWER_TOKEN: the reviewer API's own bearer token; null = the reviewer API is off. */
  reviewerToken: string | null;
  /** REVIEW_LEASE_SECONDS: how long a listed item stays reserved for the reviewer who got it. */
  leaseSeconds: number;
  /** CANDIDATE: score every request with the bundled candidate model too ("shadow"). */
  shadow: boolean;
}

export const DEFAULT_REVIEW_LOOP_CONFIG: ReviewLoopConfig = {
  db: null,
  storeText: false,
  hashKey: null,
  retentionDays: 30,
  reviewerToken: null,
  leaseSeconds: 300,
  shadow: false,
};

const TRUE_WORDS = new Set(["1", "true", "on", "yes"]);
const FALSE_WORDS = new Set(["0", "false", "off", "no"]);

/**
 * Reads the review loop's settings from bindings (names as in wrangler.toml).
 * @example reviewLoopConfigFromEnv({ REVIEWS: env.REVIEWS, REVIEW_STORE_TEXT: "on" }).storeText // true
 */
export function reviewLoopConfigFromEnv(env: Readonly<Record<string, unknown>>): ReviewLoopConfig {
  const text = (name: string): string | undefined => {
    const value = env[name];
    if (value === undefined || value === null) return undefined;
    if (typeof value !== "string" && typeof value !== "number" && typeof value !== "boolean") throw new ConfigError(`${name}: expected a string, got ${typeof value}`);
    const trimmed = String(value).trim();
    return trimmed === "" ? undefined : trimmed;
  };
  const flag = (name: string, fallback: boolean, words: { on: string; off: string } = { on: "on", off: "off" }): boolean => {
    const raw = text(name);
    if (raw === undefined) return fallback;
    const lower = raw.toLowerCase();
    if (TRUE_WORDS.has(lower) || lower === words.on) return true;
    if (FALSE_WORDS.has(lower) || lower === words.off) return false;
    throw new ConfigError(`${name}: expected ${words.on} or ${words.off} (or true/false), got "${raw}"`);
  };
  const integer = (name: string, min: number, max: number, fallback: number): number => {
    const raw = text(name);
    if (raw === undefined) return fallback;
    const value = Number(raw);
    if (!Number.isInteger(value) || value < min || value > max) throw new ConfigError(`${name}: expected an integer from ${min} to ${max}, got "${raw}"`);
    return value;
  };
  const reviewerToken = text("REVIEWER_TOKEN") ?? null;
  if (reviewerToken !== null && reviewerToken === text("API_TOKEN")) {
    throw new ConfigError("REVIEWER_TOKEN: must differ from API_TOKEN (a reviewer token must not open the classify API, nor the reverse)");
  }
  const binding = env.REVIEWS;
  let db: D1Database | null = null;
  if (isD1Database(binding)) db = binding;
  else if (binding !== undefined) console.error("sluice: REVIEWS is not a D1 binding ([[d1_databases]] in wrangler.toml); nothing will be stored");
  const d = DEFAULT_REVIEW_LOOP_CONFIG;
  return {
    db,
    storeText: flag("REVIEW_STORE_TEXT", d.storeText),
    hashKey: text("REVIEW_HASH_KEY") ?? null,
    retentionDays: integer("REVIEW_RETENTION_DAYS", 1, 3650, d.retentionDays),
    reviewerToken,
    leaseSeconds: integer("REVIEW_LEASE_SECONDS", 10, 3600, d.leaseSeconds),
    shadow: flag("CANDIDATE", d.shadow, { on: "shadow", off: "off" }),
  };
}
