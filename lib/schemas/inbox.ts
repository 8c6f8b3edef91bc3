import { z } from "zod";
import { DELIVERIES, INBOX_KINDS, type InboxKind } from "@/lib/shop-events";
import { jobNumberParamSchema, listParam } from "./jobs";

// The desk inbox's query (page and GET /api/shops/[shop]/inbox) and its forms.

/** An empty field (`?job=`) is no filter. */
const blank = (v: unknown) => (v === "" ? undefined : v);

export const inboxQuerySchema = z.object({
  /** One kind or several (repeated or comma-separated); none: every kind. */
  kind: listParam(INBOX_KINDS, "Unknown kind").optional().default([]),
  /** A job number as people write it ("J-0042", "42"). */
  job: z.preprocess(blank, jobNumberParamSchema.optional()),
  /** Keyset paging: items older than this item id. */
  before: z.preprocess(blank, z.coerce.number().int().positive().max(Number.MAX_SAFE_INTEGER).optional()),
  /** "1": unread items only. */
  unread: z.preprocess(blank, z.enum(["1"], { error: "unread is 1 or left out." }).optional()).transform((v) => v === "1"),
});

export type InboxQuery = z.output<typeof inboxQuerySchema>;

/** The query as URL search params, defaults left out (the same string on the server and in SWR keys). */
export function inboxQueryToSearch(q: Partial<InboxQuery>): string {
  const p = new URLSearchParams();
  if (q.kind?.length) p.set("kind", q.kind.join(","));
  if (q.job != null) p.set("job", String(q.job));
  if (q.unread) p.set("unread", "1");
  if (q.before != null) p.set("before", String(q.before));
  return p.toString();
}

const delivery = z.enum(DELIVERIES, { error: "Choose e-mail at once, in the morning e-mail, or no e-mail." });

/**
 * The settings form: one choice per kind, written out so tools that read schemas from the source
 * (the fuzz test) see every field; the check below fails to compile when a kind is missing.
 */
export const inboxPreferencesSchema = z.object({
  shop: z.string({ error: "This page names no shop of yours: reload it and try again." }).max(60, "This page names no shop of yours: reload it and try again."),
  owner_answered: delivery,
  payment_received: delivery,
  payment_failed: delivery,
  payment_refunded: delivery,
  consent_given: delivery,
  consent_refused: delivery,
  consent_withdrawn: delivery,
  follower_added: delivery,
  mail_undeliverable: delivery,
  text_undeliverable: delivery,
  parts_received: delivery,
  core_credit_owed: delivery,
  owner_question: delivery,
  booking_request: delivery,
});
const _everyKind: Record<InboxKind, unknown> = inboxPreferencesSchema.shape;
void _everyKind;
