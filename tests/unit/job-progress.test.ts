import { createElement } from "react";
import { renderToString } from "react-dom/server";
import { createRoutesStub } from "react-router";
import { describe, expect, it } from "vitest";
import { JobProgress } from "~/components/job-progress";
import type { JobJson } from "~/features/jobs/jobs.server";

// Our own check of the progress bar's words: a job in line says how many are ahead of it
// instead of the server refusing it (issue 10).
function render(job: JobJson): string {
  const Stub = createRoutesStub([{ path: "/", Component: () => createElement(JobProgress, { job, noun: "runs" }) }]);
  return renderToString(createElement(Stub, { initialEntries: ["/"] }));
}

const base: JobJson = {
  id: "job1",
  kind: "sweep",
  label: "Plant mass",
  params: null,
  status: "waiting",
  ahead: 2,
  done: 0,
  total: 20,
  partial: null,
  result: null,
  error: null,
  startedAt: new Date(0).toISOString(),
  finishedAt: null,
  elapsedMs: 1200,
  note: null,
};

describe("the job progress bar", () => {
  it("says how many jobs are ahead while it waits, and offers to cancel", () => {
    const html = render(base);
    expect(html).toMatch(/Waiting, 2 ahead/);
    expect(html).toMatch(/Cancel/);
  });

  it("counts runs once it runs", () => {
    const html = render({ ...base, status: "running", ahead: 0, done: 7 });
    expect(html).toMatch(/Running: 7 of 20 runs/);
    expect(html).not.toMatch(/ahead/);
    expect(html).not.toMatch(/Restarted/);
  });

  it("says when a job was restarted after a server stopped (issue 15)", () => {
    const note = "Restarted from the start after a server stopped.";
    expect(render({ ...base, status: "running", ahead: 0, note })).toContain(note);
  });
});
