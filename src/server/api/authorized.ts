import "server-only";
import type { z } from "zod";
import { db, type Tx } from "@/server/db/client";
import { recordAudit, type AuditEntry } from "@/server/audit/record-audit";
import { accessibleSiteIds, can, canSomewhere, type Actor, type Scope } from "@/lib/auth/authorize";
import type { Permission } from "@/lib/auth/roles";
import { AppError, forbidden, notFound, validationError } from "./errors";

// The one authorisation path for route handlers and server actions:
// authenticate → validate (zod) → authorise by permission and site scope → run → audit.

export type ScopeRule<I> =
  /** A fixed scope derived from the validated input (e.g. params.studyId / params.siteId). */
  | ((input: I, tx: Tx) => Scope | Promise<Scope>);

export type OperationConfig<I> = {
  /** "signed_in": any signed-in person (their own profile, their studies); no scope check. */
  permission: Permission | "signed_in";
  /** Where the thing lives: resolved after validation, before the handler runs. */
  scope: ScopeRule<I>;
  /**
   * For study-level lists that site roles may also read: allowed when the actor holds the
   * permission at any site of the study; the handler must filter by ctx.siteIds.
   */
  siteFiltered?: boolean;
  /** Mutations run in one transaction and must write at least one audit event. */
  mutation: boolean;
};

export type OperationContext<I> = {
  actor: Actor;
  input: I;
  scope: Scope;
  /** Sites the actor may see with this permission in the scope's study. */
  siteIds: "all" | string[];
  tx: Tx;
  audit: (entry: AuditEntry) => Promise<void>;
  /** Say that this mutation changed nothing (an idempotent repeat), so no audit event is due. */
  unchanged: () => void;
};

export function parseOrThrow<S extends z.ZodType>(schema: S, raw: unknown, where: string): z.infer<S> {
  const parsed = schema.safeParse(raw);
  if (!parsed.success) throw validationError(parsed.error, where);
  return parsed.data;
}

export async function runAuthorized<I, R>(
  actor: Actor | null,
  input: I,
  config: OperationConfig<I>,
  handler: (ctx: OperationContext<I>) => Promise<R>,
): Promise<R> {
  if (!actor) throw new AppError("unauthenticated", "Sign in to continue.");

  const run = async (tx: Tx) => {
    const scope = await config.scope(input, tx);
    const permission = config.permission;
    if (permission === "signed_in") {
      return handler({ actor, input, scope, siteIds: [], tx, audit: async (entry) => recordAudit(tx, actor, entry), unchanged: () => undefined });
    }
    if (!canSomewhere(actor, permission, scope.studyId)) throw forbidden();
    const allowed = scope.siteId ? can(actor, permission, scope) : config.siteFiltered || can(actor, permission, scope);
    // Outside the actor's sites we answer "not found": another site's data is not even confirmed to exist.
    if (!allowed) throw scope.siteId ? notFound() : forbidden();

    let audited = 0;
    let unchanged = false;
    const ctx: OperationContext<I> = {
      actor,
      input,
      scope,
      siteIds: accessibleSiteIds(actor, permission, scope.studyId),
      tx,
      audit: async (entry) => {
        audited++;
        await recordAudit(tx, actor, { studyId: scope.studyId, siteId: scope.siteId ?? null, ...entry });
      },
      unchanged: () => {
        unchanged = true;
      },
    };
    const result = await handler(ctx);
    if (config.mutation && audited === 0 && !unchanged) {
      throw new AppError("internal", `Mutation with permission ${permission} wrote no audit event.`);
    }
    return result;
  };

  return config.mutation ? db.transaction(run) : run(db);
}
