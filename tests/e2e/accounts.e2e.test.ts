import { describe, expect, it } from "vitest";
import {
  DEMO,
  expectNoConsoleErrors,
  newPage,
  shot,
  signIn,
  signOut,
  signUp,
  uniqueEmail,
  useBrowser,
  waitForMail,
} from "./support/browser";

useBrowser();

describe("accounts in the browser", () => {
  it("signs up through the mailed link, signs out and signs in again", async () => {
    const page = await newPage();
    const email = uniqueEmail("newcomer");
    await signUp(page, "New Keeper", email, "lantern moss river", "accounts-sign-up");
    expect(new URL(page.url()).pathname).toBe("/tanks");
    await page.getByRole("heading", { name: "Your tanks" }).waitFor();
    await signOut(page);
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Sign in" }).waitFor();
    await signIn(page, email, "lantern moss river");
    expect(new URL(page.url()).pathname).toBe("/tanks");
    expectNoConsoleErrors(page);
  });

  it("shows field errors for bad sign-up input and keeps what was typed", async () => {
    const page = await newPage();
    await page.goto("/sign-up");
    await page.getByLabel("Name").fill("Half Done");
    await page.getByLabel("E-mail").fill("not-an-address");
    await page.getByLabel("Password", { exact: true }).fill("short");
    await page.getByLabel("Password again").fill("different");
    await page.getByRole("button", { name: "Create account" }).click();
    await page.getByText("Enter an e-mail address like name@example.org.").waitFor();
    await page.getByText("Use at least 10 characters.").waitFor();
    await page.getByText("The two passwords differ.").waitFor();
    await expect.poll(() => page.getByLabel("Name").inputValue()).toBe("Half Done");
    await expect.poll(() => page.getByLabel("E-mail").getAttribute("aria-invalid")).toBe("true");
    await shot(page, "accounts-sign-up-errors");
    expectNoConsoleErrors(page);
  });

  it("resets a forgotten password through the mailed link", async () => {
    const page = await newPage();
    const email = uniqueEmail("forgetful");
    await signUp(page, "Forgetful Keeper", email, "first password 1");
    await signOut(page);

    await page.goto("/forgot-password");
    await page.getByLabel("E-mail").fill(email);
    await page.getByRole("button", { name: "Send the link" }).click();
    await page.getByText(`If an account exists for ${email}`).waitFor();
    const mail = await waitForMail(email, /Reset your Fernwater password/);
    const link = mail.links.find((l) => l.includes("/reset-password?token="))!;
    expect(link).toBeTruthy();

    // The captured mail is also listed on the local mail page.
    await page.goto("/dev/mail");
    await page.getByText(email).first().waitFor();
    await shot(page, "accounts-dev-mail");

    await page.goto(link);
    await page.getByLabel("New password", { exact: true }).fill("second password 2");
    await page.getByLabel("New password again").fill("second password 2");
    await page.getByRole("button", { name: "Save the new password" }).click();
    await page.waitForURL("**/sign-in?reset=1");
    await signIn(page, email, "second password 2");
    expect(new URL(page.url()).pathname).toBe("/tanks");
    expectNoConsoleErrors(page);
  });

  it("refuses a keeper the admin page with a 403 page", async () => {
    const page = await newPage();
    await signIn(page, DEMO.jonah, DEMO.password);
    const response = await page.goto("/admin");
    expect(response?.status()).toBe(403);
    await page.getByRole("heading", { name: "Not allowed" }).waitFor();
    await shot(page, "accounts-403");
  });

  it("lets an admin change a role that takes effect on the user's next request", async () => {
    const keeperPage = await newPage();
    const email = uniqueEmail("promoted");
    await signUp(keeperPage, "Soon Teacher", email, "promote me please");
    await expect.poll(() => keeperPage.getByRole("link", { name: "Admin" }).count()).toBe(0);
    expect((await keeperPage.goto("/admin"))?.status()).toBe(403);

    const adminPage = await newPage();
    await signIn(adminPage, DEMO.admin, DEMO.password);
    await adminPage.goto("/admin");
    const row = adminPage.getByRole("row").filter({ hasText: email });
    await row.getByLabel("Role of Soon Teacher").selectOption("admin");
    await row.getByRole("button", { name: "Save" }).click();
    await adminPage.getByText("Role saved.").waitFor();
    await shot(adminPage, "accounts-admin-roles");

    // The same session, its next request: the new role applies at once.
    expect((await keeperPage.goto("/admin"))?.status()).toBe(200);
    await keeperPage.getByRole("link", { name: "Admin" }).waitFor();
    expectNoConsoleErrors(adminPage);
  });

  it("fits a phone screen", async () => {
    const page = await newPage({ width: 375 });
    await page.goto("/");
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth > window.innerWidth);
    expect(overflow).toBe(false);
    await shot(page, "home-phone");
  });
});
