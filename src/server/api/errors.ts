import { z } from "zod";

// Typed errors in one place: code → HTTP status. Handlers throw AppError; the wrapper answers
// { error: { code, message, fields? } }.

export const errorStatus = {
  bad_request: 400,
  validation_failed: 400,
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  gone: 410,
  payload_too_large: 413,
  unsupported_media_type: 415,
  unprocessable: 422,
  too_many_requests: 429,
  internal: 500,
  upstream_unavailable: 503,
} as const;
export type ErrorCode = keyof typeof errorStatus;

export type FieldErrors = Record<string, string[]>;

export class AppError extends Error {
  constructor(
    readonly code: ErrorCode,
    message: string,
    readonly fields?: FieldErrors,
    readonly details?: unknown,
  ) {
    super(message);
    this.name = "AppError";
  }
  get status(): number {
    return errorStatus[this.code];
  }
}

export const notFound = (what = "That record") => new AppError("not_found", `${what} was not found, or you may not see it.`);
export const forbidden = (message = "Your role does not allow this.") => new AppError("forbidden", message);
export const conflict = (message: string, details?: unknown) => new AppError("conflict", message, undefined, details);
export const unprocessable = (message: string, fields?: FieldErrors) => new AppError("unprocessable", message, fields);

export function fieldErrorsFromZod(error: z.ZodError): FieldErrors {
  const fields: FieldErrors = {};
  for (const issue of error.issues) {
    const key = issue.path.length ? issue.path.join(".") : "_";
    (fields[key] ??= []).push(issue.message);
  }
  return fields;
}

export function validationError(error: z.ZodError, where = "input"): AppError {
  const fields = fieldErrorsFromZod(error);
  const first = Object.entries(fields)[0];
  const summary = first ? `${first[0] === "_" ? where : first[0]}: ${first[1][0]}` : "invalid";
  return new AppError("validation_failed", `Check the ${where}. ${summary}`, fields);
}

/** PostgreSQL error codes that mean bad input rather than a bug (drizzle wraps them in .cause). */
export function fromDatabaseError(err: unknown): AppError | null {
  const e = err as { code?: string; cause?: { code?: string; detail?: string; constraint?: string } };
  const code = e?.cause?.code ?? e?.code;
  switch (code) {
    case "23505":
      return new AppError("conflict", "That already exists.", undefined, { constraint: e.cause?.constraint });
    case "23503":
      return new AppError("conflict", "That refers to a record that does not exist or is still in use.");
    case "23514":
    case "23502":
      return new AppError("unprocessable", "That value is not allowed here.");
    case "22P02":
    case "22007":
    case "22008":
    case "22003":
      return new AppError("bad_request", "A value is not in the expected format.");
    case "40001":
    case "40P01":
      return new AppError("conflict", "Someone else changed this at the same time. Try again.");
    default:
      return null;
  }
}

export function toAppError(err: unknown): AppError {
  if (err instanceof AppError) return err;
  if (err instanceof z.ZodError) return validationError(err);
  return fromDatabaseError(err) ?? new AppError("internal", "Something went wrong on our side. It has been logged.");
}

export type ErrorBody = { error: { code: ErrorCode; message: string; fields?: FieldErrors } };

export function errorBody(err: AppError): ErrorBody {
  return { error: { code: err.code, message: err.message, ...(err.fields ? { fields: err.fields } : {}) } };
}
