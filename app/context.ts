import { createContext } from "react-router";

/** The client's address as the Node server saw it (express `req.ip`); "unknown" in tests. */
export const clientIpContext = createContext<string>("unknown");
