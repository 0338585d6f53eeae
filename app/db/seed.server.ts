/**
 * Demo data: an invented club, the Tidewell Aquarium Circle, with three keepers, a teacher
 * with a class, and an admin. Every name, e-mail and tank here is made up for the demo;
 * the password is for local use only and is printed in README.md.
 */
import { DEFAULT_NITRATE_TARGETS } from "~/features/tanks/nitrate-targets";
import { and, eq } from "drizzle-orm";
import { hashPassword } from "~/auth.server";
import { hashToken } from "~/utils/crypto.server";
import type { Db } from "~/db/client.server";
import { classes, classMembers, lessons, scenarios, shareLinks, tanks, users } from "~/db/schema";
import { seedDemoJournal } from "~/db/seed-journal.server";
import { seedDemoReadings } from "~/db/seed-readings.server";
import { seedDemoScenarios } from "~/db/seed-scenarios.server";

export const DEMO_PASSWORD = "tidewell-demo-2026";

/**
 * The demo public link, /s/tidewell-demo-theo-as-kept-now (Theo's "As kept now"). A fixed,
 * guessable token is acceptable only because the demo club is seeded on local machines only;
 * real links carry 256 random bits (app/features/sharing/share.server.ts). Stored hashed like any other.
 */
export const DEMO_SHARE_TOKEN = "tidewell-demo-theo-as-kept-now";

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
      jonah: tx
        .insert(tanks)
        .values({
          ownerId: ids.get("jonah@tidewell.example")!,
          name: "Living-room 120",
          notes: "Community tank, moderately planted.",
          ...DEFAULT_NITRATE_TARGETS,
        })
        .returning({ id: tanks.id })
        .get().id,
      ines: tx
        .insert(tanks)
        .values({
          ownerId: ids.get("ines@tidewell.example")!,
          name: "Shrimp nano",
          notes: "Small tank with mosses and floating plants.",
          ...DEFAULT_NITRATE_TARGETS,
        })
        .returning({ id: tanks.id })
        .get().id,
      theo: tx
        .insert(tanks)
        .values({
          ownerId: ids.get("theo@tidewell.example")!,
          name: "Cichlid 200",
          notes: "Heavily stocked, few plants; tap water carries nitrate.",
          ...DEFAULT_NITRATE_TARGETS,
        })
        .returning({ id: tanks.id })
        .get().id,
      teacher: tx
        .insert(tanks)
        .values({
          ownerId: ids.get("teacher@tidewell.example")!,
          name: "Classroom demo tank",
          notes: "Prepared scenarios for lessons.",
          ...DEFAULT_NITRATE_TARGETS,
        })
        .returning({ id: tanks.id })
        .get().id,
    };
    seedDemoScenarios(tx, tankIds);
    seedDemoReadings(tx, tankIds.jonah);
    seedDemoJournal(tx, tankIds.jonah);
    const cls = tx
      .insert(classes)
      .values({
        educatorId: ids.get("teacher@tidewell.example")!,
        name: "Year 9 Biology: the nitrogen cycle",
        joinCode: "TIDE-NINE",
      })
      .returning({ id: classes.id })
      .get();
    tx.insert(classMembers)
      .values({ classId: cls.id, userId: ids.get("student@tidewell.example")! })
      .run();
    const scenarioIn = (tankId: number, name: string) =>
      tx
        .select()
        .from(scenarios)
        .where(and(eq(scenarios.tankId, tankId), eq(scenarios.name, name)))
        .get()!;
    const cycling = scenarioIn(tankIds.teacher, "A new tank cycling without fish");
    tx.insert(lessons)
      .values({
        classId: cls.id,
        scenarioId: cycling.id,
        title: "How a new tank cycles",
        question:
          "Ammonia peaks first, then nitrite, then nitrate climbs. Try a warmer tank or a higher pH: what happens to the free ammonia peak, and why?",
        unlockedFields: ["water.temperatureC", "water.pH"],
        settings: cycling.settings,
      })
      .run();
    const asKept = scenarioIn(tankIds.theo, "As kept now");
    tx.insert(shareLinks)
      .values({ scenarioId: asKept.id, tokenHash: hashToken(DEMO_SHARE_TOKEN) })
      .run();
  });
}
