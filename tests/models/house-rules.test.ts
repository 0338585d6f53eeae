import { existsSync, readFileSync, readdirSync, statSync } from "node:fs";
import { join, relative } from "node:path";
import { describe, expect, it } from "vitest";

// Our own checks of the owner's rules for models/ (common practice, no source).
const root = join(__dirname, "../../models");
const files = (function walk(dir: string): string[] {
  return readdirSync(dir).flatMap((f) => {
    const p = join(dir, f);
    return statSync(p).isDirectory() ? walk(p) : p.endsWith(".ts") ? [p] : [];
  });
})(root);
const src = (f: string) => readFileSync(f, "utf8");
const rel = (f: string) => relative(root, f).replaceAll("\\", "/");
const imports = (f: string) => [...src(f).matchAll(/from\s+"([^"]+)"/g)].map((m) => m[1]);

describe("models/ stays plain, pure TypeScript", () => {
  it("keeps every source file under 400 lines", () => {
    // house style: no source file in models/ over 400 lines
    for (const f of files) expect(src(f).split("\n").length, rel(f)).toBeLessThanOrEqual(400);
  });

  it("imports no React, router, database or node:* (except the CLI)", () => {
    for (const f of files) {
      for (const i of imports(f)) {
        expect(i, rel(f)).not.toMatch(/^(react|react-dom|react-router|@react-router|drizzle-orm|better-sqlite3)/);
        if (rel(f) !== "cli.ts") expect(i, rel(f)).not.toMatch(/^node:/);
      }
    }
  });

  it("imports odex in exactly one adapter file", () => {
    const users = files.filter((f) => imports(f).includes("odex")).map(rel);
    expect(users).toEqual(["core/solver.ts"]);
  });

  it("keeps mathjs out of everything index.ts reaches", () => {
    const seen = new Set<string>();
    const visit = (f: string) => {
      if (seen.has(f)) return;
      seen.add(f);
      for (const i of imports(f)) {
        expect(i, rel(f)).not.toBe("mathjs");
        if (!i.startsWith(".")) continue;
        const base = join(f, "..", i);
        visit(i.endsWith(".ts") ? base : existsSync(`${base}.ts`) ? `${base}.ts` : join(base, "index.ts"));
      }
    };
    visit(join(root, "index.ts"));
    expect(seen.size).toBeGreaterThan(8);
    expect([...seen].map(rel)).not.toContain("units.ts");
  });

  it("uses no unseeded randomness and reads the clock only in the guards", () => {
    for (const f of files) {
      expect(src(f), rel(f)).not.toMatch(/Math\.random/);
      const clock = /performance\.now\(\)|Date\.now\(\)/.test(src(f));
      if (clock) {
        expect(["core/solver.ts", "core/rosenbrock.ts", "core/simulate.ts", "nitrogen/simulate.ts"]).toContain(rel(f));
      }
    }
  });
});
