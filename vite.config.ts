import { reactRouter } from "@react-router/dev/vite";
import tailwindcss from "@tailwindcss/vite";
import { defineConfig } from "vite";
import pkg from "./package.json" with { type: "json" };

export default defineConfig({
  plugins: [tailwindcss(), reactRouter()],
  define: { __APP_VERSION__: JSON.stringify(pkg.version) },
  // The custom server (server/app.ts) is the SSR entry: it wraps the React Router handler.
  // With the Vite Environment API (v8_viteEnvironmentApi) the entry is set per environment.
  environments: { ssr: { build: { rollupOptions: { input: "./server/app.ts" } } } },
  resolve: { tsconfigPaths: true },
  // better-sqlite3 is a native addon: keep it (and its drizzle driver) out of the SSR bundle.
  ssr: { external: ["better-sqlite3"] },
});
