// The HTTP app and the e-mail handler act on a failed-closed decision: /v1/moderate answers
// 200 "review" with the fault code and humanReview.required (not a 500 a form handler might
// let through), and an e-mail whose decision fails goes to the fallback address, not its team.
import { describe, expect, it } from "vitest";
import { Model } from "../../runtime/model/model.ts";
import { createApp } from "../../runtime/worker/create-app.ts";
import { handleEmail } from "../../runtime/worker/handle-email.ts";
import { fakeEmailMessage } from "./helpers/fake-email-message.ts";
import { demoModel, jsonPost, routingModel } from "./helpers/worker-fixture.ts";

function withBrokenTemperature(model: Model): Model {
  return new Model({ ...model.parts, header: { ...model.parts.header, calibration: { temperature: 5e-324 } } });
}

function withThrowingClassify(model: Model): Model {
  const broken = new Model(model.parts);
  broken.classify = () => {
    throw new RangeError("Maximum call stack size exceeded");
  };
  return broken;
}

describe("fail closed in the app", () => {
  it("should answer /v1/moderate with 200 review and a fault code when the scores are NaN", async () => {
    const app = createApp(withBrokenTemperature(demoModel()));
    const response = await app.request("/v1/moderate", jsonPost({ text: "WIN A FREE PRIZE!!!" }));
    expect(response.status).toBe(200);
    const body = (await response.json()) as Record<string, any>;
    expect(body.action).toBe("review");
    expect(body.fault.code).toBe("non-finite-score");
    expect(body.humanReview.required).toBe(true);
  });

  it("should forward an e-mail to the fallback address when routing throws", async () => {
    const raw = "Subject: Charged twice\r\nMessage-ID: <3@example.com>\r\n\r\nMy card was charged twice for order #A12345, please refund.\r\n";
    const { message, calls } = fakeEmailMessage(raw);
    const config = { routes: { billing: "billing@vellumcroft.example" }, fallback: "triage@vellumcroft.example", minScore: 0.7 };
    const outcome = await handleEmail({ moderation: demoModel(), routing: withThrowingClassify(routingModel()) }, config, message);
    expect(calls.forwardedTo).toBe("triage@vellumcroft.example");
    expect(calls.headers?.get("X-Sluice-Fallback")).toBe("true");
    expect(outcome.reason).toContain("deciding the message failed");
  });

  it("should forward an e-mail to the fallback address when moderation scores are NaN", async () => {
    const raw = "Subject: Charged twice\r\nMessage-ID: <4@example.com>\r\n\r\nMy card was charged twice for order #A12345, please refund.\r\n";
    const { message, calls } = fakeEmailMessage(raw);
    const config = { routes: { billing: "billing@vellumcroft.example" }, fallback: "triage@vellumcroft.example", minScore: 0.7 };
    await handleEmail({ moderation: withBrokenTemperature(demoModel()), routing: routingModel() }, config, message);
    expect(calls.forwardedTo).toBe("triage@vellumcroft.example");
    expect(calls.headers?.get("X-Sluice-Moderation")).toBe("review");
  });
});
