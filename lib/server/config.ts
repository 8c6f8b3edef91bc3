import "server-only";

/** The app's public address, for links in e-mails. */
export function appUrl(): string {
  return (process.env.APP_URL ?? `http://localhost:${process.env.PORT ?? 3000}`).replace(/\/$/, "");
}

/**
 * Text messages (lib/server/sms.ts). TWILIO_ACCOUNT_SID + TWILIO_AUTH_TOKEN: the account (the token
 * also signs every webhook the service sends us). TWILIO_API_BASE: the local fake's address
 * (fakes/sms); unset, the SDK talks to the hosted API. SMS_DEFAULT_FROM: the sender for shops that
 * haven't set a number of their own. Texts are off (owners get e-mail) while the account is unset.
 */
export function smsConfig(): { accountSid: string; authToken: string; apiBase: string | null; defaultFrom: string | null } | null {
  const accountSid = process.env.TWILIO_ACCOUNT_SID ?? "";
  const authToken = process.env.TWILIO_AUTH_TOKEN ?? "";
  if (!accountSid || !authToken) return null;
  return { accountSid, authToken, apiBase: process.env.TWILIO_API_BASE?.replace(/\/$/, "") || null, defaultFrom: process.env.SMS_DEFAULT_FROM || null };
}
