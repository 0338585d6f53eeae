/**
 * Local-mode tools (/dev/mail, /dev/chart-preview) answer only in local mode and only to this
 * machine: the captured mail holds password-reset links, so anyone else reading it could take
 * over an account. Everyone else gets the 404 a production server gives.
 */
import { data, type RouterContextProvider } from "react-router";
import { clientIpContext, peerAddressContext } from "~/context";
import { getEnv } from "~/env.server";
import { isFromThisMachine } from "~/security.server";

export function requireLocalTool(request: Request, context: Readonly<RouterContextProvider>): void {
  const local = isFromThisMachine(request.headers, {
    peer: context.get(peerAddressContext),
    client: context.get(clientIpContext),
  });
  if (getEnv().mode !== "local" || !local) throw data({ message: "Not found" }, { status: 404 });
}
