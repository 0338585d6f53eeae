/**
 * The journal's "as it happened" replay says what it crossed: a logged ammonia dose in a tank
 * with fish harms them between two nitrate readings, and the page's curve shows only nitrate.
 */
import { describe, expect, it } from "vitest";
import { loader as pageLoader } from "~/routes/journal/journal";
import { call, get } from "../support/routes";
import { day, tankAtPh8 } from "../support/journal";
import { dayInWords } from "../support/journal-days";

describe("the journal replay's warnings", () => {
  it("a logged ammonia dose with fish at pH 8.2 is named, in the person's units", async () => {
    const { keeper, tankId, log } = await tankAtPh8();
    await log({ date: day(10), kind: "water_change", water_changed_percent: 30 });
    await log({ date: day(3), kind: "ammonia_dosed", ammonia_n_mg_l: 4 });
    const page = await call(pageLoader, get(`/tanks/${tankId}/journal`, keeper.cookie), { tankId });
    expect(page.status).toBe(200);
    const codes = page.data.replay.warnings.map((w: { code: string }) => w.code);
    // Emerson et al. 1975: about 10 % of TAN is free NH3 at pH 8.2 and 28 °C, so 4 mg N/L of TAN
    // is far above the 0.02 mg/L NH3 caution line (common practice, no source).
    expect(codes).toContain("freeAmmoniaAboveCaution");
    const text = page.data.replay.warnings.find((w: { code: string }) => w.code === "freeAmmoniaAboveCaution").text;
    // Dated as the replay's day was: the dose's day, when free ammonia peaks.
    expect(text).toMatch(
      new RegExp(
        `^Free ammonia reaches [\\d.]+ mg/L NH3 on ${dayInWords(3)}, .* the caution line \\(0\\.02 mg/L NH3\\)\\.$`,
      ),
    );
  });

  it("a journal of water changes alone raises none", async () => {
    const { keeper, tankId, log } = await tankAtPh8();
    await log({ date: day(10), kind: "water_change", water_changed_percent: 30 });
    await log({ date: day(3), kind: "water_change", water_changed_percent: 30 });
    const page = await call(pageLoader, get(`/tanks/${tankId}/journal`, keeper.cookie), { tankId });
    // our own worked example: an established filter at 0.5 g a day in 100 L
    expect(page.data.replay.warnings).toEqual([]);
  });
});
