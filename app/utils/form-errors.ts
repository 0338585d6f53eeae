import type { z } from "zod";

/** Field path ("plants.0.startMassG") → first message for that field. */
export type FieldErrors = Record<string, string>;

/** Flattens zod issues to one message per field path; form-level issues go under "". */
export function fieldErrors(error: z.ZodError): FieldErrors {
  const out: FieldErrors = {};
  for (const issue of error.issues) {
    const key = issue.path.map(String).join(".");
    if (!(key in out)) out[key] = issue.message;
  }
  return out;
}

/** FormData → plain object of strings (last value wins; files skipped). Never throws. */
export function formValues(form: FormData): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [key, value] of form.entries()) {
    if (typeof value === "string") out[key] = value;
  }
  return out;
}

/** The shape every form action answers with when it refuses input. */
export type FormFailure = { errors: FieldErrors; values: Record<string, string> };
