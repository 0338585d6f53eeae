import { describe, expect, it } from "vitest";
import { safeRedirect } from "~/utils/safe-redirect";
import { REDIRECT_BYPASSES } from "../support/attack-inputs";

// Each bypass form (tests/support/attack-inputs.ts) must land on our own origin as the browser
// resolves it, or on the fallback.
const ORIGIN = "https://fernwater.example";

describe("safe redirects", () => {
  it.each(REDIRECT_BYPASSES)("keeps %j on our own site", (value) => {
    const to = safeRedirect(value);
    expect(to).toBe("/tanks");
  });

  it("keeps our own paths, queries and fragments as they are", () => {
    for (const path of [
      "/tanks",
      "/tanks/3/scenarios/5?job=abc#results",
      "/s/Ab-_9",
      "/classes/invite/tok_123",
      "/@someone",
      "/tanks?q=a%20b",
    ]) {
      expect(safeRedirect(path)).toBe(path);
    }
  });

  it("never hands back anything a header cannot carry, nor anything the browser reads as elsewhere", () => {
    for (const value of [
      ...REDIRECT_BYPASSES,
      "/tanks/ڳ🐟",
      "/tanks/é",
      "/ok/\u00a0x",
      null,
      undefined,
      42 as unknown as string,
    ]) {
      const to = safeRedirect(value);
      expect(/^[\x21-\x7e]+$/.test(to), JSON.stringify(to)).toBe(true);
      expect(new URL(to, ORIGIN).origin).toBe(ORIGIN);
      expect(to.startsWith("/") && !to.startsWith("//")).toBe(true);
    }
    expect(safeRedirect("/tanks/ڳ")).toBe("/tanks/%DA%B3");
  });

  it("uses the fallback it is given", () => {
    expect(safeRedirect("//evil.example", "/account")).toBe("/account");
  });
});
