// The engine worker run from its TypeScript source through tsx's loader (tests; the build has
// its own compiled build/server/engine-worker.js). See app/features/jobs/jobs.server.ts.
import { register } from "tsx/esm/api";

register();
await import("./engine-worker.ts");
