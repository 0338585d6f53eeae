/**
 * Labels and units (issue 12, item 12), as a person sees them in Chromium: every page the demo
 * club's people reach is crawled and its words checked (tests/support/label-checks.ts), a keeper
 * who reads nitrate as N sees N everywhere, and the forms behave as their words say.
 */
import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { doubledLabels, internalNames, titleProblems } from "../support/label-checks";
import { DEMO, expectNoConsoleErrors, newPage, shot, signIn, useBrowser, type PageWithErrors } from "./support/browser";

useBrowser();

/** Downloads, feeds, local tools and sign-out are not pages to read. */
const SKIP = /^\/(api|dev|calendar|sign-out)\b|\/(export|template)(\/|$)|\.(csv|ics|json|png)$/;

/** The words a person reads (text, and the names screen readers announce), without code samples. */
async function readPage(page: Page): Promise<{ text: string; names: string[]; title: string }> {
  return page.evaluate(() => {
    const clone = document.body.cloneNode(true) as HTMLElement;
    clone.querySelectorAll("code, pre, kbd, script, style, [hidden], template").forEach((n) => n.remove());
    document.body.append(clone);
    clone.style.position = "absolute";
    const text = clone.innerText;
    clone.remove();
    const names = [...document.querySelectorAll("[aria-label], [title]")].flatMap((el) =>
      [el.getAttribute("aria-label"), el.closest("svg") ? null : el.getAttribute("title")].filter((s): s is string => !!s),
    );
    return { text, names, title: document.title };
  });
}

/** Same-site page links from every page reached from `start`, up to `limit` pages (one per route shape). */
async function crawl(page: PageWithErrors, starts: string[], limit: number, visit: (path: string) => Promise<void>) {
  const seen = new Set<string>();
  const shapes = new Set<string>();
  const queue = [...starts];
  while (queue.length && seen.size < limit) {
    const path = queue.shift()!;
    const shape = path.replace(/\/\d+/g, "/:id").replace(/\?.*$/, "");
    if (seen.has(path) || shapes.has(shape) || SKIP.test(path)) continue;
    seen.add(path);
    shapes.add(shape);
    const response = await page.goto(path);
    if (!response || response.status() >= 400) continue;
    await visit(path);
    const links = await page.$$eval("a[href]", (as) =>
      as.map((a) => new URL((a as HTMLAnchorElement).href)).filter((u) => u.origin === location.origin).map((u) => u.pathname + u.search),
    );
    for (const l of links) if (!seen.has(l)) queue.push(l);
  }
  return seen;
}

async function checkWords(page: Page, path: string, problems: string[]) {
  const { text, names, title } = await readPage(page);
  for (const p of titleProblems(title)) problems.push(`${path}: title “${title}”: ${p}`);
  for (const d of doubledLabels([text, ...names].join("\n"))) problems.push(`${path}: doubled label “${d}”`);
  for (const n of internalNames([text, ...names].join("\n"))) problems.push(`${path}: internal name “${n}”`);
}

describe("every page's words", () => {
  for (const [who, email, starts] of [
    ["the demo keeper", DEMO.jonah, ["/tanks", "/account"]],
    ["the teacher", DEMO.teacher, ["/classes", "/tanks"]],
    ["a student", DEMO.student, ["/classes"]],
  ] as const) {
    it(`${who}: no doubled labels, no internal field names, titles without doubled punctuation`, async () => {
      const page = await newPage();
      await signIn(page, email, DEMO.password);
      const problems: string[] = [];
      const seen = await crawl(page, [...starts], 45, (path) => checkWords(page, path, problems));
      expect(seen.size).toBeGreaterThan(5);
      expect(problems).toEqual([]);
      expectNoConsoleErrors(page);
    });
  }

  it("anonymous visitors' pages too", async () => {
    const page = await newPage();
    const problems: string[] = [];
    await crawl(page, ["/", "/sign-in", "/sign-up", "/forgot-password"], 20, (path) => checkWords(page, path, problems));
    expect(problems).toEqual([]);
  });
});

/** Sets the signed-in person's nitrate unit on the account page. */
async function setNitrateUnit(page: Page, unit: "N" | "NO3") {
  await page.goto("/account");
  await page.getByLabel("Nitrate, nitrite and ammonia").selectOption(unit);
  await page.getByRole("button", { name: "Save name and units" }).click();
  await page.getByText(/saved/i).first().waitFor();
}

describe("hints follow the person's units", () => {
  it("a keeper who reads nitrate as N sees mg/L NO3-N, never NO3, on the tank, scenario, sweep and journal pages", async () => {
    const page = await newPage();
    await signIn(page, DEMO.jonah, DEMO.password);
    await setNitrateUnit(page, "N");
    try {
      const found: string[] = [];
      const seen = await crawl(page, ["/tanks"], 30, async (path) => {
        if (path.startsWith("/account")) return;
        const { text, names } = await readPage(page);
        for (const line of [text, ...names].join("\n").split("\n")) {
          // "NO3" alone (not NO3-N) is nitrate as the ion: wrong for this person.
          if (/\bNO3\b(?!-N)/.test(line)) found.push(`${path}: ${line.trim().slice(0, 120)}`);
        }
      });
      expect([...seen].some((p) => /\/journal$/.test(p))).toBe(true);
      expect(found).toEqual([]);
      await page.goto("/tanks");
      await page.getByRole("link", { name: /.+/ }).first().waitFor();
      await shot(page, "labels-no3n-tanks");
    } finally {
      await setNitrateUnit(page, "NO3");
    }
    expectNoConsoleErrors(page);
  });
});
