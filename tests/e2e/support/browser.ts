/**
 * Playwright (playwright-core) driving Debian's Chromium against the built server. One
 * browser per test file, a fresh context (cookies) per person in a test.
 */
import { chromium, type Browser, type BrowserContext, type Page } from "playwright-core";
import { afterAll, beforeAll, expect, inject } from "vitest";
import { listCapturedMail, type CapturedMail } from "~/mail/captured-mail.server";

export const baseURL = () => inject("baseURL");

let browser: Browser;
const contexts: BrowserContext[] = [];

export function useBrowser() {
  beforeAll(async () => {
    browser = await chromium.launch({
      executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
      headless: true,
      args: [
        "--no-sandbox",
        "--disable-gpu",
        "--disable-quic",
        "--no-first-run",
        "--disable-background-networking",
        "--disable-component-update",
        "--disable-sync",
      ],
    });
  });
  afterAll(async () => {
    for (const c of contexts) await c.close().catch(() => {});
    await browser?.close();
  });
}

/** Console errors the page logged; a 4xx answer to a refused form is expected and not counted. */
export type PageWithErrors = Page & { consoleErrors: string[] };

export async function newPage(
  options: { width?: number; javaScript?: boolean; timezoneId?: string } = {},
): Promise<PageWithErrors> {
  const context = await browser.newContext({
    timezoneId: options.timezoneId,
    baseURL: baseURL(),
    viewport: { width: options.width ?? 1200, height: 900 },
    javaScriptEnabled: options.javaScript ?? true,
    acceptDownloads: true,
  });
  contexts.push(context);
  const page = (await context.newPage()) as PageWithErrors;
  page.consoleErrors = [];
  page.on("console", (m) => {
    if (m.type() !== "error") return;
    if (/Failed to load resource: the server responded with a status of 4\d\d/.test(m.text())) return;
    page.consoleErrors.push(m.text());
  });
  page.on("pageerror", (e) => page.consoleErrors.push(String(e)));
  return page;
}

export async function shot(page: Page, name: string): Promise<void> {
  await page.screenshot({ path: `test-results/screenshots/${name}.png`, fullPage: true });
}

export async function signIn(page: Page, email: string, password: string): Promise<void> {
  await page.goto("/sign-in");
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL((url) => !url.pathname.startsWith("/sign-in"));
}

/** Signs in as the demo keeper and opens his Living-room 120 tank; returns the tank page's path (/tanks/N). */
export async function openDemoTank(page: Page): Promise<string> {
  await signIn(page, DEMO.jonah, DEMO.password);
  await page.goto("/tanks");
  await page.getByRole("link", { name: "Living-room 120" }).first().click();
  await page.waitForURL(/\/tanks\/\d+$/);
  return new URL(page.url()).pathname;
}

export async function signOut(page: Page): Promise<void> {
  await page.getByRole("button", { name: "Sign out" }).click();
  await page.waitForURL((url) => url.pathname === "/");
}

export async function waitForMail(to: string, subject: RegExp, timeoutMs = 10_000): Promise<CapturedMail> {
  const start = Date.now();
  for (;;) {
    const found = listCapturedMail(inject("mailDir")).find((m) => m.to.includes(to) && subject.test(m.subject));
    if (found) return found;
    if (Date.now() - start > timeoutMs) throw new Error(`no mail to ${to} matching ${subject}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

/**
 * Signs up through the form, then opens the confirmation mail's link and presses its button,
 * as a person would; ends signed in, on the tanks page (or where sign-up was sent back to).
 */
export async function signUp(
  page: Page,
  name: string,
  email: string,
  password: string,
  shotName?: string,
): Promise<void> {
  await page.goto("/sign-up");
  await page.getByLabel("Name").fill(name);
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password", { exact: true }).fill(password);
  await page.getByLabel("Password again").fill(password);
  if (shotName) await shot(page, shotName);
  await page.getByRole("button", { name: "Create account" }).click();
  await page.getByRole("heading", { name: "Check your e-mail" }).waitFor();
  const mail = await waitForMail(email, /Confirm your Fernwater account/);
  await page.goto(mail.links.find((l) => l.includes("/sign-up/confirm?token="))!);
  await page.getByRole("button", { name: "Create my account" }).click();
  await page.waitForURL((url) => !url.pathname.startsWith("/sign-up"));
}

export function expectNoConsoleErrors(page: PageWithErrors): void {
  expect(page.consoleErrors).toEqual([]);
}

/** The demo club's accounts, seeded into the e2e database (see app/db/seed.server.ts). */
export const DEMO = {
  password: "tidewell-demo-2026",
  admin: "admin@tidewell.example",
  teacher: "teacher@tidewell.example",
  jonah: "jonah@tidewell.example",
  ines: "ines@tidewell.example",
  theo: "theo@tidewell.example",
  student: "student@tidewell.example",
};

let unique = 0;
export function uniqueEmail(prefix: string): string {
  return `${prefix}-${Date.now().toString(36)}-${++unique}@example.org`;
}
