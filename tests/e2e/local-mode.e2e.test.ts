import fs from "node:fs";
import http from "node:http";
import net from "node:net";
import os from "node:os";
import { afterAll, describe, expect, it } from "vitest";
import { startBuiltServer, type BuiltServer } from "../support/built-server";

// Local mode (npm start) is for this machine: it runs with a development secret and the demo
// accounts, and /dev/mail shows password-reset links. Our own checks, against the built server.

/** This machine's first non-loopback IPv4 address, if it has one. */
function networkAddress(): string | null {
  for (const list of Object.values(os.networkInterfaces())) {
    for (const a of list ?? []) if (a.family === "IPv4" && !a.internal) return a.address;
  }
  return null;
}

/** The local addresses a TCP port is listening on, read from Linux's /proc/net/tcp{,6} (null elsewhere). */
function listeningAddresses(port: number): string[] | null {
  if (!fs.existsSync("/proc/net/tcp")) return null;
  const out: string[] = [];
  for (const file of ["/proc/net/tcp", "/proc/net/tcp6"]) {
    if (!fs.existsSync(file)) continue;
    for (const line of fs.readFileSync(file, "utf8").split("\n").slice(1)) {
      const cols = line.trim().split(/\s+/);
      if (cols.length < 4 || cols[3] !== "0A") continue; // 0A = LISTEN
      const [hexAddress, hexPort] = cols[1].split(":");
      if (parseInt(hexPort, 16) !== port) continue;
      if (hexAddress.length === 8) {
        out.push(Buffer.from(hexAddress, "hex").reverse().join("."));
      } else {
        out.push(
          hexAddress === "0".repeat(32) ? "::" : hexAddress === "00000000000000000000000001000000" ? "::1" : hexAddress,
        );
      }
    }
  }
  return out;
}

/** GET `path` from 127.0.0.1 with this Host header (fetch keeps Host to the URL's), as a rebound name's page would. */
function getWithHost(port: number, path: string, host: string): Promise<{ status: number; body: string }> {
  return new Promise((resolve, reject) => {
    const req = http.get({ host: "127.0.0.1", port, path, headers: { Host: host } }, (res) => {
      let body = "";
      res.setEncoding("utf8");
      res.on("data", (chunk: string) => (body += chunk));
      res.on("end", () => resolve({ status: res.statusCode ?? 0, body }));
    });
    req.on("error", reject);
  });
}

function connects(host: string, port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const socket = net.connect({ host, port, timeout: 2000 });
    socket.once("connect", () => (socket.destroy(), resolve(true)));
    socket.once("error", () => resolve(false));
    socket.once("timeout", () => (socket.destroy(), resolve(false)));
  });
}

const servers: BuiltServer[] = [];
afterAll(async () => {
  await Promise.all(servers.map((s) => s.stop()));
});

describe("local mode stays on this machine", () => {
  it("listens on 127.0.0.1 when HOST is not set, and says so at start", async () => {
    const server = await startBuiltServer({ env: { HOST: "", SEED_IF_EMPTY: "0" } });
    servers.push(server);
    const port = Number(new URL(server.baseURL).port);
    expect(server.log()).toMatch(/local mode: listening on 127\.0\.0\.1 only/);
    const listening = listeningAddresses(port);
    if (listening) expect(listening).toEqual(["127.0.0.1"]);
    const outside = networkAddress();
    if (outside) expect(await connects(outside, port), `reachable on ${outside}`).toBe(false);
    expect(await connects("127.0.0.1", port)).toBe(true);
    expect(listening !== null || outside !== null, "no way to check the listening address here").toBe(true);
  });

  it("answers /dev/mail only to loopback, even when HOST opens it to the network", async () => {
    const server = await startBuiltServer({ env: { HOST: "0.0.0.0", SEED_IF_EMPTY: "0" } });
    servers.push(server);
    const port = Number(new URL(server.baseURL).port);
    expect(server.log()).toMatch(/other machines can reach it/);
    const here = await fetch(`http://127.0.0.1:${port}/dev/mail`);
    expect(here.status).toBe(200);
    expect(await here.text()).toContain("Captured mail");
    // A proxy on this machine passing on another machine's request is not this machine.
    const forwarded = await fetch(`http://127.0.0.1:${port}/dev/mail`, {
      headers: { "X-Forwarded-For": "203.0.113.9" },
    });
    expect(forwarded.status).toBe(404);
    // DNS rebinding: another site's name pointed at 127.0.0.1; the browser still sends that name.
    const rebound = await getWithHost(port, "/dev/mail", `rebind.example:${port}`);
    expect(rebound.status).toBe(404);
    expect(rebound.body).not.toContain("Captured mail");
    expect((await getWithHost(port, "/dev/mail", `localhost:${port}`)).status).toBe(200);
    const outside = networkAddress();
    if (outside) {
      const remote = await fetch(`http://${outside}:${port}/dev/mail`);
      expect(remote.status).toBe(404);
      expect(await remote.text()).not.toContain("Captured mail");
      expect((await fetch(`http://${outside}:${port}/dev/chart-preview`)).status).toBe(404);
    }
  });
});
