import "server-only";
import type { Knex } from "knex";
import type { CustomersTable } from "@/db/tables";
import { AppError } from "@/lib/errors";
import type { MergeMoved } from "@/lib/customers";

/**
 * Every column that points at a customer row (grep the migrations for `inTable("customers")`).
 * A merge moves each of them from the removed record to the kept one; the integration test
 * compares this list with the database's foreign keys, so a new one can't be forgotten.
 * Follower links, portfolio consents, invoices and the rest hang off jobs, so they move with them.
 */
export const CUSTOMER_REFERENCES = [
  { table: "machines", column: "customer_id" },
  { table: "jobs", column: "customer_id" },
  { table: "customer_merges", column: "kept_customer_id" },
  { table: "job_questions", column: "customer_id" },
  { table: "text_consent_log", column: "customer_id" },
  { table: "text_outbox", column: "customer_id" },
  { table: "text_inbound", column: "customer_id" },
] as const;

const refuse = (code: "not_found" | "conflict" | "invalid", message: string): never => {
  throw new AppError(code, message, { duplicate: [message] });
};

/**
 * Folds `removedId` into `keptId`, both customers of `shopId`, inside the caller's transaction:
 * both rows locked, every reference moved, gaps in the kept record's contact filled from the
 * removed one, the removed row deleted and a `customer_merges` row written (who, when, what it
 * held, what moved). A duplicate of another shop isn't found in this one: refused. Two records
 * linked to two different sign-ins are two people as far as we know: refused.
 */
export async function mergeCustomers(tx: Knex.Transaction, { shopId, keptId, removedId, userId }: { shopId: number; keptId: number; removedId: number; userId: number }) {
  if (keptId === removedId) refuse("invalid", "Pick a different record: a customer can't be merged into itself.");
  // Locked in id order, so two merges of the same pair can't deadlock each other for long.
  const rows = await tx("customers").where("shop_id", shopId).whereIn("id", [keptId, removedId]).orderBy("id").forUpdate().select("*");
  const kept = rows.find((r) => Number(r.id) === keptId);
  const removed = rows.find((r) => Number(r.id) === removedId);
  if (!kept) throw new AppError("not_found", "No such customer, or it isn't yours to see.");
  if (!removed) return refuse("not_found", "That record isn't a customer of this shop. Pick one from the list.");
  if (kept.user_id != null && removed.user_id != null && Number(kept.user_id) !== Number(removed.user_id)) {
    refuse("conflict", "These two records belong to two different sign-ins, so they can't be merged. Check with the owner which address is theirs.");
  }

  const moved: MergeMoved = { jobIds: [], machineIds: [], took: [] };
  moved.machineIds = (await tx("machines").where({ shop_id: shopId, customer_id: removedId }).forUpdate().select("id")).map((r) => Number(r.id));
  moved.jobIds = (await tx("jobs").where({ shop_id: shopId, customer_id: removedId }).forUpdate().select("id")).map((r) => Number(r.id));
  for (const ref of CUSTOMER_REFERENCES) {
    await tx(ref.table)
      .where({ shop_id: shopId, [ref.column]: removedId })
      .update({ [ref.column]: keptId });
  }

  // The kept record keeps what it has and takes what it lacks. The removed row goes first: the
  // e-mail is unique in the shop.
  const fill: Partial<Pick<CustomersTable, "email" | "phone" | "user_id" | "contact_preference">> = {};
  if (kept.email == null && removed.email != null) fill.email = removed.email;
  if (kept.phone == null && removed.phone != null) fill.phone = removed.phone;
  if (kept.user_id == null && removed.user_id != null) fill.user_id = removed.user_id;
  if (kept.contact_preference == null && removed.contact_preference != null) fill.contact_preference = removed.contact_preference;
  moved.took = Object.keys(fill);

  const deleted = await tx("customers").where({ shop_id: shopId, id: removedId }).delete();
  if (deleted !== 1) throw new AppError("conflict", "That record changed while merging. Try again.");
  if (moved.took.length) await tx("customers").where({ shop_id: shopId, id: keptId }).update(fill);

  const snapshot = {
    id: removedId,
    name: removed.name,
    email: removed.email ?? null,
    phone: removed.phone ?? null,
    userId: removed.user_id == null ? null : Number(removed.user_id),
    contactPreference: removed.contact_preference ?? null,
    createdAt: new Date(removed.created_at).toISOString(),
  };
  const [mergeId] = await tx("customer_merges").insert({
    shop_id: shopId,
    kept_customer_id: keptId,
    removed_customer_id: removedId,
    removed: JSON.stringify(snapshot),
    moved: JSON.stringify(moved),
    merged_by_user_id: userId,
  });
  return { mergeId: Number(mergeId), moved };
}
