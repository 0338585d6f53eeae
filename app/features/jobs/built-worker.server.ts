/**
 * A worker thread's built file (`engine-worker.js`, `chores-worker.js`: SSR entries of their own,
 * vite.config.ts) beside the server bundle. Server code sits in build/server/ or its assets/, so
 * both are looked in. Null from the TypeScript sources (vitest, `npm run dev`): no build there.
 */
import fs from "node:fs";

export function builtWorkerUrl(fileName: string): URL | null {
  for (const relative of [`../${fileName}`, `./${fileName}`]) {
    const url = new URL(relative, import.meta.url);
    if (url.protocol === "file:" && fs.existsSync(url)) return url;
  }
  return null;
}
