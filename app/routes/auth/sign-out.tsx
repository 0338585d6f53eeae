import { redirect } from "react-router";
import type { Route } from "./+types/sign-out";
import { destroyUserSession } from "~/session.server";

/** Signing out is a POST (a link or prefetch must not sign anyone out). */
export function loader() {
  return redirect("/");
}

export async function action({ request }: Route.ActionArgs) {
  return destroyUserSession(request, "/");
}
