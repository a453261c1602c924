import "server-only";
import { and, eq, isNull } from "drizzle-orm";
import { db } from "@/server/db/client";
import { memberships, users } from "@/server/db/schema";
import type { Actor } from "@/lib/auth/authorize";

/** The actor with current memberships, read fresh on every request so a revoked role stops at once. */
export async function loadActor(userId: string): Promise<Actor | null> {
  const user = await db.query.users.findFirst({ where: and(eq(users.id, userId), isNull(users.disabledAt)) });
  if (!user) return null;
  const rows = await db
    .select({ studyId: memberships.studyId, siteId: memberships.siteId, role: memberships.role })
    .from(memberships)
    .where(and(eq(memberships.userId, userId), isNull(memberships.revokedAt)));
  return { userId: user.id, email: user.email, name: user.name, memberships: rows };
}
