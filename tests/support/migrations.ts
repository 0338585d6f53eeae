/** Databases as they were before a migration, for testing what the migration does to them. */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";

/** A migrations folder holding only the migrations before `tag` (a database as it was then). */
export function migrationsBefore(tag: string): string {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "fernwater-migrations-"));
  fs.mkdirSync(path.join(dir, "meta"));
  const journal = JSON.parse(fs.readFileSync("drizzle/meta/_journal.json", "utf8")) as { entries: { tag: string }[] };
  const cut = journal.entries.findIndex((entry) => entry.tag === tag);
  if (cut <= 0) throw new Error(`no migration ${tag} after the first in drizzle/meta/_journal.json`);
  const entries = journal.entries.slice(0, cut);
  for (const entry of entries) fs.copyFileSync(`drizzle/${entry.tag}.sql`, path.join(dir, `${entry.tag}.sql`));
  fs.writeFileSync(path.join(dir, "meta/_journal.json"), JSON.stringify({ ...journal, entries }));
  return dir;
}
