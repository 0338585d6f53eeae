import { describe, expect, it } from "vitest";
import { contentSecurityPolicy, crossSiteRefusal, isFromThisMachine, isLoopbackAddress } from "~/security.server";

// OWASP CSRF Prevention Cheat Sheet ("Verifying Origin With Standard Headers") and the Fetch
// Metadata spec (Sec-Fetch-Site): a state-changing request whose Origin is not ours is refused.
describe("cross-site request check", () => {
  const ours = ["https://fernwater.example"];

  it("lets safe methods through whatever their origin", () => {
    expect(crossSiteRefusal("GET", { origin: "https://evil.example" }, ours)).toBeNull();
    expect(crossSiteRefusal("HEAD", { secFetchSite: "cross-site" }, ours)).toBeNull();
  });

  it("accepts our own origin, in any letter case", () => {
    expect(crossSiteRefusal("POST", { origin: "https://fernwater.example" }, ours)).toBeNull();
    expect(crossSiteRefusal("DELETE", { origin: "HTTPS://FERNWATER.EXAMPLE" }, ours)).toBeNull();
  });

  it.each(["POST", "PUT", "PATCH", "DELETE"])("refuses %s from another origin, and from an opaque one", (method) => {
    expect(crossSiteRefusal(method, { origin: "https://evil.example" }, ours)).toMatch(/another site/);
    expect(crossSiteRefusal(method, { origin: "null" }, ours)).toMatch(/another site/);
    expect(crossSiteRefusal(method, { origin: "https://fernwater.example.evil.example" }, ours)).toMatch(
      /another site/,
    );
  });

  it("falls back to Sec-Fetch-Site when a browser sent no Origin", () => {
    expect(crossSiteRefusal("POST", { secFetchSite: "cross-site" }, ours)).toMatch(/another site/);
    expect(crossSiteRefusal("POST", { secFetchSite: "same-origin" }, ours)).toBeNull();
  });

  it("lets non-browser clients (no Origin, no fetch metadata) through: they carry no victim's cookie", () => {
    expect(crossSiteRefusal("POST", {}, ours)).toBeNull();
  });
});

describe("content security policy", () => {
  // W3C CSP Level 3: a nonce source allows only scripts carrying it; frame-ancestors 'none' forbids framing.
  it("allows our scripts and this response's nonce only, and forbids framing and plugins", () => {
    const csp = contentSecurityPolicy("abc123");
    expect(csp).toContain("script-src 'self' 'nonce-abc123'");
    expect(csp).not.toMatch(/script-src[^;]*unsafe-inline/);
    expect(csp).toContain("frame-ancestors 'none'");
    expect(csp).toContain("object-src 'none'");
    expect(csp).toContain("default-src 'self'");
  });
});

describe("requests from this machine", () => {
  it("knows loopback addresses in their IPv4, IPv6 and mapped forms", () => {
    for (const a of ["127.0.0.1", "127.8.9.10", "::1", "[::1]", "::ffff:127.0.0.1", "0:0:0:0:0:0:0:1"])
      expect(isLoopbackAddress(a), a).toBe(true);
    for (const a of [
      "192.0.2.2",
      "::ffff:192.0.2.2",
      "10.0.0.1",
      "fd00::2",
      "1127.0.0.1",
      "127.0.0.1.evil",
      "",
      "unknown",
      null,
    ])
      expect(isLoopbackAddress(a), String(a)).toBe(false);
  });

  it("needs the peer, the client and every forwarded address to be loopback", () => {
    const none = new Headers();
    expect(isFromThisMachine(none, { peer: "127.0.0.1", client: "127.0.0.1" })).toBe(true);
    expect(isFromThisMachine(none, { peer: "192.0.2.2", client: "127.0.0.1" })).toBe(false);
    expect(isFromThisMachine(none, { peer: "127.0.0.1", client: "203.0.113.5" })).toBe(false);
    expect(
      isFromThisMachine(new Headers({ "X-Forwarded-For": "127.0.0.1, 203.0.113.5" }), {
        peer: "127.0.0.1",
        client: "127.0.0.1",
      }),
    ).toBe(false);
    expect(
      isFromThisMachine(new Headers({ "X-Real-IP": "203.0.113.5" }), { peer: "127.0.0.1", client: "127.0.0.1" }),
    ).toBe(false);
    expect(
      isFromThisMachine(new Headers({ Forwarded: 'for="[2001:db8::1]";proto=http' }), { peer: "::1", client: "::1" }),
    ).toBe(false);
    expect(isFromThisMachine(new Headers({ Forwarded: "for=127.0.0.1" }), { peer: "::1", client: "::1" })).toBe(true);
  });
});
