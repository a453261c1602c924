import { z } from "zod";

// What Cairn accepts as a document upload. Checked before a URL is issued and again after the
// object is stored (size and SHA-256 read back from storage).

export const allowedContentTypes = {
  "application/pdf": [".pdf"],
  "image/png": [".png"],
  "image/jpeg": [".jpg", ".jpeg"],
  "text/csv": [".csv"],
  "text/plain": [".txt"],
  "application/vnd.openxmlformats-officedocument.wordprocessingml.document": [".docx"],
  "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet": [".xlsx"],
} as const satisfies Record<string, readonly string[]>;
export type AllowedContentType = keyof typeof allowedContentTypes;

export const DEFAULT_MAX_UPLOAD_BYTES = 20 * 1024 * 1024;

const fileNameSchema = z
  .string()
  .trim()
  .min(1, "The file needs a name")
  .max(200, "File names are limited to 200 characters")
  .refine((n) => !/[/\\]/.test(n), "A file name may not contain / or \\")
  // eslint-disable-next-line no-control-regex
  .refine((n) => !/[\u0000-\u001f\u007f]/.test(n), "A file name may not contain control characters")
  .refine((n) => n !== "." && n !== ".." && !n.startsWith("."), "A file name may not start with a dot");

export function uploadRequestSchema(maxBytes: number = DEFAULT_MAX_UPLOAD_BYTES) {
  return z
    .object({
      fileName: fileNameSchema,
      contentType: z.string().refine((t): t is AllowedContentType => t in allowedContentTypes, {
        message: `Allowed file types: ${Object.values(allowedContentTypes).flat().join(", ")}`,
      }),
      sizeBytes: z
        .number()
        .int()
        .positive("The file is empty")
        .max(maxBytes, `Files may be at most ${Math.round(maxBytes / (1024 * 1024))} MB`),
      sha256: z.string().regex(/^[0-9a-f]{64}$/, "SHA-256 must be 64 lower-case hex digits"),
    })
    .refine(
      (r) => {
        const exts = allowedContentTypes[r.contentType as AllowedContentType] as readonly string[] | undefined;
        return !exts || exts.some((ext) => r.fileName.toLowerCase().endsWith(ext));
      },
      { path: ["fileName"], message: "The file name's extension does not match its type" },
    );
}
export type UploadRequest = z.infer<ReturnType<typeof uploadRequestSchema>>;
