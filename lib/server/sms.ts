import "server-only";
import twilio from "twilio";
import type RequestClient from "twilio/lib/base/RequestClient";
import { AppError } from "@/lib/errors";
import { appUrl, smsConfig } from "@/lib/server/config";

// The only place that picks where texts go. The SDK has no base-URL option, so with TWILIO_API_BASE
// set (the local fake, fakes/sms) its own RequestClient is given requests whose hosted origins are
// rewritten to that address; unset, nothing is rewritten and real credentials talk to the hosted API.

const HOSTED_ORIGINS = ["https://api.twilio.com", "https://messaging.twilio.com"];

class RewritingRequestClient extends twilio.RequestClient {
  constructor(private readonly base: string) {
    super({ timeout: 15_000 });
  }

  override request<TData>(opts: RequestClient.RequestOptions<TData>) {
    const origin = HOSTED_ORIGINS.find((o) => opts.uri.startsWith(o));
    return super.request(origin ? { ...opts, uri: this.base + opts.uri.slice(origin.length) } : opts);
  }
}

let client: { key: string; twilio: twilio.Twilio } | undefined;

export function smsEnabled(): boolean {
  return smsConfig() !== null;
}

export function smsClient(): twilio.Twilio {
  const config = smsConfig();
  if (!config) throw new AppError("unavailable", "Text messages are not configured (TWILIO_ACCOUNT_SID, TWILIO_AUTH_TOKEN).");
  const key = `${config.accountSid}\n${config.authToken}\n${config.apiBase ?? ""}`;
  if (client?.key !== key) {
    const httpClient = config.apiBase ? new RewritingRequestClient(config.apiBase) : undefined;
    const opts: twilio.ClientOpts = httpClient ? { httpClient } : {};
    client = { key, twilio: twilio(config.accountSid, config.authToken, opts) };
  }
  return client.twilio;
}

/** Where the service POSTs to us: our public address, exactly as it is signed (path and query included). */
export function smsWebhookUrl(pathAndQuery: string): string {
  return `${appUrl()}${pathAndQuery}`;
}

/**
 * Whether a webhook is the service's own: X-Twilio-Signature checked by the SDK's validator against
 * the URL as we published it (our APP_URL, not the Host header, which a proxy may change).
 */
export function verifySmsSignature(request: Request, params: Record<string, string>): boolean {
  const config = smsConfig();
  const signature = request.headers.get("x-twilio-signature");
  if (!config || !signature) return false;
  const { pathname, search } = new URL(request.url);
  return twilio.validateRequest(config.authToken, signature, smsWebhookUrl(pathname + search), params);
}
