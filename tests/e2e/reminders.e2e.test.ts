/**
 * E-mail reminders as a keeper meets them (issue 14, item 5): opt in for a tank on the account
 * page, read the digest in the local mailbox (the fake SMTP server's folder), and stop it from
 * the mail's link alone, signed out.
 */
import { describe, expect, it } from "vitest";
import { DEMO, expectNoConsoleErrors, newPage, shot, signIn, useBrowser, waitForMail } from "./support/browser";

useBrowser();

describe("e-mail reminders", () => {
  it("a keeper subscribes a tank, reads the digest with the forecast, and stops it from the link", async () => {
    const page = await newPage();
    await signIn(page, DEMO.jonah, DEMO.password);
    await page.goto("/account");
    const form = page.getByRole("form", { name: /^Reminders for / }).first();
    const tankName = (await form.getAttribute("aria-label"))!.replace(/^Reminders for /, "");
    await form.getByLabel(/^Reminders for /).selectOption("weekly");
    // The current hour: the first digest is due now. The browser and this runner share the
    // machine's zone, which the page uses until the keeper chooses one.
    await form.getByLabel("Hour (0–23, your time zone)").fill(String(new Date().getHours()));
    await form.getByRole("button", { name: "Save reminders" }).click();
    await page.getByText("Your reminder settings were saved.").waitFor();
    await shot(page, "account-reminders");

    const mail = await waitForMail(DEMO.jonah, new RegExp(`^This week · ${tankName} · Fernwater$`), 30_000);
    expect(mail.text).toMatch(/Planned for the next 14 days:/);
    expect(mail.text).toMatch(/Forecast: /);
    expect(mail.text).toMatch(/not a water test/i);
    // RFC 8058: the one-click unsubscribe headers a mail program uses.
    expect(mail.headers?.["list-unsubscribe"]).toMatch(/^<http.*\/reminders\/unsubscribe\/[^>]+>$/);
    expect(mail.headers?.["list-unsubscribe-post"]).toBe("List-Unsubscribe=One-Click");
    const link = mail.links.find((l) => l.includes("/reminders/unsubscribe/"))!;
    expect(link).toBeTruthy();

    // The link alone, in a browser that is not signed in.
    const stranger = await newPage();
    await stranger.goto(new URL(link).pathname);
    await stranger.getByRole("heading", { name: `Stop reminders for ${tankName}?` }).waitFor();
    await stranger.getByRole("button", { name: "Stop reminder e-mails" }).click();
    await stranger.getByRole("heading", { name: "Reminders stopped" }).waitFor();
    await shot(stranger, "reminders-stopped");

    await page.goto("/account");
    const after = page.getByRole("form", { name: `Reminders for ${tankName}` });
    expect(await after.getByLabel(/^Reminders for /).inputValue()).toBe("off");
    expectNoConsoleErrors(page);
    expectNoConsoleErrors(stranger);
  });
});
