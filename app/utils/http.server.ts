import { data } from "react-router";
import type { FieldErrors, FormFailure } from "~/utils/form-errors";

/** 400 with field errors and the input echoed back (passwords stripped), for a form to redraw. */
export function invalid(errors: FieldErrors, values: Record<string, string> = {}) {
  const safe = Object.fromEntries(Object.entries(values).filter(([k]) => !/password/i.test(k)));
  return data<FormFailure>({ errors, values: safe }, { status: 400 });
}

/** Reads a form body; a malformed or oversized body becomes a 400 rather than a 500. */
export async function readForm(request: Request): Promise<FormData> {
  try {
    return await request.formData();
  } catch {
    throw data({ message: "The form could not be read. Reload the page and try again." }, { status: 400 });
  }
}
