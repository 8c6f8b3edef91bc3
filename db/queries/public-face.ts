import "server-only";
import type { Knex } from "knex";
import { db } from "@/db/client";
import { type OpeningHours, readOpeningHours } from "@/lib/shop-settings";

export type PublicFace = { shopId: number; name: string; timezone: string; openingHours: OpeningHours | null };

/** What the shop's public page shows beside its portfolio (issue 16 §6): opening hours, and the id its booking ticket carries. */
export async function getPublicFace({ slug }: { slug: string }, k: Knex = db()): Promise<PublicFace | null> {
  const row = await k("shops").where({ slug }).first("id", "name", "timezone", "opening_hours");
  if (!row) return null;
  return { shopId: Number(row.id), name: String(row.name), timezone: String(row.timezone), openingHours: readOpeningHours(row.opening_hours) };
}
