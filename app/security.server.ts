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
export function crossSiteRefusal(
  method: string,
  headers: { origin?: string; secFetchSite?: string },
  allowedOrigins: readonly string[],
): string | null {
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

/** 127.0.0.0/8 and ::1, also written as IPv4-mapped IPv6 (::ffff:127.0.0.1). */
export function isLoopbackAddress(address: string | null | undefined): boolean {
  if (!address) return false;
  const a = address
    .trim()
    .toLowerCase()
    .replace(/^\[|\]$/g, "");
  if (a === "::1" || a === "0:0:0:0:0:0:0:1") return true;
  const v4 = a.startsWith("::ffff:") ? a.slice(7) : a;
  return /^127\.\d{1,3}\.\d{1,3}\.\d{1,3}$/.test(v4);
}

/**
 * Whether a request comes from this machine: the connection's peer and the client address
 * (which TRUST_PROXY may read from X-Forwarded-For) are loopback, and no forwarding header names
 * any other address — a proxy on this machine forwarding someone else's request does not count.
 */
export function isFromThisMachine(headers: Headers, addresses: { peer: string; client: string }): boolean {
  if (!isLoopbackAddress(addresses.peer) || !isLoopbackAddress(addresses.client)) return false;
  const forwarded = [
    ...(headers.get("x-forwarded-for") ?? "").split(","),
    ...(headers.get("x-real-ip") ?? "").split(","),
    ...[...(headers.get("forwarded") ?? "").matchAll(/for=("?)\[?([^\]";,]+)/gi)].map((m) => m[2]),
  ]
    .map((s) => s.trim())
    .filter((s) => s !== "");
  return forwarded.every(isLoopbackAddress);
}

/**
 * Whether a request was addressed to this machine by a loopback name (`localhost`, a
 * `*.localhost` name, 127.0.0.0/8 or [::1]), in its Host header and any X-Forwarded-Host. A page
 * on another site can point its own host name at 127.0.0.1 (DNS rebinding) and then read this
 * server from the browser of the person running it: the connection comes from loopback with no
 * forwarding header, but the Host header still names the other site.
 */
export function isAddressedToThisMachine(request: Request): boolean {
  const url = new URL(request.url);
  const names = [
    request.headers.get("host") ?? url.host,
    ...(request.headers.get("x-forwarded-host") ?? "").split(",").filter((s) => s.trim() !== ""),
  ];
  return names.every((raw) => {
    const host = raw.trim().toLowerCase();
    // host[:port], with IPv6 in brackets
    const name = host.startsWith("[") ? host.slice(0, host.indexOf("]") + 1) : host.replace(/:\d*$/, "");
    if (name === "localhost" || name.endsWith(".localhost")) return /^[a-z0-9.-]+$/.test(name);
    return isLoopbackAddress(name);
  });
}
