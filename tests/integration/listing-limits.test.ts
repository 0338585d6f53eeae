/**
 * Whole listings (the journal or the readings as a CSV file, or through the API) are built on the
 * request thread: with a full journal and 20,000 readings each took 0.2–0.7 s, and one person
 * could ask for them again and again (issue 10: nobody can freeze the server). Each person has a
 * number a minute, the four ways counted together. Our own checks against app/rate-limits.server.ts.
 */
import { afterEach, describe, expect, it } from "vitest";
import { LIMITS, resetRateLimits } from "~/rate-limits.server";
import { loader as journalApi } from "~/routes/api/tank-journal";
import { loader as readingsApi } from "~/routes/api/tank-readings";
import { loader as journalExport } from "~/routes/journal/export";
import { loader as readingsExport } from "~/routes/readings/export";
import { call, get } from "../support/routes";
import { createTank } from "../support/tanks";
import { userWithCookie } from "../support/users";

afterEach(() => resetRateLimits());

async function keeperWithTank() {
  const keeper = await userWithCookie();
  const tankId = String(createTank(keeper.id));
  const ways = [
    () => call(journalExport, get(`/tanks/${tankId}/journal/export`, keeper.cookie), { tankId }),
    () => call(readingsExport, get(`/tanks/${tankId}/readings/export`, keeper.cookie), { tankId }),
    () => call(journalApi, get(`/api/tanks/${tankId}/journal`, keeper.cookie), { tankId }),
    () => call(readingsApi, get(`/api/tanks/${tankId}/readings`, keeper.cookie), { tankId }),
  ];
  return { keeper, tankId, ways };
}

describe("whole listings of one person", () => {
  it("builds at most the limit a minute, exports and API listings together; past it 429 with when to ask again", async () => {
    const { ways } = await keeperWithTank();
    const limit = LIMITS.fullListingsPerPerson.points;
    for (let i = 0; i < limit; i++) expect((await ways[i % ways.length]()).status).toBe(200);
    const csv = await ways[0]();
    const api = await ways[2]();
    expect(csv.status).toBe(429);
    expect(Number(csv.headers.get("Retry-After"))).toBeGreaterThan(0);
    expect(csv.data).toMatch(/Too many whole exports or listings/);
    expect(api.status).toBe(429);
    expect(api.data).toMatchObject({ status: 429, error: expect.stringMatching(/Try again in/) });
    for (const way of ways) expect((await way()).status).toBe(429);

    // Someone else is not held up.
    const other = await keeperWithTank();
    for (const way of other.ways) expect((await way()).status).toBe(200);
  });

  it("counts a burst sent at once like requests one after another", async () => {
    const { ways } = await keeperWithTank();
    const answers = await Promise.all(Array.from({ length: 30 }, (_, i) => ways[i % ways.length]()));
    const statuses = answers.map((a) => a.status);
    expect(statuses.filter((s) => s === 200)).toHaveLength(LIMITS.fullListingsPerPerson.points);
    expect(statuses.filter((s) => s === 429)).toHaveLength(30 - LIMITS.fullListingsPerPerson.points);
  });
});
