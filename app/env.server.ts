import { z } from "zod";

/**
 * The server's environment, read and checked once at boot.
 *
 * FERNWATER_MODE decides how strict we are:
 * - "production": SESSION_SECRET and SMTP_URL are required; cookies are Secure.
 * - "local" (the default outside NODE_ENV=production, and what `npm start` uses): a
 *   development secret with a warning, a fake SMTP server that captures mail, the demo
 *   data seeded into an empty database, and the /dev/mail page.
 */
const EnvSchema = z
  .object({
    NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
    FERNWATER_MODE: z.enum(["local", "production"]).optional(),
    DATABASE_URL: z.string().min(1).default("data/fernwater.sqlite"),
    SESSION_SECRET: z.string().optional(),
    SMTP_URL: z.string().url().optional(),
    MAIL_FROM: z.string().default("Fernwater <no-reply@fernwater.local>"),
    MAIL_CAPTURE_DIR: z.string().default("data/mail"),
    APP_URL: z.string().url().optional(),
    PORT: z.coerce.number().int().min(0).max(65535).default(3000),
    SEED_IF_EMPTY: z.enum(["0", "1"]).optional(),
    /** Redis for the job queue (BullMQ): sweeps, calibrations and target searches then run on `npm run worker` processes. */
    /** Seconds between reminder checks in each app process (1–59; e2e tests use a short one). */
    REMINDER_CHECK_SECONDS: z.coerce.number().int().min(1).max(59).default(30),
    REDIS_URL: z
      .string()
      .regex(/^rediss?:\/\//, "REDIS_URL must start with redis:// or rediss://")
      .optional(),
  })
  .transform((raw) => {
    const mode = raw.FERNWATER_MODE ?? (raw.NODE_ENV === "production" ? "production" : "local");
    return { ...raw, mode } as const;
  })
  .superRefine((env, ctx) => {
    if (env.mode !== "production") return;
    if (!env.SESSION_SECRET || env.SESSION_SECRET.length < 32) {
      ctx.addIssue({
        code: "custom",
        path: ["SESSION_SECRET"],
        message: "SESSION_SECRET must be set to at least 32 random characters in production",
      });
    }
    if (!env.APP_URL) {
      ctx.addIssue({
        code: "custom",
        path: ["APP_URL"],
        message: "APP_URL must be set in production (links in e-mails are built from it, never from the Host header)",
      });
    }
    if (!env.SMTP_URL) {
      ctx.addIssue({ code: "custom", path: ["SMTP_URL"], message: "SMTP_URL must be set in production" });
    }
  });

export type Env = z.output<typeof EnvSchema>;

const DEV_SESSION_SECRET = "fernwater-local-development-secret-not-for-production";

let cached: (Env & { sessionSecret: string }) | undefined;

/** The environment cannot run Fernwater; server/start.mjs prints the message alone, on one line. */
export class EnvError extends Error {
  override name = "FernwaterConfigError";
}

/** Parses process.env once; throws an EnvError listing every bad variable. */
export function getEnv(): Env & { sessionSecret: string } {
  if (cached) return cached;
  // An empty variable counts as unset (VAR= in a shell or a .env file).
  const present = Object.fromEntries(Object.entries(process.env).filter(([, v]) => v !== undefined && v !== ""));
  const parsed = EnvSchema.safeParse(present);
  if (!parsed.success) {
    const problems = parsed.error.issues.map((i) => `${i.path.join(".") || "env"}: ${i.message}`);
    throw new EnvError(`Fernwater cannot start; fix the environment: ${problems.join("; ")}.`);
  }
  const env = parsed.data;
  let sessionSecret = env.SESSION_SECRET ?? "";
  if (!sessionSecret) {
    if (env.NODE_ENV !== "test") {
      console.warn(
        "[fernwater] SESSION_SECRET is not set: using the local development secret. Never do this in production.",
      );
    }
    sessionSecret = DEV_SESSION_SECRET;
  }
  cached = { ...env, sessionSecret };
  return cached;
}

export function isProduction(): boolean {
  return getEnv().mode === "production";
}

/** Local mode only: point outgoing mail at the fake SMTP server started at boot. */
export function redirectMailTo(url: string): void {
  const env = getEnv();
  if (env.mode !== "local") throw new Error("Only local mode may replace SMTP_URL at run time");
  cached = { ...env, SMTP_URL: url };
}
