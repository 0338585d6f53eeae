import { data } from "react-router";
import { describe, expect, it } from "vitest";
import { ModelError } from "~models";
import { JobRefused } from "~/features/jobs/job-limits.server";
import { RunRefused } from "~/features/runs/run-gate.server";
import { apiAnswer, apiRoute } from "~/http/api.server";
import { formRefusal, runProblem } from "~/http/pages.server";
import { QuotaExceeded } from "~/quotas.server";

// Our own checks of the route edge: a typed error is thrown once and answered here, by HTTP's
// meaning of each status (RFC 9110 §15: 404, 413, 422, 429, 503).
describe("typed refusals at the route edge", () => {
  const model = new ModelError("NON_FINITE", "The run produced a value that is not a number on day 3.");

  it("answers the API in its JSON shape, with the status each refusal means", async () => {
    const cases: [unknown, number][] = [
      [model, 422],
      [new RunRefused("Too many previews."), 429],
      [new QuotaExceeded("At most 50 tanks."), 413],
      [new JobRefused("The line is full.", 503), 503],
      [new JobRefused("You already have a sweep running.", 429), 429],
    ];
    for (const [thrown, status] of cases) {
      const answer = apiAnswer(thrown)!;
      expect(answer.status).toBe(status);
      const body = await answer.json();
      expect(body).toMatchObject({ status, error: (thrown as Error).message });
    }
    expect((await apiAnswer(model)!.json()).issues).toEqual([{ path: "settings", message: model.message }]);
  });

  it("turns a page guard's 404 into the API's JSON 404 with the guard's message", async () => {
    const answer = apiAnswer(data({ message: "There is no such tank among yours." }, { status: 404 }))!;
    expect(answer.status).toBe(404);
    expect(await answer.json()).toEqual({ status: 404, error: "There is no such tank among yours." });
  });

  it("lets anything else through: a bug is not a refusal", async () => {
    expect(apiAnswer(new Error("boom"))).toBeNull();
    const route = apiRoute(async () => {
      throw new TypeError("boom");
    });
    await expect(route({})).rejects.toThrow(TypeError);
    const refusing = apiRoute(async () => {
      throw new RunRefused("Too many saves.");
    });
    expect((await refusing({})).status).toBe(429);
  });

  it("gives a form the message and status, saying when the model could not run the settings", () => {
    expect(formRefusal(model)).toEqual({
      message: `The model could not run these settings: ${model.message}`,
      status: 400,
    });
    expect(formRefusal(new QuotaExceeded("At most 50 tanks."))).toEqual({ message: "At most 50 tanks.", status: 413 });
    expect(formRefusal(new Error("boom"))).toBeNull();
    expect(runProblem(new RunRefused("Too many saves."))).toBe("Too many saves.");
    expect(runProblem(new Error("boom"))).toBeNull();
  });
});
