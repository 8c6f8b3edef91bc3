// The hosted API's error envelope, `{"error":{"type","code","message","param"}}`. The SDK turns a
// non-2xx answer into an error class by status and type: 400/404 → StripeInvalidRequestError,
// 401 → StripeAuthenticationError, 402 → StripeCardError, 429 → StripeRateLimitError, 5xx → StripeAPIError,
// and type idempotency_error → StripeIdempotencyError. Wording here is our own.
import { FakeApiError } from "../shared/http";

export type ErrorType = "invalid_request_error" | "api_error" | "card_error" | "idempotency_error" | "rate_limit_error";

export class PaymentsApiError extends FakeApiError {
  constructor(
    status: number,
    readonly type: ErrorType,
    message: string,
    readonly extra: { code?: string; param?: string; decline_code?: string } = {},
  ) {
    super(status, message);
  }

  toBody() {
    return { error: { type: this.type, message: this.message, ...this.extra } };
  }
}

export const invalidRequest = (message: string, param?: string, code = "parameter_invalid"): PaymentsApiError =>
  new PaymentsApiError(400, "invalid_request_error", message, { code, ...(param ? { param } : {}) });

export const missingResource = (kind: string, id: string): PaymentsApiError =>
  new PaymentsApiError(404, "invalid_request_error", `No such ${kind}: '${id}'`, { code: "resource_missing", param: "id" });

/** What an injected failure answers for a given status (POST /_fake/fail). */
export function injectedError(status: number, message: string | null): PaymentsApiError {
  if (status === 429) return new PaymentsApiError(429, "rate_limit_error", message ?? "Too many requests in a short time (injected).", { code: "rate_limit" });
  if (status >= 500) return new PaymentsApiError(status, "api_error", message ?? "The payments service had a problem (injected).");
  return new PaymentsApiError(status, "invalid_request_error", message ?? "Injected failure.");
}
