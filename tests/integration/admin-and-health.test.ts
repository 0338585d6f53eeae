import os from "node:os";
import { describe, expect, it } from "vitest";
import { action as adminAction, loader as adminLoader } from "~/routes/admin/users";
import { loader as healthLoader } from "~/routes/api/health";
import { loader as devMailLoader } from "~/routes/dev/mail";
import { loader as notFoundLoader } from "~/routes/not-found";
import { loader as tanksLoader } from "~/routes/tanks/list";
import { call, get, post } from "../support/routes";
import { roleOf, userWithCookie } from "../support/users";

describe("admin: users and roles", () => {
  it("sends anonymous visitors to sign in and refuses keepers and educators with 403", async () => {
    expect((await call(adminLoader, get("/admin"))).status).toBe(302);
    const keeper = await userWithCookie("keeper");
    const educator = await userWithCookie("educator");
    expect((await call(adminLoader, get("/admin", keeper.cookie))).status).toBe(403);
    expect((await call(adminLoader, get("/admin", educator.cookie))).status).toBe(403);
    // The action is guarded on its own, not only by the page.
    const forged = await call(
      adminAction,
      post("/admin", { intent: "role", userId: keeper.id, role: "admin" }, keeper.cookie),
    );
    expect(forged.status).toBe(403);
    expect(roleOf(keeper.id)).toBe("keeper");
  });

  it("lets an admin change a role, effective on that user's next request", async () => {
    const admin = await userWithCookie("admin");
    const keeper = await userWithCookie("keeper");
    expect((await call(adminLoader, get("/admin", keeper.cookie))).status).toBe(403);
    const list = await call(adminLoader, get("/admin", admin.cookie));
    expect(list.data.users.map((u: { id: number }) => u.id)).toContain(keeper.id);
    const changed = await call(
      adminAction,
      post("/admin", { intent: "role", userId: keeper.id, role: "admin" }, admin.cookie),
    );
    expect(changed.status).toBe(200);
    expect((await call(adminLoader, get("/admin", keeper.cookie))).status).toBe(200);
  });

  it("refuses bad input with a message, and an admin demoting themself", async () => {
    const admin = await userWithCookie("admin");
    const bad = await call(
      adminAction,
      post("/admin", { intent: "role", userId: "abc", role: "wizard" }, admin.cookie),
    );
    expect(bad.status).toBe(400);
    expect(bad.data.errors.role).toMatch(/keeper, educator or admin/);
    const self = await call(
      adminAction,
      post("/admin", { intent: "role", userId: admin.id, role: "keeper" }, admin.cookie),
    );
    expect(self.status).toBe(400);
    expect(roleOf(admin.id)).toBe("admin");
  });
});

describe("health, 404 and the local mail page", () => {
  it("reports the database and version", async () => {
    const result = await call(healthLoader, get("/api/health"));
    expect(result.status).toBe(200);
    expect(result.data).toEqual({
      status: "ok",
      version: "test",
      instance: `${os.hostname()}:${process.pid}`,
      checks: { database: "ok" },
    });
  });

  it("answers unknown addresses with 404", async () => {
    expect((await call(notFoundLoader, get("/no/such/page"))).status).toBe(404);
  });

  it("shows captured mail in local mode to this machine only", async () => {
    // As a browser on this machine asks: by a loopback name.
    const local = (headers: Record<string, string> = {}) =>
      get("/dev/mail", undefined, { Host: "localhost:5173", ...headers });
    const result = await call(devMailLoader, local(), {}, "127.0.0.1");
    expect(result.status).toBe(200);
    expect(Array.isArray(result.data.messages)).toBe(true);
    expect((await call(devMailLoader, local(), {}, "::1")).status).toBe(200);
    expect((await call(devMailLoader, local(), {}, "::ffff:127.0.0.1")).status).toBe(200);
    // Another machine, or a proxy on this machine passing on another machine's request: 404.
    expect((await call(devMailLoader, local(), {}, "192.0.2.2")).status).toBe(404);
    expect((await call(devMailLoader, local(), {}, "::ffff:192.0.2.2")).status).toBe(404);
    expect((await call(devMailLoader, local({ "X-Forwarded-For": "203.0.113.5" }), {}, "127.0.0.1")).status).toBe(404);
    expect((await call(devMailLoader, local({ Forwarded: "for=203.0.113.5" }), {}, "127.0.0.1")).status).toBe(404);
  });

  // DNS rebinding (a known attack on servers bound to 127.0.0.1, the reason for Vite's
  // server.allowedHosts; from memory): another site points its name at 127.0.0.1, so the
  // connection is loopback with no forwarding header, but the browser names that site as Host.
  it.each([
    ["localhost:5173", 200],
    ["LOCALHOST", 200],
    ["127.0.0.1:5173", 200],
    ["127.8.9.10", 200],
    ["[::1]:5173", 200],
    ["app.localhost:5173", 200],
    ["rebind.example:5173", 404],
    ["localhost.rebind.example", 404],
    ["127.0.0.1.nip.example", 404],
    ["[::2]:5173", 404],
    ["", 404],
  ] as const)("answers captured mail asked for as Host %j from loopback with %i", async (host, status) => {
    const asked = get("/dev/mail", undefined, { Host: host });
    expect((await call(devMailLoader, asked, {}, "127.0.0.1")).status).toBe(status);
  });

  it("refuses a loopback request that names another site in X-Forwarded-Host", async () => {
    const asked = get("/dev/mail", undefined, { Host: "localhost:5173", "X-Forwarded-Host": "rebind.example" });
    expect((await call(devMailLoader, asked, {}, "127.0.0.1")).status).toBe(404);
  });

  it("redirects an anonymous visitor of a private page to sign-in and back", async () => {
    const result = await call(tanksLoader, get("/tanks?x=1"));
    expect(result.location).toBe("/sign-in?redirectTo=%2Ftanks%3Fx%3D1");
  });
});
