/**
 * The journal page gets a thinned share of a long replay (the highest and lowest of each
 * stretch), so its CSV download comes from the server with every sample and event, in the
 * chart's own columns: a keeper analysing their tank gets the replay, not a sketch of it.
 */
import { createElement } from "react";
import { renderToString } from "react-dom/server";
import { createRoutesStub } from "react-router";
import { describe, expect, it, vi } from "vitest";

// The chart as the browser draws it, right after hydration (the server sends a stand-in, decision 0012).
vi.mock("~/utils/use-hydrated", () => ({ useHydrated: () => true }));
import { LIMITS, resetRateLimits } from "~/rate-limits.server";
import { JournalReplayChart } from "~/components/journal-replay-chart";
import { loader as journalLoader } from "~/routes/journal/journal";
import { loader as replayCsvLoader } from "~/routes/journal/replay-csv";
import { call, get } from "../support/routes";
import { getDb } from "~/db/client.server";
import { journalEntries } from "~/db/schema-care";
import { DAY } from "../support/journal";
import { createScenario, createTank } from "../support/tanks";
import { userWithCookie } from "../support/users";

/** Splits one CSV line (our files quote only cells with commas or quotes; these have none in numbers). */
const cells = (line: string) => line.split(",");

describe("the journal replay's CSV", () => {
  it("holds every sample of a thinned replay, and each logged 10 % change leaves 90 % of the nitrate in it", async () => {
    const keeper = await userWithCookie();
    const tankId = String(createTank(keeper.id));
    // Our own worked example: fed fish, no plants, nitrate-free tap water, and a 10 % water
    // change logged every 8 hours for 700 days: some 7,000 samples, more than the page is sent.
    await createScenario(keeper.id, Number(tankId), {
      water: { volumeL: 100, startNitrate: 10 },
      fish: { feedGPerDay: 0.5 },
      plants: [],
      maintenance: { waterChangeIntervalDays: 0 },
      tapWater: { nitrate: 0, roShare: 0 },
    });
    const start = Date.now() - 700 * DAY;
    const rows = Array.from({ length: 2100 }, (_, i) => ({
      tankId: Number(tankId),
      doneAt: new Date(start + i * 8 * 3_600_000),
      kind: "water_change",
      details: { share: 0.1 },
      note: "",
    }));
    for (let i = 0; i < rows.length; i += 500)
      getDb()
        .insert(journalEntries)
        .values(rows.slice(i, i + 500))
        .run();
    const page = await call(journalLoader, get(`/tanks/${tankId}/journal`, keeper.cookie), { tankId });
    expect(page.status).toBe(200);
    const replay = page.data.replay;
    const sent = replay.packedSeries.t.split(",").length;
    expect(sent).toBeLessThan(replay.samplesTotal);
    expect(replay.csvHref).toMatch(new RegExp(`^/tanks/${tankId}/journal/replay\\.csv\\?scenario=\\d+$`));

    const url = new URL(replay.csvHref, "http://localhost");
    const csv = await call(replayCsvLoader, get(url.pathname + url.search, keeper.cookie), { tankId });
    expect(csv.status).toBe(200);
    expect(csv.headers.get("Content-Type")).toMatch(/^text\/csv/);
    expect(csv.headers.get("Content-Disposition")).toMatch(/as-it-happened\.csv/);
    const lines = (csv.data as string)
      .replace(/^\uFEFF/, "")
      .trim()
      .split(/\r?\n/);
    const header = cells(lines[0]);
    // Every sample, one row each, under the chart CSV's own header.
    expect(lines.length - 1).toBe(replay.samplesTotal);
    expect(header[0]).toBe("day");
    expect(header.some((h) => /long-term/i.test(h))).toBe(true);
    const nitrate = header.findIndex((h) => /^Nitrate/.test(h));
    const events = header.indexOf("events");
    expect(nitrate).toBeGreaterThan(0);
    // Every logged change is in it: at each, the row before and the row after the event.
    const changes = lines.slice(1).flatMap((l, k) => (/water change/i.test(cells(l)[events]) ? [k + 1] : []));
    expect(changes.length).toBeGreaterThan(2000);
    for (const i of changes) {
      const before = cells(lines[i - 1]);
      const after = cells(lines[i]);
      expect(after[0]).toBe(before[0]);
      // Mixing: replacing 10 % of the water with nitrate-free water leaves 90 % of the nitrate
      // (mass balance, common practice, no source).
      expect(Number(after[nitrate]) / Number(before[nitrate])).toBeCloseTo(0.9, 2);
    }
  }, 60_000);

  it("is the owner's alone, and says why when there is nothing to replay", async () => {
    const keeper = await userWithCookie();
    const tankId = String(createTank(keeper.id));
    const empty = await call(replayCsvLoader, get(`/tanks/${tankId}/journal/replay.csv`, keeper.cookie), { tankId });
    expect(empty.status).toBe(404);
    expect(empty.data).toMatch(/needs a scenario and at least one entry/);
    // A whole replay counts as a listing (the journal's own CSV and the API's lists share the count).
    for (let i = 1; i < LIMITS.fullListingsPerPerson.points; i++)
      await call(replayCsvLoader, get(`/tanks/${tankId}/journal/replay.csv`, keeper.cookie), { tankId });
    const past = await call(replayCsvLoader, get(`/tanks/${tankId}/journal/replay.csv`, keeper.cookie), { tankId });
    expect(past.status).toBe(429);
    expect(past.data).toMatch(/Too many whole exports or listings/);
    resetRateLimits();
    const other = await userWithCookie();
    const theirs = await call(replayCsvLoader, get(`/tanks/${tankId}/journal/replay.csv`, other.cookie), { tankId });
    expect(theirs.status).toBe(404);
  });

  it("the chart's CSV button downloads from the server only when the page holds a share", () => {
    const base = {
      labels: {
        tan: "mg/L NH3-N",
        nh3: "mg/L NH3-N",
        no2: "mg/L NO2-N",
        no3: "mg/L NO3",
        kh: "dKH",
        temperature: "°C",
        volume: "L",
      },
      events: [],
      guides: { targetLow: 0, targetHigh: 0, oxygenCaution: 3 },
      startMs: Date.UTC(2026, 0, 1),
      readings: [],
      readingsTotal: 0,
      eventsTotal: 0,
      csvHref: "/tanks/1/journal/replay.csv?scenario=2",
      packedSeries: { t: "0,1", tan: "0,0", nh3: "0,0", no2: "0,0", no3: "1,1", plants: [] },
    };
    const html = (samplesTotal: number) =>
      renderToString(
        createElement(
          createRoutesStub([
            {
              path: "/",
              Component: () =>
                createElement(JournalReplayChart, { replay: { ...base, samplesTotal } as never, tankName: "T" }),
            },
          ]),
          { initialEntries: ["/"] },
        ),
      );
    expect(html(5000)).toMatch(/<a[^>]*href="\/tanks\/1\/journal\/replay\.csv\?scenario=2"[^>]*download=/);
    expect(html(5000)).toMatch(/The CSV download holds every sample/);
    expect(html(2)).not.toMatch(/download="T-as-it-happened\.csv"/);
  });
});
