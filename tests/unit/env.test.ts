import { afterEach, describe, expect, it, vi } from "vitest";

// The brief: in production the server refuses to start without SESSION_SECRET (and the mail
// and public address it needs); locally it warns and uses a development secret.
const saved = { ...process.env };
afterEach(() => {
  process.env = { ...saved };
  vi.resetModules();
});

async function freshEnv(vars: Record<string, string | undefined>) {
  vi.resetModules();
  process.env = { ...saved, ...vars };
  for (const [k, v] of Object.entries(vars)) if (v === undefined) delete process.env[k];
  return import("~/env.server");
}

describe("environment checks at boot", () => {
  it("refuses production without SESSION_SECRET, SMTP_URL and APP_URL, naming each", async () => {
    const { getEnv } = await freshEnv({
      NODE_ENV: "production",
      FERNWATER_MODE: undefined,
      SESSION_SECRET: undefined,
      SMTP_URL: undefined,
      APP_URL: undefined,
    });
    expect(() => getEnv()).toThrow(/SESSION_SECRET must be set[\s\S]*APP_URL must be set[\s\S]*SMTP_URL must be set/);
  });

  it("refuses a short production secret", async () => {
    const { getEnv } = await freshEnv({
      NODE_ENV: "production",
      SESSION_SECRET: "too-short",
      SMTP_URL: "smtp://mail.example:25",
      APP_URL: "https://fernwater.example",
    });
    expect(() => getEnv()).toThrow(/at least 32/);
  });

  it("starts in production with all three set, and marks cookies Secure there", async () => {
    const { getEnv, isProduction } = await freshEnv({
      NODE_ENV: "production",
      FERNWATER_MODE: undefined,
      SESSION_SECRET: "x".repeat(40),
      SMTP_URL: "smtp://mail.example:25",
      APP_URL: "https://fernwater.example",
    });
    expect(getEnv().mode).toBe("production");
    expect(isProduction()).toBe(true);
  });

  it("uses a development secret with a warning in local mode", async () => {
    const warn = vi.spyOn(console, "warn").mockImplementation(() => {});
    const { getEnv } = await freshEnv({ NODE_ENV: "development", FERNWATER_MODE: "local", SESSION_SECRET: undefined });
    expect(getEnv().sessionSecret.length).toBeGreaterThan(20);
    expect(warn).toHaveBeenCalledWith(expect.stringMatching(/SESSION_SECRET is not set/));
    warn.mockRestore();
  });
});
