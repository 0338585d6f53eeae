import { describe, expect, it } from "vitest";
import { webConcurrency } from "../../server/web-concurrency.mjs";

// Model choice, no source: one process per core in production, one on a keeper's laptop.
describe("how many app processes start", () => {
  it("uses every core in production and one in local mode", () => {
    expect(webConcurrency({ FERNWATER_MODE: "production" }, 8)).toBe(8);
    expect(webConcurrency({ NODE_ENV: "production" }, 2)).toBe(2);
    expect(webConcurrency({ NODE_ENV: "production", FERNWATER_MODE: "local" }, 8)).toBe(1);
    expect(webConcurrency({}, 8)).toBe(1);
  });

  it("follows WEB_CONCURRENCY, and refuses a value that is not a whole number", () => {
    expect(webConcurrency({ WEB_CONCURRENCY: "3", FERNWATER_MODE: "local" }, 8)).toBe(3);
    expect(webConcurrency({ WEB_CONCURRENCY: "1", FERNWATER_MODE: "production" }, 8)).toBe(1);
    expect(() => webConcurrency({ WEB_CONCURRENCY: "two" }, 8)).toThrow(/whole number/);
    expect(() => webConcurrency({ WEB_CONCURRENCY: "0" }, 8)).toThrow(/whole number/);
  });
});
