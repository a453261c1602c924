import "server-only";
import type { Tx } from "@/server/db/client";
import { unprocessable } from "@/server/api/errors";
import { proposedExpiry } from "@/lib/binder/dates";
import type { BinderUpload } from "@/lib/binder/schemas";
import { getDocumentType } from "./document-types";
import { loadSitePeople } from "./load-site-binder";

export type BinderFields = { documentTypeId: string; personId: string | null; issuedOn: string | null; expiresOn: string | null; reviewState: "awaiting_review"; purpose: string };

/**
 * Check a binder upload against its document type before a URL is issued: a site, the person for a
 * per-person type (someone holding one of its roles at that site), and an expiry date for a type
 * that expires (proposed from the issue date and the usual validity when not given).
 */
export async function checkBinderUpload(tx: Tx, { studyId, siteId, binder }: { studyId: string; siteId: string | null; binder: BinderUpload }): Promise<BinderFields> {
  const type = await getDocumentType(tx, { studyId, id: binder.documentTypeId });
  if (type.retiredAt) throw unprocessable(`"${type.name}" is no longer on the study's list.`);
  if (!siteId) throw unprocessable("A binder document belongs to a site: choose the site.", { siteId: ["Choose the site"] });
  let personId: string | null = null;
  if (type.holder === "person") {
    if (!binder.personId) throw unprocessable(`Say whose ${type.name} this is.`, { personId: ["Choose the person"] });
    const people = (await loadSitePeople(tx, { siteIds: [siteId] })).get(siteId) ?? [];
    const person = people.find((p) => p.userId === binder.personId);
    if (!person || !person.roles.some((r) => type.appliesToRoles.includes(r))) {
      throw unprocessable(`That person does not hold the role ${type.appliesToRoles.join(" or ")} at this site.`, { personId: ["Not a person of this site in that role"] });
    }
    personId = person.userId;
  }
  let expiresOn = type.expires ? binder.expiresOn : null;
  if (type.expires && !expiresOn && binder.issuedOn && type.validityMonths) expiresOn = proposedExpiry(binder.issuedOn, type.validityMonths);
  if (type.expires && !expiresOn) {
    const orIssue = type.validityMonths ? ` (or its issue date: it is usually valid ${type.validityMonths} months)` : "";
    throw unprocessable(`${type.name} expires: give its expiry date${orIssue}.`, { expiresOn: ["Give the expiry date"] });
  }
  return { documentTypeId: type.id, personId, issuedOn: binder.issuedOn, expiresOn, reviewState: "awaiting_review", purpose: type.code };
}
