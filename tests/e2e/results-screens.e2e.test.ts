/**
 * What the results screens show (issue 12): the engine's warnings in plain words where fish
 * could be harmed, the oxygen panel, and screenshots of results, compare, presentation and a
 * phone for a person to look at.
 */
import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { DEMO, expectNoConsoleErrors, newPage, openDemoTank, shot, signIn, useBrowser } from "./support/browser";

useBrowser();

/** Signs in as the demo keeper and opens "Baseline" in Living-room 120; returns the tank page's path. */
async function openBaseline(page: Page): Promise<string> {
  const tank = await openDemoTank(page);
  await page.getByRole("link", { name: "Baseline", exact: true }).first().click();
  await page.getByRole("application").waitFor();
  return tank;
}

/** From that tank's page, "Baseline" and "With floating plants" compared. */
async function openCompare(page: Page, tankUrl: string): Promise<void> {
  await page.goto(tankUrl);
  await page.getByLabel("Compare Baseline", { exact: true }).check();
  await page.getByLabel("Compare With floating plants").check();
  await page.getByRole("button", { name: /Compare the ticked scenarios/ }).click();
  await page.waitForURL(/\/compare\?/);
}

describe("specific warnings where fish can be harmed", () => {
  it("a new tank at pH 8 and 28 °C names free ammonia's peak, its day and how far above the caution line", async () => {
    const page = await newPage();
    await signIn(page, DEMO.teacher, DEMO.password);
    await page.getByRole("link", { name: "Classroom demo tank" }).click();
    await page.getByRole("link", { name: "The same at pH 8 and 28 °C" }).first().click();
    await page.getByRole("application").waitFor();
    const warning = page.locator('[data-warning="freeAmmoniaAboveCaution"]');
    // The free-ammonia caution line, 0.02 mg/L NH3 (common practice, no source).
    await expect
      .poll(() => warning.textContent())
      .toMatch(/^Free ammonia reaches [\d.]+ mg\/L NH3 on day [\d.]+, .+ the caution line \(0\.02 mg\/L NH3\)\.$/);
    await page.getByText("Test the water now and on the days named").waitFor();
    // The card of the figure crossing the caution is flagged.
    expect(await page.locator("[data-flagged]").first().textContent()).toContain("Peak free ammonia");
    await page.locator('[data-panel="oxygen"]').waitFor();
    await shot(page, "results-warnings");
    expectNoConsoleErrors(page);
  });

  it("the chart draws the short-term criterion the warning names and the lower long-term limit, in the plot and the readout", async () => {
    const page = await newPage();
    await signIn(page, DEMO.teacher, DEMO.password);
    await page.getByRole("link", { name: "Classroom demo tank" }).click();
    await page.getByRole("link", { name: "The same at pH 8 and 28 °C" }).first().click();
    await page.getByRole("application").waitFor();
    // US EPA 2013 (docs/sources.md §2): the warning and the line come from the one criterion at
    // the pH of the day (this tank's pH stays put, so every day's value is the warning's).
    const warned = await page.locator('[data-warning="ammoniaAboveAcuteCriterion"]').textContent();
    const limit = /short-term criterion at that day's pH and temperature \(([\d.]+) mg\/L NH3, US EPA 2013\)/.exec(
      warned ?? "",
    );
    expect(limit).not.toBeNull();
    const valueOf = async (name: string) => {
      await page.locator('[data-panel="ammonia"] [data-chart-label]', { hasText: name }).waitFor();
      const row = page.getByRole("row").filter({ has: page.getByRole("rowheader", { name: new RegExp(name) }) });
      return (await row.first().locator("td").first().textContent())?.trim();
    };
    expect(await valueOf("TAN short-term criterion at the pH of the day")).toBe(limit![1]);
    // US EPA 2013 (docs/sources.md §2): the long-term (chronic) limit is drawn too, and is the lower line.
    const longTerm = Number(await valueOf("TAN long-term limit at the pH of the day"));
    expect(longTerm).toBeGreaterThan(0);
    expect(longTerm).toBeLessThan(Number(limit![1]));
    expectNoConsoleErrors(page);
  });

  it("without JavaScript the chart's and the what-if panel's places say why, and link the run's CSV and the settings form", async () => {
    const page = await newPage({ javaScript: false });
    await signIn(page, DEMO.teacher, DEMO.password);
    await page.getByRole("link", { name: "Classroom demo tank" }).click();
    await page.getByRole("link", { name: "The same at pH 8 and 28 °C" }).first().click();
    // The server sends the chart as a stand-in of its size (decision 0012); the script draws it.
    const standIn = page.locator("[data-chart-stand-in]");
    await standIn.waitFor({ state: "attached" });
    // The box kept for the chart is hidden: without scripts the chart never draws.
    expect(await standIn.locator("svg").isVisible()).toBe(false);
    // No controls that would do nothing without the script.
    expect(await page.getByRole("group", { name: "Series shown on the chart" }).count()).toBe(0);
    // Playwright's text locators skip <noscript>, so its elements are found by tag.
    const said = standIn.locator("noscript p");
    expect(await said.textContent()).toMatch(
      /^The chart and its table are drawn by the page’s script, which is off in this browser\. The same numbers are in the run as a CSV file/,
    );
    const link = standIn.locator("noscript a");
    const csv = await page.request.get((await link.getAttribute("href"))!);
    expect(csv.status()).toBe(200);
    expect((await csv.text()).split("\n")[0]).toMatch(
      /^day,tan_mg_n_per_l,free_nh3_mg_n_per_l,nitrite_mg_n_per_l,nitrate_mg_n_per_l,/,
    );
    // The what-if panel's place says the same, and points to the settings form instead.
    const whatIf = page.locator("[data-what-if-stand-in]");
    expect(await whatIf.locator("noscript p").textContent()).toMatch(
      /^Trying a change needs the page’s script, which is off in this browser\. To change the scenario without it, edit its settings\.$/,
    );
    expect(await page.getByRole("slider").count()).toBe(0);
    const edit = await whatIf.locator("noscript a").getAttribute("href");
    expect(edit).toMatch(/^\/tanks\/\d+\/scenarios\/\d+\/edit$/);
    await shot(page, "results-without-scripts");
    await page.goto(edit!);
    await page.getByRole("button", { name: /Save/ }).first().waitFor();
  });

  it("the chart's stand-in keeps its place: nothing below moves when the chart draws", async () => {
    // Found once with scripts on: a results page and a compare page of the demo keeper.
    const finder = await newPage();
    const tankUrl = await openBaseline(finder);
    const results = new URL(finder.url()).pathname;
    await openCompare(finder, tankUrl);
    const compare = new URL(finder.url()).pathname + new URL(finder.url()).search;
    for (const path of [results, compare])
      for (const width of [1280, 390]) {
        const heights: number[] = [];
        for (const drawn of [false, true]) {
          const page = await newPage({ width });
          await page.context().addCookies(await finder.context().cookies());
          // Before the script runs: the page's scripts held back, so the stand-in stays.
          if (!drawn) await page.route(/\/assets\/.*\.js$/, (route) => route.abort());
          await page.goto(path);
          if (drawn) await page.getByRole("application").first().waitFor();
          else await page.locator("[data-chart-stand-in]").first().waitFor();
          heights.push(await page.evaluate(() => document.documentElement.scrollHeight));
        }
        // Under 60 px in a 900 px-high window the layout-shift score stays under 0.1 whatever
        // moves: "good" by the Core Web Vitals' cumulative layout shift (web.dev, from memory).
        expect(Math.abs(heights[1] - heights[0]), `${path} at ${width} px: ${heights.join(" → ")}`).toBeLessThan(60);
      }
  });

  it("the presentation shows the same warnings, large, at 1920×1080", async () => {
    const page = await newPage({ width: 1920 });
    await page.setViewportSize({ width: 1920, height: 1080 });
    await signIn(page, DEMO.teacher, DEMO.password);
    await page.goto("/classes");
    await page.getByRole("link", { name: "Year 9 Biology: the nitrogen cycle" }).first().click();
    await page.getByRole("link", { name: "How a new tank cycles" }).first().click();
    await page.getByRole("link", { name: "Present to the class" }).click();
    await page.getByRole("application").waitFor();
    await page.locator("[data-run-warnings]").waitFor();
    await page.screenshot({ path: "test-results/screenshots/presentation-1920.png" });
    expectNoConsoleErrors(page);
  });
});

describe("anonymous visitors see the product", () => {
  it("the home page links to a live example, the demo club's shared scenario", async () => {
    const page = await newPage();
    await page.goto("/");
    await page.getByRole("link", { name: "See a live example, no account needed" }).click();
    await page.waitForURL(/\/s\//);
    await page.getByRole("heading", { name: "As kept now", level: 1 }).waitFor();
    await page.getByRole("application").waitFor();
    expectNoConsoleErrors(page);
  });
});

describe("results screens for a person to look at", () => {
  it("a keeper's results, compare and a phone at 390 px", async () => {
    const page = await newPage();
    const tankUrl = await openBaseline(page);
    await page.locator('[data-panel="oxygen"]').waitFor();
    await shot(page, "results");

    await openCompare(page, tankUrl);
    await page.getByRole("application").first().waitFor();
    await shot(page, "compare");
    expectNoConsoleErrors(page);

    const phone = await newPage({ width: 390 });
    await openBaseline(phone);
    const overflow = await phone.evaluate(() => document.documentElement.scrollWidth > window.innerWidth + 1);
    expect(overflow).toBe(false);
    await shot(phone, "results-phone-390");
    expectNoConsoleErrors(phone);
  });
});
