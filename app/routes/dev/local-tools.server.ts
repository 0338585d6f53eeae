/**
 * Local-mode tools (/dev/mail, /dev/chart-preview) answer only in local mode and only to this
 * machine, asked for by a loopback name (localhost, 127.0.0.1, [::1]): the captured mail holds
 * password-reset links, so anyone else reading it could take over an account. Everyone else
 * gets the 404 a production server gives.
 */
import { data, type RouterContextProvider } from "react-router";
import { clientIpContext, peerAddressContext } from "~/context";
import { getEnv } from "~/env.server";
import { isAddressedToThisMachine, isFromThisMachine } from "~/security.server";

export function requireLocalTool(request: Request, context: Readonly<RouterContextProvider>): void {
  const local = isFromThisMachine(request.headers, {
    peer: context.get(peerAddressContext),
    client: context.get(clientIpContext),
  });
  // Asked for by a loopback name too, so another site rebinding its name to 127.0.0.1 is refused.
  if (getEnv().mode !== "local" || !local || !isAddressedToThisMachine(request)) {
    throw data({ message: "Not found" }, { status: 404 });
  }
}
