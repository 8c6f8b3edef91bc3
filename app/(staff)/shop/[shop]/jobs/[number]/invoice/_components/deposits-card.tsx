import { CircleCheck, Clock } from "lucide-react";
import { Badge, Card } from "@/components/ui";
import { formatMoney } from "@/lib/money";
import type { InvoiceView } from "@/lib/server/invoice-views";
import { RecordDepositForm, RequestDepositForm } from "./payment-forms";

/** Parts deposits on the job: asked for, paid online or at the counter; each counts towards the invoice. */
export function DepositsCard({ view, jobPublicId, mayRequest, mayRecord }: { view: InvoiceView; jobPublicId: string; mayRequest: boolean; mayRecord: boolean }) {
  const requests = [...view.openRequests, ...view.record.map((r) => ({ publicId: r.request, title: r.title }))];
  return (
    <Card as="section" title="Parts deposits" headingId="deposits-heading" description="Ask for a deposit before ordering parts; it counts towards the invoice.">
      <div className="space-y-4">
        {view.deposits.length ? (
          <ul className="divide-y divide-line">
            {view.deposits.map((d) => (
              <li key={d.publicId} className="space-y-2 py-3">
                <p className="flex flex-wrap items-center gap-2">
                  <strong>{formatMoney(d.amountMinor, d.currency)}</strong>
                  {d.status === "paid" ? (
                    <Badge tone="moss" icon={CircleCheck}>
                      Paid
                    </Badge>
                  ) : d.status === "open" ? (
                    <Badge tone="signal" icon={Clock}>
                      Waiting for the owner
                    </Badge>
                  ) : (
                    <Badge tone="neutral">Cancelled</Badge>
                  )}
                  {d.note ? <span className="text-ink-muted">{d.note}</span> : null}
                </p>
                {d.status === "open" && mayRecord ? <RecordDepositForm deposit={d.publicId} amount={formatMoney(d.amountMinor, d.currency)} /> : null}
              </li>
            ))}
          </ul>
        ) : (
          <p className="text-ink-muted">No deposit asked for on this job.</p>
        )}
        {mayRequest ? <RequestDepositForm job={jobPublicId} currency={view.currency} requests={requests} /> : null}
      </div>
    </Card>
  );
}
