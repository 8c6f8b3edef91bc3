import "server-only";
import type { Knex } from "knex";
import { db } from "@/db/client";
import type { JobsTable, ShopEventsTable } from "@/db/tables";
import type { PolledEvent, StreamScope } from "@/lib/live-events";
import type { ShopEventKind } from "@/lib/shop-events";

// The live stream's reads of shop_events (lib/server/event-stream.ts). Beside each event, the
// job's public id: clients know a job by the id in its address. Never the payload: a stream
// tells a page to refetch, and the refetch decides what its reader may see.

type Row = Pick<ShopEventsTable, "id" | "shop_id" | "job_id" | "kind" | "owner_visible" | "created_at"> & { job_public_id: JobsTable["public_id"] | null };

const COLUMNS = ["e.id", "e.shop_id", "e.job_id", "e.kind", "e.owner_visible", "e.created_at", "j.public_id as job_public_id"] as const;

function toPolled(r: Row): PolledEvent {
  return {
    id: Number(r.id),
    kind: r.kind as ShopEventKind,
    job: r.job_public_id ?? null,
    at: new Date(r.created_at).toISOString(),
    shopId: Number(r.shop_id),
    jobId: r.job_id == null ? null : Number(r.job_id),
    ownerVisible: Boolean(r.owner_visible),
  };
}

const base = (k: Knex) => k("shop_events as e").leftJoin("jobs as j", (on) => on.on("j.id", "=", "e.job_id").andOn("j.shop_id", "=", "e.shop_id"));

/** Every shop's events after `afterId`, oldest first (by the primary key): one poll of one app instance. */
export async function listStreamEventsAfter({ afterId, limit }: { afterId: number; limit: number }, k: Knex = db()): Promise<PolledEvent[]> {
  const rows: Row[] = await base(k).where("e.id", ">", afterId).orderBy("e.id", "asc").limit(limit).select(COLUMNS);
  return rows.map(toPolled);
}

/**
 * A resuming subscriber's missed events: its scope's events in (afterId, throughId], the newest
 * `limit` of them, oldest first. Bounded, so a client back after days gets the latest (it
 * refetches everything on any event anyway).
 */
export async function listScopeEventsBetween(
  { scope, afterId, throughId, limit }: { scope: StreamScope; afterId: number; throughId: number; limit: number },
  k: Knex = db(),
): Promise<PolledEvent[]> {
  const q = base(k).where("e.id", ">", afterId).andWhere("e.id", "<=", throughId);
  if (scope.kind === "shop") q.andWhere("e.shop_id", scope.shopId);
  else {
    q.andWhere("e.job_id", scope.jobId);
    if (scope.ownerVisibleOnly) q.andWhere("e.owner_visible", true);
  }
  const rows: Row[] = await q.orderBy("e.id", "desc").limit(limit).select(COLUMNS);
  return rows.reverse().map(toPolled);
}
