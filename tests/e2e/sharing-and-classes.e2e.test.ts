import { describe, expect, it } from "vitest";
import {
  DEMO,
  expectNoConsoleErrors,
  newPage,
  shot,
  signIn,
  uniqueEmail,
  useBrowser,
  waitForMail,
  type PageWithErrors,
} from "./support/browser";

useBrowser();

/** Fills the sign-up form on this page, then opens the confirmation mail's link and presses its button. */
async function signUpHere(page: PageWithErrors, name: string, email: string) {
  await page.getByLabel("Name").fill(name);
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password", { exact: true }).fill("tide pool lantern");
  await page.getByLabel("Password again").fill("tide pool lantern");
  await page.getByRole("button", { name: "Create account" }).click();
  await page.getByRole("heading", { name: "Check your e-mail" }).waitFor();
  const mail = await waitForMail(email, /Confirm your Fernwater account/);
  await page.goto(mail.links.find((l) => l.includes("/sign-up/confirm?token="))!);
  await page.getByRole("button", { name: "Create my account" }).click();
}

describe("share links in the browser", () => {
  it("a keeper shares, a visitor sees the chart, signs up and copies it; the link turned off answers 404", async () => {
    const keeper = await newPage();
    await signIn(keeper, DEMO.jonah, DEMO.password);
    await keeper.getByRole("link", { name: "Living-room 120" }).click();
    await keeper.getByRole("link", { name: "Feeding less" }).first().click();
    await keeper.getByRole("link", { name: "Share" }).click();
    await keeper.getByRole("button", { name: "Turn on a public link" }).click();
    const url = await keeper.getByLabel("Your public link").inputValue();
    expect(url).toMatch(/\/s\/[A-Za-z0-9_-]{43}$/);
    await shot(keeper, "share-turned-on");

    // A visitor without an account.
    const visitor = await newPage({ width: 375 });
    const opened = await visitor.goto(url);
    expect(opened?.status()).toBe(200);
    await visitor.getByRole("heading", { name: "Feeding less" }).waitFor();
    await visitor.getByRole("application").waitFor();
    await visitor.getByText("Shown in litres, °C and nitrate as NO3").waitFor();
    await visitor.getByRole("heading", { name: "Before you act on this" }).waitFor();
    const overflow = await visitor.evaluate(() => document.documentElement.scrollWidth > window.innerWidth + 1);
    expect(overflow).toBe(false);
    await shot(visitor, "share-visitor-phone");

    // Copy → sign in → create an account → back on the share page → copy into a new tank.
    await visitor.getByRole("link", { name: "Sign in to copy" }).click();
    await visitor.waitForURL(/\/sign-in\?redirectTo=/);
    await visitor.getByRole("link", { name: "Create an account" }).click();
    await signUpHere(visitor, "Forum Reader", uniqueEmail("forum"));
    await visitor.waitForURL(url);
    await visitor.getByText("You have no tanks yet").waitFor();
    await visitor.getByRole("button", { name: "Copy to my tanks" }).click();
    await visitor.waitForURL(/\/tanks\/\d+\/scenarios\/\d+$/);
    await visitor.getByRole("heading", { name: "Feeding less" }).waitFor();
    await visitor
      .getByRole("navigation", { name: "Breadcrumb" })
      .getByRole("link", { name: "Shared with me" })
      .waitFor();
    await visitor.getByRole("application").waitFor();

    // The keeper turns the link off: the address answers 404 at once.
    await keeper.getByRole("button", { name: "Turn the link off" }).click();
    await keeper.getByText("The link is off").waitFor();
    const stranger = await newPage();
    const gone = await stranger.goto(url);
    expect(gone?.status()).toBe(404);
    await stranger.getByRole("heading", { name: "This shared link does not work" }).waitFor();
    expectNoConsoleErrors(keeper);
    expectNoConsoleErrors(visitor);
  });

  it("an admin takes a link down; visitors get 404 and the owner sees the reason", async () => {
    const admin = await newPage();
    await signIn(admin, DEMO.admin, DEMO.password);
    await admin.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Admin", exact: true }).click();
    await admin.getByRole("link", { name: "Public links" }).click();
    const card = admin.getByRole("listitem").filter({ hasText: "As kept now" });
    await card.getByPlaceholder("Reason (the owner sees it)").fill("Names a shop in the scenario title");
    await card.getByRole("button", { name: "Take down" }).click();
    await admin.getByText("The link is down.").waitFor();
    await card.getByText(/taken down/).waitFor();
    await shot(admin, "admin-link-taken-down");

    const visitor = await newPage();
    const gone = await visitor.goto("/s/tidewell-demo-theo-as-kept-now");
    expect(gone?.status()).toBe(404);

    const owner = await newPage();
    await signIn(owner, DEMO.theo, DEMO.password);
    const own = await owner.goto("/s/tidewell-demo-theo-as-kept-now");
    expect(own?.status()).toBe(410);
    await owner.getByText(/Names a shop in the scenario title/).waitFor();
    await owner.goto("/tanks");
    await owner.getByRole("link", { name: "Cichlid 200" }).click();
    await owner.getByRole("link", { name: "As kept now" }).first().click();
    await owner.getByRole("link", { name: "Share" }).click();
    await owner.getByText("Their reason: Names a shop in the scenario title").waitFor();
    await expect
      .poll(() => owner.getByRole("button", { name: /Turn on a public link|Make a new link/ }).count())
      .toBe(0);

    // Restored, the demo link works again for the other tests and the demo.
    await card.getByRole("button", { name: "Restore" }).click();
    await admin.getByText("The link is live again").waitFor();
    expect((await visitor.goto("/s/tidewell-demo-theo-as-kept-now"))?.status()).toBe(200);
    expectNoConsoleErrors(admin);
  });
});

describe("classes in the browser", () => {
  it("a teacher invites a student by e-mail and hands out a lesson; the student changes what is open, hands in; the teacher sees it", async () => {
    const teacher = await newPage();
    await signIn(teacher, DEMO.teacher, DEMO.password);
    await teacher.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Classes" }).click();
    const className = `Pond study ${Date.now().toString(36)}`;
    await teacher.getByLabel("New class name").fill(className);
    await teacher.getByRole("button", { name: "Create class" }).click();
    await teacher.getByRole("heading", { name: className }).waitFor();

    const email = uniqueEmail("pupil");
    await teacher.getByLabel("Student’s e-mail").fill(email);
    await teacher.getByRole("button", { name: "Send invitation" }).click();
    await teacher.getByText(`Invitation sent to ${email}.`).waitFor();
    const mail = await waitForMail(email, /Join the class/);
    const invite = mail.links.find((l) => l.includes("/classes/invite/"))!;
    expect(invite).toBeTruthy();

    // A lesson on the demo cycling scenario with only the temperature open.
    await teacher.getByRole("link", { name: "New lesson" }).click();
    await teacher
      .getByLabel("1. Scenario to hand out")
      .selectOption({ label: "A new tank cycling without fish (Classroom demo tank)" });
    await teacher.getByRole("button", { name: "Use this scenario" }).click();
    await teacher.getByLabel("Lesson title").fill("Warm water");
    await teacher.getByLabel("Question for the students").fill("Does a warmer tank cycle faster?");
    await teacher.getByText("Water", { exact: true }).click();
    await teacher.getByLabel(/^Temperature/).check();
    await shot(teacher, "lesson-new");
    await teacher.getByRole("button", { name: "Create the lesson" }).click();
    await teacher.getByRole("heading", { name: "Warm water" }).waitFor();
    const lessonUrl = teacher.url();

    // The student: invitation → create an account → join → lesson → own copy.
    const student = await newPage({ width: 375 });
    await student.goto(invite);
    await student.getByRole("heading", { name: `Join “${className}”` }).waitFor();
    await student.getByRole("link", { name: "Create an account" }).click();
    await signUpHere(student, "Pip Pupil", email);
    await student.waitForURL(invite);
    await student.getByRole("button", { name: "Join the class" }).click();
    await student.getByText("You joined the class.").waitFor();
    await student.getByRole("link", { name: "Warm water" }).click();
    await student.getByRole("button", { name: "Start the lesson" }).click();
    await student.waitForURL(/\/work$/);
    await student.getByRole("application").waitFor();

    // Temperature is open; pH is locked (drawn read-only, and refused by the server if forged:
    // tests/integration/classes.test.ts).
    const temperature = student.getByLabel(/^Temperature/);
    await expect.poll(() => temperature.isEditable()).toBe(true);
    await expect.poll(() => student.locator("#f-water-pH").isDisabled()).toBe(true);
    await student.getByText("(locked by the lesson)").first().waitFor();
    await temperature.fill("30");
    await shot(student, "lesson-work-phone");
    await student.getByRole("button", { name: "Save and run" }).click();
    await student.waitForURL(/\/work\?saved=1/);
    await expect.poll(() => student.getByLabel(/^Temperature/).inputValue()).toBe("30");

    await student.getByLabel("Your answer").fill("Warmer water: the bacteria grow faster, so nitrite falls sooner.");
    await student.getByRole("button", { name: "Hand in" }).click();
    await student.getByText(/Handed in .*Warmer water/).waitFor();

    // The teacher sees the hand-in with its key figures and can open the copy.
    await teacher.goto(lessonUrl);
    const row = teacher.getByRole("row").filter({ hasText: "Pip Pupil" });
    await row.getByText("Warmer water: the bacteria grow faster").waitFor();
    await shot(teacher, "lesson-hand-ins");
    await row.getByRole("link", { name: /Open/ }).click();
    await teacher.getByRole("heading", { name: "Pip Pupil’s copy" }).waitFor();
    const changed = teacher.getByRole("table", { name: "Settings that differ from the lesson" });
    await changed.getByRole("row").filter({ hasText: "Temperature" }).getByText("30").waitFor();
    await teacher.getByRole("application").waitFor();

    // The presentation view animates the cycle day by day.
    await teacher.goto(`${lessonUrl}/present`);
    await teacher.getByRole("application").waitFor();
    await teacher.getByText("Day 0", { exact: true }).waitFor();
    await teacher.getByRole("button", { name: "Play" }).click();
    await teacher.waitForFunction(
      () => ((document.querySelector("#day-slider") as HTMLInputElement | null)?.valueAsNumber ?? 0) >= 5,
    );
    await teacher.getByRole("button", { name: "Pause" }).click();
    await shot(teacher, "lesson-present");
    expectNoConsoleErrors(teacher);
    expectNoConsoleErrors(student);
  });
});
