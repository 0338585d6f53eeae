/**
 * Bad input, fuzzed (issues 7 and 10): random and adversarial form data, JSON and uploads sent
 * to every action and API route of the permission matrix (API loaders too, with random query
 * strings and methods), as the owner (the deepest code paths), another keeper, the educator of
 * the owner's class, a demoted educator and an anonymous visitor. Every answer must be 2xx, 3xx
 * or 4xx — a thrown error here is what the server would answer as 500 — and a refused request
 * (4xx) must leave the database exactly as it was. The adversarial values include the known
 * open-redirect bypass forms, partial settings with unknown names, formula cells (ASCII and
 * full-width), header-only CSV files and wrong methods. At least 10,000 requests in the default
 * run (FUZZ_RUNS per route, FUZZ_SEED to vary); the count and time are printed at the end.
 */
import { createHash } from "node:crypto";
import fc from "fast-check";
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { getDb } from "~/db/client.server";
import { resetRateLimits } from "~/rate-limits.server";
import { resetRunGate } from "~/features/runs/run-gate.server";
import { REDIRECT_BYPASSES } from "../support/attack-inputs";
import { startMailFake } from "../support/mail";
import { call, ORIGIN } from "../support/routes";
import { buildWorld, fill, handlerOf, people, PERMISSION_MATRIX, ROUTE_FILES, type Row } from "../support/route-world";

let stopMail: () => Promise<void>;
beforeAll(async () => {
  stopMail = (await startMailFake()).close;
  await buildWorld();
}, 60_000);
// Limits are walked by their own tests (limits.test.ts, quotas.test.ts); here every case starts
// with fresh counts so random input reaches the validators behind them.
beforeEach(() => {
  resetRateLimits();
  resetRunGate();
});

/** Every table's rows, hashed: equal before and after means nothing was written. */
function fingerprint(): string {
  const db = getDb().$client;
  const tables = db
    .prepare("select name from sqlite_master where type = 'table' and name not like 'sqlite_%' order by name")
    .pluck()
    .all() as string[];
  const hash = createHash("sha256");
  for (const t of tables) {
    if (t === "sessions") continue; // signing in legitimately writes sessions
    hash.update(t);
    hash.update(JSON.stringify(db.prepare(`select * from "${t}" order by rowid`).raw().all()));
  }
  return hash.digest("hex");
}

/**
 * The fingerprint is costly on a growing database, so it is recomputed only after something was
 * written: SQLite's total_changes() counts every row written on the connection (all writes go
 * through the one client), so an unchanged count means an unchanged database.
 */
const totalChanges = () => getDb().$client.prepare("select total_changes()").pluck().get() as number;
let known = { changes: -1, print: "" };
function stateBefore(): { changes: number; print: () => string } {
  const changes = totalChanges();
  if (changes !== known.changes) known = { changes, print: "" };
  const at = known;
  return { changes, print: () => (at.print ||= fingerprint()) };
}

// Field names the app reads, so random forms reach past "unknown action" into the validators.
const FIELDS = [
  "intent",
  "name",
  "notes",
  "email",
  "password",
  "confirmPassword",
  "currentPassword",
  "token",
  "redirectTo",
  "nitrateLow",
  "nitrateHigh",
  "confirm",
  "scenarioId",
  "userId",
  "role",
  "tankId",
  "code",
  "answer",
  "reason",
  "question",
  "title",
  "newPlantForm",
  "volumeUnit",
  "temperatureUnit",
  "nitrateUnit",
  "khUnit",
  "water.volumeL",
  "water.temperatureC",
  "water.pH",
  "water.startNitrate",
  "fish.feedGPerDay",
  "fish.fractionEaten",
  "maintenance.waterChangeIntervalDays",
  "maintenance.waterChangeFraction",
  "run.lengthDays",
  "run.outputIntervalDays",
  "run.startDate",
  "plants.0.id",
  "plants.0.name",
  "plants.0.growthForm",
  "plants.0.startMassG",
  "plants.0.maxMassG",
  "plants.99.startMassG",
  "feedGPerDay",
  "plantMassFactor",
  "tapNitrate",
  "takenAt",
  "date",
  "time",
  "tan",
  "nitrite",
  "nitrate",
  "ph",
  "kh",
  "temperature",
  "note",
  "readingId",
  "setting",
  "from",
  "to",
  "points",
  "outcome",
  "lever",
  "nitrateMax",
  "nh3Max",
  "intervalDays",
  "fit",
  "unlocked",
  "linkId",
  "studentId",
  "emails",
  "page",
  "sort",
];
// Intents that would delete the world the other cases need are left out; deleting is covered elsewhere.
const INTENTS = [
  "add",
  "add-plant",
  "remove-plant:0",
  "remove-plant:99",
  "cancel",
  "copy",
  "create",
  "hand-in",
  "invite",
  "join",
  "make",
  "new",
  "off",
  "password",
  "preferences",
  "remove",
  "restore",
  "role",
  "save",
  "save-as-new",
  "save-what-if",
  "settings",
  "start",
  "take-down",
  "update",
  "nothing",
  "",
];
const NASTY = [
  ...REDIRECT_BYPASSES.slice(0, 30),
  "＝SUM(A1)",
  "－1",
  "＋x",
  "＠y",
  "'=already",
  "\u202e",
  "/tanks",
  "/s/abc",
  "",
  " ",
  "0",
  "-0",
  "-1",
  "-5",
  "1e309",
  "-1e309",
  "NaN",
  "Infinity",
  "-Infinity",
  "1e-320",
  "9".repeat(400),
  "0x1F",
  "12,5",
  "1.2.3",
  "true",
  "null",
  "undefined",
  "[]",
  "{}",
  "yes",
  "=cmd|' /C calc'!A0",
  "+SUM(A1:A9)",
  "-2+3",
  '@HYPERLINK("x")',
  "<script>alert(1)</script>",
  "' or 1=1 --",
  "../../etc/passwd",
  "\u0000",
  "\uFFFD\uFFFD",
  "ڳ🐟\u200b",
  "a".repeat(5000),
  "2026-13-45T25:61",
  "2026-02-30",
  "14",
  "7.2",
  "25",
  "100",
  "asN",
  "asNO3",
  "keeper",
  "admin",
  "stem",
  "floating",
];
const value = fc.oneof(
  { weight: 5, arbitrary: fc.constantFrom(...NASTY) },
  { weight: 2, arbitrary: fc.string({ maxLength: 40 }) },
  { weight: 2, arbitrary: fc.double().map(String) },
  { weight: 1, arbitrary: fc.integer().map(String) },
);
const formBody = fc
  .tuple(
    fc.constantFrom(...INTENTS),
    fc.dictionary(
      fc.oneof(
        { weight: 6, arbitrary: fc.constantFrom(...FIELDS) },
        { weight: 1, arbitrary: fc.string({ maxLength: 12 }) },
      ),
      value,
      { maxKeys: 12 },
    ),
  )
  .map(([intent, fields]) => ({ intent, ...fields }));

const nastyJson = fc.constantFrom<unknown>(
  null,
  0,
  "x",
  [],
  {},
  { settings: null },
  { settings: { water: { volumeL: -1, pH: 99 } } },
  { settings: { plants: Array.from({ length: 10_000 }, (_, i) => ({ id: `p${i}` })) } },
  { settings: { water: { volumeL: "NaN", temperatureC: "Infinity" } } },
  { settings: { run: { lengthDays: 1e308 } } },
  { name: "=cmd|' /C calc'!A0", settings: {} },
  { scenarioId: -1, whatIf: { feedGPerDay: 1e308 } },
  { scenarioId: 1, whatIf: { plantMassFactor: -3, extra: 1 } },
  { setting: "__proto__", from: 0, to: 1, points: 1e9 },
  { fit: ["feedLoad", "feedLoad", "nope"] },
  { nitrateMax: -1, lever: "constructor" },
  JSON.parse('{"__proto__":{"polluted":1}}'),
  // Partial settings, unknown names, prototype keys (PATCH merges; unknown names answer 400).
  { settings: { water: { volumeL: 120 } } },
  { settings: { water: { volumeLitres: 50 } } },
  { settings: { fsh: {} } },
  { settings: { plants: [{ id: "a", mass: 3 }] } },
  { settings: JSON.parse('{"__proto__":{"water":1},"constructor":{"x":1}}') },
  { settings: { run: { lengthDays: 730, outputIntervalDays: 0.0417 } } },
  // The maintenance plan's fields (PUT /api/tanks/:id/plan): valid, out of range, wrong types, unknown names.
  { water_change_percent: 30, water_change_every_days: 7, gravel_percent: 10, filter_every_days: 30 },
  { water_change_percent: "1e309", water_change_every_days: -1, gravel_percent: null, filter_every_days: [] },
  { water_change_percent: 96, water_change_every_days: 2.5, gravel_percent: "x", trim_every_days___proto__: 3 },
  { settings: [] },
  { settings: "x" },
  { name: "", settings: null },
);
const jsonBody = fc.oneof(
  { weight: 3, arbitrary: nastyJson },
  { weight: 3, arbitrary: fc.jsonValue({ maxDepth: 4 }) },
  { weight: 2, arbitrary: fc.record({ name: value, settings: fc.jsonValue({ maxDepth: 3 }) }, { requiredKeys: [] }) },
);
/** Raw bodies no JSON encoder makes: deep nesting, invalid UTF-8, 5 MB, truncated. */
const rawJson = fc.constantFrom<Uint8Array | string>(
  "[".repeat(20_000) + "]".repeat(20_000),
  new Uint8Array([0x7b, 0x22, 0x6e, 0xff, 0xfe, 0x22, 0x3a, 0x31, 0x7d]),
  `{"name":"${"x".repeat(5 * 1024 * 1024)}"}`,
  '{"settings": {"water": ',
  "",
);

/** Uploads (readings CSV, scenario files): header-only, formula notes, junk, too many rows. */
const uploadText = fc.constantFrom(
  "datetime,nitrate_no3_mg_l,note\r\n",
  "datetime,nitrate_no3_mg_l,note\r\n2026-01-01T08:00,10,'=1+2\r\n2026-01-02T08:00,11,＝SUM(A1)\r\n",
  "datetime;nitrate_no3_mg_l\n2026-01-03T08:00;12,5\n",
  "note\n=cmd|' /C calc'!A0\n",
  "",
  "\uFEFF",
  '{"fernwater":"scenario","schemaVersion":1,"name":"x","settings":{"water":{"volumeL":60}}}',
  '{"fernwater":"scenario","schemaVersion":99,"settings":{}}',
  "datetime,nitrate_no3_mg_l\n" +
    Array.from({ length: 5001 }, (_, i) => `2025-01-01T00:${String(i % 60).padStart(2, "0")},1`).join("\n"),
);

type Visitor = "owner" | "other keeper" | "anonymous" | "educator of the owner's class" | "demoted educator";
const visitor = fc.constantFrom<Visitor>(
  "owner",
  "owner",
  "owner",
  "other keeper",
  "anonymous",
  "educator of the owner's class",
  "demoted educator",
);
/** Methods that reach an action (GET and HEAD reach the loader, and carry no body). */
const METHODS = ["POST", "PUT", "PATCH", "DELETE"] as const;

type Body = {
  form?: Record<string, string>;
  json?: unknown;
  raw?: Uint8Array | string;
  upload?: string;
  query?: string;
  method?: string;
};

function requestFor(row: Row, who: Visitor, body: Body): Request {
  const { url } = fill(row.path);
  const headers: Record<string, string> = { Origin: ORIGIN };
  const cookie = who === "anonymous" ? undefined : people[who]?.cookie;
  if (cookie) headers.Cookie = cookie;
  const method = body.method ?? row.method ?? "POST";
  if (row.handler === "loader") {
    const sep = url.includes("?") ? "&" : "?";
    return new Request(ORIGIN + url + (body.query ? sep + body.query : ""), {
      method: method === "POST" ? "GET" : method,
      headers,
    });
  }
  if (body.upload !== undefined) {
    const form = new FormData();
    form.set(
      "file",
      new File([body.upload], body.upload.startsWith("{") ? "scenario.fernwater.json" : "readings.csv", {
        type: "text/plain",
      }),
    );
    for (const [k, v] of Object.entries(body.form ?? {})) form.set(k, v);
    return new Request(ORIGIN + url, { method, headers, body: form });
  }
  if (body.raw !== undefined) {
    headers["Content-Type"] = "application/json";
    return new Request(ORIGIN + url, { method, headers, body: body.raw as BodyInit });
  }
  if (body.json !== undefined) {
    headers["Content-Type"] = "application/json";
    return new Request(ORIGIN + url, { method, headers, body: JSON.stringify(body.json) });
  }
  headers["Content-Type"] = "application/x-www-form-urlencoded";
  return new Request(ORIGIN + url, { method, headers, body: new URLSearchParams(body.form ?? {}) });
}

let cases = 0;
let refused = 0;
const started = performance.now();
const RUNS_PER_ROUTE = Number(process.env.FUZZ_RUNS ?? 200);

// One property per distinct action route, and per API loader (rows that end the session are
// walked in the matrix).
const isApi = (r: Row) => r.path.startsWith("/api/");
const rows = PERMISSION_MATRIX.filter(
  (r) => (r.handler === "action" || isApi(r)) && !r.freshSession && ROUTE_FILES.has(r.file),
).filter(
  (r, i, all) =>
    all.findIndex(
      (o) =>
        o.file === r.file &&
        o.handler === r.handler &&
        o.path === r.path &&
        (o.method ?? "POST") === (r.method ?? "POST"),
    ) === i,
);
const isUpload = (r: Row) => /readings\/upload|\/import$/.test(r.path);
const query = fc.oneof(
  fc.constant(""),
  fc.constantFrom(
    "format=csv",
    "format=xml",
    "units=display",
    "units=%00",
    "job=" + "x".repeat(300),
    "redirectTo=%2F%09%2Fevil.example",
    "page=-1&sort=__proto__",
  ),
  fc.dictionary(fc.constantFrom(...FIELDS), value, { maxKeys: 3 }).map((d) => new URLSearchParams(d).toString()),
);

describe("fuzzed input to every action and API route", () => {
  for (const row of rows) {
    const isJson = row.json !== undefined;
    const verb = row.handler === "loader" ? "GET" : (row.method ?? "POST");
    it(`${verb} ${row.path} (${row.file} ${row.handler}) never answers 500 and refuses without writing`, async () => {
      const handler = await handlerOf(row);
      // API routes also get methods they do not take (each answers its JSON 405).
      const method = isApi(row)
        ? fc.option(fc.constantFrom(...METHODS), { freq: 3 }).map((m) => m ?? undefined)
        : fc.constant(undefined);
      const bodies: fc.Arbitrary<Body> =
        row.handler === "loader"
          ? fc.record({ query, method: fc.constantFrom(undefined, undefined, "HEAD") })
          : isJson
            ? fc.oneof(
                { weight: 5, arbitrary: fc.record({ json: jsonBody, method }) },
                { weight: 1, arbitrary: fc.record({ raw: rawJson, method }) },
              )
            : isUpload(row)
              ? fc.oneof(
                  { weight: 3, arbitrary: fc.record({ upload: uploadText, form: formBody }) },
                  { weight: 1, arbitrary: fc.record({ form: formBody }) },
                )
              : fc.record({ form: formBody });
      await fc.assert(
        fc.asyncProperty(bodies, visitor, fc.integer({ min: 1, max: 254 }), async (body, who, ip) => {
          resetRateLimits();
          resetRunGate();
          const before = stateBefore();
          const result = await call(handler, requestFor(row, who, body), fill(row.path).params, `203.0.113.${ip}`);
          cases++;
          expect(result.status, `answered ${result.status}`).toBeGreaterThanOrEqual(200);
          expect(result.status, `answered ${result.status}`).toBeLessThan(500);
          if (result.status >= 400) {
            refused++;
            if (totalChanges() !== before.changes)
              expect(fingerprint(), "a refused request changed the database").toBe(before.print());
          }
        }),
        { numRuns: RUNS_PER_ROUTE, seed: Number(process.env.FUZZ_SEED ?? 7) },
      );
    }, 180_000);
  }

  it("sent at least 10,000 requests in the default run", () => {
    // Runs last (tests in a file run in order): the count of every case above.
    if (process.env.FUZZ_RUNS === undefined) expect(cases).toBeGreaterThanOrEqual(10_000);
    expect(cases).toBe(rows.length * RUNS_PER_ROUTE);
  });
});

afterAll(async () => {
  await stopMail();
  const seconds = ((performance.now() - started) / 1000).toFixed(1);
  process.stdout.write(
    `fuzz: ${cases} requests to ${rows.length} action and API routes in ${seconds} s, ${refused} refused with 4xx, none answered 500\n`,
  );
});
