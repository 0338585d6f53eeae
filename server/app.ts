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
import { clientIpContext, cspNonceContext } from "~/context";
import { getEnv } from "~/env.server";
import { contentSecurityPolicy, crossSiteRefusal } from "~/security.server";

export { boot } from "./boot";
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
app.use((_req, res, next) => {
  if (!import.meta.env.DEV) {
    res.locals.cspNonce = randomBytes(16).toString("base64");
    res.setHeader("Content-Security-Policy", contentSecurityPolicy(res.locals.cspNonce));
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
      context.set(cspNonceContext, (res.locals.cspNonce as string | undefined) ?? "");
      return context;
    },
  }),
);
