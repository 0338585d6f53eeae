/**
 * One pass of the reminder check, run every minute in each app process (reminder-timer.server.ts)
 * and directly by tests: claim each due row, send its mail, move it to its next due time.
 */
import { sendMail } from "~/email.server";
import { reminderMail } from "~/features/reminders/reminder-mail.server";
import { claim, dueReminderIds, markSent, subscriptionById } from "~/features/reminders/reminder-schedule.server";

export async function checkReminders(claimer: string, now = Date.now()): Promise<number> {
  let sent = 0;
  for (const id of dueReminderIds(now)) {
    if (!claim(id, claimer, now)) continue;
    const row = subscriptionById(id);
    if (!row) continue;
    const mail = await reminderMail(row, now);
    // A failed send leaves the claim to run out: the next check after the lease tries again.
    if (mail) await sendMail(mail);
    markSent(row, claimer, now, !!mail);
    if (mail) sent += 1;
  }
  return sent;
}
