// `npm run seed`: seeds the demo club into an empty database; `-- --reset` wipes it first.
import fs from "node:fs";
import { count } from "drizzle-orm";
import { closeDb, databasePath, getDb } from "~/db/client.server";
import { users } from "~/db/schema";
import { DEMO_PASSWORD, DEMO_USERS, seedDemoData } from "~/db/seed.server";
import { getEnv } from "~/env.server";

const reset = process.argv.includes("--reset");
const file = databasePath(getEnv().DATABASE_URL);
if (reset && file !== ":memory:") {
  for (const f of [file, `${file}-wal`, `${file}-shm`]) fs.rmSync(f, { force: true });
  console.log(`Removed ${file}`);
}
const db = getDb();
const existing = db.select({ n: count() }).from(users).get()?.n ?? 0;
if (existing > 0) {
  console.log(
    `${file} already holds ${existing} users; nothing seeded. Use \`npm run seed -- --reset\` to start over.`,
  );
} else {
  await seedDemoData(db);
  console.log(`Seeded the demo club into ${file}. Accounts (password "${DEMO_PASSWORD}"):`);
  for (const u of DEMO_USERS) console.log(`  ${u.role.padEnd(8)} ${u.email}`);
}
closeDb();
