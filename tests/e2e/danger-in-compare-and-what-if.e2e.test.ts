/**
 * The danger shows wherever a run is shown (issue 12): the compare page flags the toxic peaks
 * above their caution lines and says each scenario's warnings; the what-if answer flags them
 * and words them, for the saved run and while a slider moves; the journal's replay says what it
 * crossed above its nitrate-only curve.
 */
import { describe, expect, it } from "vitest";
import { DEMO, expectNoConsoleErrors, newPage, shot, signIn, useBrowser } from "./support/browser";

useBrowser();

const TANK = "Classroom demo tank";
const HIGH_PEAK = "The same at pH 8 and 28 °C";
// The free-ammonia caution line, 0.02 mg/L NH3 (common practice, no source).
const FREE_NH3_WORDS = /Free ammonia reaches [\d.]+ mg\/L NH3 on day [\d.]+, .+ the caution line \(0\.02 mg\/L NH3\)\./;

describe("the danger beyond the results page", () => {
  it("compare names each scenario's warnings and flags its peaks", async () => {
    const page = await newPage({ width: 1280 });
    await signIn(page, DEMO.teacher, DEMO.password);
    await page.getByRole("link", { name: TANK }).click();
    await page.waitForURL(/\/tanks\/\d+$/);
    // The tank page's scenario table flags the same peaks, where a scenario is chosen to open or compare.
    const pH8Row = page.getByRole("row").filter({ hasText: HIGH_PEAK });
    await expect.poll(() => pH8Row.locator("[data-above-caution]").count()).toBe(2);
    await page.getByLabel("Compare A new tank cycling without fish", { exact: true }).check();
    await page.getByLabel(`Compare ${HIGH_PEAK}`, { exact: true }).check();
    await page.getByRole("button", { name: /Compare the ticked scenarios/ }).click();
    await page.waitForURL(/\/compare\?/);
    const box = page.locator("[data-compare-warnings]").filter({ hasText: HIGH_PEAK });
    await expect.poll(() => box.textContent()).toMatch(FREE_NH3_WORDS);
    await page.getByText("Test the water now and on the days named").waitFor();
    const flagged = page.locator("td[data-flagged]");
    expect(await flagged.count()).toBeGreaterThan(0);
    expect(await flagged.first().textContent()).toContain("above the caution line");
    // A flagged peak reads in the flag's colour in every column, also where it differs from the
    // baseline (a marked difference had turned it back to plain text there): common practice, no source.
    const numberColours = await flagged.evaluateAll((cells) =>
      cells.map((cell) => {
        const walker = document.createTreeWalker(cell, NodeFilter.SHOW_TEXT);
        for (let n = walker.nextNode(); n; n = walker.nextNode())
          if (/\d/.test(n.textContent ?? "")) return getComputedStyle(n.parentElement!).color;
        return null;
      }),
    );
    expect(numberColours.length).toBeGreaterThan(1);
    const flagColour = await flagged.first().evaluate((cell) => getComputedStyle(cell).color);
    expect(new Set(numberColours)).toEqual(new Set([flagColour]));
    await shot(page, "compare-warnings");
    expectNoConsoleErrors(page);
  });

  it("the what-if answer flags and words the danger, saved and previewed", async () => {
    const page = await newPage({ width: 1280 });
    await signIn(page, DEMO.teacher, DEMO.password);
    await page.getByRole("link", { name: TANK }).click();
    await page.getByRole("link", { name: HIGH_PEAK }).first().click();
    await page.getByRole("application").waitFor();
    const summary = page.locator("[data-what-if-summary]");
    await expect.poll(() => summary.textContent()).toMatch(/Peak free ammonia — above the caution line/);
    expect(await summary.textContent()).toMatch(/Peak nitrite/);
    expect(await summary.locator("[data-what-if-warnings]").textContent()).toMatch(FREE_NH3_WORDS);

    // Move a lever: the preview's own warnings replace the saved run's.
    const change = page.locator("#what-if-waterChangeFraction");
    await change.focus();
    await page.keyboard.press("ArrowRight");
    await expect.poll(() => summary.textContent(), { timeout: 15_000 }).toMatch(/against the saved run/);
    await expect.poll(() => summary.locator("[data-what-if-warnings]").textContent()).toMatch(FREE_NH3_WORDS);
    await shot(page, "what-if-warnings");
    expectNoConsoleErrors(page);
  });

  it("the journal's replay names what it crossed", async () => {
    const page = await newPage({ width: 1280 });
    await signIn(page, DEMO.teacher, DEMO.password);
    await page.getByRole("link", { name: TANK }).click();
    await page.waitForURL(/\/tanks\/\d+$/);
    await page.getByRole("link", { name: "Journal" }).click();
    await page.waitForURL(/\/journal$/);
    const DAY = 86_400_000;
    const twentyDaysAgo = new Date(Math.floor(Date.now() / DAY) * DAY - 20 * DAY).toISOString().slice(0, 10);
    await page.getByLabel("Date").fill(twentyDaysAgo);
    await page.getByLabel("What was done").selectOption({ label: "Ammonia dosed" });
    await page.getByLabel(/^Ammonia dosed, mg\/L/).fill("2");
    await page.getByRole("button", { name: "Add to the journal" }).click();
    await page.getByText(/added to the journal/).waitFor();
    // The pH 8 scenario describes the tank: at pH 8 and 28 °C the dose is far above the line.
    await page.getByLabel("Scenario that describes this tank").selectOption({ label: HIGH_PEAK });
    await page.getByRole("button", { name: "Show", exact: true }).click();
    await page.waitForURL(/scenario=\d+/);
    const box = page.locator("[data-replay-warnings]");
    // Once failed in CI only (the box never showed); if it does again, say what the page said instead.
    await box.waitFor({ timeout: 15_000 }).catch(async (error) => {
      throw new Error(`No replay warnings; the page says: ${(await page.locator("main").innerText()).slice(0, 1500)}`, {
        cause: error,
      });
    });
    // Dated with the day it was: the dose's day, twenty days ago.
    const doseDay = new Date(Date.parse(twentyDaysAgo)).toLocaleDateString("en-GB", {
      day: "numeric",
      month: "long",
      timeZone: "UTC",
    });
    await expect
      .poll(() => box.textContent())
      .toMatch(new RegExp(`Free ammonia reaches [\\d.]+ mg/L NH3 on ${doseDay}`));
    await shot(page, "journal-replay-warnings");
    expectNoConsoleErrors(page);
  });
});
