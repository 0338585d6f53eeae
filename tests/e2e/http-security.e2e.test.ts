import { describe, expect, it } from "vitest";
import { signInOverHttp } from "../support/built-server";
import { baseURL, DEMO } from "./support/browser";

// Against the real built server (no browser needed): the headers every answer carries and the
// cross-site check on state-changing requests. OWASP Secure Headers Project and OWASP CSRF
// Prevention Cheat Sheet.
describe("HTTP protections of the built server", () => {
  it("sends the security headers, with a fresh CSP nonce on each page", async () => {
    const first = await fetch(`${baseURL()}/`);
    const second = await fetch(`${baseURL()}/`);
    expect(first.headers.get("x-content-type-options")).toBe("nosniff");
    expect(first.headers.get("referrer-policy")).toBe("strict-origin-when-cross-origin");
    expect(first.headers.get("x-powered-by")).toBeNull();
    const csp = first.headers.get("content-security-policy")!;
    expect(csp).toContain("frame-ancestors 'none'");
    const nonce = /'nonce-([^']+)'/.exec(csp)![1];
    expect(nonce.length).toBeGreaterThanOrEqual(16);
    expect(/'nonce-([^']+)'/.exec(second.headers.get("content-security-policy")!)![1]).not.toBe(nonce);
    // React Router's inline scripts carry the nonce, so the page still runs under the policy.
    const html = await first.text();
    const inline = [...html.matchAll(/<script(?![^>]*\bsrc=)([^>]*)>/g)].map((m) => m[1]);
    expect(inline.length).toBeGreaterThan(0);
    for (const attrs of inline) expect(attrs).toContain(`nonce="${nonce}"`);
  });

  it("refuses a state-changing request from another site, and accepts our own", async () => {
    const cookie = await signInOverHttp(baseURL(), DEMO.jonah, DEMO.password);
    const body = new URLSearchParams({ name: "Made from afar" });
    const forged = await fetch(`${baseURL()}/tanks`, {
      method: "POST",
      redirect: "manual",
      headers: { Cookie: cookie, Origin: "https://evil.example", "Content-Type": "application/x-www-form-urlencoded" },
      body,
    });
    expect(forged.status).toBe(403);
    const fetchMetadata = await fetch(`${baseURL()}/api/preview`, {
      method: "POST",
      headers: { Cookie: cookie, "Sec-Fetch-Site": "cross-site", "Content-Type": "application/json" },
      body: JSON.stringify({ settings: {} }),
    });
    expect(fetchMetadata.status).toBe(403);
    expect((await fetchMetadata.json()).error).toMatch(/another site/);
    const tanks = (await (await fetch(`${baseURL()}/api/tanks`, { headers: { Cookie: cookie } })).json()) as { tanks: { name: string }[] };
    expect(tanks.tanks.map((t) => t.name)).not.toContain("Made from afar");

    const ownSite = await fetch(`${baseURL()}/tanks`, {
      method: "POST",
      redirect: "manual",
      headers: { Cookie: cookie, Origin: baseURL(), "Content-Type": "application/x-www-form-urlencoded" },
      body: new URLSearchParams({ name: "Made here" }),
    });
    expect(ownSite.status).toBe(302);
  });

  it("sets the session cookie HttpOnly and SameSite=Lax", async () => {
    const res = await fetch(`${baseURL()}/sign-in`, {
      method: "POST",
      redirect: "manual",
      headers: { "Content-Type": "application/x-www-form-urlencoded", Origin: baseURL() },
      body: new URLSearchParams({ email: DEMO.theo, password: DEMO.password }),
    });
    const setCookie = res.headers.get("set-cookie")!;
    expect(setCookie).toMatch(/HttpOnly/i);
    expect(setCookie).toMatch(/SameSite=Lax/i);
  });
});
