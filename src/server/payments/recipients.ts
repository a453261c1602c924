import "server-only";
import { and, eq, isNull } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { memberships, users } from "@/server/db/schema";

/** E-mail addresses of a site's finance people. */
export async function siteFinanceEmails(tx: Tx, { studyId, siteId }: { studyId: string; siteId: string }): Promise<string[]> {
  const rows = await tx
    .selectDistinct({ email: users.email })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.studyId, studyId), eq(memberships.siteId, siteId), eq(memberships.role, "site_finance"), isNull(memberships.revokedAt)));
  return rows.map((r) => r.email);
}

/** E-mail addresses of the study's sponsor finance people. */
export async function sponsorFinanceEmails(tx: Tx, { studyId }: { studyId: string }): Promise<string[]> {
  const rows = await tx
    .selectDistinct({ email: users.email })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.studyId, studyId), eq(memberships.role, "sponsor_finance"), isNull(memberships.revokedAt)));
  return rows.map((r) => r.email);
}
