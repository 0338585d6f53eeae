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
import { and, asc, desc, eq, gt, inArray, isNotNull, isNull } from "drizzle-orm";
import { data } from "react-router";
import type { KeyFigures, Scenario } from "../models";
import { copyScenarioInto } from "~/copies.server";
import { getDb } from "~/db/client.server";
import { classes, classInvites, classMembers, lessonCopies, lessons, runs, scenarios, tanks, users } from "~/db/schema";
import { absoluteUrl, sendMail } from "~/email.server";
import { hasRole, notFound } from "~/permissions.server";
import { giveBack, LIMITS, take, takeAll, waitText } from "~/rate-limits.server";
import { buildScenarioForm } from "~/scenario-form.server";
import type { SessionUser } from "~/session.server";
import { findRun, readStoredSettings, runEngine, settingsHash, type StoredRun } from "~/simulation.server";
import { parseId, type ScenarioRow, type TankRow } from "~/tanks.server";
import { READ_ONLY_CLASS } from "~/utils/class-messages";
import { hashToken, randomToken } from "~/utils/crypto.server";
import type { DisplayUnits } from "~/utils/display-units";
import type { FieldErrors } from "~/utils/form-errors";
import type { FormField, ScenarioFormModel } from "~/utils/scenario-form-types";

export type ClassRow = typeof classes.$inferSelect;
export type LessonRow = typeof lessons.$inferSelect;
export type LessonCopyRow = typeof lessonCopies.$inferSelect;

// ---------------------------------------------------------------------------------------------
// Join codes

/** No 0/O, 1/I/L: a code read aloud or off a board is not mistaken. */
const CODE_ALPHABET = "ABCDEFGHJKMNPQRSTUVWXYZ23456789";

/** A fresh code like "K7QM-2XHP" (31^8 ≈ 8.5 × 10^11 codes; joining is rate-limited). */
export function newJoinCode(): string {
  const bytes = Buffer.from(randomToken(16), "base64url");
  let code = "";
  for (let i = 0; i < 8; i++) code += CODE_ALPHABET[bytes[i] % CODE_ALPHABET.length];
  return `${code.slice(0, 4)}-${code.slice(4)}`;
}

/** What a person typed → the stored form ("tide nine", "tidenine" → "TIDE-NINE"); null if it cannot be a code. */
export function normaliseJoinCode(input: string): string | null {
  const plain = input.toUpperCase().replace(/[^A-Z0-9]/g, "");
  if (plain.length !== 8) return null;
  return `${plain.slice(0, 4)}-${plain.slice(4)}`;
}

/** Wrong codes per person per ten minutes: guessing a code by trying is hopeless. */
export const JOIN_ATTEMPTS = LIMITS.wrongJoinCodesPerPerson.points;

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
    if (!target || !hasRole(target, "educator")) return { ok: false, message: "Choose someone who is an educator (or an admin)." };
    if (tx.select({ userId: classMembers.userId }).from(classMembers).where(and(eq(classMembers.classId, classId), eq(classMembers.userId, toUserId))).get()) {
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

function isMember(classId: number, userId: number): boolean {
  return !!getDb()
    .select({ userId: classMembers.userId })
    .from(classMembers)
    .where(and(eq(classMembers.classId, classId), eq(classMembers.userId, userId)))
    .get();
}

export type ClassRelation = "educator" | "former educator" | "student";

/**
 * The class and how the person relates to it; 404 for anyone who neither runs it nor belongs to
 * it. Its educator counts as "former educator" while their role is below educator.
 */
export function requireClassAccess(user: SessionUser, classIdParam: string | undefined): { cls: ClassRow; as: ClassRelation } {
  const cls = getDb().select().from(classes).where(eq(classes.id, parseId(classIdParam))).get();
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
export function classIsRun(cls: Pick<ClassRow, "educatorId">): boolean {
  const educator = getDb().select({ role: users.role }).from(users).where(eq(users.id, cls.educatorId)).get();
  return !!educator && hasRole(educator, "educator");
}

const NOT_TAKING = "This class is not taking new students: its teacher no longer runs classes here. Ask your teacher.";

export function roster(classId: number) {
  return getDb()
    .select({ id: users.id, name: users.name, email: users.email, joinedAt: classMembers.joinedAt })
    .from(classMembers)
    .innerJoin(users, eq(users.id, classMembers.userId))
    .where(eq(classMembers.classId, classId))
    .orderBy(asc(users.name))
    .all();
}

/**
 * Takes a student out of the class. Their lesson copies stay theirs as ordinary scenarios, but
 * the class's educator no longer sees them (the lesson_copies rows go), all in one transaction.
 */
export function removeStudent(classId: number, studentId: number): boolean {
  return getDb().transaction((tx) => {
    const done = tx
      .delete(classMembers)
      .where(and(eq(classMembers.classId, classId), eq(classMembers.userId, studentId)))
      .run();
    if (done.changes === 0) return false;
    const lessonIds = tx.select({ id: lessons.id }).from(lessons).where(eq(lessons.classId, classId)).all().map((l) => l.id);
    if (lessonIds.length) {
      tx.delete(lessonCopies)
        .where(and(eq(lessonCopies.studentId, studentId), inArray(lessonCopies.lessonId, lessonIds)))
        .run();
    }
    return true;
  });
}

export type JoinOutcome = { ok: true; classId: number } | { ok: false; message: string; status?: 409 | 429 };

/** Joins the class with this code (joining twice is harmless). Wrong codes count against a limit. */
export async function joinWithCode(user: SessionUser, input: string): Promise<JoinOutcome> {
  const key = `user:${user.id}`;
  // Counted before the code is looked up (parallel guesses cannot all pass); a right code gives it back.
  const wait = await take("wrongJoinCodesPerPerson", key);
  if (wait > 0) return { ok: false, status: 429, message: `Too many wrong codes. Try again in ${waitText(wait)}.` };
  const code = normaliseJoinCode(input);
  const cls = code ? getDb().select().from(classes).where(eq(classes.joinCode, code)).get() : undefined;
  if (!cls) {
    return { ok: false, message: "No class has that code. Check it with your teacher: it looks like ABCD-EF23." };
  }
  await giveBack("wrongJoinCodesPerPerson", key);
  if (cls.educatorId === user.id) return { ok: false, message: "You run this class, so you cannot join it as a student." };
  if (!classIsRun(cls)) return { ok: false, status: 409, message: NOT_TAKING };
  getDb().insert(classMembers).values({ classId: cls.id, userId: user.id }).onConflictDoNothing().run();
  return { ok: true, classId: cls.id };
}

// ---------------------------------------------------------------------------------------------
// Invitations

export const INVITE_DAYS = 14;

/**
 * Sends an invitation with a single-use link (the token is stored hashed). The row is written
 * first and removed again if the mail cannot be sent, so no dead invitation is left behind.
 */
export async function inviteByEmail(
  request: Request,
  cls: ClassRow,
  educator: SessionUser,
  email: string,
): Promise<{ ok: true } | { ok: false; message: string; status?: 429 }> {
  const already = getDb()
    .select({ id: users.id })
    .from(classMembers)
    .innerJoin(users, eq(users.id, classMembers.userId))
    .where(and(eq(classMembers.classId, cls.id), eq(users.email, email)))
    .get();
  if (already) return { ok: false, message: "That person is already in the class." };
  // Counted before anything is written or sent, per educator and per invited address.
  const wait = await takeAll([
    ["invitesPerEducator", `user:${educator.id}`],
    ["invitesPerEmail", email.toLowerCase()],
  ]);
  if (wait > 0) {
    return {
      ok: false,
      status: 429,
      message: `Too many invitations for now (at most ${LIMITS.invitesPerEducator.points} an hour, and ${LIMITS.invitesPerEmail.points} a day to one address). Try again in ${waitText(wait)}, or give the class its join code.`,
    };
  }
  const token = randomToken(32);
  const invite = getDb()
    .insert(classInvites)
    .values({ classId: cls.id, email, tokenHash: hashToken(token), expiresAt: new Date(Date.now() + INVITE_DAYS * 24 * 3600 * 1000) })
    .returning({ id: classInvites.id })
    .get();
  const link = absoluteUrl(request, `/classes/invite/${token}`);
  try {
    await sendMail({
      to: email,
      subject: `Join the class “${cls.name}” on Fernwater`,
      text: [
        `${educator.name} invites you to the class “${cls.name}” on Fernwater, a nitrogen-cycle simulator for aquariums.`,
        "",
        `Open this link to join (sign in, or create a free account with this e-mail address first):`,
        link,
        "",
        `The link works once and for ${INVITE_DAYS} days. If you did not expect this message, ignore it.`,
      ].join("\n"),
    });
  } catch {
    getDb().delete(classInvites).where(eq(classInvites.id, invite.id)).run();
    return { ok: false, message: "The invitation could not be sent. Try again in a moment." };
  }
  return { ok: true };
}

/** Open (not yet accepted) invitations of a class, newest first. */
export function pendingInvites(classId: number) {
  return getDb()
    .select({ id: classInvites.id, email: classInvites.email, expiresAt: classInvites.expiresAt })
    .from(classInvites)
    .where(and(eq(classInvites.classId, classId), isNull(classInvites.acceptedAt), gt(classInvites.expiresAt, new Date())))
    .orderBy(desc(classInvites.id))
    .all();
}

const INVITE_TOKEN = /^[A-Za-z0-9_-]{16,128}$/;

/** An invitation that can still be used, with its class name; null if unknown, used or expired. */
export function findOpenInvite(token: string | undefined) {
  if (!token || !INVITE_TOKEN.test(token)) return null;
  return (
    getDb()
      .select({ id: classInvites.id, email: classInvites.email, classId: classes.id, className: classes.name, educatorId: classes.educatorId })
      .from(classInvites)
      .innerJoin(classes, eq(classes.id, classInvites.classId))
      .where(and(eq(classInvites.tokenHash, hashToken(token)), isNull(classInvites.acceptedAt), gt(classInvites.expiresAt, new Date())))
      .get() ?? null
  );
}

/** Uses an invitation: the signed-in person must hold the invited address. One transaction. */
export function acceptInvite(user: SessionUser, token: string): JoinOutcome {
  return getDb().transaction((tx) => {
    const invite = findOpenInvite(token);
    if (!invite) return { ok: false, message: "This invitation has been used or has expired. Ask your teacher for the join code." };
    if (invite.email.toLowerCase() !== user.email.toLowerCase()) {
      return { ok: false, message: `This invitation was sent to ${invite.email}. Sign in with that address, or join with the class code.` };
    }
    if (invite.educatorId === user.id) return { ok: false, message: "You run this class, so you cannot join it as a student." };
    if (!classIsRun({ educatorId: invite.educatorId })) return { ok: false, status: 409, message: NOT_TAKING };
    tx.update(classInvites).set({ acceptedAt: new Date() }).where(eq(classInvites.id, invite.id)).run();
    tx.insert(classMembers).values({ classId: invite.classId, userId: user.id }).onConflictDoNothing().run();
    return { ok: true, classId: invite.classId };
  });
}

// ---------------------------------------------------------------------------------------------
// Lessons and their locks

/** The pseudo-field that frees the plant groups (adding, removing and every plant setting). */
export const PLANT_GROUPS_FIELD = "plants";

/** Every input name of a scenario's setup form, grouped as the form groups them. */
export function formFieldGroups(model: ScenarioFormModel): { title: string; fields: FormField[] }[] {
  return model.sections.flatMap((s) =>
    s.id === "plants"
      ? model.plants.map((p) => ({
          title: `Plants: ${p.fields.find((f) => f.name.endsWith(".name"))?.value || `group ${p.index + 1}`}`,
          fields: p.fields,
        }))
      : [{ title: s.title, fields: s.fields }],
  );
}

export function lessonFieldNames(settings: Scenario, units: DisplayUnits): Set<string> {
  const model = buildScenarioForm("", settings, units);
  return new Set(formFieldGroups(model).flatMap((g) => g.fields.map((f) => f.name)));
}

/** Names drawn locked on a student's form: every field not unlocked (all plant fields are free when the groups are). */
export function lockedNames(model: ScenarioFormModel, unlocked: readonly string[]): Set<string> {
  const free = new Set(unlocked);
  const plantsFree = free.has(PLANT_GROUPS_FIELD);
  const out = new Set<string>();
  for (const g of formFieldGroups(model)) {
    for (const f of g.fields) {
      if (free.has(f.name) || (plantsFree && f.name.startsWith("plants."))) continue;
      out.add(f.name);
    }
  }
  return out;
}

function valueAt(obj: unknown, path: string[]): unknown {
  let cur = obj;
  for (const p of path) {
    if (cur === null || typeof cur !== "object") return undefined;
    cur = (cur as Record<string, unknown>)[p];
  }
  return cur;
}

function same(a: unknown, b: unknown): boolean {
  if (typeof a === "number" && typeof b === "number") return Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(a), Math.abs(b));
  return a === b;
}

/**
 * The check handleSetupSubmission runs before saving a student's copy: every locked field must
 * still hold the lesson's value (in canonical units), and, unless the plant groups are free,
 * the same plant groups must be there in the same order. A refused field gets its message.
 */
export function lessonEnforcer(lesson: Pick<LessonRow, "settings" | "unlockedFields">) {
  const base = readStoredSettings(lesson.settings);
  const free = new Set(lesson.unlockedFields);
  const plantsFree = free.has(PLANT_GROUPS_FIELD);
  return (scenario: Scenario): FieldErrors | null => {
    if (!base) return { "": "The lesson’s settings can no longer be read; ask your teacher." };
    const errors: FieldErrors = {};
    if (!plantsFree) {
      const ids = (s: Scenario) => s.plants.map((p) => p.id).join("|");
      if (ids(scenario) !== ids(base)) errors[""] = "This lesson fixes the plant groups: they cannot be added or removed.";
    }
    // Check every field the form has, in the lesson's own settings (units do not matter here).
    for (const name of lessonFieldNames(base, { volume: "L", temperature: "C", nitrate: "asN", nitrite: "asN", ammonia: "asN", kh: "dKH" })) {
      if (free.has(name) || (plantsFree && name.startsWith("plants."))) continue;
      const path = name.split(".");
      if (!same(valueAt(scenario, path), valueAt(base, path))) errors[name] = "This setting is locked by the lesson.";
    }
    return Object.keys(errors).length ? errors : null;
  };
}

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
    run = { id: 0, scenarioId: lesson.scenarioId ?? 0, settingsHash: hash, createdAt: new Date(), ...result };
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

export function insertLesson(values: { classId: number; scenarioId: number; title: string; question: string; unlockedFields: string[]; settings: Scenario }): number {
  return getDb().insert(lessons).values(values).returning({ id: lessons.id }).get().id;
}

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
    tank ? { tank } : { newTank: { name: `Class: ${cls.name}`.slice(0, 80), notes: `Lesson copies for the class “${cls.name}”.` } },
    lesson.title.slice(0, 120),
    settings,
    lesson.scenarioId,
    (tx, { scenarioId }) => {
      // A second click racing the first finds the unique index and keeps the first copy.
      tx.insert(lessonCopies).values({ lessonId: lesson.id, studentId: student.id, scenarioId }).onConflictDoNothing().run();
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
export function changedFields(lesson: ScenarioFormModel, copy: ScenarioFormModel, locked: ReadonlySet<string>) {
  const before = new Map(formFieldGroups(lesson).flatMap((g) => g.fields.map((f) => [f.name, f] as const)));
  const out: { name: string; label: string; from: string; to: string; unit: string; locked: boolean }[] = [];
  for (const g of formFieldGroups(copy)) {
    for (const f of g.fields) {
      const b = before.get(f.name);
      if (b && b.value === f.value) continue;
      out.push({
        name: f.name,
        label: g.title.startsWith("Plants") ? `${f.label} (${g.title.slice(8)})` : f.label,
        from: b ? b.value : "–",
        to: f.value,
        unit: f.kind === "boolean" || f.kind === "enum" ? "" : f.unit,
        locked: locked.has(f.name),
      });
    }
  }
  return { fields: out, plantGroups: { from: lesson.plants.length, to: copy.plants.length } };
}
