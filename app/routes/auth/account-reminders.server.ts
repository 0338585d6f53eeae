/** The account page's reminder preferences: each of the keeper's tanks with its setting, and the save. */
import { asc, eq } from "drizzle-orm";
import { redirect } from "react-router";
import { getDb } from "~/db/client.server";
import { tanks } from "~/db/schema";
import { reminderSubscriptions } from "~/db/schema-care";
import { ReminderPreferencesSchema } from "~/features/reminders/reminder-preferences";
import { setReminder } from "~/features/reminders/reminder-schedule.server";
import { invalid } from "~/http/pages.server";
import { fieldErrors } from "~/utils/form-errors";

export function reminderSettings(userId: number) {
  return getDb()
    .select({ tankId: tanks.id, name: tanks.name, mode: reminderSubscriptions.mode, hour: reminderSubscriptions.hour })
    .from(tanks)
    .leftJoin(reminderSubscriptions, eq(reminderSubscriptions.tankId, tanks.id))
    .where(eq(tanks.ownerId, userId))
    .orderBy(asc(tanks.name), asc(tanks.id))
    .all()
    .map((r) => ({ tankId: r.tankId, name: r.name, mode: r.mode ?? "off", hour: r.hour ?? 8 }));
}

export function saveReminderSettings(userId: number, values: Record<string, string>) {
  const parsed = ReminderPreferencesSchema.safeParse(values);
  if (!parsed.success) return invalid(fieldErrors(parsed.error), values);
  const tank = getDb().select({ ownerId: tanks.ownerId }).from(tanks).where(eq(tanks.id, parsed.data.tankId)).get();
  // Someone else's tank answers like an unknown one, so its existence does not leak.
  if (!tank || tank.ownerId !== userId) return invalid({ tankId: "No such tank of yours." }, values);
  setReminder(userId, parsed.data.tankId, parsed.data.mode, parsed.data.hour);
  return redirect("/account?saved=reminders");
}
