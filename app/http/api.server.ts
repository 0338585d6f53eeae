/**
 * The route edge for the JSON API (resource routes under /api): one error shape everywhere.
 * Every API loader and action runs inside apiRoute, which turns what feature code throws — a
 * typed refusal, a page guard's 404 — into `{ status, error, issues? }`.
 */
import type { z } from "zod";
import { refusalOf } from "~/http/refusals.server";

export type ApiIssue = { path: string; message: string };

/** `{ status, error, issues? }` with the HTTP status; issues carry field paths. */
export function apiError(status: number, error: string, issues?: ApiIssue[]): Response {
  return Response.json(
    { status, error, ...(issues ? { issues } : {}) },
    { status, headers: { "Cache-Control": "no-store" } },
  );
}

export function zodIssues(error: z.ZodError): ApiIssue[] {
  return error.issues.map((i) => ({ path: i.path.map(String).join("."), message: i.message }));
}

/** Reads a JSON body of at most `maxBytes`; a bad or oversized body is a 400/413, not a 500. */
export async function readJson(request: Request, maxBytes = 256 * 1024): Promise<unknown> {
  const type = request.headers.get("Content-Type") ?? "";
  if (!type.includes("application/json"))
    throw apiError(415, "Send the body as JSON (Content-Type: application/json).");
  const declared = Number(request.headers.get("Content-Length") ?? "0");
  if (declared > maxBytes) throw apiError(413, `The body is larger than ${Math.round(maxBytes / 1024)} kB.`);
  const text = await readBodyText(request, maxBytes);
  try {
    return JSON.parse(text);
  } catch {
    throw apiError(400, "The body is not valid JSON.");
  }
}

export function json(data: unknown, init: ResponseInit = {}): Response {
  return Response.json(data, { ...init, headers: { "Cache-Control": "no-store", ...(init.headers ?? {}) } });
}

/** The body as UTF-8 text, reading no more than `maxBytes` (the rest is never buffered). */
async function readBodyText(request: Request, maxBytes: number): Promise<string> {
  if (!request.body) return "";
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let size = 0;
  try {
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      size += value.byteLength;
      if (size > maxBytes) {
        await reader.cancel().catch(() => {});
        throw apiError(413, `The body is larger than ${Math.round(maxBytes / 1024)} kB.`);
      }
      chunks.push(value);
    }
  } catch (error) {
    if (error instanceof Response) throw error;
    throw apiError(400, "The body could not be read.");
  }
  const bytes = new Uint8Array(size);
  let offset = 0;
  for (const c of chunks) {
    bytes.set(c, offset);
    offset += c.byteLength;
  }
  try {
    return new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    throw apiError(400, "The body is not valid UTF-8 text.");
  }
}

/** What React Router's `data(…, { status })` throws (page guards: notFound, requireRole). */
type ThrownData = { type: "DataWithResponseInit"; data: unknown; init: { status?: number } | null };

function isThrownData(thrown: unknown): thrown is ThrownData {
  return (
    typeof thrown === "object" && thrown !== null && (thrown as { type?: unknown }).type === "DataWithResponseInit"
  );
}

/**
 * The API's answer to what a handler threw: a typed refusal (app/http/refusals.server.ts) with
 * its status (a model refusal names "settings" as the field), a page guard's 4xx with the
 * guard's message. Null for anything else (a Response passes as it is; an Error is a bug).
 */
export function apiAnswer(thrown: unknown): Response | null {
  const refused = refusalOf(thrown);
  if (refused) {
    const issues = refused.kind === "model" ? [{ path: "settings", message: refused.message }] : undefined;
    return apiError(refused.status, refused.message, issues);
  }
  const status = isThrownData(thrown) ? (thrown.init?.status ?? 500) : 0;
  if (status >= 400 && status < 500) {
    const message = (thrown as ThrownData).data as { message?: unknown } | null;
    return apiError(status, typeof message?.message === "string" ? message.message : "Not found.");
  }
  return null;
}

/** Wraps an API loader or action: what it throws is answered by apiAnswer, the rest rethrown. */
export function apiRoute<A, R>(handler: (args: A) => Promise<R> | R): (args: A) => Promise<R | Response> {
  return async (args) => {
    try {
      return await handler(args);
    } catch (thrown) {
      const answer = apiAnswer(thrown);
      if (answer) return answer;
      throw thrown;
    }
  };
}

/**
 * 405 in the API's JSON shape, with an Allow header. Every API route exports both a loader and
 * an action, so a wrong method gets this instead of React Router's logged error.
 */
export function methodNotAllowed(allowed: readonly string[]): Response {
  const response = apiError(405, `Use ${allowed.join(" or ")} here.`);
  response.headers.set("Allow", allowed.join(", "));
  return response;
}
