import { spawnSync } from "node:child_process";
import { describe, expect, it } from "vitest";

// Our own checks of the command line (models/cli.ts), run as a child process like `npm run sim`.
const run = (args: string[], input?: string) =>
  spawnSync(process.execPath, ["--import", "tsx", "models/cli.ts", ...args], {
    input,
    encoding: "utf8",
    timeout: 30_000,
  });

describe("command line", () => {
  it("runs the example file and prints the result JSON", () => {
    const r = run(["models/examples/mossbank-90l.json"]);
    expect(r.status).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.engineVersion).toMatch(/fernwater-engine/);
    expect(out.series.t.length).toBeGreaterThan(200);
    expect(out.budget.imbalanceRelative).toBeLessThan(1e-9);
  });

  it("prints the series as CSV and reads standard input", () => {
    const r = run(["--csv"], JSON.stringify({ run: { lengthDays: 3 } }));
    expect(r.status).toBe(0);
    const lines = r.stdout.trim().split("\n");
    expect(lines[0]).toMatch(/^day,tan_mgN_per_L,free_nh3_mgN_per_L,nitrite_mgN_per_L,nitrate_mgN_per_L,/);
    expect(lines).toHaveLength(1 + 4);
  });

  it("exits 2 and lists each bad field with its reason", () => {
    const r = run([], JSON.stringify({ water: { volumeL: 0 }, run: { lengthDays: 9999 } }));
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/water\.volumeL: Water volume must be at least 1 L/);
    expect(r.stderr).toMatch(/run\.lengthDays: Run length must be at most 730 days/);
  });

  it("exits 2 for a file that is not JSON", () => {
    const r = run([], "{ not json");
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/not valid JSON/);
  });
});
