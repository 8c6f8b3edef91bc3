// Validates a Resend-style send body and turns it into a stored MailMessage.
import { ApiError, invalidField, missingField } from "./errors";
import type { MailAttachmentInfo, MailMessage, MailTag } from "./types";

const MAX_RECIPIENTS = 50;
// Deliberately loose: the fake must accept dev domains such as `owner@shop.test` or `a@localhost`.
const ADDRESS = /^[^\s@<>",;]+@[^\s@<>",;]+$/;
const TAG_PART = /^[A-Za-z0-9_-]{1,256}$/;
const HEADER_NAME = /^[!#$%&'*+.^_`|~0-9A-Za-z-]+$/;

export type EmailInput = Omit<MailMessage, "id" | "created_at" | "idempotency_key" | "links">;

export function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === "object" && value !== null && !Array.isArray(value);
}

/** `Name <a@b>` → `a@b`; anything else is returned trimmed. */
export function bareAddress(value: string): string {
  const match = /<([^<>]+)>\s*$/.exec(value);
  return (match?.[1] ?? value).trim();
}

function addressList(body: Record<string, unknown>, field: string, required: boolean): string[] {
  const raw = body[field];
  if (raw === undefined || raw === null) {
    if (required) throw missingField(field);
    return [];
  }
  const list: unknown[] | null = typeof raw === "string" ? [raw] : Array.isArray(raw) ? raw : null;
  if (list === null || !list.every((item): item is string => typeof item === "string")) {
    throw invalidField(`Invalid \`${field}\` field. Expected a string or an array of strings.`);
  }
  if (required && list.length === 0) throw missingField(field);
  if (list.length > MAX_RECIPIENTS) {
    throw invalidField(`Invalid \`${field}\` field. At most ${MAX_RECIPIENTS} addresses are allowed, got ${list.length}.`);
  }
  for (const item of list) {
    if (!ADDRESS.test(bareAddress(item))) {
      throw invalidField(
        `Invalid \`${field}\` field. The email address needs to follow the \`email@example.com\` or \`Name <email@example.com>\` format.`,
      );
    }
  }
  return list.map((item) => item.trim());
}

function optionalString(body: Record<string, unknown>, field: string): string | null {
  const raw = body[field];
  if (raw === undefined || raw === null) return null;
  if (typeof raw !== "string") throw invalidField(`Invalid \`${field}\` field. Expected a string.`);
  return raw;
}

function parseHeaders(raw: unknown): Record<string, string> {
  if (raw === undefined || raw === null) return {};
  if (!isRecord(raw)) throw invalidField("Invalid `headers` field. Expected an object of header names to string values.");
  const out: Record<string, string> = {};
  for (const [name, value] of Object.entries(raw)) {
    if (!HEADER_NAME.test(name) || typeof value !== "string" || /[\r\n]/.test(value)) {
      throw invalidField(`Invalid \`headers\` field. Header \`${name}\` must have a token name and a single-line string value.`);
    }
    out[name] = value;
  }
  return out;
}

function parseTags(raw: unknown): MailTag[] {
  if (raw === undefined || raw === null) return [];
  if (!Array.isArray(raw)) throw invalidField("Invalid `tags` field. Expected an array of { name, value }.");
  return raw.map((tag) => {
    if (!isRecord(tag) || typeof tag.name !== "string" || typeof tag.value !== "string" || !TAG_PART.test(tag.name) || !TAG_PART.test(tag.value)) {
      throw invalidField("Invalid `tags` field. Tag names and values may only contain ASCII letters, numbers, underscores and dashes (max 256 characters).");
    }
    return { name: tag.name, value: tag.value };
  });
}

function parseAttachments(raw: unknown): MailAttachmentInfo[] {
  if (raw === undefined || raw === null) return [];
  if (!Array.isArray(raw)) throw invalidField("Invalid `attachments` field. Expected an array.");
  return raw.map((item) => {
    if (!isRecord(item) || (typeof item.content !== "string" && typeof item.path !== "string")) {
      throw invalidField("Invalid `attachments` field. Each attachment needs a base64 `content` string or a `path`.");
    }
    return {
      filename: typeof item.filename === "string" ? item.filename : null,
      content_type: typeof item.content_type === "string" ? item.content_type : null,
      // byteLength on base64 computes the decoded size without allocating the bytes.
      size: typeof item.content === "string" ? Buffer.byteLength(item.content, "base64") : null,
    };
  });
}

/** Throws ApiError with the status and name the hosted API would use. */
export function parseEmail(body: unknown, opts: { batch: boolean }): EmailInput {
  if (!isRecord(body)) throw invalidField("The request body must be a JSON object.");
  if (body.react !== undefined && body.react !== null) {
    throw invalidField("The `react` field is not supported; render it to `html` first (the SDK does this before sending).");
  }
  if (body.template !== undefined && body.template !== null) {
    throw invalidField("The `template` field is not supported by the mail fake; send `html` or `text`.");
  }
  if (body.from === undefined || body.from === null || body.from === "") throw missingField("from");
  if (typeof body.from !== "string") throw invalidField("Invalid `from` field. Expected a single address string.");
  const from = addressList(body, "from", true)[0] ?? body.from;
  const to = addressList(body, "to", true);
  const subject = optionalString(body, "subject");
  if (subject === null || subject === "") throw missingField("subject");
  const html = optionalString(body, "html");
  const text = optionalString(body, "text");
  if (!html && !text) throw new ApiError(422, "missing_required_field", "Missing `html` or `text` field.");
  if (opts.batch && body.attachments !== undefined) throw invalidField("Attachments are not supported in batch sends.");
  if (opts.batch && body.scheduled_at !== undefined) throw invalidField("`scheduled_at` is not supported in batch sends.");
  return {
    from,
    to,
    cc: addressList(body, "cc", false),
    bcc: addressList(body, "bcc", false),
    reply_to: addressList(body, "reply_to", false),
    subject,
    html,
    text,
    headers: parseHeaders(body.headers),
    tags: parseTags(body.tags),
    attachments: parseAttachments(body.attachments),
    scheduled_at: optionalString(body, "scheduled_at"),
  };
}

const NAMED_ENTITIES: Record<string, string> = { amp: "&", lt: "<", gt: ">", quot: '"', apos: "'" };

function decodeEntities(value: string): string {
  return value.replace(/&(#x[0-9a-f]+|#[0-9]+|[a-z]+);/gi, (whole, body: string) => {
    if (body.startsWith("#")) {
      const code = body[1] === "x" || body[1] === "X" ? parseInt(body.slice(2), 16) : parseInt(body.slice(1), 10);
      return Number.isFinite(code) && code >= 0 && code <= 0x10ffff ? String.fromCodePoint(code) : whole;
    }
    return NAMED_ENTITIES[body.toLowerCase()] ?? whole;
  });
}

function isHttpUrl(value: string): boolean {
  if (!/^https?:\/\//i.test(value)) return false;
  try {
    new URL(value);
    return true;
  } catch {
    return false;
  }
}

/** Tests follow these links (sign-in, approval, unsubscribe), so they must be exactly what the recipient would click. */
export function extractLinks(html: string | null, text: string | null): string[] {
  const found: string[] = [];
  if (html) {
    for (const match of html.matchAll(/\shref\s*=\s*(?:"([^"]*)"|'([^']*)'|([^\s"'=<>`]+))/gi)) {
      const url = decodeEntities(match[1] ?? match[2] ?? match[3] ?? "").trim();
      if (isHttpUrl(url)) found.push(url);
    }
  }
  if (text) {
    for (const match of text.matchAll(/https?:\/\/[^\s<>"'`]+/gi)) {
      let url = match[0].replace(/[.,;:!?]+$/, "");
      // A URL written in parentheses keeps its closing bracket otherwise.
      while (/[)\]]$/.test(url) && !/[([]/.test(url)) url = url.slice(0, -1);
      if (isHttpUrl(url)) found.push(url);
    }
  }
  return [...new Set(found)];
}

export function toMessage(input: EmailInput, id: string, createdAt: Date, idempotencyKey: string | null): MailMessage {
  return {
    id,
    created_at: createdAt.toISOString(),
    ...input,
    idempotency_key: idempotencyKey,
    links: extractLinks(input.html, input.text),
  };
}
