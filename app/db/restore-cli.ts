// `npm run db:restore -- <backup file> --yes`: replaces DATABASE_URL with a backup. Stop the server first.
import { databasePath } from "~/db/client.server";
import { restoreDatabase } from "~/db/backup.server";
import { getEnv } from "~/env.server";

const file = process.argv.slice(2).find((a) => !a.startsWith("--"));
if (!file || !process.argv.includes("--yes")) {
  console.error(
    "Usage: npm run db:restore -- <backup file> --yes   (stop the server first; the current file is kept beside it)",
  );
  process.exit(2);
}
const target = databasePath(getEnv().DATABASE_URL);
try {
  const counts = await restoreDatabase(file, target);
  console.log(`Restored ${file} into ${target}.`);
  for (const [table, n] of Object.entries(counts)) console.log(`  ${table.padEnd(24)} ${n}`);
} catch (error) {
  console.error(`Restore failed: ${(error as Error).message}`);
  process.exit(1);
}
