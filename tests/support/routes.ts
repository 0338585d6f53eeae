/**
 * Calls route modules' loaders and actions the way React Router does, with real Request
 * objects and cookies, and normalises what they return or throw into { status, headers, data }.
 */
import { RouterContextProvider } from "react-router";
import { clientIpContext, peerAddressContext } from "~/context";

export const ORIGIN = "http://fernwater.test";

type Handler = (args: any) => unknown;

export type RouteResult = { status: number; headers: Headers; data: any; location: string | null };

async function normalise(value: unknown): Promise<RouteResult> {
  if (value instanceof Response) {
    const type = value.headers.get("Content-Type") ?? "";
    const body = type.includes("json") ? await value.json() : await value.text();
    return { status: value.status, headers: value.headers, data: body, location: value.headers.get("Location") };
  }
  if (value && typeof value === "object" && (value as any).type === "DataWithResponseInit") {
    const init = (value as any).init ?? {};
    const headers = new Headers(init.headers);
    return { status: init.status ?? 200, headers, data: (value as any).data, location: headers.get("Location") };
  }
  return { status: 200, headers: new Headers(), data: value, location: null };
}

export async function call(
  handler: Handler,
  request: Request,
  params: Record<string, string> = {},
  ip = "203.0.113.7",
): Promise<RouteResult> {
  const context = new RouterContextProvider();
  // As a server without TRUST_PROXY sees it: the client is the connection's peer.
  context.set(clientIpContext, ip);
  context.set(peerAddressContext, ip);
  try {
    return await normalise(await handler({ request, params, context }));
  } catch (thrown) {
    if (
      thrown instanceof Response ||
      (thrown && typeof thrown === "object" && (thrown as any).type === "DataWithResponseInit")
    ) {
      return normalise(thrown);
    }
    throw thrown;
  }
}

export function get(path: string, cookie?: string, headers: Record<string, string> = {}): Request {
  return new Request(ORIGIN + path, { headers: { ...(cookie ? { Cookie: cookie } : {}), ...headers } });
}

export function post(
  path: string,
  fields: Record<string, string | number>,
  cookie?: string,
  headers: Record<string, string> = {},
): Request {
  const body = new URLSearchParams(Object.entries(fields).map(([k, v]) => [k, String(v)]));
  return new Request(ORIGIN + path, {
    method: "POST",
    body,
    headers: {
      "Content-Type": "application/x-www-form-urlencoded",
      Origin: ORIGIN,
      ...(cookie ? { Cookie: cookie } : {}),
      ...headers,
    },
  });
}

export function postJson(path: string, json: unknown, cookie?: string, method = "POST"): Request {
  return new Request(ORIGIN + path, {
    method,
    body: JSON.stringify(json),
    headers: { "Content-Type": "application/json", Origin: ORIGIN, ...(cookie ? { Cookie: cookie } : {}) },
  });
}

/** The "name=value" part of a Set-Cookie header, ready for a Cookie header. */
export function cookieFrom(result: RouteResult): string {
  const set = result.headers.get("Set-Cookie");
  if (!set) throw new Error(`No Set-Cookie (status ${result.status})`);
  return set.split(";")[0];
}
