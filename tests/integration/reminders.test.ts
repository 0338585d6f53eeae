import { spawn } from "node:child_process";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "~/db/client.server";
import { reminderSubscriptions } from "~/db/schema-care";
import { checkReminders } from "~/features/reminders/reminder-check.server";
import { claim } from "~/features/reminders/reminder-schedule.server";
import { action as accountAction } from "~/routes/auth/account";
import { action as unsubscribeAction, loader as unsubscribeLoader } from "~/routes/reminders/unsubscribe";
import { mailTo, startMailFake, waitForMail } from "../support/mail";
import { call, get, post } from "../support/routes";
import { createScenario, createTank } from "../support/tanks";
import { userWithCookie } from "../support/users";

let stopMail: () => Promise<void>;
beforeAll(async () => {
  stopMail = (await startMailFake()).close;
});
afterAll(async () => {
  await stopMail();
});

const HOUR = 3_600_000;
const hourNow = () => new Date().getUTCHours();
const row = (tankId: number) =>
  getDb().select().from(reminderSubscriptions).where(eq(reminderSubscriptions.tankId, tankId)).get();

/** A keeper subscribed to the weekly digest at this hour: due now. */
async function subscribed() {
  const keeper = await userWithCookie();
  const tankId = createTank(keeper.id, "Reminder tank");
  await createScenario(keeper.id, tankId, { maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.3 } });
  const r = await call(
    accountAction,
    post("/account", { intent: "reminders", tankId, mode: "weekly", hour: hourNow() }, keeper.cookie),
  );
  expect(r.status).toBe(302);
  return { keeper, tankId };
}

describe("e-mail reminders", () => {
  // common practice, no source: a due reminder goes out exactly once per due time.
  it("sends a reminder due now exactly once when the check runs twice", async () => {
    const { keeper } = await subscribed();
    const now = Date.now();
    expect(await checkReminders("process-a", now)).toBe(1);
    expect(await checkReminders("process-a", now)).toBe(0);
    await waitForMail(keeper.email);
    expect(mailTo(keeper.email)).toHaveLength(1);
  });

  it("sends once when two processes race for the same due row", async () => {
    const { keeper } = await subscribed();
    const now = Date.now();
    const sent = await Promise.all([checkReminders("process-a", now), checkReminders("process-b", now)]);
    expect(sent.reduce((a, b) => a + b, 0)).toBe(1);
    await waitForMail(keeper.email);
    await new Promise((r) => setTimeout(r, 200));
    expect(mailTo(keeper.email)).toHaveLength(1);
  });

  it("a live claim blocks a second claimer; a claim whose sender died is taken again after its lease, and sent once", async () => {
    const { keeper, tankId } = await subscribed();
    const now = Date.now();
    const id = row(tankId)!.id;
    // The first process claims, then dies before sending (nothing else happens).
    expect(claim(id, "dead-process", now)).toBe(true);
    expect(claim(id, "other", now + 1000)).toBe(false);
    expect(await checkReminders("other", now + 1000)).toBe(0);
    expect(mailTo(keeper.email)).toHaveLength(0);
    // After the lease (2 minutes) another process takes it and sends it.
    const later = now + 3 * 60_000;
    expect(await checkReminders("other", later)).toBe(1);
    expect(await checkReminders("third", later)).toBe(0);
    await waitForMail(keeper.email);
    expect(mailTo(keeper.email)).toHaveLength(1);
    expect(row(tankId)!.nextDueAt).toBeGreaterThan(later + 6 * 24 * HOUR);
  });

  it("is sent once when the sending process is killed (SIGKILL) between claiming and sending", async () => {
    const { keeper, tankId } = await subscribed();
    const now = Date.now();
    const id = row(tankId)!.id;
    // A real second process on the same SQLite file claims the reminder and is killed before it sends.
    const child = spawn(
      process.execPath,
      ["--import", "tsx", "tests/support/claim-then-die.ts", String(id), String(now)],
      {
        env: process.env,
        stdio: ["ignore", "pipe", "pipe"],
      },
    );
    let out = "";
    child.stdout.on("data", (chunk) => (out += chunk));
    let err = "";
    child.stderr.on("data", (chunk) => (err += chunk));
    const signal = await new Promise<NodeJS.Signals | null>((resolve) =>
      child.on("exit", (_code, sig) => resolve(sig)),
    );
    expect(err).toBe("");
    expect(out).toBe("claimed\n");
    expect(signal).toBe("SIGKILL");
    expect(row(tankId)!.claimedBy).toBe(`killed-sender-${child.pid}`);
    expect(row(tankId)!.lastSentAt).toBeNull();

    // While its lease lasts nobody else sends; after it (2 minutes) the survivor sends, once.
    expect(await checkReminders("survivor", now + 1000)).toBe(0);
    const later = now + 3 * 60_000;
    expect(await checkReminders("survivor", later)).toBe(1);
    expect(await checkReminders("survivor", later)).toBe(0);
    await waitForMail(keeper.email);
    await new Promise((r) => setTimeout(r, 200));
    expect(mailTo(keeper.email)).toHaveLength(1);
  }, 30_000);

  it("has List-Unsubscribe headers, and the link alone (no session) unsubscribes; a tampered token is refused", async () => {
    const { keeper, tankId } = await subscribed();
    await checkReminders("process-a", Date.now());
    const mail = await waitForMail(keeper.email);
    expect(mail.text).toMatch(/not a water test/);
    expect(mail.headers?.["list-unsubscribe-post"]).toBe("List-Unsubscribe=One-Click");
    const link = mail.links.find((l) => l.includes("/reminders/unsubscribe/"))!;
    expect(mail.headers?.["list-unsubscribe"]).toBe(`<${link}>`);
    const token = link.split("/").at(-1)!;
    const tampered = token.slice(0, -2) + (token.endsWith("AA") ? "BB" : "AA");
    expect((await call(unsubscribeLoader, get(`/reminders/unsubscribe/${tampered}`), { token: tampered })).status).toBe(
      404,
    );
    expect(
      (await call(unsubscribeAction, post(`/reminders/unsubscribe/${tampered}`, {}), { token: tampered })).status,
    ).toBe(404);
    expect(row(tankId)).toBeDefined();
    const page = await call(unsubscribeLoader, get(`/reminders/unsubscribe/${token}`), { token });
    expect(page.data.tankName).toBe("Reminder tank");
    expect(row(tankId)).toBeDefined();
    await call(unsubscribeAction, post(`/reminders/unsubscribe/${token}`, { "List-Unsubscribe": "One-Click" }), {
      token,
    });
    expect(row(tankId)).toBeUndefined();
  });

  it("refuses another keeper's tank, and a bad hour with a message by the field", async () => {
    const { tankId } = await subscribed();
    const other = await userWithCookie();
    const r = await call(
      accountAction,
      post("/account", { intent: "reminders", tankId, mode: "off", hour: 8 }, other.cookie),
    );
    expect(r.status).toBe(400);
    expect(r.data.errors.tankId).toMatch(/No such tank/);
    expect(row(tankId)).toBeDefined();
    const bad = await call(
      accountAction,
      post("/account", { intent: "reminders", tankId, mode: "weekly", hour: 24 }, other.cookie),
    );
    expect(bad.data.errors.hour).toMatch(/0 to 23/);
  });
});
