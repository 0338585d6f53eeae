import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { SIGN_IN_ATTEMPTS_PER_MINUTE } from "~/auth.server";
import { getDb } from "~/db/client.server";
import { passwordResetTokens, sessions, users } from "~/db/schema";
import { action as accountAction, loader as accountLoader } from "~/routes/auth/account";
import { action as forgotAction } from "~/routes/auth/forgot-password";
import { action as resetAction, loader as resetLoader } from "~/routes/auth/reset-password";
import { action as signInAction } from "~/routes/auth/sign-in";
import { action as signOutAction } from "~/routes/auth/sign-out";
import { action as confirmAction, loader as confirmLoader } from "~/routes/auth/confirm-sign-up";
import { action as signUpAction } from "~/routes/auth/sign-up";
import { loader as tanksLoader } from "~/routes/tanks/list";
import { hashToken } from "~/utils/crypto.server";
import { mailTo, startMailFake, waitForMail } from "../support/mail";
import { call, cookieFrom, get, post } from "../support/routes";
import { createUser, signIn, TEST_PASSWORD } from "../support/users";

let stopMail: () => Promise<void>;
beforeAll(async () => {
  stopMail = (await startMailFake()).close;
});
afterAll(() => stopMail());

const goodSignUp = {
  name: "Ada Keeper",
  email: "ada@example.org",
  password: "moss ball lantern",
  confirmPassword: "moss ball lantern",
};

describe("sign-up", () => {
  /** The confirmation link mailed to `email`, opened and its button pressed: the account's first session. */
  async function confirmByMail(email: string) {
    const mail = await waitForMail(email);
    expect(mail.subject).toMatch(/Confirm your Fernwater account/);
    const link = mail.links.find((l) => l.includes("/sign-up/confirm?token="))!;
    const token = new URL(link).searchParams.get("token")!;
    const page = await call(confirmLoader, get(`/sign-up/confirm?token=${token}`));
    expect(page.data.email).toBe(email);
    return call(confirmAction, post("/sign-up/confirm", { token }));
  }

  it("mails a link that creates the account, signs in and redirects to the tanks", async () => {
    const result = await call(signUpAction, post("/sign-up", goodSignUp));
    expect(result.status).toBe(200);
    expect(result.data).toMatchObject({ sent: true, email: "ada@example.org" });
    // Nothing exists until the mail is opened.
    expect(getDb().select().from(users).where(eq(users.email, "ada@example.org")).get()).toBeUndefined();
    const confirmed = await confirmByMail("ada@example.org");
    expect(confirmed.status).toBe(302);
    expect(confirmed.location).toBe("/tanks");
    const cookie = cookieFrom(confirmed);
    expect(confirmed.headers.get("Set-Cookie")).toMatch(/HttpOnly/i);
    expect(confirmed.headers.get("Set-Cookie")).toMatch(/SameSite=Lax/i);
    const tanks = await call(tanksLoader, get("/tanks", cookie));
    expect(tanks.status).toBe(200);
    const row = getDb().select().from(users).where(eq(users.email, "ada@example.org")).get()!;
    expect(row.role).toBe("keeper");
    expect(row.emailVerifiedAt).not.toBeNull();
    // bcrypt with cost 11 ($2a$11$ / $2b$11$): the brief asks for at least 10.
    expect(row.passwordHash).toMatch(/^\$2[aby]\$11\$/);
    expect(await signIn("ada@example.org", "moss ball lantern", "198.51.100.60")).toMatch(/^__fernwater=/);
    // The link works once.
    const token = new URL(
      mailTo("ada@example.org")[0].links.find((l) => l.includes("/sign-up/confirm?token="))!,
    ).searchParams.get("token")!;
    expect((await call(confirmAction, post("/sign-up/confirm", { token }))).status).toBe(400);
    expect((await call(confirmLoader, get(`/sign-up/confirm?token=${token}`))).data.token).toBeNull();
  });

  it("answers a taken e-mail exactly as a free one, and mails its owner instead of making anything", async () => {
    const before = getDb().select().from(users).all().length;
    const taken = await call(
      signUpAction,
      post("/sign-up", { ...goodSignUp, email: "ADA@example.org", name: "Someone Else" }, undefined, {
        "X-Test": "taken",
      }),
    );
    const free = await call(
      signUpAction,
      post("/sign-up", { ...goodSignUp, email: "brand-new@example.org", name: "Someone Else" }),
    );
    // OWASP Authentication Cheat Sheet: account enumeration through registration.
    expect(taken.status).toBe(free.status);
    expect({ ...taken.data, email: "" }).toEqual({ ...free.data, email: "" });
    expect(getDb().select().from(users).all().length).toBe(before);
    const note = await waitForMail("ada@example.org").then(() =>
      mailTo("ada@example.org").find((m) => /already have/.test(m.subject)),
    );
    await expect
      .poll(() => mailTo("ada@example.org").some((m) => /You already have a Fernwater account/.test(m.subject)))
      .toBe(true);
    expect(note === undefined || /sign-in/.test(note.text)).toBe(true);
    expect(
      mailTo("ada@example.org").some(
        (m) => m.links.some((l) => l.includes("/sign-up/confirm")) && /Someone Else/.test(m.text),
      ),
    ).toBe(false);
  });

  it("goes back to where sign-up started once the account is confirmed", async () => {
    await call(
      signUpAction,
      post("/sign-up", { ...goodSignUp, email: "returning@example.org", redirectTo: "/s/some-share-token" }),
    );
    const confirmed = await confirmByMail("returning@example.org");
    expect(confirmed.location).toBe("/s/some-share-token");
  });

  it.each([
    [{ password: "short", confirmPassword: "short" }, "password", /at least 10/],
    [{ password: "password123", confirmPassword: "password123" }, "password", /too common/],
    [{ password: "aaaaaaaaaaaa", confirmPassword: "aaaaaaaaaaaa" }, "password", /too easy/],
    [{ confirmPassword: "something else" }, "confirmPassword", /differ/],
    [{ email: "not-an-email" }, "email", /e-mail address like/],
    [{ name: "" }, "name", /what to call you/],
  ])("refuses weak or malformed input %#", async (change, field, message) => {
    const before = getDb().select().from(users).all().length;
    const result = await call(signUpAction, post("/sign-up", { ...goodSignUp, email: "new@example.org", ...change }));
    expect(result.status).toBe(400);
    expect(result.data.errors[field]).toMatch(message);
    expect(getDb().select().from(users).all().length).toBe(before);
  });

  it("answers 400, not 500, to a form with missing fields", async () => {
    const result = await call(signUpAction, post("/sign-up", {}));
    expect(result.status).toBe(400);
    expect(Object.keys(result.data.errors)).toEqual(expect.arrayContaining(["name", "email", "password"]));
  });
});

describe("sign-in and sign-out", () => {
  it("rotates the session id at sign-in and ends it at sign-out", async () => {
    const user = await createUser();
    const first = await signIn(user.email);
    const second = await call(signInAction, post("/sign-in", { email: user.email, password: TEST_PASSWORD }, first));
    const secondCookie = cookieFrom(second);
    expect(secondCookie).not.toBe(first);
    // The first session row was replaced, not kept beside the new one.
    expect((await call(tanksLoader, get("/tanks", first))).status).toBe(302);
    expect((await call(tanksLoader, get("/tanks", secondCookie))).status).toBe(200);

    const out = await call(signOutAction, post("/sign-out", {}, secondCookie));
    expect(out.status).toBe(302);
    const after = await call(tanksLoader, get("/tanks", secondCookie));
    expect(after.status).toBe(302);
    expect(after.location).toMatch(/^\/sign-in\?redirectTo=%2Ftanks/);
  });

  it("gives one message for an unknown e-mail and a wrong password", async () => {
    const user = await createUser();
    const wrong = await call(
      signInAction,
      post("/sign-in", { email: user.email, password: "not the password" }),
      {},
      "198.51.100.1",
    );
    const unknown = await call(
      signInAction,
      post("/sign-in", { email: "nobody@example.org", password: "whatever it is" }),
      {},
      "198.51.100.2",
    );
    expect(wrong.status).toBe(400);
    expect(unknown.status).toBe(400);
    expect(wrong.data.errors.password).toBe(unknown.data.errors.password);
  });

  it("only redirects back to paths on this site", async () => {
    const user = await createUser();
    const result = await call(
      signInAction,
      post("/sign-in", { email: user.email, password: TEST_PASSWORD, redirectTo: "//evil.example/x" }),
    );
    expect(result.location).toBe("/tanks");
  });

  it(`limits failed attempts to ${SIGN_IN_ATTEMPTS_PER_MINUTE} a minute per e-mail, with a clear message`, async () => {
    const user = await createUser();
    for (let i = 0; i < SIGN_IN_ATTEMPTS_PER_MINUTE; i++) {
      const r = await call(
        signInAction,
        post("/sign-in", { email: user.email, password: "wrong wrong wrong" }),
        {},
        `192.0.2.${i + 10}`,
      );
      expect(r.status).toBe(400);
    }
    // Even the right password is refused while the limit holds.
    const blocked = await call(
      signInAction,
      post("/sign-in", { email: user.email, password: TEST_PASSWORD }),
      {},
      "192.0.2.99",
    );
    expect(blocked.status).toBe(429);
    expect(blocked.data.errors[""]).toMatch(/Too many failed sign-in attempts\. Wait \d+ seconds?/);
  });

  it("limits failed attempts per address across e-mails", async () => {
    const ip = "192.0.2.200";
    for (let i = 0; i < SIGN_IN_ATTEMPTS_PER_MINUTE; i++) {
      await call(signInAction, post("/sign-in", { email: `nobody${i}@example.org`, password: "wrong wrong" }), {}, ip);
    }
    const other = await createUser();
    const blocked = await call(signInAction, post("/sign-in", { email: other.email, password: TEST_PASSWORD }), {}, ip);
    expect(blocked.status).toBe(429);
    expect(blocked.data.errors[""]).toMatch(/Too many/);
  });
});

describe("forgot and reset password", () => {
  it("mails a single-use link that sets a new password and ends old sessions", async () => {
    const user = await createUser();
    const oldCookie = await signIn(user.email);
    const asked = await call(forgotAction, post("/forgot-password", { email: user.email.toUpperCase() }));
    expect(asked.status).toBe(200);
    expect(asked.data.sent).toBe(true);

    const mail = await waitForMail(user.email);
    const link = mail.links.find((l) => l.includes("/reset-password?token="))!;
    expect(link).toBeTruthy();
    const token = new URL(link).searchParams.get("token")!;
    // Stored hashed, never in the clear.
    const stored = getDb().select().from(passwordResetTokens).where(eq(passwordResetTokens.userId, user.id)).all();
    expect(stored.map((s) => s.tokenHash)).toContain(hashToken(token));
    expect(stored.map((s) => s.tokenHash)).not.toContain(token);
    // One hour to live.
    const ttl = stored[0].expiresAt.getTime() - stored[0].createdAt.getTime();
    expect(Math.abs(ttl - 3600_000)).toBeLessThan(5_000);

    expect((await call(resetLoader, get(`/reset-password?token=${token}`))).data.token).toBe(token);
    const reset = await call(
      resetAction,
      post("/reset-password", { token, password: "new fern password", confirmPassword: "new fern password" }),
    );
    expect(reset.status).toBe(302);
    expect(reset.location).toBe("/sign-in?reset=1");

    expect((await call(tanksLoader, get("/tanks", oldCookie))).status).toBe(302);
    await expect(signIn(user.email)).rejects.toThrow();
    expect(await signIn(user.email, "new fern password")).toMatch(/^__fernwater=/);

    // Single use.
    const again = await call(
      resetAction,
      post("/reset-password", { token, password: "another password 1", confirmPassword: "another password 1" }),
    );
    expect(again.status).toBe(400);
    expect((await call(resetLoader, get(`/reset-password?token=${token}`))).data.token).toBeNull();
  });

  it("answers the same for an address with no account, and sends nothing", async () => {
    const result = await call(forgotAction, post("/forgot-password", { email: "ghost@example.org" }));
    expect(result.status).toBe(200);
    expect(result.data).toEqual({ sent: true, email: "ghost@example.org" });
    await new Promise((r) => setTimeout(r, 200));
    expect(mailTo("ghost@example.org")).toHaveLength(0);
  });

  it("refuses an expired token", async () => {
    const user = await createUser();
    const token = "expired-token-0123456789";
    getDb()
      .insert(passwordResetTokens)
      .values({ userId: user.id, tokenHash: hashToken(token), expiresAt: new Date(Date.now() - 1000) })
      .run();
    const result = await call(
      resetAction,
      post("/reset-password", { token, password: "new fern password", confirmPassword: "new fern password" }),
    );
    expect(result.status).toBe(400);
    expect(result.data.errors[""]).toMatch(/expired or was already used/);
  });
});

describe("account", () => {
  it("ends a reset link asked for before a password change", async () => {
    const user = await createUser();
    const cookie = await signIn(user.email, TEST_PASSWORD, "198.51.100.70");
    await call(forgotAction, post("/forgot-password", { email: user.email }));
    const link = (await waitForMail(user.email)).links.find((l) => l.includes("/reset-password?token="))!;
    const token = new URL(link).searchParams.get("token")!;
    const changed = await call(
      accountAction,
      post(
        "/account",
        {
          intent: "password",
          currentPassword: TEST_PASSWORD,
          password: "changed password 7",
          confirmPassword: "changed password 7",
        },
        cookie,
      ),
    );
    expect(changed.status).toBe(302);
    // The old link is dead on the page and in the action: whoever holds it cannot take the account.
    expect((await call(resetLoader, get(`/reset-password?token=${token}`))).data.token).toBeNull();
    const used = await call(
      resetAction,
      post("/reset-password", { token, password: "attacker password 1", confirmPassword: "attacker password 1" }),
    );
    expect(used.status).toBe(400);
    expect(await signIn(user.email, "changed password 7", "198.51.100.71")).toMatch(/^__fernwater=/);
  });

  it("saves unit preferences", async () => {
    const user = await createUser();
    const cookie = await signIn(user.email);
    const saved = await call(
      accountAction,
      post(
        "/account",
        {
          intent: "preferences",
          name: "Kim",
          volumeUnit: "usgal",
          temperatureUnit: "F",
          nitrateUnit: "N",
          khUnit: "CaCO3",
        },
        cookie,
      ),
    );
    expect(saved.status).toBe(302);
    const page = await call(accountLoader, get("/account", cookie));
    expect(page.data.user).toMatchObject({
      name: "Kim",
      volumeUnit: "usgal",
      temperatureUnit: "F",
      nitrateUnit: "N",
      khUnit: "CaCO3",
    });
  });

  it("refuses an unknown unit beside its field", async () => {
    const user = await createUser();
    const cookie = await signIn(user.email);
    const bad = await call(
      accountAction,
      post(
        "/account",
        {
          intent: "preferences",
          name: "Kim",
          volumeUnit: "barrels",
          temperatureUnit: "C",
          nitrateUnit: "NO3",
          khUnit: "dKH",
        },
        cookie,
      ),
    );
    expect(bad.status).toBe(400);
    expect(bad.data.errors.volumeUnit).toMatch(/volume unit/);
  });

  it("changes the password, ends other sessions and keeps this one signed in", async () => {
    const user = await createUser();
    const here = await signIn(user.email);
    const elsewhere = await signIn(user.email, TEST_PASSWORD, "203.0.113.50");
    const wrong = await call(
      accountAction,
      post(
        "/account",
        {
          intent: "password",
          currentPassword: "nope nope",
          password: "fresh password 9",
          confirmPassword: "fresh password 9",
        },
        here,
      ),
    );
    expect(wrong.data.errors.currentPassword).toMatch(/not your current password/);
    const changed = await call(
      accountAction,
      post(
        "/account",
        {
          intent: "password",
          currentPassword: TEST_PASSWORD,
          password: "fresh password 9",
          confirmPassword: "fresh password 9",
        },
        here,
      ),
    );
    expect(changed.status).toBe(302);
    const rotated = cookieFrom(changed);
    expect((await call(tanksLoader, get("/tanks", elsewhere))).status).toBe(302);
    expect((await call(tanksLoader, get("/tanks", here))).status).toBe(302);
    expect((await call(tanksLoader, get("/tanks", rotated))).status).toBe(200);
    expect(getDb().select().from(sessions).where(eq(sessions.userId, user.id)).all()).toHaveLength(1);
  });
});
