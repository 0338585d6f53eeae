import { count, eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "~/db/client.server";
import { runs, scenarios, sharePreviews, shareLinks, tanks, users } from "~/db/schema";
import { action as adminLinksAction, loader as adminLinksLoader } from "~/routes/admin/links";
import { loader as adminLinkLoader } from "~/routes/admin/link";
import { action as manageAction, loader as manageLoader } from "~/routes/share/manage";
import { loader as previewLoader } from "~/routes/share/preview-image";
import { action as publicAction, loader as publicLoader, meta as publicMeta, middleware } from "~/routes/share/public";
import { hashToken } from "~/utils/crypto.server";
import { RUNS_IN_FLIGHT_PER_PERSON } from "~/features/runs/run-gate.server";
import { unpackSeries } from "~/features/runs/series-packing";
import { call, get, post, ORIGIN } from "../support/routes";
import { createScenario, createTank } from "../support/tanks";
import { userWithCookie } from "../support/users";

async function sharedScenario(input = {}) {
  const owner = await userWithCookie();
  const tankId = createTank(owner.id, "Hall tank");
  const scenarioId = await createScenario(owner.id, tankId, { run: { lengthDays: 40 }, ...input }, "Fewer meals");
  const params = { tankId: String(tankId), scenarioId: String(scenarioId) };
  const path = `/tanks/${tankId}/scenarios/${scenarioId}/share`;
  const turnOn = async () => {
    const made = await call(manageAction, post(path, { intent: "make" }, owner.cookie), params);
    expect(made.status).toBe(200);
    const token = new URL(made.data.url).pathname.split("/").pop()!;
    return token;
  };
  return { owner, tankId, scenarioId, params, path, turnOn };
}

const open = (token: string, cookie?: string) => call(publicLoader, get(`/s/${token}`, cookie), { token });

/** Runs the share route's middleware as the router would, with a stand-in for the rest of the request. */
async function throughMiddleware(
  token: string,
  headers: Record<string, string> = {},
  variant: "data" | "html" = "data",
) {
  let rendered = 0;
  const request = new Request(`${ORIGIN}/s/${token}${variant === "data" ? ".data" : ""}`, { headers });
  const response = (await middleware[0](
    { request, params: { token }, context: undefined as never } as never,
    async () => {
      rendered++;
      return new Response("<html>page</html>", { status: 200, headers: { "Content-Type": "text/html" } });
    },
  )) as Response;
  return { response, rendered };
}

/** The chart series a read-only view sends (packed into strings on the wire). */
const seriesOf = (view: { results: { packedSeries: Parameters<typeof unpackSeries>[0] } }) =>
  unpackSeries(view.results.packedSeries);

describe("share links: the owner's controls", () => {
  it("makes a link with an unguessable token stored only as its hash", async () => {
    const { turnOn, scenarioId } = await sharedScenario();
    const token = await turnOn();
    // 32 random bytes in base64url: 43 characters, 256 bits (the issue asks for at least 128).
    expect(token).toMatch(/^[A-Za-z0-9_-]{43}$/);
    const rows = getDb().select().from(shareLinks).where(eq(shareLinks.scenarioId, scenarioId)).all();
    expect(rows).toHaveLength(1);
    expect(rows[0].tokenHash).toBe(hashToken(token));
    expect(JSON.stringify(rows)).not.toContain(token);
    expect(String(rows[0].id)).not.toBe(token);
  });

  it("turns a link off (the old address answers 404) and makes a new one (the old one dies)", async () => {
    const { owner, turnOn, path, params } = await sharedScenario();
    const first = await turnOn();
    expect((await open(first)).status).toBe(200);
    const second = await turnOn();
    expect(second).not.toBe(first);
    expect((await open(first)).status).toBe(404);
    expect((await open(second)).status).toBe(200);
    const state = await call(manageLoader, get(path, owner.cookie), params);
    expect(state.data.live).not.toBeNull();
    const off = await call(manageAction, post(path, { intent: "off" }, owner.cookie), params);
    expect(off.status).toBe(200);
    expect((await open(second)).status).toBe(404);
    expect((await call(manageLoader, get(path, owner.cookie), params)).data.live).toBeNull();
    // Nothing left to turn off: a message, not a 500.
    const again = await call(manageAction, post(path, { intent: "off" }, owner.cookie), params);
    expect(again.status).toBe(400);
    const nonsense = await call(manageAction, post(path, { intent: "publish-everything" }, owner.cookie), params);
    expect(nonsense.status).toBe(400);
  });

  it("answers 404 to another keeper and sends anonymous visitors to sign in", async () => {
    const { path, params } = await sharedScenario();
    const other = await userWithCookie();
    expect((await call(manageLoader, get(path, other.cookie), params)).status).toBe(404);
    expect((await call(manageAction, post(path, { intent: "make" }, other.cookie), params)).status).toBe(404);
    const anon = await call(manageAction, post(path, { intent: "make" }), params);
    expect(anon.status).toBe(302);
    expect(anon.location).toMatch(/^\/sign-in\?redirectTo=/);
  });
});

describe("share links: the public page", () => {
  it("shows the results read-only to anyone, in metric and nitrate as NO3 when anonymous", async () => {
    const { turnOn } = await sharedScenario();
    const token = await turnOn();
    const page = await open(token);
    expect(page.status).toBe(200);
    expect(page.data.name).toBe("Fewer meals");
    expect(page.data.viewer).toBeNull();
    expect(page.data.view.results.labels.nitrate).toBe("mg/L NO3");
    expect(seriesOf(page.data.view).t.length).toBeGreaterThan(40);
    expect(
      page.data.view.settings.sections.find((s: { id: string }) => s.id === "water").fields.length,
    ).toBeGreaterThan(3);
    // Nothing about the owner or their tank travels to the page.
    expect(JSON.stringify(page.data)).not.toContain("Hall tank");
    expect(JSON.stringify(page.data)).not.toMatch(/@example\.org/);
  });

  it("uses a signed-in viewer's own units", async () => {
    const { turnOn } = await sharedScenario({ water: { startNitrate: 10 } });
    const token = await turnOn();
    const viewer = await userWithCookie();
    getDb().update(users).set({ nitrateUnit: "N" }).where(eq(users.id, viewer.id)).run();
    const asN = await open(token, viewer.cookie);
    const asNo3 = await open(token);
    expect(asN.data.view.results.labels.nitrate).toBe("mg/L NO3-N");
    // Molar masses (references §3): mg/L as NO3 = mg/L as N × 4.4268 (1 / 0.22590).
    expect(seriesOf(asNo3.data.view).no3[0] / seriesOf(asN.data.view).no3[0]).toBeCloseTo(1 / 0.2259, 3);
  });

  it("describes the scenario for forum previews and keeps it out of search engines", async () => {
    const { turnOn } = await sharedScenario();
    const token = await turnOn();
    const page = await open(token);
    const tags = publicMeta({ data: page.data } as never) as Record<string, string>[];
    const find = (key: string, value: string) => tags.find((t) => t[key] === value)?.content;
    expect(find("property", "og:title")).toBe("Fewer meals · shared on Fernwater");
    expect(find("property", "og:description")).toMatch(
      /^Simulated nitrogen over 40 days: nitrate ends at [\d.]+ mg\/L NO3/,
    );
    expect(find("name", "robots")).toMatch(/noindex/);
    expect(find("property", "og:url")).toBe(`${ORIGIN}/s/${token}`);
    // The link-preview picture (issue 12, item 8): an absolute address, its size and words for it.
    expect(find("property", "og:image")).toBe(`${ORIGIN}/s/${token}/preview.png`);
    expect(find("property", "og:image:type")).toBe("image/png");
    expect(find("property", "og:image:width")).toBe("1200");
    expect(find("property", "og:image:height")).toBe("630");
    expect(find("property", "og:image:alt")).toMatch(/nitrate.*40 days.*Fewer meals/);
    expect(find("name", "twitter:card")).toBe("summary_large_image");
    expect(find("name", "twitter:image")).toBe(`${ORIGIN}/s/${token}/preview.png`);
  });

  it("reuses the stored run instead of running the engine on every view", async () => {
    const { turnOn, scenarioId } = await sharedScenario();
    const token = await turnOn();
    const stored = getDb().select().from(runs).where(eq(runs.scenarioId, scenarioId)).all();
    expect(stored).toHaveLength(1);
    for (let i = 0; i < 3; i++) expect((await open(token)).data.view.results.runId).toBe(stored[0].id);
    expect(getDb().select({ n: count() }).from(runs).where(eq(runs.scenarioId, scenarioId)).get()!.n).toBe(1);
  });

  it("runs a stale run once for visitors who come at once, instead of each taking one of the owner's runs in flight", async () => {
    const { turnOn, scenarioId } = await sharedScenario();
    const token = await turnOn();
    // No stored run, as after an engine update: the first view must run the engine.
    getDb().delete(runs).where(eq(runs.scenarioId, scenarioId)).run();
    const visitors = RUNS_IN_FLIGHT_PER_PERSON + 3;
    const pages = await Promise.all(Array.from({ length: visitors }, () => open(token)));
    for (const page of pages) {
      expect(page.data.view.error).toBeNull();
      expect(page.data.view.results).not.toBeNull();
    }
    const stored = getDb().select().from(runs).where(eq(runs.scenarioId, scenarioId)).all();
    expect(stored).toHaveLength(1);
    expect(new Set(pages.map((p) => p.data.view.results.runId))).toEqual(new Set([stored[0].id]));
  });

  it("answers 404 for a malformed or unknown token", async () => {
    expect((await open("not a token")).status).toBe(404);
    expect((await open("A".repeat(43))).status).toBe(404);
    expect((await open("x".repeat(500))).status).toBe(404);
  });

  it("never validates the HTML, which carries a per-response CSP nonce: a cached body would have its scripts refused", async () => {
    const { turnOn } = await sharedScenario();
    const token = await turnOn();
    const first = await throughMiddleware(token, {}, "html");
    expect(first.response.headers.get("Cache-Control")).toBe("no-cache");
    expect(first.response.headers.get("ETag")).toBeNull();
    const again = await throughMiddleware(token, { "If-None-Match": "*" }, "html");
    expect(again.response.status).toBe(200);
    expect(again.rendered).toBe(1);
  });

  it("validates anonymous data requests with an ETag: 304 while unchanged, a full answer once the link changes", async () => {
    const { turnOn, owner, tankId, scenarioId } = await sharedScenario();
    const token = await turnOn();
    const first = await throughMiddleware(token);
    expect(first.rendered).toBe(1);
    expect(first.response.headers.get("Cache-Control")).toBe("no-cache");
    const tag = first.response.headers.get("ETag")!;
    expect(tag).toMatch(/^"[0-9a-f]{27}"$/);
    const repeat = await throughMiddleware(token, { "If-None-Match": tag });
    expect(repeat.response.status).toBe(304);
    expect(repeat.rendered).toBe(0);
    // Saving the scenario changes the tag, so the page is rendered again.
    getDb()
      .update(scenarios)
      .set({ updatedAt: new Date(Date.now() + 1000) })
      .where(eq(scenarios.id, scenarioId))
      .run();
    const changed = await throughMiddleware(token, { "If-None-Match": tag });
    expect(changed.rendered).toBe(1);
    expect(changed.response.headers.get("ETag")).not.toBe(tag);
    // A link turned off is never answered from the validator: the request goes through (to its 404).
    const newTag = changed.response.headers.get("ETag")!;
    getDb().update(shareLinks).set({ revokedAt: new Date() }).where(eq(shareLinks.scenarioId, scenarioId)).run();
    const revoked = await throughMiddleware(token, { "If-None-Match": newTag });
    expect(revoked.rendered).toBe(1);
    expect(revoked.response.headers.get("ETag")).toBeNull();
    // Signed-in views are private and carry no tag.
    const mine = await throughMiddleware(token, { Cookie: owner.cookie });
    expect(mine.response.headers.get("Cache-Control")).toBe("private, no-cache");
    expect(mine.response.headers.get("ETag")).toBeNull();
    expect(tankId).toBeGreaterThan(0);
  });
});

describe("share links: copy to my tanks", () => {
  it("sends an anonymous visitor to sign in and back to the share page", async () => {
    const { turnOn } = await sharedScenario();
    const token = await turnOn();
    const result = await call(publicAction, post(`/s/${token}`, { intent: "copy", tankId: "new" }), { token });
    expect(result.status).toBe(302);
    expect(result.location).toBe(`/sign-in?redirectTo=${encodeURIComponent(`/s/${token}`)}`);
  });

  it("copies into a new tank “Shared with me” for a keeper with none, with a run and copied_from_id", async () => {
    const { turnOn, scenarioId } = await sharedScenario();
    const token = await turnOn();
    const visitor = await userWithCookie();
    const page = await open(token, visitor.cookie);
    expect(page.data.myTanks).toEqual([]);
    const result = await call(publicAction, post(`/s/${token}`, { intent: "copy", tankId: "new" }, visitor.cookie), {
      token,
    });
    expect(result.status).toBe(302);
    const [, , tankId, , copyId] = result.location!.split("/");
    const tank = getDb()
      .select()
      .from(tanks)
      .where(eq(tanks.id, Number(tankId)))
      .get()!;
    expect(tank).toMatchObject({ ownerId: visitor.id, name: "Shared with me" });
    const copy = getDb()
      .select()
      .from(scenarios)
      .where(eq(scenarios.id, Number(copyId)))
      .get()!;
    const source = getDb().select().from(scenarios).where(eq(scenarios.id, scenarioId)).get()!;
    expect(copy.copiedFromId).toBe(scenarioId);
    expect(copy.name).toBe(source.name);
    expect(copy.settings).toEqual(source.settings);
    expect(getDb().select().from(runs).where(eq(runs.scenarioId, copy.id)).all()).toHaveLength(1);
  });

  it("copies into a chosen tank of one's own, and 404s a forged tank of someone else", async () => {
    const { turnOn, owner, tankId: ownersTank } = await sharedScenario();
    const token = await turnOn();
    const visitor = await userWithCookie();
    const mine = createTank(visitor.id, "Bedroom tank");
    const forged = await call(
      publicAction,
      post(`/s/${token}`, { intent: "copy", tankId: ownersTank }, visitor.cookie),
      { token },
    );
    expect(forged.status).toBe(404);
    const bad = await call(publicAction, post(`/s/${token}`, { intent: "copy", tankId: "-3" }, visitor.cookie), {
      token,
    });
    expect(bad.status).toBe(400);
    expect(bad.data.errors.tankId).toMatch(/Choose one of your tanks/);
    const done = await call(publicAction, post(`/s/${token}`, { intent: "copy", tankId: mine }, visitor.cookie), {
      token,
    });
    expect(done.status).toBe(302);
    expect(done.location).toMatch(new RegExp(`^/tanks/${mine}/scenarios/\\d+$`));
    expect(owner.id).not.toBe(visitor.id);
  });

  it("refuses to copy through a link that was turned off", async () => {
    const { turnOn, path, params, owner } = await sharedScenario();
    const token = await turnOn();
    await call(manageAction, post(path, { intent: "off" }, owner.cookie), params);
    const visitor = await userWithCookie();
    expect(
      (await call(publicAction, post(`/s/${token}`, { intent: "copy", tankId: "new" }, visitor.cookie), { token }))
        .status,
    ).toBe(404);
  });
});

describe("admin: public links", () => {
  it("lists live links with owner and date, takes one down with a reason the owner sees, and restores it", async () => {
    const { turnOn, owner, path, params, scenarioId } = await sharedScenario();
    const token = await turnOn();
    const admin = await userWithCookie("admin");
    const list = await call(adminLinksLoader, get("/admin/links", admin.cookie));
    const row = list.data.links.find((l: { scenarioName: string; ownerEmail: string }) => l.ownerEmail === owner.email);
    expect(row).toMatchObject({ scenarioName: "Fewer meals", takenDownAt: null });
    expect(row.createdAt).toMatch(/^\d{4}-\d{2}-\d{2}$/);
    // Finding a reported link by its pasted address.
    const found = await call(
      adminLinksLoader,
      get(`/admin/links?link=${encodeURIComponent(`${ORIGIN}/s/${token}`)}`, admin.cookie),
    );
    expect(found.data.search.foundId).toBe(row.id);
    const review = await call(adminLinkLoader, get(`/admin/links/${row.id}`, admin.cookie), { linkId: String(row.id) });
    expect(review.status).toBe(200);
    expect(seriesOf(review.data.view).t.length).toBeGreaterThan(0);

    const noReason = await call(
      adminLinksAction,
      post("/admin/links", { intent: "take-down", linkId: row.id, reason: " " }, admin.cookie),
    );
    expect(noReason.status).toBe(400);
    expect(noReason.data.errors.reason).toMatch(/owner reads it/);
    const down = await call(
      adminLinksAction,
      post("/admin/links", { intent: "take-down", linkId: row.id, reason: "Advertises a shop" }, admin.cookie),
    );
    expect(down.status).toBe(200);
    expect(getDb().select().from(shareLinks).where(eq(shareLinks.id, row.id)).get()).toMatchObject({
      takenDownById: admin.id,
      takedownReason: "Advertises a shop",
    });

    // Everyone else: 404. The owner: 410 with the reason, and the reason on the share page.
    const visitor = await userWithCookie();
    expect((await open(token)).status).toBe(404);
    expect((await open(token, visitor.cookie)).status).toBe(404);
    const gone = await open(token, owner.cookie);
    expect(gone.status).toBe(410);
    expect(gone.data.message).toMatch(/Advertises a shop/);
    const state = await call(manageLoader, get(path, owner.cookie), params);
    expect(state.data.takedown.reason).toBe("Advertises a shop");
    // While the takedown stands, no new link.
    const again = await call(manageAction, post(path, { intent: "make" }, owner.cookie), params);
    expect(again.status).toBe(400);
    expect(getDb().select().from(shareLinks).where(eq(shareLinks.scenarioId, scenarioId)).all()).toHaveLength(1);
    const twice = await call(
      adminLinksAction,
      post("/admin/links", { intent: "take-down", linkId: row.id, reason: "Again" }, admin.cookie),
    );
    expect(twice.status).toBe(400);

    const restored = await call(
      adminLinksAction,
      post("/admin/links", { intent: "restore", linkId: row.id }, admin.cookie),
    );
    expect(restored.status).toBe(200);
    expect((await open(token)).status).toBe(200);
  });

  it("is for admins only, action included", async () => {
    const { turnOn } = await sharedScenario();
    await turnOn();
    const keeper = await userWithCookie();
    const educator = await userWithCookie("educator");
    expect((await call(adminLinksLoader, get("/admin/links"))).status).toBe(302);
    expect((await call(adminLinksLoader, get("/admin/links", keeper.cookie))).status).toBe(403);
    expect((await call(adminLinksLoader, get("/admin/links", educator.cookie))).status).toBe(403);
    const link = getDb().select().from(shareLinks).get()!;
    const forged = await call(
      adminLinksAction,
      post("/admin/links", { intent: "take-down", linkId: link.id, reason: "mine now" }, keeper.cookie),
    );
    expect(forged.status).toBe(403);
    expect(getDb().select().from(shareLinks).where(eq(shareLinks.id, link.id)).get()!.takenDownAt).toBeNull();
  });
});

/** Width and height from a PNG's IHDR chunk, after checking the signature (ISO/IEC 15948, §5.2 and §11.2.2; docs/sources.md §18). */
function pngSize(bytes: Buffer): { width: number; height: number } {
  expect([...bytes.subarray(0, 8)]).toEqual([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
  expect(bytes.subarray(12, 16).toString("latin1")).toBe("IHDR");
  return { width: bytes.readUInt32BE(16), height: bytes.readUInt32BE(20) };
}

async function preview(token: string, headers: Record<string, string> = {}) {
  const response = (await previewLoader({
    request: get(`/s/${token}/preview.png`, undefined, headers),
    params: { token },
  } as never).catch((thrown: unknown) => thrown)) as Response | { init: { status: number } };
  if (!(response instanceof Response))
    return { status: response.init.status, bytes: Buffer.alloc(0), headers: new Headers() };
  return { status: response.status, bytes: Buffer.from(await response.arrayBuffer()), headers: response.headers };
}

describe("share links: the link-preview picture", () => {
  it("is a 1200×630 PNG drawn once per run, and gone with the link", async () => {
    const { turnOn, owner, path, params } = await sharedScenario();
    const token = await turnOn();
    const first = await preview(token);
    expect(first.status).toBe(200);
    expect(first.headers.get("Content-Type")).toBe("image/png");
    expect(pngSize(first.bytes)).toEqual({ width: 1200, height: 630 });
    // Drawn, not blank: a flat picture compresses to a few hundred bytes.
    expect(first.bytes.length).toBeGreaterThan(10_000);
    const runId = getDb()
      .select({ id: runs.id })
      .from(runs)
      .innerJoin(scenarios, eq(scenarios.id, runs.scenarioId))
      .where(eq(scenarios.id, Number(params.scenarioId)))
      .get()!.id;
    const kept = getDb().select().from(sharePreviews).where(eq(sharePreviews.runId, runId)).all();
    expect(kept).toHaveLength(1);

    // The second asker gets the kept bytes; a browser that has them gets 304.
    const second = await preview(token);
    expect(second.bytes.equals(first.bytes)).toBe(true);
    expect(getDb().select({ n: count() }).from(sharePreviews).get()!.n).toBe(1);
    const etag = first.headers.get("ETag")!;
    expect((await preview(token, { "If-None-Match": etag })).status).toBe(304);

    // A rename keeps the run, but the picture shows the name: drawn again, and the old ETag is stale.
    getDb()
      .update(scenarios)
      .set({ name: "Fewer meals, renamed" })
      .where(eq(scenarios.id, Number(params.scenarioId)))
      .run();
    const renamed = await preview(token, { "If-None-Match": etag });
    expect(renamed.status).toBe(200);
    expect(renamed.bytes.equals(first.bytes)).toBe(false);
    expect(getDb().select().from(sharePreviews).where(eq(sharePreviews.runId, runId)).get()!.name).toBe(
      "Fewer meals, renamed",
    );

    // Turned off: neither the picture nor a 304 for it.
    const off = await call(manageAction, post(path, { intent: "off" }, owner.cookie), params);
    expect(off.status).toBe(200);
    expect((await preview(token)).status).toBe(404);
    expect((await preview(token, { "If-None-Match": etag })).status).toBe(404);
    expect((await preview("not-a-token-of-ours")).status).toBe(404);
  });
});
