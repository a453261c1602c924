import "server-only";
import { and, eq, like } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { sites, subjects, subjectStatusEvents, type Subject } from "@/server/db/schema";
import { conflict, notFound, unprocessable } from "@/server/api/errors";
import { listVersionsInForceAtSite } from "@/server/protocol/in-force";
import { todayAtSite } from "@/server/sites/site-today";
import type { Actor } from "@/lib/auth/authorize";
import { subjectCodeSchemaForSite } from "@/lib/subjects/subject-code";
import { consentVersionFor } from "./consent-version";
import { checkSubjectDates } from "./subject-dates";
import type { CreateSubjectInput } from "./subject-schemas";

/** The next subject number at a site: one above the highest used (3 digits, then 5 past 999). */
async function nextSubjectCode(tx: Tx, site: { studyId: string; code: string }): Promise<string> {
  const rows = await tx
    .select({ code: subjects.code })
    .from(subjects)
    .where(and(eq(subjects.studyId, site.studyId), like(subjects.code, `${site.code}-%`)));
  let max = 0;
  for (const r of rows) max = Math.max(max, Number(r.code.slice(site.code.length + 1)) || 0);
  const n = max + 1;
  return `${site.code}-${String(n).padStart(n < 1000 ? 3 : 5, "0")}`;
}

/** Screens a new subject at a site (status Screening), consented on the version in force that day. */
export async function createSubject(tx: Tx, { siteId, input, actor, now = new Date() }: { siteId: string; input: CreateSubjectInput; actor: Actor; now?: Date }): Promise<Subject> {
  const [site] = await tx.select().from(sites).where(eq(sites.id, siteId));
  if (!site) throw notFound("That site");
  if (site.status !== "open") throw conflict(`Subjects are screened only at an open site; ${site.code} is not open.`);
  const code = input.subjectCode ? input.subjectCode : await nextSubjectCode(tx, site);
  const parsed = subjectCodeSchemaForSite(site.code).safeParse(code);
  if (!parsed.success) throw unprocessable(parsed.error.issues[0]?.message ?? "Invalid subject code", { subjectCode: parsed.error.issues.map((i) => i.message) });
  const today = todayAtSite(site.timeZone, now);
  const dates = {
    status: "screening" as const,
    consentDate: input.consentDate,
    screeningDate: input.screeningDate ?? null,
    enrolmentDate: null,
    implantDate: null,
    deviceSerial: null,
    endedOn: null,
  };
  const fields = checkSubjectDates(dates, today);
  if (Object.keys(fields).length > 0) throw unprocessable("Check the dates.", fields);
  const version = consentVersionFor(await listVersionsInForceAtSite(tx, { siteId }), input.consentDate, site.code);
  const [subject] = await tx
    .insert(subjects)
    .values({ studyId: site.studyId, siteId, code: parsed.data, status: "screening", consentDate: input.consentDate, consentVersionId: version.versionId, screeningDate: dates.screeningDate, createdBy: actor.userId })
    .returning();
  await tx.insert(subjectStatusEvents).values({ subjectId: subject!.id, fromStatus: null, toStatus: "screening", effectiveOn: dates.screeningDate ?? input.consentDate, actorId: actor.userId });
  return subject!;
}
