/**
 * Demo data: an invented club, the Tidewell Aquarium Circle, with three keepers, a teacher
 * with a class, and an admin. Every name, e-mail and tank here is made up for the demo;
 * the password is for local use only and is printed in README.md.
 */
import { hashPassword } from "~/auth.server";
import type { Db } from "./client.server";
import { classes, classMembers, tanks, users } from "./schema";
import { seedDemoScenarios } from "./seed-scenarios.server";

export const DEMO_PASSWORD = "tidewell-demo-2026";

export const DEMO_USERS = [
  { email: "admin@tidewell.example", name: "Rowan Admin", role: "admin" },
  { email: "teacher@tidewell.example", name: "Marta Quill", role: "educator" },
  { email: "jonah@tidewell.example", name: "Jonah Reed", role: "keeper" },
  { email: "ines@tidewell.example", name: "Ines Calloway", role: "keeper" },
  { email: "theo@tidewell.example", name: "Theo Marsh", role: "keeper" },
  { email: "student@tidewell.example", name: "Sam Student", role: "keeper" },
] as const;

/** Fills an empty database with the demo club. Runs in one transaction: all or nothing. */
export async function seedDemoData(db: Db): Promise<void> {
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  db.transaction((tx) => {
    const ids = new Map<string, number>();
    for (const u of DEMO_USERS) {
      const row = tx
        .insert(users)
        .values({ email: u.email, name: u.name, role: u.role, passwordHash, emailVerifiedAt: new Date() })
        .returning({ id: users.id })
        .get();
      ids.set(u.email, row.id);
    }
    const tankIds = {
      jonah: tx.insert(tanks).values({ ownerId: ids.get("jonah@tidewell.example")!, name: "Living-room 120", notes: "Community tank, moderately planted." }).returning({ id: tanks.id }).get().id,
      ines: tx.insert(tanks).values({ ownerId: ids.get("ines@tidewell.example")!, name: "Shrimp nano", notes: "Small tank with mosses and floating plants." }).returning({ id: tanks.id }).get().id,
      theo: tx.insert(tanks).values({ ownerId: ids.get("theo@tidewell.example")!, name: "Cichlid 200", notes: "Heavily stocked, few plants; tap water carries nitrate." }).returning({ id: tanks.id }).get().id,
      teacher: tx.insert(tanks).values({ ownerId: ids.get("teacher@tidewell.example")!, name: "Classroom demo tank", notes: "Prepared scenarios for lessons." }).returning({ id: tanks.id }).get().id,
    };
    seedDemoScenarios(tx, tankIds);
    const cls = tx
      .insert(classes)
      .values({ educatorId: ids.get("teacher@tidewell.example")!, name: "Year 9 Biology: the nitrogen cycle", joinCode: "TIDE-NINE" })
      .returning({ id: classes.id })
      .get();
    tx.insert(classMembers).values({ classId: cls.id, userId: ids.get("student@tidewell.example")! }).run();
  });
}
