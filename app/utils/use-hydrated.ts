import { useSyncExternalStore } from "react";

const never = () => () => {};

/**
 * False on the server and in the render that hydrates the server's HTML, true from then on (and
 * at once on pages reached by client navigation). For parts that only the page's script can
 * draw: the server sends a stand-in, and the browser draws the real thing right after hydration.
 */
export function useHydrated(): boolean {
  return useSyncExternalStore(
    never,
    () => true,
    () => false,
  );
}
