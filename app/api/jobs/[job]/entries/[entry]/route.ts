import { z } from "zod";
import { entryChangeSchema, entryDeleteSchema } from "@/lib/schemas/journal";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { editEntry } from "@/lib/server/journal";
import { dropPublicPagesForJob } from "@/lib/server/portfolio-cache";

const params = z.object({ job: ids.job, entry: ids.row });

// An entry a published story shows may have changed: the shop's cached public pages are dropped.

/** PATCH /api/jobs/:job/entries/:entry {version, note?, caption?, visibility?} — edit or share; the old state goes to history. */
export const PATCH = route({ params, body: entryChangeSchema, resource: "job", permission: "journal:post" }, async ({ body, params, found, actor }) => {
  const result = await editEntry(actor, found, params.entry, body);
  await dropPublicPagesForJob({ shopId: found.job.shopId, shopSlug: found.job.shopSlug, jobId: found.job.id });
  return result;
});

/** DELETE /api/jobs/:job/entries/:entry {version} — hidden from everyone, kept in history. */
export const DELETE = route({ params, body: entryDeleteSchema, resource: "job", permission: "journal:post" }, async ({ body, params, found, actor }) => {
  const result = await editEntry(actor, found, params.entry, { version: body.version, delete: true });
  await dropPublicPagesForJob({ shopId: found.job.shopId, shopSlug: found.job.shopSlug, jobId: found.job.id });
  return result;
});
