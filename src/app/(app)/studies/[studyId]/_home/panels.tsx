import { db } from "@/server/db/client";
import { countSitesByStatus, listSitesForStudy } from "@/server/studies/queries";
import { listPendingInvitations } from "@/server/people/people";
import { listRecentAuditEvents } from "@/server/audit/list-audit-events";
import { accessibleSiteIds, type Actor } from "@/lib/auth/authorize";
import type { Role } from "@/lib/auth/roles";
import { siteStatusLabels, siteStatuses } from "@/lib/sites/site-status";
import { SiteStatusChip } from "@/components/site-status-chip";
import { SiteAmountsDue, StudyAmountsDue } from "../ledger/_components/home-panels";
import { FailedTransfersPanel, OpenPaymentQueriesPanel, PaymentsToConfirmPanel, RunsAwaitingApprovalPanel } from "../payment-runs/_components/home-panels";
import { MyAcknowledgementsPanel, OverdueAcknowledgementsPanel } from "../acknowledgements/_components/home-panels";
import { PendingApprovalsPanel } from "../adoption/_components/home-panels";
import { BinderReviewPanel, BinderToDoPanel } from "../documents/_components/binder-home-panels";
import { ProtocolWorkPanel } from "../protocol/_components/protocol-home-panel";

import { EnrolmentBySitePanel, SiteWeekVisitsPanel } from "../visits/_components/home-panels";
// Home panels by role. Each capability adds the panel that shows a person their pending work.
export type HomePanel = {
  key: string;
  title: string;
  roles: Role[];
  Component: (props: { studyId: string; actor: Actor }) => Promise<React.ReactNode>;
};

async function SitesByStatus({ studyId }: { studyId: string }) {
  const by = await countSitesByStatus(db, { studyId });
  return (
    <table className="table-dense">
      <tbody>
        {siteStatuses.map((s) => (
          <tr key={s}>
            <td>{siteStatusLabels[s]}</td>
            <td className="amount">{by.get(s) ?? 0}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

async function PendingInvitations({ studyId }: { studyId: string }) {
  const rows = await listPendingInvitations(db, { studyId });
  if (rows.length === 0) return <p className="text-sm">Everyone invited has set a password.</p>;
  return (
    <ul className="text-sm">
      {rows.map((r) => (
        <li key={r.email}>
          {r.name} <span className="text-muted">({r.email})</span>
        </li>
      ))}
    </ul>
  );
}

async function LatestAudit({ studyId }: { studyId: string }) {
  const rows = await listRecentAuditEvents(db, { studyId, limit: 6 });
  if (rows.length === 0) return <p className="text-sm">No recorded changes yet.</p>;
  return (
    <ul className="text-sm">
      {rows.map((r) => (
        <li key={r.id}>
          <span className="font-mono text-xs">{r.at.toISOString().slice(0, 16).replace("T", " ")} UTC</span> {r.actorName}: {r.action}
        </li>
      ))}
    </ul>
  );
}

async function MySites({ studyId, actor }: { studyId: string; actor: Actor }) {
  const rows = await listSitesForStudy(db, { studyId, siteIds: accessibleSiteIds(actor, "sites.read", studyId) });
  return (
    <ul className="flex flex-col gap-1 text-sm">
      {rows.map((s) => (
        <li key={s.id} className="flex items-center gap-2">
          <span className="font-mono">{s.code}</span> {s.name} <SiteStatusChip status={s.status} />
        </li>
      ))}
    </ul>
  );
}

export const homePanels: HomePanel[] = [
  { key: "protocol-work", title: "Protocol versions", roles: ["protocol_writer", "medical_reviewer"], Component: ProtocolWorkPanel },
  { key: "my-acknowledgements", title: "Protocol versions to acknowledge", roles: ["investigator"], Component: MyAcknowledgementsPanel },
  { key: "pending-approvals", title: "Ethics approvals to record", roles: ["coordinator"], Component: PendingApprovalsPanel },
  { key: "sites-by-status", title: "Sites by status", roles: ["sponsor_admin"], Component: SitesByStatus },
  { key: "pending-invitations", title: "Invitations not yet accepted", roles: ["sponsor_admin"], Component: PendingInvitations },
  { key: "latest-audit", title: "Latest recorded changes", roles: ["auditor", "sponsor_admin"], Component: LatestAudit },
  {
    key: "my-sites",
    title: "Your sites",
    roles: ["investigator", "coordinator", "site_finance", "monitor", "protocol_writer", "medical_reviewer", "sponsor_finance"],
    Component: MySites,
  },
  { key: "binder-review", title: "Documents awaiting review", roles: ["sponsor_admin"], Component: BinderReviewPanel },
  { key: "binder-todo", title: "Your site's documents to do", roles: ["coordinator"], Component: BinderToDoPanel },
  { key: "overdue-acknowledgements", title: "Protocol acknowledgements", roles: ["sponsor_admin", "medical_reviewer"], Component: OverdueAcknowledgementsPanel },
  { key: "week-visits", title: "Visits due this week", roles: ["coordinator"], Component: SiteWeekVisitsPanel },
  { key: "enrolment-by-site", title: "Enrolment and overdue visits by site", roles: ["sponsor_admin"], Component: EnrolmentBySitePanel },
  { key: "site-amounts-due", title: "Due to your site", roles: ["site_finance"], Component: SiteAmountsDue },
  { key: "study-amounts-due", title: "Due to sites, by currency", roles: ["sponsor_finance"], Component: StudyAmountsDue },
  { key: "runs-awaiting-approval", title: "Payment runs awaiting approval", roles: ["sponsor_finance"], Component: RunsAwaitingApprovalPanel },
  { key: "failed-transfers", title: "Failed transfers", roles: ["sponsor_finance"], Component: FailedTransfersPanel },
  { key: "payments-to-confirm", title: "Payments to confirm", roles: ["site_finance"], Component: PaymentsToConfirmPanel },
  { key: "open-payment-queries", title: "Open payment queries", roles: ["site_finance", "sponsor_finance"], Component: OpenPaymentQueriesPanel },
];
