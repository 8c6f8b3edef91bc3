import "server-only";
import { db } from "@/lib/server/db";

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
