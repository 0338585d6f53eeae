/** Reminder preferences as the account page's form sends them (client-safe: the form shares the labels). */
import { z } from "zod";

export const REMINDER_MODES = {
  off: "Off",
  due: "On days a planned task is due",
  weekly: "Weekly digest",
} as const;

export type ReminderMode = Exclude<keyof typeof REMINDER_MODES, "off">;

export const ReminderPreferencesSchema = z.object({
  tankId: z.coerce.number({ message: "Choose a tank." }).int().positive("Choose a tank."),
  mode: z.enum(["off", "due", "weekly"], { message: "Choose off, due days or a weekly digest." }),
  hour: z.coerce
    .number({ message: "Give the hour as a whole number from 0 to 23." })
    .int("Give the hour as a whole number from 0 to 23.")
    .min(0, "Give the hour as a whole number from 0 to 23.")
    .max(23, "Give the hour as a whole number from 0 to 23."),
});
