// `npm run db:backup [-- <file>]`: an online backup of DATABASE_URL (safe while the server runs).
import path from "node:path";
import { databasePath } from "~/db/client.server";
import { backupDatabase } from "~/db/backup.server";
import { getEnv } from "~/env.server";

const source = databasePath(getEnv().DATABASE_URL);
const stamp = new Date().toISOString().replace(/[:.]/g, "-");
const destination = process.argv[2] ?? path.join(path.dirname(source), "backups", `fernwater-${stamp}.sqlite`);
try {
  const counts = await backupDatabase(source, destination);
  console.log(`Backed up ${source} to ${destination} (integrity ok).`);
  for (const [table, n] of Object.entries(counts)) console.log(`  ${table.padEnd(24)} ${n}`);
} catch (error) {
  console.error(`Backup failed: ${(error as Error).message}`);
  process.exit(1);
}
