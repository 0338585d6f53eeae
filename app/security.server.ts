/**
 * HTTP-level protections applied by the server (server/app.ts) before React Router runs:
 * the cross-site request check and the Content-Security-Policy.
 */

const UNSAFE_METHODS = new Set(["POST", "PUT", "PATCH", "DELETE"]);

/**
 * Refuses state-changing requests that a browser made from another site (CSRF). Browsers send
 * `Origin` on every cross-origin POST and `Sec-Fetch-Site` on every request; a request with
 * neither comes from a non-browser client (curl, scripts), which cannot ride on a victim's
 * cookie. Returns the reason for refusing, or null to let the request through.
 *
 * @param allowedOrigins the server's own origin(s), e.g. "https://fernwater.example"
 */
export function crossSiteRefusal(method: string, headers: { origin?: string; secFetchSite?: string }, allowedOrigins: readonly string[]): string | null {
  if (!UNSAFE_METHODS.has(method.toUpperCase())) return null;
  const origin = headers.origin;
  if (origin !== undefined && origin !== "") {
    if (origin === "null" || !allowedOrigins.includes(origin.toLowerCase())) {
      return "This request came from another site and was refused. Use Fernwater's own pages to change things.";
    }
    return null;
  }
  if (headers.secFetchSite === "cross-site") {
    return "This request came from another site and was refused. Use Fernwater's own pages to change things.";
  }
  return null;
}

/**
 * The Content-Security-Policy of every page: scripts only from us or carrying this
 * response's nonce (React Router's inline hydration scripts get it), no framing, no plugins.
 * Styles allow inline attributes (chart geometry, bar widths); images allow data:/blob: for
 * the chart PNG/SVG downloads.
 */
export function contentSecurityPolicy(nonce: string): string {
  return [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}'`,
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self' data:",
    "connect-src 'self'",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
  ].join("; ");
}
