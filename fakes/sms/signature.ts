// X-Twilio-Signature as the hosted service computes it for the webhooks it sends: base64 of HMAC-SHA1,
// keyed with the account's auth token, over the full URL followed by each POST parameter's name and
// value, names in sorted order. The SDK's `validateRequest(authToken, signature, url, params)` checks it.
import { createHmac } from "node:crypto";

export function twilioSignature(authToken: string, url: string, params: Record<string, string>): string {
  const data = Object.keys(params)
    .sort()
    .reduce((acc, name) => acc + name + params[name], url);
  return createHmac("sha1", authToken).update(Buffer.from(data, "utf8")).digest("base64");
}

/** The same from a form-encoded body, as the shared webhook sender hands it over. */
export function signFormBody(rawBody: string, authToken: string, url: string): string {
  return twilioSignature(authToken, url, Object.fromEntries(new URLSearchParams(rawBody)));
}
