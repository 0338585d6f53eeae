import { describe, expect, it } from "vitest";
import { chooseListenHost } from "../../server/listen-host.mjs";

// Our own rule (issue 10): local mode listens on loopback unless HOST is set; production on every address.
describe("the address the server listens on", () => {
  it("keeps local mode on 127.0.0.1 unless HOST is set, and says so", () => {
    for (const env of [
      { FERNWATER_MODE: "local" },
      { NODE_ENV: "development" },
      { FERNWATER_MODE: "local", HOST: "" },
      { FERNWATER_MODE: "local", HOST: "  " },
    ]) {
      const chosen = chooseListenHost(env);
      expect(chosen.host).toBe("127.0.0.1");
      expect(chosen.note).toMatch(/only this machine/);
    }
  });

  it("takes an explicit HOST in local mode, with a warning when it opens the server to a network", () => {
    expect(chooseListenHost({ FERNWATER_MODE: "local", HOST: "0.0.0.0" })).toEqual({
      host: "0.0.0.0",
      note: expect.stringMatching(/other machines can reach it/),
    });
    expect(chooseListenHost({ FERNWATER_MODE: "local", HOST: "::1" }).note).toMatch(/this machine only/);
  });

  it("listens on every address in production unless HOST says otherwise", () => {
    expect(chooseListenHost({ NODE_ENV: "production" })).toEqual({ host: "0.0.0.0", note: null });
    expect(chooseListenHost({ FERNWATER_MODE: "production", HOST: "10.0.0.5" }).host).toBe("10.0.0.5");
    expect(chooseListenHost({ NODE_ENV: "production", FERNWATER_MODE: "local" }).host).toBe("127.0.0.1");
  });
});
