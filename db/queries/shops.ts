import "server-only";
import { db } from "@/lib/server/db";
import type { StaffRole } from "@/lib/permissions";

export type ShopRow = { id: number; slug: string; name: string; timezone: string; currency: string };

export async function getShopBySlug({ slug }: { slug: string }): Promise<ShopRow | null> {
  const row = await db()("shops").where({ slug }).first("id", "slug", "name", "timezone", "currency");
  return row ? { id: Number(row.id), slug: String(row.slug), name: String(row.name), timezone: String(row.timezone), currency: String(row.currency) } : null;
}

export async function listShopTechnicians({ shopId }: { shopId: number }) {
  const rows = await db()("memberships as m")
    .join("users as u", "u.id", "m.user_id")
    .where("m.shop_id", shopId)
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
    .orderByRaw("m.role = 'technician' DESC")
    .orderBy("u.name")
    .select("u.id", "u.name", "m.role");
  return rows.map((r: { id: number; name: string; role: StaffRole }) => ({ id: Number(r.id), name: String(r.name), role: r.role }));
}
