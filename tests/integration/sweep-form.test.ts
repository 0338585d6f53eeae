/**
 * The sweep form (issue 12, item 12): every field's problem is shown at once, and the bounds
 * its hint gives are the bounds its check enforces, for every setting it offers, in the
 * person's units. Common practice, no source.
 */
import { describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { getDb } from "~/db/client.server";
import { users } from "~/db/schema";
import { action as sweepAction, loader as sweepLoader } from "~/routes/sweeps/sweep";
import { call, get, post } from "../support/routes";
import { createScenario, createTank } from "../support/tanks";
import { userWithCookie } from "../support/users";

async function world(nitrateUnit: "NO3" | "N" = "NO3") {
  const user = await userWithCookie();
  getDb().update(users).set({ nitrateUnit }).where(eq(users.id, user.id)).run();
  const tank = createTank(user.id);
  const scenario = await createScenario(user.id, tank, {
    plants: [{ id: "p", name: "Stems", growthForm: "stem", startMassG: 15, maxMassG: 60 }],
  } as never);
  return { user, tankId: String(tank), scenarioId: String(scenario), base: `/tanks/${tank}/scenarios/${scenario}` };
}

const start = { intent: "start", outcome: "nitrateBeforeLastWaterChange", points: "5" };

describe("the sweep form", () => {
  it("shows every field's problem at once, not one at a time", async () => {
    const { user, tankId, scenarioId, base } = await world();
    const page = await call(sweepLoader, get(`${base}/sweep`, user.cookie), { tankId, scenarioId });
    const lever = page.data.levers.find((l: { id: string }) => l.id === "water.startNitrate")!;
    // "From" not a number, "To" above the bound, points below 2, no outcome chosen.
    const refused = await call(
      sweepAction,
      post(
        `${base}/sweep`,
        { intent: "start", setting: lever.id, from: "abc", to: String(lever.max * 2), points: "1", outcome: "" },
        user.cookie,
      ),
      { tankId, scenarioId },
    );
    expect(refused.status).toBe(400);
    expect(Object.keys(refused.data.errors).sort()).toEqual(["from", "outcome", "points", "to"]);
    expect(refused.data.errors.to).toContain(String(lever.max));
  });

  for (const unit of ["NO3", "N"] as const) {
    it(`hint bounds equal check bounds for every setting (nitrate as ${unit})`, async () => {
      const { user, tankId, scenarioId, base } = await world(unit);
      const page = await call(sweepLoader, get(`${base}/sweep`, user.cookie), { tankId, scenarioId });
      expect(page.data.levers.length).toBeGreaterThan(10);
      const check = async (setting: string, from: number, to: number) => {
        const r = await call(
          sweepAction,
          post(`${base}/sweep`, { ...start, setting, from: String(from), to: String(to) }, user.cookie),
          { tankId, scenarioId },
        );
        return r.status === 400 ? (r.data.errors as Record<string, string>) : {};
      };
      for (const l of page.data.levers) {
        // The hint (sweep.tsx) prints exactly these numbers: "Between {min} and {max} {unit}."
        const nudge = Math.max(Math.abs(l.max), Math.abs(l.min), 1) * 1e-3;
        // Just outside either end is refused, naming the same bounds…
        const below = await check(l.id, l.min - nudge, l.max);
        expect(below.from, `${l.id} below ${l.min}`).toBe(
          `Keep ${l.label.toLowerCase()} between ${l.min} and ${l.max} ${l.unit}.`,
        );
        const above = await check(l.id, l.min, l.max + nudge);
        expect(above.to, `${l.id} above ${l.max}`).toContain(`between ${l.min} and ${l.max}`);
        // …and the ends themselves are allowed (a job starts, or only the job limit refuses).
        const ends = await check(l.id, l.min, l.max);
        expect(ends.from ?? ends.to, `${l.id} from ${l.min} to ${l.max}`).toBeUndefined();
      }
    });
  }
});
