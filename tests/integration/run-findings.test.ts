/**
 * Stored runs keep what the engine found beyond the series (warnings, low-oxygen zones,
 * ammonia criteria); runs stored before that was kept are run again, never a 500.
 */
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { ammoniaCriteria, getPreset } from "../../models";
import { getDb } from "~/db/client.server";
import { runs, scenarios } from "~/db/schema";
import { resultsPayload } from "~/features/runs/results.server";
import { ensureRun, readStoredSettings } from "~/features/runs/simulation.server";
import { DEFAULT_PREFERENCES, displayUnitsFor } from "~/utils/display-units";
import { createScenario, createTank } from "../support/tanks";
import { createUser } from "../support/users";

const NEW_FILTER_PH_8 = {
  ...getPreset("first-light-fishless")!.scenario,
  water: { ...getPreset("first-light-fishless")!.scenario.water, pH: 8.2, temperatureC: 28 },
};

describe("stored run findings", () => {
  it("keeps the warnings and criteria, and re-runs a run stored without them", async () => {
    const user = await createUser();
    const tankId = createTank(user.id);
    const scenarioId = await createScenario(user.id, tankId, NEW_FILTER_PH_8, "New filter at pH 8.2");
    const row = getDb().select().from(scenarios).where(eq(scenarios.id, scenarioId)).get()!;
    const settings = readStoredSettings(row.settings)!;
    const stored = await ensureRun(scenarioId, settings, user.id);
    // US EPA 2013 (docs/sources.md §2): the criteria at the scenario's pH and temperature.
    expect(stored.findings.ammoniaCriteria.chronicTanMgNPerL).toBeCloseTo(
      ammoniaCriteria(8.2, 28).chronicTanMgNPerL,
      6,
    );
    expect(stored.findings.warnings.map((w) => w.code)).toContain("ammoniaAboveAcuteCriterion");

    // A run stored before the findings were kept: not reused, run again and stored with them.
    getDb().update(runs).set({ findings: null }).where(eq(runs.id, stored.id)).run();
    const again = await ensureRun(scenarioId, settings, user.id);
    expect(again.id).not.toBe(stored.id);
    expect(again.findings.warnings.length).toBeGreaterThan(0);

    // The results payload says it in plain words and draws the criterion on TAN, sample by sample.
    const payload = resultsPayload(again, settings, displayUnitsFor(DEFAULT_PREFERENCES));
    const freeNh3 = payload.warnings.find((w) => w.code === "freeAmmoniaAboveCaution");
    expect(freeNh3?.text).toMatch(
      /^Free ammonia reaches [\d.]+ mg\/L NH3 on day \d+(\.\d+)?, .* the caution line \(0\.02 mg\/L NH3\)\.$/,
    );
    expect(payload.series.tanLongTerm).toHaveLength(payload.series.t.length);
    expect(payload.series.tanShortTerm).toHaveLength(payload.series.t.length);
    expect(Math.min(...payload.series.tanLongTerm!)).toBeGreaterThan(0);
  });
});
