// The hosted API's error envelope, `{"code", "message", "more_info", "status"}`; the SDK turns a non-2xx
// answer into a RestException carrying these. The codes are the service's published error codes; the
// wording is our own.
import { FakeApiError } from "../shared/http";

export class SmsApiError extends FakeApiError {
  constructor(
    status: number,
    readonly code: number,
    message: string,
    headers: Record<string, string> = {},
  ) {
    super(status, message, headers);
  }

  toBody() {
    return { code: this.code, message: this.message, more_info: `https://www.twilio.com/docs/errors/${this.code}`, status: this.status };
  }
}

export const invalidParam = (code: number, message: string) => new SmsApiError(400, code, message);
export const notFound = (message: string) => new SmsApiError(404, 20404, message);
export const badSwitch = (message: string) => new SmsApiError(400, 21100, message);

/** What an injected failure answers (POST /_fake/fail). */
export function injectedError(status: number, message: string | null): SmsApiError {
  if (status === 429) return new SmsApiError(429, 20429, message ?? "Too many requests (injected).", { "retry-after": "1" });
  if (status >= 500) return new SmsApiError(status, 20500, message ?? "The SMS service had a problem (injected).");
  return new SmsApiError(status, 21100, message ?? "Injected failure.");
}
