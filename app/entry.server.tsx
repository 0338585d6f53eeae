/**
 * Server rendering (React Router's default Node entry) plus the Content-Security-Policy nonce:
 * the server picks a nonce per response (server/app.ts) and React Router's inline scripts
 * carry it, so the policy can forbid every other inline script.
 */
import { Writable } from "node:stream";
import { renderToPipeableStream } from "react-dom/server";
import { ServerRouter, type EntryContext, type RouterContextProvider } from "react-router";
import { cspNonceContext } from "~/context";
import { cachedPage, keepPage, NONCE_STAND_IN, renderKey, urlSeenBefore } from "~/http/render-cache.server";
import { NonceContext } from "~/utils/nonce";

export const streamTimeout = 5_000;

export default function handleRequest(
  request: Request,
  responseStatusCode: number,
  responseHeaders: Headers,
  routerContext: EntryContext,
  loadContext: RouterContextProvider,
) {
  if (request.method.toUpperCase() === "HEAD") {
    return new Response(null, { status: responseStatusCode, headers: responseHeaders });
  }
  const nonce = loadContext.get(cspNonceContext) || undefined;
  const key = nonce ? cacheKeyFor(request, responseStatusCode, routerContext) : null;
  if (key) {
    const kept = cachedPage(key, nonce!);
    if (kept !== undefined) {
      void routerContext.serverHandoffStream?.cancel(); // the kept page already holds the data
      // Server-Timing (W3C) says a kept rendering answered: for the browser's network panel and the tests.
      responseHeaders.append("Server-Timing", 'render;desc="kept"');
      return htmlResponse(kept, responseStatusCode, responseHeaders);
    }
  }

  return new Promise<Response>((resolve, reject) => {
    let shellRendered = false;
    let failed = false;
    let timeoutId: ReturnType<typeof setTimeout> | undefined = setTimeout(() => abort(), streamTimeout + 1000);
    // The whole document is rendered before it is sent, as one body: our loaders defer
    // nothing, so streaming would send no byte earlier, and every streamed chunk costs the
    // request thread a trip through web streams and gzip.
    const chunks: Buffer[] = [];
    const sink = new Writable({
      write(chunk: Buffer, _encoding, callback) {
        chunks.push(chunk);
        callback();
      },
      final(callback) {
        clearTimeout(timeoutId);
        timeoutId = undefined;
        const html = Buffer.concat(chunks);
        const body = keep && !failed ? keepPage(key!, html, nonce!) : html;
        resolve(htmlResponse(body, responseStatusCode, responseHeaders));
        callback();
      },
    });
    // A page to be kept renders with a stand-in nonce, swapped for each response's own.
    const keep = key !== null;
    const renderNonce = keep ? NONCE_STAND_IN : nonce;

    const { pipe, abort } = renderToPipeableStream(
      <NonceContext.Provider value={renderNonce}>
        <ServerRouter context={routerContext} url={request.url} nonce={renderNonce} />
      </NonceContext.Provider>,
      {
        nonce: renderNonce,
        onShellReady() {
          shellRendered = true;
        },
        onAllReady() {
          pipe(sink);
        },
        onShellError(error: unknown) {
          reject(error);
        },
        onError(error: unknown) {
          failed = true;
          responseStatusCode = 500;
          if (shellRendered) console.error(error);
        },
      },
    );
  });
}

/**
 * The render cache's key when the page's route allows keeping it and its URL came before
 * (see render-cache.server.ts), else null.
 */
function cacheKeyFor(request: Request, status: number, routerContext: EntryContext): string | null {
  const { matches, loaderData, actionData, errors } = routerContext.staticHandlerContext;
  const page = matches.at(-1);
  const handle = page
    ? (routerContext.routeModules[page.route.id]?.handle as { renderCache?: boolean } | undefined)
    : undefined;
  if (handle?.renderCache !== true || actionData || errors || !urlSeenBefore(request.url)) return null;
  return renderKey(request.url, status, loaderData);
}

function htmlResponse(html: Buffer, status: number, headers: Headers): Response {
  headers.set("Content-Type", "text/html; charset=utf-8");
  // Buffer.concat allocates a plain (not shared) ArrayBuffer, which is what BodyInit asks for.
  return new Response(html as Uint8Array<ArrayBuffer>, { headers, status });
}
