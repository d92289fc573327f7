import "server-only";
import type { z } from "zod";
import { env } from "./env";
import {
  AppError,
  DATABASE_RETRY_AFTER_SECONDS,
  LONE_SURROGATE_MESSAGE,
  loneSurrogatePath,
  NUL_MESSAGE,
  nulCharacterPath,
  toAppError,
} from "./errors";
import { canAccess, type Permission } from "@/lib/engine/permissions";
import { viewerFromHeaders, type Viewer } from "./session";

type RouteContext<P> = { params: Promise<P> };

type HandlerArgs<P, B> = { request: Request; viewer: Viewer; params: P; body: B };

type Options<S extends z.ZodType | undefined> = {
  permission: Permission;
  body?: S;
  // Customer-facing routes pass through; staff-only ones answer 404 to everyone else.
  /** Answer a visitor who is not signed in 404 too, so the route's existence is not told (owner-only files). */
  hideFromVisitors?: boolean;
};

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

export function json(data: unknown, init: ResponseInit = {}): Response {
  const headers = new Headers(init.headers);
  headers.set("content-type", "application/json; charset=utf-8");
  headers.set("cache-control", "no-store");
  return new Response(JSON.stringify(data), { ...init, headers });
}

export function errorResponse(error: unknown): Response {
  const e = toAppError(error);
  // Unavailable is temporary: say when to come back.
  const headers = e.status === 503 ? { "retry-after": String(DATABASE_RETRY_AFTER_SECONDS) } : undefined;
  return json(e.toJSON(), { status: e.status, headers });
}

// State-changing requests must come from our own pages (Next checks this only for server actions).
export function assertSameOrigin(request: Request): void {
  if (SAFE_METHODS.has(request.method)) return;
  const origin = request.headers.get("origin");
  const site = request.headers.get("sec-fetch-site");
  const allowed = new Set([new URL(env().APP_URL).origin]);
  const alt = new URL(env().APP_URL);
  if (alt.hostname === "127.0.0.1") alt.hostname = "localhost";
  else if (alt.hostname === "localhost") alt.hostname = "127.0.0.1";
  allowed.add(alt.origin);
  if (origin) {
    if (!allowed.has(origin)) throw new AppError("forbidden", "This request did not come from the Bandedge site.");
    return;
  }
  if (site && site !== "same-origin") throw new AppError("forbidden", "This request did not come from the Bandedge site.");
  if (!site) throw new AppError("forbidden", "This request did not come from the Bandedge site.");
}

export function zodFields(error: z.ZodError): Record<string, string> {
  const fields: Record<string, string> = {};
  for (const issue of error.issues) {
    const key = issue.path.join(".") || "_";
    if (!fields[key]) fields[key] = issue.message;
  }
  return fields;
}

export async function readJson(request: Request, limitBytes = 256 * 1024): Promise<unknown> {
  const text = await request.text();
  if (text.length > limitBytes) throw new AppError("payload_too_large", "The request is too large.");
  if (!text) return {};
  let parsed: unknown;
  try {
    parsed = JSON.parse(text);
  } catch {
    throw new AppError("invalid_input", "The request body is not valid JSON.");
  }
  const nul = nulCharacterPath(parsed);
  if (nul) throw new AppError("invalid_input", "Some fields need attention.", { [nul]: NUL_MESSAGE });
  const broken = loneSurrogatePath(parsed);
  if (broken) throw new AppError("invalid_input", "Some fields need attention.", { [broken]: LONE_SURROGATE_MESSAGE });
  return parsed;
}

// The one wrapper for JSON route handlers: session, permission, origin, body validation, error shape.
export function route<P = Record<string, string>, S extends z.ZodType | undefined = undefined>(
  options: Options<S>,
  handler: (args: HandlerArgs<P, S extends z.ZodType ? z.infer<S> : undefined>) => Promise<unknown>,
) {
  return async (request: Request, context: RouteContext<P>): Promise<Response> => {
    try {
      const viewer = await viewerFromHeaders(request.headers);
      if (!viewer)
        throw options.hideFromVisitors ? new AppError("not_found", "Not found.") : new AppError("unauthenticated", "Please sign in.");
      if (!canAccess(viewer, options.permission)) throw new AppError("not_found", "Not found.");
      assertSameOrigin(request);
      let body: unknown = undefined;
      if (options.body) {
        const parsed = options.body.safeParse(await readJson(request));
        if (!parsed.success) throw new AppError("invalid_input", "Some fields need attention.", zodFields(parsed.error));
        body = parsed.data;
      }
      const params = (await context.params) as P;
      const result = await handler({ request, viewer, params, body: body as S extends z.ZodType ? z.infer<S> : undefined });
      if (result instanceof Response) return result;
      return json(result ?? { ok: true });
    } catch (error) {
      return errorResponse(error);
    }
  };
}
