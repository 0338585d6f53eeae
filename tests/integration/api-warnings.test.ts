/**
 * The API says what the pages say: a run's warnings (and the criteria behind them) in the run
 * JSON, the oxygen and the TAN caution lines in the CSV, and the warnings in a what-if preview, canonical or in the
 * person's units.
 */
import { describe, expect, it } from "vitest";
import { ammoniaCriteria, getPreset } from "../../models";
import { action as previewAction } from "~/routes/api/preview";
import { loader as runLoader } from "~/routes/api/run";
import { loader as scenarioRunLoader } from "~/routes/api/scenario-run";
import { call, get, postJson } from "../support/routes";
import { createScenario, createTank } from "../support/tanks";
import { userWithCookie } from "../support/users";

const fishless = getPreset("first-light-fishless")!.scenario;
/** A new filter at pH 8.2 and 28 °C: free ammonia far above the caution line. */
const NEW_FILTER_PH_8 = { ...fishless, water: { ...fishless.water, pH: 8.2, temperatureC: 28 } };

describe("warnings through the API", () => {
  it("the run JSON carries the warnings and criteria, the CSV the oxygen and the TAN caution lines", async () => {
    const keeper = await userWithCookie();
    const tankId = createTank(keeper.id);
    const scenarioId = String(await createScenario(keeper.id, tankId, NEW_FILTER_PH_8, "pH 8.2"));
    const stored = await call(scenarioRunLoader, get(`/api/scenarios/${scenarioId}/run`, keeper.cookie), {
      scenarioId,
    });
    expect(stored.status).toBe(200);
    const run = stored.data.run;
    // US EPA 2013 (docs/sources.md §2): acute criterion at pH 8.2 and 28 °C
    expect(run.ammoniaCriteria.acuteTanMgNPerL).toBeCloseTo(ammoniaCriteria(8.2, 28).acuteTanMgNPerL, 6);
    const acute = run.warnings.find((w: { code: string }) => w.code === "ammoniaAboveAcuteCriterion");
    expect(acute?.value).toBeGreaterThan(acute?.limit);
    expect(acute?.unit).toBe("mg N/L");

    const runId = String(run.id);
    const full = await call(runLoader, get(`/api/runs/${runId}`, keeper.cookie), { runId });
    expect(full.data.run.warnings).toEqual(run.warnings);
    const csv = await call(runLoader, get(`/api/runs/${runId}?format=csv`, keeper.cookie), { runId });
    const [header, first] = String(csv.data).trim().split(/\r?\n/);
    const columns = header.split(",");
    expect(columns).toContain("oxygen_mg_o2_per_l");
    // The run starts at saturation: 7.8 mg/L at 28 °C (Benson & Krause 1984, docs/sources.md)
    expect(Number(first.split(",")[columns.indexOf("oxygen_mg_o2_per_l")])).toBeCloseTo(7.8, 1);
    // The chart's two TAN caution lines, at each row's own pH and the run's 28 °C: US EPA 2013
    // chronic and acute criteria (docs/sources.md §2), as the results chart and its CSV draw them.
    const rows = String(csv.data)
      .trim()
      .split(/\r?\n/)
      .slice(1)
      .map((line) => line.split(",").map(Number));
    const at = (row: number[], name: string) => row[columns.indexOf(name)];
    expect(columns).toContain("tan_long_term_limit_mg_n_per_l");
    for (const row of [rows[0], rows[Math.floor(rows.length / 2)], rows.at(-1)!]) {
      const criteria = ammoniaCriteria(at(row, "ph"), 28);
      expect(at(row, "tan_long_term_limit_mg_n_per_l")).toBeCloseTo(criteria.chronicTanMgNPerL, 4);
      expect(at(row, "tan_short_term_criterion_mg_n_per_l")).toBeCloseTo(criteria.acuteTanMgNPerL, 4);
    }
  });

  it("a what-if preview warns, canonical and in the person's units", async () => {
    const keeper = await userWithCookie();
    const tankId = createTank(keeper.id);
    const scenarioId = await createScenario(keeper.id, tankId, NEW_FILTER_PH_8, "pH 8.2");
    const canonical = await call(previewAction, postJson("/api/preview", { scenarioId, whatIf: {} }, keeper.cookie));
    expect(canonical.status).toBe(200);
    expect(canonical.data.warnings.map((w: { code: string }) => w.code)).toContain("ammoniaAboveAcuteCriterion");
    const display = await call(
      previewAction,
      postJson("/api/preview?units=display", { scenarioId, whatIf: {} }, keeper.cookie),
    );
    // The caution line for free ammonia: 0.02 mg/L NH3 (common practice, no source)
    const freeNh3 = display.data.warnings.find((w: { code: string }) => w.code === "freeAmmoniaAboveCaution");
    expect(freeNh3?.text).toMatch(
      /^Free ammonia reaches [\d.]+ mg\/L NH3 on day [\d.]+, .* the caution line \(0\.02 mg\/L NH3\)\.$/,
    );
    expect(freeNh3?.figure).toBe("peakFreeNh3");
  });
});
