import { createContext, useContext } from "react";

/** The CSP nonce for inline scripts, provided by entry.server.tsx; empty in the browser. */
export const NonceContext = createContext<string | undefined>(undefined);

export function useNonce(): string | undefined {
  return useContext(NonceContext);
}
