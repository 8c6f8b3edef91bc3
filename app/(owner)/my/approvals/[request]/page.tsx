import { redirect } from "next/navigation";
import { loadPage } from "@/lib/server/page-access";

/**
 * /my/approvals/:request — the link in timeline entries, which don't know who reads them: the
 * job's staff go to the finding's page in the shop, the machine's owner to the answer page.
 */
export default async function ApprovalLinkPage({ params }: { params: Promise<{ request: string }> }) {
  const { request } = await params;
  const found = await loadPage("request", { request }, "job:view", `/my/approvals/${request}`);
  const { job } = found;
  if (found.audience === "shop") redirect(`/shop/${job.shopSlug}/jobs/${job.number}/findings/${found.request.findingId}`);
  redirect(`/my/jobs/${job.publicId}/approvals/${request}`);
}
