// `npm run db:migrate`: applies the committed migrations in drizzle/ to DATABASE_URL.
import { closeDb, databasePath, getDb } from "~/db/client.server";
import { getEnv } from "~/env.server";

getDb();
console.log(`Migrated ${databasePath(getEnv().DATABASE_URL)}`);
closeDb();
