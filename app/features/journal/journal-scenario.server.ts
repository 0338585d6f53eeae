/**
 * Which of the tank's scenarios the journal is replayed on, and its settings: the one asked for
 * (`?scenario=`), else the one the tank's plan is over, as the tank page and the reminders use,
 * under the tank's maintenance plan and nitrate band. The journal page and its replay CSV agree.
 */
import type { Scenario } from "~models";
import { readStoredSettings } from "~/features/runs/simulation.server";
import { planScenario, tankModelSettings } from "~/features/tanks/maintenance-plan.server";
import { listScenarios, type ScenarioRow, type TankRow } from "~/features/tanks/tanks.server";

export function journalScenario(
  tank: TankRow,
  scenarioParam: string | null,
): { scenarios: ScenarioRow[]; plan: ScenarioRow | null; chosen: ScenarioRow | null; settings: Scenario | null } {
  const scenarios = listScenarios(tank.id);
  const plan = planScenario(tank.id);
  const chosen = scenarios.find((s) => String(s.id) === scenarioParam) ?? plan;
  const stored = chosen ? readStoredSettings(chosen.settings) : null;
  return { scenarios, plan, chosen, settings: stored ? tankModelSettings(tank, stored) : null };
}
