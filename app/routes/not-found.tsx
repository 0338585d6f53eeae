import { data } from "react-router";
import type { Route } from "./+types/not-found";

export const meta: Route.MetaFunction = () => [{ title: "Page not found · Fernwater" }];

/** Any address no route claims: a 404 drawn by the root error page. */
export function loader() {
  throw data({ message: "Not found" }, { status: 404 });
}

export function action() {
  throw data({ message: "Not found" }, { status: 404 });
}

export default function NotFoundPage() {
  return null;
}
