import type { Actor } from "@/lib/permissions";
import { can } from "@/lib/permissions";
import { jobApprovals } from "@/lib/server/approval-views";
import { ApprovalsPanelView } from "./approvals-panel-view";

/** Findings and approval requests on the staff job page (loaded here, kept fresh by SWR in the view). */
export async function ApprovalsPanel({ actor, job, basePath, timeZone }: { actor: Actor; job: { publicId: string; shopId: number; customerUserId: number | null }; basePath: string; timeZone: string }) {
  const initial = await jobApprovals(actor, job.publicId);
  const resource = { shopId: job.shopId, customerUserId: job.customerUserId };
  return <ApprovalsPanelView jobPublicId={job.publicId} basePath={basePath} timeZone={timeZone} initial={initial} mayDraft={can(actor, "approvals:draft", resource)} />;
}
