/**
 * Starts the built server once for the end-to-end run (see tests/support/built-server.ts).
 * Needs `react-router build` first (npm run test:e2e does it).
 */
import fs from "node:fs";
import type { TestProject } from "vitest/node";
import { startBuiltServer } from "../../support/built-server";

export default async function setup(project: TestProject) {
  const chromium = process.env.CHROMIUM_PATH ?? "/usr/bin/chromium";
  if (!fs.existsSync(chromium)) throw new Error(`Chromium not found at ${chromium}: apt-get install -y chromium`);
  // Reminders are checked every second here, so a reminder due now reaches the mailbox at once.
  const server = await startBuiltServer({ env: { REMINDER_CHECK_SECONDS: "1" } });
  fs.mkdirSync("test-results/screenshots", { recursive: true });
  project.provide("baseURL", server.baseURL);
  project.provide("mailDir", server.mailDir);
  project.provide("databaseFile", server.databaseFile);
  return async () => {
    await server.stop();
    if (process.env.E2E_SERVER_LOG) fs.writeFileSync(process.env.E2E_SERVER_LOG, server.log());
    // OWASP Logging Cheat Sheet: no password reaches the server's log, whatever the tests did.
    if (server.log().includes("tidewell-demo-2026")) throw new Error("The server log contains the demo password.");
  };
}

declare module "vitest" {
  export interface ProvidedContext {
    baseURL: string;
    mailDir: string;
    databaseFile: string;
  }
}
