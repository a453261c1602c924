// Types for s3.mjs (the fakes are plain ESM; tests import them from TypeScript).
export declare const DEFAULT_S3_PORT: number;
export declare const DEFAULT_S3_BUCKET: string;
export declare const CORS_XML: string;
export interface S3Fake {
  url: string;
  port: number;
  bucket: string;
  directory: string;
  close(): Promise<void>;
}
export declare function startS3Fake(options?: { port?: number; bucket?: string; dataDir?: string; silent?: boolean }): Promise<S3Fake>;
