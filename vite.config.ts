import { reactRouter } from "@react-router/dev/vite";
import tailwindcss from "@tailwindcss/vite";
import { defineConfig } from "vite";

export default defineConfig({
  plugins: [tailwindcss(), reactRouter()],
  resolve: { tsconfigPaths: true },
  // better-sqlite3 is a native addon: keep it (and its drizzle driver) out of the SSR bundle.
  ssr: { external: ["better-sqlite3"] },
});
