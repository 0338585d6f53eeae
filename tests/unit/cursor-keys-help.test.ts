/**
 * The chart cursor's keyboard help says which way each key moves, and says it truly (issue 12,
 * item 12). The directions are read from the help's own words and checked against what the key
 * handler does. WAI-ARIA Authoring Practices, slider pattern (Page Up larger, Page Down smaller).
 */
import { describe, expect, it } from "vitest";
import { CURSOR_KEYS_HELP, CURSOR_KEYS_SUMMARY, stepCursor } from "~/utils/series-lookup";

const days = Array.from({ length: 60 }, (_v, k) => k);

/** "later" or "earlier" as the help text says for a key, or null when it does not say. */
function saidDirection(help: string, key: string): "later" | "earlier" | null {
  const m = new RegExp(`${key}[^,.;]*?\\b(later|earlier)\\b`).exec(help);
  return (m?.[1] as "later" | "earlier" | undefined) ?? null;
}

describe("the chart cursor's keyboard help", () => {
  for (const [name, help] of [
    ["visible help", CURSOR_KEYS_HELP],
    ["accessible name", CURSOR_KEYS_SUMMARY],
  ] as const) {
    it(`${name}: Page Up and Page Down each say which way they move, and the keys move that way`, () => {
      for (const [key, word] of [
        ["PageUp", "Page Up"],
        ["PageDown", "Page Down"],
      ] as const) {
        const said = saidDirection(help, word);
        expect(said, `${word} in “${help}”`).not.toBeNull();
        const moved = stepCursor(days, 30, key)!;
        expect(moved > 30 ? "later" : "earlier").toBe(said);
        // A week, as the help says.
        expect(Math.abs(moved - 30)).toBe(7);
        expect(help).toMatch(new RegExp(`${word}[^,.;]*a week`));
      }
    });
  }

  it("would catch a help that leaves the direction out", () => {
    expect(saidDirection("Page Up / Page Down (a week), Home / End.", "Page Up")).toBeNull();
  });
});
