import Link from "next/link";
import { db } from "@/server/db/client";
import { listOpenWork } from "@/server/protocol/queries";
import { rolesIn, type Actor } from "@/lib/auth/authorize";
import { studyPath } from "@/lib/nav";
import { ProtocolStateChip } from "./protocol-state-chip";

/** Home panel for writers and reviewers: their drafts, and versions waiting for review or release. */
export async function ProtocolWorkPanel({ studyId, actor }: { studyId: string; actor: Actor }) {
  const roles = rolesIn(actor, studyId);
  const rows = await listOpenWork(db, { studyId });
  const mine = (r: (typeof rows)[number]) =>
    (roles.includes("protocol_writer") && r.authorId === actor.userId && (r.state === "draft" || r.state === "returned")) ||
    (roles.includes("medical_reviewer") && r.authorId !== actor.userId && (r.state === "in_review" || r.state === "approved"));
  const todo = rows.filter(mine);
  const others = rows.filter((r) => !mine(r));
  const base = studyPath(studyId, "protocol");
  const item = (r: (typeof rows)[number]) => (
    <li key={r.id} className="flex flex-wrap items-center gap-2">
      <Link href={`${base}/${r.id}${r.state === "draft" && r.authorId === actor.userId ? "/edit" : ""}`}>Version {r.versionLabel}</Link>
      <ProtocolStateChip state={r.state} />
      <span className="text-muted">
        by {r.authorName}, changed {r.updatedAt.toISOString().slice(0, 10)}
      </span>
    </li>
  );
  return (
    <div className="space-y-2 text-sm" data-testid="protocol-work">
      {todo.length ? <ul className="space-y-1">{todo.map(item)}</ul> : <p>Nothing waits for you.</p>}
      {others.length > 0 && (
        <>
          <p className="text-muted">Also open:</p>
          <ul className="space-y-1">{others.map(item)}</ul>
        </>
      )}
      <p>
        <Link href={base}>All protocol versions</Link>
      </p>
    </div>
  );
}
