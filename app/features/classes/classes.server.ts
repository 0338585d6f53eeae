/**
 * Classes, lessons and students' lesson copies.
 *
 * - A class belongs to one educator. Students are ordinary keepers who join with the class's
 *   join code or an e-mailed, single-use invitation (the token is stored hashed).
 * - A lesson freezes a copy of the educator's scenario (lessons.settings) with a question and
 *   the setup-form fields students may change (lessons.unlocked_fields). The pseudo-field
 *   "plants" lets students add and remove plant groups (and so change every plant setting);
 *   without it the plant groups are fixed and only their unlocked fields may change.
 * - A student's copy is a normal scenario they own, in a tank the app makes for the class
 *   ("Class: <name>"), plus a lesson_copies row. Saving it goes through the setup form's
 *   handler with `enforce`, which refuses any change to a locked field, even a forged one.
 *
 * Access: the class's educator sees everything of the class; a member sees the class and their
 * own copies; anyone else (admins included: classes are private) gets 404. Roles are checked on
 * every request, not only ownership: an educator demoted to keeper keeps their classes read-only
 * (lesson titles and students' names; no e-mails, no hand-ins, no invitations or removals — 403)
 * until an admin hands them to another educator (docs/decisions/0007-demoted-educators.md).
 */
import { and, asc, eq, inArray } from "drizzle-orm";
import { data } from "react-router";
import type { Scenario } from "~models";
import { getDb } from "~/db/client.server";
import { classes, classMembers, lessons, scenarios, tanks, users } from "~/db/schema";
import { hasRole, notFound } from "~/permissions.server";
import type { SessionUser } from "~/session.server";
import {
  findRun,
  readStoredSettings,
  runEngine,
  settingsHash,
  type StoredRun,
} from "~/features/runs/simulation.server";
import { parseId } from "~/features/tanks/tanks.server";
import { READ_ONLY_CLASS } from "~/features/classes/class-messages";

import type { ClassRow, LessonRow } from "~/features/classes/class-rows";

export type { ClassRow, LessonRow } from "~/features/classes/class-rows";

// Membership (codes, roster, invitations) and students' copies live in their own modules.
export * from "~/features/classes/class-members.server";
export * from "~/features/classes/lesson-copies.server";
export * from "~/features/classes/lesson-locks.server";
import { isMember, newJoinCode } from "~/features/classes/class-members.server";

// ---------------------------------------------------------------------------------------------
// Classes and members

/**
 * An admin hands a class to another educator (after its own was demoted, or moved on): the new
 * educator gets the class, its lessons and the students' hand-ins. Their own scenario behind a
 * lesson stays the old owner's; the lesson keeps its frozen settings, so nothing changes for students.
 */
export function handOverClass(classId: number, toUserId: number): { ok: true } | { ok: false; message: string } {
  return getDb().transaction((tx) => {
    const target = tx.select({ id: users.id, role: users.role }).from(users).where(eq(users.id, toUserId)).get();
    if (!target || !hasRole(target, "educator"))
      return { ok: false, message: "Choose someone who is an educator (or an admin)." };
    if (
      tx
        .select({ userId: classMembers.userId })
        .from(classMembers)
        .where(and(eq(classMembers.classId, classId), eq(classMembers.userId, toUserId)))
        .get()
    ) {
      return { ok: false, message: "That person is a student of this class; take them out of it first." };
    }
    const done = tx.update(classes).set({ educatorId: toUserId }).where(eq(classes.id, classId)).run();
    return done.changes === 1 ? { ok: true } : { ok: false, message: "That class no longer exists." };
  });
}

export function createClass(educatorId: number, name: string): number {
  // A clash of random codes is unlikely; the unique index settles it, and we try again.
  for (let attempt = 0; attempt < 5; attempt++) {
    const row = getDb()
      .insert(classes)
      .values({ educatorId, name, joinCode: newJoinCode() })
      .onConflictDoNothing()
      .returning({ id: classes.id })
      .get();
    if (row) return row.id;
  }
  throw new Error("Could not find a free join code.");
}

/** Classes the person runs and classes they are a member of. */
export function classesOf(userId: number) {
  const db = getDb();
  const running = db
    .select({ id: classes.id, name: classes.name, joinCode: classes.joinCode, createdAt: classes.createdAt })
    .from(classes)
    .where(eq(classes.educatorId, userId))
    .orderBy(asc(classes.name))
    .all();
  const counts = new Map<number, number>();
  if (running.length) {
    for (const m of db
      .select({ classId: classMembers.classId })
      .from(classMembers)
      .where(
        inArray(
          classMembers.classId,
          running.map((c) => c.id),
        ),
      )
      .all())
      counts.set(m.classId, (counts.get(m.classId) ?? 0) + 1);
  }
  const member = db
    .select({ id: classes.id, name: classes.name, educator: users.name })
    .from(classMembers)
    .innerJoin(classes, eq(classes.id, classMembers.classId))
    .innerJoin(users, eq(users.id, classes.educatorId))
    .where(eq(classMembers.userId, userId))
    .orderBy(asc(classes.name))
    .all();
  return { running: running.map((c) => ({ ...c, students: counts.get(c.id) ?? 0 })), member };
}

export type ClassRelation = "educator" | "former educator" | "student";

/**
 * The class and how the person relates to it; 404 for anyone who neither runs it nor belongs to
 * it. Its educator counts as "former educator" while their role is below educator.
 */
export function requireClassAccess(
  user: SessionUser,
  classIdParam: string | undefined,
): { cls: ClassRow; as: ClassRelation } {
  const cls = getDb()
    .select()
    .from(classes)
    .where(eq(classes.id, parseId(classIdParam)))
    .get();
  if (cls && cls.educatorId === user.id) return { cls, as: hasRole(user, "educator") ? "educator" : "former educator" };
  if (cls && isMember(cls.id, user.id)) return { cls, as: "student" };
  notFound("There is no such class among yours.");
}

export { READ_ONLY_CLASS };

/** The class, for its own educator only (404 for everyone else, members included; 403 once demoted). */
export function requireOwnClass(user: SessionUser, classIdParam: string | undefined): ClassRow {
  const { cls, as } = requireClassAccess(user, classIdParam);
  if (as === "former educator") throw data({ message: READ_ONLY_CLASS }, { status: 403 });
  if (as !== "educator") notFound("There is no such class among yours.");
  return cls;
}

/** Whether the class's educator still holds the educator role (else it takes no new students). */

// ---------------------------------------------------------------------------------------------
// Lessons (their locks: lesson-locks.server.ts)

const presented = new Map<string, StoredRun>();

/**
 * The run of a lesson's frozen settings, for the presentation view: the handed-out scenario's
 * stored run while its settings are unchanged, else one run kept in memory (the engine is
 * deterministic, so it never goes stale). Null when the settings no longer read.
 * Throws the engine's ModelError for settings it cannot resolve.
 */
export async function lessonRun(
  lesson: Pick<LessonRow, "scenarioId" | "settings">,
  educatorId: number,
): Promise<{ settings: Scenario; run: StoredRun } | null> {
  const settings = readStoredSettings(lesson.settings);
  if (!settings) return null;
  const hash = settingsHash(settings);
  const stored = lesson.scenarioId ? findRun(lesson.scenarioId, hash) : null;
  if (stored) return { settings, run: stored };
  let run = presented.get(hash);
  if (!run) {
    const result = await runEngine(settings, { userId: educatorId, purpose: "view" });
    const { warnings, lowOxygenZones, ammoniaCriteria } = result;
    run = {
      id: 0,
      scenarioId: lesson.scenarioId ?? 0,
      settingsHash: hash,
      createdAt: new Date(),
      ...result,
      findings: { warnings, lowOxygenZones, ammoniaCriteria },
    };
    presented.set(hash, run);
    if (presented.size > 16) presented.delete(presented.keys().next().value!);
  }
  return { settings, run };
}

export function listLessons(classId: number) {
  return getDb()
    .select({ id: lessons.id, title: lessons.title, question: lessons.question, createdAt: lessons.createdAt })
    .from(lessons)
    .where(eq(lessons.classId, classId))
    .orderBy(asc(lessons.createdAt), asc(lessons.id))
    .all();
}

export function requireLesson(cls: ClassRow, lessonIdParam: string | undefined): LessonRow {
  const lesson = getDb()
    .select()
    .from(lessons)
    .where(and(eq(lessons.id, parseId(lessonIdParam)), eq(lessons.classId, cls.id)))
    .get();
  if (!lesson) notFound("There is no such lesson in this class.");
  return lesson;
}

/** The educator's own scenarios to choose from for a lesson (name with tank). */
export function educatorScenarios(educatorId: number) {
  return getDb()
    .select({ id: scenarios.id, name: scenarios.name, tankName: tanks.name })
    .from(scenarios)
    .innerJoin(tanks, eq(tanks.id, scenarios.tankId))
    .where(eq(tanks.ownerId, educatorId))
    .orderBy(asc(tanks.name), asc(scenarios.name))
    .all();
}

export function insertLesson(values: {
  classId: number;
  scenarioId: number;
  title: string;
  question: string;
  unlockedFields: string[];
  settings: Scenario;
}): number {
  return getDb().insert(lessons).values(values).returning({ id: lessons.id }).get().id;
}
