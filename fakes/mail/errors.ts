// Error names are the ones the resend SDK types declare, so callers can branch on them.
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

export class ApiError extends Error {
  readonly statusCode: number;
  readonly errorName: ResendErrorName;
  readonly headers: Record<string, string>;

  constructor(statusCode: number, errorName: ResendErrorName, message: string, headers: Record<string, string> = {}) {
    super(message);
    this.statusCode = statusCode;
    this.errorName = errorName;
    this.headers = headers;
  }

  toBody(): ResendErrorBody {
    return { statusCode: this.statusCode, name: this.errorName, message: this.message };
  }
}

export const missingField = (field: string): ApiError =>
  new ApiError(422, "missing_required_field", `Missing \`${field}\` field.`);

export const invalidField = (message: string): ApiError => new ApiError(422, "validation_error", message);
