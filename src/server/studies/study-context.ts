import "server-only";
import { notFound } from "next/navigation";
import { cache } from "react";
import { db } from "@/server/db/client";
import { requireActor } from "@/server/auth/session";
import { rolesIn } from "@/lib/auth/authorize";
import { idSchema } from "@/lib/api/schemas";
import { getStudyById } from "./queries";

/** For pages under /studies/[studyId]: the actor, the study and their roles, or a 404. */
export const getStudyContext = cache(async (studyId: string) => {
  const actor = await requireActor();
  if (!idSchema.safeParse(studyId).success) notFound();
  if (!actor.memberships.some((m) => m.studyId === studyId)) notFound();
  const study = await getStudyById(db, { studyId }).catch(() => null);
  if (!study) notFound();
  return { actor, study, roles: rolesIn(actor, studyId) };
});
