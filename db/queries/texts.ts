import "server-only";
import crypto from "node:crypto";
import type { Knex } from "knex";
import { db } from "@/db/client";
import { claimDueRows } from "@/db/queries/outbox";
import type { CustomersTable, JobsTable, MachinesTable, ShopsTable, TextOutboxTable } from "@/db/tables";
import { describeMachine } from "@/lib/machine";
import type { ConsentHow, Language, NotifyChannels, OptOutHow, TextDelivery, TextFiled } from "@/lib/texts";

// The SQL of text messages: consent on the customer row (and its log), the texts' outbox with the
// delivery status the service reports, and what came in.

export type ShopTextSettings = Pick<ShopsTable, "id" | "name" | "phone" | "email" | "timezone" | "currency" | "sms_from" | "sms_quiet_start" | "sms_quiet_end" | "sms_languages">;

export async function getShopTextSettings(k: Knex, shopId: number): Promise<ShopTextSettings | undefined> {
  return k("shops").where({ id: shopId }).first("id", "name", "phone", "email", "timezone", "currency", "sms_from", "sms_quiet_start", "sms_quiet_end", "sms_languages");
}

/** The languages setting of these shops (an inbound text's: lib/texts.ts shopLanguages reads it). */
export async function shopsTextLanguages(k: Knex, shopIds: number[]): Promise<Pick<ShopsTable, "id" | "sms_languages">[]> {
  if (!shopIds.length) return [];
  const rows: Pick<ShopsTable, "id" | "sms_languages">[] = await k("shops").whereIn("id", shopIds).select("id", "sms_languages");
  return rows.map((r) => ({ id: Number(r.id), sms_languages: r.sms_languages }));
}

export type CustomerTextState = Pick<CustomersTable, "id" | "shop_id" | "email" | "phone" | "notify_channels" | "text_consent_phone" | "text_consent_at" | "text_consent_how" | "text_opt_out_at" | "text_opt_out_how">;

const TEXT_STATE = ["id", "shop_id", "email", "phone", "notify_channels", "text_consent_phone", "text_consent_at", "text_consent_how", "text_opt_out_at", "text_opt_out_how"] as const;

export async function getCustomerTextState(k: Knex, { shopId, customerId, lock = false }: { shopId: number; customerId: number; lock?: boolean }): Promise<CustomerTextState | undefined> {
  const q = k("customers").where({ shop_id: shopId, id: customerId }).first(...TEXT_STATE);
  return lock ? q.forUpdate() : q;
}

/** Consent given (again): the number, when and how; an earlier opt-out ends. Logged. */
export async function grantTextConsent(k: Knex, { shopId, customerId, phone, how, userId }: { shopId: number; customerId: number; phone: string; how: ConsentHow; userId: number | null }): Promise<void> {
  await k("customers")
    .where({ shop_id: shopId, id: customerId })
    .update({ text_consent_phone: phone, text_consent_at: k.fn.now(3), text_consent_how: how, text_opt_out_at: null, text_opt_out_how: null });
  await k("text_consent_log").insert({ shop_id: shopId, customer_id: customerId, phone, action: "granted", how, user_id: userId });
}

/** Consent withdrawn for these customers (STOP from their number, their page, the carrier). Logged. */
export async function revokeTextConsent(k: Knex, { shopId, customerIds, phone, how, userId }: { shopId: number; customerIds: number[]; phone: string; how: OptOutHow; userId: number | null }): Promise<void> {
  if (!customerIds.length) return;
  await k("customers").where({ shop_id: shopId }).whereIn("id", customerIds).update({ text_opt_out_at: k.fn.now(3), text_opt_out_how: how });
  await k("text_consent_log").insert(customerIds.map((id) => ({ shop_id: shopId, customer_id: id, phone, action: "revoked" as const, how, user_id: userId })));
}

export async function setNotifyChannels(k: Knex, { shopId, customerId, channels }: { shopId: number; customerId: number; channels: NotifyChannels }): Promise<void> {
  await k("customers").where({ shop_id: shopId, id: customerId }).update({ notify_channels: channels });
}

/** What the worker checks before sending a notice: the shop's clock and quiet hours, the owner's consent now. */
export async function textSendFacts({ shopId, customerId }: { shopId: number; customerId: number | null }): Promise<{ shop: ShopTextSettings | undefined; customer: CustomerTextState | undefined }> {
  const shop = await getShopTextSettings(db(), shopId);
  const customer = customerId == null ? undefined : await getCustomerTextState(db(), { shopId, customerId });
  return { shop, customer };
}

/** Customers of these shops whose consented number is `phone` (an inbound text's sender). */
export async function customersByTextPhone(k: Knex, { shopIds, phone }: { shopIds: number[]; phone: string }): Promise<CustomerTextState[]> {
  if (!shopIds.length) return [];
  return k("customers").whereIn("shop_id", shopIds).where({ text_consent_phone: phone }).select(...TEXT_STATE);
}

/** The shops that text from `to`: their own number, or the default sender for shops without one. */
export async function shopsForNumber(k: Knex, { to, defaultFrom }: { to: string; defaultFrom: string | null }): Promise<number[]> {
  const rows: Pick<ShopsTable, "id">[] = await k("shops")
    .where({ sms_from: to })
    .modify((q) => {
      if (defaultFrom === to) q.orWhereNull("sms_from");
    })
    .select("id");
  return rows.map((r) => Number(r.id));
}

/**
 * The job a reply from `ownerPhone` to `senderPhone` answers: that of the newest text the app sent
 * from that number to that number (and that reached it, as far as the carrier said) about a job of
 * these customers (the job's owner still) that is not yet picked up. Null when no such text went; the caller then takes the newest open job.
 */
export async function lastTextedOpenJob(
  k: Knex,
  { customers, ownerPhone, senderPhone }: { customers: { shopId: number; customerId: number }[]; ownerPhone: string; senderPhone: string },
): Promise<{ shopId: number; jobId: number; customerId: number } | null> {
  if (!customers.length) return null;
  // The (shop_id, customer_id) foreign-key index narrows this to the owner's own texts.
  const row: Pick<JobsTable, "shop_id" | "id" | "customer_id"> | undefined = await k("text_outbox as t")
    .join("jobs as j", (j) => j.on("j.shop_id", "=", "t.shop_id").andOn("j.id", "=", "t.job_id").andOn("j.customer_id", "=", "t.customer_id"))
    .where((q) => {
      for (const c of customers) q.orWhere((w) => w.where({ "t.shop_id": c.shopId, "t.customer_id": c.customerId }));
    })
    .where({ "t.to_phone": ownerPhone, "t.from_phone": senderPhone, "t.state": "sent" })
    // A text the carrier reported it could not deliver is none the owner can be answering.
    .where((q) => q.whereNull("t.delivery").orWhereNotIn("t.delivery", ["undelivered", "failed"]))
    .whereNot("j.status", "picked_up")
    .orderBy("t.sent_at", "desc")
    .orderBy("t.id", "desc")
    .first("j.shop_id", "j.id", "j.customer_id");
  return row ? { shopId: Number(row.shop_id), jobId: Number(row.id), customerId: Number(row.customer_id) } : null;
}

/** The newest job of these customers not yet picked up (where a reply belongs when no text about a job went). */
export async function latestOpenJob(k: Knex, customers: { shopId: number; customerId: number }[]): Promise<{ shopId: number; jobId: number; customerId: number } | null> {
  if (!customers.length) return null;
  const row = await k("jobs")
    .where((q) => {
      for (const c of customers) q.orWhere((w) => w.where({ shop_id: c.shopId, customer_id: c.customerId }));
    })
    .whereNot("status", "picked_up")
    .orderBy("created_at", "desc")
    .orderBy("id", "desc")
    .first("shop_id", "id", "customer_id");
  return row ? { shopId: Number(row.shop_id), jobId: Number(row.id), customerId: Number(row.customer_id) } : null;
}

export type NewTextRow = {
  shopId: number;
  jobId: number | null;
  customerId: number | null;
  kind: string;
  purpose: "notice" | "keyword_reply";
  to: string;
  from: string;
  body: string;
  sendAfter: Date | null;
  heldReason: string | null;
  dedupeKey: string | null;
};

const isDuplicateKey = (error: unknown) => (error as { code?: string } | null)?.code === "ER_DUP_ENTRY";

/** Queues one text in the caller's transaction; the same dedupe key in a shop queues it once. Returns its id. */
/** Drops a text not yet sent (a reminder whose request was settled); true when one was dropped. */
export async function cancelQueuedText(k: Knex, { shopId, dedupeKey }: { shopId: number; dedupeKey: string }): Promise<boolean> {
  return (await k("text_outbox").where({ shop_id: shopId, dedupe_key: dedupeKey }).whereIn("state", ["queued", "retrying"]).delete()) > 0;
}

export async function insertText(k: Knex, t: NewTextRow): Promise<number> {
  const row = {
    shop_id: t.shopId,
    job_id: t.jobId,
    customer_id: t.customerId,
    kind: t.kind,
    purpose: t.purpose,
    to_phone: t.to,
    from_phone: t.from,
    body: t.body,
    ref: crypto.randomBytes(16).toString("hex"),
    dedupe_key: t.dedupeKey,
    held_reason: t.heldReason,
    next_attempt_at: t.sendAfter ?? k.fn.now(3),
  };
  try {
    const [id] = await k("text_outbox").insert(row);
    return Number(id);
  } catch (error) {
    if (!isDuplicateKey(error) || !t.dedupeKey) throw error;
    const existing = await k("text_outbox").where({ shop_id: t.shopId, dedupe_key: t.dedupeKey }).first("id");
    if (!existing) throw error;
    return Number(existing.id);
  }
}

export type ClaimedText = Pick<TextOutboxTable, "id" | "shop_id" | "job_id" | "customer_id" | "kind" | "purpose" | "to_phone" | "from_phone" | "body" | "attempts" | "ref" | "provider_sid" | "delivery"> & {
  claimToken: string;
};

export async function claimTexts({ limit, leaseMs }: { limit: number; leaseMs: number }): Promise<ClaimedText[]> {
  const claimToken = crypto.randomUUID();
  const ids = await claimDueRows("text_outbox", { limit, leaseMs, claimToken });
  if (!ids.length) return [];
  const rows = await db()("text_outbox")
    .whereIn("id", ids)
    .where("claim_token", claimToken)
    .orderBy("id")
    .select("id", "shop_id", "job_id", "customer_id", "kind", "purpose", "to_phone", "from_phone", "body", "attempts", "ref", "provider_sid", "delivery");
  return rows.map((r) => ({ ...r, id: Number(r.id), attempts: Number(r.attempts), claimToken }));
}

const mine = (t: Pick<ClaimedText, "id" | "claimToken">, k: Knex = db()) => k("text_outbox").where({ id: t.id, claim_token: t.claimToken, state: "sending" });

export async function markTextSent(t: ClaimedText, sid: string): Promise<void> {
  await mine(t).update({ state: "sent", sent_at: db().fn.now(3), provider_sid: sid, delivery: db().raw("COALESCE(delivery, 'queued')"), locked_until: null, claim_token: null, last_error: null, held_reason: null });
}

/** A failed try: again after `retryInMs`, or (null) given up on, with the service's error code. */
export async function markTextFailed(t: ClaimedText, { error, code, retryInMs }: { error: string; code: number | null; retryInMs: number | null }, k: Knex = db()): Promise<void> {
  const base = { last_error: error.slice(0, 500), error_code: code, locked_until: null, claim_token: null };
  if (retryInMs == null) await mine(t, k).update({ ...base, state: "dead" });
  else await mine(t).update({ ...base, state: "retrying", next_attempt_at: db().raw("NOW(3) + INTERVAL ? MICROSECOND", [Math.max(0, Math.round(retryInMs)) * 1000]) });
}

/** Gives a claimed text back untried until `until` (quiet hours began while it waited), saying why. */
export async function holdText(t: ClaimedText, { until, reason }: { until: Date; reason: string }): Promise<void> {
  await mine(t).update({ state: "queued", attempts: db().raw("GREATEST(attempts, 1) - 1"), next_attempt_at: until, held_reason: reason, locked_until: null, claim_token: null });
}

/** The row a status callback is about, by our reference (in its URL), locked. */
export async function lockTextByRef(k: Knex, ref: string) {
  return k("text_outbox").where({ ref }).forUpdate().first("id", "shop_id", "job_id", "state", "delivery", "provider_sid", "purpose", "kind", "to_phone");
}

/** A (message, status) callback seen for the first time: true; a replay: false. Callers hold the text's row lock. */
export async function recordStatusEvent(k: Knex, { sid, status }: { sid: string; status: string }): Promise<boolean> {
  if (await k("text_status_events").where({ provider_sid: sid, status }).first("status")) return false;
  await k("text_status_events").insert({ provider_sid: sid, status });
  return true;
}

/** Applies a delivery status: the sid is taken if the row had none (the send's answer was lost), and the row counts as sent. */
export async function applyTextDelivery(k: Knex, { id, sid, delivery, errorCode }: { id: number; sid: string; delivery: TextDelivery; errorCode: number | null }): Promise<void> {
  await k("text_outbox")
    .where({ id })
    .update({
      provider_sid: sid,
      delivery,
      error_code: errorCode,
      delivered_at: delivery === "delivered" ? k.fn.now(3) : null,
      // A callback proves the service took the text: a row still waiting to retry is sent, not sent again.
      state: k.raw("IF(state IN ('retrying','sending','queued'), 'sent', state)"),
      sent_at: k.raw("COALESCE(sent_at, NOW(3))"),
      claim_token: k.raw("IF(state IN ('retrying','sending','queued'), NULL, claim_token)"),
    });
}

export async function insertInbound(k: Knex, row: { sid: string; shopId: number | null; customerId: number | null; jobId: number | null; from: string; to: string; body: string; filed: TextFiled }): Promise<boolean> {
  const [id] = await k("text_inbound")
    .insert({ provider_sid: row.sid, shop_id: row.shopId, customer_id: row.customerId, job_id: row.jobId, from_phone: row.from, to_phone: row.to, body: row.body, filed: row.filed })
    .onConflict("provider_sid")
    .ignore();
  return Number(id ?? 0) > 0;
}

export async function inboundSeen(k: Knex, sid: string): Promise<boolean> {
  return (await k("text_inbound").where({ provider_sid: sid }).first("id")) !== undefined;
}

/** What a text about a job needs: its owner (id, e-mail) and the machine in words. */
export async function jobTextFacts(k: Knex, { shopId, jobId }: { shopId: number; jobId: number }) {
  const row: (Pick<JobsTable, "public_id" | "customer_id"> & Pick<MachinesTable, "year" | "make" | "model"> & { email: string | null }) | undefined = await k("jobs as j")
    .join("customers as c", (j) => j.on("c.id", "=", "j.customer_id").andOn("c.shop_id", "=", "j.shop_id"))
    .join("machines as m", (j) => j.on("m.id", "=", "j.machine_id").andOn("m.shop_id", "=", "j.shop_id"))
    .where({ "j.shop_id": shopId, "j.id": jobId })
    .first("j.public_id", "j.customer_id", "c.email", "m.year", "m.make", "m.model");
  if (!row) return null;
  return { publicId: String(row.public_id), customerId: Number(row.customer_id), email: row.email ?? null, machine: describeMachine({ year: row.year, make: row.make, model: row.model }) };
}

export async function updateShopTexts(
  k: Knex,
  { shopId, smsFrom, quietStart, quietEnd, languages }: { shopId: number; smsFrom: string | null; quietStart: number; quietEnd: number; languages: readonly Language[] },
): Promise<void> {
  await k("shops").where({ id: shopId }).update({ sms_from: smsFrom, sms_quiet_start: quietStart, sms_quiet_end: quietEnd, sms_languages: languages.join(",") });
}

/** A page's read of one customer's text state (outside a transaction). */
export async function customerTextStateOf({ shopId, customerId }: { shopId: number; customerId: number }): Promise<CustomerTextState | undefined> {
  return getCustomerTextState(db(), { shopId, customerId });
}

/** The settings page's read of the shop's texts section. */
export async function shopTextSettingsOf({ shopId }: { shopId: number }): Promise<ShopTextSettings | undefined> {
  return getShopTextSettings(db(), shopId);
}
