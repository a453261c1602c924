import { createHash, randomUUID } from "node:crypto";
import { PutObjectCommand } from "@aws-sdk/client-s3";
import { and, count, eq, like } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import * as uploads from "@/app/api/v1/studies/[studyId]/documents/route";
import * as complete from "@/app/api/v1/documents/[documentId]/complete/route";
import * as download from "@/app/api/v1/documents/[documentId]/download/route";
import * as review from "@/app/api/v1/documents/[documentId]/review/route";
import * as typesRoute from "@/app/api/v1/studies/[studyId]/binder/types/route";
import * as typeRoute from "@/app/api/v1/studies/[studyId]/binder/types/[typeCode]/route";
import * as siteBinder from "@/app/api/v1/studies/[studyId]/binder/sites/[siteId]/route";
import * as matrix from "@/app/api/v1/studies/[studyId]/binder/matrix/route";
import * as awaiting from "@/app/api/v1/studies/[studyId]/binder/review/route";
import * as siteStatus from "@/app/api/v1/sites/[siteId]/status/route";
import { documents, memberships, outboxMessages, sites, users } from "@/server/db/schema";
import { expiringDocumentsDigest, sendExpiryDigest } from "@/server/binder/expiry-digest";
import { siteToday } from "@/server/binder/load-site-binder";
import { runScheduledJob } from "@/server/jobs/run-scheduled-job";
import { addCalendarDays } from "@/lib/visits/calendar-date";
import { verifyStoredDocument, getDocumentById } from "@/server/documents/uploads";
import { s3, DOWNLOAD_URL_SECONDS } from "@/server/storage/s3";
import { env } from "@/env";
import { callRoute } from "../../support/api";
import { createStudyFixture, db, type StudyFixture } from "../../support/db";

let fx: StudyFixture;
let typeIds: Record<string, string>;
const sha = (b: Buffer) => createHash("sha256").update(b).digest("hex");
const pdf = (text: string) => Buffer.from(`%PDF-1.4\n% ${text}\n%%EOF\n`);

beforeAll(async () => {
  fx = await createStudyFixture();
  const res = await callRoute(typesRoute.GET, { params: { studyId: fx.study.id }, userId: fx.userByRole.sponsor_admin.id });
  typeIds = Object.fromEntries((res.json.types as { code: string; id: string }[]).map((t) => [t.code, t.id]));
});

async function requestBinderUpload(body: Record<string, unknown>, binder: Record<string, unknown>, userId = fx.userByRole.coordinator.id) {
  return callRoute(uploads.POST, { method: "POST", params: { studyId: fx.study.id }, body: { siteId: fx.siteA.id, ...body, binder }, userId });
}

async function uploadBinder(code: string, content: Buffer, binder: Record<string, unknown> = {}, userId = fx.userByRole.coordinator.id) {
  const res = await requestBinderUpload({ fileName: `${code}.pdf`, contentType: "application/pdf", sizeBytes: content.length, sha256: sha(content) }, { documentTypeId: typeIds[code], ...binder }, userId);
  expect(res.status, JSON.stringify(res.json)).toBe(201);
  const put = await fetch(res.json.uploadUrl, { method: "PUT", body: new Uint8Array(content), headers: { "content-type": "application/pdf" } });
  expect(put.status).toBe(200);
  const done = await callRoute(complete.POST, { method: "POST", params: { documentId: res.json.document.id }, userId });
  expect(done.status, JSON.stringify(done.json)).toBe(200);
  return done.json.document as { id: string; state: string; reviewState: string; supersedesId: string | null; storageKey: string; expiresOn: string | null };
}

const binderOf = async (userId = fx.userByRole.coordinator.id) =>
  (await callRoute(siteBinder.GET, { params: { studyId: fx.study.id, siteId: fx.siteA.id }, userId })).json as {
    items: { type: { code: string }; person: { userId: string } | null; state: string; current: { id: string } | null; earlier: { id: string }[] }[];
  };
const itemOf = (b: Awaited<ReturnType<typeof binderOf>>, code: string, personId?: string) => b.items.find((i) => i.type.code === code && (personId === undefined || i.person?.userId === personId))!;

describe("binder uploads through the S3 fake", () => {
  it("stores a CV with its SHA-256 verified, awaiting review; a new version supersedes and the old stays readable", async () => {
    const investigator = fx.userByRole.investigator.id;
    const first = await uploadBinder("investigator_cv", pdf("CV v1"), { personId: investigator });
    expect(first.state).toBe("stored");
    expect(first.reviewState).toBe("awaiting_review");
    expect(itemOf(await binderOf(), "investigator_cv", investigator).state).toBe("awaiting_review");

    const accepted = await callRoute(review.POST, { method: "POST", params: { documentId: first.id }, body: { decision: "accepted" }, userId: fx.userByRole.sponsor_admin.id });
    expect(accepted.status).toBe(200);
    expect(itemOf(await binderOf(), "investigator_cv", investigator).state).toBe("complete");

    const second = await uploadBinder("investigator_cv", pdf("CV v2"), { personId: investigator });
    expect(second.supersedesId).toBe(first.id);
    const item = itemOf(await binderOf(), "investigator_cv", investigator);
    expect(item.current?.id).toBe(second.id);
    expect(item.earlier.map((d) => d.id)).toEqual([first.id]);
    expect(item.state).toBe("awaiting_review");

    const oldLink = await callRoute(download.GET, { params: { documentId: first.id }, userId: fx.userByRole.investigator.id });
    expect(oldLink.status).toBe(200);
    expect(sha(Buffer.from(await (await fetch(oldLink.json.url)).arrayBuffer()))).toBe(sha(pdf("CV v1")));
  });

  it("proposes the expiry of a GCP certificate from its issue date and the 3-year validity (common practice)", async () => {
    const doc = await uploadBinder("gcp_training", pdf("GCP"), { personId: fx.userByRole.coordinator.id, issuedOn: "2025-01-31" });
    expect(doc.expiresOn).toBe("2028-01-31");
  });

  it("detects an object changed in storage behind the app's back", async () => {
    const doc = await uploadBinder("delegation_log", pdf("delegation log"));
    const row = await getDocumentById(db, { id: doc.id });
    expect((await verifyStoredDocument(row)).intact).toBe(true);
    await s3().send(new PutObjectCommand({ Bucket: env.S3_BUCKET, Key: row.storageKey, Body: pdf("delegation lug") }));
    const check = await verifyStoredDocument(row);
    expect(check.intact).toBe(false);
    expect(check.found?.sha256).not.toBe(row.sha256);
  });

  const storedCount = async () => (await db.select({ n: count() }).from(documents).where(and(eq(documents.studyId, fx.study.id), like(documents.fileName, "refused%"))))[0]!.n;

  it.each([
    ["an over-size file", { fileName: "refused.pdf", contentType: "application/pdf", sizeBytes: 500 * 1024 * 1024 }, /at most/],
    ["a disallowed type", { fileName: "refused.exe", contentType: "application/x-msdownload", sizeBytes: 100 }, /Allowed file types/],
    ["a path separator in the name", { fileName: "refused/../../cv.pdf", contentType: "application/pdf", sizeBytes: 100 }, /may not contain \//],
    ["a backslash in the name", { fileName: "refused\\cv.pdf", contentType: "application/pdf", sizeBytes: 100 }, /may not contain/],
    ["a control character in the name", { fileName: "refused\u0000cv.pdf", contentType: "application/pdf", sizeBytes: 100 }, /control characters/],
  ])("refuses %s with a clear 400 and stores nothing", async (_label, body, message) => {
    const before = await storedCount();
    const res = await requestBinderUpload({ sha256: "c".repeat(64), ...body }, { documentTypeId: typeIds.delegation_log });
    expect(res.status).toBe(400);
    expect(JSON.stringify(res.json.error)).toMatch(message);
    expect(await storedCount()).toBe(before);
  });

  it.each([
    ["a per-person type without the person", "investigator_cv", {}, /whose/],
    ["a person of another site", "investigator_cv", () => ({ personId: fx.siteBPeople.investigator.id }), /does not hold/],
    ["a person without the role", "investigator_cv", () => ({ personId: fx.userByRole.site_finance.id }), /does not hold/],
    ["an expiring type without dates", "insurance_certificate", {}, /expiry date/],
  ])("refuses %s with 422 and stores nothing", async (_label, code, extra, message) => {
    const before = await storedCount();
    const res = await requestBinderUpload(
      { fileName: "refused.pdf", contentType: "application/pdf", sizeBytes: 10, sha256: "d".repeat(64) },
      { documentTypeId: typeIds[code], ...(typeof extra === "function" ? extra() : extra) },
    );
    expect(res.status).toBe(422);
    expect(res.json.error.message).toMatch(message);
    expect(await storedCount()).toBe(before);
  });

  it("refuses an expiry date before the issue date", async () => {
    const res = await requestBinderUpload(
      { fileName: "refused.pdf", contentType: "application/pdf", sizeBytes: 10, sha256: "d".repeat(64) },
      { documentTypeId: typeIds.insurance_certificate, issuedOn: "2026-05-01", expiresOn: "2026-04-30" },
    );
    expect(res.status).toBe(400);
    expect(res.json.error.fields["binder.expiresOn"]).toBeTruthy();
  });
});

describe("download links", () => {
  it("expire within 300 seconds (X-Amz-Expires of the presigned URL)", async () => {
    const doc = await uploadBinder("investigator_agreement", pdf("agreement"));
    const link = await callRoute(download.GET, { params: { documentId: doc.id }, userId: fx.userByRole.monitor.id });
    expect(link.status).toBe(200);
    const expires = Number(new URL(link.json.url).searchParams.get("X-Amz-Expires"));
    expect(expires).toBe(DOWNLOAD_URL_SECONDS);
    expect(expires).toBeLessThanOrEqual(300);
    expect(link.json.expiresInSeconds).toBeLessThanOrEqual(300);
  });

  it("are refused to site B's people for site A's binder document, and site A's binder itself is not found", async () => {
    const doc = await uploadBinder("ethics_approval", pdf("ethics"));
    for (const role of ["investigator", "coordinator", "site_finance"] as const) {
      const link = await callRoute(download.GET, { params: { documentId: doc.id }, userId: fx.siteBPeople[role].id });
      expect(link.status).toBe(404);
      expect(link.json.url).toBeUndefined();
    }
    const b = await callRoute(siteBinder.GET, { params: { studyId: fx.study.id, siteId: fx.siteA.id }, userId: fx.siteBPeople.coordinator.id });
    expect(b.status).toBe(404);
  });
});

describe("sponsor review", () => {
  it("rejects with a reason: the item returns to the site's to-do list and the coordinator is told", async () => {
    const doc = await uploadBinder("financial_disclosure", pdf("disclosure"), { personId: fx.userByRole.investigator.id });
    const list = await callRoute(awaiting.GET, { params: { studyId: fx.study.id }, userId: fx.userByRole.sponsor_admin.id });
    expect((list.json.documents as { id: string }[]).some((d) => d.id === doc.id)).toBe(true);

    const noReason = await callRoute(review.POST, { method: "POST", params: { documentId: doc.id }, body: { decision: "rejected" }, userId: fx.userByRole.sponsor_admin.id });
    expect(noReason.status).toBe(400);
    const rejected = await callRoute(review.POST, { method: "POST", params: { documentId: doc.id }, body: { decision: "rejected", reason: "Page 2 is not signed" }, userId: fx.userByRole.sponsor_admin.id });
    expect(rejected.status).toBe(200);
    expect(itemOf(await binderOf(), "financial_disclosure").state).toBe("rejected");
    const mail = await db.select().from(outboxMessages).where(eq(outboxMessages.dedupeKey, `binder-rejected:${doc.id}:${fx.userByRole.coordinator.id}`));
    expect(mail).toHaveLength(1);
    expect(mail[0]!.textBody).toContain("Page 2 is not signed");

    const again = await callRoute(review.POST, { method: "POST", params: { documentId: doc.id }, body: { decision: "accepted" }, userId: fx.userByRole.sponsor_admin.id });
    expect(again.status).toBe(409);
  });

  it("refuses to review a file that is not a binder document", async () => {
    const res = await callRoute(review.POST, { method: "POST", params: { documentId: fx.docA.id }, body: { decision: "accepted" }, userId: fx.userByRole.sponsor_admin.id });
    expect(res.status).toBe(422);
  });
});

describe("document types", () => {
  it("lets the sponsor add, change and retire a type; site people cannot", async () => {
    const code = `site_visit_log_${randomUUID().slice(0, 6)}`;
    const created = await callRoute(typesRoute.POST, {
      method: "POST",
      params: { studyId: fx.study.id },
      body: { code, name: "Site visit log", holder: "site", requiredFrom: "open", expires: false, validityMonths: null, reference: "common practice" },
      userId: fx.userByRole.sponsor_admin.id,
    });
    expect(created.status).toBe(201);
    const changed = await callRoute(typeRoute.PATCH, { method: "PATCH", params: { studyId: fx.study.id, typeCode: code }, body: { retired: true }, userId: fx.userByRole.sponsor_admin.id });
    expect(changed.status).toBe(200);
    expect(changed.json.type.retiredAt).toBeTruthy();
    const byCoordinator = await callRoute(typeRoute.PATCH, { method: "PATCH", params: { studyId: fx.study.id, typeCode: code }, body: { retired: false }, userId: fx.userByRole.coordinator.id });
    expect(byCoordinator.status).toBe(403);
    const invalid = await callRoute(typesRoute.POST, {
      method: "POST",
      params: { studyId: fx.study.id },
      body: { code: "cv2", name: "CV", holder: "person", appliesToRoles: [], requiredFrom: "start_up", expires: false, validityMonths: null },
      userId: fx.userByRole.sponsor_admin.id,
    });
    expect(invalid.status).toBe(400);
    expect(invalid.json.error.fields.appliesToRoles).toBeTruthy();
  });
});

describe("matrix", () => {
  it("counts per site and type, shows site people their own row, and exports CSV", async () => {
    const sponsor = await callRoute(matrix.GET, { params: { studyId: fx.study.id }, userId: fx.userByRole.sponsor_admin.id });
    expect(sponsor.status).toBe(200);
    expect((sponsor.json.rows as { code: string }[]).map((r) => r.code).sort()).toEqual([fx.siteA.code, fx.siteB.code].sort());
    const siteB = await callRoute(matrix.GET, { params: { studyId: fx.study.id }, userId: fx.siteBPeople.coordinator.id });
    expect((siteB.json.rows as { code: string }[]).map((r) => r.code)).toEqual([fx.siteB.code]);
    const rejected = await callRoute(matrix.GET, { params: { studyId: fx.study.id }, query: { state: "rejected" }, userId: fx.userByRole.sponsor_admin.id });
    expect((rejected.json.rows as { code: string }[]).every((r) => r.code === fx.siteA.code)).toBe(true);
    const csv = await callRoute(matrix.GET, { params: { studyId: fx.study.id }, query: { format: "csv" }, userId: fx.userByRole.auditor.id });
    expect(csv.headers.get("content-type")).toMatch(/text\/csv/);
    expect(String(csv.json)).toMatch(/^site_code,site_name,site_status,document_type/);
    expect(String(csv.json)).toContain(`${fx.siteA.code},Site A,open,investigator_cv`);
  });
});


/** An accepted binder document written straight to the table (no file: readiness reads rows only). */
async function acceptedRow(siteId: string, code: string, personId: string | null, expiresOn: string | null = null) {
  await db.insert(documents).values({
    studyId: fx.study.id,
    siteId,
    purpose: code,
    storageKey: `test/${randomUUID()}`,
    fileName: `${code}.pdf`,
    contentType: "application/pdf",
    sizeBytes: 10,
    sha256: "0".repeat(64),
    state: "stored",
    uploaderId: fx.userByRole.sponsor_admin.id,
    documentTypeId: typeIds[code],
    personId,
    expiresOn,
    reviewState: "accepted",
  });
}

describe("the site-open gate", () => {
  it("refuses to open a site while a required document is missing, listing what is missing, then opens it", async () => {
    const [site] = await db
      .insert(sites)
      .values({ studyId: fx.study.id, code: `C${fx.tag.slice(0, 4)}`.toUpperCase(), name: "Site C", country: "NL", timeZone: "Europe/Amsterdam", currency: "EUR", status: "start_up" })
      .returning();
    const open = () => callRoute(siteStatus.POST, { method: "POST", params: { siteId: site!.id }, body: { to: "open" }, userId: fx.userByRole.sponsor_admin.id });

    const blocked = await open();
    expect(blocked.status).toBe(422);
    expect(blocked.json.error.message).toContain("cannot open until its essential documents are complete");
    expect(blocked.json.error.message).toContain("Curriculum vitae (nobody holds the role investigator yet) — missing");
    expect(blocked.json.error.fields.documents).toContain("Device receipt and accountability log — missing");

    const [inv] = await db.insert(users).values({ email: `inv.c.${fx.tag}@test.example`, name: "Dr. Site C" }).returning();
    await db.insert(memberships).values({ userId: inv!.id, studyId: fx.study.id, siteId: site!.id, role: "investigator" });
    const today = siteToday("Europe/Amsterdam");
    for (const code of ["investigator_agreement", "ethics_approval", "delegation_log", "device_accountability"]) await acceptedRow(site!.id, code, null);
    await acceptedRow(site!.id, "insurance_certificate", null, addCalendarDays(today, 200));
    await acceptedRow(site!.id, "lab_certification", null, addCalendarDays(today, 200));
    for (const code of ["investigator_cv", "financial_disclosure"]) await acceptedRow(site!.id, code, inv!.id);
    await acceptedRow(site!.id, "medical_licence", inv!.id, addCalendarDays(today, 300));
    // Valid through yesterday: expired, so still blocking.
    await acceptedRow(site!.id, "gcp_training", inv!.id, addCalendarDays(today, -1));
    const stillBlocked = await open();
    expect(stillBlocked.status).toBe(422);
    expect(stillBlocked.json.error.fields.documents).toEqual(["GCP training certificate (Dr. Site C) — expired"]);

    // A renewed certificate expiring within 60 days does not block.
    await acceptedRow(site!.id, "gcp_training", inv!.id, addCalendarDays(today, 30));
    const opened = await open();
    expect(opened.status, JSON.stringify(opened.json)).toBe(200);
    expect(opened.json.site.status).toBe("open");
  });
});

describe("weekly expiring-documents digest", () => {
  it("mails the site's people their expired and expiring items once per ISO week", async () => {
    const today = siteToday(fx.siteA.timeZone);
    await acceptedRow(fx.siteA.id, "insurance_certificate", null, addCalendarDays(today, 10));
    const periodKey = `test-${randomUUID()}`;
    const first = await db.transaction((tx) => sendExpiryDigest(tx, { now: new Date(), periodKey }));
    expect(first.queued).toBeGreaterThan(0);
    const key = `binder-expiry:${periodKey}:${fx.siteA.id}:${fx.userByRole.coordinator.id}`;
    const [mail] = await db.select().from(outboxMessages).where(eq(outboxMessages.dedupeKey, key));
    expect(mail?.textBody).toContain("Insurance certificate — expiring");
    expect(mail?.textBody).toContain("10 days left");
    const siteBMail = await db.select().from(outboxMessages).where(like(outboxMessages.dedupeKey, `binder-expiry:${periodKey}:${fx.siteB.id}:${fx.userByRole.coordinator.id}`));
    expect(siteBMail).toHaveLength(0);
    const second = await db.transaction((tx) => sendExpiryDigest(tx, { now: new Date(), periodKey }));
    expect(second.queued).toBe(0);
  });

  it("runs at most once per ISO week", async () => {
    // A week far ahead so no other run of this database has claimed it.
    const monday = new Date("2031-03-03T06:00:00Z");
    expect(expiringDocumentsDigest.periodKey(monday)).toBe("2031-W10");
    expect(await runScheduledJob(expiringDocumentsDigest, monday)).toBe("ran");
    expect(await runScheduledJob(expiringDocumentsDigest, new Date("2031-03-09T22:00:00Z"))).toBe("already-done");
  });
});
