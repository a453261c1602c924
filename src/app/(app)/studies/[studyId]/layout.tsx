import { NavLinks } from "@/components/nav-links";
import { getStudyContext } from "@/server/studies/study-context";
import { canSomewhere } from "@/lib/auth/authorize";
import { navItems, studyPath } from "@/lib/nav";
import { roleLabels } from "@/lib/auth/roles";

export default async function StudyLayout({ children, params }: { children: React.ReactNode; params: Promise<{ studyId: string }> }) {
  const { studyId } = await params;
  const { actor, study, roles } = await getStudyContext(studyId);
  const items = navItems
    .filter((i) => canSomewhere(actor, i.permission, studyId))
    .map((i) => ({ key: i.key, label: i.label, icon: i.icon, href: studyPath(studyId, i.segment) }));
  return (
    <div className="flex min-h-[calc(100vh-53px)]">
      <nav aria-label="Sections" className="w-56 shrink-0 border-r border-rule bg-white p-3">
        <p className="px-3 pb-1 text-xs font-semibold uppercase tracking-wide text-muted">Study</p>
        <p className="px-3 pb-3 font-semibold" data-testid="study-code">
          {study.code}
        </p>
        <NavLinks items={items} />
        <p className="mt-6 px-3 text-xs text-muted">Your roles: {roles.map((r) => roleLabels[r]).join(", ")}</p>
      </nav>
      <main id="main" className="min-w-0 flex-1 p-6">
        {children}
      </main>
    </div>
  );
}
