import { describe, expect, it, vi } from "vitest";
import { ModelError } from "../../models";
import { action as newAction } from "~/routes/scenarios/new";
import { call, post } from "../support/routes";
import { countScenarios, createTank, setupFormFields } from "../support/tanks";
import { userWithCookie } from "../support/users";

// The engine's typed error reaches the form as a message, not a 500. The engine itself is
// tested for when it throws (tests/models/errors.test.ts); here it is made to throw.
vi.mock("~/features/runs/simulation.server", async (importOriginal) => {
  const original = await importOriginal<typeof import("~/features/runs/simulation.server")>();
  const fail = async () => {
    throw new ModelError(
      "MAX_STEPS",
      "The model could not settle: the plants' uptake is far outside the usual range. Check the growth rate.",
    );
  };
  // Saving runs for storage; a preview or a view runs plain.
  return { ...original, runEngine: vi.fn(fail), runEngineForStorage: vi.fn(fail) };
});

describe("a model error on save", () => {
  it("shows the engine's message on the form, keeps the input and saves nothing", async () => {
    const keeper = await userWithCookie();
    const tankId = String(createTank(keeper.id));
    const before = countScenarios();
    const result = await call(
      newAction,
      post(`/tanks/${tankId}/scenarios/new`, setupFormFields({ name: "Will fail" }), keeper.cookie),
      { tankId },
    );
    expect(result.status).toBe(400);
    expect(result.data.errors[""]).toMatch(/could not run these settings: The model could not settle/);
    expect(result.data.form.name).toBe("Will fail");
    expect(countScenarios()).toBe(before);
  });
});
