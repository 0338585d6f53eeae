import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "~/db/client.server";
import { classes, lessons } from "~/db/schema";
import { DEMO_PASSWORD, DEMO_SHARE_TOKEN, seedDemoData } from "~/db/seed.server";
import { action as lessonAction, loader as lessonLoader } from "~/routes/classes/lesson";
import { loader as publicLoader } from "~/routes/share/public";
import { call, get, post } from "../support/routes";
import { signIn } from "../support/users";

beforeAll(async () => {
  await seedDemoData(getDb());
}, 120_000);

describe("demo data for sharing and classes", () => {
  it("opens the seeded public link of Theo's scenario to anyone", async () => {
    const page = await call(publicLoader, get(`/s/${DEMO_SHARE_TOKEN}`), { token: DEMO_SHARE_TOKEN });
    expect(page.status).toBe(200);
    expect(page.data.name).toBe("As kept now");
    // Theo's tap water carries 30 mg/L as NO3 (our own worked example): below the WHO limit of 50 mg/L, so no drinking-water warning.
    expect(page.data.view.results.tapNitrateAboveDrinkingLimit).toBe(false);
  });

  it("hands the class a lesson on the teacher's cycling scenario that the demo student can start", async () => {
    const cls = getDb().select().from(classes).where(eq(classes.joinCode, "TIDE-NINE")).get()!;
    const lesson = getDb().select().from(lessons).where(eq(lessons.classId, cls.id)).get()!;
    expect(lesson.unlockedFields).toEqual(["water.temperatureC", "water.pH"]);
    const params = { classId: String(cls.id), lessonId: String(lesson.id) };
    const student = await signIn("student@tidewell.example", DEMO_PASSWORD);
    const page = await call(lessonLoader, get(`/classes/${cls.id}/lessons/${lesson.id}`, student), params);
    expect(page.data).toMatchObject({ as: "student", started: false });
    const started = await call(
      lessonAction,
      post(`/classes/${cls.id}/lessons/${lesson.id}`, { intent: "start" }, student),
      params,
    );
    expect(started.status).toBe(302);
  });
});
