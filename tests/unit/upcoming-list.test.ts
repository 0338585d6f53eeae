/**
 * An overdue task stands out in the tank page's list: a badge before its date, on that task
 * alone, besides the "overdue since" in its words (our own check of the page's markup).
 */
import { createElement } from "react";
import { renderToString } from "react-dom/server";
import { createRoutesStub } from "react-router";
import { describe, expect, it } from "vitest";
import { UpcomingList, type UpcomingTask } from "~/features/tanks/upcoming-list";

function render(tasks: UpcomingTask[]): string {
  const Stub = createRoutesStub([
    { path: "/", Component: () => createElement(UpcomingList, { tankId: 1, tasks, back: "tank" }) },
  ]);
  return renderToString(createElement(Stub, { initialEntries: ["/"] }));
}

const task = (key: string, title: string, overdue: boolean): UpcomingTask => ({
  key,
  title,
  when: "Fri 4 December",
  overdue,
  values: { kind: "water_change", date: "2026-12-04T09:00" },
});

describe("the upcoming list", () => {
  it("badges the overdue task and only it", () => {
    const html = render([
      task("a", "Water change (30 %) — overdue since 1 December", true),
      task("b", "Clean the filter", false),
    ]);
    const items = html.split("<li").slice(1);
    expect(items).toHaveLength(2);
    expect(items[0]).toMatch(/>Overdue<\/span>/);
    expect(items[1]).not.toMatch(/>Overdue</);
  });
});
