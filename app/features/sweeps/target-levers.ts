/** What the target finder may change (isomorphic: the page's form lists them). */
export const TARGET_LEVERS = ["waterChangeFraction", "waterChangeInterval", "plantMass", "feed", "roShare"] as const;
export type TargetLeverId = (typeof TARGET_LEVERS)[number];

export const TARGET_LEVER_LABELS: Record<TargetLeverId, string> = {
  waterChangeFraction: "Share of water changed (at a given interval)",
  waterChangeInterval: "Days between water changes (at a given share)",
  plantMass: "Plant mass",
  feed: "Food per day",
  roShare: "Reverse-osmosis share of the change water",
};

/** The setting of the shared vocabulary (models/nitrogen/scenario/settings.ts) each lever changes. */
export const TARGET_LEVER_SETTINGS: Record<TargetLeverId, string> = {
  waterChangeFraction: "maintenance.waterChangeFraction",
  waterChangeInterval: "maintenance.waterChangeIntervalDays",
  plantMass: "plantMass",
  feed: "fish.feedGPerDay",
  roShare: "tapWater.roShare",
};
