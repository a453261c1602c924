import "server-only";
import { unprocessable } from "@/server/api/errors";
import type { VersionInForceAtSite } from "@/server/protocol/in-force";
import { versionInForceOn } from "@/lib/visits/subject-calendar";

/** Subjects are consented on the version in force at their site on the consent date. */
export function consentVersionFor(versions: readonly VersionInForceAtSite[], consentDate: string, siteCode: string): VersionInForceAtSite {
  const v = versionInForceOn(versions, consentDate);
  if (!v) {
    const first = versions[0]?.inForceFrom;
    throw unprocessable(`No protocol version was in force at site ${siteCode} on ${consentDate}: consent needs the ethics committee's approval first.`, {
      consentDate: [first ? `The first version is in force at the site from ${first}` : "No protocol version has been approved at this site yet"],
    });
  }
  return v;
}
