import type { Route } from "./+types/feed";
import { calendarFor } from "~/features/journal/calendar-feed.server";

/** GET /calendar/:token.ics — a tank's maintenance calendar (RFC 5545) for anyone holding the secret address. */
export async function loader({ params }: Route.LoaderArgs) {
  const token = (params.token ?? "").replace(/\.ics$/, "");
  const body = /^[A-Za-z0-9_-]{16,100}$/.test(token) ? calendarFor(token) : null;
  if (body === null)
    return new Response("No such calendar.", { status: 404, headers: { "Content-Type": "text/plain; charset=utf-8" } });
  return new Response(body, {
    headers: {
      "Content-Type": "text/calendar; charset=utf-8",
      "Cache-Control": "no-store",
      "Referrer-Policy": "no-referrer",
    },
  });
}
