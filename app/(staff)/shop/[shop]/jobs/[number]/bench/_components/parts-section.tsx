import { Package } from "lucide-react";
import { Badge, Card, EmptyState } from "@/components/ui";
import type { PartRow } from "@/db/queries/bench-parts";
import { PART_STATUS_LABEL, isOutstanding } from "@/lib/bench";
import { formatMoney, formatQuantity } from "@/lib/money";
import { PartForm } from "./part-form";
import { PartStatusForm } from "./part-status-form";
import type { FindingClearance } from "@/db/queries/workflow";
import { whenText } from "./when";

type Props = { jobPublicId: string; parts: PartRow[]; currency: string; timeZone: string; mayManage: boolean; findings: FindingClearance[] };

/** What the part is for, and whether it can wait the job yet. */
function forWhat(p: PartRow, findings: FindingClearance[]): string {
  // A part from a priced finding line follows the owner's answer to that line (issue 19).
  const title = findings.find((x) => x.id === p.findingId)?.title;
  const line = title ? `the line on “${title}”` : "its finding line";
  if (p.ownerAnswer === "pending") return `Proposed on ${line}: doesn't hold the job until the owner approves it`;
  if (p.ownerAnswer === "approved") return `For ${line} (approved)`;
  if (p.ownerAnswer === "declined") return `Declined by owner on ${line}: not ordered, never on the invoice`;
  if (p.noOkNeeded) return "For the booked work";
  const f = findings.find((x) => x.id === p.findingId);
  if (!f) return "For work not named";
  return f.state === "approved" ? `For “${f.title}” (approved)` : `For “${f.title}”: doesn't hold the job until the owner approves it`;
}

/** Parts on the job with their status, expected date and history; costs stay on this staff page. */
export function PartsSection({ jobPublicId, parts, currency, timeZone, mayManage, findings }: Props) {
  // Proposed and declined parts aren't awaited (issue 19).
  const waiting = parts.filter((p) => isOutstanding(p.status) && (p.ownerAnswer === null || p.ownerAnswer === "approved")).length;
  return (
    <Card
      as="section"
      title="Parts"
      headingId="parts"
      description={parts.length ? (waiting ? `${waiting} still to come.` : "Everything is in.") : undefined}
      className="scroll-mt-4"
    >
      <div className="space-y-4">
        {parts.length === 0 ? (
          <EmptyState icon={Package} title="No parts on this job" description="Add what the job needs. While a part for approved or booked work is still to come, the job shows as waiting on parts." />
        ) : (
          <ul className="space-y-3" aria-label="Parts on this job">
            {parts.map((p) => (
              <li key={p.id} className="space-y-2 rounded-lg border border-line p-3">
                <p className="flex flex-wrap items-center gap-2">
                  <span className="font-semibold text-ink">{p.description}</span>
                  {p.ownerAnswer === "declined" ? (
                    <Badge tone="rust" icon={Package}>
                      Declined by owner
                    </Badge>
                  ) : (
                    <Badge tone={isOutstanding(p.status) ? "signal" : "moss"} icon={Package}>
                      {p.ownerAnswer === "pending" ? `Proposed · ${PART_STATUS_LABEL[p.status]}` : PART_STATUS_LABEL[p.status]}
                    </Badge>
                  )}
                </p>
                <p className="text-sm text-ink-muted">
                  {[p.partNumber, `qty ${formatQuantity(p.qtyThousandths)}`, p.supplier, p.costMinor != null ? `${formatMoney(p.costMinor, currency)} each` : null, p.sellMinor != null ? `sells at ${formatMoney(p.sellMinor, currency)}${p.costMinor == null ? " as typed (no cost, no markup)" : ""}` : null].filter(Boolean).join(" · ")}
                </p>
                <p className="text-sm text-ink">{forWhat(p, findings)}</p>
                {p.expectedOn && isOutstanding(p.status) ? <p>Expected {p.expectedOn}</p> : null}
                <details>
                  <summary className="inline-flex min-h-tap cursor-pointer items-center rounded-md px-2 font-semibold text-oil hover:bg-oil-soft">History</summary>
                  <ol className="space-y-1 pt-1 text-sm">
                    {p.history.map((h, i) => (
                      <li key={i}>
                        {h.from ? `${PART_STATUS_LABEL[h.from]} → ` : "Added as "}
                        {PART_STATUS_LABEL[h.to]} · {h.by ?? "someone"} · {whenText(h.at, timeZone)}
                      </li>
                    ))}
                  </ol>
                </details>
                {p.priceReason ? <p className="text-sm text-ink-muted">Price set by hand: {p.priceReason}</p> : null}
                {mayManage && p.ownerAnswer !== "declined" ? <PartStatusForm jobPublicId={jobPublicId} partId={p.id} status={p.status} description={p.description} /> : null}
              </li>
            ))}
          </ul>
        )}
        {mayManage ? <PartForm jobPublicId={jobPublicId} currency={currency} findings={findings} /> : null}
      </div>
    </Card>
  );
}
