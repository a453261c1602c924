import Link from "next/link";
import { db } from "@/server/db/client";
import { loadStudyBinders } from "@/server/binder/study-matrix";
import { listAwaitingReview } from "@/server/binder/review-document";
import { accessibleSiteIds, type Actor } from "@/lib/auth/authorize";
import { itemStateLabels } from "@/lib/binder/readiness";
import { studyPath } from "@/lib/nav";

// Home panels of the binder: a site's to-do list, and the sponsor's review queue.

export async function BinderToDoPanel({ studyId, actor }: { studyId: string; actor: Actor }) {
  const siteIds = accessibleSiteIds(actor, "documents.upload", studyId);
  const { binders } = await loadStudyBinders(db, { studyId, siteIds });
  const rows = binders.flatMap(({ site, binder }) =>
    binder.items.filter((i) => i.required && ["missing", "rejected", "expired", "expiring"].includes(i.state)).map((i) => ({ site, i })),
  );
  if (rows.length === 0) return <p className="text-sm">Every required document of your site is in place.</p>;
  const shown = rows.slice(0, 8);
  return (
    <div className="text-sm" data-testid="home-binder-todo">
      <ul>
        {shown.map(({ site, i }) => (
          <li key={`${site.id}-${i.type.id}-${i.person?.userId ?? ""}`}>
            <span className="font-mono">{site.code}</span> {i.type.name}
            {i.person ? ` (${i.person.name})` : ""}: {itemStateLabels[i.state].toLowerCase()}
            {i.state === "expiring" && i.daysToExpiry !== null ? `, ${i.daysToExpiry} days left` : ""}
          </li>
        ))}
      </ul>
      {rows.length > shown.length && <p className="text-muted">and {rows.length - shown.length} more</p>}
      <Link className="text-slate underline" href={studyPath(studyId, "documents")}>
        Open the binder
      </Link>
    </div>
  );
}

export async function BinderReviewPanel({ studyId }: { studyId: string; actor: Actor }) {
  const pending = await listAwaitingReview(db, { studyId, limit: 50 });
  if (pending.length === 0) return <p className="text-sm">No document is waiting for your review.</p>;
  return (
    <div className="text-sm" data-testid="home-binder-review">
      <p>
        {pending.length}
        {pending.length === 50 ? "+" : ""} document{pending.length === 1 ? "" : "s"} awaiting review
      </p>
      <ul>
        {pending.slice(0, 6).map((d) => (
          <li key={d.id}>
            <span className="font-mono">{d.siteCode}</span> {d.typeName} — {d.fileName}
          </li>
        ))}
      </ul>
      <Link className="text-slate underline" href={studyPath(studyId, "documents/review")}>
        Review them
      </Link>
    </div>
  );
}
