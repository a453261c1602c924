// PATCH /api/v1/studies/:studyId/acknowledgements/settings — the study's acknowledgement deadline in days
import { apiRoute } from "@/server/api/route";
import { studyParams } from "@/lib/api/schemas";
import { ackSettingsBody } from "@/lib/acknowledgements/api-schemas";
import { setAcknowledgementDeadline } from "@/server/acknowledgements/settings";

export const PATCH = apiRoute(
  { permission: "study.manage", params: studyParams, body: ackSettingsBody, scope: ({ params }) => ({ studyId: params.studyId }) },
  async ({ tx, input, audit, unchanged }) => {
    const { before, after, changed } = await setAcknowledgementDeadline(tx, { studyId: input.params.studyId, ...input.body });
    if (changed) await audit({ action: "study.ack_deadline_changed", entityType: "study", entityId: input.params.studyId, before, after });
    else unchanged();
    return after;
  },
);
