import "server-only";
import { createHash } from "node:crypto";
import { GetObjectCommand, HeadObjectCommand, PutObjectCommand, S3Client } from "@aws-sdk/client-s3";
import { getSignedUrl } from "@aws-sdk/s3-request-presigner";
import { env } from "@/env";

// S3-compatible storage (the s3rver fake locally, real S3 when S3_ENDPOINT points there).
// Checksums "WHEN_REQUIRED": with the SDK defaults a presigned PUT carries a CRC32 of an empty body.

let client: S3Client | undefined;
export function s3(): S3Client {
  client ??= new S3Client({
    region: env.S3_REGION,
    endpoint: env.S3_ENDPOINT,
    forcePathStyle: env.S3_FORCE_PATH_STYLE,
    credentials: { accessKeyId: env.S3_ACCESS_KEY_ID, secretAccessKey: env.S3_SECRET_ACCESS_KEY },
    requestChecksumCalculation: "WHEN_REQUIRED",
    responseChecksumValidation: "WHEN_REQUIRED",
  });
  return client;
}

export const UPLOAD_URL_SECONDS = 10 * 60;
export const DOWNLOAD_URL_SECONDS = 60;

export function presignUpload(key: string, contentType: string, sizeBytes: number) {
  return getSignedUrl(s3(), new PutObjectCommand({ Bucket: env.S3_BUCKET, Key: key, ContentType: contentType, ContentLength: sizeBytes }), {
    expiresIn: UPLOAD_URL_SECONDS,
  });
}

export function presignDownload(key: string, fileName: string, expiresIn = DOWNLOAD_URL_SECONDS) {
  const safeName = fileName.replace(/["\\]/g, "_");
  return getSignedUrl(
    s3(),
    new GetObjectCommand({ Bucket: env.S3_BUCKET, Key: key, ResponseContentDisposition: `attachment; filename="${safeName}"` }),
    { expiresIn },
  );
}

/** Read the stored object back and hash it: what we verify is what storage holds. */
export async function hashStoredObject(key: string): Promise<{ sha256: string; sizeBytes: number } | null> {
  try {
    await s3().send(new HeadObjectCommand({ Bucket: env.S3_BUCKET, Key: key }));
  } catch {
    return null;
  }
  const obj = await s3().send(new GetObjectCommand({ Bucket: env.S3_BUCKET, Key: key }));
  const hash = createHash("sha256");
  let size = 0;
  for await (const chunk of obj.Body as AsyncIterable<Uint8Array>) {
    hash.update(chunk);
    size += chunk.length;
  }
  return { sha256: hash.digest("hex"), sizeBytes: size };
}

/** Server-side write, for files Cairn generates itself (signature pages, remittances). */
export async function putObject(key: string, body: Buffer, contentType: string) {
  await s3().send(new PutObjectCommand({ Bucket: env.S3_BUCKET, Key: key, Body: body, ContentType: contentType }));
}
