import "server-only";
import { NextResponse, type NextRequest } from "next/server";
import { z } from "zod";
import { actorFromRequest } from "@/server/auth/session";
import { AppError, errorBody, toAppError } from "./errors";
import { parseOrThrow, runAuthorized, type OperationConfig, type OperationContext } from "./authorized";

// Wraps every JSON route handler under src/app/api/v1: the same authorisation as server actions,
// zod for params, query and body, and typed errors as { error: { code, message, fields? } }.

type Schemas = { params?: z.ZodType; query?: z.ZodType; body?: z.ZodType };
type Out<S, K extends keyof Schemas> = S extends { [P in K]: infer T } ? (T extends z.ZodType ? z.infer<T> : undefined) : undefined;
export type RouteInput<S extends Schemas> = { params: Out<S, "params">; query: Out<S, "query">; body: Out<S, "body"> };

type RouteConfig<S extends Schemas> = S & Omit<OperationConfig<RouteInput<S>>, "mutation"> & { status?: number };

type RouteContext = { params: Promise<Record<string, string | string[]>> };

export function jsonResponse(data: unknown, init?: ResponseInit): Response {
  const body = JSON.stringify(data, (_k, v) => (typeof v === "bigint" ? v.toString() : v));
  return new NextResponse(body, { ...init, headers: { "content-type": "application/json", ...(init?.headers ?? {}) } });
}

export function errorResponse(err: unknown): Response {
  const appError = toAppError(err);
  if (appError.code === "internal") console.error("[api] internal error", err);
  return jsonResponse(errorBody(appError), { status: appError.status });
}

async function readBody(req: NextRequest): Promise<unknown> {
  const text = await req.text();
  if (!text) return undefined;
  const type = req.headers.get("content-type") ?? "";
  if (!type.includes("application/json")) {
    throw new AppError("unsupported_media_type", "Send the request body as application/json.");
  }
  try {
    return JSON.parse(text);
  } catch {
    throw new AppError("bad_request", "The request body is not valid JSON.");
  }
}

export function apiRoute<S extends Schemas, R>(
  config: RouteConfig<S>,
  handler: (ctx: OperationContext<RouteInput<S>> & { req: NextRequest }) => Promise<R | Response>,
) {
  return async (req: NextRequest, routeContext: RouteContext): Promise<Response> => {
    try {
      const actor = await actorFromRequest(req);
      if (!actor) throw new AppError("unauthenticated", "Sign in to continue.");
      const rawParams = routeContext?.params ? await routeContext.params : {};
      const input = {
        params: config.params ? parseOrThrow(config.params, rawParams, "address") : undefined,
        query: config.query ? parseOrThrow(config.query, Object.fromEntries(req.nextUrl.searchParams), "query") : undefined,
        body: config.body ? parseOrThrow(config.body, await readBody(req), "request body") : undefined,
      } as RouteInput<S>;
      const mutation = req.method !== "GET" && req.method !== "HEAD";
      const result = await runAuthorized(actor, input, { ...config, mutation }, (ctx) => handler({ ...ctx, req }));
      if (result instanceof Response) return result;
      return jsonResponse(result ?? { ok: true }, { status: config.status ?? 200 });
    } catch (err) {
      return errorResponse(err);
    }
  };
}
