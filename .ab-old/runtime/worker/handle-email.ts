// The e-mail handler: parse the raw RFC 5322 message with postal-mime, run moderation then
// topic routing on subject and body (routeEmail), then forward with X-Sluice-* headers or
// refuse the message at SMTP time.

import PostalMime from "postal-mime";
import type { EmailConfig } from "./app-config.ts";
import { emailText } from "./email-text.ts";
import { headerValue } from "./header-value.ts";
import type { IncomingEmailMessage } from "./platform-types.ts";
import { routeEmail, toFallback, type EmailModels, type EmailOutcome } from "./route-email.ts";

/**
 * Larger messages are forwarded to the fallback address without being parsed: decoding
 * big attachments would spend the request's CPU budget (10 ms on the free plan) on bytes
 * the models never read. Messages may be up to 25 MiB (Email Routing limits).
 */
export const MAX_PARSED_BYTES = 4 * 1024 * 1024;

/**
 * Handles one incoming message; returns what was done. `onModerated` hears each text the
 * moderation model decided on (not unreadable or oversized ones).
 * @example export default { email: (message, env) => handleEmail({ moderation, routing }, appConfigFromEnv(env).email, message) }
 */
export async function handleEmail(models: EmailModels, config: EmailConfig, message: IncomingEmailMessage, onModerated?: (text: string, outcome: EmailOutcome) => void): Promise<EmailOutcome> {
  let outcome: EmailOutcome;
  if (message.rawSize > MAX_PARSED_BYTES) {
    outcome = unclassified(config, `the message has ${message.rawSize} bytes, more than the ${MAX_PARSED_BYTES} this handler parses`);
  } else {
    const text = await readMessageText(message);
    outcome = text === "" ? unclassified(config, "the message has no readable text") : routeOrFallback(models, config, text);
    // The review queue sees every moderated text (it stores the review band, counts the rest).
    if (text !== "") {
      try {
        onModerated?.(text, outcome);
      } catch (error) {
        console.error("sluice: the review queue could not take the message; it is handled anyway", error);
      }
    }
  }
  if (outcome.kind === "reject") {
    await message.setReject(outcome.reason);
    return outcome;
  }
  await message.forward(outcome.to as string, forwardHeaders(models, outcome));
  return outcome;
}

/**
 * The headers a forwarded message gains (forwards may only add X-* headers, Email Workers
 * runtime API): the moderation action, the topic and its score when routing ran, both model
 * content ids, and on the fallback path a flag and the reason.
 * @example forwardHeaders(models, outcome).get("X-Sluice-Topic") // "billing"
 */
export function forwardHeaders(models: EmailModels, outcome: EmailOutcome): Headers {
  const headers = new Headers({
    "X-Sluice-Moderation": outcome.moderation.action,
    "X-Sluice-Model": `moderation=${models.moderation.meta.contentId}; routing=${models.routing.meta.contentId}`,
    "X-Sluice-Tokens": String(outcome.tokenCount),
  });
  if (outcome.topic !== null) {
    headers.set("X-Sluice-Topic", headerValue(outcome.topic.label));
    headers.set("X-Sluice-Score", outcome.topic.score.toFixed(4));
  }
  if (outcome.fallback) {
    headers.set("X-Sluice-Fallback", "true");
    headers.set("X-Sluice-Reason", headerValue(outcome.reason));
  }
  return headers;
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

/** routeEmail, failing closed: an error while deciding sends the message to a person, never on to its topic. */
function routeOrFallback(models: EmailModels, config: EmailConfig, text: string): EmailOutcome {
  try {
    return routeEmail(models, config, text);
  } catch (error) {
    console.error("sluice: deciding the message failed; it goes to the fallback address", error);
    return unclassified(config, "deciding the message failed (see the log)");
  }
}

/** A message that cannot be read (or is too big to) goes to a person unclassified. */
function unclassified(config: EmailConfig, why: string): EmailOutcome {
  return toFallback(config, { moderation: { action: "review", label: "", score: 0 }, topic: null, tokenCount: 0 }, why);
}
