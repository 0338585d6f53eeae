/**
 * Every rate limit of Fernwater in one place (the README's "Reliability" lists them). The counts
 * live in the database (`rate_limits`, rate-limiter-flexible's SQLite store on better-sqlite3),
 * so every app process on the machine counts against the same limit (README, "Scale on paper").
 * Each take is one upsert in a transaction: two processes cannot both take the last point.
 *
 * Limits are counted before the work they guard — a request takes its point first and gives it
 * back if the limit was not meant for it (a successful sign-in) — so a burst of parallel
 * requests cannot all pass a check that only counted finished attempts.
 */
import { RateLimiterRes, RateLimiterSQLite } from "rate-limiter-flexible";
import { getDb } from "~/db/client.server";

type Limit = { points: number; seconds: number };

export const LIMITS = {
  /** Failed (or still running) sign-ins per e-mail address. */
  signInPerEmail: { points: 5, seconds: 60 },
  /** Failed (or still running) sign-ins per client address. */
  signInPerClient: { points: 5, seconds: 60 },
  /** Sign-up forms per client address (a class behind one school address fits). */
  signUpPerClient: { points: 40, seconds: 3600 },
  /** Mails about an account (reset links, sign-up confirmations, "you already have an account") per e-mail address. */
  accountMailsPerEmail: { points: 3, seconds: 3600 },
  /** Class invitations an educator sends. */
  invitesPerEducator: { points: 60, seconds: 3600 },
  /** Invitations to one e-mail address, from anyone. */
  invitesPerEmail: { points: 3, seconds: 86_400 },
  /** Wrong class join codes per person. */
  wrongJoinCodesPerPerson: { points: 10, seconds: 600 },
  /** Model runs that store something (saves, imports, copies, re-runs) per person. */
  savesPerPerson: { points: 30, seconds: 60 },
  /** What-if previews per person. */
  previewsPerPerson: { points: 60, seconds: 60 },
  /** CSV uploads (readings and journal together) per person; each is read on the request thread. */
  uploadsPerPerson: { points: 10, seconds: 60 },
  /** Whole journals or reading lists built (CSV exports, API listings) per person, 0.2–0.7 s each when full. */
  fullListingsPerPerson: { points: 10, seconds: 60 },
  /** Share-link pictures drawn (about 50 ms each on the request thread) per scenario owner. */
  sharePicturesPerOwner: { points: 20, seconds: 60 },
  /**
   * Model runs of one person in flight at once, across every app process: taken when a run
   * starts, given back when it ends. The window only frees a count a stopped process never gave
   * back (a run takes at most a few seconds).
   */
  runsInFlightPerPerson: { points: 2, seconds: 60 },
} as const satisfies Record<string, Limit>;

export type LimitName = keyof typeof LIMITS;

const limiters = new Map<LimitName, RateLimiterSQLite>();
let limitersClient: unknown = null;
function limiter(name: LimitName): RateLimiterSQLite {
  const client = getDb().$client;
  // A reopened database (tests, restore) needs limiters bound to the new connection.
  if (client !== limitersClient) {
    limiters.clear();
    limitersClient = client;
  }
  let l = limiters.get(name);
  if (!l) {
    l = new RateLimiterSQLite({
      storeClient: client,
      storeType: "better-sqlite3",
      tableName: "rate_limits",
      tableCreated: true, // by the migrations (drizzle/), not by the library
      keyPrefix: name,
      clearExpiredByTimeout: true, // the library's sweep of windows that ended an hour ago
      points: LIMITS[name].points,
      duration: LIMITS[name].seconds,
    });
    limiters.set(name, l);
  }
  return l;
}

/** Takes one point; returns 0, or the seconds to wait when the limit is reached (nothing taken then). */
export async function take(name: LimitName, key: string): Promise<number> {
  try {
    await limiter(name).consume(key, 1);
    return 0;
  } catch (refused) {
    if (refused instanceof RateLimiterRes) {
      // A refused consume still counts in rate-limiter-flexible; give it back so waiting shortens nothing.
      await limiter(name).reward(key, 1);
      return Math.max(1, Math.ceil(refused.msBeforeNext / 1000));
    }
    throw refused;
  }
}

/** Takes one point from each limit, or none: returns the longest wait when any is reached. */
export async function takeAll(entries: readonly [LimitName, string][]): Promise<number> {
  const taken: [LimitName, string][] = [];
  for (const [name, key] of entries) {
    const wait = await take(name, key);
    if (wait > 0) {
      await Promise.all(taken.map(([n, k]) => giveBack(n, k)));
      return wait;
    }
    taken.push([name, key]);
  }
  return 0;
}

/** Gives a point back (the attempt did not count: it succeeded, or never started). */
export async function giveBack(name: LimitName, key: string): Promise<void> {
  await limiter(name).reward(key, 1);
}

/** Seconds until one more point is free, without taking it (0 when free). */
export async function waitFor(name: LimitName, key: string): Promise<number> {
  const state = await limiter(name).get(key);
  if (!state || state.consumedPoints < LIMITS[name].points) return 0;
  return Math.max(1, Math.ceil(state.msBeforeNext / 1000));
}

/** Forgets the counts of one limit (tests). */
export function resetLimit(name: LimitName): void {
  getDb().$client.prepare("DELETE FROM rate_limits WHERE key LIKE ?").run(`${name}:%`);
}

/** Forgets every count (tests). */
export function resetRateLimits(): void {
  getDb().$client.prepare("DELETE FROM rate_limits").run();
  limiters.clear();
}

/**
 * The key for a client address: IPv6 clients are counted per /64 (one home or one machine gets
 * a whole /64 and can pick any address in it), IPv4 per address.
 */
export function clientKey(ip: string): string {
  const a = ip.trim().toLowerCase();
  const v4 = /^(?:::ffff:)?(\d{1,3}(?:\.\d{1,3}){3})$/.exec(a);
  if (v4) return v4[1];
  if (!a.includes(":")) return a;
  const [head, tail = ""] = a.split("::");
  const left = head ? head.split(":") : [];
  const right = tail ? tail.split(":") : [];
  const full = [...left, ...Array(Math.max(0, 8 - left.length - right.length)).fill("0"), ...right];
  return (
    full
      .slice(0, 4)
      .map((h) => h.replace(/^0+(?=.)/, ""))
      .join(":") + "::/64"
  );
}

/** "Wait 12 seconds" / "Wait 3 minutes". */
export function waitText(seconds: number): string {
  if (seconds < 120) return `${seconds} second${seconds === 1 ? "" : "s"}`;
  const minutes = Math.ceil(seconds / 60);
  return `${minutes} minutes`;
}
