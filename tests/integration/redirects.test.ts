/**
 * Safe redirects through the real routes: after sign-in, and for a signed-in visitor of the
 * sign-up page. Every known bypass form (tests/support/attack-inputs.ts) lands on our own site,
 * and none answers 500 (a line break or a character outside Latin-1 in a Location header did).
 */
import { beforeAll, describe, expect, it } from "vitest";
import { action as signInAction } from "~/routes/auth/sign-in";
import { loader as signUpLoader } from "~/routes/auth/sign-up";
import { REDIRECT_BYPASSES } from "../support/attack-inputs";
import { call, get, ORIGIN, post } from "../support/routes";
import { createUser, signIn, TEST_PASSWORD } from "../support/users";

let user: { id: number; email: string };
let cookie: string;
beforeAll(async () => {
  user = await createUser();
  cookie = await signIn(user.email);
});

function expectOurs(location: string | null) {
  expect(location).not.toBeNull();
  // The browser's own reading of the Location header (WHATWG URL parser).
  expect(new URL(location!, ORIGIN).origin).toBe(ORIGIN);
  expect(location).toMatch(/^\/(?![/\\])[\x21-\x7e]*$/);
}

describe("redirects after sign-in stay on this site", () => {
  it.each(REDIRECT_BYPASSES)("a signed-in visitor of /sign-up?redirectTo=%j", async (value) => {
    const result = await call(signUpLoader, get(`/sign-up?redirectTo=${encodeURIComponent(value)}`, cookie));
    expect(result.status).toBe(302);
    expectOurs(result.location);
    expect(result.location).toBe("/tanks");
  });

  it.each(["/\n/evil.example", "/\t/evil.example", "/\\evil.example", "https://evil.example", "/tanks/ڳ🐟"])(
    "signing in with redirectTo=%j",
    async (value) => {
      const result = await call(
        signInAction,
        post("/sign-in", { email: user.email, password: TEST_PASSWORD, redirectTo: value }),
        {},
        "198.51.100.40",
      );
      expect(result.status).toBe(302);
      expectOurs(result.location);
    },
  );

  it("keeps a same-site path with its query and fragment", async () => {
    const result = await call(
      signInAction,
      post("/sign-in", { email: user.email, password: TEST_PASSWORD, redirectTo: "/tanks?sort=name#list" }),
      {},
      "198.51.100.41",
    );
    expect(result.location).toBe("/tanks?sort=name#list");
  });
});
