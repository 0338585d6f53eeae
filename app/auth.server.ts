import bcrypt from "bcryptjs";
import { eq } from "drizzle-orm";
import { RateLimiterMemory } from "rate-limiter-flexible";
import { Authenticator } from "remix-auth";
import { FormStrategy } from "remix-auth-form";
import { getDb } from "~/db/client.server";
import { users } from "~/db/schema";
import { SignInSchema } from "~/utils/account-schemas";
import { fieldErrors, formValues, type FieldErrors } from "~/utils/form-errors";

/** bcrypt cost: 2^11 rounds, ~135 ms a hash on this 2-core machine; the brief asks for at least 10. */
export const BCRYPT_COST = 11;

export function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, BCRYPT_COST);
}

export function verifyPassword(password: string, hash: string): Promise<boolean> {
  return bcrypt.compare(password, hash);
}

// A hash to compare against when the e-mail is unknown, so both paths cost the same time.
const DUMMY_HASH = bcrypt.hashSync("fernwater-no-such-user", BCRYPT_COST);

/** Thrown inside the strategy; the sign-in action turns it into field errors. */
export class SignInError extends Error {
  constructor(
    readonly errors: FieldErrors,
    readonly values: Record<string, string>,
  ) {
    super(Object.values(errors)[0] ?? "Sign-in failed");
  }
}

export const authenticator = new Authenticator<{ id: number }>();

authenticator.use(
  new FormStrategy(async ({ form }) => {
    const values = formValues(form);
    delete values.password;
    const parsed = SignInSchema.safeParse(Object.fromEntries(form));
    if (!parsed.success) throw new SignInError(fieldErrors(parsed.error), values);
    const { email, password } = parsed.data;
    const user = getDb().select({ id: users.id, passwordHash: users.passwordHash }).from(users).where(eq(users.email, email)).get();
    const ok = await verifyPassword(password, user?.passwordHash ?? DUMMY_HASH);
    if (!user || !ok) {
      throw new SignInError({ password: "That e-mail and password do not match an account." }, values);
    }
    return { id: user.id };
  }),
  "password",
);

/**
 * Failed sign-ins allowed per minute, counted separately per e-mail and per client address.
 * In memory: one app process holds the counts (see README, "Scale on paper").
 */
export const SIGN_IN_ATTEMPTS_PER_MINUTE = 5;
const failedByEmail = new RateLimiterMemory({ points: SIGN_IN_ATTEMPTS_PER_MINUTE, duration: 60 });
const failedByIp = new RateLimiterMemory({ points: SIGN_IN_ATTEMPTS_PER_MINUTE, duration: 60 });

/** Seconds until this e-mail/address may try again, or 0 when a try is allowed. */
export async function signInRetryAfter(email: string, ip: string): Promise<number> {
  const [byEmail, byIp] = await Promise.all([failedByEmail.get(email), failedByIp.get(ip)]);
  const blocked = [byEmail, byIp].filter((r) => r && r.consumedPoints >= SIGN_IN_ATTEMPTS_PER_MINUTE);
  if (blocked.length === 0) return 0;
  return Math.max(1, Math.ceil(Math.max(...blocked.map((r) => r!.msBeforeNext)) / 1000));
}

/** Counts one failed attempt against the e-mail and the address. */
export async function recordFailedSignIn(email: string, ip: string): Promise<void> {
  await Promise.allSettled([failedByEmail.consume(email), failedByIp.consume(ip)]);
}

/** A successful sign-in clears the e-mail's count (not the address's). */
export async function clearFailedSignIns(email: string): Promise<void> {
  await failedByEmail.delete(email);
}
