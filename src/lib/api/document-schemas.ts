import { z } from "zod";
import { idSchema } from "./schemas";
import { uploadRequestSchema } from "@/lib/documents/upload-rules";
import { binderUploadSchema } from "@/lib/binder/schemas";

export const documentPurposeSchema = z.string().regex(/^[a-z][a-z0-9_]{1,48}$/, "Unknown document purpose");

export function createUploadSchema(maxBytes: number) {
  return z.intersection(
    uploadRequestSchema(maxBytes),
    z.object({
      siteId: idSchema.nullable().default(null),
      purpose: documentPurposeSchema.default("general"),
      /** Set for an essential document of a site's binder. */
      binder: binderUploadSchema.optional(),
    }),
  );
}

export const documentParams = z.object({ documentId: idSchema });
export const documentListQuery = z.object({ siteId: idSchema.optional(), purpose: documentPurposeSchema.optional() });
