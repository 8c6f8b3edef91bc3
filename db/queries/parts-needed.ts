import "server-only";
import type { Knex } from "knex";
import { db } from "@/db/client";

// Parts still to order across a shop's jobs (issue 19), for the parts page's order form: every
// "needed" part the owner hasn't declined, oldest first, with its job. One query, capped at `limit`
// (an order form holds at most 100 parts); `more` says there were others past it.

export type NeededPart = { partId: number; description: string; partNumber: string | null; proposed: boolean; jobNumber: number };

export async function listNeededParts({ shopId, limit }: { shopId: number; limit: number }, k: Knex = db()): Promise<{ rows: NeededPart[]; more: boolean }> {
  const rows = await k("job_parts as p")
    .join("jobs as j", function () {
      this.on("j.id", "=", "p.job_id").andOn("j.shop_id", "=", "p.shop_id");
    })
    .where({ "p.shop_id": shopId, "p.status": "needed" })
    .where((w) => w.whereNull("p.owner_answer").orWhereNot("p.owner_answer", "declined"))
    .orderBy("p.id")
    .limit(limit + 1)
    .select("p.id", "p.description", "p.part_number", "p.owner_answer", "j.number");
  return {
    more: rows.length > limit,
    rows: rows.slice(0, limit).map((r) => ({ partId: Number(r.id), description: String(r.description), partNumber: r.part_number ?? null, proposed: r.owner_answer === "pending", jobNumber: Number(r.number) })),
  };
}
