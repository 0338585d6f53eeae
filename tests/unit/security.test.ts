import { describe, expect, it } from "vitest";
import { contentSecurityPolicy, crossSiteRefusal } from "~/security.server";

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
    expect(crossSiteRefusal(method, { origin: "https://fernwater.example.evil.example" }, ours)).toMatch(/another site/);
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
