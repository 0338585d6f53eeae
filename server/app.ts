/**
 * The SSR entry of the build (see vite.config.ts): an Express app that hands every request
 * to React Router, plus `boot()`, which prepares the database and mail before listening.
 * server/start.mjs imports this module from build/server/index.js (or through Vite in dev).
 */
import { randomBytes } from "node:crypto";
import { createRequestHandler } from "@react-router/express";
import express from "express";
import helmet from "helmet";
import { RouterContextProvider } from "react-router";
import * as build from "virtual:react-router/server-build";
import { clientIpContext, cspNonceContext, peerAddressContext } from "~/context";
import { getEnv } from "~/env.server";
import { INSTANCE } from "~/instance.server";
import { contentSecurityPolicy, crossSiteRefusal } from "~/security.server";

export { boot, prepareDatabase } from "./boot";
export { closeDb } from "~/db/client.server";

export const app = express();

// Security headers on every answer. The CSP is set per response below (it carries a nonce);
// Vite's dev server injects inline scripts, so dev runs without one.
app.use(
  helmet({
    contentSecurityPolicy: false,
    strictTransportSecurity: getEnv().mode === "production",
    referrerPolicy: { policy: "strict-origin-when-cross-origin" },
    crossOriginEmbedderPolicy: false,
  }),
);
// Which app process answered (several share the port, server/start.mjs): for logs and tests.
app.use((_req, res, next) => {
  res.setHeader("X-Fernwater-Instance", INSTANCE);
  next();
});

app.use((_req, res, next) => {
  if (!import.meta.env.DEV) {
    res.locals.cspNonce = randomBytes(16).toString("base64");
    res.setHeader("Content-Security-Policy", contentSecurityPolicy(res.locals.cspNonce));
  }
  next();
});

// Bodies: 2 MB at most (a readings CSV is at most 1 MB); a body of unknown length is refused
// rather than read without a bound. Browsers always send the length of a form or fetch body.
const MAX_BODY_BYTES = 2 * 1024 * 1024;
app.use((req, res, next) => {
  if (req.method === "GET" || req.method === "HEAD" || req.method === "OPTIONS") return next();
  const length = req.get("content-length");
  const answer = (status: number, error: string) => {
    // Node discards the unread body after the answer, so the client reads it instead of a
    // broken pipe; a body far beyond any use closes the connection instead.
    res.status(status);
    if (!length || Number(length) > 64 * MAX_BODY_BYTES) res.set("Connection", "close");
    if (req.accepts(["html", "json"]) === "json" || req.path.startsWith("/api/")) res.json({ status, error });
    else res.type("text/plain").send(error);
  };
  if (length === undefined) {
    if (req.get("transfer-encoding")) return answer(411, "Send the length of the body (Content-Length).");
    return next();
  }
  if (!/^\d{1,12}$/.test(length) || Number(length) > MAX_BODY_BYTES) {
    return answer(413, `The body is larger than ${MAX_BODY_BYTES / (1024 * 1024)} MB.`);
  }
  next();
});

// Cross-site request check: another site's page must not change anything here.
app.use((req, res, next) => {
  const own = `${req.protocol}://${req.get("host")}`.toLowerCase();
  const appUrl = getEnv().APP_URL ? new URL(getEnv().APP_URL!).origin.toLowerCase() : null;
  const refusal = crossSiteRefusal(
    req.method,
    { origin: req.get("origin"), secFetchSite: req.get("sec-fetch-site") },
    appUrl ? [own, appUrl] : [own],
  );
  if (!refusal) return next();
  res.status(403);
  if (req.path.startsWith("/api/") || req.accepts(["html", "json"]) === "json") {
    res.json({ status: 403, error: refusal });
  } else {
    res.type("text/plain").send(refusal);
  }
});

app.use(
  createRequestHandler({
    // The build object itself, not a function returning it: with a function React Router
    // re-derives its route tables on every request (in dev, Vite reloads this module instead).
    build,
    getLoadContext(req, res) {
      const context = new RouterContextProvider();
      context.set(clientIpContext, req.ip ?? req.socket.remoteAddress ?? "unknown");
      context.set(peerAddressContext, req.socket.remoteAddress ?? "unknown");
      context.set(cspNonceContext, (res.locals.cspNonce as string | undefined) ?? "");
      return context;
    },
  }),
);
