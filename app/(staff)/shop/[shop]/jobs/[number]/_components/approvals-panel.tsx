import { type Actor, can } from "@/lib/permissions";
import { stripMoney } from "@/lib/money-fields";
import { jobApprovals } from "@/lib/server/approval-views";
import { ApprovalsPanelView } from "./approvals-panel-view";

/**
 * Findings and approval requests on the staff job page (loaded here, kept fresh by SWR in the view).
 * What is handed to the browser follows the permission table: no amounts for a technician.
 */
export async function ApprovalsPanel({
  actor,
  job,
  currency,
  basePath,
  timeZone,
}: {
  actor: Actor;
  job: { id: number; publicId: string; shopId: number; customerUserId: number | null };
  /** The shop's, from the row the page has already read. */
  currency: string;
  basePath: string;
  timeZone: string;
}) {
  const resource = { shopId: job.shopId, customerUserId: job.customerUserId };
  const overview = await jobApprovals(job, currency);
  const showMoney = can(actor, "money:view", resource);
  return (
    <ApprovalsPanelView
      jobPublicId={job.publicId}
      basePath={basePath}
      timeZone={timeZone}
      initial={showMoney ? overview : stripMoney(overview)}
      mayDraft={can(actor, "approvals:draft", resource)}
      showMoney={showMoney}
    />
  );
}
