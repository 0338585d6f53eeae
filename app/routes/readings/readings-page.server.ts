/**
 * Server code of the readings page: the query string (sorting, paging, the reading being
 * edited), the add/edit form, and the rows in the viewer's units.
 */
import { and, eq } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "~/db/client.server";
import { readings } from "~/db/schema";
import {
  checkTakenAt,
  displayMeasure,
  MEASURE_KEYS,
  readMeasure,
  SORT_KEYS,
  type MeasureKey,
  type MeasureUnits,
  type ReadingInput,
  type ReadingRow,
} from "~/features/readings/readings.server";
import { MAX_NOTE_LENGTH } from "~/features/readings/readings-csv.server";
import { formatDateTime, parseDateTime, toDateTimeInput } from "~/utils/dates";
import type { DisplayUnits } from "~/utils/display-units";
import type { FieldErrors } from "~/utils/form-errors";

const ListQuerySchema = z.object({
  sort: z.enum(SORT_KEYS).catch("takenAt"),
  dir: z.enum(["asc", "desc"]).catch("desc"),
  page: z.coerce.number().int().min(1).max(100_000).catch(1),
  edit: z.coerce.number().int().positive().optional().catch(undefined),
});

export type ListQuery = z.infer<typeof ListQuerySchema>;

export function readListQuery(url: URL): ListQuery {
  return ListQuerySchema.parse(Object.fromEntries(url.searchParams));
}

const FormSchema = z.object({
  takenAt: z
    .string({ error: "Give the date and time of the test." })
    .trim()
    .min(1, "Give the date and time of the test."),
  note: z
    .string()
    .trim()
    .max(MAX_NOTE_LENGTH, `Keep the note under ${MAX_NOTE_LENGTH} characters.`)
    .optional()
    .transform((v) => v ?? ""),
  ...Object.fromEntries(MEASURE_KEYS.map((k) => [k, z.string().max(40, "That is not a number.").optional()])),
});

/** The add/edit form → a canonical reading, or errors beside the fields. */
export function parseReadingForm(
  values: Record<string, string>,
  units: MeasureUnits,
  now = Date.now(),
): { ok: true; reading: ReadingInput } | { ok: false; errors: FieldErrors } {
  const parsed = FormSchema.safeParse(values);
  if (!parsed.success) {
    const errors: FieldErrors = {};
    for (const i of parsed.error.issues) errors[i.path.map(String).join(".")] ??= i.message;
    return { ok: false, errors };
  }
  const errors: FieldErrors = {};
  const takenAt = parseDateTime(parsed.data.takenAt);
  if (takenAt === null) errors.takenAt = "Give the date and time like 2026-03-01 08:30.";
  else {
    const problem = checkTakenAt(takenAt, now);
    if (problem) errors.takenAt = problem;
  }
  const measured = {} as Record<MeasureKey, number | null>;
  for (const k of MEASURE_KEYS) {
    const read = readMeasure(k, values[k], units, true);
    if ("error" in read) errors[k] = read.error;
    else measured[k] = read.value;
  }
  if (Object.keys(errors).length === 0 && MEASURE_KEYS.every((k) => measured[k] === null)) {
    errors[""] = "Enter at least one test result.";
  }
  if (Object.keys(errors).length) return { ok: false, errors };
  return { ok: true, reading: { ...measured, takenAt: takenAt!, note: parsed.data.note } };
}

/** Whether the tank already has a reading at this time (other than `exceptId`). */
export function takenAtClash(tankId: number, takenAt: number, exceptId?: number): boolean {
  const row = getDb()
    .select({ id: readings.id })
    .from(readings)
    .where(and(eq(readings.tankId, tankId), eq(readings.takenAt, new Date(takenAt))))
    .get();
  return Boolean(row && row.id !== exceptId);
}

export function clashMessage(takenAt: number): string {
  return `There is already a reading at ${formatDateTime(takenAt)}: edit that one instead.`;
}

/** A row as the table and the edit form show it. */
export function displayRow(r: ReadingRow, units: DisplayUnits) {
  return {
    id: r.id,
    takenAt: formatDateTime(r.takenAt.getTime()),
    takenAtInput: toDateTimeInput(r.takenAt.getTime()),
    values: Object.fromEntries(MEASURE_KEYS.map((k) => [k, displayMeasure(k, r[k], units)])) as Record<
      MeasureKey,
      number | null
    >,
    note: r.note,
  };
}

export type DisplayReading = ReturnType<typeof displayRow>;
