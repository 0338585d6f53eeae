/**
 * A sender that dies between claiming a due reminder and sending it: it claims the row through
 * the app's own claim, says so, and is killed with SIGKILL (no cleanup, no send) — the crash the
 * at-least-once guarantee is about. Spawned by tests/integration/reminders.test.ts with the
 * test's DATABASE_URL; arguments: the reminder's id and the clock (ms).
 */
import { claim } from "~/features/reminders/reminder-schedule.server";

const [id, now] = process.argv.slice(2).map(Number);
const claimed = claim(id, `killed-sender-${process.pid}`, now);
process.stdout.write(claimed ? "claimed\n" : "not claimed\n", () => process.kill(process.pid, "SIGKILL"));
