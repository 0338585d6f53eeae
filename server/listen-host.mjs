// Which address the server listens on. Local mode (npm start) is for this machine: it has a
// development secret, the demo accounts and /dev/mail, so it listens on loopback unless HOST is
// set explicitly. Production keeps listening on every address (behind a proxy or a firewall).
// Plain JavaScript so server/start.mjs can use it before the build is loaded.

/** The mode as app/env.server.ts decides it: FERNWATER_MODE, else production under NODE_ENV=production. */
export function modeOf(env) {
  const mode = env.FERNWATER_MODE || (env.NODE_ENV === "production" ? "production" : "local");
  return mode === "production" ? "production" : "local";
}

/**
 * @param {Record<string, string | undefined>} env process.env (an empty HOST counts as unset)
 * @returns {{ host: string, note: string | null }} the address, and a line to print at start
 */
export function chooseListenHost(env) {
  const explicit = env.HOST && env.HOST.trim() !== "" ? env.HOST.trim() : null;
  if (modeOf(env) === "production") return { host: explicit ?? "0.0.0.0", note: null };
  if (explicit === null) {
    return {
      host: "127.0.0.1",
      note: "[fernwater] local mode: listening on 127.0.0.1 only, so only this machine can reach it (set HOST to open it to a network).",
    };
  }
  const loopback = /^(127\.\d+\.\d+\.\d+|::1|localhost)$/i.test(explicit);
  return {
    host: explicit,
    note: loopback
      ? `[fernwater] local mode: listening on ${explicit} (HOST), this machine only.`
      : `[fernwater] local mode on HOST=${explicit}: other machines can reach it. It runs with a development secret and demo accounts; /dev/mail still answers only this machine.`,
  };
}
