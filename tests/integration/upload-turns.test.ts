/**
 * CSV uploads are read on the request thread (a full 1 MB file: about 0.1 s, 0.3 s cold), and a file with a
 * bad row stores nothing, so no quota stopped it: uploads in a loop kept the request thread reading
 * (issue 10: nobody can freeze the server). Each person has a number of uploads a minute,
 * readings and journal together, counted before the file is read. Our own checks against
 * app/rate-limits.server.ts.
 */
import { afterEach, describe, expect, it } from "vitest";
import { LIMITS, resetRateLimits } from "~/rate-limits.server";
import { action as journalAction } from "~/routes/journal/journal";
import { action as uploadAction } from "~/routes/readings/upload";
import { call, ORIGIN } from "../support/routes";
import { createTank } from "../support/tanks";
import { userWithCookie } from "../support/users";

afterEach(() => resetRateLimits());

function csvUpload(path: string, cookie: string, text: string): Request {
  const form = new FormData();
  form.set("file", new File([text], "upload.csv", { type: "text/csv" }));
  return new Request(ORIGIN + path, { method: "POST", body: form, headers: { Cookie: cookie, Origin: ORIGIN } });
}

/** A readings file of `rows` rows whose every seventh value is not a number: refused whole, nothing stored. */
function badReadings(rows: number): string {
  const lines = ["datetime,nitrate_no3_mg_l,note"];
  for (let i = 0; i < rows; i++) {
    const day = String((i % 28) + 1).padStart(2, "0");
    const time = `${String(i % 24).padStart(2, "0")}:${String(i % 60).padStart(2, "0")}`;
    lines.push(`2025-01-${day}T${time},${i % 7 === 0 ? "x" : 10},${"n".repeat(150)}`);
  }
  return lines.join("\n");
}

describe("CSV uploads of one person", () => {
  it("reads at most the limit of a burst of full files sent at once; the rest are refused before they are read", async () => {
    const keeper = await userWithCookie();
    const tankId = String(createTank(keeper.id));
    const csv = badReadings(5000);
    const answers = await Promise.all(
      Array.from({ length: 30 }, () =>
        call(uploadAction, csvUpload(`/tanks/${tankId}/readings/upload`, keeper.cookie, csv), { tankId }),
      ),
    );
    const statuses = answers.map((a) => a.status);
    expect(statuses.filter((s) => s === 400)).toHaveLength(LIMITS.uploadsPerPerson.points);
    expect(statuses.filter((s) => s === 429)).toHaveLength(30 - LIMITS.uploadsPerPerson.points);
  });

  it("reads at most the limit a minute, readings and journal files counted together", async () => {
    const keeper = await userWithCookie();
    const tankId = String(createTank(keeper.id));
    const csv = badReadings(20);
    const limit = LIMITS.uploadsPerPerson.points;
    for (let i = 0; i < limit; i++) {
      const read = await call(uploadAction, csvUpload(`/tanks/${tankId}/readings/upload`, keeper.cookie, csv), {
        tankId,
      });
      expect(read.status).toBe(400);
    }
    const readings = await call(uploadAction, csvUpload(`/tanks/${tankId}/readings/upload`, keeper.cookie, csv), {
      tankId,
    });
    expect(readings.status).toBe(429);
    expect(readings.data.error).toMatch(/Too many uploads/);
    const journal = await call(
      journalAction,
      csvUpload(`/tanks/${tankId}/journal`, keeper.cookie, "date,kind,note\n2025-01-02,note,hello\n"),
      { tankId },
    );
    expect(journal.status).toBe(429);
    expect(journal.data.message).toMatch(/Too many uploads/);
    // Another person is not held up by this one.
    const other = await userWithCookie();
    const otherTank = String(createTank(other.id));
    const theirs = await call(
      journalAction,
      csvUpload(`/tanks/${otherTank}/journal`, other.cookie, "date,kind,note\n2025-01-02,note,hello\n"),
      { tankId: otherTank },
    );
    expect(theirs.status).toBe(200);
    expect(theirs.data.stored).toBe(1);
  });
});
