import "server-only";
import { getServerSession } from "next-auth";
import type { z } from "zod";
import { authOptions } from "@/server/auth/options";
import { loadActor } from "@/server/auth/load-actor";
import { errorBody, toAppError, type ErrorBody } from "./errors";
import { parseOrThrow, runAuthorized, type OperationConfig, type OperationContext } from "./authorized";

// Server actions go through the same path as route handlers. They return a typed result that
// forms show (useActionState), never throw to the client.

export type ActionResult<R> = { ok: true; data: R } | ({ ok: false } & ErrorBody);

export function defineAction<S extends z.ZodType, R>(
  config: { input: S } & Omit<OperationConfig<z.infer<S>>, "mutation">,
  handler: (ctx: OperationContext<z.infer<S>>) => Promise<R>,
) {
  return async (raw: unknown): Promise<ActionResult<R>> => {
    try {
      const session = await getServerSession(authOptions);
      const actor = session?.user?.id ? await loadActor(session.user.id) : null;
      const input = parseOrThrow(config.input, raw, "form");
      const data = await runAuthorized(actor, input, { ...config, mutation: true }, handler);
      return { ok: true, data };
    } catch (err) {
      const appError = toAppError(err);
      if (appError.code === "internal") console.error("[action] internal error", err);
      return { ok: false, ...errorBody(appError) };
    }
  };
}
