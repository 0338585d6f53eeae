import { data } from "react-router";
import type { FieldErrors, FormFailure } from "~/utils/form-errors";

/**
 * 400 with field errors and the input echoed back (passwords stripped), for a form to redraw;
 * 429 past a rate limit, 413 past a storage quota, 503 when the server cannot take it now.
 */
export function invalid(errors: FieldErrors, values: Record<string, string> = {}, status: 400 | 409 | 413 | 429 | 503 = 400) {
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
