/**
 * Students' copies of lessons: made on first use as the student's own scenario in a class tank,
 * handed in once (and then kept: a handed-in copy cannot be deleted), and read by the educator.
 */
import { and, desc, eq, inArray, isNotNull, isNull } from "drizzle-orm";
import type { KeyFigures } from "~models";
import { copyScenarioInto } from "~/features/scenarios/copies.server";
import { getDb } from "~/db/client.server";
import { lessonCopies, lessons, runs, scenarios, tanks } from "~/db/schema";
import { notFound } from "~/permissions.server";
import type { SessionUser } from "~/session.server";
import { readStoredSettings } from "~/features/runs/simulation.server";
import { parseId, type ScenarioRow, type TankRow } from "~/features/tanks/tanks.server";
import type { ClassRow, LessonCopyRow, LessonRow } from "~/features/classes/class-rows";
import { roster } from "~/features/classes/class-members.server";

// ---------------------------------------------------------------------------------------------
// Students' copies

export function findCopy(lessonId: number, studentId: number): LessonCopyRow | null {
  return (
    getDb()
      .select()
      .from(lessonCopies)
      .where(and(eq(lessonCopies.lessonId, lessonId), eq(lessonCopies.studentId, studentId)))
      .get() ?? null
  );
}

/** The student's tank for this class: the one an earlier copy of the class lives in, if any. */
function classTankOf(studentId: number, classId: number): TankRow | null {
  const row = getDb()
    .select({ tank: tanks })
    .from(lessonCopies)
    .innerJoin(lessons, eq(lessons.id, lessonCopies.lessonId))
    .innerJoin(scenarios, eq(scenarios.id, lessonCopies.scenarioId))
    .innerJoin(tanks, eq(tanks.id, scenarios.tankId))
    .where(and(eq(lessonCopies.studentId, studentId), eq(lessons.classId, classId), eq(tanks.ownerId, studentId)))
    .orderBy(desc(lessonCopies.id))
    .get();
  return row?.tank ?? null;
}

/**
 * The student's copy of a lesson, made on first use: the lesson's frozen settings, run, stored
 * as their own scenario in their class tank (made if needed) with its lesson_copies row.
 * Null if the lesson's settings no longer read. Throws the API's JSON 422 Response if the engine
 * cannot run them.
 */
export async function startCopy(student: SessionUser, cls: ClassRow, lesson: LessonRow): Promise<LessonCopyRow | null> {
  const existing = findCopy(lesson.id, student.id);
  if (existing) return existing;
  const settings = readStoredSettings(lesson.settings);
  if (!settings) return null;
  const tank = classTankOf(student.id, cls.id);
  await copyScenarioInto(
    student.id,
    tank
      ? { tank }
      : { newTank: { name: `Class: ${cls.name}`.slice(0, 80), notes: `Lesson copies for the class “${cls.name}”.` } },
    lesson.title.slice(0, 120),
    settings,
    lesson.scenarioId,
    (tx, { scenarioId }) => {
      // A second click racing the first finds the unique index and keeps the first copy.
      tx.insert(lessonCopies)
        .values({ lessonId: lesson.id, studentId: student.id, scenarioId })
        .onConflictDoNothing()
        .run();
    },
  );
  return findCopy(lesson.id, student.id)!;
}

/** The copy's scenario and tank (the student owns both). */
export function copyScenario(copy: LessonCopyRow): { scenario: ScenarioRow; tank: TankRow } {
  const row = getDb()
    .select({ scenario: scenarios, tank: tanks })
    .from(scenarios)
    .innerJoin(tanks, eq(tanks.id, scenarios.tankId))
    .where(eq(scenarios.id, copy.scenarioId))
    .get();
  if (!row) notFound("This lesson copy no longer exists.");
  return row;
}

/**
 * A handed-in lesson copy among these scenarios (or in this tank), with its lesson's title: such
 * a copy cannot be deleted, so a student cannot drop a first answer and start the lesson again.
 */
export function handedInCopyIn(where: { tankId: number } | { scenarioId: number }): { lessonTitle: string } | null {
  const row = getDb()
    .select({ lessonTitle: lessons.title })
    .from(lessonCopies)
    .innerJoin(lessons, eq(lessons.id, lessonCopies.lessonId))
    .innerJoin(scenarios, eq(scenarios.id, lessonCopies.scenarioId))
    .where(
      and(
        "tankId" in where ? eq(scenarios.tankId, where.tankId) : eq(scenarios.id, where.scenarioId),
        isNotNull(lessonCopies.handedInAt),
      ),
    )
    .get();
  return row ?? null;
}

export function handIn(copyId: number, answer: string): boolean {
  const done = getDb()
    .update(lessonCopies)
    .set({ answer, handedInAt: new Date() })
    .where(and(eq(lessonCopies.id, copyId), isNull(lessonCopies.handedInAt)))
    .run();
  return done.changes > 0;
}

/** Every student of the class with their copy of the lesson (if started) and its newest key figures. */
export function handInTable(cls: ClassRow, lesson: LessonRow) {
  const db = getDb();
  const students = roster(cls.id);
  const copies = db
    .select({ copy: lessonCopies, scenarioName: scenarios.name })
    .from(lessonCopies)
    .innerJoin(scenarios, eq(scenarios.id, lessonCopies.scenarioId))
    .where(eq(lessonCopies.lessonId, lesson.id))
    .all();
  const runRows = copies.length
    ? db
        .select({ scenarioId: runs.scenarioId, keyFigures: runs.keyFigures })
        .from(runs)
        .where(
          inArray(
            runs.scenarioId,
            copies.map((c) => c.copy.scenarioId),
          ),
        )
        .orderBy(desc(runs.id))
        .all()
    : [];
  const figures = new Map<number, KeyFigures>();
  for (const r of runRows) if (!figures.has(r.scenarioId)) figures.set(r.scenarioId, r.keyFigures as KeyFigures);
  return students.map((s) => {
    const c = copies.find((x) => x.copy.studentId === s.id);
    return {
      student: { id: s.id, name: s.name },
      copy: c
        ? {
            id: c.copy.id,
            answer: c.copy.answer,
            handedInAt: c.copy.handedInAt,
            keyFigures: figures.get(c.copy.scenarioId) ?? null,
          }
        : null,
    };
  });
}

/** A student's copy for the class's educator; 404 unless the copy belongs to this lesson. */
export function requireCopyOfLesson(lesson: LessonRow, copyIdParam: string | undefined): LessonCopyRow {
  const copy = getDb()
    .select()
    .from(lessonCopies)
    .where(and(eq(lessonCopies.id, parseId(copyIdParam)), eq(lessonCopies.lessonId, lesson.id)))
    .get();
  if (!copy) notFound("There is no such copy in this lesson.");
  return copy;
}

/** Where a scenario that is a lesson copy is worked on (its owner's lesson page), or null. */
export function lessonCopyPath(scenarioId: number): string | null {
  const row = getDb()
    .select({ lessonId: lessons.id, classId: lessons.classId })
    .from(lessonCopies)
    .innerJoin(lessons, eq(lessons.id, lessonCopies.lessonId))
    .where(eq(lessonCopies.scenarioId, scenarioId))
    .get();
  return row ? `/classes/${row.classId}/lessons/${row.lessonId}/work` : null;
}

/** Fields whose shown value differs between two form models (the lesson's and a copy's), for "what they changed". */
