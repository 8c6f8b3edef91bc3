import "server-only";
import type { Knex } from "knex";
import { db } from "@/db/client";
import type { StaffRole } from "@/lib/permissions";

/** The shop as its pages need it; the clip limits too, so the staff job page reads the row once. */
export type ShopRow = { id: number; slug: string; name: string; timezone: string; currency: string; ownerWaitDays: number; clipMaxSeconds: number; clipMaxBytes: number };

export async function getShopBySlug({ slug }: { slug: string }): Promise<ShopRow | null> {
  const row = await db()("shops").where({ slug }).first("id", "slug", "name", "timezone", "currency", "owner_wait_days", "clip_max_seconds", "clip_max_bytes");
  return row
    ? {
        id: Number(row.id),
        slug: String(row.slug),
        name: String(row.name),
        timezone: String(row.timezone),
        currency: String(row.currency),
        ownerWaitDays: Number(row.owner_wait_days),
        clipMaxSeconds: Number(row.clip_max_seconds),
        clipMaxBytes: Number(row.clip_max_bytes),
      }
    : null;
}

/** After how many days waiting on the owner the board flags a job. */
export async function saveOwnerWaitDays({ shopId, days }: { shopId: number; days: number }, k: Knex = db()): Promise<void> {
  await k("shops").where({ id: shopId }).update({ owner_wait_days: days });
}

/** The shop's currency code; "USD" for a shop that isn't there (callers reach it through a job of the shop). */
export async function getShopCurrency({ shopId }: { shopId: number }, k: Knex = db()): Promise<string> {
  const row = await k("shops").where({ id: shopId }).first("currency");
  return row ? String(row.currency) : "USD";
}

export async function getShopName({ shopId }: { shopId: number }, k: Knex = db()): Promise<string> {
  const row = await k("shops").where({ id: shopId }).first("name");
  if (!row) throw new Error(`shop ${shopId} not found`);
  return String(row.name);
}

export async function listShopTechnicians({ shopId }: { shopId: number }) {
  const rows = await db()("memberships as m")
    .join("users as u", "u.id", "m.user_id")
    .where("m.shop_id", shopId)
    .whereNull("m.deactivated_at")
    .whereIn("m.role", ["technician", "owner"])
    .orderBy("u.name")
    .select("u.id", "u.name");
  return rows.map((r: { id: number; name: string }) => ({ id: Number(r.id), name: String(r.name) }));
}

/** Everyone on the shop's staff with their role, technicians first (who a job can be assigned to). */
export async function listShopStaff({ shopId }: { shopId: number }): Promise<{ id: number; name: string; role: StaffRole }[]> {
  const rows = await db()("memberships as m")
    .join("users as u", "u.id", "m.user_id")
    .where("m.shop_id", shopId)
    .whereNull("m.deactivated_at")
    .orderByRaw("m.role = 'technician' DESC")
    .orderBy("u.name")
    .select("u.id", "u.name", "m.role");
  return rows.map((r: { id: number; name: string; role: StaffRole }) => ({ id: Number(r.id), name: String(r.name), role: r.role }));
}
