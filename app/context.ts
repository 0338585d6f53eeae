import { createContext } from "react-router";

/** The client's address as the Node server saw it (express `req.ip`); "unknown" in tests. */
export const clientIpContext = createContext<string>("unknown");

/** This response's Content-Security-Policy nonce (empty when no policy is sent, e.g. in dev). */
export const cspNonceContext = createContext<string>("");

/**
 * The address at the other end of the TCP connection (express `req.socket.remoteAddress`),
 * whatever TRUST_PROXY says; "unknown" in tests unless set. Local-mode tools check it.
 */
export const peerAddressContext = createContext<string>("unknown");
