import { Receipt } from "lucide-react";
import { getLiveInvoice } from "@/db/queries/invoices";
import { listJobDeposits } from "@/db/queries/payments";
import { ButtonLink, Card } from "@/components/ui";
import { formatInvoiceNumber } from "@/lib/invoices";
import { formatMoney } from "@/lib/money";
import { type Actor, type Resource, can } from "@/lib/permissions";

/**
 * On the owner's job page: the issued invoice (or a deposit asked for) with what is due and the
 * way to it. Nothing for followers, who see no money, and nothing before there is anything to show.
 */
export async function OwnerInvoiceCard({ actor, job, resource }: { actor: Actor; job: { id: number; shopId: number; publicId: string }; resource: Resource }) {
  if (!can(actor, "invoice:view", resource)) return null;
  const [live, deposits] = await Promise.all([getLiveInvoice({ shopId: job.shopId, jobId: job.id }), listJobDeposits({ shopId: job.shopId, jobId: job.id })]);
  const invoice = live && live.status !== "draft" ? live : null;
  const open = deposits.filter((d) => d.status === "open");
  if (!invoice && !open.length) return null;
  const due = invoice ? (invoice.balanceMinor > 0 ? `Balance due ${formatMoney(invoice.balanceMinor, invoice.currency)}.` : "Paid in full.") : null;
  return (
    <Card as="section" title={invoice ? `Invoice ${formatInvoiceNumber(invoice.number)}` : "Parts deposit requested"} headingId="invoice-card">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <p>
          {due}
          {open.map((d) => ` A parts deposit of ${formatMoney(d.amountMinor, d.currency)} is requested.`).join("")}
        </p>
        <ButtonLink href={`/my/jobs/${job.publicId}/invoice`} icon={<Receipt aria-hidden className="size-5" />}>
          {invoice && invoice.balanceMinor <= 0 && !open.length ? "See the invoice" : "See and pay"}
        </ButtonLink>
      </div>
    </Card>
  );
}
