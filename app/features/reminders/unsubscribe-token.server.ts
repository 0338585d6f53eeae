/**
 * The signed token in a reminder's unsubscribe link: it works without signing in, so it carries
 * the subscription id and is signed with the app's secret (HMAC-SHA256). Checked in constant time.
 */
import { createHmac, timingSafeEqual } from "node:crypto";
import { getEnv } from "~/env.server";

const sign = (payload: string) =>
  createHmac("sha256", getEnv().sessionSecret).update(`reminder-unsubscribe:${payload}`).digest("base64url");

export function unsubscribeToken(subscriptionId: number): string {
  const payload = String(subscriptionId);
  return `${payload}.${sign(payload)}`;
}

/** The subscription id the token was made for, or null when it is malformed or tampered with. */
export function readUnsubscribeToken(token: string): number | null {
  const m = /^([1-9]\d{0,15})\.([A-Za-z0-9_-]{43})$/.exec(token);
  if (!m) return null;
  const given = Buffer.from(m[2]);
  const expected = Buffer.from(sign(m[1]));
  if (given.length !== expected.length || !timingSafeEqual(given, expected)) return null;
  return Number(m[1]);
}
