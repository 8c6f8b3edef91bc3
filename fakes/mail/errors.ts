// Error names are the ones the resend SDK types declare, so callers can branch on them.
import { FakeApiError } from "../shared/http";

export type ResendErrorName =
  | "validation_error"
  | "missing_required_field"
  | "missing_api_key"
  | "invalid_api_key"
  | "invalid_idempotency_key"
  | "invalid_idempotent_request"
  | "concurrent_idempotent_requests"
  | "invalid_parameter"
  | "not_found"
  | "method_not_allowed"
  | "rate_limit_exceeded"
  | "internal_server_error"
  | "application_error";

export type ResendErrorBody = { statusCode: number; name: ResendErrorName; message: string };

export class ApiError extends FakeApiError {
  constructor(status: number, readonly errorName: ResendErrorName, message: string, headers: Record<string, string> = {}) {
    super(status, message, headers);
  }

  toBody(): ResendErrorBody {
    return { statusCode: this.status, name: this.errorName, message: this.message };
  }
}

export const missingField = (field: string): ApiError =>
  new ApiError(422, "missing_required_field", `Missing \`${field}\` field.`);

export const invalidField = (message: string): ApiError => new ApiError(422, "validation_error", message);
