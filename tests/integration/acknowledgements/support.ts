import { createHash } from "node:crypto";
import canonicalize from "canonicalize";
import { eq } from "drizzle-orm";
import { db } from "../../support/db";
import { protocolVersions, users } from "@/server/db/schema";
import { hashPassword } from "@/server/auth/password";

export const PASSWORD = "correct horse battery staple 42";

/** SHA-256 of RFC 8785 canonical JSON via the `canonicalize` package: an outside check of the content hash. */
export const referenceHash = (doc: unknown, visitSchedule: unknown) =>
  createHash("sha256").update(canonicalize({ doc, visitSchedule })!, "utf8").digest("hex");

let counter = 0;
/** A released protocol version of the study, content hash computed independently of Cairn's code. */
export async function insertReleasedVersion(studyId: string, authorId: string, { label, releasedAt, parentId = null }: { label: string; releasedAt: Date; parentId?: string | null }) {
  counter++;
  const doc = { type: "doc", content: [{ type: "paragraph", content: [{ type: "text", text: `Protocol text ${label} (${counter})` }] }] };
  const visitSchedule: never[] = [];
  const [v] = await db
    .insert(protocolVersions)
    .values({ studyId, parentId, versionLabel: label, title: `Test protocol ${label}`, state: "released", content: doc, visitSchedule, contentHash: referenceHash(doc, visitSchedule), authorId, releasedAt, releasedBy: authorId, approvedAt: releasedAt })
    .returning();
  return v!;
}

export async function givePassword(userId: string, password = PASSWORD) {
  await db.update(users).set({ passwordHash: await hashPassword(password) }).where(eq(users.id, userId));
}

/** The SMTP fake's REST API (maildev 3 serves it under /api). */
export function maildevApi(): string {
  const base = process.env.MAILDEV_API_URL!.replace(/\/$/, "");
  return base.endsWith("/api") ? base : `${base}/api`;
}

export async function inbox(): Promise<{ subject: string; to: { address: string }[]; text: string }[]> {
  const res = await fetch(`${maildevApi()}/email`);
  if (!res.ok) throw new Error(`maildev answered ${res.status}`);
  return (await res.json()) as { subject: string; to: { address: string }[]; text: string }[];
}
