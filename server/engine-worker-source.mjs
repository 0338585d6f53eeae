// The engine worker run from its TypeScript source through tsx's loader (tests; the build has
// its own compiled build/server/engine-worker.js). Piscina calls the default export.
import { register } from "tsx/esm/api";

register();
const worker = await import("./engine-worker.ts");
export default worker.default;
