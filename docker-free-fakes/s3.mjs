// S3 fake: s3rver on 127.0.0.1 with the documents bucket created at start and a CORS rule that lets
// a browser PUT/GET through presigned URLs from any origin. s3rver does not check signatures.
import S3rver from "s3rver";
import { LOOPBACK, closeOnSignals, dataDirFor, envInt, isMain } from "./common.mjs";

export const DEFAULT_S3_PORT = 4569;
export const DEFAULT_S3_BUCKET = "cairn-documents";

// ExposeHeader ETag lets browser code read the uploaded object's ETag after a PUT.
export const CORS_XML = `<?xml version="1.0" encoding="UTF-8"?>
<CORSConfiguration>
  <CORSRule>
    <AllowedOrigin>*</AllowedOrigin>
    <AllowedMethod>GET</AllowedMethod>
    <AllowedMethod>PUT</AllowedMethod>
    <AllowedMethod>HEAD</AllowedMethod>
    <AllowedHeader>*</AllowedHeader>
    <ExposeHeader>ETag</ExposeHeader>
    <MaxAgeSeconds>3000</MaxAgeSeconds>
  </CORSRule>
</CORSConfiguration>`;

/**
 * Starts the S3 fake. port 0 picks a free port.
 * @param {{ port?: number, bucket?: string, dataDir?: string, silent?: boolean }} [options]
 */
export async function startS3Fake(options = {}) {
  const port = options.port ?? envInt("S3_FAKE_PORT", DEFAULT_S3_PORT);
  const bucket = options.bucket ?? (process.env.S3_BUCKET || DEFAULT_S3_BUCKET);
  const directory = dataDirFor("s3", options.dataDir);
  const server = new S3rver({
    address: LOOPBACK,
    port,
    silent: options.silent ?? true,
    directory,
    // Path-style only: vhost matching would need DNS names the fake does not have.
    vhostBuckets: false,
    configureBuckets: [{ name: bucket, configs: [CORS_XML] }],
  });
  const address = await server.run();
  const url = `http://${LOOPBACK}:${address.port}`;
  let closed = false;
  return {
    url,
    port: address.port,
    bucket,
    directory,
    async close() {
      if (closed) return;
      closed = true;
      await server.close();
    },
  };
}

if (isMain(import.meta.url)) {
  const s3 = await startS3Fake({ silent: process.env.S3_FAKE_VERBOSE !== "1" });
  console.log(`S3 fake: ${s3.url} bucket=${s3.bucket} data=${s3.directory}`);
  closeOnSignals([() => s3.close()]);
}
