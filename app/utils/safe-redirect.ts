/**
 * Where to send someone after signing in or up: only a path on this site. A browser cleans a
 * Location before following it (it drops tabs and line breaks, reads a backslash as a slash), so
 * "/\t/evil.example" or "/\\evil.example" leads to another site although it starts with one
 * slash. We parse the value as the browser would, against our own origin, and keep it only if
 * it stays here; anything else, and anything that would not fit in a header, gets the fallback.
 */
const BASE = "http://fernwater.invalid";
const MAX_LENGTH = 2000;
/** C0 and C1 controls, DEL, backslashes and any whitespace: none belongs in a path we made. */
// eslint-disable-next-line no-control-regex -- finding control characters is the point
const FORBIDDEN = /[\u0000-\u001f\u007f-\u009f\\\s]/u;
/** Once percent-decoded, spaces may be real (a search), but controls and backslashes are not. */
// eslint-disable-next-line no-control-regex -- as above
const FORBIDDEN_DECODED = /[\u0000-\u001f\u007f-\u009f\\]/u;

function staysHere(path: string, forbidden = FORBIDDEN): boolean {
  return path.startsWith("/") && !path.startsWith("//") && !forbidden.test(path);
}

export function safeRedirect(to: FormDataEntryValue | string | null | undefined, fallback = "/tanks"): string {
  if (typeof to !== "string" || to.length > MAX_LENGTH || !staysHere(to)) return fallback;
  // The same checks on the percent-decoded form, for a proxy or client that decodes first.
  let decoded: string;
  try {
    decoded = decodeURIComponent(to);
  } catch {
    return fallback;
  }
  if (!staysHere(decoded, FORBIDDEN_DECODED)) return fallback;
  let url: URL;
  try {
    url = new URL(to, BASE);
  } catch {
    return fallback;
  }
  if (url.origin !== BASE || url.username !== "" || url.password !== "") return fallback;
  // The serialised form is ASCII (safe in a header) and "/.//x" has become "//x": check again.
  const path = url.pathname + url.search + url.hash;
  return staysHere(path) ? path : fallback;
}
