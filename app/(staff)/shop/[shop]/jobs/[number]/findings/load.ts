import "server-only";
import { notFound } from "next/navigation";
import { getJobByNumber } from "@/db/queries/jobs";
import { getMoneySettings, listEvidenceChoices } from "@/db/queries/findings";
import { can } from "@/lib/permissions";
import { jobNumberParamSchema } from "@/lib/schemas/jobs";
import { authorizePage } from "@/lib/server/authorize";
import { shopPageAccess } from "../../../shop-access";

/** The job behind a findings page, for its shop's staff, with what the editor needs. */
export async function loadFindingsJob(slug: string, number: string, path: string) {
  const { actor, shop } = await shopPageAccess(slug, "shop:view-board", path);
  const n = jobNumberParamSchema.safeParse(number);
  if (!n.success) notFound();
  const job = await getJobByNumber({ shopId: shop.id, number: n.data });
  if (!job) notFound();
  const resource = { shopId: job.shopId, customerUserId: job.customerUserId };
  authorizePage(actor, "approvals:draft", resource);
  const [settings, choices] = await Promise.all([getMoneySettings({ shopId: shop.id }), listEvidenceChoices({ shopId: shop.id, jobId: job.id })]);
  return {
    actor,
    shop,
    job,
    settings,
    choices,
    basePath: `/shop/${shop.slug}/jobs/${job.number}`,
    mayPrice: can(actor, "approvals:send", resource),
    mayRecord: can(actor, "approvals:record-decision", resource),
  };
}
