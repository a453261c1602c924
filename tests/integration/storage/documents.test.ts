import { createHash } from "node:crypto";
import { PutObjectCommand } from "@aws-sdk/client-s3";
import { beforeAll, describe, expect, it } from "vitest";
import * as uploads from "@/app/api/v1/studies/[studyId]/documents/route";
import * as complete from "@/app/api/v1/documents/[documentId]/complete/route";
import * as download from "@/app/api/v1/documents/[documentId]/download/route";
import { s3 } from "@/server/storage/s3";
import { env } from "@/env";
import { callRoute } from "../../support/api";
import { createStudyFixture, type StudyFixture } from "../../support/db";

let fx: StudyFixture;
beforeAll(async () => {
  fx = await createStudyFixture();
});

const sha = (b: Buffer) => createHash("sha256").update(b).digest("hex");

async function requestUpload(body: Record<string, unknown>, userId = fx.userByRole.coordinator.id) {
  return callRoute(uploads.POST, { method: "POST", params: { studyId: fx.study.id }, body: { siteId: fx.siteA.id, purpose: "cv", ...body }, userId });
}

describe("document storage through presigned URLs", () => {
  it("round-trips an upload and a download through the S3 fake with the SHA-256 verified", async () => {
    const content = Buffer.from("%PDF-1.4\nInvestigator CV (test)\n%%EOF\n");
    const res = await requestUpload({ fileName: "cv.pdf", contentType: "application/pdf", sizeBytes: content.length, sha256: sha(content) });
    expect(res.status).toBe(201);
    const put = await fetch(res.json.uploadUrl, { method: "PUT", body: content, headers: { "content-type": "application/pdf" } });
    expect(put.status).toBe(200);
    const done = await callRoute(complete.POST, { method: "POST", params: { documentId: res.json.document.id }, userId: fx.userByRole.coordinator.id });
    expect(done.status).toBe(200);
    expect(done.json.document.state).toBe("stored");

    const link = await callRoute(download.GET, { params: { documentId: res.json.document.id }, userId: fx.userByRole.investigator.id });
    expect(link.status).toBe(200);
    expect(link.json.expiresInSeconds).toBeLessThanOrEqual(300);
    const got = Buffer.from(await (await fetch(link.json.url)).arrayBuffer());
    expect(sha(got)).toBe(sha(content));
  });

  it("detects an object that does not match its declared SHA-256", async () => {
    const declared = Buffer.from("the real letter");
    const res = await requestUpload({ fileName: "letter.pdf", contentType: "application/pdf", sizeBytes: declared.length, sha256: sha(declared) });
    // Someone writes other bytes of the same length behind the app's back.
    const other = Buffer.from("a forged letter");
    await s3().send(new PutObjectCommand({ Bucket: env.S3_BUCKET, Key: res.json.document.storageKey, Body: other }));
    const done = await callRoute(complete.POST, { method: "POST", params: { documentId: res.json.document.id }, userId: fx.userByRole.coordinator.id });
    expect(done.status).toBe(422);
    expect(done.json.error.message).toMatch(/SHA-256/);
    const link = await callRoute(download.GET, { params: { documentId: res.json.document.id }, userId: fx.userByRole.coordinator.id });
    expect(link.status).toBe(422);
  });

  it.each([
    ["an over-size file", { fileName: "big.pdf", contentType: "application/pdf", sizeBytes: 500 * 1024 * 1024 }, /at most/],
    ["a disallowed type", { fileName: "run.exe", contentType: "application/x-msdownload", sizeBytes: 100 }, /Allowed file types/],
    ["a mismatched extension", { fileName: "cv.exe", contentType: "application/pdf", sizeBytes: 100 }, /extension/],
    ["a path in the file name", { fileName: "../../etc/passwd.pdf", contentType: "application/pdf", sizeBytes: 100 }, /may not contain/],
    ["a control character in the file name", { fileName: "cv\u0007.pdf", contentType: "application/pdf", sizeBytes: 100 }, /control characters/],
  ])("refuses %s with a clear 400", async (_label, body, message) => {
    const res = await requestUpload({ sha256: "b".repeat(64), ...body });
    expect(res.status).toBe(400);
    expect(res.json.error.code).toBe("validation_failed");
    expect(JSON.stringify(res.json.error)).toMatch(message);
  });

  it("answers malformed JSON with 400, not 500", async () => {
    const res = await callRoute(uploads.POST, { method: "POST", params: { studyId: fx.study.id }, body: "{not json", userId: fx.userByRole.coordinator.id });
    expect(res.status).toBe(400);
  });

  it("lists only the caller's site's documents to site people", async () => {
    const res = await callRoute(uploads.GET, { params: { studyId: fx.study.id }, userId: fx.userByRole.coordinator.id });
    expect(res.status).toBe(200);
    const siteIds = new Set((res.json.documents as { siteId: string }[]).map((d) => d.siteId));
    expect(siteIds.has(fx.siteB.id)).toBe(false);
    expect(siteIds.has(fx.siteA.id)).toBe(true);
  });
});
