import { count } from "drizzle-orm";
import { getDb } from "~/db/client.server";
import { users } from "~/db/schema";
import { seedDemoData } from "~/db/seed.server";
import { getEnv, redirectMailTo } from "~/env.server";
import { startJobResumer } from "~/features/jobs/job-resume.server";
import { releaseLocalJobs } from "~/features/jobs/jobs.server";
import { startReminderTimer } from "~/features/reminders/reminder-timer.server";
import { startFakeSmtp, type FakeSmtp } from "~/mail/fake-smtp.server";

/**
 * Migrates the database and seeds the demo data into an empty one. With several app processes
 * (server/start.mjs) the primary does this once before starting them, so they never race.
 */
export async function prepareDatabase(log: (line: string) => void = console.log): Promise<void> {
  const env = getEnv();
  const db = getDb();
  log(`[fernwater] database ${env.DATABASE_URL} migrated`);
  const seedIfEmpty = env.SEED_IF_EMPTY ? env.SEED_IF_EMPTY === "1" : env.mode === "local";
  if (seedIfEmpty) {
    const existing = db.select({ n: count() }).from(users).get()?.n ?? 0;
    if (existing === 0) {
      await seedDemoData(db);
      log("[fernwater] empty database: demo data seeded (accounts are listed in README.md)");
    }
  }
}

/**
 * Everything that must happen before the first request: check the environment, start the
 * local mail fake when no real SMTP service is configured (local mode only), migrate the
 * database, and seed the demo data into an empty one. Returns a function that stops what
 * it started.
 */
export async function boot(log: (line: string) => void = console.log): Promise<() => Promise<void>> {
  let fake: FakeSmtp | undefined;
  const env = getEnv();
  if (env.mode === "local" && !env.SMTP_URL) {
    fake = await startFakeSmtp({ captureDir: env.MAIL_CAPTURE_DIR });
    redirectMailTo(fake.url);
    log(`[fernwater] mail goes to the local fake SMTP server at ${fake.url}; read it at /dev/mail`);
  }
  await prepareDatabase(log);
  const stopReminders = startReminderTimer(log);
  // Jobs of a process that stopped are run again here (decision 0009); a stop leaves ours to others.
  const stopResumer = startJobResumer(log);
  return async () => {
    stopReminders();
    stopResumer();
    releaseLocalJobs();
    await fake?.close();
  };
}
