import { and, eq, gt, isNull } from "drizzle-orm";
import { hashPassword } from "~/auth.server";
import { getDb } from "~/db/client.server";
import { passwordResetTokens, users } from "~/db/schema";
import { absoluteUrl, sendMail } from "~/email.server";
import { take } from "~/rate-limits.server";
import { revokeAllSessions } from "~/session.server";
import { hashToken, randomToken } from "~/utils/crypto.server";

const RESET_TOKEN_TTL_MS = 60 * 60 * 1000;

/**
 * Starts a reset for `email` if it has an account. The caller answers the same either way,
 * and the mail is sent after the response would go out, so timing does not reveal it either.
 */
export async function requestPasswordReset(request: Request, email: string): Promise<void> {
  const user = getDb().select({ id: users.id, name: users.name }).from(users).where(eq(users.email, email)).get();
  if (!user) return;
  // At most a few account mails an hour to one address, so the form cannot flood an inbox.
  if ((await take("accountMailsPerEmail", email)) > 0) return;
  const token = randomToken(32);
  getDb()
    .insert(passwordResetTokens)
    .values({ userId: user.id, tokenHash: hashToken(token), expiresAt: new Date(Date.now() + RESET_TOKEN_TTL_MS) })
    .run();
  const link = absoluteUrl(request, `/reset-password?token=${encodeURIComponent(token)}`);
  void sendMail({
    to: email,
    subject: "Reset your Fernwater password",
    text: [
      `Hello ${user.name},`,
      "",
      "Someone (we hope you) asked to reset the password of your Fernwater account.",
      `Open this link within an hour to choose a new one: ${link}`,
      "",
      "If you did not ask, ignore this mail: your password stays as it is.",
    ].join("\n"),
  }).catch((error: unknown) => console.error("[fernwater] could not send a password-reset mail", error));
}

/** The user id a live token belongs to (unused, unexpired), or null. Lookup is by hash. */
export function findLiveResetToken(token: string): { id: number; userId: number } | null {
  return (
    getDb()
      .select({ id: passwordResetTokens.id, userId: passwordResetTokens.userId })
      .from(passwordResetTokens)
      .where(
        and(
          eq(passwordResetTokens.tokenHash, hashToken(token)),
          isNull(passwordResetTokens.usedAt),
          gt(passwordResetTokens.expiresAt, new Date()),
        ),
      )
      .get() ?? null
  );
}

/**
 * Sets the new password and spends the token in one transaction; every session of the user
 * ends. Returns false when the token is no longer live (used meanwhile, or expired).
 */
export async function completePasswordReset(token: string, newPassword: string): Promise<boolean> {
  const live = findLiveResetToken(token);
  if (!live) return false;
  const passwordHash = await hashPassword(newPassword);
  return getDb().transaction((tx) => {
    const spent = tx
      .update(passwordResetTokens)
      .set({ usedAt: new Date() })
      .where(and(eq(passwordResetTokens.id, live.id), isNull(passwordResetTokens.usedAt)))
      .run();
    if (spent.changes !== 1) return false;
    tx.update(users).set({ passwordHash }).where(eq(users.id, live.userId)).run();
    // Any other outstanding reset links die with this one.
    spendResetLinks(tx, live.userId);
    revokeAllSessions(live.userId);
    return true;
  });
}

type Tx = Parameters<Parameters<ReturnType<typeof getDb>["transaction"]>[0]>[0];

/**
 * Spends every outstanding reset link of a user, inside the caller's transaction: a link asked
 * for before a password change must not work after it (whoever asked for it then).
 */
export function spendResetLinks(tx: Tx, userId: number): void {
  tx.update(passwordResetTokens)
    .set({ usedAt: new Date() })
    .where(and(eq(passwordResetTokens.userId, userId), isNull(passwordResetTokens.usedAt)))
    .run();
}
