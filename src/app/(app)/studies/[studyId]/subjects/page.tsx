import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { db } from "@/server/db/client";
import { getStudyContext } from "@/server/studies/study-context";
import { listSitesForStudy } from "@/server/studies/queries";
import { listSubjects } from "@/server/subjects/list-subjects";
import { accessibleSiteIds, canSomewhere } from "@/lib/auth/authorize";
import { ImportSubjectsForm } from "./_components/import-subjects-form";
import { ScreenSubjectForm } from "./_components/screen-subject-form";
import { SubjectsTable } from "./_components/subjects-table";

export const metadata: Metadata = { title: "Subjects" };

export default async function SubjectsPage({ params, searchParams }: { params: Promise<{ studyId: string }>; searchParams: Promise<{ siteId?: string }> }) {
  const { studyId } = await params;
  const { siteId } = await searchParams;
  const { actor } = await getStudyContext(studyId);
  if (!canSomewhere(actor, "subjects.read", studyId)) notFound();
  const readable = accessibleSiteIds(actor, "subjects.read", studyId);
  const sites = await listSitesForStudy(db, { studyId, siteIds: readable });
  const selected = siteId && sites.some((s) => s.id === siteId) ? siteId : null;
  const rows = await listSubjects(db, { studyId, siteIds: selected ? [selected] : readable });
  const writable = accessibleSiteIds(actor, "subjects.write", studyId);
  const screenSites = sites.filter((s) => s.status === "open" && (writable === "all" || writable.includes(s.id)));
  const importSites = sites.filter((s) => writable === "all" || writable.includes(s.id));
  return (
    <div className="space-y-6">
      <header className="space-y-1">
        <h1>Subjects</h1>
        <form className="flex items-end gap-2" method="get">
          <label className="field">
            <span>Site</span>
            <select className="input" name="siteId" defaultValue={selected ?? ""}>
              <option value="">All your sites</option>
              {sites.map((s) => (
                <option key={s.id} value={s.id}>
                  {s.code} {s.name}
                </option>
              ))}
            </select>
          </label>
          <button className="btn-secondary">Show</button>
        </form>
      </header>
      {screenSites.length > 0 && (
        <section aria-labelledby="screen-heading" className="space-y-2">
          <h2 id="screen-heading">Screen a subject</h2>
          <ScreenSubjectForm studyId={studyId} sites={screenSites.map((s) => ({ id: s.id, code: s.code }))} />
        </section>
      )}
      <SubjectsTable studyId={studyId} rows={rows} />
      {importSites.length > 0 && (
        <details className="space-y-2">
          <summary className="cursor-pointer font-semibold">Import subjects from a CSV file</summary>
          <ImportSubjectsForm sites={importSites.map((s) => ({ id: s.id, code: s.code }))} />
        </details>
      )}
    </div>
  );
}
