// Settings of the HTTP app and the e-mail handler, and how they are read from Worker
// bindings ([vars] and secrets in wrangler.toml) or from process.env under `sluice serve`.
// One table of defaults; every variable is parsed with an error that names it.

import { SURFACE_DEFAULTS } from "../index.ts";
import type { RateLimitBinding } from "./platform-types.ts";
import type { ReviewLoop } from "./reviews/review-loop.ts";

/** Where e-mail goes, by the routing model's topic. */
export interface EmailConfig {
  /** Topic → destination address (a verified destination address of Email Routing). */
  routes: Readonly<Record<string, string>>;
  /** Destination when moderation asks for review, or the topic is uncertain or unrouted. */
  fallback: string | null;
  /** Score a topic needs before its route is used, when the routing model has no threshold for it. */
  minScore: number;
}

/** Everything `createApp` and the e-mail handler need besides the model. */
export interface AppConfig {
  /** Bearer token every /v1/* request must carry; null = no authentication. */
  apiToken: string | null;
  /** Origins allowed to call /v1/* from a browser; empty = no CORS headers at all. */
  corsOrigins: readonly string[];
  /** Largest request body in bytes (413 above). */
  maxBodyBytes: number;
  /** Most texts in one /v1/classify call (413 above). */
  maxTexts: number;
  /** Fields of a /v1/moderate body that hold the text, joined in this order. */
  moderateFields: readonly string[];
  /** An "allow" whose top score is below this becomes "review" (0 = off). */
  reviewBelow: number;
  /** Platform rate limiter; null = no rate limiting. */
  rateLimiter: RateLimitBinding | null;
  email: EmailConfig;
  /** Review queue, traffic counts and shadow candidate (runtime/worker/reviews/); null = off. */
  reviewLoop: ReviewLoop | null;
}

/**
 * Defaults for a fresh app: no auth, no CORS, 128 KiB bodies, 100 texts a call. E-mail needs a
 * topic score of 0.7: on the demo routing model's validation split (600 support e-mails) 90.7%
 * reach it and 97.2% of those carry their labelled topic, so about one mail in eleven goes to a
 * person (runtime/worker/README.md, "Choosing EMAIL_MIN_SCORE").
 */
export const DEFAULT_APP_CONFIG: AppConfig = {
  apiToken: null,
  corsOrigins: [],
  maxBodyBytes: 128 * 1024,
  maxTexts: 100,
  moderateFields: ["text"],
  reviewBelow: SURFACE_DEFAULTS.reviewBelow,
  rateLimiter: null,
  email: { routes: {}, fallback: null, minScore: 0.7 },
  reviewLoop: null,
};

/** A configuration variable that cannot be used; the message names the variable. */
export class ConfigError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "ConfigError";
  }
}

/**
 * Fills defaults into a partial config.
 * @example resolveAppConfig({ maxTexts: 10 }).maxBodyBytes // 131072
 */
export function resolveAppConfig(partial: Partial<AppConfig> = {}): AppConfig {
  return {
    ...DEFAULT_APP_CONFIG,
    ...partial,
    email: { ...DEFAULT_APP_CONFIG.email, ...(partial.email ?? {}) },
  };
}

/**
 * Reads the config from bindings or environment variables (names as in wrangler.toml [vars]).
 * @example appConfigFromEnv({ MAX_TEXTS: "20", CORS_ORIGINS: "https://shop.example" }).maxTexts // 20
 */
export function appConfigFromEnv(env: Readonly<Record<string, unknown>>): AppConfig {
  const text = (name: string): string | undefined => {
    const value = env[name];
    if (value === undefined || value === null) return undefined;
    if (typeof value === "number" || typeof value === "boolean") return String(value);
    if (typeof value !== "string") throw new ConfigError(`${name}: expected a string, got ${typeof value}`);
    return value.trim() === "" ? undefined : value.trim();
  };
  const number = (name: string, min: number, max: number, integer: boolean): number | undefined => {
    const raw = text(name);
    if (raw === undefined) return undefined;
    const value = Number(raw);
    if (!Number.isFinite(value) || value < min || value > max || (integer && !Number.isInteger(value))) {
      throw new ConfigError(`${name}: expected ${integer ? "an integer" : "a number"} from ${min} to ${max}, got "${raw}"`);
    }
    return value;
  };
  const list = (name: string): string[] | undefined => {
    const raw = text(name);
    return raw === undefined ? undefined : raw.split(",").map((item) => item.trim()).filter((item) => item.length > 0);
  };
  const defaults = DEFAULT_APP_CONFIG;
  const limiter = env.RATE_LIMITER;
  if (limiter !== undefined && (typeof limiter !== "object" || limiter === null || typeof (limiter as RateLimitBinding).limit !== "function")) {
    throw new ConfigError("RATE_LIMITER: expected a rate limiting binding ([[ratelimits]] in wrangler.toml)");
  }
  const moderateFields = list("MODERATE_FIELDS");
  if (moderateFields !== undefined && moderateFields.length === 0) throw new ConfigError("MODERATE_FIELDS: expected at least one field name");
  return {
    apiToken: apiToken(env.API_TOKEN),
    corsOrigins: list("CORS_ORIGINS") ?? defaults.corsOrigins,
    maxBodyBytes: number("MAX_BODY_BYTES", 1, 64 * 1024 * 1024, true) ?? defaults.maxBodyBytes,
    maxTexts: number("MAX_TEXTS", 1, 10_000, true) ?? defaults.maxTexts,
    moderateFields: moderateFields ?? defaults.moderateFields,
    reviewBelow: number("REVIEW_BELOW", 0, 1, false) ?? defaults.reviewBelow,
    rateLimiter: (limiter as RateLimitBinding | undefined) ?? null,
    email: {
      routes: emailRoutes(env.EMAIL_ROUTES),
      fallback: text("EMAIL_FALLBACK") ?? null,
      minScore: number("EMAIL_MIN_SCORE", 0, 1, false) ?? defaults.email.minScore,
    },
    // Built by the Worker entry, which holds the models (runtime/worker/worker.ts).
    reviewLoop: null,
  };
}

// RFC 6750 §2.1 b64token: the only characters a bearer credential can carry.
const B64TOKEN = /^[A-Za-z0-9\-._~+/]+=*$/;

/**
 * API_TOKEN: unset (undefined or null) means an open API; anything else must be a usable
 * token. A blank value or one no Authorization header can carry (spaces inside, non-ASCII)
 * is a misconfiguration, not "no token": a typo in a secret must not silently open the API.
 */
function apiToken(value: unknown): string | null {
  if (value === undefined || value === null) return null;
  if (typeof value !== "string") throw new ConfigError(`API_TOKEN: expected a string, got ${typeof value}`);
  const token = value.trim();
  if (token === "") throw new ConfigError("API_TOKEN: it is set but blank; set a real token, or remove the variable to run an open API");
  if (!B64TOKEN.test(token)) {
    throw new ConfigError("API_TOKEN: it holds characters a bearer token cannot carry (RFC 6750 allows A-Z a-z 0-9 - . _ ~ + / and trailing =), so no request could match it");
  }
  return token;
}

/** EMAIL_ROUTES: a JSON object (or a TOML table) mapping topic → address. */
function emailRoutes(value: unknown): Record<string, string> {
  if (value === undefined || value === null || value === "") return {};
  let parsed: unknown = value;
  if (typeof value === "string") {
    try {
      parsed = JSON.parse(value);
    } catch (error) {
      throw new ConfigError(`EMAIL_ROUTES: expected a JSON object of topic → address, but it is not valid JSON (${(error as Error).message})`);
    }
  }
  if (typeof parsed !== "object" || parsed === null || Array.isArray(parsed)) throw new ConfigError("EMAIL_ROUTES: expected a JSON object of topic → address");
  const routes: Record<string, string> = {};
  for (const [label, address] of Object.entries(parsed)) {
    if (typeof address !== "string" || !address.includes("@")) throw new ConfigError(`EMAIL_ROUTES: the route for "${label}" must be an e-mail address, got ${JSON.stringify(address)}`);
    routes[label] = address;
  }
  return routes;
}
