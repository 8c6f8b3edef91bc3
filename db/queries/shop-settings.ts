import "server-only";
import type { Knex } from "knex";
import { db } from "@/db/client";
import type { ShopsTable } from "@/db/tables";
import { type OpeningHours, readOpeningHours } from "@/lib/shop-settings";

// The shop row's own settings, named labour rates and the record of settings changes.
// Money settings are read and written by getMoneySettings / saveMoneySettings (db/queries/findings.ts).

/** A JSON column: mysql2 hands some back parsed already (MariaDB's JSON check), others as text. */
const fromJson = (v: unknown): unknown => (typeof v === "string" ? JSON.parse(v) : v);

export type ShopProfileSettings = { name: string; email: string | null; phone: string | null; address: string | null };
export type ShopRowSettings = ShopProfileSettings & { timezone: string; currency: string; digestWindowMinutes: number; ownerWaitDays: number; openingHours: OpeningHours | null };
export type NamedRate = { name: string; rateMinor: number };

export async function getShopRowSettings({ shopId }: { shopId: number }, k: Knex = db()): Promise<ShopRowSettings> {
  const row = await k("shops").where({ id: shopId }).first("name", "email", "phone", "address", "timezone", "currency", "digest_window_minutes", "owner_wait_days", "opening_hours");
  if (!row) throw new Error(`shop ${shopId} not found`);
  return {
    name: String(row.name),
    email: row.email ?? null,
    phone: row.phone ?? null,
    address: row.address ?? null,
    timezone: String(row.timezone),
    currency: String(row.currency),
    digestWindowMinutes: Number(row.digest_window_minutes),
    ownerWaitDays: Number(row.owner_wait_days),
    openingHours: readOpeningHours(row.opening_hours),
  };
}

type ShopChange = Partial<Pick<ShopsTable, "name" | "email" | "phone" | "address" | "timezone" | "currency" | "digest_window_minutes">> & { openingHours?: OpeningHours };

export async function updateShopRow(k: Knex, { shopId, change }: { shopId: number; change: ShopChange }): Promise<void> {
  const { openingHours, ...columns } = change;
  await k("shops")
    .where({ id: shopId })
    .update({ ...columns, ...(openingHours ? { opening_hours: JSON.stringify(openingHours) } : {}) });
}

/** The shop's standard drop-off terms, or null when the owner hasn't set them. */
export type DropoffStandard = { chargeMinor: number; upToMinor: number };

export async function getDropoffStandard({ shopId }: { shopId: number }, k: Knex = db()): Promise<DropoffStandard | null> {
  const row = await k("shop_money_settings").where({ shop_id: shopId }).first("dropoff_charge_minor", "dropoff_up_to_minor");
  if (row?.dropoff_charge_minor == null || row.dropoff_up_to_minor == null) return null;
  return { chargeMinor: Number(row.dropoff_charge_minor), upToMinor: Number(row.dropoff_up_to_minor) };
}

export async function saveDropoffStandard(k: Knex, { shopId, standard }: { shopId: number; standard: DropoffStandard | null }): Promise<void> {
  const row = { dropoff_charge_minor: standard?.chargeMinor ?? null, dropoff_up_to_minor: standard?.upToMinor ?? null };
  // The other columns keep their defaults when the shop has no money settings yet.
  await k("shop_money_settings").insert({ shop_id: shopId, ...row }).onConflict("shop_id").merge(row);
}

export async function getNamedRates({ shopId }: { shopId: number }, k: Knex = db()): Promise<NamedRate[]> {
  const row = await k("shop_money_settings").where({ shop_id: shopId }).first("labour_rates");
  const value: unknown = fromJson(row?.labour_rates ?? null);
  return Array.isArray(value) ? value.filter((r): r is NamedRate => typeof r?.name === "string" && Number.isSafeInteger(r?.rateMinor)) : [];
}

/** Call after saveMoneySettings (or with a row present): the named rates live on the money settings row. */
export async function saveNamedRates(k: Knex, { shopId, rates }: { shopId: number; rates: NamedRate[] }): Promise<void> {
  await k("shop_money_settings").where({ shop_id: shopId }).update({ labour_rates: JSON.stringify(rates) });
}

export async function insertSettingChange(k: Knex, row: { shopId: number; userId: number; section: string; before: unknown; after: unknown }): Promise<void> {
  await k("shop_setting_changes").insert({ shop_id: row.shopId, user_id: row.userId, section: row.section, before: JSON.stringify(row.before), after: JSON.stringify(row.after) });
}

export type SettingChange = { id: number; section: string; by: string | null; at: string; before: unknown; after: unknown };

/** The shop's newest changes first. */
export async function listSettingChanges({ shopId, limit = 20 }: { shopId: number; limit?: number }, k: Knex = db()): Promise<SettingChange[]> {
  const rows = await k("shop_setting_changes as c")
    .leftJoin("users as u", "u.id", "c.user_id")
    .where("c.shop_id", shopId)
    .orderBy("c.id", "desc")
    .limit(limit)
    .select("c.id", "c.section", "c.before", "c.after", "c.at", "u.name as by_name");
  return rows.map((r) => ({ id: Number(r.id), section: String(r.section), by: r.by_name ?? null, at: (r.at as Date).toISOString(), before: fromJson(r.before), after: fromJson(r.after) }));
}

/** Locks the shop row for a settings change, so two sections saved at once don't overwrite each other's reads. */
export async function lockShopRow(k: Knex, { shopId }: { shopId: number }): Promise<void> {
  await k("shops").where({ id: shopId }).forUpdate().first("id");
}
