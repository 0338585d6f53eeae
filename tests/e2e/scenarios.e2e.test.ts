import fs from "node:fs";
import { describe, expect, it } from "vitest";
import {
  expectNoConsoleErrors,
  newPage,
  shot,
  signIn,
  uniqueEmail,
  useBrowser,
  type PageWithErrors,
  signUp as signUpThroughMail,
} from "./support/browser";

useBrowser();

async function signUp(page: PageWithErrors, email: string) {
  await signUpThroughMail(page, "Chart Keeper", email, "nitrate band keeper");
  await page.waitForURL("**/tanks");
}

/** Reads "Nitrate at the end" for each scenario column of the compare page's key-figure table. */
async function nitrateAtEndByScenario(page: PageWithErrors): Promise<Record<string, number>> {
  return page.evaluate(() => {
    const table = [...document.querySelectorAll("table")].find((t) => t.caption?.textContent?.includes("Key figures"))!;
    const names = [...table.querySelectorAll("thead th")].slice(1).map((th) => th.childNodes[0].textContent!.trim());
    const row = [...table.querySelectorAll("tbody tr")].find((tr) =>
      tr.querySelector("th")!.textContent!.startsWith("Nitrate at the end"),
    )!;
    const cells = [...row.querySelectorAll("td")].map((td) => Number(td.textContent!.replace(/[^\d.]/g, "")));
    return Object.fromEntries(names.map((n, i) => [n, cells[i]]));
  });
}

describe("a keeper's tank in the browser", () => {
  it("creates a tank and two scenarios, compares them, moves the cursor and downloads the CSV", async () => {
    const page = await newPage();
    await signUp(page, uniqueEmail("charts"));

    await page.getByLabel("Name").fill("Study tank");
    await page.getByRole("button", { name: "Add tank" }).click();
    await page.waitForURL(/\/tanks\/\d+$/);
    const tankUrl = page.url();

    // Scenario 1: no plants.
    await page.getByRole("link", { name: "New scenario" }).click();
    await page.waitForURL("**/scenarios/new");
    await page.locator("#f-name").fill("No plants");
    await page.getByText("Plants", { exact: true }).click();
    await page.getByRole("button", { name: /^Remove / }).click();
    await page.getByText("No plant groups").waitFor();
    await shot(page, "setup-no-plants");
    await page.getByRole("button", { name: "Save and run" }).click();
    await page.waitForURL(/\/scenarios\/\d+$/);
    await page.getByRole("application").waitFor();
    await page.getByRole("heading", { name: "Nitrogen budget" }).waitFor();
    await page.getByText("Where the nitrogen went").waitFor();
    await shot(page, "results-no-plants");

    // The day cursor moves with the keyboard.
    const chart = page.getByRole("application");
    await chart.focus();
    await page.keyboard.press("Home");
    await page
      .getByText(/^day 0\b/)
      .first()
      .waitFor();
    await page.keyboard.press("ArrowRight");
    await page
      .getByText(/^day 1\b/)
      .first()
      .waitFor();
    await page.keyboard.press("End");
    await page
      .getByText(/^day 180\b/)
      .first()
      .waitFor();

    // CSV download, made in the browser.
    const download = page.waitForEvent("download");
    await page.getByRole("button", { name: "Download the series as a CSV file" }).click();
    const file = await (await download).path();
    const csv = fs.readFileSync(file!, "utf8");
    // A byte-order mark first, so spreadsheet programs read the file as UTF-8.
    expect(csv.replace(/^\uFEFF/, "").split(/\r?\n/)[0]).toMatch(/^day,/);
    expect(csv).toMatch(/NO3/);

    // Scenario 2: the default stem plants plus a floating group.
    await page.goto(tankUrl);
    await page.getByRole("link", { name: "New scenario" }).click();
    await page.locator("#f-name").fill("Floating plants");
    await page.getByText("Plants", { exact: true }).click();
    await page.getByLabel("Growth form of the new group").selectOption("floating");
    await page.getByRole("button", { name: "Add a plant group" }).click();
    await expect.poll(() => page.locator("fieldset[data-plant-row]").count()).toBe(2);
    await shot(page, "setup-floating");
    await page.getByRole("button", { name: "Save and run" }).click();
    await page.waitForURL(/\/scenarios\/\d+$/);
    await page.getByRole("application").waitFor();

    // Compare: the planted scenario ends with less nitrate.
    await page.goto(tankUrl);
    await page.getByLabel("Compare No plants").check();
    await page.getByLabel("Compare Floating plants").check();
    await page.getByRole("button", { name: /Compare the ticked scenarios/ }).click();
    await page.waitForURL(/\/compare\?/);
    await page.getByRole("application").waitFor();
    const nitrate = await nitrateAtEndByScenario(page);
    // Common practice, no source: growing plants take up nitrogen that would otherwise end as nitrate.
    expect(nitrate["Floating plants"]).toBeLessThan(nitrate["No plants"]);
    await shot(page, "compare");
    expectNoConsoleErrors(page);
  });

  it("shows a field error for a negative volume and keeps the input", async () => {
    const page = await newPage();
    await signUp(page, uniqueEmail("negative"));
    await page.getByLabel("Name").fill("Typo tank");
    await page.getByRole("button", { name: "Add tank" }).click();
    await page.waitForURL(/\/tanks\/\d+$/);
    await page.getByRole("link", { name: "New scenario" }).click();
    await page.getByLabel("Water volume").fill("-5");
    await page.getByRole("button", { name: "Save and run" }).click();
    await page.getByText("Water volume must be at least 1 L.").waitFor();
    await expect.poll(() => page.getByLabel("Water volume").inputValue()).toBe("-5");
    await expect.poll(() => page.getByLabel("Water volume").getAttribute("aria-invalid")).toBe("true");
    expect(new URL(page.url()).pathname).toMatch(/\/scenarios\/new$/);
    await shot(page, "setup-error");
    expectNoConsoleErrors(page);
  });

  it("opens a demo keeper's results on a phone", async () => {
    const page = await newPage({ width: 375 });
    await signIn(page, "jonah@tidewell.example", "tidewell-demo-2026");
    await page.getByRole("link", { name: "Living-room 120" }).click();
    await page.getByRole("link", { name: "Baseline" }).click();
    await page.getByRole("application").waitFor();
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth > window.innerWidth + 1);
    expect(overflow).toBe(false);
    await shot(page, "results-phone");
  });
});
