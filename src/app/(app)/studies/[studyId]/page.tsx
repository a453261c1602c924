import { Suspense } from "react";
import { getStudyContext } from "@/server/studies/study-context";
import { roleLabels } from "@/lib/auth/roles";
import { homePanels } from "./_home/panels";

export default async function StudyHome({ params }: { params: Promise<{ studyId: string }> }) {
  const { studyId } = await params;
  const { actor, study, roles } = await getStudyContext(studyId);
  const panels = homePanels.filter((p) => p.roles.some((r) => roles.includes(r)));
  return (
    <div className="space-y-6">
      <header>
        <h1>Home</h1>
        <p className="text-sm text-muted">
          {study.code} · {study.sponsorName} · you are {roles.map((r) => roleLabels[r]).join(", ")}
        </p>
      </header>
      <div className="grid gap-4 lg:grid-cols-2" data-testid="home-panels">
        {panels.map(({ key, title, Component }) => (
          <section key={key} className="card" aria-labelledby={`panel-${key}`}>
            <h2 id={`panel-${key}`} className="mb-2">
              {title}
            </h2>
            <Suspense fallback={<p className="animate-pulse text-sm text-muted">Loading…</p>}>
              <Component studyId={studyId} actor={actor} />
            </Suspense>
          </section>
        ))}
      </div>
    </div>
  );
}
