import { forbidden, notFound, redirect } from "next/navigation";
import { AppError } from "@/lib/errors";
import { REQUEST_PUBLIC_ID_PATTERN } from "@/lib/schemas/approvals";
import { requestAccess } from "@/lib/server/approvals";
import { requirePageActor } from "@/lib/server/authorize";

/**
 * /my/approvals/:request — the link in timeline entries, which don't know who reads them: the
 * job's staff go to the finding's page in the shop, the machine's owner to the answer page.
 */
export default async function ApprovalLinkPage({ params }: { params: Promise<{ request: string }> }) {
  const { request } = await params;
  const actor = await requirePageActor(`/my/approvals/${request}`);
  if (!REQUEST_PUBLIC_ID_PATTERN.test(request)) notFound();
  let access: Awaited<ReturnType<typeof requestAccess>>;
  try {
    access = await requestAccess(actor, request);
  } catch (error) {
    if (error instanceof AppError && (error.code === "not_found" || error.code === "forbidden")) forbidden();
    throw error;
  }
  const { job } = access;
  if (access.audience === "shop") redirect(`/shop/${job.shopSlug}/jobs/${job.number}/findings/${access.request.findingId}`);
  redirect(`/my/jobs/${job.publicId}/approvals/${request}`);
}
