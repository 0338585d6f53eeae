import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { action as accountAction } from "~/routes/auth/account";
import { action as forgotAction } from "~/routes/auth/forgot-password";
import { action as signInAction } from "~/routes/auth/sign-in";
import { action as confirmAction } from "~/routes/auth/confirm-sign-up";
import { action as signUpAction } from "~/routes/auth/sign-up";
import { startMailFake, waitForMail } from "../support/mail";
import { call, cookieFrom, post } from "../support/routes";

// OWASP Logging Cheat Sheet: passwords and session ids are never written to logs. Everything
// the app prints while accounts are made, used and changed is captured and searched.
const printed: string[] = [];
// console.error is already watched by tests/setup (any call fails the test); these are the rest.
const methods = ["log", "info", "warn", "debug"] as const;
const spies: { mockRestore: () => void }[] = [];

beforeEach(() => {
  for (const m of methods)
    spies.push(
      vi.spyOn(console, m).mockImplementation((...args: unknown[]) => void printed.push(args.map(String).join(" "))),
    );
  const write = process.stdout.write.bind(process.stdout);
  spies.push(
    vi.spyOn(process.stdout, "write").mockImplementation(((chunk: string | Uint8Array, ...rest: unknown[]) => {
      printed.push(String(chunk));
      return (write as (...a: unknown[]) => boolean)(chunk, ...rest);
    }) as typeof process.stdout.write),
  );
});
afterEach(() => spies.splice(0).forEach((s) => s.mockRestore()));

describe("secrets stay out of the logs", () => {
  it("prints no password or session id while signing up, failing and succeeding to sign in, and changing the password", async () => {
    const stop = (await startMailFake()).close;
    const first = "first secret passphrase 41";
    const second = "second secret passphrase 42";
    await call(
      signUpAction,
      post("/sign-up", { name: "Quiet", email: "quiet@example.org", password: first, confirmPassword: first }),
    );
    const link = (await waitForMail("quiet@example.org")).links.find((l) => l.includes("/sign-up/confirm?token="))!;
    const up = await call(confirmAction, post("/sign-up/confirm", { token: new URL(link).searchParams.get("token")! }));
    const cookie = cookieFrom(up);
    await call(
      signInAction,
      post("/sign-in", { email: "quiet@example.org", password: "wrong " + first }),
      {},
      "192.0.2.77",
    );
    await call(signInAction, post("/sign-in", { email: "quiet@example.org", password: first }), {}, "192.0.2.78");
    await call(
      accountAction,
      post(
        "/account",
        { intent: "password", currentPassword: first, password: second, confirmPassword: second },
        cookie,
      ),
    );
    await call(forgotAction, post("/forgot-password", { email: "quiet@example.org" }));
    await new Promise((r) => setTimeout(r, 300));
    await stop();
    const all = printed.join("\n");
    expect(all).not.toContain(first);
    expect(all).not.toContain(second);
    expect(all).not.toContain(cookie.split("=")[1]);
  });
});
