// Essential-document binders of the demo sites, each at a different level of completeness, with
// some expired and expiring items, a rejection and uploads awaiting review. Dates are relative to
// the day the seed runs so the states stay meaningful. Files are small generated PDFs put into the
// S3 fake when it is reachable (rows only otherwise).
import { createHash, randomUUID } from "node:crypto";
import { HeadBucketCommand, PutObjectCommand, S3Client } from "@aws-sdk/client-s3";
import { and, eq, isNotNull, isNull } from "drizzle-orm";
import { binderDocumentTypes, documents, memberships, sites, studies, users } from "../../src/server/db/schema";
import { defaultBinderTypes } from "../../src/lib/binder/default-types";
import { addCalendarDays } from "../../src/lib/visits/calendar-date";
import { addMonths } from "../../src/lib/binder/dates";
import { demoStudy } from "./demo-data";
import type { SeedContext } from "./context";

type Spec = { review?: "accepted" | "awaiting_review" | "rejected"; expiry?: "ok" | "expiring" | "expired"; reason?: string; older?: boolean } | "skip";

// Per site: what each item looks like (key = type code, or code#n for the n-th person); the rest
// follows `rest`. SE01 is only proposed: nothing is required there yet.
const plans: Record<string, { rest: Spec; items: Record<string, Spec> }> = {
  DE01: { rest: {}, items: { "gcp_training#1": { expiry: "expiring" }, investigator_agreement: { older: true }, monitoring_report: {} } },
  NL01: { rest: {}, items: { insurance_certificate: { expiry: "expired" }, delegation_log: { review: "rejected", reason: "Signature sheet missing for the sub-investigator" }, monitoring_report: "skip" } },
  GB01: { rest: {}, items: { investigator_cv: { review: "awaiting_review" }, medical_licence: { expiry: "expiring" }, monitoring_report: "skip" } },
  JP01: { rest: {}, items: { lab_certification: "skip", "gcp_training#0": { expiry: "expired" }, financial_disclosure: { review: "awaiting_review" }, monitoring_report: "skip" } },
  US01: { rest: {}, items: { medical_licence: { expiry: "expired" }, monitoring_report: {} } },
  CH01: { rest: { older: true }, items: { monitoring_report: {} } },
  ES01: {
    rest: "skip",
    items: { investigator_agreement: {}, ethics_approval: { review: "awaiting_review" }, "gcp_training#0": {}, insurance_certificate: { expiry: "ok" } },
  },
  SE01: { rest: "skip", items: {} },
};

/** A one-page PDF saying what it stands for (valid structure, computed xref offsets). */
export function tinyPdf(title: string): Buffer {
  const safe = title.replace(/[()\\]/g, "");
  const stream = `BT /F1 14 Tf 72 760 Td (${safe}) Tj 0 -22 Td /F1 10 Tf (Invented demo document - KESTREL-VP) Tj ET`;
  const objects = [
    "<< /Type /Catalog /Pages 2 0 R >>",
    "<< /Type /Pages /Kids [3 0 R] /Count 1 >>",
    "<< /Type /Page /Parent 2 0 R /MediaBox [0 0 612 792] /Contents 4 0 R /Resources << /Font << /F1 5 0 R >> >> >>",
    `<< /Length ${stream.length} >>\nstream\n${stream}\nendstream`,
    "<< /Type /Font /Subtype /Type1 /BaseFont /Helvetica >>",
  ];
  let out = "%PDF-1.4\n";
  const offsets: number[] = [];
  objects.forEach((o, i) => {
    offsets.push(out.length);
    out += `${i + 1} 0 obj\n${o}\nendobj\n`;
  });
  const xref = out.length;
  out += `xref\n0 ${objects.length + 1}\n0000000000 65535 f \n${offsets.map((o) => `${String(o).padStart(10, "0")} 00000 n \n`).join("")}`;
  out += `trailer\n<< /Size ${objects.length + 1} /Root 1 0 R >>\nstartxref\n${xref}\n%%EOF\n`;
  return Buffer.from(out, "latin1");
}

/** "Dr. Élodie Chappuis" → "dr-elodie-chappuis" (file names stay ASCII). */
const slug = (name: string) =>
  name
    .normalize("NFD")
    .replace(/[\u0300-\u036f]/g, "")
    .toLowerCase()
    .replace(/[^a-z]+/g, "-")
    .replace(/^-|-$/g, "");

async function storage(log: (m: string) => void) {
  const bucket = process.env.S3_BUCKET ?? "cairn-documents";
  const client = new S3Client({
    region: process.env.S3_REGION ?? "us-east-1",
    endpoint: process.env.S3_ENDPOINT ?? "http://127.0.0.1:4569",
    forcePathStyle: (process.env.S3_FORCE_PATH_STYLE ?? "true") === "true",
    credentials: { accessKeyId: process.env.S3_ACCESS_KEY_ID ?? "S3RVER", secretAccessKey: process.env.S3_SECRET_ACCESS_KEY ?? "S3RVER" },
    requestChecksumCalculation: "WHEN_REQUIRED",
    responseChecksumValidation: "WHEN_REQUIRED",
    maxAttempts: 1,
  });
  try {
    await client.send(new HeadBucketCommand({ Bucket: bucket }), { abortSignal: AbortSignal.timeout(3000) });
    return async (key: string, body: Buffer) => {
      await client.send(new PutObjectCommand({ Bucket: bucket, Key: key, Body: body, ContentType: "application/pdf" }));
    };
  } catch {
    log("binder: S3 is not reachable, seeding document rows without files");
    return null;
  }
}

export async function seedBinder({ db, log }: SeedContext) {
  const study = await db.query.studies.findFirst({ where: eq(studies.code, demoStudy.code) });
  if (!study) return;
  const already = await db.select({ id: documents.id }).from(documents).where(and(eq(documents.studyId, study.id), isNotNull(documents.documentTypeId))).limit(1);
  if (already.length > 0) {
    log("binder: already seeded");
    return;
  }
  const put = await storage(log);
  const today = new Date().toISOString().slice(0, 10);
  const [admin] = await db.select({ id: users.id }).from(users).where(eq(users.email, "admin@kestrel-vp.example"));
  let files = 0;

  await db.transaction(async (tx) => {
    const existingTypes = await tx.select().from(binderDocumentTypes).where(eq(binderDocumentTypes.studyId, study.id));
    if (existingTypes.length === 0) {
      await tx.insert(binderDocumentTypes).values(defaultBinderTypes.map((t, i) => ({ ...t, studyId: study.id, sortOrder: (i + 1) * 10 })));
    }
    const types = await tx.select().from(binderDocumentTypes).where(eq(binderDocumentTypes.studyId, study.id));
    const siteRows = await tx.select().from(sites).where(eq(sites.studyId, study.id));
    const people = await tx
      .select({ siteId: memberships.siteId, userId: users.id, name: users.name, role: memberships.role })
      .from(memberships)
      .innerJoin(users, eq(users.id, memberships.userId))
      .where(and(eq(memberships.studyId, study.id), isNull(memberships.revokedAt)));

    for (const site of siteRows) {
      const plan = plans[site.code] ?? { rest: "skip" as Spec, items: {} };
      const sitePeople = people.filter((p) => p.siteId === site.id);
      const uploader = sitePeople.find((p) => p.role === "coordinator")?.userId ?? sitePeople[0]?.userId ?? admin!.id;
      for (const type of types) {
        const holders = type.holder === "site" ? [null] : [...new Map(sitePeople.filter((p) => type.appliesToRoles.includes(p.role)).map((p) => [p.userId, p])).values()];
        for (const [n, person] of holders.entries()) {
          const spec = plan.items[`${type.code}#${n}`] ?? plan.items[type.code] ?? plan.rest;
          if (spec === "skip") continue;
          const review = spec.review ?? "accepted";
          // Dates relative to today: expired 20 days ago, expiring in 25 days, or issued 200 days ago
          // and valid for the usual validity (400 days when the type has none); never issued in the future.
          let issuedOn = addCalendarDays(today, -200);
          let expiresOn: string | null = null;
          if (type.expires) {
            if (spec.expiry === "expired" || spec.expiry === "expiring") {
              expiresOn = addCalendarDays(today, spec.expiry === "expired" ? -20 : 25);
              if (type.validityMonths) issuedOn = addMonths(expiresOn, -type.validityMonths);
              else issuedOn = addCalendarDays(expiresOn, -730);
            } else {
              expiresOn = type.validityMonths ? addMonths(issuedOn, type.validityMonths) : addCalendarDays(today, 400);
            }
          }
          const versions = spec.older ? 2 : 1;
          let previous: string | null = null;
          for (let v = 1; v <= versions; v++) {
            const latest = v === versions;
            const title = `${type.name}${person ? ` - ${person.name}` : ""} - site ${site.code}${versions > 1 ? ` (version ${v})` : ""}`;
            const body = tinyPdf(title);
            const storageKey = `${study.id}/${site.id}/${type.code}/${randomUUID()}`;
            if (put) await put(storageKey, body);
            const created = new Date(Date.now() - (versions - v + 1) * 86_400_000 * 30);
            const [row]: { id: string }[] = await tx
              .insert(documents)
              .values({
                studyId: study.id,
                siteId: site.id,
                purpose: type.code,
                storageKey,
                fileName: `${type.code}${person ? `-${slug(person.name)}` : ""}-v${v}.pdf`,
                contentType: "application/pdf",
                sizeBytes: body.length,
                sha256: createHash("sha256").update(body).digest("hex"),
                state: "stored",
                uploaderId: uploader,
                createdAt: created,
                verifiedAt: created,
                documentTypeId: type.id,
                personId: person?.userId ?? null,
                supersedesId: previous,
                issuedOn: latest ? issuedOn : addCalendarDays(issuedOn, -700),
                expiresOn: latest ? expiresOn : expiresOn && addCalendarDays(expiresOn, -700),
                reviewState: latest ? review : "accepted",
                reviewReason: latest && review === "rejected" ? (spec.reason ?? "Illegible scan") : null,
                reviewerId: latest && review === "awaiting_review" ? null : admin!.id,
                reviewedAt: latest && review === "awaiting_review" ? null : new Date(created.getTime() + 86_400_000),
              })
              .returning({ id: documents.id });
            previous = row!.id;
            files++;
          }
        }
      }
    }
  });
  log(`binder: ${files} essential documents${put ? " stored in S3" : " (rows only)"}`);
}
