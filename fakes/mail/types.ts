// Shapes shared by the mail fake, its tests and the e2e helpers.

export type MailTag = { name: string; value: string };

/** Attachments are recorded by name and size only; tests assert on presence, not bytes. */
export type MailAttachmentInfo = {
  filename: string | null;
  content_type: string | null;
  size: number | null;
};

/** One accepted e-mail as `/_fake/messages` returns it. */
export type MailMessage = {
  id: string;
  created_at: string;
  from: string;
  to: string[];
  cc: string[];
  bcc: string[];
  reply_to: string[];
  subject: string;
  html: string | null;
  text: string | null;
  /** Custom headers from the request body, e.g. List-Unsubscribe. */
  headers: Record<string, string>;
  tags: MailTag[];
  attachments: MailAttachmentInfo[];
  scheduled_at: string | null;
  idempotency_key: string | null;
  /** Absolute http(s) URLs from html hrefs, then the text part; de-duplicated, in order. */
  links: string[];
};
