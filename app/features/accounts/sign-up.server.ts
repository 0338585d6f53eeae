/**
 * Sign-up that does not tell who has an account. The form always answers "check your mail":
 * a new address gets a link that makes the account (so an account is only ever made by someone
 * who reads that mailbox), an address that already has an account gets a note saying so, with
 * links to sign in or reset the password. Both paths hash the password, so they take the same time.
 */
import { and, eq, gt, isNull, lt } from "drizzle-orm";
import { hashPassword } from "~/auth.server";
import { getDb } from "~/db/client.server";
import { signUpRequests, users } from "~/db/schema";
import { absoluteUrl, sendMail } from "~/email.server";
import { take } from "~/rate-limits.server";
import { hashToken, randomToken } from "~/utils/crypto.server";
import { safeRedirect } from "~/utils/safe-redirect";

export const SIGN_UP_LINK_HOURS = 24;

function mailInBackground(mail: Parameters<typeof sendMail>[0], what: string) {
  void sendMail(mail).catch((error: unknown) => console.error(`[fernwater] could not send ${what}`, error));
}

/** Starts a sign-up; resolves when the answer may go out (mail is sent after). */
export async function requestSignUp(
  request: Request,
  input: { name: string; email: string; password: string; redirectTo: string },
): Promise<void> {
  const passwordHash = await hashPassword(input.password);
  const db = getDb();
  const existing = db.select({ id: users.id, name: users.name }).from(users).where(eq(users.email, input.email)).get();
  // A few account mails an hour per address: the form cannot flood an inbox.
  if ((await take("accountMailsPerEmail", input.email)) > 0) return;
  if (existing) {
    mailInBackground(
      {
        to: input.email,
        subject: "You already have a Fernwater account",
        text: [
          `Hello ${existing.name},`,
          "",
          "Someone (we hope you) tried to create a Fernwater account with this address, which already has one.",
          `Sign in here: ${absoluteUrl(request, "/sign-in")}`,
          `Forgot the password? Choose a new one here: ${absoluteUrl(request, "/forgot-password")}`,
          "",
          "If it was not you, ignore this mail: nothing has changed.",
        ].join("\n"),
      },
      "a sign-up note",
    );
    return;
  }
  const token = randomToken(32);
  db.transaction((tx) => {
    tx.delete(signUpRequests).where(lt(signUpRequests.expiresAt, new Date())).run();
    tx.insert(signUpRequests)
      .values({
        email: input.email,
        name: input.name,
        passwordHash,
        tokenHash: hashToken(token),
        redirectTo: safeRedirect(input.redirectTo),
        expiresAt: new Date(Date.now() + SIGN_UP_LINK_HOURS * 3600_000),
      })
      .run();
  });
  mailInBackground(
    {
      to: input.email,
      subject: "Confirm your Fernwater account",
      text: [
        `Hello ${input.name},`,
        "",
        `Open this link within ${SIGN_UP_LINK_HOURS} hours to finish creating your Fernwater account:`,
        absoluteUrl(request, `/sign-up/confirm?token=${encodeURIComponent(token)}`),
        "",
        "If you did not sign up, ignore this mail: no account is made.",
      ].join("\n"),
    },
    "a sign-up confirmation",
  );
}

const TOKEN = /^[A-Za-z0-9_-]{16,128}$/;

/** The sign-up a live link belongs to (unused, unexpired), or null. */
export function findSignUpRequest(token: string | null | undefined) {
  if (!token || !TOKEN.test(token)) return null;
  return (
    getDb()
      .select({ id: signUpRequests.id, email: signUpRequests.email, name: signUpRequests.name })
      .from(signUpRequests)
      .where(
        and(
          eq(signUpRequests.tokenHash, hashToken(token)),
          isNull(signUpRequests.usedAt),
          gt(signUpRequests.expiresAt, new Date()),
        ),
      )
      .get() ?? null
  );
}

export type ConfirmOutcome = { ok: true; userId: number; redirectTo: string } | { ok: false; message: string };

/** Makes the account of a live link, in one transaction; the link and any other pending sign-up of the address die. */
export function confirmSignUp(token: string): ConfirmOutcome {
  return getDb().transaction((tx) => {
    if (!TOKEN.test(token)) return { ok: false, message: "This link has expired or was already used. Sign up again." };
    const pending = tx
      .select()
      .from(signUpRequests)
      .where(
        and(
          eq(signUpRequests.tokenHash, hashToken(token)),
          isNull(signUpRequests.usedAt),
          gt(signUpRequests.expiresAt, new Date()),
        ),
      )
      .get();
    if (!pending) return { ok: false, message: "This link has expired or was already used. Sign up again." };
    tx.update(signUpRequests).set({ usedAt: new Date() }).where(eq(signUpRequests.email, pending.email)).run();
    // The unique index settles a race with another sign-up of the same address.
    const created = tx
      .insert(users)
      .values({
        name: pending.name,
        email: pending.email,
        passwordHash: pending.passwordHash,
        emailVerifiedAt: new Date(),
      })
      .onConflictDoNothing()
      .returning({ id: users.id })
      .get();
    if (!created)
      return { ok: false, message: "This address already has an account. Sign in, or reset your password." };
    return { ok: true, userId: created.id, redirectTo: safeRedirect(pending.redirectTo) };
  });
}
