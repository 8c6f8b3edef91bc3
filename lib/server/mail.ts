import "server-only";
import { Resend } from "resend";
import { AppError } from "@/lib/errors";

// The only place that picks where mail goes: RESEND_BASE_URL points the SDK at the local
// fake (fakes/mail) or, unset, at the hosted API; a real RESEND_API_KEY works unchanged.
let client: Resend | undefined;
export function resend(): Resend {
  const key = process.env.RESEND_API_KEY;
  if (!key) throw new AppError("unavailable", "Mail is not configured (RESEND_API_KEY).");
  client ??= new Resend(key, process.env.RESEND_BASE_URL ? { baseUrl: process.env.RESEND_BASE_URL } : undefined);
  return client;
}

export const MAIL_FROM = () => process.env.MAIL_FROM ?? "Benchside <no-reply@benchside.test>";

export type OutgoingMail = {
  to: string;
  subject: string;
  html: string;
  text: string;
  replyTo?: string;
  headers?: Record<string, string>;
  idempotencyKey?: string;
};

/** Sends one message; returns the provider's id or throws a clear 503 AppError. */
export async function sendMail(mail: OutgoingMail): Promise<string> {
  const { data, error } = await resend().emails.send(
    {
      from: MAIL_FROM(),
      to: mail.to,
      subject: mail.subject,
      html: mail.html,
      text: mail.text,
      ...(mail.replyTo ? { replyTo: mail.replyTo } : {}),
      ...(mail.headers ? { headers: mail.headers } : {}),
    },
    mail.idempotencyKey ? { idempotencyKey: mail.idempotencyKey } : undefined,
  );
  if (error || !data) {
    console.error("mail send failed:", error?.name, error?.message);
    throw new AppError("unavailable", "We couldn't send the e-mail just now. Try again in a minute.");
  }
  return data.id;
}

export function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (ch) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[ch] ?? ch);
}
