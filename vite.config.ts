import { reactRouter } from "@react-router/dev/vite";
import tailwindcss from "@tailwindcss/vite";
import { defineConfig, type Plugin } from "vite";
import pkg from "./package.json" with { type: "json" };

/**
 * React Router names every SSR entry after its server build file (index.js); this keeps that for
 * the server and names the worker entries engine-worker.js and chores-worker.js, so the pool can find it beside index.js.
 */
function engineWorkerFileName(): Plugin {
  return {
    name: "fernwater:engine-worker-file-name",
    enforce: "post",
    configEnvironment(name, options) {
      const output = options.build?.rollupOptions?.output;
      if (name !== "ssr" || !output || Array.isArray(output)) return;
      const main = output.entryFileNames;
      output.entryFileNames = (chunk) =>
        chunk.name === "engine-worker" || chunk.name === "chores-worker"
          ? `${chunk.name}.js`
          : typeof main === "function"
            ? main(chunk)
            : (main ?? "[name].js");
    },
  };
}

export default defineConfig({
  plugins: [tailwindcss(), reactRouter(), engineWorkerFileName()],
  define: { __APP_VERSION__: JSON.stringify(pkg.version) },
  // The custom server (server/app.ts) is the SSR entry: it wraps the React Router handler.
  // With the Vite Environment API (v8_viteEnvironmentApi) the entry is set per environment.
  // The engine worker (server/engine-worker.ts) is a second entry, built next to it as
  // engine-worker.js so the worker pool (app/features/jobs/jobs.server.ts) finds it beside the bundle;
  // likewise the chores worker (server/chores-worker.ts: CSV uploads, share pictures).
  environments: {
    ssr: {
      build: {
        rollupOptions: {
          input: {
            index: "./server/app.ts",
            "engine-worker": "./server/engine-worker.ts",
            "chores-worker": "./server/chores-worker.ts",
          },
        },
      },
    },
  },
  resolve: { tsconfigPaths: true },
  // Native addons stay out of the SSR bundle: better-sqlite3 (and its drizzle driver) and resvg.
  ssr: { external: ["better-sqlite3", "@resvg/resvg-js"] },
});
