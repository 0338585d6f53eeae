/**
 * Guards: call at the top of every loader and action that needs them. They throw a
 * redirect or an error response, so the code after them can assume the check passed.
 * A parent layout's loader does not protect a child's action: each route calls its own.
 */
import { data, redirect } from "react-router";
import type { Role } from "~/db/schema";
import { getSessionUser, type SessionUser } from "~/session.server";

/** The signed-in user, or a redirect to sign-in that comes back here afterwards. */
export async function requireUser(request: Request): Promise<SessionUser> {
  const user = await getSessionUser(request);
  if (!user) {
    const url = new URL(request.url);
    const back = url.pathname + url.search;
    throw redirect(`/sign-in?redirectTo=${encodeURIComponent(back)}`);
  }
  return user;
}

/** Roles in order of reach: an admin may do what an educator may, an educator what a keeper may. */
const RANK: Record<Role, number> = { keeper: 0, educator: 1, admin: 2 };

export function hasRole(user: Pick<SessionUser, "role">, role: Role): boolean {
  return RANK[user.role] >= RANK[role];
}

/** The signed-in user holding at least `role`; anyone else gets the 403 page. */
export async function requireRole(request: Request, role: Role): Promise<SessionUser> {
  const user = await requireUser(request);
  if (!hasRole(user, role)) {
    throw data({ message: `This page is for ${role}s only.` }, { status: 403 });
  }
  return user;
}

/** API flavour of requireUser: a JSON 401 instead of a redirect. */
export async function requireApiUser(request: Request): Promise<SessionUser> {
  const user = await getSessionUser(request);
  if (!user) {
    throw Response.json({ status: 401, error: "Sign in first: this API uses your session cookie." }, { status: 401 });
  }
  return user;
}

/** A private thing of someone else answers 404, so its existence does not leak. */
export function notFound(message = "Not found"): never {
  throw data({ message }, { status: 404 });
}
