import { sql } from "drizzle-orm";
import { methodNotAllowed } from "~/http/api.server";
import { getDb } from "~/db/client.server";
import { INSTANCE } from "~/instance.server";

/** GET /api/health: the database answers a query, which version runs, and which process answers (`instance`). */
export function loader() {
  let database: "ok" | "error" = "ok";
  try {
    getDb().get(sql`select 1`);
  } catch {
    database = "error";
  }
  const ok = database === "ok";
  return Response.json(
    { status: ok ? "ok" : "degraded", version: __APP_VERSION__, instance: INSTANCE, checks: { database } },
    { status: ok ? 200 : 503, headers: { "Cache-Control": "no-store" } },
  );
}

/** Health is read-only. Any other method: 405 in the API's JSON shape. */
export function action() {
  return methodNotAllowed(["GET"]);
}
