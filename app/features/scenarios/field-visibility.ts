/**
 * Which setup-form fields apply, given the values of the fields that switch them (pure, shared
 * by the form in the browser and its server render). A field that does not apply is hidden, not
 * removed: its value still travels with the form, so nothing typed is lost when a switch flips back.
 */

/** A field's value as the form holds it ("true"/"false" for a box, the option for a list). */
type ValueOf = (name: string) => string | undefined;

type Rule = {
  /** Matches the fields the rule governs; group 1 is the prefix shared with the switch. */
  field: RegExp;
  /** The switch, after that prefix. */
  switch: string;
  /** Whether the governed field applies for the switch's value. */
  applies: (value: string | undefined) => boolean;
};

const RULES: readonly Rule[] = [
  // A plant group's trimming: the interval is for the fixed schedule only; "full at" for the
  // "when full" rule only; how far back to trim for either, not for "never".
  { field: /^(plants\.\d+\.)trim\.everyDays$/, switch: "trim.rule", applies: (v) => v === "everyDays" },
  { field: /^(plants\.\d+\.)trim\.fullAtFraction$/, switch: "trim.rule", applies: (v) => v === "whenFull" },
  { field: /^(plants\.\d+\.)trim\.trimToFraction$/, switch: "trim.rule", applies: (v) => v !== "none" },
  // Fishless cycling's dosing fields only while it is on; "stop after" only for that stop rule.
  {
    field: /^(fishlessCycling\.)(doseMgNPerL|doseIntervalDays|stopRule|stopAfterDays)$/,
    switch: "enabled",
    applies: (v) => v === "true",
  },
  { field: /^(fishlessCycling\.)stopAfterDays$/, switch: "stopRule", applies: (v) => v === "afterDays" },
  // Low-oxygen zones: their fields only while they are on; rock and sand for zones sized from
  // the media, a stated capacity otherwise; the anammox capacity only with anammox on.
  {
    field:
      /^(lowOxygen\.)(zoneSize|porousRockL|sandBedAreaM2|sandBedDepthCm|capacityEstimate|denitrificationCapacityMgNPerDay|anammoxEnabled|anammoxCapacityMgNPerDay)$/,
    switch: "enabled",
    applies: (v) => v === "true",
  },
  {
    field: /^(lowOxygen\.)(porousRockL|sandBedAreaM2|sandBedDepthCm|capacityEstimate)$/,
    switch: "zoneSize",
    applies: (v) => v === "fromMedia",
  },
  {
    field: /^(lowOxygen\.)denitrificationCapacityMgNPerDay$/,
    switch: "zoneSize",
    applies: (v) => v === "fromCapacity",
  },
  { field: /^(lowOxygen\.)anammoxCapacityMgNPerDay$/, switch: "anammoxEnabled", applies: (v) => v === "true" },
];

/** Whether the field `name` applies, given the form's current values. Fields no rule governs always apply. */
export function fieldApplies(name: string, valueOf: ValueOf): boolean {
  return RULES.every((rule) => {
    const m = rule.field.exec(name);
    return !m || rule.applies(valueOf(m[1] + rule.switch));
  });
}

/** Whether changing the field `name` can show or hide another field. */
export function isSwitchField(name: string): boolean {
  return RULES.some(
    (rule) => name.endsWith(rule.switch) && /^(plants\.\d+\.|fishlessCycling\.|lowOxygen\.)/.test(name),
  );
}
