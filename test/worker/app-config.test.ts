// Reading the Worker's configuration from bindings / environment variables.

import { describe, expect, it } from "vitest";
import { appConfigFromEnv, ConfigError, DEFAULT_APP_CONFIG } from "../../runtime/worker/app-config.ts";

describe("appConfigFromEnv", () => {
  it("uses the defaults when nothing is set", () => {
    expect(appConfigFromEnv({})).toEqual(DEFAULT_APP_CONFIG);
  });

  it("reads lists, numbers and the e-mail routes as wrangler.toml [vars] strings", () => {
    const config = appConfigFromEnv({
      CORS_ORIGINS: " https://shop.example ,https://admin.shop.example,",
      MAX_TEXTS: "20",
      MODERATE_FIELDS: "subject, message",
      EMAIL_ROUTES: '{"ok":"support@vellumcroft.example"}',
      EMAIL_FALLBACK: "triage@vellumcroft.example",
      EMAIL_MIN_SCORE: "0.7",
      API_TOKEN: "t",
    });
    expect(config.corsOrigins).toEqual(["https://shop.example", "https://admin.shop.example"]);
    expect(config.maxTexts).toBe(20);
    expect(config.moderateFields).toEqual(["subject", "message"]);
    expect(config.email).toEqual({ routes: { ok: "support@vellumcroft.example" }, fallback: "triage@vellumcroft.example", minScore: 0.7 });
    expect(config.apiToken).toBe("t");
  });

  it("accepts the routes as a table, as a TOML [vars] table arrives", () => {
    expect(appConfigFromEnv({ EMAIL_ROUTES: { spam: "spam@vellumcroft.example" } }).email.routes).toEqual({ spam: "spam@vellumcroft.example" });
  });

  it("names the variable and what it expected when a value is wrong", () => {
    expect(() => appConfigFromEnv({ MAX_TEXTS: "0" })).toThrow(new ConfigError('MAX_TEXTS: expected an integer from 1 to 10000, got "0"'));
    expect(() => appConfigFromEnv({ EMAIL_MIN_SCORE: "high" })).toThrow(/EMAIL_MIN_SCORE: expected a number from 0 to 1/);
    expect(() => appConfigFromEnv({ EMAIL_ROUTES: "{ok: nowhere}" })).toThrow(/EMAIL_ROUTES: .*not valid JSON/);
    expect(() => appConfigFromEnv({ EMAIL_ROUTES: '{"ok":"nowhere"}' })).toThrow(/route for "ok" must be an e-mail address/);
    expect(() => appConfigFromEnv({ RATE_LIMITER: "yes" })).toThrow(/RATE_LIMITER: expected a rate limiting binding/);
  });

  it("treats an empty string as unset", () => {
    expect(appConfigFromEnv({ CORS_ORIGINS: "" })).toMatchObject({ apiToken: null, corsOrigins: [] });
  });

  it("leaves the API open only when API_TOKEN is unset", () => {
    expect(appConfigFromEnv({}).apiToken).toBeNull();
    expect(appConfigFromEnv({ API_TOKEN: " s3cret-token " }).apiToken).toBe("s3cret-token");
  });

  it.each([
    ["empty", ""],
    ["made only of spaces", "   "],
    ["holding a space inside", "two words"],
    ["holding a non-ASCII letter", "tökén"],
  ])("refuses an API_TOKEN that is %s", (_name, value) => {
    // RFC 6750 §2.1: b64token = 1*( ALPHA / DIGIT / "-" / "." / "_" / "~" / "+" / "/" ) *"=".
    expect(() => appConfigFromEnv({ API_TOKEN: value })).toThrow(/^API_TOKEN: /);
  });
});
