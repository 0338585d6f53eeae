import { describe, expect, it } from "vitest";
import { expectNoConsoleErrors, newPage, openDemoTank, shot, useBrowser } from "./support/browser";

useBrowser();

const DAY = 86_400_000;
const isoDay = (daysAgo: number) =>
  new Date(Math.floor(Date.now() / DAY) * DAY - daysAgo * DAY).toISOString().slice(0, 10);

describe("the tank journal in the browser", () => {
  it("logs a 50 % water change and the 'as it happened' curve follows it, with a forecast", async () => {
    const page = await newPage();
    await openDemoTank(page);
    await page.getByRole("link", { name: "Journal" }).click();
    await page.waitForURL(/\/journal$/);
    // The nitrate panel's curve, as the chart draws it once the page has loaded.
    const nitrate = page.locator('[role="application"] svg [data-panel="nitrate"] path');
    await nitrate.first().waitFor();
    const curve = () => nitrate.evaluateAll((paths) => paths.map((p) => p.getAttribute("d")).join(" "));
    const before = await curve();
    // The chart of a results page: TAN (with its caution lines), nitrite and nitrate panels.
    const panels = await page
      .locator('[role="application"] svg [data-panel]')
      .evaluateAll((gs) => gs.map((g) => g.getAttribute("data-panel")));
    expect(panels).toEqual(expect.arrayContaining(["ammonia", "nitrite", "nitrate"]));
    await expect(page.getByTestId("forecast").textContent()).resolves.toMatch(/model, not a water test/);

    await page.getByLabel("Date").fill(isoDay(2));
    await page.getByLabel("Water changed, %").fill("50");
    await page.getByRole("button", { name: "Add to the journal" }).click();
    await page.getByText("Water change added to the journal.").waitFor();
    // "Added" is said once the page shows the entry, not while the page is still being read again.
    expect(await page.getByRole("cell", { name: "50 % changed" }).count()).toBeGreaterThan(0);
    await expect.poll(curve).not.toBe(before);
    await shot(page, "journal-after-water-change");
    expectNoConsoleErrors(page);
  });
});

describe("whole downloads, written on the chores thread", () => {
  it("the journal, the readings and the journal's replay download whole as CSV", async () => {
    const page = await newPage();
    const tank = await openDemoTank(page);
    const text = async (path: string) => {
      const answer = await page.request.get(path);
      expect(answer.status()).toBe(200);
      expect(answer.headers()["content-type"]).toMatch(/^text\/csv/);
      return (await answer.text())
        .replace(/^\uFEFF/, "")
        .trimEnd()
        .split(/\r?\n/);
    };
    // Every entry and every reading the API lists is a row of its file, in the same order.
    const entries = (await (await page.request.get(`/api${tank}/journal`)).json()) as {
      entries: { kind: string }[];
    };
    const journal = await text(`${tank}/journal/export`);
    expect(journal[0]).toMatch(/^date,kind,/);
    expect(journal.slice(1).map((line) => line.split(",")[1])).toEqual(entries.entries.map((e) => e.kind));
    const readings = (await (await page.request.get(`/api${tank}/readings`)).json()) as { readings: unknown[] };
    const readingsCsv = await text(`${tank}/readings/export`);
    expect(readingsCsv.length - 1).toBe(readings.readings.length);
    // The replay: one row per sample from its first day, in the chart's columns.
    const replay = await text(`${tank}/journal/replay.csv`);
    expect(replay[0]).toMatch(/^day,Total ammonia \(TAN\) \(mg\/L NH3\),/);
    expect(replay.length).toBeGreaterThan(100);
    // Each row: its day, then the species' numbers (the events column may hold quoted words).
    expect(replay.slice(1).filter((line) => !/^\d+(\.\d+)?,[\d.e+-]+,[\d.e+-]+,/.test(line))).toEqual([]);
    expect(Number(replay[1].split(",")[0])).toBe(0);
  });
});

describe("the journal on a phone", () => {
  it("draws the 'as it happened' chart with labels as large as on a desktop", async () => {
    const page = await newPage({ width: 390 });
    await openDemoTank(page);
    await page.getByRole("link", { name: "Journal" }).click();
    await page.waitForURL(/\/journal$/);
    const chart = page.getByRole("img", { name: /nitrogen as it happened/ });
    await chart.locator("[data-panel]").first().waitFor();
    // The axis numbers as drawn, in CSS px: at least 10 px to read (common practice, no source).
    const sizes = () =>
      chart.locator("text").evaluateAll((labels) =>
        labels.map((label) => {
          const svg = (label as SVGTextElement).ownerSVGElement!;
          const scale = svg.getBoundingClientRect().width / svg.viewBox.baseVal.width;
          return Number(label.getAttribute("font-size")) * scale;
        }),
      );
    await expect.poll(async () => Math.min(...(await sizes()))).toBeGreaterThanOrEqual(10);
    await shot(page, "journal-phone");
    expectNoConsoleErrors(page);
  });
});

describe("the maintenance plan in the browser", () => {
  it("marks a planned water change done on the tank page, edited before saving, and finds it in the journal", async () => {
    const page = await newPage();
    await openDemoTank(page);
    const task = page.getByRole("listitem").filter({ hasText: "Water change (" }).first();
    await task.getByText("Mark done").click();
    // Filled from the plan; the keeper changed a little more than planned today.
    await expect(task.getByLabel("Water changed, %").inputValue()).resolves.toMatch(/^\d+$/);
    await task.getByLabel("Water changed, %").fill("35");
    await shot(page, "tank-page-mark-done");
    await task.getByRole("button", { name: "Add to the journal" }).click();
    await page.getByText("Added to the journal.").waitFor();
    await page.getByRole("link", { name: "Journal" }).click();
    await page.waitForURL(/\/journal$/);
    const row = page.getByRole("row").filter({ hasText: "35 % changed" }).first();
    await expect(row.textContent()).resolves.toContain(new Date().toISOString().slice(0, 10));
    expectNoConsoleErrors(page);
  });
});
