// The two secrets stay apart, in real workerd: the reviewer routes take only REVIEWER_TOKEN
// (and are off without it); the classify routes take only API_TOKEN and refuse the reviewer
// token even when the API is open; one token for both roles is a configuration error.

import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { removeWorkerBundle } from "../helpers/worker-fixture.ts";
import { API_TOKEN, bearer, moderate, REVIEWER_TOKEN, startReviewWorker, type ReviewWorker } from "../helpers/review-worker.ts";

let guarded: ReviewWorker;
let open: ReviewWorker;
let noReviewer: ReviewWorker;

beforeAll(async () => {
  [guarded, open, noReviewer] = await Promise.all([startReviewWorker({ API_TOKEN }), startReviewWorker({}), startReviewWorker({ REVIEWER_TOKEN: "" })]);
}, 120_000);

afterAll(async () => {
  await Promise.all([guarded?.miniflare.dispose(), open?.miniflare.dispose(), noReviewer?.miniflare.dispose()]);
  removeWorkerBundle();
});

const REVIEWER_ROUTES = ["/v1/reviews?status=pending", "/v1/reviews/export", "/v1/stats", "/v1/shadow"];

describe("reviewer and API tokens", () => {
  it("should refuse the reviewer routes without a token, with a wrong one and with the API token", async () => {
    for (const path of REVIEWER_ROUTES) {
      for (const headers of [{}, bearer("not-the-token"), bearer(API_TOKEN), { authorization: `Basic ${btoa(`x:${REVIEWER_TOKEN}`)}` }]) {
        const response = await guarded.fetch(path, { headers });
        expect(response.status, `${path} with ${JSON.stringify(headers)}`).toBe(401);
      }
    }
    const decide = await guarded.fetch("/v1/reviews/1", { method: "POST", headers: { ...bearer(API_TOKEN), "content-type": "application/json" }, body: '{"skip":true}' });
    expect(decide.status).toBe(401);
  });

  it("should open the reviewer routes with the reviewer token", async () => {
    for (const path of REVIEWER_ROUTES) {
      const response = await guarded.fetch(path, { headers: bearer(REVIEWER_TOKEN) });
      expect(response.status, path).toBe(200);
    }
  });

  it("should refuse the reviewer token on the classify routes, whether or not the API has a token", async () => {
    for (const worker of [guarded, open]) {
      const response = await moderate(worker, "hello there", bearer(REVIEWER_TOKEN));
      expect(response.status).toBe(401);
      const classify = await worker.fetch("/v1/classify", { method: "POST", headers: { ...bearer(REVIEWER_TOKEN), "content-type": "application/json" }, body: '{"text":"hello"}' });
      expect(classify.status).toBe(401);
    }
    expect((await moderate(guarded, "hello there", bearer(API_TOKEN))).status).toBe(200);
    expect((await moderate(open, "hello there")).status).toBe(200);
  });

  it("should keep the reviewer routes off (503) when no REVIEWER_TOKEN is set, whatever is presented", async () => {
    for (const headers of [{}, bearer(REVIEWER_TOKEN)]) {
      const response = await noReviewer.fetch("/v1/reviews", { headers });
      expect(response.status).toBe(503);
      expect(((await response.json()) as { error: { code: string } }).error.code).toBe("reviews-off");
    }
  });

  it("should answer bad-config when REVIEWER_TOKEN equals API_TOKEN", async () => {
    const same = await startReviewWorker({ API_TOKEN: "same-t0ken", REVIEWER_TOKEN: "same-t0ken" });
    try {
      const response = await moderate(same, "hello", bearer("same-t0ken"));
      expect(response.status).toBe(500);
      expect(((await response.json()) as { error: { code: string } }).error.code).toBe("bad-config");
    } finally {
      await same.miniflare.dispose();
    }
  });
});
