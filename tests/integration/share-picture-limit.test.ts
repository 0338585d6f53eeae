/**
 * A share link's picture (og:image) is drawn on the request thread, about 50 ms each, and drawn
 * anew whenever the scenario is renamed. Renaming and fetching in a loop kept the request thread
 * drawing (issue 10: nobody can freeze the server), so draws count per owner; past the limit the
 * picture under the former name is served. Our own checks against app/rate-limits.server.ts.
 */
import { eq } from "drizzle-orm";
import { afterEach, describe, expect, it } from "vitest";
import { getDb } from "~/db/client.server";
import { runs, scenarios } from "~/db/schema";
import { previewEtag } from "~/features/sharing/preview-image.server";
import { LIMITS, resetRateLimits } from "~/rate-limits.server";
import { action as manageAction } from "~/routes/share/manage";
import { loader as previewLoader } from "~/routes/share/preview-image";
import { call, get, post } from "../support/routes";
import { createScenario, createTank } from "../support/tanks";
import { userWithCookie } from "../support/users";

afterEach(() => resetRateLimits());

async function preview(token: string) {
  const response = (await previewLoader({
    request: get(`/s/${token}/preview.png`),
    params: { token },
  } as never)) as Response;
  return { status: response.status, etag: response.headers.get("ETag"), type: response.headers.get("Content-Type") };
}

describe("share-link pictures", () => {
  it("draws at most the owner's limit a minute however often the scenario is renamed; visitors at once share one drawing", async () => {
    const owner = await userWithCookie();
    const tankId = createTank(owner.id);
    const scenarioId = await createScenario(owner.id, tankId, { run: { lengthDays: 20 } }, "First name");
    const made = await call(
      manageAction,
      post(`/tanks/${tankId}/scenarios/${scenarioId}/share`, { intent: "make" }, owner.cookie),
      {
        tankId: String(tankId),
        scenarioId: String(scenarioId),
      },
    );
    const token = new URL(made.data.url).pathname.split("/").pop()!;
    const runId = getDb().select({ id: runs.id }).from(runs).where(eq(runs.scenarioId, scenarioId)).get()!.id;
    const rename = (name: string) => getDb().update(scenarios).set({ name }).where(eq(scenarios.id, scenarioId)).run();

    // Ten visitors at once after a rename: one drawing between them.
    rename("Name 0");
    const burst = await Promise.all(Array.from({ length: 10 }, () => preview(token)));
    expect(burst.map((b) => b.etag)).toEqual(burst.map(() => previewEtag(runId, "Name 0")));
    let drawn = 1;
    const limit = LIMITS.sharePicturesPerOwner.points;
    for (let i = 1; i <= limit + 10; i++) {
      rename(`Name ${i}`);
      const answer = await preview(token);
      expect(answer.status).toBe(200);
      expect(answer.type).toBe("image/png");
      if (answer.etag === previewEtag(runId, `Name ${i}`)) drawn++;
    }
    // The burst took one drawing of the limit, so the loop drew the rest and no more.
    expect(drawn).toBe(limit);
  });
});
