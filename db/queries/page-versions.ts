import "server-only";
import { db } from "@/db/client";

/** Which job a job page's address names: the owner's (by public id) or the shop's (by slug and number). */
export type JobPageRef = { area: "owner"; publicId: string } | { area: "staff"; shopSlug: string; number: number };

/**
 * The counters a job page is rendered under (db/page-versions.ts), in one statement: the job's,
 * its shop's and the instance's, with the job's shop. Null when no such job: the page itself
 * answers that (not found, or no access), never the cache.
 */
export async function jobPageVersions(ref: JobPageRef): Promise<{ shopId: number; versions: string } | null> {
  const where = ref.area === "owner" ? ["j.public_id = ?", [ref.publicId]] : ["s.slug = ? AND j.number = ?", [ref.shopSlug, ref.number]];
  const [rows] = (await db().raw(
    `SELECT j.id AS job, j.shop_id AS shop,
       (SELECT version FROM page_versions WHERE scope = 'job' AND ref = j.id) AS j,
       (SELECT version FROM page_versions WHERE scope = 'shop' AND ref = j.shop_id) AS s,
       (SELECT version FROM page_versions WHERE scope = 'all' AND ref = 0) AS g
     FROM jobs j JOIN shops s ON s.id = j.shop_id
     WHERE ${where[0] as string}
     LIMIT 1`,
    where[1] as (string | number)[],
  )) as [Record<string, unknown>[]];
  const row = rows[0];
  if (!row) return null;
  return { shopId: Number(row.shop), versions: ["job", row.job, row.j, "shop", row.shop, row.s, "all", row.g].map((v) => String(v ?? 0)).join(":") };
}
