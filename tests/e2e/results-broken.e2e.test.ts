/**
 * The four things that broke for keepers, teachers and forum members (issue 12, "Broken"):
 * a share link on reload, a what-if saved twice over, a what-if changing settings it did not
 * touch, and a new tank's nitrate target read back with conversion noise.
 */
import fs from "node:fs";
import { describe, expect, it } from "vitest";
import {
  DEMO,
  expectNoConsoleErrors,
  newPage,
  shot,
  signIn,
  signUp,
  uniqueEmail,
  useBrowser,
  type PageWithErrors,
} from "./support/browser";

useBrowser();

const DEMO_SHARE = "/s/tidewell-demo-theo-as-kept-now";

/** The chart has hydrated: the keyboard moves its day cursor. */
async function cursorWorks(page: PageWithErrors) {
  const chart = page.getByRole("application").first();
  await chart.focus();
  await page.keyboard.press("End");
  await page
    .getByText(/^day 180\b/)
    .first()
    .waitFor({ timeout: 10_000 });
  await page.keyboard.press("Home");
  await page
    .getByText(/^day 0\b/)
    .first()
    .waitFor({ timeout: 10_000 });
}

/** The nonce the response's CSP allows, after checking every inline script carries that one. */
async function nonceOf(response: Awaited<ReturnType<PageWithErrors["goto"]>>): Promise<string> {
  const policy = (await response!.allHeaders())["content-security-policy"] ?? "";
  const nonce = /'nonce-([^']+)'/.exec(policy)?.[1];
  expect(nonce).toBeTruthy();
  const scriptNonces = [...(await response!.text()).matchAll(/<script[^>]*\snonce="([^"]*)"/g)].map((m) => m[1]);
  expect(scriptNonces.length).toBeGreaterThan(0);
  expect(new Set(scriptNonces)).toEqual(new Set([nonce]));
  return nonce!;
}

const cspErrors = (page: PageWithErrors) =>
  page.consoleErrors.filter((e) => /Content Security Policy|Refused to execute/i.test(e));

describe("a share link survives a reload and a second visit", () => {
  it("hydrates every time: no CSP errors, chart drawn, cursor works", async () => {
    const page = await newPage();
    const first = await page.goto(DEMO_SHARE);
    expect(first?.status()).toBe(200);
    const nonces = [await nonceOf(first)];
    await cursorWorks(page);
    await shot(page, "share-first-visit");

    // A reload makes the browser revalidate what it cached.
    const reloaded = await page.reload();
    expect(reloaded?.status()).toBe(200);
    nonces.push(await nonceOf(reloaded));
    await cursorWorks(page);

    // A second visit in the same browser (away and back). By now the page is served from the
    // render cache (kept the second time it was asked for), which must swap in a new nonce.
    await page.goto("/");
    const again = await page.goto(DEMO_SHARE);
    expect(again?.status()).toBe(200);
    nonces.push(await nonceOf(again));
    expect(new Set(nonces).size).toBe(3);
    expect((await again!.allHeaders())["server-timing"]).toContain('render;desc="kept"');
    await cursorWorks(page);
    await shot(page, "share-second-visit");
    expect(cspErrors(page)).toEqual([]);
    expectNoConsoleErrors(page);
  });

  it("carries a link-preview picture: a 1200×630 PNG of its chart (issue 12, item 8)", async () => {
    const page = await newPage();
    await page.goto(DEMO_SHARE);
    const image = await page.locator('meta[property="og:image"]').getAttribute("content");
    expect(image).toMatch(/^http:\/\/[^/]+\/s\/tidewell-demo-theo-as-kept-now\/preview\.png$/);
    expect(await page.locator('meta[property="og:image:width"]').getAttribute("content")).toBe("1200");
    expect(await page.locator('meta[property="og:image:height"]').getAttribute("content")).toBe("630");
    expect(await page.locator('meta[property="og:image:alt"]').getAttribute("content")).toMatch(/nitrate/i);
    const picture = await page.request.get(image!);
    expect(picture.status()).toBe(200);
    expect(picture.headers()["content-type"]).toBe("image/png");
    const bytes = await picture.body();
    // PNG signature and IHDR size (ISO/IEC 15948, §5.2 and §11.2.2; docs/sources.md §18).
    expect(bytes.subarray(1, 4).toString("latin1")).toBe("PNG");
    expect([bytes.readUInt32BE(16), bytes.readUInt32BE(20)]).toEqual([1200, 630]);
    fs.mkdirSync("test-results/screenshots", { recursive: true });
    fs.writeFileSync("test-results/screenshots/share-preview-picture.png", bytes);
    // What a forum shows: the picture opens in the browser as an image of that size.
    await page.goto(image!);
    const size = await page.locator("img").evaluate((img: HTMLImageElement) => [img.naturalWidth, img.naturalHeight]);
    expect(size).toEqual([1200, 630]);
  });
});

/** The scenario's settings as its export file holds them. */
async function exportedSettings(page: PageWithErrors, scenarioPath: string) {
  const response = await page.request.get(`${scenarioPath}/export`);
  expect(response.status()).toBe(200);
  return (await response.json()).settings as Record<string, unknown> & {
    plants: { startMassG: number; maxMassG: number }[];
  };
}

async function startDateOf(page: PageWithErrors, scenarioPath: string) {
  await page.goto(`${scenarioPath}/edit`);
  return page.locator("#f-startDate").inputValue();
}

describe("saving a what-if", () => {
  it("changes only the lever moved, keeps the start date, and the new page starts clean", async () => {
    const page = await newPage();
    await signIn(page, DEMO.jonah, DEMO.password);
    await page.getByRole("link", { name: "Living-room 120" }).click();
    await page.getByRole("link", { name: "Baseline", exact: true }).first().click();
    await page.waitForURL(/\/scenarios\/\d+$/);
    const originalPath = new URL(page.url()).pathname;
    await page.getByRole("application").waitFor();

    // Plants ×2: ten steps of 0.1 on the plant-mass slider.
    const plants = page.locator("#what-if-plantMassFactor");
    await plants.focus();
    for (let i = 0; i < 10; i++) await page.keyboard.press("ArrowRight");
    await expect.poll(() => plants.inputValue()).toBe("2");
    await page.getByText("The changed run is drawn thin").waitFor();
    // The answer stays beside the sliders: nitrate before the last water change and its change.
    const summary = page.locator("[data-what-if-summary]");
    await expect.poll(() => summary.textContent(), { timeout: 15_000 }).toMatch(/against the saved run/);
    expect(await summary.textContent()).toMatch(
      /Nitrate before the last water change[\d.]+ mg\/L NO3\s?\((−[\d.]+|no change)\)/,
    );
    await expect.poll(() => page.locator("#what-if-name").inputValue()).toBe("Baseline (what if)");
    await page.getByRole("button", { name: "Save as a new scenario" }).click();
    await page.waitForURL((url) => /\/scenarios\/\d+$/.test(url.pathname) && url.pathname !== originalPath);
    const variantPath = new URL(page.url()).pathname;
    await page.getByRole("heading", { name: "Baseline (what if)", level: 1 }).waitFor();

    // The new page starts clean: sliders at its own saved values, nothing to save, no overlay.
    await page.getByRole("application").waitFor();
    expect(await page.locator("#what-if-plantMassFactor").inputValue()).toBe("1");
    await expect.poll(() => page.getByRole("button", { name: "Save as a new scenario" }).isDisabled()).toBe(true);
    expect(await page.locator("#what-if-name").inputValue()).toBe("Baseline (what if 2)");
    await page.getByText("Move a slider to try a change.").waitFor();

    // Every setting equals the original's except the plant masses, which doubled.
    const original = await exportedSettings(page, originalPath);
    const variant = await exportedSettings(page, variantPath);
    expect(variant.plants.map((p) => p.startMassG)).toEqual(original.plants.map((p) => p.startMassG * 2));
    expect(variant.plants.map((p) => p.maxMassG)).toEqual(original.plants.map((p) => p.maxMassG * 2));
    const withoutMass = (s: typeof original) => ({
      ...s,
      plants: s.plants.map(({ startMassG: _a, maxMassG: _b, ...rest }) => rest),
    });
    expect(withoutMass(variant)).toEqual(withoutMass(original));

    // The run starts on the same day, so the tank's readings line up the same way.
    const originalStart = await startDateOf(page, originalPath);
    expect(originalStart).toMatch(/^\d{4}-\d\d-\d\d$/);
    expect(await startDateOf(page, variantPath)).toBe(originalStart);

    // Leave the demo tank as it was for the other tests.
    await page.goto(variantPath);
    await page.getByLabel("Yes, delete this scenario").check();
    await page.getByRole("button", { name: "Delete scenario" }).click();
    await page.waitForURL((url) => /^\/tanks\/\d+$/.test(url.pathname));
    await page.getByRole("link", { name: "Baseline (what if)" }).waitFor({ state: "detached" });
    expectNoConsoleErrors(page);
  });
});

describe("a tank's nitrate target", () => {
  it("reads back exactly as typed, in the person's units", async () => {
    const page = await newPage();
    await signUp(page, "Target Keeper", uniqueEmail("targets"), "tide pool lantern");
    await page.getByLabel("Name").fill("Band tank");
    await page.getByRole("button", { name: "Add tank" }).click();
    await page.waitForURL(/\/tanks\/\d+$/);
    // The defaults, 5–20 mg/L as NO3 (common practice, no source), not 5.002 and 20.01.
    expect(await page.getByLabel("Nitrate target, low").inputValue()).toBe("5");
    expect(await page.getByLabel("Nitrate target, high").inputValue()).toBe("20");
    for (const [low, high] of [
      ["12.5", "33.3"],
      ["7.123", "19.87"],
    ]) {
      await page.getByLabel("Nitrate target, low").fill(low);
      await page.getByLabel("Nitrate target, high").fill(high);
      await page.getByRole("button", { name: "Save tank settings" }).click();
      await page.waitForURL(/saved=1/);
      expect(await page.getByLabel("Nitrate target, low").inputValue()).toBe(low);
      expect(await page.getByLabel("Nitrate target, high").inputValue()).toBe(high);
    }
    expectNoConsoleErrors(page);
  });
});
