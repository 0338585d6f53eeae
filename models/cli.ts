/**
 * Command-line runner: `npm run sim -- scenario.json` (or pipe JSON on stdin).
 *
 *   --csv      print the time series as CSV instead of the full result JSON
 *   --pretty   indent the JSON
 *   --help     usage
 *
 * Exit codes: 0 ok; 2 invalid input (each bad field's path and reason on stderr);
 * 1 the model could not run these settings (ModelError message on stderr).
 * The only file in models/ allowed to touch node:* modules.
 */
import { readFileSync } from "node:fs";
import process from "node:process";
import { ModelError, describeScenarioIssues, parseScenario, simulate } from "./index";
import type { SimulationResult } from "./index";

const USAGE = `Usage: npm run sim -- [scenario.json | -] [--csv] [--pretty]
Runs the Fernwater nitrogen model on a scenario file (JSON, canonical units: litres, °C,
mg N/L, g, days) and prints the result as JSON, or the time series as CSV with --csv.
Reads standard input when no file (or "-") is given. See docs/engine.md.`;

/** The series as CSV: one row per sample, canonical units in the header. */
function seriesToCsv(result: SimulationResult): string {
  const s = result.series;
  const cols: [string, number[]][] = [
    ["day", s.t],
    ["tan_mgN_per_L", s.tan],
    ["free_nh3_mgN_per_L", s.nh3],
    ["nitrite_mgN_per_L", s.no2],
    ["nitrate_mgN_per_L", s.no3],
    ["kh_dKH", s.kh],
    ["ph", s.ph],
    ...s.plants.map((p): [string, number[]] => [`plants_${p.id.replace(/[^A-Za-z0-9_-]/g, "_")}_g`, p.massG]),
    ["ammonia_oxidisers_mgN", s.aob],
    ["nitrite_oxidisers_mgN", s.nob],
    ["detritus_tank_mgN", s.organicWater],
    ["detritus_filter_mgN", s.organicFilter],
  ];
  const lines = [cols.map((c) => c[0]).join(",")];
  for (let k = 0; k < s.t.length; k++) lines.push(cols.map((c) => String(c[1][k])).join(","));
  return lines.join("\n") + "\n";
}

function readInput(file: string | undefined): string {
  if (!file || file === "-") return readFileSync(0, "utf8");
  return readFileSync(file, "utf8");
}

export function main(argv: string[]): number {
  const flags = new Set(argv.filter((a) => a.startsWith("--")));
  const files = argv.filter((a) => !a.startsWith("--") || a === "-");
  if (flags.has("--help")) {
    process.stdout.write(USAGE + "\n");
    return 0;
  }
  const unknown = [...flags].filter((f) => !["--csv", "--pretty"].includes(f));
  if (unknown.length > 0 || files.length > 1) {
    process.stderr.write(
      `${unknown.length ? `Unknown option ${unknown.join(", ")}` : "Give at most one file"}\n${USAGE}\n`,
    );
    return 2;
  }
  let text: string;
  try {
    text = readInput(files[0]);
  } catch (e) {
    process.stderr.write(`Cannot read ${files[0] ?? "standard input"}: ${(e as Error).message}\n`);
    return 2;
  }
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (e) {
    process.stderr.write(`The scenario is not valid JSON: ${(e as Error).message}\n`);
    return 2;
  }
  const parsed = parseScenario(raw);
  if (!parsed.success) {
    process.stderr.write("The scenario has invalid settings:\n");
    for (const line of describeScenarioIssues(parsed.error)) process.stderr.write(`  ${line}\n`);
    return 2;
  }
  let result: SimulationResult;
  try {
    result = simulate(parsed.data);
  } catch (e) {
    if (e instanceof ModelError) {
      process.stderr.write(`${e.code}: ${e.message}\n`);
      return 1;
    }
    throw e;
  }
  if (flags.has("--csv")) process.stdout.write(seriesToCsv(result));
  else process.stdout.write(JSON.stringify(result, null, flags.has("--pretty") ? 2 : undefined) + "\n");
  return 0;
}

const invokedDirectly = process.argv[1] !== undefined && /cli\.(ts|js|mjs)$/.test(process.argv[1]);
if (invokedDirectly) {
  process.exitCode = main(process.argv.slice(2));
}
