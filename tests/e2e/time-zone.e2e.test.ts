/**
 * The browser's time zone reaches the server before the keeper chooses one, and a chosen one
 * replaces it; a name the runtime does not know is refused next to the field.
 */
import { describe, expect, it } from "vitest";
import { expectNoConsoleErrors, newPage, shot, signUp, uniqueEmail, useBrowser } from "./support/browser";

useBrowser();

describe("the time zone", () => {
  it("is the browser's until the keeper chooses one on the account page", async () => {
    // IANA tz database zone names; the browser is told to be in Auckland.
    const page = await newPage({ timezoneId: "Pacific/Auckland" });
    await signUp(page, "Far Keeper", uniqueEmail("tz"), "southern kelp forest");
    await page.goto("/account");
    await page.getByText("counted in Pacific/Auckland, your browser's").waitFor();

    const zone = page.getByLabel("Time zone");
    await zone.fill("Atlantis/Lost_City");
    await page.getByRole("button", { name: "Save name, units and time zone" }).click();
    await page.getByText("Choose a time zone from the list").waitFor();
    expect(await page.getByLabel("Time zone").getAttribute("aria-invalid")).toBe("true");
    await shot(page, "account-time-zone-refused");

    await page.getByLabel("Time zone").fill("America/Los_Angeles");
    await page.getByRole("button", { name: "Save name, units and time zone" }).click();
    await page.getByText("Your preferences were saved.").waitFor();
    await page.getByText("counted in America/Los_Angeles, your choice").waitFor();
    expectNoConsoleErrors(page);
  });
});
