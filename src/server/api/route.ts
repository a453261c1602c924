import "server-only";
import { NextResponse, type NextRequest } from "next/server";
import { z } from "zod";
import { actorFromRequest } from "@/server/auth/session";
import { AppError, errorBody, toAppError } from "./errors";
import { parseOrThrow, runAuthorized, type OperationConfig, type OperationContext } from "./authorized";

// Wraps every JSON route handler under src/app/api/v1: the same authorisation as server actions,
// zod for params, query and body, and typed errors as { error: { code, message, fields? } }.

type Inferred<T> = T extends z.ZodType ? z.infer<T> : undefined;
export type RouteInput<P, Q, B> = { params: Inferred<P>; query: Inferred<Q>; body: Inferred<B> };

type RouteConfig<P, Q, B> = { params?: P; query?: Q; body?: B } & Omit<OperationConfig<RouteInput<P, Q, B>>, "mutation"> & { status?: number };

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

export function apiRoute<P extends z.ZodType | undefined = undefined, Q extends z.ZodType | undefined = undefined, B extends z.ZodType | undefined = undefined, R = unknown>(
  config: RouteConfig<P, Q, B>,
  handler: (ctx: OperationContext<RouteInput<P, Q, B>> & { req: NextRequest }) => Promise<R | Response>,
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
      } as RouteInput<P, Q, B>;
      const mutation = req.method !== "GET" && req.method !== "HEAD";
      const result = await runAuthorized(actor, input, { ...config, mutation }, (ctx) => handler({ ...ctx, req }));
      if (result instanceof Response) return result;
      return jsonResponse(result ?? { ok: true }, { status: config.status ?? 200 });
    } catch (err) {
      return errorResponse(err);
    }
  };
}
