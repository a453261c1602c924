// The S3 fake with the AWS SDK v3 as Cairn configures it: presigned PUT and GET, and CORS preflight.
import fs from "node:fs";
import { CreateBucketCommand, GetObjectCommand, HeadBucketCommand, PutObjectCommand, S3Client } from "@aws-sdk/client-s3";
import { getSignedUrl } from "@aws-sdk/s3-request-presigner";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startS3Fake, type S3Fake } from "../../../docker-free-fakes/s3.mjs";
import { tempDir } from "./helpers";

process.env.AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED = "true";

let s3: S3Fake;
let dataDir: string;
let client: S3Client;

beforeAll(async () => {
  dataDir = tempDir("s3-fake");
  s3 = await startS3Fake({ port: 0, dataDir, bucket: "cairn-documents" });
  client = new S3Client({
    endpoint: s3.url,
    region: "us-east-1",
    forcePathStyle: true,
    credentials: { accessKeyId: "S3RVER", secretAccessKey: "S3RVER" },
    // With the SDK defaults a presigned PUT carries a CRC32 of an empty body.
    requestChecksumCalculation: "WHEN_REQUIRED",
    responseChecksumValidation: "WHEN_REQUIRED",
  });
});

afterAll(async () => {
  client?.destroy();
  await s3?.close();
  fs.rmSync(dataDir, { recursive: true, force: true });
});

describe("S3 fake", () => {
  it("creates the documents bucket at start", async () => {
    await expect(client.send(new HeadBucketCommand({ Bucket: "cairn-documents" }))).resolves.toBeDefined();
    await expect(client.send(new HeadBucketCommand({ Bucket: "no-such-bucket" }))).rejects.toMatchObject({ $metadata: { httpStatusCode: 404 } });
  });

  it("round-trips a file through a presigned PUT and a presigned GET", async () => {
    const key = "sites/site-01/ethics-approval/v1.pdf";
    const content = Buffer.from("%PDF-1.7\ninvented test document\n%%EOF\n");
    const putUrl = await getSignedUrl(client, new PutObjectCommand({ Bucket: s3.bucket, Key: key, ContentType: "application/pdf" }), { expiresIn: 300 });
    expect(putUrl).toContain(`${s3.url}/${s3.bucket}/`);
    const put = await fetch(putUrl, { method: "PUT", headers: { "content-type": "application/pdf" }, body: content });
    expect(put.status).toBe(200);

    const getUrl = await getSignedUrl(client, new GetObjectCommand({ Bucket: s3.bucket, Key: key }), { expiresIn: 300 });
    const got = await fetch(getUrl);
    expect(got.status).toBe(200);
    expect(got.headers.get("content-type")).toBe("application/pdf");
    expect(Buffer.from(await got.arrayBuffer()).equals(content)).toBe(true);

    const missing = await fetch(await getSignedUrl(client, new GetObjectCommand({ Bucket: s3.bucket, Key: "sites/none.pdf" })));
    expect(missing.status).toBe(404);
  });

  it("answers a browser preflight for PUT with CORS headers", async () => {
    const res = await fetch(`${s3.url}/${s3.bucket}/sites/site-01/cv.pdf`, {
      method: "OPTIONS",
      headers: { origin: "http://127.0.0.1:3000", "access-control-request-method": "PUT", "access-control-request-headers": "content-type" },
    });
    expect(res.status).toBe(200);
    expect(res.headers.get("access-control-allow-origin")).toBe("*");
    expect(res.headers.get("access-control-allow-methods")).toContain("PUT");
    expect(res.headers.get("access-control-allow-headers")?.toLowerCase()).toContain("content-type");
  });

  it("has no CORS rule for a bucket created without one (the rule above is the fake's doing)", async () => {
    await client.send(new CreateBucketCommand({ Bucket: "plain-bucket" }));
    const res = await fetch(`${s3.url}/plain-bucket/x.txt`, {
      method: "OPTIONS",
      headers: { origin: "http://127.0.0.1:3000", "access-control-request-method": "PUT" },
    });
    expect(res.headers.get("access-control-allow-origin")).toBeNull();
  });
});
