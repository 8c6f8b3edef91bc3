import "server-only";
import type { Knex } from "knex";
import { db } from "@/db/client";
import type { ShopEventsTable } from "@/db/tables";
import { type ShopEvent, type ShopEventKind, isInboxKind } from "@/lib/shop-events";

// The shop's event log: written in the same transaction as the change it reports, so an event is
// never announced for a change that rolled back, and never missing for one that committed.

/** Records one event inside the caller's transaction (or on the pool). Returns its id. */
export async function recordEvent(
  k: Knex,
  e: { shopId: number; jobId: number | null; kind: ShopEventKind; actorUserId: number | null; payload?: Record<string, unknown>; ownerVisible?: boolean },
): Promise<number> {
  const [id] = await k("shop_events").insert({
    shop_id: e.shopId,
    job_id: e.jobId,
    kind: e.kind,
    inbox: isInboxKind(e.kind),
    owner_visible: e.ownerVisible ?? false,
    payload: JSON.stringify(e.payload ?? {}),
    actor_user_id: e.actorUserId,
  });
  return Number(id);
}

export function toShopEvent(r: ShopEventsTable): ShopEvent {
  const payload = typeof r.payload === "string" ? (JSON.parse(r.payload) as Record<string, unknown>) : ((r.payload ?? {}) as Record<string, unknown>);
  return {
    id: Number(r.id),
    shopId: Number(r.shop_id),
    jobId: r.job_id == null ? null : Number(r.job_id),
    kind: r.kind as ShopEventKind,
    inbox: Boolean(r.inbox),
    ownerVisible: Boolean(r.owner_visible),
    payload,
    actorUserId: r.actor_user_id == null ? null : Number(r.actor_user_id),
    at: new Date(r.created_at).toISOString(),
  };
}

/** Every shop's events after `afterId`, oldest first: what one app instance's poller reads. */
export async function listEventsAfter({ afterId, limit }: { afterId: number; limit: number }, k: Knex = db()): Promise<ShopEvent[]> {
  const rows: ShopEventsTable[] = await k("shop_events").where("id", ">", afterId).orderBy("id", "asc").limit(limit).select("*");
  return rows.map(toShopEvent);
}

/** The newest event id (0 when there is none): where a fresh stream starts. */
export async function latestEventId(k: Knex = db()): Promise<number> {
  const row = await k("shop_events").max({ id: "id" }).first();
  return Number(row?.id ?? 0);
}
