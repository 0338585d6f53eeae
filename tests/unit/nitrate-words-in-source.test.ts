/**
 * No fixed nitrate unit in what a person reads (issue 12, item 12): every sentence, label, hint
 * and mail states nitrate through the units table (models/units.ts, unitLabels, nitrateText), so
 * it follows the reader's choice of mg/L NO3 or mg/L NO3-N. This scans the app's and the engine's
 * source, comments left out, for the unit written by hand; the few places that must name NO3
 * itself are listed with why. The e2e crawl (labels-and-units.e2e) checks the pages it reaches;
 * this also covers mails, messages and pages it does not. Our own rule, no source.
 */
import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";

/** file → why it may name mg/L NO3 (or "as NO3") itself. */
const ALLOWED: Record<string, string> = {
  "models/units.ts": "the units table itself",
  "models/nitrogen/calibration/kits.ts": "the units a kit is printed in",
  "app/routes/readings/upload.tsx": "the choice of the unit an uploaded file is written in",
  "app/routes/auth/account.tsx": "the choice of units on the account page",
  "app/routes/share/public.tsx": "anonymous visitors always read NO3, and the page says so",
  "app/routes/dev/chart-preview.tsx": "a local development page, not for readers",
  "models/nitrogen/parameters/scenario-defaults.ts": "parameters' source notes (never shown)",
};

const FIXED_UNIT = /mg\/L( as)? NO3\b(?!-N)|\bas NO3\b(?!-N)|nitrate as NO3/;

function sourceFiles(dir: string): string[] {
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
    const p = path.join(dir, e.name);
    if (e.isDirectory()) return sourceFiles(p);
    return /\.(ts|tsx)$/.test(e.name) ? [p] : [];
  });
}

/** The code without comments: block comments, and line comments not inside a string's `//` (URLs). */
const withoutComments = (src: string) => src.replace(/\/\*[\s\S]*?\*\//g, "").replace(/(^|[^:"'`\\])\/\/.*$/gm, "$1");

describe("nitrate's unit is never written by hand", () => {
  it("finds the hand-written unit where it is (the check itself can fail)", () => {
    expect(FIXED_UNIT.test("tap water 10 mg/L NO3")).toBe(true);
    expect(FIXED_UNIT.test("carries 40 mg/L nitrate as NO3")).toBe(true);
    expect(FIXED_UNIT.test("steps of 0.113 mg/L NO3-N")).toBe(false);
    expect(FIXED_UNIT.test("NO3 target 5–20")).toBe(false);
  });

  it("app/, models/ and server/ state nitrate through the units table, save the listed places", () => {
    const found: string[] = [];
    for (const file of ["app", "models", "server"].flatMap(sourceFiles)) {
      const rel = file.split(path.sep).join("/");
      if (Object.hasOwn(ALLOWED, rel)) continue;
      withoutComments(fs.readFileSync(file, "utf8"))
        .split("\n")
        .forEach((line, i) => {
          if (FIXED_UNIT.test(line)) found.push(`${rel}:${i + 1}: ${line.trim()}`);
        });
    }
    expect(found).toEqual([]);
  });
});
