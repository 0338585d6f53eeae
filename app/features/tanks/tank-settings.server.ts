/**
 * Saving a tank's name, notes and nitrate band. The band enters every figure of the tank's
 * scenarios (days above the target, …), so a tank that holds a handed-in lesson copy keeps its
 * band: what the teacher reads stays what was handed in (issue 12). Its name and notes may change.
 */
import { eq } from "drizzle-orm";
import { getDb } from "~/db/client.server";
import { tanks } from "~/db/schema";
import { handedInCopyIn } from "~/features/classes/classes.server";
import type { TankRow } from "~/features/tanks/tanks.server";

/**
 * Whether a band typed back equals the stored one: the form shows the stored band converted to
 * the person's units (12 significant figures), so the way back differs by rounding only.
 */
const same = (stored: number, typed: number) => Math.abs(stored - typed) <= 1e-9 * Math.max(1, Math.abs(stored));

/**
 * Stores the settings in one transaction; a band left as shown keeps its stored numbers exactly
 * (no new runs for a rounding). Refused, with the lesson's title, when the band would change on
 * a tank holding a handed-in lesson copy.
 */
export function saveTankSettings(
  tank: TankRow,
  input: { name: string; notes: string; nitrateLowMgN: number; nitrateHighMgN: number },
): { ok: true } | { ok: false; lessonTitle: string } {
  return getDb().transaction((tx) => {
    const unchanged =
      same(tank.nitrateTargetLow, input.nitrateLowMgN) && same(tank.nitrateTargetHigh, input.nitrateHighMgN);
    if (!unchanged) {
      const handedIn = handedInCopyIn({ tankId: tank.id });
      if (handedIn) return { ok: false as const, lessonTitle: handedIn.lessonTitle };
    }
    tx.update(tanks)
      .set({
        name: input.name,
        notes: input.notes,
        nitrateTargetLow: unchanged ? tank.nitrateTargetLow : input.nitrateLowMgN,
        nitrateTargetHigh: unchanged ? tank.nitrateTargetHigh : input.nitrateHighMgN,
        updatedAt: new Date(),
      })
      .where(eq(tanks.id, tank.id))
      .run();
    return { ok: true as const };
  });
}

/** What the band's field says on a tank whose band is kept for a hand-in. */
export function bandKeptMessage(lessonTitle: string): string {
  return `This tank holds your hand-in for the lesson “${lessonTitle}”, and its nitrate band is part of what you handed in: it stays as it was. Make another tank to try another band.`;
}
