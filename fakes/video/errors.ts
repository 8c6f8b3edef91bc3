// Error envelope of the hosted Mux API: {"error":{"type":"…","messages":["…"]}}. The SDK turns any non-2xx
// into APIError subclasses by status (401 → AuthenticationError, 404 → NotFoundError, 429 → RateLimitError,
// 5xx → InternalServerError) and keeps this body in `error.error`.
// Type names are modelled on the hosted API's answers (from memory, unverified).
import { FakeApiError } from "../shared/http";

export type MuxErrorType =
  | "invalid_parameters"
  | "unauthorized"
  | "forbidden"
  | "not_found"
  | "method_not_allowed"
  | "too_many_requests"
  | "internal_error"
  | "service_unavailable";

export type MuxErrorBody = { error: { type: MuxErrorType; messages: string[] } };

export class MuxApiError extends FakeApiError {
  constructor(status: number, readonly type: MuxErrorType, message: string, headers: Record<string, string> = {}) {
    super(status, message, headers);
  }

  toBody(): MuxErrorBody {
    return { error: { type: this.type, messages: [this.message] } };
  }
}

export const invalidParameter = (message: string): MuxApiError => new MuxApiError(400, "invalid_parameters", message);

export const notFound = (what = "resource"): MuxApiError =>
  new MuxApiError(404, "not_found", `The requested ${what} either doesn't exist or you don't have access to it.`);

/** The error an injected failure produces for a given status. */
export function injectedError(status: number, message: string | null): MuxApiError {
  if (status === 429) return new MuxApiError(429, "too_many_requests", message ?? "Too many requests, please slow down.", { "retry-after": "1" });
  if (status === 401) return new MuxApiError(401, "unauthorized", message ?? "Unauthorized request");
  if (status === 503) return new MuxApiError(503, "service_unavailable", message ?? "The service is temporarily unavailable.");
  if (status >= 500) return new MuxApiError(status, "internal_error", message ?? "An internal error occurred.");
  return new MuxApiError(status, "invalid_parameters", message ?? "Injected failure.");
}
