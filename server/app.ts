/**
 * The SSR entry of the build (see vite.config.ts): an Express app that hands every request
 * to React Router, plus `boot()`, which prepares the database and mail before listening.
 * server/start.mjs imports this module from build/server/index.js (or through Vite in dev).
 */
import { createRequestHandler } from "@react-router/express";
import express from "express";
import { RouterContextProvider } from "react-router";
import * as build from "virtual:react-router/server-build";
import { clientIpContext } from "~/context";

export { boot } from "./boot";
export { closeDb } from "~/db/client.server";

export const app = express();

app.use(
  createRequestHandler({
    // The build object itself, not a function returning it: with a function React Router
    // re-derives its route tables on every request (in dev, Vite reloads this module instead).
    build,
    getLoadContext(req) {
      const context = new RouterContextProvider();
      context.set(clientIpContext, req.ip ?? req.socket.remoteAddress ?? "unknown");
      return context;
    },
  }),
);
