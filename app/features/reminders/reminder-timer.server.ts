/**
 * Drives the reminder check on a timer (croner) in every app process; the claim in the database,
 * not the timer, keeps processes from sending twice. REMINDER_CHECK_SECONDS sets the interval.
 */
import { randomUUID } from "node:crypto";
import { Cron } from "croner";
import { getEnv } from "~/env.server";
import { checkReminders } from "~/features/reminders/reminder-check.server";

export function startReminderTimer(log: (line: string) => void): () => void {
  const seconds = getEnv().REMINDER_CHECK_SECONDS;
  const claimer = `${process.pid}-${randomUUID()}`;
  const job = new Cron(`*/${seconds} * * * * *`, { protect: true, unref: true }, async () => {
    try {
      await checkReminders(claimer);
    } catch (error) {
      log(`[fernwater] reminder check failed: ${error instanceof Error ? error.message : String(error)}`);
    }
  });
  return () => job.stop();
}
