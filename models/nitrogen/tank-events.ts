/**
 * An explicit event schedule: "these events on these days", for replaying a tank as it happened
 * (a keeper's journal) instead of the scenario's periodic schedule. Validated by zod like every
 * engine boundary. Days are model days from the run's start; amounts are canonical units.
 */
import { z } from "zod";

const day = z.number({ error: "Day must be a number" }).min(0, { error: "Day must be 0 or later" }).max(730);
const share = (what: string) =>
  z
    .number({ error: `${what} must be a number` })
    .min(0, { error: `${what} must be 0 or more` })
    .max(1, {
      error: `${what} must be at most 1`,
    });

const TankEventSchema = z.discriminatedUnion("kind", [
  z.object({
    kind: z.literal("waterChange"),
    day,
    /** Share of the tank's water replaced. */
    fraction: share("Share of water changed").max(0.95, { error: "At most 95 % of the water can be changed" }),
    /** Nitrate-N of the tap water used, mg N/L; null: the scenario's. */
    tapNitrate: z.number().min(0).max(100).nullable().default(null),
    /** Share of the change water that was RO water; null: the scenario's. */
    roShare: share("RO share").nullable().default(null),
    /** Share of the gravel's detritus siphoned at the change. */
    gravelFraction: share("Detritus siphoned").default(0),
  }),
  z.object({
    kind: z.literal("filterCleaning"),
    day,
    /** Share of the filter's sludge taken out. */
    sludgeFraction: share("Sludge removed"),
    /** Share of all nitrifying bacteria lost (the filter's share times the rinse's kill). */
    bacteriaShare: share("Bacteria lost"),
    inTapWater: z.boolean().default(false),
  }),
  z.object({ kind: z.literal("gravelCleaning"), day, fraction: share("Detritus siphoned") }),
  z.object({
    kind: z.literal("plants"),
    day,
    /** Plant group id in the scenario. */
    groupId: z.string().min(1),
    /** Dry mass added (positive) or taken out (negative), g. */
    changeG: z.number().min(-10000).max(10000),
  }),
  z.object({
    kind: z.literal("trim"),
    day,
    groupId: z.string().min(1),
    /** Dry mass left after trimming, g (nothing happens if the group is not above it). */
    toG: z.number().min(0).max(100000),
  }),
  z.object({ kind: z.literal("feeding"), day, feedGPerDay: z.number().min(0).max(1000) }),
  z.object({ kind: z.literal("dose"), day, mgNPerL: z.number().min(0).max(10) }),
]);

export type TankEvent = z.output<typeof TankEventSchema>;
export type TankEventInput = z.input<typeof TankEventSchema>;

export const TankEventsSchema = z.array(TankEventSchema).max(20_000, { error: "At most 20 000 events" });
