import { apiError } from "~/http/api.server";

/** Any address under /api that is not a route: the API's JSON 404, whatever the method. */
export function loader() {
  return apiError(404, "There is no such API route. The routes are listed in docs/api.md.");
}

export function action() {
  return apiError(404, "There is no such API route. The routes are listed in docs/api.md.");
}
