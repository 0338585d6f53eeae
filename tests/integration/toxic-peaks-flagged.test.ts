/**
 * Lists that show a run's toxic peaks flag them above their caution lines: the tank list
 * (its latest run) and the teacher's table of a lesson's hand-ins.
 */
import { describe, expect, it } from "vitest";
import { getPreset } from "../../models";
import { action as lessonAction, loader as lessonLoader } from "~/routes/classes/lesson";
import { action as newLessonAction } from "~/routes/classes/lesson-new";
import { loader as workLoader } from "~/routes/classes/lesson-work";
import { action as classesAction } from "~/routes/classes/list";
import { loader as tanksLoader } from "~/routes/tanks/list";
import { getDb } from "~/db/client.server";
import { classes } from "~/db/schema";
import { eq } from "drizzle-orm";
import { call, get, post } from "../support/routes";
import { createScenario, createTank } from "../support/tanks";
import { userWithCookie } from "../support/users";

const fishless = getPreset("first-light-fishless")!.scenario;
/** A new filter at pH 8.2 and 28 °C: free ammonia and nitrite far above their caution lines. */
const NEW_FILTER_PH_8 = { ...fishless, water: { ...fishless.water, pH: 8.2, temperatureC: 28 } };
/** An established filter lightly fed: every peak below the lines (our own worked example). */
const CALM = {
  water: { pH: 7, temperatureC: 24 },
  fish: { feedGPerDay: 0.3 },
  filter: { establishedAtStart: true },
  run: { lengthDays: 60 },
};

describe("toxic peaks flagged in lists", () => {
  it("the tank list flags free ammonia (0.02 mg/L NH3) and nitrite (0.1 mg/L NO2-N) above their lines (common practice, no source)", async () => {
    const keeper = await userWithCookie();
    const hot = createTank(keeper.id, "A hot new tank");
    await createScenario(keeper.id, hot, NEW_FILTER_PH_8, "pH 8.2");
    const calm = createTank(keeper.id, "A calm tank");
    await createScenario(keeper.id, calm, CALM, "Calm");
    const page = await call(tanksLoader, get("/tanks", keeper.cookie));
    const byName = (n: string) => page.data.tanks.find((t: { name: string }) => t.name === n);
    expect(byName("A hot new tank").latest.above).toEqual({ peakFreeNh3: true, peakNitrite: true });
    expect(byName("A calm tank").latest.above).toEqual({ peakFreeNh3: false, peakNitrite: false });
  });

  it("the lesson's hand-in table flags a copy's peaks", async () => {
    const teacher = await userWithCookie("educator");
    const student = await userWithCookie("keeper");
    const made = await call(classesAction, post("/classes", { intent: "create", name: "Year 9" }, teacher.cookie));
    const classId = made.location!.split("/").pop()!;
    const cls = getDb()
      .select()
      .from(classes)
      .where(eq(classes.id, Number(classId)))
      .get()!;
    await call(classesAction, post("/classes", { intent: "join", code: cls.joinCode }, student.cookie));
    const tankId = createTank(teacher.id, "Classroom tank");
    const scenarioId = await createScenario(teacher.id, tankId, NEW_FILTER_PH_8, "A new tank at pH 8.2");
    const body = new URLSearchParams({
      scenarioId: String(scenarioId),
      title: "Cycling",
      question: "When is it safe?",
    });
    body.append("unlock", "fish.feedGPerDay");
    const lesson = await call(
      newLessonAction,
      new Request(`http://fernwater.test/classes/${classId}/lessons/new`, {
        method: "POST",
        body,
        headers: { "Content-Type": "application/x-www-form-urlencoded", Cookie: teacher.cookie },
      }),
      { classId },
    );
    const lessonId = lesson.location!.split("/").pop()!;
    const params = { classId, lessonId };
    const started = await call(
      lessonAction,
      post(`/classes/${classId}/lessons/${lessonId}`, { intent: "start" }, student.cookie),
      params,
    );
    expect((await call(workLoader, get(started.location!, student.cookie), params)).status).toBe(200);
    const table = await call(lessonLoader, get(`/classes/${classId}/lessons/${lessonId}`, teacher.cookie), params);
    expect(table.data.handIns[0].copy.above).toEqual({ peakFreeNh3: true, peakNitrite: true });
  });
});
