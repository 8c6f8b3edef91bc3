// One error vocabulary for route handlers and server actions: a code, a safe message,
// optional per-field messages. Never a stack trace to the client.
import { z } from "zod";

export const ERROR_STATUS = {
  bad_request: 400,
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  too_large: 413,
  invalid: 422,
  rate_limited: 429,
  internal: 500,
  unavailable: 503,
} as const;

export type ErrorCode = keyof typeof ERROR_STATUS;
export type FieldErrors = Record<string, string[]>;
export type ErrorBody = { error: { code: ErrorCode; message: string; fields?: FieldErrors } };

export class AppError extends Error {
  constructor(
    readonly code: ErrorCode,
    message: string,
    readonly fields?: FieldErrors,
  ) {
    super(message);
    this.name = "AppError";
  }
  get status(): number {
    return ERROR_STATUS[this.code];
  }
}

export function fieldErrors(error: z.ZodError): FieldErrors {
  const out: FieldErrors = {};
  for (const issue of error.issues) {
    const key = issue.path.join(".") || "_";
    (out[key] ??= []).push(issue.message);
  }
  return out;
}

/** Maps anything thrown to the error body and HTTP status we show; unknown errors become a plain 500. */
export function toErrorBody(error: unknown): { status: number; body: ErrorBody } {
  if (error instanceof AppError) {
    return { status: error.status, body: { error: { code: error.code, message: error.message, ...(error.fields ? { fields: error.fields } : {}) } } };
  }
  if (error instanceof z.ZodError) {
    return { status: 422, body: { error: { code: "invalid", message: "Some fields need attention.", fields: fieldErrors(error) } } };
  }
  return { status: 500, body: { error: { code: "internal", message: "Something went wrong on our side. Try again in a moment." } } };
}
