import { redirect } from "next/navigation";
import { db } from "@/server/db/client";
import { requireActor } from "@/server/auth/session";
import { listStudiesByIds } from "@/server/studies/queries";
import { studyIdsOf } from "@/lib/auth/authorize";
import { studyPath } from "@/lib/nav";

export default async function IndexPage() {
  const actor = await requireActor();
  const studies = await listStudiesByIds(db, { studyIds: studyIdsOf(actor) });
  if (studies.length === 1) redirect(studyPath(studies[0]!.id));
  return (
    <main id="main" className="mx-auto max-w-3xl p-6">
      <h1 className="mb-4">Your studies</h1>
      {studies.length === 0 ? (
        <p>You hold no role in any study yet. Ask the study&apos;s administrator to grant you one.</p>
      ) : (
        <ul className="list-disc pl-6">
          {studies.map((s) => (
            <li key={s.id}>
              <a href={studyPath(s.id)}>{s.code}</a> — {s.title}
            </li>
          ))}
        </ul>
      )}
    </main>
  );
}
