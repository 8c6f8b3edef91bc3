import { MessageCircleQuestionMark } from "lucide-react";
import { listOpenRequests } from "@/db/queries/approvals";
import { ButtonLink } from "@/components/ui";
import { formatMoney } from "@/lib/money";
import { type Actor, can } from "@/lib/permissions";

/**
 * "The decision you owe", at the top of the owner's job page: each open request with its
 * estimate and one button. Shown to the machine's owner only (never to staff or followers).
 */
export async function OwedDecisions({ actor, job }: { actor: Actor; job: { id: number; shopId: number; publicId: string; customerUserId: number | null } }) {
  if (!can(actor, "approvals:answer", { shopId: job.shopId, customerUserId: job.customerUserId })) return null;
  const open = await listOpenRequests({ shopId: job.shopId, jobId: job.id });
  if (!open.length) return null;
  return (
    <section aria-labelledby="owed-heading" className="space-y-3 rounded-xl border-2 border-brass bg-brass-soft p-4">
      <h2 id="owed-heading" className="flex items-center gap-2 text-lg font-bold text-ink">
        <MessageCircleQuestionMark aria-hidden className="size-6 text-brass" />
        The shop needs your answer
      </h2>
      <ul className="space-y-3">
        {open.map((r) => (
          <li key={r.publicId} className="flex flex-wrap items-center justify-between gap-3">
            <span>
              <span className="block font-semibold text-ink">{r.title}</span>
              <span className="text-sm text-ink">Estimate {formatMoney(r.totalMinor, r.currency)}, approve or decline each line</span>
            </span>
            <ButtonLink href={`/my/jobs/${job.publicId}/approvals/${r.publicId}`}>Review and answer</ButtonLink>
          </li>
        ))}
      </ul>
    </section>
  );
}
