/**
 * The chart shows the danger (issue 12, item 5): stacked panels on one time axis and one day
 * cursor, the toxic species on their own scale, no two labels over each other, text large enough
 * to read — on results, compare (with the plants' panel when there are plants), share and the presentation, for a new tank at pH 8 and 28 °C
 * whose new filter lets ammonia peak high.
 */
import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import {
  DEMO,
  expectNoConsoleErrors,
  newPage,
  openDemoTank,
  signIn,
  useBrowser,
  type PageWithErrors,
} from "./support/browser";

useBrowser();

const TANK = "Classroom demo tank";
const HIGH_PEAK = "The same at pH 8 and 28 °C";

type ChartFacts = {
  texts: number;
  overlaps: string[];
  smallest: { size: number; text: string };
  panels: string[];
  yMax: Record<string, number>;
};

/** Reads every text of the first chart on the page from its bounding boxes. */
async function chartFacts(page: Page): Promise<ChartFacts> {
  await page.locator('[role="application"] svg [data-panel]').first().waitFor();
  return page.evaluate(() => {
    const svg = document.querySelector('[role="application"] svg')!;
    const texts = [...svg.querySelectorAll("text")].filter((t) => (t.textContent ?? "").trim() !== "");
    const boxes = texts.map((t) => ({ text: t.textContent!.trim(), r: t.getBoundingClientRect() }));
    const overlaps: string[] = [];
    // Half a pixel of slack for anti-aliased edges.
    for (let a = 0; a < boxes.length; a++)
      for (let b = a + 1; b < boxes.length; b++) {
        const p = boxes[a].r;
        const q = boxes[b].r;
        if (p.left < q.right - 0.5 && q.left < p.right - 0.5 && p.top < q.bottom - 0.5 && q.top < p.bottom - 0.5)
          overlaps.push(`"${boxes[a].text}" over "${boxes[b].text}"`);
      }
    let smallest = { size: Infinity, text: "" };
    for (const t of texts) {
      const size = parseFloat(getComputedStyle(t).fontSize);
      if (size < smallest.size) smallest = { size, text: t.textContent!.trim() };
    }
    const panels = [...svg.querySelectorAll("[data-panel]")].map((p) => p.getAttribute("data-panel")!);
    const yMax: Record<string, number> = {};
    for (const name of panels) {
      const ticks = [...svg.querySelectorAll(`[data-panel="${name}"] [data-y-tick]`)].map((t) =>
        Number(t.getAttribute("data-y-tick")),
      );
      yMax[name] = Math.max(...ticks);
    }
    return { texts: texts.length, overlaps, smallest, panels, yMax };
  });
}

/** x of the cursor line on every panel. */
async function cursorXs(page: Page): Promise<number[]> {
  return page.evaluate(() =>
    [...document.querySelectorAll('[role="application"] svg')[0].querySelectorAll("[data-cursor-line]")].map((l) =>
      Number(l.getAttribute("x1")),
    ),
  );
}

/** Moves the pointer over one panel and checks the cursor followed on every panel. */
async function cursorMovesTogether(page: Page, panel: string): Promise<void> {
  const before = await cursorXs(page);
  expect(before.length).toBeGreaterThanOrEqual(2);
  const box = await page.locator(`[role="application"] svg [data-panel="${panel}"]`).first().boundingBox();
  if (!box) throw new Error(`no ${panel} panel`);
  await page.mouse.move(box.x + box.width * 0.3, box.y + box.height / 2);
  await expect.poll(async () => (await cursorXs(page))[0]).not.toBe(before[0]);
  const after = await cursorXs(page);
  expect(new Set(after).size).toBe(1);
  // And by keyboard: Home takes every panel's cursor to day 0.
  await page.locator('[role="application"]').first().focus();
  await page.keyboard.press("Home");
  await expect.poll(async () => new Set(await cursorXs(page))).toEqual(new Set([0]));
}

async function checkChart(page: PageWithErrors, minFont: number, name: string): Promise<void> {
  const facts = await chartFacts(page);
  await page.screenshot({ path: `test-results/screenshots/panels-${name}.png`, fullPage: name !== "presentation" });
  await page
    .locator('[role="application"]')
    .first()
    .screenshot({ path: `test-results/screenshots/panels-${name}-chart.png` });
  expect(facts.texts).toBeGreaterThan(10);
  expect(facts.overlaps).toEqual([]);
  // At least 11 px on a page, 18 px on a projected screen: common practice, no source.
  expect(facts.smallest.size).toBeGreaterThanOrEqual(minFont);
  expect(facts.panels.slice(0, 2)).toEqual(
    name === "compare" ? ["compare-tan", "compare-no3"] : ["ammonia", "nitrite"],
  );
  const toxic = facts.panels[0];
  const nitrate = name === "compare" ? "compare-no3" : "nitrate";
  // Ammonia on its own scale: a peak of a few mg/L is not drawn under tens of mg/L of nitrate.
  expect(facts.yMax[toxic]).toBeLessThan(facts.yMax[nitrate] / 3);
  await cursorMovesTogether(page, toxic);
  expectNoConsoleErrors(page);
}

describe("stacked chart panels", () => {
  it("results, compare and share: own scales, no overlapping labels, text ≥ 11 px, one cursor", async () => {
    const page = await newPage({ width: 1280 });
    await signIn(page, DEMO.teacher, DEMO.password);
    await page.getByRole("link", { name: TANK }).click();
    await page.waitForURL(/\/tanks\/\d+$/);
    const tankUrl = page.url();
    await page.getByRole("link", { name: HIGH_PEAK }).first().click();
    await page.getByRole("application").waitFor();
    const resultsUrl = page.url();
    await checkChart(page, 11, "results");

    await page.goto(tankUrl);
    await page.getByLabel("Compare A new tank cycling without fish", { exact: true }).check();
    await page.getByLabel(`Compare ${HIGH_PEAK}`, { exact: true }).check();
    await page.getByRole("button", { name: /Compare the ticked scenarios/ }).click();
    await page.waitForURL(/\/compare\?/);
    await page.getByLabel("Show", { exact: true }).selectOption("tan");
    await page.getByRole("button", { name: "Compare", exact: true }).click();
    await page.waitForURL(/species=tan/);
    await checkChart(page, 11, "compare");

    await page.goto(resultsUrl);
    await page.getByRole("link", { name: "Share" }).click();
    await page.getByRole("button", { name: /Turn on a public link|Make a new link/ }).click();
    const url = await page.getByLabel("Your public link").inputValue();
    const visitor = await newPage({ width: 1280 });
    await visitor.goto(url);
    await visitor.getByRole("application").waitFor();
    await checkChart(visitor, 11, "share");

    const phone = await newPage({ width: 390 });
    await phone.goto(url);
    await phone.getByRole("application").waitFor();
    const facts = await chartFacts(phone);
    await phone.screenshot({ path: "test-results/screenshots/panels-share-phone.png", fullPage: true });
    expect(facts.overlaps).toEqual([]);
    expect(facts.smallest.size).toBeGreaterThanOrEqual(11);
    expectNoConsoleErrors(phone);

    // The link is turned off again, so the demo data stay as other tests expect.
    await page.getByRole("button", { name: "Turn the link off" }).click();
    await expect.poll(() => page.getByRole("button", { name: "Turn on a public link" }).count()).toBe(1);
  });

  it("compare with plants: plant mass on a third panel under nitrate, same axis and cursor, no overlaps, text ≥ 11 px", async () => {
    const page = await newPage({ width: 1280 });
    await openDemoTank(page);
    await page.getByLabel("Compare Baseline", { exact: true }).check();
    await page.getByLabel("Compare With floating plants", { exact: true }).check();
    await page.getByRole("button", { name: /Compare the ticked scenarios/ }).click();
    await page.waitForURL(/\/compare\?/);
    for (const [species, panels] of [
      ["no3", ["compare-no3", "compare-plants"]],
      ["tan", ["compare-tan", "compare-no3", "compare-plants"]],
    ] as const) {
      await page.getByLabel("Show", { exact: true }).selectOption(species);
      await page.getByRole("button", { name: "Compare", exact: true }).click();
      await page.waitForURL(new RegExp(`species=${species}`));
      await page.locator('[role="application"] svg [data-panel="compare-plants"]').waitFor();
      const facts = await chartFacts(page);
      await page
        .locator('[role="application"]')
        .first()
        .screenshot({ path: `test-results/screenshots/panels-compare-plants-${species}-chart.png` });
      expect(facts.panels).toEqual(panels);
      expect(facts.overlaps).toEqual([]);
      // At least 11 px on a page: common practice, no source.
      expect(facts.smallest.size).toBeGreaterThanOrEqual(11);
      expect((await cursorXs(page)).length).toBe(panels.length);
      await cursorMovesTogether(page, "compare-plants");
    }
    expectNoConsoleErrors(page);
  });

  it("the presentation at 1920×1080: the chart fills the screen's width and its text is at least 18 px", async () => {
    const page = await newPage({ width: 1920 });
    await page.setViewportSize({ width: 1920, height: 1080 });
    await signIn(page, DEMO.teacher, DEMO.password);
    await page.goto("/classes");
    await page.getByRole("link", { name: "Year 9 Biology: the nitrogen cycle" }).first().click();
    await page.getByRole("link", { name: "How a new tank cycles" }).first().click();
    await page.getByRole("link", { name: "Present to the class" }).click();
    await page.getByRole("application").waitFor();
    await page.locator('[role="application"]').scrollIntoViewIfNeeded();
    await checkChart(page, 18, "presentation");
    // On a projector the chart (with its day readout beside it) takes the screen's width, not
    // the other pages' reading width of 1152 px: well over 1152 px of chart on its own.
    const chart = (await page.locator('[role="application"] svg').first().boundingBox())!;
    expect(chart.width).toBeGreaterThan(1500);
    expect(chart.x + chart.width).toBeGreaterThan(1920 * 0.75);
  });
});
