// The e-mail handler: parse the raw RFC 5322 message with postal-mime, classify subject and
// body, then forward (with X-Sluice-* headers) or refuse it as routeEmail decides.

import PostalMime from "postal-mime";
import type { Model } from "../model.ts";
import type { EmailConfig } from "./app-config.ts";
import { emailText } from "./email-text.ts";
import type { IncomingEmailMessage } from "./platform-types.ts";
import { routeEmail, type EmailOutcome } from "./route-email.ts";

/**
 * Larger messages are forwarded to the fallback address without being parsed: decoding
 * big attachments would spend the request's CPU budget (10 ms on the free plan) on bytes
 * the model never reads. Messages may be up to 25 MiB (Email Routing limits).
 */
export const MAX_PARSED_BYTES = 4 * 1024 * 1024;

/**
 * Handles one incoming message; returns what was done.
 * @example export default { email: (message, env) => handleEmail(model, appConfigFromEnv(env).email, message) }
 */
export async function handleEmail(model: Model, config: EmailConfig, message: IncomingEmailMessage): Promise<EmailOutcome> {
  let outcome: EmailOutcome;
  if (message.rawSize > MAX_PARSED_BYTES) {
    outcome = unclassified(config, `the message has ${message.rawSize} bytes, more than the ${MAX_PARSED_BYTES} this handler parses`);
  } else {
    const text = await readMessageText(message);
    outcome = text === "" ? unclassified(config, "the message has no readable text") : routeEmail(model, config, text);
  }
  if (outcome.kind === "reject") {
    await message.setReject(outcome.reason);
    return outcome;
  }
  // Forwarded messages may only gain X-* headers (Email Workers runtime API).
  const headers = new Headers({ "X-Sluice-Action": outcome.action, "X-Sluice-Tokens": String(outcome.tokenCount), "X-Sluice-Model": model.meta.version });
  if (outcome.label !== "") {
    headers.set("X-Sluice-Label", outcome.label);
    headers.set("X-Sluice-Score", outcome.score.toFixed(4));
  }
  if (outcome.fallback) headers.set("X-Sluice-Fallback", "true");
  await message.forward(outcome.to as string, headers);
  return outcome;
}

async function readMessageText(message: IncomingEmailMessage): Promise<string> {
  try {
    const parsed = await PostalMime.parse(await new Response(message.raw).arrayBuffer());
    return emailText(parsed);
  } catch (error) {
    console.error("sluice: the message cannot be parsed as MIME", error);
    return "";
  }
}

/** A message that cannot be read (or is too big to) goes to the fallback address unclassified. */
function unclassified(config: EmailConfig, why: string): EmailOutcome {
  const base = { label: "", score: 0, action: "review" as const, tokenCount: 0 };
  if (config.fallback === null) return { ...base, kind: "reject", to: null, fallback: false, reason: `${why}, and no fallback address is configured` };
  return { ...base, kind: "forward", to: config.fallback, fallback: true, reason: why };
}
