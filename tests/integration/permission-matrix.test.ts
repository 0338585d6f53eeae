/**
 * Walks the permission matrix (tests/support/route-world.ts): every row, every visitor.
 */
import { beforeAll, describe, expect, it } from "vitest";
import { call } from "../support/routes";
import {
  answerOf,
  buildWorld,
  fill,
  handlerOf,
  people,
  PERMISSION_MATRIX,
  request,
  ROUTE_FILES,
  VISITORS,
  type Answer,
} from "../support/route-world";
import { signIn } from "../support/users";

beforeAll(buildWorld, 60_000);

describe("the permission matrix", () => {
  for (const row of PERMISSION_MATRIX) {
    const title = `${row.handler === "loader" ? "GET" : (row.method ?? "POST")} ${row.path} (${row.file} ${row.handler})${row.form?.intent ? ` intent=${row.form.intent}` : ""}${row.ip ? ` from ${row.ip}` : ""}`;
    it.skipIf(!ROUTE_FILES.has(row.file))(title, async () => {
      const handler = await handlerOf(row);
      const got: Answer[] = [];
      for (const who of VISITORS) {
        const person = people[who as keyof typeof people];
        let cookie = person?.cookie;
        if (row.freshSession && person) cookie = await signIn(person.email, undefined, "198.51.100.2");
        const result = await call(handler, request(row, cookie), fill(row.path).params, row.ip ?? "198.51.100.9");
        got.push(answerOf(result.status, result.location));
      }
      expect(Object.fromEntries(VISITORS.map((v, i) => [v, got[i]]))).toEqual(
        Object.fromEntries(VISITORS.map((v, i) => [v, row.expect[i]])),
      );
    });
  }

  it("has a row for every loader and action of every route in app/routes.ts", async () => {
    const missing: string[] = [];
    for (const file of ROUTE_FILES) {
      const mod = await import(/* @vite-ignore */ `../../app/${file}`);
      for (const handler of ["loader", "action"] as const) {
        if (typeof mod[handler] !== "function") continue;
        if (!PERMISSION_MATRIX.some((r) => r.file === file && r.handler === handler))
          missing.push(`${file} ${handler}`);
      }
    }
    expect(
      missing,
      "Add a row to PERMISSION_MATRIX (tests/integration/permission-matrix.test.ts) for each of these",
    ).toEqual([]);
  });
});
