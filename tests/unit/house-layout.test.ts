import { readFileSync, readdirSync, statSync } from "node:fs";
import { join, relative } from "node:path";
import { describe, expect, it } from "vitest";

// Our own checks of the house rules (docs/decisions/0008-feature-folders.md; common practice, no source).
const repo = join(__dirname, "../..");
const walk = (dir: string, keep: (f: string) => boolean): string[] =>
  readdirSync(dir).flatMap((f) => {
    if (f === "node_modules" || f === "+types" || f.startsWith(".")) return [];
    const p = join(dir, f);
    return statSync(p).isDirectory() ? walk(p, keep) : keep(p) ? [p] : [];
  });
const isSource = (f: string) => /\.(ts|tsx)$/.test(f) && !f.endsWith(".d.ts");
const sources = [...walk(join(repo, "app"), isSource), ...walk(join(repo, "models"), isSource)];
const lines = (f: string) => readFileSync(f, "utf8").split("\n").length;
const rel = (f: string) => relative(repo, f).replaceAll("\\", "/");

describe("the house stays easy to live in", () => {
  it("finds the sources it checks", () => {
    expect(sources.length).toBeGreaterThan(100);
  });

  it("has no source file in app/ or models/ over 400 lines", () => {
    const long = sources.filter((f) => lines(f) > 400).map((f) => `${rel(f)}: ${lines(f)}`);
    expect(long).toEqual([]);
  });

  it("keeps the median source file under 100 lines", () => {
    const sorted = sources.map(lines).sort((a, b) => a - b);
    const mid = sorted.length / 2;
    const median = sorted.length % 2 ? sorted[Math.floor(mid)] : (sorted[mid - 1] + sorted[mid]) / 2;
    expect(median).toBeLessThan(100);
  });

  it("keeps only cross-cutting server modules at app/'s top level", () => {
    const top = readdirSync(join(repo, "app")).filter((f) => f.endsWith(".server.ts"));
    expect(top.length).toBeLessThanOrEqual(10);
  });

  it("refers nowhere to the briefing folder outside the repository", () => {
    const text = (f: string) => /\.(ts|tsx|mjs|js|md|json|yml|sh)$/.test(f) || f.endsWith("/run");
    const files = ["app", "models", "server", "tests", "docs", "bench", "tools", ".ci"]
      .flatMap((d) => {
        try {
          return walk(join(repo, d), text);
        } catch {
          return [];
        }
      })
      .concat(["README.md", "DEVELOPERS.md", "package.json"].map((f) => join(repo, f)));
    const self = rel(__filename);
    const offenders = files.filter((f) => rel(f) !== self && readFileSync(f, "utf8").includes("../" + "shared"));
    expect(offenders.map(rel)).toEqual([]);
  });
});
