/**
 * Every page, as each of its people sees it (issue 12, items 10 and 11):
 * - accessibility: axe-core (@axe-core/playwright) with the WCAG 2.1 A and AA rules finds no
 *   serious or critical violation (Deque's impact levels; W3C WCAG 2.1), and each has one main element;
 * - phones: at 390 px wide no page scrolls sideways as a whole (wide tables scroll inside their
 *   own box), and a screenshot of each is saved for a person to look at.
 * The pages are found by following the demo club's links; the last test fails when a page
 * route of app/routes.ts is visited by none of them, so a new page cannot be left out.
 */
import fs from "node:fs";
import AxeBuilder from "@axe-core/playwright";
import { describe, expect, it } from "vitest";
import routes from "~/routes";
import { DEMO, newPage, type PageWithErrors, signIn, useBrowser } from "./support/browser";

useBrowser();

const PHONE = 390;

type Visit = { name: string; path: string };

/** The first link on the current page whose path matches, as a path. */
async function linkMatching(page: PageWithErrors, pattern: RegExp): Promise<string> {
  const hrefs = await page
    .locator("a[href]")
    .evaluateAll((links) => links.map((a) => new URL((a as HTMLAnchorElement).href).pathname));
  const found = hrefs.find((href) => pattern.test(href));
  if (!found) throw new Error(`no link matching ${pattern} on ${page.url()}`);
  return found;
}

/** The keeper's pages, found through the demo keeper's first tank and scenario. */
async function keeperPages(page: PageWithErrors): Promise<Visit[]> {
  await page.goto("/tanks");
  const tank = await linkMatching(page, /^\/tanks\/\d+$/);
  await page.goto(tank);
  const scenario = await linkMatching(page, /^\/tanks\/\d+\/scenarios\/\d+$/);
  const scenarioIds = (
    await page
      .locator("a[href]")
      .evaluateAll((links) => links.map((a) => new URL((a as HTMLAnchorElement).href).pathname))
  )
    .map((href) => /^\/tanks\/\d+\/scenarios\/(\d+)$/.exec(href)?.[1])
    .filter((id): id is string => Boolean(id));
  const compared = [...new Set(scenarioIds)].slice(0, 3);
  expect(compared.length).toBeGreaterThan(1);
  return [
    { name: "tanks", path: "/tanks" },
    { name: "tank", path: tank },
    { name: "results", path: scenario },
    { name: "scenario-edit", path: `${scenario}/edit` },
    { name: "scenario-new", path: `${tank}/scenarios/new` },
    { name: "import", path: `${tank}/import` },
    { name: "compare-choose", path: `${tank}/compare` },
    { name: "compare", path: `${tank}/compare?${compared.map((id) => `s=${id}`).join("&")}` },
    { name: "readings", path: `${tank}/readings` },
    { name: "readings-upload", path: `${tank}/readings/upload` },
    { name: "journal", path: `${tank}/journal` },
    { name: "plan", path: `${tank}/plan` },
    { name: "calibrate", path: `${scenario}/calibrate` },
    { name: "sweep", path: `${scenario}/sweep` },
    { name: "target", path: `${scenario}/target` },
    { name: "share-manage", path: `${scenario}/share` },
    { name: "account", path: "/account" },
  ];
}

async function teacherPages(page: PageWithErrors): Promise<Visit[]> {
  await page.goto("/classes");
  const klass = await linkMatching(page, /^\/classes\/\d+$/);
  await page.goto(klass);
  const lesson = await linkMatching(page, /^\/classes\/\d+\/lessons\/\d+$/);
  return [
    { name: "classes", path: "/classes" },
    { name: "class", path: klass },
    { name: "lesson", path: lesson },
    { name: "lesson-new", path: `${klass}/lessons/new` },
    { name: "present", path: `${lesson}/present` },
  ];
}

async function studentPages(page: PageWithErrors): Promise<Visit[]> {
  await page.goto("/classes");
  const klass = await linkMatching(page, /^\/classes\/\d+$/);
  await page.goto(klass);
  const lesson = await linkMatching(page, /^\/classes\/\d+\/lessons\/\d+(\/work)?$/);
  return [
    { name: "student-classes", path: "/classes" },
    { name: "student-class", path: klass },
    { name: "student-lesson", path: lesson },
  ];
}

async function adminPages(page: PageWithErrors): Promise<Visit[]> {
  await page.goto("/admin/links");
  const link = await linkMatching(page, /^\/admin\/links\/\d+$/);
  return [
    { name: "admin-users", path: "/admin" },
    { name: "admin-links", path: "/admin/links" },
    { name: "admin-link", path: link },
    { name: "admin-classes", path: "/admin/classes" },
  ];
}

const ANONYMOUS: Visit[] = [
  { name: "home", path: "/" },
  { name: "sign-in", path: "/sign-in" },
  { name: "sign-up", path: "/sign-up" },
  { name: "forgot-password", path: "/forgot-password" },
  { name: "share", path: "/s/tidewell-demo-theo-as-kept-now" },
  { name: "not-found", path: "/no-such-page" },
];

/** Opens a page and waits until it has hydrated (charts drawn, forms live). */
async function open(page: PageWithErrors, path: string) {
  const response = await page.goto(path);
  expect(response, path).not.toBeNull();
  await page.waitForLoadState("networkidle");
}

/** Serious and critical axe violations of WCAG 2.1 A/AA on the open page, one line each. */
async function seriousViolations(page: PageWithErrors, name: string): Promise<string[]> {
  const result = await new AxeBuilder({ page }).withTags(["wcag2a", "wcag2aa", "wcag21a", "wcag21aa"]).analyze();
  return result.violations
    .filter((v) => v.impact === "serious" || v.impact === "critical")
    .map(
      (v) =>
        `${name}: ${v.id} (${v.impact}) ${v.help} — ${v.nodes
          .map((n) => n.target.join(" "))
          .slice(0, 3)
          .join(" | ")}`,
    );
}

/** How far the page scrolls sideways as a whole at phone width (0 = not at all). */
async function sidewaysOverflow(page: PageWithErrors): Promise<number> {
  return page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
}

/** Every path opened above, for the coverage check at the end. */
const visited: string[] = [];

type RouteEntry = { file: string; path?: string; index?: boolean; children?: RouteEntry[] };

/** Page routes (modules with a page component) of the route table, as path patterns. */
function pageRoutes(entries: RouteEntry[], prefix = ""): { file: string; pattern: RegExp }[] {
  return entries.flatMap((entry) => {
    const path = entry.index ? prefix : [prefix, entry.path].filter(Boolean).join("/");
    const own = /export default/.test(fs.readFileSync(`app/${entry.file}`, "utf8"))
      ? [{ file: entry.file, pattern: new RegExp(`^/${path.replace(/:[^/]+/g, "[^/]+")}$`) }]
      : [];
    return [...own, ...pageRoutes(entry.children ?? [], path)];
  });
}

/**
 * Pages the crawl cannot reach as a visitor would, each with why; everything else must be visited.
 * The forms behind e-mailed links are checked by their own end-to-end tests.
 */
const NOT_CRAWLED: Record<string, string> = {
  "routes/auth/confirm-sign-up.tsx": "needs a fresh sign-up link from an e-mail (accounts.e2e)",
  "routes/auth/reset-password.tsx": "needs a fresh reset link from an e-mail (accounts.e2e)",
  "routes/classes/invite.tsx": "needs a fresh invitation link from an e-mail (sharing-and-classes.e2e)",
  "routes/classes/copy.tsx": "needs a student's hand-in, made by sharing-and-classes.e2e",
  "routes/classes/lesson-work.tsx": "a student's copy is made by starting the lesson (sharing-and-classes.e2e)",
  "routes/reminders/unsubscribe.tsx": "needs a signed link from a reminder mail (reminders.e2e)",
  "routes/dev/mail.tsx": "a local-mode tool, not part of the product",
  "routes/dev/chart-preview.tsx": "a local-mode tool for measuring chart redraws",
};

const PEOPLE: { who: string; email: string | null; pages: (page: PageWithErrors) => Promise<Visit[]> }[] = [
  { who: "anonymous visitor", email: null, pages: async () => ANONYMOUS },
  { who: "keeper", email: DEMO.jonah, pages: keeperPages },
  { who: "educator", email: DEMO.teacher, pages: teacherPages },
  { who: "student", email: DEMO.student, pages: studentPages },
  { who: "admin", email: DEMO.admin, pages: adminPages },
];

describe("every page, for each of its people", () => {
  for (const person of PEOPLE) {
    it(`${person.who}: no serious or critical accessibility problem, and nothing scrolls sideways at ${PHONE} px`, async () => {
      const desk = await newPage();
      const phone = await newPage({ width: PHONE });
      if (person.email) {
        await signIn(desk, person.email, DEMO.password);
        await signIn(phone, person.email, DEMO.password);
      }
      const visits = await person.pages(desk);
      const problems: string[] = [];
      const overflowing: string[] = [];
      for (const visit of visits) {
        visited.push(visit.path);
        await open(desk, visit.path);
        problems.push(...(await seriousViolations(desk, visit.name)));
        // One main element per page, the shell's (HTML Living Standard, "the main element"); axe rates a second one moderate.
        const mains = await desk.locator("main").count();
        if (mains !== 1) problems.push(`${visit.name}: ${mains} main elements, not one`);
        await open(phone, visit.path);
        const overflow = await sidewaysOverflow(phone);
        if (overflow > 0) overflowing.push(`${visit.name} (${visit.path}) scrolls ${overflow} px sideways`);
        await phone.screenshot({ path: `test-results/screenshots/phone-${visit.name}.png`, fullPage: true });
      }
      expect(visits.length).toBeGreaterThan(0);
      expect({ problems, overflowing }).toEqual({ problems: [], overflowing: [] });
    }, 240_000);
  }
});

describe("wide tables on a phone", () => {
  it("scroll inside their own box, say so, and keep the first column in view", async () => {
    const phone = await newPage({ width: PHONE });
    await signIn(phone, DEMO.jonah, DEMO.password);
    const pages = await keeperPages(phone);
    for (const name of ["readings", "compare"]) {
      await open(phone, pages.find((p) => p.name === name)!.path);
      const box = phone.locator(".scroll-table").first();
      await expect.poll(() => box.getAttribute("data-hidden"), { message: name }).toBe("right");
      await phone.getByText("More columns: scroll sideways →").first().waitFor({ timeout: 5000 });
      const firstCell = box.locator("tbody tr").first().locator("th, td").first();
      const secondCell = box.locator("tbody tr").first().locator("th, td").nth(1);
      const before = { first: (await firstCell.boundingBox())!.x, second: (await secondCell.boundingBox())!.x };
      await box.evaluate((el) => el.scrollBy({ left: 120 }));
      await expect.poll(() => box.getAttribute("data-hidden")).not.toBe("right");
      const after = { first: (await firstCell.boundingBox())!.x, second: (await secondCell.boundingBox())!.x };
      expect(after.first, `${name}: the first column stays`).toBeCloseTo(before.first, 0);
      expect(after.second, `${name}: the rest scrolls`).toBeLessThan(before.second - 50);
      expect(await sidewaysOverflow(phone)).toBe(0);
    }
  });
});

describe("the crawl", () => {
  it("visits every page route of app/routes.ts (or says why not)", () => {
    const missing = pageRoutes(routes as RouteEntry[])
      .filter((route) => !(route.file in NOT_CRAWLED))
      .filter((route) => !visited.some((path) => route.pattern.test(path.split("?")[0])))
      .map((route) => route.file);
    expect(missing).toEqual([]);
  });
});
