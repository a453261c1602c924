// GET /api/v1/studies/:studyId/audit — the audit trail, filtered and paginated
import { apiRoute } from "@/server/api/route";
import { auditQuery, studyParams } from "@/lib/api/schemas";
import { listAuditEvents } from "@/server/audit/list-audit-events";

export const GET = apiRoute(
  { permission: "audit.read", params: studyParams, query: auditQuery, scope: ({ params }) => ({ studyId: params.studyId }) },
  async ({ tx, input }) => listAuditEvents(tx, { studyId: input.params.studyId, query: input.query }),
);
