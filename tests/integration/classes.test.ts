import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { JOIN_ATTEMPTS, lessonEnforcer, newJoinCode, normaliseJoinCode } from "~/features/classes/classes.server";
import { getDb } from "~/db/client.server";
import { classInvites, classMembers, classes, lessonCopies, lessons, scenarios, tanks, users } from "~/db/schema";
import { action as scenarioApiAction } from "~/routes/api/scenario";
import { loader as copyLoader } from "~/routes/classes/copy";
import { action as classAction, loader as classLoader } from "~/routes/classes/detail";
import { action as inviteAction, loader as inviteLoader } from "~/routes/classes/invite";
import { action as lessonAction, loader as lessonLoader } from "~/routes/classes/lesson";
import { action as newLessonAction, loader as newLessonLoader } from "~/routes/classes/lesson-new";
import { action as workAction, loader as workLoader } from "~/routes/classes/lesson-work";
import { action as classesAction, loader as classesLoader } from "~/routes/classes/list";
import { loader as presentLoader } from "~/routes/classes/present";
import { action as editAction, loader as editLoader } from "~/routes/scenarios/edit";
import { action as tankAction, loader as tankLoader } from "~/routes/tanks/detail";
import { ScenarioSchema } from "../../models";
import type { ScenarioFormModel } from "~/features/scenarios/scenario-form-types";
import { unpackSeries } from "~/features/runs/series-packing";
import { startMailFake, waitForMail } from "../support/mail";
import { call, get, post, postJson } from "../support/routes";
import { createScenario, createTank } from "../support/tanks";
import { userWithCookie } from "../support/users";

let stopMail: () => Promise<void>;
beforeAll(async () => {
  stopMail = (await startMailFake()).close;
});
afterAll(() => stopMail());

type Person = Awaited<ReturnType<typeof userWithCookie>>;

/** The fields a browser posts for a setup form as drawn (locked fields travel as hidden inputs). */
function postedFields(
  form: ScenarioFormModel,
  overrides: Record<string, string | number> = {},
): Record<string, string | number> {
  const out: Record<string, string | number> = { intent: "save", name: form.name };
  for (const s of form.sections) for (const f of s.fields) out[f.name] = f.value;
  for (const p of form.plants) {
    out[`plants.${p.index}.id`] = p.id;
    for (const f of p.fields) out[f.name] = f.value;
  }
  return { ...out, ...overrides };
}

async function classWithStudent() {
  const teacher = await userWithCookie("educator");
  const student = await userWithCookie("keeper");
  const made = await call(
    classesAction,
    post("/classes", { intent: "create", name: "Year 9 Biology" }, teacher.cookie),
  );
  expect(made.status).toBe(302);
  const classId = made.location!.split("/").pop()!;
  const cls = getDb()
    .select()
    .from(classes)
    .where(eq(classes.id, Number(classId)))
    .get()!;
  const joined = await call(classesAction, post("/classes", { intent: "join", code: cls.joinCode }, student.cookie));
  expect(joined.status).toBe(302);
  return { teacher, student, classId, cls };
}

async function lessonFor(teacher: Person, classId: string, unlock: string[] = ["fish.feedGPerDay"]) {
  const tankId = createTank(teacher.id, "Classroom tank");
  const scenarioId = await createScenario(teacher.id, tankId, { run: { lengthDays: 30 } }, "A new tank cycling");
  const body = new URLSearchParams({
    scenarioId: String(scenarioId),
    title: "Feeding and nitrate",
    question: "What does halving the food do?",
  });
  for (const u of unlock) body.append("unlock", u);
  const request = new Request(`http://fernwater.test/classes/${classId}/lessons/new`, {
    method: "POST",
    body,
    headers: { "Content-Type": "application/x-www-form-urlencoded", Cookie: teacher.cookie },
  });
  const made = await call(newLessonAction, request, { classId });
  expect(made.status).toBe(302);
  return { lessonId: made.location!.split("/").pop()!, scenarioId, tankId };
}

async function startedCopy() {
  const world = await classWithStudent();
  const { lessonId, scenarioId } = await lessonFor(world.teacher, world.classId);
  const params = { classId: world.classId, lessonId };
  const started = await call(
    lessonAction,
    post(`/classes/${world.classId}/lessons/${lessonId}`, { intent: "start" }, world.student.cookie),
    params,
  );
  expect(started.status).toBe(302);
  expect(started.location).toBe(`/classes/${world.classId}/lessons/${lessonId}/work`);
  const workPath = started.location!;
  const work = await call(workLoader, get(workPath, world.student.cookie), params);
  expect(work.status).toBe(200);
  const copy = getDb()
    .select()
    .from(lessonCopies)
    .where(eq(lessonCopies.lessonId, Number(lessonId)))
    .get()!;
  return { ...world, lessonId, scenarioId, params, workPath, work, copy };
}

const settingsOf = (scenarioId: number) =>
  ScenarioSchema.parse(getDb().select().from(scenarios).where(eq(scenarios.id, scenarioId)).get()!.settings);

/** The chart series a read-only view sends (packed into strings on the wire). */
const seriesOf = (view: { results: { packedSeries: Parameters<typeof unpackSeries>[0] } }) =>
  unpackSeries(view.results.packedSeries);

describe("classes and joining", () => {
  it("makes short, unambiguous join codes and reads them back however they are typed", () => {
    for (let i = 0; i < 50; i++) expect(newJoinCode()).toMatch(/^[A-HJKMNP-Z2-9]{4}-[A-HJKMNP-Z2-9]{4}$/);
    expect(normaliseJoinCode("tide nine")).toBe("TIDE-NINE");
    expect(normaliseJoinCode(" Tide-Nine ")).toBe("TIDE-NINE");
    expect(normaliseJoinCode("TIDE")).toBeNull();
  });

  it("lets an educator create a class and refuses a keeper with 403, the action included", async () => {
    const keeper = await userWithCookie();
    const refused = await call(classesAction, post("/classes", { intent: "create", name: "Mine" }, keeper.cookie));
    expect(refused.status).toBe(403);
    const teacher = await userWithCookie("educator");
    const empty = await call(classesAction, post("/classes", { intent: "create", name: "  " }, teacher.cookie));
    expect(empty.status).toBe(400);
    expect(empty.data.errors.name).toMatch(/name/);
    const list = await call(classesLoader, get("/classes", keeper.cookie));
    expect(list.data).toMatchObject({ canRun: false, running: [], member: [] });
  });

  it("joins with a code typed loosely, shows the class to the student and the roster to the teacher", async () => {
    const { teacher, student, classId, cls } = await classWithStudent();
    const again = await call(
      classesAction,
      post("/classes", { intent: "join", code: cls.joinCode.toLowerCase().replace("-", " ") }, student.cookie),
    );
    expect(again.status).toBe(302); // joining twice is harmless
    const mine = await call(classesLoader, get("/classes", student.cookie));
    expect(mine.data.member.map((c: { name: string }) => c.name)).toEqual(["Year 9 Biology"]);
    const asStudent = await call(classLoader, get(`/classes/${classId}`, student.cookie), { classId });
    expect(asStudent.data.as).toBe("student");
    expect(asStudent.data.teacher).toBeNull();
    const asTeacher = await call(classLoader, get(`/classes/${classId}`, teacher.cookie), { classId });
    expect(asTeacher.data.teacher.students.map((s: { id: number }) => s.id)).toEqual([student.id]);
    // The teacher cannot join their own class; another keeper sees nothing of it.
    const own = await call(classesAction, post("/classes", { intent: "join", code: cls.joinCode }, teacher.cookie));
    expect(own.status).toBe(400);
    const other = await userWithCookie();
    expect((await call(classLoader, get(`/classes/${classId}`, other.cookie), { classId })).status).toBe(404);
  });

  it("refuses a wrong code beside the field, and stops guessing after a few tries", async () => {
    const keeper = await userWithCookie();
    const wrong = await call(classesAction, post("/classes", { intent: "join", code: "ZZZZ-ZZZZ" }, keeper.cookie));
    expect(wrong.status).toBe(400);
    expect(wrong.data.errors.code).toMatch(/No class has that code/);
    for (let i = 1; i < JOIN_ATTEMPTS; i++)
      await call(classesAction, post("/classes", { intent: "join", code: "ZZZZ-ZZZ2" }, keeper.cookie));
    const limited = await call(classesAction, post("/classes", { intent: "join", code: "TIDE-NINE" }, keeper.cookie));
    expect(limited.data.errors.code).toMatch(/Too many wrong codes/);
  });

  it("invites by e-mail with a single-use link for that address", async () => {
    const { teacher, classId } = await classWithStudent();
    const invitee = await userWithCookie();
    const bad = await call(
      classAction,
      post(`/classes/${classId}`, { intent: "invite", email: "not-an-address" }, teacher.cookie),
      { classId },
    );
    expect(bad.status).toBe(400);
    expect(bad.data.errors.email).toMatch(/e-mail address like/);
    const sent = await call(
      classAction,
      post(`/classes/${classId}`, { intent: "invite", email: invitee.email.toUpperCase() }, teacher.cookie),
      { classId },
    );
    expect(sent.status).toBe(200);
    const mail = await waitForMail(invitee.email);
    expect(mail.subject).toMatch(/Year 9 Biology/);
    const link = mail.links.find((l) => l.includes("/classes/invite/"))!;
    const token = new URL(link).pathname.split("/").pop()!;
    expect(getDb().select().from(classInvites).where(eq(classInvites.tokenHash, token)).all()).toHaveLength(0); // stored hashed
    const anon = await call(inviteLoader, get(`/classes/invite/${token}`), { token });
    expect(anon.status).toBe(200);
    expect(anon.data).toMatchObject({ className: "Year 9 Biology", email: invitee.email, signedInAs: null });
    // Someone else holding the link cannot use it.
    const stranger = await userWithCookie();
    const refused = await call(inviteAction, post(`/classes/invite/${token}`, {}, stranger.cookie), { token });
    expect(refused.status).toBe(400);
    expect(refused.data.errors[""]).toMatch(/was sent to/);
    const accepted = await call(inviteAction, post(`/classes/invite/${token}`, {}, invitee.cookie), { token });
    expect(accepted.status).toBe(302);
    expect(accepted.location).toBe(`/classes/${classId}?joined=1`);
    const member = getDb()
      .select()
      .from(classMembers)
      .where(and(eq(classMembers.classId, Number(classId)), eq(classMembers.userId, invitee.id)))
      .get();
    expect(member).toBeDefined();
    // Single use.
    expect((await call(inviteLoader, get(`/classes/invite/${token}`), { token })).status).toBe(404);
    expect((await call(inviteAction, post(`/classes/invite/${token}`, {}, invitee.cookie), { token })).status).toBe(
      404,
    );
    // An anonymous visitor pressing "join" is sent to sign in and back.
    const anonPost = await call(inviteAction, post(`/classes/invite/${token}`, {}), { token });
    expect(anonPost.location).toMatch(/^\/sign-in\?redirectTo=%2Fclasses%2Finvite%2F/);
  });

  it("removes a student only when confirmed; their copies stay theirs but leave the teacher's table", async () => {
    const { teacher, student, classId, lessonId, copy, params } = await startedCopy();
    const unconfirmed = await call(
      classAction,
      post(`/classes/${classId}`, { intent: "remove", studentId: student.id }, teacher.cookie),
      { classId },
    );
    expect(unconfirmed.status).toBe(400);
    const done = await call(
      classAction,
      post(`/classes/${classId}`, { intent: "remove", studentId: student.id, confirm: "yes" }, teacher.cookie),
      { classId },
    );
    expect(done.status).toBe(200);
    expect(getDb().select().from(lessonCopies).where(eq(lessonCopies.id, copy.id)).all()).toHaveLength(0);
    expect(getDb().select().from(scenarios).where(eq(scenarios.id, copy.scenarioId)).all()).toHaveLength(1);
    expect((await call(classLoader, get(`/classes/${classId}`, student.cookie), { classId })).status).toBe(404);
    const table = await call(lessonLoader, get(`/classes/${classId}/lessons/${lessonId}`, teacher.cookie), params);
    expect(table.data.handIns).toEqual([]);
    // A student cannot manage the roster.
    const other = await classWithStudent();
    const forged = await call(
      classAction,
      post(
        `/classes/${other.classId}`,
        { intent: "remove", studentId: other.student.id, confirm: "yes" },
        other.student.cookie,
      ),
      {
        classId: other.classId,
      },
    );
    expect(forged.status).toBe(404);
  });
});

describe("lessons", () => {
  it("offers the chosen scenario's fields to unlock and refuses unknown ones", async () => {
    const { teacher, classId } = await classWithStudent();
    const tankId = createTank(teacher.id);
    const scenarioId = await createScenario(teacher.id, tankId, { run: { lengthDays: 20 } });
    const page = await call(
      newLessonLoader,
      get(`/classes/${classId}/lessons/new?scenario=${scenarioId}`, teacher.cookie),
      { classId },
    );
    const names = page.data.pick.groups.flatMap((g: { fields: { name: string }[] }) => g.fields.map((f) => f.name));
    expect(names).toContain("fish.feedGPerDay");
    expect(names).toContain("plants.0.startMassG");
    const forged = await call(
      newLessonAction,
      post(
        `/classes/${classId}/lessons/new`,
        { scenarioId, title: "T", question: "Q", unlock: "targets.nitrateLow" },
        teacher.cookie,
      ),
      { classId },
    );
    expect(forged.status).toBe(400);
    expect(forged.data.errors.unlock).toMatch(/Unknown settings/);
    const noQuestion = await call(
      newLessonAction,
      post(`/classes/${classId}/lessons/new`, { scenarioId, title: "T", question: "" }, teacher.cookie),
      { classId },
    );
    expect(noQuestion.data.errors.question).toMatch(/question/);
    // Someone else's scenario cannot be handed out.
    const other = await userWithCookie("educator");
    const theirs = await createScenario(other.id, createTank(other.id));
    const stolen = await call(
      newLessonAction,
      post(`/classes/${classId}/lessons/new`, { scenarioId: theirs, title: "T", question: "Q" }, teacher.cookie),
      { classId },
    );
    expect(stolen.status).toBe(404);
  });

  it("freezes the scenario's settings into the lesson", async () => {
    const { teacher, classId } = await classWithStudent();
    const { lessonId, scenarioId } = await lessonFor(teacher, classId);
    const lesson = getDb()
      .select()
      .from(lessons)
      .where(eq(lessons.id, Number(lessonId)))
      .get()!;
    expect(lesson.unlockedFields).toEqual(["fish.feedGPerDay"]);
    expect(lesson.settings).toEqual(
      getDb().select().from(scenarios).where(eq(scenarios.id, scenarioId)).get()!.settings,
    );
  });

  it("gives a student their own copy in a class tank, with the lesson's settings", async () => {
    const { student, copy, scenarioId, work } = await startedCopy();
    const row = getDb().select().from(scenarios).where(eq(scenarios.id, copy.scenarioId)).get()!;
    expect(row.copiedFromId).toBe(scenarioId);
    const tank = getDb().select().from(tanks).where(eq(tanks.id, row.tankId)).get()!;
    expect(tank).toMatchObject({ ownerId: student.id, name: "Class: Year 9 Biology" });
    expect(work.data.locked).toContain("water.volumeL");
    expect(work.data.locked).not.toContain("fish.feedGPerDay");
    expect(work.data.plantGroupsFree).toBe(false);
  });

  it("saves a change to an unlocked setting and runs it", async () => {
    const { student, copy, work, workPath, params } = await startedCopy();
    const feed = settingsOf(copy.scenarioId).fish.feedGPerDay;
    const saved = await call(
      workAction,
      post(workPath, postedFields(work.data.form, { "fish.feedGPerDay": feed / 2 }), student.cookie),
      params,
    );
    expect(saved.status).toBe(302);
    expect(settingsOf(copy.scenarioId).fish.feedGPerDay).toBe(feed / 2);
    const after = await call(workLoader, get(workPath, student.cookie), params);
    // Timmons & Ebeling: TAN produced = feed × protein × 0.092, so half the food makes less nitrate by the end.
    expect(after.data.view.results.keyFigures.nitrateEnd).toBeLessThan(work.data.view.results.keyFigures.nitrateEnd);
  });

  it("accepts a student who reads US gallons and °F: locked values shown rounded still count as unchanged", async () => {
    const { student, copy, workPath, params } = await startedCopy();
    getDb()
      .update(users)
      .set({ volumeUnit: "usgal", temperatureUnit: "F", nitrateUnit: "N", khUnit: "CaCO3" })
      .where(eq(users.id, student.id))
      .run();
    const work = await call(workLoader, get(workPath, student.cookie), params);
    // NIST SP 811: 1 US gallon = 3.785411784 L, so the locked volume is drawn rounded in gallons.
    const volume = work.data.form.sections[0].fields.find((f: { name: string }) => f.name === "water.volumeL");
    expect(volume.unit).toBe("US gal");
    const before = settingsOf(copy.scenarioId);
    const saved = await call(
      workAction,
      post(workPath, postedFields(work.data.form, { "fish.feedGPerDay": 0.3 }), student.cookie),
      params,
    );
    expect(saved.status).toBe(302);
    const after = settingsOf(copy.scenarioId);
    expect(after.water).toEqual(before.water);
    expect(after.tapWater).toEqual(before.tapWater);
    expect(after.fish).toEqual({ ...before.fish, feedGPerDay: 0.3 });
  });

  it("refuses a forged change to a locked setting, a forged plant group and a removed one", async () => {
    const { student, copy, work, workPath, params } = await startedCopy();
    const before = settingsOf(copy.scenarioId);
    const forged = await call(
      workAction,
      post(workPath, postedFields(work.data.form, { "water.volumeL": 400 }), student.cookie),
      params,
    );
    expect(forged.status).toBe(400);
    expect(forged.data.errors["water.volumeL"]).toBe("This setting is locked by the lesson.");
    const add = await call(
      workAction,
      post(workPath, postedFields(work.data.form, { intent: "add-plant" }), student.cookie),
      params,
    );
    expect(add.status).toBe(400);
    const withoutPlants = Object.fromEntries(
      Object.entries(postedFields(work.data.form)).filter(([k]) => !k.startsWith("plants.")),
    );
    const removed = await call(workAction, post(workPath, withoutPlants, student.cookie), params);
    expect(removed.status).toBe(400);
    expect(removed.data.errors[""]).toMatch(/plant groups/);
    const saveAsNew = await call(
      workAction,
      post(workPath, postedFields(work.data.form, { intent: "save-as-new" }), student.cookie),
      params,
    );
    expect(saveAsNew.status).toBe(400);
    expect(settingsOf(copy.scenarioId)).toEqual(before);
  });

  it("checks locks in canonical units whatever units the student reads", () => {
    const settings = ScenarioSchema.parse({ run: { lengthDays: 10 } });
    const enforce = lessonEnforcer({ settings, unlockedFields: ["plants"] });
    expect(enforce(settings)).toBeNull();
    // Plant groups free: changing a plant is fine, changing the temperature is not.
    const plants = { ...settings, plants: [] };
    expect(enforce(plants)).toBeNull();
    const warmer = { ...settings, water: { ...settings.water, temperatureC: settings.water.temperatureC + 0.5 } };
    expect(enforce(warmer)).toEqual({ "water.temperatureC": "This setting is locked by the lesson." });
  });

  it("sends the normal edit page and the API of a lesson copy back to the lesson", async () => {
    const { student, copy, workPath } = await startedCopy();
    const row = getDb().select().from(scenarios).where(eq(scenarios.id, copy.scenarioId)).get()!;
    const params = { tankId: String(row.tankId), scenarioId: String(row.id) };
    const page = await call(editLoader, get(`/tanks/${row.tankId}/scenarios/${row.id}/edit`, student.cookie), params);
    expect(page.location).toBe(workPath);
    const forged = await call(
      editAction,
      post(`/tanks/${row.tankId}/scenarios/${row.id}/edit`, { intent: "save", name: "x" }, student.cookie),
      params,
    );
    expect(forged.location).toBe(workPath);
    const api = await call(
      scenarioApiAction,
      postJson(`/api/scenarios/${row.id}`, { settings: { water: { volumeL: 400 } } }, student.cookie, "PATCH"),
      {
        scenarioId: String(row.id),
      },
    );
    expect(api.status).toBe(409);
    expect(settingsOf(row.id).water.volumeL).not.toBe(400);
  });

  it("hands in an answer; the copy then stays as handed in, and the teacher sees it with its key figures", async () => {
    const { teacher, student, work, workPath, params, classId, lessonId, copy } = await startedCopy();
    const empty = await call(workAction, post(workPath, { intent: "hand-in", answer: "  " }, student.cookie), params);
    expect(empty.status).toBe(400);
    expect(empty.data.errors.answer).toMatch(/answer/);
    const done = await call(
      workAction,
      post(workPath, { intent: "hand-in", answer: "Less food, less nitrate." }, student.cookie),
      params,
    );
    expect(done.status).toBe(302);
    const late = await call(
      workAction,
      post(workPath, postedFields(work.data.form, { "fish.feedGPerDay": 0.2 }), student.cookie),
      params,
    );
    expect(late.status).toBe(400);
    expect(late.data.errors[""]).toMatch(/handed this lesson in/);

    const table = await call(lessonLoader, get(`/classes/${classId}/lessons/${lessonId}`, teacher.cookie), params);
    expect(table.data.handIns).toHaveLength(1);
    const row = table.data.handIns[0];
    expect(row.student.id).toBe(student.id);
    expect(row.copy.answer).toBe("Less food, less nitrate.");
    expect(row.copy.handedInAt).toMatch(/^\d{4}-\d{2}-\d{2} \d{2}:\d{2}$/);
    expect(row.copy.figures.nitrateEnd).toBeGreaterThan(0);

    const copyParams = { ...params, copyId: String(copy.id) };
    const view = await call(
      copyLoader,
      get(`/classes/${classId}/lessons/${lessonId}/copies/${copy.id}`, teacher.cookie),
      copyParams,
    );
    expect(view.status).toBe(200);
    expect(view.data.answer).toBe("Less food, less nitrate.");
    expect(seriesOf(view.data.view).t.length).toBeGreaterThan(0);
  });

  it("keeps a handed-in copy: the student cannot delete it, nor its tank, to start the lesson again", async () => {
    const { student, workPath, params, copy } = await startedCopy();
    expect(
      (await call(workAction, post(workPath, { intent: "hand-in", answer: "First answer." }, student.cookie), params))
        .status,
    ).toBe(302);
    const scenario = getDb().select().from(scenarios).where(eq(scenarios.id, copy.scenarioId)).get()!;
    const tankId = String(scenario.tankId);
    const dropScenario = await call(
      tankAction,
      post(`/tanks/${tankId}`, { intent: "delete-scenario", scenarioId: scenario.id, confirm: "yes" }, student.cookie),
      { tankId },
    );
    expect(dropScenario.status).toBe(409);
    expect(dropScenario.data.errors[""]).toMatch(/holds your hand-in/);
    const dropTank = await call(
      tankAction,
      post(`/tanks/${tankId}`, { intent: "delete-tank", confirm: "yes" }, student.cookie),
      { tankId },
    );
    expect(dropTank.status).toBe(409);
    const kept = getDb().select().from(lessonCopies).where(eq(lessonCopies.id, copy.id)).get()!;
    expect(kept.answer).toBe("First answer.");
    expect(kept.handedInAt).not.toBeNull();
    expect(getDb().select().from(scenarios).where(eq(scenarios.id, copy.scenarioId)).get()).toBeDefined();
    // Starting the lesson again finds the handed-in copy, not a fresh one.
    const again = await call(
      lessonAction,
      post(`/classes/${params.classId}/lessons/${params.lessonId}`, { intent: "start" }, student.cookie),
      params,
    );
    expect(again.location).toBe(workPath);
    expect(
      getDb()
        .select()
        .from(lessonCopies)
        .where(eq(lessonCopies.lessonId, Number(params.lessonId)))
        .all(),
    ).toHaveLength(1);
  });

  it("freezes a handed-in copy's key figures: its tank's nitrate band cannot be changed afterwards, its name can", async () => {
    const { teacher, student, workPath, params, classId, lessonId, copy } = await startedCopy();
    expect(
      (await call(workAction, post(workPath, { intent: "hand-in", answer: "Nitrate climbs." }, student.cookie), params))
        .status,
    ).toBe(302);
    const figuresNow = async () =>
      (await call(lessonLoader, get(`/classes/${classId}/lessons/${lessonId}`, teacher.cookie), params)).data.handIns[0]
        .copy.figures;
    const before = await figuresNow();
    const tank = getDb()
      .select()
      .from(tanks)
      .innerJoin(scenarios, eq(scenarios.tankId, tanks.id))
      .where(eq(scenarios.id, copy.scenarioId))
      .get()!.tanks;
    const tankId = String(tank.id);
    // A band of 0–1 mg/L NO3 would put every day of the run above the target (our own worked example).
    const moved = await call(
      tankAction,
      post(
        `/tanks/${tankId}`,
        { intent: "settings", name: tank.name, notes: tank.notes ?? "", nitrateLow: "0", nitrateHigh: "1" },
        student.cookie,
      ),
      { tankId },
    );
    expect(moved.status).toBe(409);
    expect(moved.data.errors.nitrateLow).toMatch(/handed in/);
    const after = getDb().select().from(tanks).where(eq(tanks.id, tank.id)).get()!;
    expect([after.nitrateTargetLow, after.nitrateTargetHigh]).toEqual([tank.nitrateTargetLow, tank.nitrateTargetHigh]);
    // The student opens the copy again (a new band would make a new run); the teacher's figures stay.
    await call(workLoader, get(workPath, student.cookie), params);
    expect(await figuresNow()).toEqual(before);
    // The tank's name may still change; the band as the form shows it goes back unchanged.
    const page = await call(tankLoader, get(`/tanks/${tankId}`, student.cookie), { tankId });
    expect(page.data.bandKept).toBe(true);
    expect(page.data.nitrateHint).toMatch(/handed in/);
    const band = { nitrateLow: page.data.tank.nitrateLow, nitrateHigh: page.data.tank.nitrateHigh };
    const renamed = await call(
      tankAction,
      post(`/tanks/${tankId}`, { intent: "settings", name: "My class tank", notes: "", ...band }, student.cookie),
      { tankId },
    );
    expect(renamed.status).toBe(302);
    const kept = getDb().select().from(tanks).where(eq(tanks.id, tank.id)).get()!;
    expect(kept.name).toBe("My class tank");
    expect([kept.nitrateTargetLow, kept.nitrateTargetHigh]).toEqual([tank.nitrateTargetLow, tank.nitrateTargetHigh]);
  });

  it("shows the teacher what a student changed, locked settings flagged", async () => {
    const { teacher, student, work, workPath, params, classId, lessonId, copy } = await startedCopy();
    const feed = settingsOf(copy.scenarioId).fish.feedGPerDay;
    await call(
      workAction,
      post(workPath, postedFields(work.data.form, { "fish.feedGPerDay": feed * 2 }), student.cookie),
      params,
    );
    const copyParams = { ...params, copyId: String(copy.id) };
    const view = await call(
      copyLoader,
      get(`/classes/${classId}/lessons/${lessonId}/copies/${copy.id}`, teacher.cookie),
      copyParams,
    );
    expect(view.data.changes.fields).toEqual([
      {
        name: "fish.feedGPerDay",
        label: expect.any(String),
        from: String(feed),
        to: String(feed * 2),
        unit: "g/day",
        locked: false,
      },
    ]);
  });

  it("lets only the class's educator open a copy; other copies, lessons and classes answer 404", async () => {
    const first = await startedCopy();
    const second = await startedCopy();
    const path = `/classes/${first.classId}/lessons/${first.lessonId}/copies/${first.copy.id}`;
    const params = { ...first.params, copyId: String(first.copy.id) };
    expect((await call(copyLoader, get(path, second.teacher.cookie), params)).status).toBe(404);
    expect((await call(copyLoader, get(path, first.student.cookie), params)).status).toBe(404);
    // A copy of another class's lesson, reached through the teacher's own class: 404.
    const crossed = { classId: first.classId, lessonId: first.lessonId, copyId: String(second.copy.id) };
    expect((await call(copyLoader, get(path, first.teacher.cookie), crossed)).status).toBe(404);
    const admin = await userWithCookie("admin");
    expect((await call(copyLoader, get(path, admin.cookie), params)).status).toBe(404);
    // Students of another class cannot start this lesson.
    const start = await call(
      lessonAction,
      post(`/classes/${first.classId}/lessons/${first.lessonId}`, { intent: "start" }, second.student.cookie),
      first.params,
    );
    expect(start.status).toBe(404);
  });

  it("answers a lesson whose stored settings no longer read with a message, not a 500", async () => {
    const { teacher, student, classId } = await classWithStudent();
    const { lessonId } = await lessonFor(teacher, classId);
    getDb()
      .update(lessons)
      .set({ settings: { schemaVersion: 999, water: "?" } })
      .where(eq(lessons.id, Number(lessonId)))
      .run();
    const params = { classId, lessonId };
    const start = await call(
      lessonAction,
      post(`/classes/${classId}/lessons/${lessonId}`, { intent: "start" }, student.cookie),
      params,
    );
    expect(start.status).toBe(400);
    expect(start.data.errors[""]).toMatch(/can no longer be read/);
    const shown = await call(
      presentLoader,
      get(`/classes/${classId}/lessons/${lessonId}/present`, teacher.cookie),
      params,
    );
    expect(shown.status).toBe(200);
    expect(shown.data.error).toMatch(/can no longer be read/);
  });

  it("presents the lesson with its run to the educator only", async () => {
    const { teacher, student, classId, lessonId, params } = await startedCopy();
    const path = `/classes/${classId}/lessons/${lessonId}/present`;
    const shown = await call(presentLoader, get(path, teacher.cookie), params);
    expect(shown.status).toBe(200);
    expect(shown.data.results.lengthDays).toBe(30);
    expect((await call(presentLoader, get(path, student.cookie), params)).status).toBe(404);
  });
});

describe("a demoted educator (docs/decisions/0007-demoted-educators.md)", () => {
  it("keeps the class read-only, hides the students' e-mails, closes the class to newcomers, and an admin hands it over", async () => {
    const { teacher, student, classId, cls } = await classWithStudent();
    const { lessonId } = await lessonFor(teacher, classId);
    const started = await call(
      lessonAction,
      post(`/classes/${classId}/lessons/${lessonId}`, { intent: "start" }, student.cookie),
      { classId, lessonId },
    );
    expect(started.status).toBe(302);
    const invite = await call(
      classAction,
      post(`/classes/${classId}`, { intent: "invite", email: "late@example.org" }, teacher.cookie),
      { classId },
    );
    expect(invite.status).toBe(200);
    const inviteLink = (await waitForMail("late@example.org")).links.find((l) => l.includes("/classes/invite/"))!;

    getDb().update(users).set({ role: "keeper" }).where(eq(users.id, teacher.id)).run();

    // Read-only, on the very next request: names without e-mails, lesson questions without hand-ins.
    const page = await call(classLoader, get(`/classes/${classId}`, teacher.cookie), { classId });
    expect(page.status).toBe(200);
    expect(page.data.teacher).toBeNull();
    expect(JSON.stringify(page.data)).not.toContain(student.email);
    expect(page.data.formerStudents).toEqual([{ id: student.id, name: expect.any(String) }]);
    const lesson = await call(lessonLoader, get(`/classes/${classId}/lessons/${lessonId}`, teacher.cookie), {
      classId,
      lessonId,
    });
    expect(lesson.data.handIns).toBeNull();
    const list = await call(classesLoader, get("/classes", teacher.cookie));
    expect(list.data.running.map((c: { joinCode: string }) => c.joinCode)).toEqual([""]);
    // Nothing an educator does: invite, remove, new lesson, present, read a copy.
    expect(
      (
        await call(
          classAction,
          post(`/classes/${classId}`, { intent: "invite", email: "x@example.org" }, teacher.cookie),
          { classId },
        )
      ).status,
    ).toBe(403);
    expect(
      (
        await call(
          classAction,
          post(`/classes/${classId}`, { intent: "remove", studentId: student.id, confirm: "yes" }, teacher.cookie),
          { classId },
        )
      ).status,
    ).toBe(403);
    expect(
      (await call(newLessonLoader, get(`/classes/${classId}/lessons/new`, teacher.cookie), { classId })).status,
    ).toBe(403);
    expect(
      (
        await call(presentLoader, get(`/classes/${classId}/lessons/${lessonId}/present`, teacher.cookie), {
          classId,
          lessonId,
        })
      ).status,
    ).toBe(403);
    const copy = getDb()
      .select()
      .from(lessonCopies)
      .where(eq(lessonCopies.lessonId, Number(lessonId)))
      .get()!;
    expect(
      (
        await call(copyLoader, get(`/classes/${classId}/lessons/${lessonId}/copies/${copy.id}`, teacher.cookie), {
          classId,
          lessonId,
          copyId: String(copy.id),
        })
      ).status,
    ).toBe(403);
    expect(
      getDb()
        .select()
        .from(classMembers)
        .where(eq(classMembers.classId, Number(classId)))
        .all(),
    ).toHaveLength(1);

    // The student keeps their class and their work.
    expect(
      (
        await call(workLoader, get(`/classes/${classId}/lessons/${lessonId}/work`, student.cookie), {
          classId,
          lessonId,
        })
      ).status,
    ).toBe(200);
    // Nobody new joins: not with the code, not with an invitation sent before the demotion.
    const newcomer = await userWithCookie();
    const joined = await call(classesAction, post("/classes", { intent: "join", code: cls.joinCode }, newcomer.cookie));
    expect(joined.status).toBe(409);
    expect(joined.data.errors.code).toMatch(/not taking new students/);
    const late = await userWithCookie();
    getDb().update(users).set({ email: "late@example.org" }).where(eq(users.id, late.id)).run();
    const token = inviteLink.split("/").pop()!;
    const accepted = await call(inviteAction, post(`/classes/invite/${token}`, {}, late.cookie), { token });
    expect(accepted.status).toBe(409);

    // An admin hands the class to another educator, who then runs it in full.
    const admin = await userWithCookie("admin");
    const next = await userWithCookie("educator");
    const { action: handOver } = await import("~/routes/admin/classes");
    const refused = await call(
      handOver,
      post("/admin/classes", { intent: "hand-over", classId, educatorId: student.id }, admin.cookie),
    );
    expect(refused.status).toBe(400);
    const handed = await call(
      handOver,
      post("/admin/classes", { intent: "hand-over", classId, educatorId: next.id }, admin.cookie),
    );
    expect(handed.status).toBe(200);
    const nextPage = await call(classLoader, get(`/classes/${classId}`, next.cookie), { classId });
    expect(nextPage.data.teacher.students.map((s: { email: string }) => s.email)).toEqual([student.email]);
    expect(
      (await call(classesAction, post("/classes", { intent: "join", code: cls.joinCode }, newcomer.cookie))).status,
    ).toBe(302);
    // The former educator, promoted again, no longer has it.
    getDb().update(users).set({ role: "educator" }).where(eq(users.id, teacher.id)).run();
    expect((await call(classLoader, get(`/classes/${classId}`, teacher.cookie), { classId })).status).toBe(404);
  });
});
