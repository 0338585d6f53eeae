import { eq } from "drizzle-orm";
import { hashPassword } from "~/auth.server";
import { getDb } from "~/db/client.server";
import { type Role, users } from "~/db/schema";
import { action as signInAction } from "~/routes/auth/sign-in";
import { call, cookieFrom, post } from "./routes";

export const TEST_PASSWORD = "correct horse battery";

let counter = 0;

/** Creates a user directly in the database; returns its id and e-mail. */
export async function createUser(role: Role = "keeper", name = "Test Keeper"): Promise<{ id: number; email: string }> {
  const email = `user${++counter}-${role}@example.org`;
  const row = getDb()
    .insert(users)
    .values({ email, name, role, passwordHash: await hashPassword(TEST_PASSWORD) })
    .returning({ id: users.id })
    .get();
  return { id: row.id, email };
}

/** Signs in through the real sign-in action and returns the session cookie. */
export async function signIn(email: string, password = TEST_PASSWORD, ip?: string): Promise<string> {
  const result = await call(signInAction, post("/sign-in", { email, password }), {}, ip);
  if (result.status !== 302) throw new Error(`sign-in failed: ${result.status} ${JSON.stringify(result.data)}`);
  return cookieFrom(result);
}

export async function userWithCookie(role: Role = "keeper") {
  const user = await createUser(role);
  return { ...user, cookie: await signIn(user.email) };
}

export function roleOf(id: number): Role | undefined {
  return getDb().select({ role: users.role }).from(users).where(eq(users.id, id)).get()?.role;
}
