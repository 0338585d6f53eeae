import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
import {
  expectNoConsoleErrors,
  newPage,
  shot,
  uniqueEmail,
  useBrowser,
  type PageWithErrors,
  signUp as signUpThroughMail,
} from "./support/browser";

useBrowser();

const DAY = 86_400_000;
const isoDay = (daysAgo: number) =>
  new Date(Math.floor(Date.now() / DAY) * DAY - daysAgo * DAY).toISOString().slice(0, 10);

async function signUp(page: PageWithErrors, email: string) {
  await signUpThroughMail(page, "Readings Keeper", email, "readings and sweeps");
  await page.waitForURL("**/tanks");
}

async function uploadCsv(page: PageWithErrors, tankUrl: string, text: string) {
  await page.goto(`${tankUrl}/readings/upload`);
  const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), "fernwater-upload-")), "readings.csv");
  fs.writeFileSync(file, text);
  await page.setInputFiles("#readings-file", file);
  await page.getByRole("button", { name: "Upload and check" }).click();
  await page.waitForLoadState("networkidle");
  fs.rmSync(path.dirname(file), { recursive: true, force: true });
}

describe("readings, calibration and sweeps in the browser", () => {
  it("uploads the template (a bad row first), draws the readings, calibrates, and sweeps 20 points with progress", async () => {
    const page = await newPage();
    await signUp(page, uniqueEmail("readings"));
    await page.getByLabel("Name").fill("Readings tank");
    await page.getByRole("button", { name: "Add tank" }).click();
    await page.waitForURL(/\/tanks\/\d+$/);
    const tankUrl = new URL(page.url()).pathname;

    // A scenario whose day 0 is ten days ago, so the template's example rows (7, 4 and 1 days ago) fall in its run.
    await page.getByRole("link", { name: "New scenario" }).click();
    await page.locator("#f-name").fill("Checked");
    await page.locator("#section-run summary").click();
    await page.locator("#f-run-lengthDays").fill("60");
    await page.getByLabel("Run starts on").fill(isoDay(10));
    await page.getByRole("button", { name: "Save and run" }).click();
    await page.waitForURL(/\/scenarios\/\d+$/);
    const scenarioUrl = new URL(page.url()).pathname;

    // The template, in this keeper's units, with a bad row added.
    await page.goto(`${tankUrl}/readings`);
    const download = page.waitForEvent("download");
    await page.getByRole("link", { name: "Download the template" }).click();
    const template = fs.readFileSync((await (await download).path())!, "utf8");
    const lines = template
      .replace(/^\uFEFF/, "")
      .trimEnd()
      .split("\r\n");
    expect(lines[0]).toBe("datetime,tan_nh3_mg_l,nitrite_no2_mg_l,nitrate_no3_mg_l,ph,kh_dkh,temperature_c,note");
    expect(lines).toHaveLength(4);
    const extra = `${isoDay(2)}T19:00,0,0,twenty,7.2,5,25,evening`;
    await uploadCsv(page, tankUrl, [...lines, extra].join("\r\n"));
    await page.getByText("Nothing was stored: one row needs attention.").waitFor();
    await page.getByText(/Line 5/).waitFor();
    await page.getByText(/Nitrate must be a number.*“twenty”/).waitFor();
    await shot(page, "readings-upload-refused");
    await page.goto(`${tankUrl}/readings`);
    await page.getByRole("heading", { name: "No readings yet" }).waitFor();

    await uploadCsv(page, tankUrl, [...lines, extra.replace("twenty", "20")].join("\r\n"));
    await page.getByText("Stored 4 readings.").waitFor();
    await page.goto(`${tankUrl}/readings`);
    await page.getByRole("heading", { name: "4 readings" }).waitFor();
    await shot(page, "readings-table");

    // The points on the results chart, with the residual at the cursor.
    await page.goto(scenarioUrl);
    await page.getByRole("application").waitFor();
    await page.getByText("4 test readings are drawn as points over the curves.").waitFor();
    const points = page.locator("svg title").filter({ hasText: /NO3 reading, day \d/ });
    await expect.poll(() => points.count()).toBe(4);
    await shot(page, "readings-on-chart");

    // Calibrate against them: the page first says which multipliers these readings can tell
    // and pre-ticks only those, and asks how each species was tested.
    await page.getByRole("link", { name: "Calibrate against them" }).click();
    await page.waitForURL(/\/calibrate$/);
    await page.getByText(/4\s+of the tank’s 4 readings fall within it/).waitFor();
    const notes = page.locator("[data-assessment]");
    await expect.poll(() => notes.count()).toBe(3);
    for (const key of ["feedLoad", "plantUptake", "nitrifierCapacity"]) {
      const row = page.locator(`[data-multiplier-choice="${key}"]`);
      const determinable = (await row.locator("[data-assessment]").getAttribute("data-assessment")) === "determinable";
      expect(await row.locator('input[type="checkbox"]').isChecked(), key).toBe(determinable);
    }
    // Four readings over a week cannot tell the filter's capacity: said plainly, with what would help.
    const filter = page.locator('[data-multiplier-choice="nitrifierCapacity"] [data-assessment]');
    expect(await filter.getAttribute("data-assessment")).toBe("undetermined");
    await expect.poll(() => filter.textContent()).toMatch(/cannot tell this one.*test ammonia and nitrite/i);
    // The nitrate readings' values suggest a kit; say it was a colour card instead.
    const nitrateKit = page.getByLabel("Nitrate: how you tested");
    await expect.poll(() => page.locator('[data-kit="no3"]').textContent()).toMatch(/Your readings’ values suggest/);
    await nitrateKit.selectOption("card");
    await shot(page, "calibration-setup");
    await page.getByLabel(/Feed load/).check();
    await page.getByLabel(/Plant uptake/).uncheck();
    await page.getByLabel(/Filter capacity/).check();
    await page.getByRole("button", { name: "Fit to 4 readings" }).click();
    await page.getByRole("heading", { name: "The fit" }).waitFor({ timeout: 30_000 });
    const fitted = page.locator('tr[data-multiplier="feedLoad"] td').nth(1);
    await expect.poll(() => fitted.textContent()).toMatch(/^×\d+(\.\d+)?/);
    // What the person reads is what the engine reported: verdicts, reasons and the kit used.
    const jobId = new URL(page.url()).searchParams.get("job")!;
    const job = (await (await page.request.get(`${new URL(page.url()).origin}/api/jobs/${jobId}`)).json()) as {
      job: {
        result: {
          multipliers: { key: string; fitted: boolean; determined: boolean | null; suggestion: string | null }[];
          fitQuality: { good: boolean; text: string | null };
        };
      };
    };
    for (const m of job.job.result.multipliers.filter((x) => x.fitted)) {
      const verdict = page.locator(`[data-verdict-of="${m.key}"]`);
      await expect.poll(() => verdict.textContent()).toMatch(m.determined ? /is determined/ : /is not determined/);
      // Undetermined: its own suggestion, or — with no good fit — the one message above the verdicts.
      if (!m.determined && m.suggestion) expect(await verdict.textContent()).toContain(m.suggestion.slice(0, 40));
      expect(await page.locator(`tr[data-multiplier="${m.key}"] [data-verdict]`).getAttribute("data-verdict")).toBe(
        m.determined ? "determined" : "undetermined",
      );
    }
    expect(job.job.result.multipliers.find((m) => m.key === "nitrifierCapacity")!.determined).toBe(false);
    // When the model cannot follow the template's four readings, the page says so as the API does.
    const quality = job.job.result.fitQuality;
    expect(await page.locator('[data-fit-quality="poor"]').count()).toBe(quality.good ? 0 : 1);
    if (!quality.good) expect(await page.locator('[data-fit-quality="poor"]').textContent()).toBe(quality.text);
    await expect.poll(() => page.getByText(/Nitrate colour card 0, 5, 10, 20, 40, 80, 160/).count()).toBeGreaterThan(0);
    // Saving is offered only for a fit that follows the readings; after "no good fit" the page says why not.
    const saveButton = page.getByRole("button", { name: "Save the fitted multipliers as a new scenario" });
    if (quality.good) await saveButton.waitFor();
    else {
      await expect.poll(() => page.locator("[data-no-save]").textContent()).toMatch(/not trustworthy/);
      expect(await saveButton.count()).toBe(0);
    }
    await shot(page, "calibration-fit");
    // "Change the start date" lands on the date field itself, not inside a closed section of the form.
    await page.getByRole("link", { name: "Change the start date" }).click();
    await page.waitForURL(/\/edit/);
    await page.getByLabel("Run starts on").waitFor({ state: "visible" });

    // Once the tank has a journal, the check before a fit runs on what the fit runs on (the
    // journal, its default) and runs again on the schedule the keeper switches to.
    const logged = await page.request.post(`${new URL(page.url()).origin}/api${tankUrl}/journal`, {
      data: { date: isoDay(9), kind: "note", note: "started logging" },
    });
    expect(logged.status()).toBe(201);
    await page.goto(`${scenarioUrl}/calibrate`);
    await page.getByText("What your readings can tell, checked against the tank's journal, as it happened.").waitFor();
    await page.getByLabel(/The scenario’s periodic schedule/).check();
    await page.waitForURL(/calibrate\?schedule=periodic$/);
    await page.getByText("What your readings can tell, checked against the scenario's periodic schedule.").waitFor();
    expect(await page.getByLabel(/The scenario’s periodic schedule/).isChecked()).toBe(true);
    // Without scripts the choice re-checks too, through a button that asks the page again.
    const noScript = await newPage({ javaScript: false });
    await noScript.context().addCookies(await page.context().cookies());
    await noScript.goto(`${scenarioUrl}/calibrate`);
    await noScript.getByText("checked against the tank's journal, as it happened.").waitFor();
    await noScript.getByLabel(/The scenario’s periodic schedule/).check();
    await noScript.getByRole("button", { name: "Check the readings against this choice" }).click();
    await noScript.waitForURL(/calibrate\?.*schedule=periodic/);
    await noScript.getByText("checked against the scenario's periodic schedule.").waitFor();
    expect(await noScript.getByLabel(/The scenario’s periodic schedule/).isChecked()).toBe(true);

    // A 20-point sweep: the bar starts, moves, and the plot follows.
    await page.goto(`${scenarioUrl}/sweep`);
    await page.getByLabel("Setting to vary").selectOption("fish.feedGPerDay");
    await page.getByLabel("From", { exact: true }).fill("0.2");
    await page.getByLabel("To", { exact: true }).fill("2");
    await page.getByLabel("Points").fill("20");
    await page.getByRole("button", { name: "Run the sweep" }).click();
    await page.waitForURL(/sweep\?job=/);
    // The app's own bar (app/components/ui/progress-bar.tsx), its fill gliding by a CSS transition.
    const bar = page.getByRole("progressbar");
    await bar.waitFor();
    await expect.poll(() => bar.getAttribute("aria-valuemax")).toBe("20");
    expect(await page.locator("progress").count()).toBe(0);
    const fill = bar.locator("div").first();
    expect(await fill.evaluate((el) => getComputedStyle(el).transitionProperty)).toBe("width");
    expect(parseFloat(await fill.evaluate((el) => getComputedStyle(el).transitionDuration))).toBeGreaterThan(0);
    await page.getByText("Done: 20 of 20 engine runs").waitFor({ timeout: 30_000 });
    await expect.poll(() => bar.getAttribute("aria-valuenow")).toBe("20");
    await expect.poll(() => fill.evaluate((el) => el.style.width)).toBe("100%");
    const plot = page.locator("svg").filter({ has: page.locator("title", { hasText: "against food per day" }) });
    await expect.poll(() => plot.locator("circle").count()).toBe(20);
    await shot(page, "sweep-20-points");

    const phone = await newPage({ width: 375 });
    await phone.context().addCookies(await page.context().cookies());
    await phone.goto(page.url());
    await phone.getByText("Done: 20 of 20 engine runs").waitFor();
    await shot(phone, "sweep-20-points-phone");
    expectNoConsoleErrors(page);
    expectNoConsoleErrors(phone);
  });
});
