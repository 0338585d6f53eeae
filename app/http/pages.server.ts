/** The route edge for pages: form answers, form bodies, and typed refusals as a form's message. */
import { data } from "react-router";
import { refusalOf } from "~/http/refusals.server";
import type { FieldErrors, FormFailure } from "~/utils/form-errors";

/**
 * 400 with field errors and the input echoed back (passwords stripped), for a form to redraw;
 * 429 past a rate limit, 413 past a storage quota, 503 when the server cannot take it now.
 */
export function invalid(
  errors: FieldErrors,
  values: Record<string, string> = {},
  status: 400 | 409 | 413 | 429 | 503 = 400,
) {
  const safe = Object.fromEntries(Object.entries(values).filter(([k]) => !/password/i.test(k)));
  return data<FormFailure>({ errors, values: safe }, { status });
}

/** Reads a form body; a malformed or oversized body becomes a 400 rather than a 500. */
export async function readForm(request: Request): Promise<FormData> {
  try {
    return await request.formData();
  } catch {
    throw data({ message: "The form could not be read. Reload the page and try again." }, { status: 400 });
  }
}

/**
 * A typed refusal (app/http/refusals.server.ts) as a form's message and status: the model could
 * not run the settings (400, saying so), a rate or concurrency limit (429), a storage quota
 * (413), the job line full (503). Null for anything else: rethrow it.
 */
export function formRefusal(error: unknown): { message: string; status: 400 | 413 | 429 | 503 } | null {
  const refused = refusalOf(error);
  if (!refused) return null;
  if (refused.kind === "model")
    return { message: `The model could not run these settings: ${refused.message}`, status: 400 };
  return { message: refused.message, status: refused.status as 413 | 429 | 503 };
}

/**
 * A form action's answer to a typed refusal: the form redrawn with the message (formRefusal).
 * Anything else is rethrown (a bug, for the error page).
 */
export function refusedForm(error: unknown, values: Record<string, string>, field = "") {
  const refused = formRefusal(error);
  if (!refused) throw error;
  return invalid({ [field]: refused.message }, values, refused.status);
}

/**
 * The sentence for a page that needed a run and could not have one: the model could not run
 * the settings, a limit on runs, or the owner's storage quota. Null for anything else (a bug).
 */
export function runProblem(error: unknown): string | null {
  return refusalOf(error)?.message ?? null;
}
