/**
 * Who is in a class and how they get in: join codes (guessing is rate-limited), the roster,
 * taking a student out, and e-mailed single-use invitations (tokens stored hashed, limited per
 * educator and per address). A class whose educator was demoted takes nobody new
 * (docs/decisions/0007-demoted-educators.md).
 */
import { and, asc, desc, eq, gt, inArray, isNull } from "drizzle-orm";
import { getDb } from "~/db/client.server";
import { classes, classInvites, classMembers, lessonCopies, lessons, users } from "~/db/schema";
import { absoluteUrl, sendMail } from "~/email.server";
import { hasRole } from "~/permissions.server";
import { giveBack, LIMITS, take, takeAll, waitText } from "~/rate-limits.server";
import type { SessionUser } from "~/session.server";
import { hashToken, randomToken } from "~/utils/crypto.server";
import type { ClassRow } from "~/features/classes/class-rows";

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

export function isMember(classId: number, userId: number): boolean {
  return !!getDb()
    .select({ userId: classMembers.userId })
    .from(classMembers)
    .where(and(eq(classMembers.classId, classId), eq(classMembers.userId, userId)))
    .get();
}

function classIsRun(cls: Pick<ClassRow, "educatorId">): boolean {
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
    const lessonIds = tx
      .select({ id: lessons.id })
      .from(lessons)
      .where(eq(lessons.classId, classId))
      .all()
      .map((l) => l.id);
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
  if (cls.educatorId === user.id)
    return { ok: false, message: "You run this class, so you cannot join it as a student." };
  if (!classIsRun(cls)) return { ok: false, status: 409, message: NOT_TAKING };
  getDb().insert(classMembers).values({ classId: cls.id, userId: user.id }).onConflictDoNothing().run();
  return { ok: true, classId: cls.id };
}

// ---------------------------------------------------------------------------------------------
// Invitations

const INVITE_DAYS = 14;

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
    .values({
      classId: cls.id,
      email,
      tokenHash: hashToken(token),
      expiresAt: new Date(Date.now() + INVITE_DAYS * 24 * 3600 * 1000),
    })
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
    .where(
      and(eq(classInvites.classId, classId), isNull(classInvites.acceptedAt), gt(classInvites.expiresAt, new Date())),
    )
    .orderBy(desc(classInvites.id))
    .all();
}

const INVITE_TOKEN = /^[A-Za-z0-9_-]{16,128}$/;

/** An invitation that can still be used, with its class name; null if unknown, used or expired. */
export function findOpenInvite(token: string | undefined) {
  if (!token || !INVITE_TOKEN.test(token)) return null;
  return (
    getDb()
      .select({
        id: classInvites.id,
        email: classInvites.email,
        classId: classes.id,
        className: classes.name,
        educatorId: classes.educatorId,
      })
      .from(classInvites)
      .innerJoin(classes, eq(classes.id, classInvites.classId))
      .where(
        and(
          eq(classInvites.tokenHash, hashToken(token)),
          isNull(classInvites.acceptedAt),
          gt(classInvites.expiresAt, new Date()),
        ),
      )
      .get() ?? null
  );
}

/** Uses an invitation: the signed-in person must hold the invited address. One transaction. */
export function acceptInvite(user: SessionUser, token: string): JoinOutcome {
  return getDb().transaction((tx) => {
    const invite = findOpenInvite(token);
    if (!invite)
      return {
        ok: false,
        message: "This invitation has been used or has expired. Ask your teacher for the join code.",
      };
    if (invite.email.toLowerCase() !== user.email.toLowerCase()) {
      return {
        ok: false,
        message: `This invitation was sent to ${invite.email}. Sign in with that address, or join with the class code.`,
      };
    }
    if (invite.educatorId === user.id)
      return { ok: false, message: "You run this class, so you cannot join it as a student." };
    if (!classIsRun({ educatorId: invite.educatorId })) return { ok: false, status: 409, message: NOT_TAKING };
    tx.update(classInvites).set({ acceptedAt: new Date() }).where(eq(classInvites.id, invite.id)).run();
    tx.insert(classMembers).values({ classId: invite.classId, userId: user.id }).onConflictDoNothing().run();
    return { ok: true, classId: invite.classId };
  });
}
