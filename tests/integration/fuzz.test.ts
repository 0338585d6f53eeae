/**
 * Bad input, fuzzed (issue 7): random and adversarial form data and JSON posted to every
 * action and API route of the permission matrix, as the owner (the deepest code paths), another
 * keeper and an anonymous visitor. Every answer must be 2xx, 3xx or 4xx — a thrown error here
 * is what the server would answer as 500 — and a refused request (4xx) must leave the database
 * exactly as it was. Our own property test; the number of cases tried is printed at the end.
 */
import { createHash } from "node:crypto";
import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "~/db/client.server";
import { call, ORIGIN } from "../support/routes";
import { buildWorld, fill, handlerOf, people, PERMISSION_MATRIX, ROUTE_FILES, type Row } from "../support/route-world";

beforeAll(buildWorld, 60_000);

/** Every table's rows, hashed: equal before and after means nothing was written. */
function fingerprint(): string {
  const db = getDb().$client;
  const tables = db.prepare("select name from sqlite_master where type = 'table' and name not like 'sqlite_%' order by name").pluck().all() as string[];
  const hash = createHash("sha256");
  for (const t of tables) {
    if (t === "sessions") continue; // signing in legitimately writes sessions
    hash.update(t);
    hash.update(JSON.stringify(db.prepare(`select * from "${t}" order by rowid`).raw().all()));
  }
  return hash.digest("hex");
}

// Field names the app reads, so random forms reach past "unknown action" into the validators.
const FIELDS = [
  "intent", "name", "notes", "email", "password", "confirmPassword", "currentPassword", "token", "redirectTo",
  "nitrateLow", "nitrateHigh", "confirm", "scenarioId", "userId", "role", "tankId", "code", "answer", "reason",
  "question", "title", "newPlantForm", "volumeUnit", "temperatureUnit", "nitrateUnit", "khUnit",
  "water.volumeL", "water.temperatureC", "water.pH", "water.startNitrate", "fish.feedGPerDay", "fish.fractionEaten",
  "maintenance.waterChangeIntervalDays", "maintenance.waterChangeFraction", "run.lengthDays", "run.outputIntervalDays",
  "run.startDate", "plants.0.id", "plants.0.name", "plants.0.growthForm", "plants.0.startMassG", "plants.0.maxMassG",
  "plants.99.startMassG", "feedGPerDay", "plantMassFactor", "tapNitrate", "takenAt", "date", "time", "tan", "nitrite",
  "nitrate", "ph", "kh", "temperature", "note", "readingId", "setting", "from", "to", "points", "outcome",
  "lever", "nitrateMax", "nh3Max", "intervalDays", "fit", "unlocked", "linkId", "studentId", "emails", "page", "sort",
];
// Intents that would delete the world the other cases need are left out; deleting is covered elsewhere.
const INTENTS = [
  "add", "add-plant", "remove-plant:0", "remove-plant:99", "cancel", "copy", "create", "hand-in", "invite", "join", "make",
  "new", "off", "password", "preferences", "remove", "restore", "role", "save", "save-as-new", "save-what-if", "settings",
  "start", "take-down", "update", "nothing", "",
];
const NASTY = [
  "", " ", "0", "-0", "-1", "-5", "1e309", "-1e309", "NaN", "Infinity", "-Infinity", "1e-320", "9".repeat(400), "0x1F",
  "12,5", "1.2.3", "true", "null", "undefined", "[]", "{}", "yes", "=cmd|' /C calc'!A0", "+SUM(A1:A9)", "-2+3", "@HYPERLINK(\"x\")",
  "<script>alert(1)</script>", "' or 1=1 --", "../../etc/passwd", "\u0000", "\uFFFD\uFFFD", "ڳ🐟\u200b", "a".repeat(5000),
  "2026-13-45T25:61", "2026-02-30", "14", "7.2", "25", "100", "asN", "asNO3", "keeper", "admin", "stem", "floating",
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
    fc.dictionary(fc.oneof({ weight: 6, arbitrary: fc.constantFrom(...FIELDS) }, { weight: 1, arbitrary: fc.string({ maxLength: 12 }) }), value, { maxKeys: 12 }),
  )
  .map(([intent, fields]) => ({ intent, ...fields }));

const nastyJson = fc.constantFrom<unknown>(
  null, 0, "x", [], {}, { settings: null }, { settings: { water: { volumeL: -1, pH: 99 } } },
  { settings: { plants: Array.from({ length: 10_000 }, (_, i) => ({ id: `p${i}` })) } },
  { settings: { water: { volumeL: "NaN", temperatureC: "Infinity" } } }, { settings: { run: { lengthDays: 1e308 } } },
  { name: "=cmd|' /C calc'!A0", settings: {} }, { scenarioId: -1, whatIf: { feedGPerDay: 1e308 } },
  { scenarioId: 1, whatIf: { plantMassFactor: -3, extra: 1 } }, { setting: "__proto__", from: 0, to: 1, points: 1e9 },
  { fit: ["feedLoad", "feedLoad", "nope"] }, { nitrateMax: -1, lever: "constructor" }, JSON.parse('{"__proto__":{"polluted":1}}'),
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

type Visitor = "owner" | "other keeper" | "anonymous";
const visitor = fc.constantFrom<Visitor>("owner", "owner", "owner", "other keeper", "anonymous");

function requestFor(row: Row, who: Visitor, body: { form?: Record<string, string>; json?: unknown; raw?: Uint8Array | string }): Request {
  const { url } = fill(row.path);
  const headers: Record<string, string> = { Origin: ORIGIN };
  const cookie = who === "anonymous" ? undefined : people[who]?.cookie;
  if (cookie) headers.Cookie = cookie;
  const method = row.method ?? "POST";
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
const RUNS_PER_ROUTE = Number(process.env.FUZZ_RUNS ?? 100);

// One property per distinct action route (rows that end the session are walked in the matrix).
const rows = PERMISSION_MATRIX.filter((r) => r.handler === "action" && !r.freshSession && ROUTE_FILES.has(r.file)).filter(
  (r, i, all) => all.findIndex((o) => o.file === r.file && o.path === r.path && (o.method ?? "POST") === (r.method ?? "POST")) === i,
);

describe("fuzzed input to every action and API route", () => {
  for (const row of rows) {
    const isJson = row.json !== undefined;
    it(`${row.method ?? "POST"} ${row.path} (${row.file}) never answers 500 and refuses without writing`, async () => {
      const handler = await handlerOf(row);
      const bodies = isJson
        ? fc.oneof({ weight: 5, arbitrary: jsonBody.map((json) => ({ json })) }, { weight: 1, arbitrary: rawJson.map((raw) => ({ raw })) })
        : formBody.map((form) => ({ form }));
      await fc.assert(
        fc.asyncProperty(bodies, visitor, fc.integer({ min: 1, max: 254 }), async (body, who, ip) => {
          const before = fingerprint();
          const result = await call(handler, requestFor(row, who, body), fill(row.path).params, `203.0.113.${ip}`);
          cases++;
          expect(result.status, `answered ${result.status}`).toBeGreaterThanOrEqual(200);
          expect(result.status, `answered ${result.status}`).toBeLessThan(500);
          if (result.status >= 400) {
            refused++;
            expect(fingerprint(), "a refused request changed the database").toBe(before);
          }
        }),
        { numRuns: RUNS_PER_ROUTE, seed: Number(process.env.FUZZ_SEED ?? 7) },
      );
    }, 120_000);
  }
});

afterAll(() => {
  process.stdout.write(`fuzz: ${cases} requests to ${rows.length} action and API routes, ${refused} refused with 4xx, none answered 500\n`);
});
