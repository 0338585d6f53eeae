/**
 * Rendered pages kept for a short while, so the same page for the same data is not rendered
 * again (issue 15: React's render is about a third of a results page's CPU). A page is
 * rendered with a stand-in for the CSP nonce and the stand-in is swapped for each response's
 * own nonce, so every response still carries a fresh one (issue 12, item 1).
 *
 * The key is the URL, the status and everything the page was rendered from (every route's
 * loader data, action data and errors), so a hit can only return what a new render would
 * give: other data, another person or another unit choice is another key. Only routes that
 * ask for it (`handle: { renderCache: true }`) are kept: their markup depends on nothing else
 * (no clock, no randomness in render).
 */
import { createHash, randomBytes } from "node:crypto";
import { LRUCache } from "lru-cache";

/** Written where the nonce goes while a cacheable page renders; random per process, so no page can contain it by chance. */
export const NONCE_STAND_IN = `fw${randomBytes(12).toString("hex")}`;

// Pages are kept as byte pieces between the nonce's places (outside V8's heap, so a full
// cache costs the garbage collector nothing): 32 MB (a results page is about 52 kB), a minute
// at most. A page is kept only when its URL comes a second time within the minute: most pages
// are seen once, and for those not even the key (a hash of all their data) is worked out.
const pages = new LRUCache<string, Buffer[]>({
  maxSize: 32 * 1024 * 1024,
  sizeCalculation: (pieces) =>
    Math.max(
      1,
      pieces.reduce((sum, piece) => sum + piece.length, 0),
    ),
  ttl: 60_000,
});
const urlsSeen = new LRUCache<string, true>({ max: 10_000, ttl: 60_000 });
const STAND_IN_BYTES = Buffer.from(NONCE_STAND_IN);

/**
 * The cache key for a page rendered from `inputs`, or null when the inputs are not plain data
 * (a Map, a Set or a promise would not show in JSON, so two different pages could share a key).
 */
export function renderKey(url: string, status: number, inputs: unknown): string | null {
  let plain = true;
  let json: string;
  try {
    json = JSON.stringify({ url, status, inputs }, (_key, value: unknown) => {
      if (value instanceof Map || value instanceof Set || value instanceof Promise || typeof value === "function")
        plain = false;
      return value;
    });
  } catch {
    return null; // a BigInt or a cycle: render it every time
  }
  return plain ? createHash("sha256").update(json).digest("base64url") : null;
}

/** A kept page for this key with `nonce` in its places, or undefined. */
export function cachedPage(key: string, nonce: string): Buffer | undefined {
  const pieces = pages.get(key);
  return pieces && withNonce(pieces, nonce);
}

/**
 * Whether a page at this URL may be kept or served kept: true from the second time the URL
 * comes within a minute. A first view costs no key, and a second one renders to keep.
 */
export function urlSeenBefore(url: string): boolean {
  if (urlsSeen.has(url)) return true;
  urlsSeen.set(url, true);
  return false;
}

/** Keeps a page rendered with the stand-in nonce and returns it with `nonce` in its places. */
export function keepPage(key: string, html: Buffer, nonce: string): Buffer {
  const pieces: Buffer[] = [];
  let from = 0;
  for (let at = html.indexOf(STAND_IN_BYTES); at !== -1; at = html.indexOf(STAND_IN_BYTES, from)) {
    pieces.push(html.subarray(from, at));
    from = at + STAND_IN_BYTES.length;
  }
  pieces.push(html.subarray(from));
  pages.set(key, pieces);
  return withNonce(pieces, nonce);
}

function withNonce(pieces: Buffer[], nonce: string): Buffer {
  const nonceBytes = Buffer.from(nonce);
  return Buffer.concat(pieces.flatMap((piece, i) => (i === 0 ? [piece] : [nonceBytes, piece])));
}
