// SHA-256 of a protocol version's canonical content: what an investigator signs is bound to it.
// Server-side (node:crypto).
import { createHash } from "node:crypto";
import { canonicalJson } from "@/lib/canonical-json";
import type { VisitSchedule } from "./visit-schedule";

export interface ProtocolContent {
  doc: unknown;
  visitSchedule: VisitSchedule;
}

/** The canonical JSON that is hashed: { doc, visitSchedule } under RFC 8785. */
export function canonicalProtocolContent({ doc, visitSchedule }: ProtocolContent): string {
  return canonicalJson({ doc, visitSchedule });
}

/** Lower-case hex SHA-256 of the UTF-8 bytes of the canonical JSON. */
export function hashProtocolContent(content: ProtocolContent): string {
  return createHash("sha256").update(canonicalProtocolContent(content), "utf8").digest("hex");
}
