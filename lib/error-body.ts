// Anything thrown in a route handler or server action, mapped to the error body and status we
// answer with. Apart from lib/errors.ts because it needs zod at run time (to recognise a zod
// failure), and lib/errors.ts is imported by client components.
import { z } from "zod";
import { AppError, DATABASE_UNAVAILABLE_MESSAGE, type ErrorBody, type FieldErrors, isDatabaseUnavailable } from "@/lib/errors";

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
  if (isDatabaseUnavailable(error)) return { status: 503, body: { error: { code: "unavailable", message: DATABASE_UNAVAILABLE_MESSAGE } } };
  return { status: 500, body: { error: { code: "internal", message: "Something went wrong on our side. Try again in a moment." } } };
}
