/**
 * Labels and units (issue 12, item 12), as a person sees them in Chromium: every page the demo
 * club's people reach is crawled and its words checked (tests/support/label-checks.ts), a keeper
 * who reads nitrate as N sees N everywhere, and the forms behave as their words say.
 */
import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { doubledLabels, internalNames, titleProblems } from "../support/label-checks";
import {
  DEMO,
  expectNoConsoleErrors,
  newPage,
  openDemoTank,
  shot,
  signIn,
  useBrowser,
  type PageWithErrors,
} from "./support/browser";

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
      [el.getAttribute("aria-label"), el.closest("svg") ? null : el.getAttribute("title")].filter(
        (s): s is string => !!s,
      ),
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
      as
        .map((a) => new URL((a as HTMLAnchorElement).href))
        .filter((u) => u.origin === location.origin)
        .map((u) => u.pathname + u.search),
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
    await crawl(page, ["/", "/sign-in", "/sign-up", "/forgot-password"], 20, (path) =>
      checkWords(page, path, problems),
    );
    expect(problems).toEqual([]);
  });
});

/** Sets the signed-in person's nitrate unit on the account page. */
async function setNitrateUnit(page: Page, unit: "N" | "NO3") {
  await page.goto("/account");
  await page.getByLabel("Nitrate, nitrite and ammonia").selectOption(unit);
  await page.getByRole("button", { name: "Save name, units and time zone" }).click();
  await page.getByText(/saved/i).first().waitFor();
}

describe("hints follow the person's units", () => {
  it("a keeper who reads nitrate as N sees amounts and hints in mg/L NO3-N on every page, the journal among them", async () => {
    const page = await newPage();
    await signIn(page, DEMO.jonah, DEMO.password);
    await setNitrateUnit(page, "N");
    try {
      const found: string[] = [];
      const seen = await crawl(page, ["/tanks"], 30, async (path) => {
        if (path.startsWith("/account")) return;
        const { text, names } = await readPage(page);
        for (const line of [text, ...names].join("\n").split("\n")) {
          // The one exception: the readings upload's choice of the unit a file is written in.
          if (/mg\/L as NO3 \(most kits\)/.test(line)) continue;
          // A nitrate unit in mg/L NO3 (not NO3-N) is the wrong unit for this person, and so is an
          // amount stated that way ("40 mg/L nitrate as NO3"); "NO3" alone names the species (a
          // legend, "the file keeps tap nitrate as nitrate (NO3)"), not a unit.
          if (/mg\/L( as)? NO3\b(?!-N)/.test(line) || /\d\s*mg\/L(\s+(as|nitrate|of))+\s+NO3\b(?!-N)/.test(line))
            found.push(`${path}: ${line.trim().slice(0, 120)}`);
        }
      });
      expect([...seen].some((p) => /\/journal$/.test(p))).toBe(true);
      expect([...seen].some((p) => /\/calibrate$/.test(p))).toBe(true);
      expect([...seen].some((p) => /\/scenarios\/new$/.test(p))).toBe(true);
      expect(found).toEqual([]);
      // The journal's tap nitrate: typed in NO3-N, listed back as typed, in NO3-N.
      const journal = [...seen].find((p) => /\/journal$/.test(p))!;
      await page.goto(journal);
      await page.getByLabel("What was done").selectOption("water_change");
      await page.getByLabel("Water changed, %").fill("20");
      await page.getByLabel("Tap water nitrate if measured, mg/L NO3-N").fill("2.37");
      await page.getByLabel("Note").fill("tap in N");
      await page.getByRole("button", { name: "Add to the journal" }).click();
      const row = page.getByRole("row").filter({ hasText: "tap in N" }).first();
      await row.waitFor();
      expect(await row.textContent()).toContain("20 % changed, tap water 2.37 mg/L NO3-N");
      await shot(page, "labels-no3n-journal");
      await row.getByRole("button", { name: /^Delete the entry of/ }).click();
      await page.getByText("Entry deleted.").waitFor();
      await page.goto("/tanks");
      await page.getByRole("link", { name: /.+/ }).first().waitFor();
      await shot(page, "labels-no3n-tanks");
    } finally {
      await setNitrateUnit(page, "NO3");
    }
    expectNoConsoleErrors(page);
  });
});

describe("forms that say what they do", () => {
  it("deleting a reading asks first, also without JavaScript", async () => {
    const page = await newPage({ javaScript: false });
    await signIn(page, DEMO.ines, DEMO.password);
    await page.goto("/tanks");
    await page.locator("main a[href^='/tanks/']").first().click();
    const tankPath = /^\/tanks\/\d+/.exec(new URL(page.url()).pathname)![0];
    await page.goto(`${tankPath}/readings`);
    await page.getByLabel("Date and time").fill("2026-01-02T09:30");
    await page.getByLabel(/^Nitrate/).fill("12");
    await page.getByLabel("Note").fill("to be deleted");
    await page.getByRole("button", { name: "Add reading" }).click();
    const row = page.getByRole("row").filter({ hasText: "to be deleted" });
    await row.waitFor();
    // The first press only opens the question; nothing is deleted yet.
    await row.getByText("Delete…").click();
    await row.getByText("Delete this reading? It cannot be undone.").waitFor();
    expect(await page.getByRole("row").filter({ hasText: "to be deleted" }).count()).toBe(1);
    await shot(page, "labels-delete-reading-asks");
    await row.getByRole("button", { name: /^Yes, delete the reading of/ }).click();
    await page.getByText("Reading deleted.").waitFor();
    expect(await page.getByRole("row").filter({ hasText: "to be deleted" }).count()).toBe(0);
  });

  it("the setup form hides settings that do not apply, and shows them when they do", async () => {
    const page = await newPage();
    const tank = await openDemoTank(page);
    await page.goto(`${tank}/scenarios/new`);
    await page.locator("details").evaluateAll((ds) => ds.forEach((d) => ((d as HTMLDetailsElement).open = true)));
    const enabled = page.locator("input[type=checkbox][name='fishlessCycling.enabled']");
    const dose = page.locator("[data-field='fishlessCycling.doseMgNPerL']");
    if (await enabled.isChecked()) await enabled.uncheck();
    await expect.poll(() => dose.isVisible()).toBe(false);
    await enabled.check();
    await expect.poll(() => dose.isVisible()).toBe(true);
    // Trimming: the interval only for the fixed schedule.
    const rule = page.locator("select[name='plants.0.trim.rule']");
    const every = page.locator("[data-field='plants.0.trim.everyDays']");
    await rule.selectOption("whenFull");
    await expect.poll(() => every.isVisible()).toBe(false);
    await rule.selectOption("everyDays");
    await expect.poll(() => every.isVisible()).toBe(true);
    await shot(page, "labels-setup-form-visibility");
    expectNoConsoleErrors(page);
  });

  it("“Copy to my tanks” can make a new tank with the name given", async () => {
    const page = await newPage();
    await signIn(page, DEMO.ines, DEMO.password);
    await page.goto("/");
    await page.getByRole("link", { name: "See a live example, no account needed" }).click();
    await page.waitForURL(/\/s\//);
    await page.getByLabel("Into which tank?").selectOption({ label: "A new tank" });
    await page.getByLabel("Name of a new tank").fill("Ideas from the club");
    await page.getByRole("button", { name: "Copy to my tanks" }).click();
    await page.waitForURL(/\/tanks\/\d+\/scenarios\/\d+$/);
    await page
      .getByRole("navigation", { name: "Breadcrumb" })
      .getByRole("link", { name: "Ideas from the club" })
      .waitFor();
    expectNoConsoleErrors(page);
  });

  it("the lesson page names the settings it leaves open, and a student is warned of unsaved changes before handing in", async () => {
    const teacher = await newPage();
    await signIn(teacher, DEMO.teacher, DEMO.password);
    await teacher.goto("/classes");
    await teacher.getByRole("link", { name: "Year 9 Biology: the nitrogen cycle" }).first().click();
    await teacher.getByRole("link", { name: "How a new tank cycles" }).first().click();
    const open = teacher.locator("[data-open-settings] li");
    await open.first().waitFor();
    // The demo lesson leaves temperature and pH open (app/db/seed.server.ts).
    expect(await open.allTextContents()).toEqual(["Temperature", "pH"]);
    expect(await open.count()).toBeGreaterThan(0);
    for (const name of await open.allTextContents())
      expect(internalNames(name.replace(/\bpH\b/, "")), name).toEqual([]);
    const lessonUrl = teacher.url();

    const student = await newPage();
    await signIn(student, DEMO.student, DEMO.password);
    await student.goto(lessonUrl);
    await student.locator("[data-open-settings] li").first().waitFor();
    const start = student.getByRole("button", { name: "Start the lesson" });
    if (await start.count()) await start.click();
    else await student.getByRole("link", { name: /Continue the lesson|See what you handed in/ }).click();
    await student.waitForURL(/\/work/);
    await student.getByRole("heading", { name: "Results of your copy" }).waitFor();
    const handIn = student.getByRole("button", { name: /^Hand in/ });
    if (!(await handIn.count())) return; // handed in already by another test: nothing to warn about
    await expect.poll(() => handIn.textContent()).toBe("Hand in");
    const editable = student.locator("form input[type=number]:not([disabled])").first();
    await student.locator("details").evaluateAll((ds) => ds.forEach((d) => ((d as HTMLDetailsElement).open = true)));
    await editable.fill("7");
    await student.locator("[data-unsaved-warning]").waitFor();
    await expect.poll(() => handIn.textContent()).toBe("Hand in without my unsaved changes");
    await shot(student, "labels-unsaved-before-hand-in");
    expectNoConsoleErrors(student);
  });
});
