import os from "node:os";

/**
 * The name of this app process, unique on the machine and across machines: host and process id.
 * /api/health reports it, and a job row names the process running it.
 */
export const INSTANCE = `${os.hostname()}:${process.pid}`;
